// Billing API against the payment stand-in, driven through the official SDK: the pay flow,
// webhook signatures, idempotency, ordering, declines, refunds, amounts and who may do what.
// Sources: common practice for integer-cent money and webhook handling; the provider's
// documented webhook signing scheme (t=…,v1=HMAC-SHA256) as reproduced by fakes/payments.
import type { Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import dayjs from 'dayjs';
import request from 'supertest';
import Stripe from 'stripe';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startPaymentsFake, type PaymentsFakeHandle } from '../../fakes/payments/server.js';
import { startSmtpFake, type SmtpFakeHandle } from '../../fakes/smtp/server.js';
import { createMailer } from '../../server/integrations/mailer.js';
import { deliverDue } from '../../server/services/outbox.js';
import { AuditEvent, Invoice, OutboxMessage, PaymentEvent } from '../../server/db/models/index.js';
import { as, demo, tokenFor } from '../fixtures/auth.js';
import { makeAcidLot, makeResult, makeSite } from '../fixtures/bench.js';
import { apiTestApp } from '../setup/db.js';

const WEBHOOK_SECRET = 'whsec_billing_api_tests';
let pay: PaymentsFakeHandle;
let smtp: SmtpFakeHandle;
let ctx: ReturnType<typeof apiTestApp>;
let server: Server;
let stripe: Stripe;
let titrantId: number;

beforeAll(async () => {
  pay = await startPaymentsFake({ port: 0, webhookUrl: null, webhookSecret: WEBHOOK_SECRET, webhookRetry: { attempts: 3, baseDelayMs: 50, maxDelayMs: 200, timeoutMs: 5000 } });
  smtp = await startSmtpFake({ smtpPort: 0, mailboxPort: 0 });
  ctx = apiTestApp({ SMTP_PORT: String(smtp.smtpPort), PAYMENTS_PORT: String(pay.port), PAYMENTS_HOST: '127.0.0.1', PAYMENTS_PROTOCOL: 'http', PAYMENTS_WEBHOOK_SECRET: WEBHOOK_SECRET, PUBLIC_URL: 'http://127.0.0.1:8080' });
  // The fake delivers webhooks over HTTP, so the app listens on a free port for this file.
  server = ctx.app.listen(0, '127.0.0.1');
  await new Promise<void>((resolve) => server.once('listening', () => resolve()));
  pay.configure({ url: `http://127.0.0.1:${(server.address() as AddressInfo).port}/api/v1/payments/webhook` });
  stripe = new Stripe('sk_test_billing_api', { host: '127.0.0.1', port: pay.port, protocol: 'http', maxNetworkRetries: 0, telemetry: false });
  titrantId = (await makeAcidLot(ctx.app)).id;
});
/** Sends every queued e-mail to the SMTP capture (the outbox job's work, done here on demand). */
async function deliverAll() {
  const mailer = createMailer(ctx.config);
  try {
    for (let i = 0; i < 20 && (await deliverDue(ctx.config, mailer, 50)).sent > 0; i++);
  } finally {
    mailer.close();
  }
}

afterAll(async () => {
  // Leave no queued mail behind for the files that run after this one.
  await deliverAll();
  await smtp.close();
  await pay.close();
  await new Promise((r) => server.close(r));
  await ctx.sequelize.close();
});

const day = (daysAgo: number) => dayjs().subtract(daysAgo, 'day').format('YYYY-MM-DD');
let userSeq = 0;

/** An approved result on `pointId`: sample, titration (alkalinity; with initial pH and TDS or conductance, a full speciation), submitted and approved. */
async function approvedResult(pointId: number, daysAgo: number, titration: Record<string, unknown> = {}) {
  const analyst = await as(ctx.app, demo.analyst);
  const { sample, titration: draft } = await makeResult(ctx.app, demo.analyst, { pointId, titrantId, analysedAt: dayjs().subtract(daysAgo, 'day').hour(10), titreMl: 10, titration });
  const submitted = await analyst.post(`/api/v1/titrations/${draft.id}/submit`, { version: draft.version });
  expect(submitted.status, JSON.stringify(submitted.body)).toBe(200);
  const approved = await analyst.post(`/api/v1/titrations/${draft.id}/approve`, { version: submitted.body.version });
  expect(approved.status, JSON.stringify(approved.body)).toBe(200);
  return sample.id;
}

/** A fresh client utility with its own billing contact and its own price overrides (so demo prices never interfere). */
async function client(prices: Partial<Record<'alkalinity' | 'speciation' | 'rush' | 'acidity', number>> = { alkalinity: 2450, speciation: 3875, rush: 1500 }) {
  const admin = await as(ctx.app, demo.admin);
  const site = await makeSite(ctx.app);
  const orgId = site.facility.organizationId;
  for (const [kind, cents] of Object.entries(prices)) {
    const res = await admin.post('/api/v1/price-items', { kind, description: `Test ${kind}`, unitAmountCents: cents, currency: 'usd', clientId: orgId, effectiveFrom: '2020-01-01' });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
  }
  const email = `billing-${Date.now().toString(36)}-${userSeq++}@testutility.example`;
  const created = await admin.post('/api/v1/users', { email, name: 'Test Billing Contact', role: 'billing', organizationId: orgId });
  expect(created.status, JSON.stringify(created.body)).toBe(201);
  const token = await tokenFor(ctx.app, email, created.body.temporaryPassword);
  const payer = {
    get: (url: string) => request(ctx.app).get(url).set('Authorization', `Bearer ${token}`),
    post: (url: string, body: object = {}) => request(ctx.app).post(url).set('Authorization', `Bearer ${token}`).send(body),
  };
  return { orgId, pointId: site.point.id, payer, email };
}

async function openInvoice(c: Awaited<ReturnType<typeof client>>, results = 1) {
  const admin = await as(ctx.app, demo.admin);
  for (let i = 0; i < results; i++) await approvedResult(c.pointId, 3 + i);
  const draft = await admin.post('/api/v1/invoices', { organizationId: c.orgId, periodStart: day(30), periodEnd: day(0) });
  expect(draft.status, JSON.stringify(draft.body)).toBe(201);
  const open = await admin.post(`/api/v1/invoices/${draft.body.id}/finalise`, { termsDays: 30 });
  expect(open.status, JSON.stringify(open.body)).toBe(200);
  return open.body as { id: number; number: string; totalCents: number };
}

/** The payer on the hosted page: a form post as the browser sends it, without following the redirect. */
async function payOnPage(url: string, card: string) {
  return fetch(url, { method: 'POST', redirect: 'manual', headers: { 'content-type': 'application/x-www-form-urlencoded' }, body: new URLSearchParams({ card_number: card, action: 'pay' }) });
}

async function checkout(c: Awaited<ReturnType<typeof client>>, invoiceId: number) {
  const res = await c.payer.post(`/api/v1/invoices/${invoiceId}/checkout`);
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  const sessionId = String(res.body.url).split('/pay/')[1];
  return { url: res.body.url as string, sessionId };
}

const invoiceRow = (id: number) => Invoice.findByPk(id);
const auditCount = (id: number, action: string) => AuditEvent.count({ where: { entity: 'invoice', entityId: String(id), action } });

describe('OpenAPI description of billing', () => {
  it('documents the billing routes with their access rules and request bodies', async () => {
    const doc = (await request(ctx.app).get('/api/v1/openapi.json')).body;
    expect(doc.paths['/invoices/{id}/checkout'].post).toMatchObject({ 'x-titrata-access': 'billing.pay' });
    expect(doc.paths['/payments/webhook'].post).toMatchObject({ 'x-titrata-access': 'public', security: [] });
    expect(doc.paths['/invoices'].post.requestBody.content['application/json'].schema.required).toEqual(expect.arrayContaining(['organizationId', 'periodStart', 'periodEnd']));
  });
});

describe('demo billing data', () => {
  it('gives Kestrel Ford paid, overdue and open invoices, and the lab a price list', async () => {
    const payer = await as(ctx.app, demo.billing);
    const mine = (await payer.get('/api/v1/invoices?pageSize=50')).body.items as { state: string; organizationName: string; totalCents: number }[];
    expect(new Set(mine.map((i) => i.state))).toEqual(new Set(['paid', 'overdue', 'open']));
    expect(mine.every((i) => i.organizationName === 'Kestrel Ford Sanitary District' && i.totalCents > 0)).toBe(true);
    const admin = await as(ctx.app, demo.admin);
    expect((await admin.get('/api/v1/invoices?state=draft')).body.total).toBeGreaterThanOrEqual(1);
    const prices = (await admin.get('/api/v1/price-items?pageSize=50')).body.items as { kind: string; clientName: string | null }[];
    expect(prices.filter((p) => p.clientName === null).map((p) => p.kind).sort()).toEqual(['acidity', 'alkalinity', 'rush', 'speciation']);
  });
});

describe('invoices from approved analyses', () => {
  it('bills each sample once per kind at the client’s price, exact in cents, with the samples behind each line', async () => {
    // setup: 3 alkalinity (one with a pH but no ionic strength), 2 full speciation (pH and TDS or conductance), 1 rushed
    const c = await client();
    const admin = await as(ctx.app, demo.admin);
    const alk = [await approvedResult(c.pointId, 5), await approvedResult(c.pointId, 6, { initialPh: 8.0, temperatureC: 20 }), await approvedResult(c.pointId, 7)];
    const spec = [await approvedResult(c.pointId, 8, { initialPh: 8.1, temperatureC: 20, tdsMgL: 240 }), await approvedResult(c.pointId, 9, { initialPh: 7.9, temperatureC: 20, specificConductanceUsCm: 410 })];
    // a result still in draft is not billed
    await makeResult(ctx.app, demo.analyst, { pointId: c.pointId, titrantId, analysedAt: dayjs().subtract(4, 'day'), titreMl: 10 });

    // action
    const res = await admin.post('/api/v1/invoices', { organizationId: c.orgId, periodStart: day(30), periodEnd: day(0), rushSampleIds: [alk[0]] });

    // assert: 3 × 2450 = 7350; 2 × 3875 = 7750; 1 × 1500 = 1500; total 16600 cents (by hand)
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body).toMatchObject({ status: 'draft', state: 'draft', number: null, currency: 'usd', totalCents: 16600, totalFormatted: '$166.00' });
    const lines = res.body.lines as { kind: string; quantity: number; unitAmountCents: number; amountCents: number; samples: { sampleId: number }[] }[];
    expect(lines.map((l) => [l.kind, l.quantity, l.unitAmountCents, l.amountCents])).toEqual([
      ['alkalinity', 3, 2450, 7350],
      ['speciation', 2, 3875, 7750],
      ['rush', 1, 1500, 1500],
    ]);
    expect(lines[0].samples.map((s) => s.sampleId).sort()).toEqual([...alk].sort());
    expect(lines[1].samples.map((s) => s.sampleId).sort()).toEqual([...spec].sort());
    expect(lines[2].samples.map((s) => s.sampleId)).toEqual([alk[0]]);

    // the same analyses are not billed twice while this invoice stands
    const again = await admin.post('/api/v1/invoices', { organizationId: c.orgId, periodStart: day(30), periodEnd: day(0) });
    expect(again.status).toBe(400);
    expect(again.body.error.fields).toHaveProperty('periodStart');

    // drafts are the lab's: the client does not see them
    expect((await c.payer.get(`/api/v1/invoices/${res.body.id}`)).status).toBe(404);

    // finalise: numbered, due after the terms, e-mailed with its PDF
    const fin = await admin.post(`/api/v1/invoices/${res.body.id}/finalise`, { termsDays: 14, issuedOn: day(0) });
    expect(fin.status, JSON.stringify(fin.body)).toBe(200);
    expect(fin.body).toMatchObject({ status: 'open', state: 'open', issuedOn: day(0), dueOn: dayjs().add(14, 'day').format('YYYY-MM-DD'), totalCents: 16600 });
    expect(fin.body.number).toMatch(/^MA-\d{4}-\d{4}$/);
    const mail = await OutboxMessage.findOne({ where: { dedupeKey: `invoice:${res.body.id}` } });
    expect(mail?.toAddresses).toContain(c.email);
    expect(mail?.subject).toContain(fin.body.number);
    expect((await admin.post(`/api/v1/invoices/${res.body.id}/finalise`, {})).status).toBe(409);

    const pdf = await admin.get(`/api/v1/invoices/${res.body.id}/pdf`).buffer(true).parse((r, cb) => {
      const chunks: Buffer[] = [];
      r.on('data', (d: Buffer) => chunks.push(d));
      r.on('end', () => cb(null, Buffer.concat(chunks)));
    });
    expect(pdf.status).toBe(200);
    expect(pdf.headers['content-type']).toBe('application/pdf');
    expect((pdf.body as Buffer).subarray(0, 5).toString()).toBe('%PDF-');

    // voiding frees the samples for a corrected invoice
    expect((await admin.post(`/api/v1/invoices/${res.body.id}/void`, {})).body.error.fields).toHaveProperty('reason');
    const voided = await admin.post(`/api/v1/invoices/${res.body.id}/void`, { reason: 'Rush surcharge agreed to be waived.' });
    expect(voided.body).toMatchObject({ status: 'void', voidReason: 'Rush surcharge agreed to be waived.' });
    expect(await auditCount(res.body.id, 'invoice.void')).toBe(1);
    const corrected = await admin.post('/api/v1/invoices', { organizationId: c.orgId, periodStart: day(30), periodEnd: day(0) });
    expect(corrected.body.totalCents).toBe(7350 + 7750);
  });

  it('answers bad input with 400 and a field, and saves nothing', async () => {
    const c = await client();
    const admin = await as(ctx.app, demo.admin);
    const sampleId = await approvedResult(c.pointId, 4);
    const before = await Invoice.count();
    const cases: [object, string][] = [
      [{}, 'organizationId'],
      [{ organizationId: c.orgId, periodStart: day(1), periodEnd: day(5) }, 'periodEnd'],
      [{ organizationId: c.orgId, periodStart: day(60), periodEnd: day(40) }, 'periodStart'],
      [{ organizationId: c.orgId, periodStart: day(30), periodEnd: day(0), rushSampleIds: [999999] }, 'rushSampleIds.0'],
      [{ organizationId: 999999, periodStart: day(30), periodEnd: day(0) }, 'organizationId'],
    ];
    for (const [body, field] of cases) {
      const res = await admin.post('/api/v1/invoices', body);
      expect(res.status, JSON.stringify(body)).toBe(400);
      expect(res.body.error.fields, JSON.stringify(res.body)).toHaveProperty([field]);
    }
    expect(await Invoice.count()).toBe(before);
    const price = await admin.post('/api/v1/price-items', { kind: 'alkalinity', description: 'x', unitAmountCents: 12.5, effectiveFrom: '2026-01-01' });
    expect(price.status).toBe(400);
    expect(price.body.error.fields).toHaveProperty('unitAmountCents');
    expect(sampleId).toBeGreaterThan(0);
  });

  it('lets only the lab administrator generate, finalise and refund, and only the invoice’s own utility pay', async () => {
    const c = await client();
    const other = await client();
    const inv = await openInvoice(c);
    for (const who of [demo.analyst, demo.operator, demo.compliance, demo.billing]) {
      const u = await as(ctx.app, who);
      expect((await u.post('/api/v1/invoices', { organizationId: c.orgId, periodStart: day(30), periodEnd: day(0) })).status, who).toBe(403);
      expect((await u.post(`/api/v1/invoices/${inv.id}/refund`, { reason: 'x' })).status, who).toBe(403);
    }
    expect((await c.payer.post('/api/v1/invoices', { organizationId: c.orgId, periodStart: day(30), periodEnd: day(0) })).status).toBe(403);
    // the lab administrator cannot press Pay for a client
    expect((await (await as(ctx.app, demo.admin)).post(`/api/v1/invoices/${inv.id}/checkout`)).status).toBe(403);
    // another utility's billing contacts do not even see it
    expect((await other.payer.get(`/api/v1/invoices/${inv.id}`)).status).toBe(404);
    expect((await other.payer.post(`/api/v1/invoices/${inv.id}/checkout`)).status).toBe(404);
    expect((await (await as(ctx.app, demo.billing)).post(`/api/v1/invoices/${inv.id}/checkout`)).status).toBe(404);
    expect((await other.payer.get('/api/v1/invoices?pageSize=200')).body.items.map((i: { id: number }) => i.id)).not.toContain(inv.id);
    expect((await c.payer.get('/api/v1/invoices?pageSize=200')).body.items.map((i: { id: number }) => i.id)).toContain(inv.id);
  });
});

describe('paying through the hosted page', () => {
  it('runs the whole flow: Pay → hosted page → signed webhook → paid, with a receipt', async () => {
    // setup
    const c = await client();
    const inv = await openInvoice(c, 2); // 2 × 2450 = 4900 cents
    expect(inv.totalCents).toBe(4900);

    // action: Pay, then the success card on the hosted page
    const { url, sessionId } = await checkout(c, inv.id);
    expect(url).toBe(`${pay.url}/pay/${sessionId}`);
    // pressing Pay again reuses the open page
    expect((await c.payer.post(`/api/v1/invoices/${inv.id}/checkout`)).body.url).toBe(url);
    const session = await stripe.checkout.sessions.retrieve(sessionId);
    expect(session).toMatchObject({ amount_total: 4900, currency: 'usd', metadata: { invoice_id: String(inv.id) } });
    const res = await payOnPage(url, '4242424242424242');
    expect(res.status).toBe(303);
    expect(res.headers.get('location')).toBe(`http://127.0.0.1:8080/billing/invoices/${inv.id}?checkout=return&session=${sessionId}`);
    await pay.idle();

    // assert
    const seen = await c.payer.get(`/api/v1/invoices/${inv.id}`);
    expect(seen.body).toMatchObject({ status: 'paid', state: 'paid', paidCents: 4900, lastPaymentError: null });
    expect(seen.body.paymentIntentId).toMatch(/^pi_/);
    expect(pay.deliveries().filter((d) => d.status !== 200)).toEqual([]);
    expect(await auditCount(inv.id, 'invoice.paid')).toBe(1);
    const receipt = await OutboxMessage.findOne({ where: { dedupeKey: `receipt:${inv.id}` } });
    expect(receipt?.toAddresses).toContain(c.email);
    // the receipt and the invoice reach the billing contact's mailbox with their PDFs
    await deliverAll();
    const receiptMail = await smtp.waitForMessage((m) => (m.subject ?? '').startsWith(`Receipt for invoice ${inv.number}`));
    expect(receiptMail.to).toContain(c.email);
    expect(receiptMail.subject).toContain('$49.00 paid');
    expect(receiptMail.attachments[0]).toMatchObject({ filename: `receipt-${inv.number}.pdf`, contentType: 'application/pdf' });
    const invoiceMail = await smtp.waitForMessage((m) => (m.subject ?? '').startsWith(`Invoice ${inv.number}`));
    expect(invoiceMail.attachments[0]).toMatchObject({ filename: `${inv.number}.pdf`, contentType: 'application/pdf' });
    expect((await c.payer.get(`/api/v1/invoices/${inv.id}/receipt`)).status).toBe(200);
    // the customer was created once, for this organisation
    const customers = await stripe.customers.list({ limit: 100 });
    expect(customers.data.filter((x) => x.metadata.organization_id === String(c.orgId))).toHaveLength(1);
    expect((await c.payer.post(`/api/v1/invoices/${inv.id}/checkout`)).status).toBe(409);
  });

  it('refuses a webhook with a bad signature (400) and changes nothing', async () => {
    const c = await client();
    const inv = await openInvoice(c);
    const payload = JSON.stringify({
      id: 'evt_forged_0001',
      object: 'event',
      type: 'checkout.session.completed',
      created: Math.floor(Date.now() / 1000),
      data: { object: { id: 'cs_forged', object: 'checkout.session', payment_status: 'paid', amount_total: inv.totalCents, currency: 'usd', metadata: { invoice_id: String(inv.id) }, payment_intent: 'pi_forged' } },
    });
    const wrong = stripe.webhooks.generateTestHeaderString({ payload, secret: 'whsec_not_ours' });
    for (const signature of [wrong, 't=1,v1=deadbeef', undefined]) {
      const req = request(ctx.app).post('/api/v1/payments/webhook').set('content-type', 'application/json');
      if (signature) req.set('stripe-signature', signature);
      const res = await req.send(payload);
      expect(res.status).toBe(400);
      expect(res.body.error.code).toBe('validation_failed');
      expect(Object.keys(res.body.error.fields)[0]).toBe('stripe-signature');
    }
    expect((await invoiceRow(inv.id))!.status).toBe('open');
    expect(await PaymentEvent.count({ where: { eventId: 'evt_forged_0001' } })).toBe(0);

    // the same bytes correctly signed are accepted: the check is the signature, not the content
    const good = stripe.webhooks.generateTestHeaderString({ payload, secret: WEBHOOK_SECRET });
    const ok = await request(ctx.app).post('/api/v1/payments/webhook').set('content-type', 'application/json').set('stripe-signature', good).send(payload);
    expect(ok.status).toBe(200);
    expect((await invoiceRow(inv.id))!.status).toBe('paid');
  });

  it('applies the same event delivered twice only once', async () => {
    const c = await client();
    const inv = await openInvoice(c);
    const { url } = await checkout(c, inv.id);
    await payOnPage(url, '4242424242424242');
    await pay.idle();
    const completed = pay.events().find((e) => e.type === 'checkout.session.completed' && (e.data.object as { metadata?: Record<string, string> }).metadata?.invoice_id === String(inv.id))!;
    const again = await pay.resend(completed.id);
    expect(again?.status).toBe(200);
    await pay.resend(completed.id);
    expect(await PaymentEvent.count({ where: { eventId: completed.id } })).toBe(1);
    expect(await auditCount(inv.id, 'invoice.paid')).toBe(1);
    expect(await OutboxMessage.count({ where: { dedupeKey: `receipt:${inv.id}` } })).toBe(1);
    expect((await invoiceRow(inv.id))!.paidCents).toBe(inv.totalCents);
  });

  it('ends paid whatever order the events arrive in, and a late decline does not undo it', async () => {
    const c = await client();
    const inv = await openInvoice(c);
    pay.configure({ autoDeliver: false });
    try {
      const { url } = await checkout(c, inv.id);
      expect((await payOnPage(url, '4000000000000002')).status).toBe(402); // declined first
      expect((await payOnPage(url, '4242424242424242')).status).toBe(303); // then paid
      const mine = pay.events().filter((e) => {
        const o = e.data.object as { metadata?: Record<string, string> };
        return o.metadata?.invoice_id === String(inv.id);
      });
      expect(mine.map((e) => e.type)).toEqual(expect.arrayContaining(['payment_intent.payment_failed', 'payment_intent.succeeded', 'checkout.session.completed']));
      // newest first: completion, success, … and the decline last
      // (events of one second share `created`, so the decline is put last explicitly)
      const newestFirst = [...mine].sort((a, b) => b.created - a.created || (a.id < b.id ? 1 : -1));
      const order = [...newestFirst.filter((e) => e.type !== 'payment_intent.payment_failed'), ...newestFirst.filter((e) => e.type === 'payment_intent.payment_failed')];
      for (const e of order) await pay.resend(e.id);
      const row = (await invoiceRow(inv.id))!;
      expect(row.status).toBe('paid');
      expect(row.lastPaymentError).toBeNull();
      expect(await auditCount(inv.id, 'invoice.paid')).toBe(1);
      const outcomes = (await PaymentEvent.findAll({ where: { invoiceId: inv.id } })).map((e) => `${e.type}:${e.outcome}`);
      expect(outcomes).toContain('payment_intent.payment_failed:ignored_settled');
    } finally {
      pay.configure({ autoDeliver: true });
    }
  });

  it.each([
    ['4000000000000002', /declined/i],
    ['4000000000009995', /insufficient funds/i],
  ])('leaves the invoice open when card %s is declined, with the reason for the payer', async (card, reason) => {
    const c = await client();
    const inv = await openInvoice(c);
    const { url } = await checkout(c, inv.id);
    expect((await payOnPage(url, card)).status).toBe(402);
    await pay.idle();
    const seen = (await c.payer.get(`/api/v1/invoices/${inv.id}`)).body;
    expect(seen).toMatchObject({ status: 'open', paidAt: null });
    expect(seen.lastPaymentError).toMatch(reason);
    expect(await auditCount(inv.id, 'invoice.payment_failed')).toBeGreaterThanOrEqual(1);
    // the payer tries again on the same page, which now succeeds
    expect((await c.payer.post(`/api/v1/invoices/${inv.id}/checkout`)).body.url).toBe(url);
    await payOnPage(url, '4242424242424242');
    await pay.idle();
    expect((await c.payer.get(`/api/v1/invoices/${inv.id}`)).body).toMatchObject({ status: 'paid', lastPaymentError: null });
  });

  it('refunds a paid invoice through the provider, once', async () => {
    const c = await client();
    const inv = await openInvoice(c, 3); // 3 × 2450 = 7350 cents
    const admin = await as(ctx.app, demo.admin);
    expect((await admin.post(`/api/v1/invoices/${inv.id}/refund`, { reason: 'Paid twice by mistake.' })).status).toBe(409); // not paid yet
    const { url } = await checkout(c, inv.id);
    await payOnPage(url, '4242424242424242');
    await pay.idle();
    expect((await admin.post(`/api/v1/invoices/${inv.id}/refund`, {})).body.error.fields).toHaveProperty('reason');

    const res = await admin.post(`/api/v1/invoices/${inv.id}/refund`, { reason: 'Samples re-run at the lab’s cost.' });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body).toMatchObject({ status: 'refunded', refundedCents: 7350, paidCents: 7350, refundReason: 'Samples re-run at the lab’s cost.' });
    await pay.idle();
    const row = (await invoiceRow(inv.id))!;
    const refunds = await stripe.refunds.list({ payment_intent: row.paymentIntentId! });
    expect(refunds.data.map((r) => r.amount)).toEqual([7350]);
    expect((await admin.post(`/api/v1/invoices/${inv.id}/refund`, { reason: 'again' })).status).toBe(409);
    // the provider's event may be handled before or after our own refund call commits: either
    // way it is recorded once and the money is refunded once
    const refundEvents = (await PaymentEvent.findAll({ where: { invoiceId: inv.id, type: 'charge.refunded' } })).map((e) => e.outcome);
    expect(refundEvents).toHaveLength(1);
    expect(['already_refunded', 'refunded']).toContain(refundEvents[0]);
    expect(await auditCount(inv.id, 'invoice.refund')).toBe(1);
    expect((await c.payer.get(`/api/v1/invoices/${inv.id}`)).body.state).toBe('refunded');
  });

  it('voids an open invoice and closes its payment page', async () => {
    const c = await client();
    const inv = await openInvoice(c);
    const { url, sessionId } = await checkout(c, inv.id);
    const admin = await as(ctx.app, demo.admin);
    const res = await admin.post(`/api/v1/invoices/${inv.id}/void`, { reason: 'Issued to the wrong utility.' });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect((await stripe.checkout.sessions.retrieve(sessionId)).status).toBe('expired');
    expect((await fetch(url)).status).toBe(410);
    expect((await c.payer.post(`/api/v1/invoices/${inv.id}/checkout`)).status).toBe(409);
  });

  it('lists unpaid and overdue invoices for Today', async () => {
    const c = await client();
    const inv = await openInvoice(c);
    await Invoice.update({ dueOn: day(2) }, { where: { id: inv.id } });
    const overdue = await c.payer.get('/api/v1/invoices?state=overdue');
    expect(overdue.body.items.map((i: { id: number; state: string }) => [i.id, i.state])).toEqual([[inv.id, 'overdue']]);
    expect((await c.payer.get('/api/v1/invoices?state=unpaid')).body.total).toBe(1);
    expect((await c.payer.get('/api/v1/invoices?state=nonsense')).status).toBe(400);
  });
});
