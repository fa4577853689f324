import { execFileSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { mkdirSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import dayjs from 'dayjs';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startSmtpFake, type SmtpFakeHandle } from '../../fakes/smtp/server.js';
import { createMailer } from '../../server/integrations/mailer.js';
import { deliverDue } from '../../server/services/outbox.js';
import { processReportBatches } from '../../server/services/reports.js';
import { as, demo } from '../fixtures/auth.js';
import { makeAcidLot, makeResult, makeSite } from '../fixtures/bench.js';
import { apiTestApp } from '../setup/db.js';

let smtp: SmtpFakeHandle;
let ctx: ReturnType<typeof apiTestApp>;
let site: Awaited<ReturnType<typeof makeSite>>;
let officer: { email: string; password: string };
const REGULATOR = 'reports-desk@state.example';
const MONTH = '2026-10';
const OUT = path.resolve('.data/test-output');

/** Raw bytes of a binary response (supertest buffers only with a parser). */
const binary = (t: request.Test) =>
  t.buffer(true).parse((res, cb) => {
    const chunks: Buffer[] = [];
    res.on('data', (c: Buffer) => chunks.push(c));
    res.on('end', () => cb(null, Buffer.concat(chunks)));
  });

async function login(email: string, password: string) {
  const r = await request(ctx.app).post('/api/v1/auth/login').send({ email, password });
  expect(r.status, JSON.stringify(r.body)).toBe(200);
  return r.body.accessToken ?? r.body.token;
}

let officerToken: string;
const co = {
  get: (u: string) => request(ctx.app).get(u).set('Authorization', `Bearer ${officerToken}`),
  post: (u: string, b: object = {}) => request(ctx.app).post(u).set('Authorization', `Bearer ${officerToken}`).send(b),
};

beforeAll(async () => {
  smtp = await startSmtpFake({ smtpPort: 0, mailboxPort: 0 });
  ctx = apiTestApp({ SMTP_PORT: String(smtp.smtpPort) });
  const { app } = ctx;
  site = await makeSite(app);
  const lot = await makeAcidLot(app);
  const admin = await as(app, demo.admin);
  const u = await admin.post('/api/v1/users', { email: `rco-${Date.now()}@utility.example`, name: 'Report Officer', role: 'compliance_officer', organizationId: site.facility.organizationId });
  officer = { email: u.body.user.email, password: u.body.temporaryPassword };
  const permit = await admin.post('/api/v1/permits', {
    facilityId: site.facility.id, number: `RP-${Date.now()}`, issuingAuthority: 'Test authority', effectiveFrom: '2026-01-01', regulatorContacts: [{ name: 'Reports Desk', email: REGULATOR }],
  });
  expect(permit.status, JSON.stringify(permit.body)).toBe(201);
  const limit = await admin.post(`/api/v1/permits/${permit.body.id}/limits`, {
    pointId: site.point.id, parameter: 'total_alkalinity', statistic: 'daily', bound: 'minimum', value: '50', units: 'mg/L as CaCO3', significantFigures: 2, effectiveFrom: '2026-01-01',
  });
  expect(limit.status).toBe(201);
  const analyst = await as(app, demo.analyst);
  // 4.00 mL and 6.00 mL × 0.0200 N × 50,000 / 100 mL = 40 and 60 mg/L (SM 2320 B)
  for (const [titre, d] of [[6.0, 5], [4.0, 6]] as const) {
    const { titration } = await makeResult(app, demo.analyst, { pointId: site.point.id, titrantId: lot.id, analysedAt: dayjs(`${MONTH}-0${d}T15:00:00Z`), titreMl: titre });
    const sub = await analyst.post(`/api/v1/titrations/${titration.id}/submit`, { version: titration.version });
    expect(sub.status, JSON.stringify(sub.body)).toBe(200);
    expect((await analyst.post(`/api/v1/titrations/${titration.id}/approve`, { version: sub.body.version })).status).toBe(200);
  }
  officerToken = await login(officer.email, officer.password);
});
afterAll(async () => {
  await ctx.sequelize.close();
  await smtp.close();
});

describe('monthly reports', () => {
  let id: number;
  let firstHash: string;

  it('creates one draft per facility and month (409 for a second)', async () => {
    const r = await co.post('/api/v1/reports', { facilityId: site.facility.id, month: MONTH });
    expect(r.status, JSON.stringify(r.body)).toBe(201);
    expect(r.body.status).toBe('draft');
    id = r.body.id;
    expect((await co.post('/api/v1/reports', { facilityId: site.facility.id, month: MONTH })).status).toBe(409);
    const list = await co.get(`/api/v1/reports?facilityId=${site.facility.id}&status=draft`);
    expect(list.body.items.map((x: any) => x.id)).toContain(id);
  });

  it('previews the limits, exceedances, daily table and QC summary', async () => {
    const r = await co.get(`/api/v1/reports/${id}`);
    expect(r.status).toBe(200);
    const c = r.body.content;
    expect(c.limits).toHaveLength(1);
    expect(c.limits[0]).toMatchObject({ parameter: 'total_alkalinity', statistic: 'daily', status: 'exceeded', sampleCount: 2 });
    expect(c.daily[0].values.map((v: any) => v.value).sort()).toEqual([40, 60]);
    expect(c.qc.results).toBe(2);
    expect(c.certification.wording).toMatch(/governs/);
  });

  it('exports a CSV whose values equal the compliance API', async () => {
    const admin = await as(ctx.app, demo.admin);
    const cm = (await admin.get(`/api/v1/compliance?facilityId=${site.facility.id}&month=${MONTH}`)).body;
    const csv = (await co.get(`/api/v1/reports/${id}/csv`)).text.trim().split('\n').map((l) => l.split(','));
    const head = csv[0];
    const rows = csv.slice(1).map((r) => Object.fromEntries(head.map((h, i) => [h, r[i]])));
    const limits = rows.filter((r) => r.kind === 'limit');
    expect(limits.map((r) => [r.value, r.reported, r.status])).toEqual(cm.limits.map((l: any) => [String(l.value), String(l.reported), l.status]));
    const daily = rows.filter((r) => r.kind === 'daily').map((r) => Number(r.value)).sort();
    const series = Object.values(cm.series as Record<string, { sampledAt: string; value: number }[]>).flat().filter((p) => p.sampledAt.startsWith(MONTH)).map((p) => p.value).sort();
    expect(daily).toEqual(series);
  });

  it('renders a PDF in Work Sans with the facility, month, values, statuses and units', async () => {
    const pdf = (await binary(co.get(`/api/v1/reports/${id}/pdf`))).body as Buffer;
    mkdirSync(OUT, { recursive: true });
    const file = path.join(OUT, 'report-draft.pdf');
    writeFileSync(file, pdf);
    const text = execFileSync('pdftotext', ['-layout', file, '-']).toString();
    expect(text).toContain(site.facility.name);
    expect(text).toContain(MONTH);
    expect(text).toContain('40 mg/L as CaCO3');
    expect(text).toContain('Exceeded');
    expect(text).toMatch(/Page 1 of \d/);
    expect(execFileSync('pdffonts', [file]).toString()).toMatch(/WorkSans/);
  });

  it('lets only a compliance officer certify, and needs the right password', async () => {
    for (const who of [demo.admin, demo.analyst]) {
      expect((await (await as(ctx.app, who)).post(`/api/v1/reports/${id}/certify`, { password: 'titrata-demo' })).status).toBe(403);
    }
    const wrong = await co.post(`/api/v1/reports/${id}/certify`, { password: 'not-it' });
    expect(wrong.status).toBe(400);
    expect(wrong.body.fields ?? wrong.body.error?.fields).toHaveProperty('password');
  });

  it('certifies: stores signer, wording, PDF and hash, and then refuses changes (409)', async () => {
    const r = await co.post(`/api/v1/reports/${id}/certify`, { password: officer.password, statement: 'Reviewed with the plant superintendent.' });
    expect(r.status, JSON.stringify(r.body)).toBe(200);
    expect(r.body.status).toBe('certified');
    expect(r.body.content.certification.signedBy).toContain(officer.email);
    const pdf = (await binary(co.get(`/api/v1/reports/${id}/pdf`))).body as Buffer;
    firstHash = createHash('sha256').update(pdf).digest('hex');
    expect(r.body.pdfSha256).toBe(firstHash);
    expect((await co.post(`/api/v1/reports/${id}/certify`, { password: officer.password })).status).toBe(409);
  });

  it('e-mails the certified PDF to the regulator contacts', async () => {
    const mailer = createMailer(ctx.config);
    // other files' messages may be queued ahead of ours: deliver until the outbox is empty
    for (let i = 0; i < 50 && (await deliverDue(ctx.config, mailer)).sent > 0; i++);
    mailer.close();
    const m = await smtp.waitForMessage((x) => (x.subject ?? '').includes(`Monitoring report ${MONTH}`) && JSON.stringify(x.to).includes(REGULATOR));
    expect(m.to).toContain(REGULATOR);
    const pdf = m.attachments.find((a) => a.contentType === 'application/pdf');
    expect(pdf?.filename).toBe(`report-${MONTH}-r1.pdf`);
    // the attachment is the certified PDF itself: same size as the stored one
    const stored = (await binary(co.get(`/api/v1/reports/${id}/pdf`))).body as Buffer;
    expect(pdf?.size).toBe(stored.length);
    expect(m.text).toContain(createHash('sha256').update(stored).digest('hex'));
  });

  it('a revision needs a reason, keeps the old version and its hash, and lists what changed', async () => {
    expect((await co.post(`/api/v1/reports/${id}/revisions`, {})).status).toBe(400);
    const rev = await co.post(`/api/v1/reports/${id}/revisions`, { reason: 'Re-issued after review' });
    expect(rev.status, JSON.stringify(rev.body)).toBe(201);
    expect(rev.body).toMatchObject({ revision: 2, status: 'draft', previousId: id });
    expect(Array.isArray(rev.body.changes)).toBe(true);
    const cert = await co.post(`/api/v1/reports/${rev.body.id}/certify`, { password: officer.password });
    expect(cert.status).toBe(200);
    const old = await co.get(`/api/v1/reports/${id}`);
    expect(old.body.status).toBe('revised');
    expect(old.body.pdfSha256).toBe(firstHash);
    const again = (await binary(co.get(`/api/v1/reports/${id}/pdf`))).body as Buffer;
    expect(createHash('sha256').update(again).digest('hex')).toBe(firstHash);
    expect(old.body.versions.map((v: any) => v.revision)).toEqual([1, 2]);
  });

  it('a year batch makes the missing drafts in the background, can pause and resume, and keeps its progress', async () => {
    expect((await co.post('/api/v1/report-batches', { facilityIds: [], year: 2026 })).status).toBe(400);
    const bad = await co.post('/api/v1/report-batches', { facilityIds: [site.facility.id], year: 1850 });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields).toHaveProperty('year');
    const b = await co.post('/api/v1/report-batches', { facilityIds: [site.facility.id], year: 2026 });
    expect(b.status, JSON.stringify(b.body)).toBe(201);
    expect(b.body).toMatchObject({ total: 12, done: 0, status: 'running' });
    expect((await co.post(`/api/v1/report-batches/${b.body.id}/state`, { action: 'pause' })).body.status).toBe('paused');
    await processReportBatches(100);
    expect((await co.get(`/api/v1/report-batches/${b.body.id}`)).body.done).toBe(0);
    await co.post(`/api/v1/report-batches/${b.body.id}/state`, { action: 'resume' });
    await processReportBatches(5);
    const half = (await co.get(`/api/v1/report-batches/${b.body.id}`)).body;
    expect(half.done).toBeGreaterThanOrEqual(5);
    expect(half.status).toBe('running');
    while ((await processReportBatches(6)) > 0);
    const done = (await co.get(`/api/v1/report-batches/${b.body.id}`)).body;
    expect(done).toMatchObject({ status: 'finished', done: 12, failed: 0 });
    // October already had its report (two versions); the batch leaves it alone.
    expect(done.items.find((i: any) => i.month === MONTH).state).toBe('existing');
    expect(done.items.filter((i: any) => i.state === 'made')).toHaveLength(11);
    const list = await co.get(`/api/v1/reports?facilityId=${site.facility.id}&year=2026`);
    expect(new Set(list.body.items.map((x: any) => x.month)).size).toBe(12);
    expect((await co.post(`/api/v1/report-batches/${b.body.id}/state`, { action: 'pause' })).status).toBe(409);
  });
});
