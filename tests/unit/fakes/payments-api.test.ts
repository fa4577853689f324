// The payment API fake through the real SDK: wire format, auth, errors, idempotency.
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import Stripe from 'stripe';
import { startPaymentsFake } from '../../../fakes/payments/server.js';
import type { PaymentsFakeHandle } from '../../../fakes/payments/server.js';
import { sdk, sessionParams, TEST_KEY } from './helpers.js';

let fake: PaymentsFakeHandle;
let stripe: Stripe;

beforeAll(async () => {
  fake = await startPaymentsFake({ port: 0, webhookUrl: null });
  stripe = sdk(fake.port);
});
afterAll(async () => {
  await fake.close();
});
beforeEach(async () => {
  await fake.reset();
});

describe('payments fake: customers', () => {
  it('creates, retrieves, updates and lists customers with nested metadata', async () => {
    const created = await stripe.customers.create({
      email: 'billing@utility.test',
      name: 'Riverbend Water Utility',
      metadata: { utilityId: '17', plan: 'contract' },
    });
    expect(created.id).toMatch(/^cus_[0-9A-Za-z]{14}$/);
    expect(created).toMatchObject({ object: 'customer', livemode: false, email: 'billing@utility.test', metadata: { utilityId: '17', plan: 'contract' } });
    expect(typeof created.created).toBe('number');

    const got = await stripe.customers.retrieve(created.id);
    expect(got).toEqual({ ...created });
    expect(got.lastResponse.requestId).toMatch(/^req_/);

    // An empty metadata value removes the key.
    const updated = await stripe.customers.update(created.id, { name: 'Riverbend Water', metadata: { plan: '' } });
    expect(updated).toMatchObject({ name: 'Riverbend Water', metadata: { utilityId: '17' } });

    await stripe.customers.create({ email: 'other@utility.test' });
    const byEmail = await stripe.customers.list({ email: 'billing@utility.test' });
    expect(byEmail).toMatchObject({ object: 'list', has_more: false, url: '/v1/customers' });
    expect(byEmail.data.map((c) => c.id)).toEqual([created.id]);

    // Newest first, cursor pagination; the SDK's auto-pagination walks every page.
    const page = await stripe.customers.list({ limit: 1 });
    expect(page.has_more).toBe(true);
    const ids: string[] = [];
    for await (const c of stripe.customers.list({ limit: 1 })) ids.push(c.id);
    expect(ids).toHaveLength(2);
    expect(ids[1]).toBe(created.id);
  });
});

describe('payments fake: errors as the SDK types them', () => {
  it('a missing object is a 404 StripeInvalidRequestError with code resource_missing', async () => {
    const err = await stripe.customers.retrieve('cus_doesnotexist').catch((e: unknown) => e);
    expect(err).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
    expect(err).toMatchObject({ statusCode: 404, code: 'resource_missing', param: 'id', message: "No such customer: 'cus_doesnotexist'" });
  });

  it('a missing parameter is a 400 StripeInvalidRequestError naming the param', async () => {
    const err = await stripe.checkout.sessions.create({ mode: 'payment', success_url: 'http://127.0.0.1:8080/ok' }).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
    expect(err).toMatchObject({ statusCode: 400, type: 'StripeInvalidRequestError', rawType: 'invalid_request_error', code: 'parameter_missing', param: 'line_items' });

    const nested = await stripe.checkout.sessions
      .create(sessionParams({ line_items: [{ price_data: { currency: 'usd', unit_amount: 100, product_data: { name: 'x' } } }] }))
      .catch((e: unknown) => e);
    expect(nested).toMatchObject({ statusCode: 400, param: 'line_items[0][quantity]', message: 'Missing required param: line_items[0][quantity].' });
  });

  it('names an object missing from the parameters with a 400, not a 404', async () => {
    const err = await stripe.checkout.sessions.create(sessionParams({ customer: 'cus_gone' })).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
    expect(err).toMatchObject({ statusCode: 400, code: 'resource_missing', param: 'customer' });
  });

  it('refuses unknown parameters and malformed integers', async () => {
    const unknown = await stripe.customers.create({ email: 'a@b.test', colour: 'blue' } as Stripe.CustomerCreateParams).catch((e: unknown) => e);
    expect(unknown).toMatchObject({ statusCode: 400, code: 'parameter_unknown', param: 'colour' });
    const badInt = await stripe.customers.list({ limit: 'many' as unknown as number }).catch((e: unknown) => e);
    expect(badInt).toMatchObject({ statusCode: 400, code: 'parameter_invalid_integer', param: 'limit' });
  });

  it('rejects keys that are not test secret keys with 401 StripeAuthenticationError', async () => {
    const live = sdk(fake.port, 'sk_live_0123456789abcdef');
    const err = await live.customers.list().catch((e: unknown) => e);
    expect(err).toBeInstanceOf(Stripe.errors.StripeAuthenticationError);
    expect(err).toMatchObject({ statusCode: 401 });
    expect((err as Error).message).not.toContain('0123456789ab');

    const raw = await fetch(`${fake.url}/v1/customers`);
    expect(raw.status).toBe(401);
    const body = await raw.json();
    expect(body.error).toMatchObject({ type: 'invalid_request_error', message: expect.stringContaining('did not provide an API key') });
  });

  it('answers unknown routes with the provider error shape', async () => {
    const res = await fetch(`${fake.url}/v1/widgets`, { headers: { Authorization: `Bearer ${TEST_KEY}` } });
    expect(res.status).toBe(404);
    expect((await res.json()).error.message).toContain('Unrecognized request URL (GET: /v1/widgets)');
  });

  it('accepts the raw form encoding the SDK sends, bracketed keys included', async () => {
    const res = await fetch(`${fake.url}/v1/customers`, {
      method: 'POST',
      headers: { Authorization: `Bearer ${TEST_KEY}`, 'Content-Type': 'application/x-www-form-urlencoded' },
      body: 'email=raw%40utility.test&metadata[invoiceId]=42&metadata%5Bsource%5D=curl',
    });
    expect(res.status).toBe(200);
    expect(res.headers.get('request-id')).toMatch(/^req_/);
    expect(await res.json()).toMatchObject({ email: 'raw@utility.test', metadata: { invoiceId: '42', source: 'curl' } });
  });
});

describe('payments fake: idempotency keys', () => {
  it('replays the first result for the same key and parameters', async () => {
    const first = await stripe.customers.create({ email: 'idem@utility.test' }, { idempotencyKey: 'invoice-42-customer' });
    const again = await stripe.customers.create({ email: 'idem@utility.test' }, { idempotencyKey: 'invoice-42-customer' });
    expect(again.id).toBe(first.id);
    expect((again.lastResponse.headers as Record<string, string>)['idempotent-replayed']).toBe('true');
    expect((await stripe.customers.list()).data).toHaveLength(1);
  });

  it('refuses the same key with different parameters as StripeIdempotencyError', async () => {
    await stripe.checkout.sessions.create(sessionParams(), { idempotencyKey: 'pay-42' });
    const err = await stripe.checkout.sessions
      .create(sessionParams({ metadata: { invoiceId: '43' } }), { idempotencyKey: 'pay-42' })
      .catch((e: unknown) => e);
    expect(err).toBeInstanceOf(Stripe.errors.StripeIdempotencyError);
    expect(err).toMatchObject({ statusCode: 400, rawType: 'idempotency_error' });
  });

  it('does not save a result that failed parameter validation', async () => {
    await expect(stripe.customers.create({ email: 'not-an-email' }, { idempotencyKey: 'k1' })).rejects.toMatchObject({ code: 'email_invalid' });
    const ok = await stripe.customers.create({ email: 'fixed@utility.test' }, { idempotencyKey: 'k1' });
    expect(ok.email).toBe('fixed@utility.test');
  });
});

describe('payments fake: list filters and expansion', () => {
  it('filters lists by created and expands ids into objects', async () => {
    const customer = await stripe.customers.create({ email: 'x@utility.test' });
    await stripe.checkout.sessions.create(sessionParams({ customer: customer.id }));
    expect((await stripe.customers.list({ created: { gte: customer.created } })).data).toHaveLength(1);
    expect((await stripe.customers.list({ created: { gt: customer.created } })).data).toHaveLength(0);

    const sessions = await stripe.checkout.sessions.list({ customer: customer.id, expand: ['data.customer'] });
    expect(sessions.data).toHaveLength(1);
    expect(sessions.data[0].customer).toMatchObject({ id: customer.id, object: 'customer' });

    const err = await stripe.customers.retrieve(customer.id, { expand: ['invoice_settings'] }).catch((e: unknown) => e);
    expect(err).toMatchObject({ statusCode: 400, param: 'expand' });
  });
});

