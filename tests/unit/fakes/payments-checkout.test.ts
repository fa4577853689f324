// Checkout through the hosted pay page, webhooks verified by the SDK, refunds, expiry.
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import Stripe from 'stripe';
import { startPaymentsFake } from '../../../fakes/payments/server.js';
import type { PaymentsFakeHandle } from '../../../fakes/payments/server.js';
import { payOnPage, sdk, sessionParams, startReceiver, waitFor, WEBHOOK_SECRET } from './helpers.js';

let fake: PaymentsFakeHandle;
let stripe: Stripe;
let receiver: Awaited<ReturnType<typeof startReceiver>>;

beforeAll(async () => {
  receiver = await startReceiver();
  fake = await startPaymentsFake({
    port: 0,
    webhookUrl: receiver.url,
    webhookSecret: WEBHOOK_SECRET,
    webhookRetry: { attempts: 3, baseDelayMs: 20 },
  });
  stripe = sdk(fake.port);
});
afterAll(async () => {
  await fake.close();
  await receiver.close();
});
beforeEach(async () => {
  await fake.reset();
  receiver.received.length = 0;
  receiver.rejected.length = 0;
});

async function newSession(extra: Partial<Stripe.Checkout.SessionCreateParams> = {}) {
  const customer = await stripe.customers.create({ email: 'billing@utility.test', name: 'Riverbend Water' });
  const session = await stripe.checkout.sessions.create(sessionParams({ customer: customer.id, ...extra }));
  return { customer, session };
}

describe('payments fake: checkout session', () => {
  it('creates an open session whose url is the fake’s own hosted page', async () => {
    const { customer, session } = await newSession();
    expect(session.id).toMatch(/^cs_test_/);
    expect(session).toMatchObject({
      object: 'checkout.session',
      mode: 'payment',
      status: 'open',
      payment_status: 'unpaid',
      payment_intent: null,
      customer: customer.id,
      currency: 'usd',
      amount_subtotal: 3 * 2500 + 1075,
      amount_total: 8575,
      client_reference_id: 'inv_42',
      metadata: { invoiceId: '42' },
      url: `${fake.url}/pay/${session.id}`,
      livemode: false,
    });
    expect(session.expires_at - session.created).toBe(24 * 3600);

    const items = await stripe.checkout.sessions.listLineItems(session.id);
    expect(items.data.map((i) => [i.description, i.quantity, i.amount_total])).toEqual([
      ['Total alkalinity', 3, 7500],
      ['Rush surcharge', 1, 1075],
    ]);
  });

  it('serves a self-contained pay page with escaped content and a strict CSP', async () => {
    const { session } = await newSession({
      line_items: [{ quantity: 1, price_data: { currency: 'usd', unit_amount: 5000, product_data: { name: '<script>alert("x")</script>' } } }],
    });
    const res = await fetch(session.url!);
    expect(res.status).toBe(200);
    const csp = res.headers.get('content-security-policy')!;
    expect(csp).toContain("default-src 'none'");
    expect(csp).toContain("style-src 'self'");
    expect(csp).toContain('form-action');
    const html = await res.text();
    expect(html).toContain('$50.00');
    expect(html).toContain('&lt;script&gt;alert(&quot;x&quot;)&lt;/script&gt;');
    expect(html).not.toMatch(/<script/i);
    expect(html).not.toMatch(/ on\w+=/i);
    expect(html).not.toMatch(/https?:\/\/(?!127\.0\.0\.1)[^"]*\.(css|js)/);
    expect(html).toMatch(/name="card_number"/);
    const css = await fetch(`${fake.url}/pay/assets/pay.css`);
    expect(css.headers.get('content-type')).toContain('text/css');
  });

  it('pays with the success card: 303 to success_url, session paid, signed webhooks delivered', async () => {
    const { session } = await newSession();
    const res = await payOnPage(session.url!, '4242 4242 4242 4242');
    expect(res.status).toBe(303);
    expect(res.headers.get('location')).toBe(`http://127.0.0.1:8080/billing/paid?session=${session.id}`);

    const paid = await stripe.checkout.sessions.retrieve(session.id, { expand: ['payment_intent', 'payment_intent.latest_charge'] });
    expect(paid).toMatchObject({ status: 'complete', payment_status: 'paid', url: null });
    const pi = paid.payment_intent as Stripe.PaymentIntent;
    expect(pi.id).toMatch(/^pi_/);
    expect(pi).toMatchObject({ status: 'succeeded', amount: 8575, amount_received: 8575, currency: 'usd', customer: paid.customer });
    const charge = pi.latest_charge as Stripe.Charge;
    expect(charge.id).toMatch(/^ch_/);
    expect(charge).toMatchObject({ status: 'succeeded', paid: true, amount: 8575, payment_intent: pi.id });
    expect(charge.payment_method_details?.card).toMatchObject({ brand: 'visa', last4: '4242' });

    const completed = await waitFor(() => receiver.ok('checkout.session.completed')[0], 5000, 'checkout.session.completed');
    expect(completed.event.id).toMatch(/^evt_/);
    expect(completed.event).toMatchObject({ object: 'event', livemode: false, api_version: Stripe.API_VERSION });
    expect(completed.signature).toMatch(/^t=\d+,v1=[0-9a-f]{64}$/);
    const object = completed.event.data.object as Stripe.Checkout.Session;
    expect(object).toMatchObject({ id: session.id, payment_status: 'paid', metadata: { invoiceId: '42' }, client_reference_id: 'inv_42', payment_intent: pi.id });
    await waitFor(() => receiver.ok('payment_intent.succeeded')[0], 5000, 'payment_intent.succeeded');
    expect(receiver.rejected).toEqual([]);

    // The same event through the API, as a product may re-fetch it.
    const fetched = await stripe.events.retrieve(completed.event.id);
    expect(fetched.type).toBe('checkout.session.completed');
    const listed = await stripe.events.list({ type: 'checkout.session.completed' });
    expect(listed.data.map((e) => e.id)).toEqual([completed.event.id]);

    // Paying again (a double submit) charges nothing more.
    const again = await payOnPage(session.url!, '4242424242424242');
    expect(again.status).toBe(303);
    expect((await stripe.charges.list({ payment_intent: pi.id })).data).toHaveLength(1);
  });

  it('declines 4000000000000002: reason on the page, payment_failed webhook, retry then succeeds', async () => {
    const { session } = await newSession();
    const res = await payOnPage(session.url!, '4000000000000002');
    expect(res.status).toBe(402);
    const html = await res.text();
    expect(html).toContain('Your card was declined.');
    expect(html).toMatch(/name="card_number"/);
    expect(html).toContain('value="cancel"');

    const failed = await waitFor(() => receiver.ok('payment_intent.payment_failed')[0], 5000, 'payment_intent.payment_failed');
    const failedPi = failed.event.data.object as Stripe.PaymentIntent;
    expect(failedPi.status).toBe('requires_payment_method');
    expect(failedPi.last_payment_error).toMatchObject({ type: 'card_error', code: 'card_declined', decline_code: 'generic_decline' });

    const open = await stripe.checkout.sessions.retrieve(session.id);
    expect(open).toMatchObject({ status: 'open', payment_status: 'unpaid', payment_intent: failedPi.id });

    // Reloading the page still shows why.
    expect(await (await fetch(session.url!)).text()).toContain('Your card was declined.');

    const retry = await payOnPage(session.url!, '4242424242424242');
    expect(retry.status).toBe(303);
    const pi = await stripe.paymentIntents.retrieve(failedPi.id);
    expect(pi).toMatchObject({ status: 'succeeded', last_payment_error: null });
    expect((await stripe.charges.list({ payment_intent: pi.id })).data.map((c) => c.status)).toEqual(['succeeded', 'failed']);
  });

  it('declines 4000000000009995 for insufficient funds, with a 402 card_error for JSON clients', async () => {
    const { session } = await newSession();
    const res = await payOnPage(session.url!, '4000000000009995', {}, 'application/json');
    expect(res.status).toBe(402);
    const body = await res.json();
    expect(body.error).toMatchObject({ type: 'card_error', code: 'card_declined', decline_code: 'insufficient_funds', message: 'Your card has insufficient funds.' });
    // The shape is the one the SDK turns into its card error.
    const typed = Stripe.errors.StripeError.generate({ ...body.error, statusCode: 402 });
    expect(typed).toBeInstanceOf(Stripe.errors.StripeCardError);
    expect(typed).toMatchObject({ decline_code: 'insufficient_funds' });

    const html = await (await payOnPage(session.url!, '4000000000009995')).text();
    expect(html).toContain('Your card has insufficient funds.');
  });

  it('rejects a mistyped card number without charging, and Cancel goes to cancel_url', async () => {
    const { session } = await newSession();
    const bad = await payOnPage(session.url!, '4242424242424241');
    expect(bad.status).toBe(400);
    expect(await bad.text()).toContain('Your card number is invalid.');
    expect((await stripe.checkout.sessions.retrieve(session.id)).payment_intent).toBeNull();

    const cancel = await fetch(session.url!, { method: 'POST', body: new URLSearchParams({ action: 'cancel' }), redirect: 'manual' });
    expect(cancel.status).toBe(303);
    expect(cancel.headers.get('location')).toBe('http://127.0.0.1:8080/billing/invoices/42');
    expect((await stripe.checkout.sessions.retrieve(session.id)).status).toBe('open');
  });

  it('expires an open session once; its page then says so', async () => {
    const { session } = await newSession();
    const expired = await stripe.checkout.sessions.expire(session.id);
    expect(expired).toMatchObject({ status: 'expired', url: null });
    await expect(stripe.checkout.sessions.expire(session.id)).rejects.toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
    const page = await fetch(`${fake.url}/pay/${session.id}`);
    expect(page.status).toBe(410);
    expect((await payOnPage(`${fake.url}/pay/${session.id}`, '4242424242424242')).status).toBe(410);
    await waitFor(() => receiver.ok('checkout.session.expired')[0], 5000, 'checkout.session.expired');
    expect((await fetch(`${fake.url}/pay/cs_test_nothing`)).status).toBe(404);
  });
});

describe('payments fake: refunds', () => {
  async function paidIntent() {
    const { session } = await newSession();
    await payOnPage(session.url!, '4242424242424242');
    const paid = await stripe.checkout.sessions.retrieve(session.id);
    return paid.payment_intent as string;
  }

  it('refunds in part, then the rest, then refuses; each refund sends charge.refunded', async () => {
    const pi = await paidIntent();
    const partial = await stripe.refunds.create({ payment_intent: pi, amount: 1075, reason: 'requested_by_customer' });
    expect(partial.id).toMatch(/^re_/);
    expect(partial).toMatchObject({ object: 'refund', amount: 1075, status: 'succeeded', payment_intent: pi, currency: 'usd' });

    const tooMuch = await stripe.refunds.create({ payment_intent: pi, amount: 9000 }).catch((e: unknown) => e);
    expect(tooMuch).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
    expect(tooMuch).toMatchObject({ statusCode: 400, code: 'amount_too_large', param: 'amount' });

    const rest = await stripe.refunds.create({ payment_intent: pi });
    expect(rest.amount).toBe(8575 - 1075);

    const charge = await stripe.charges.retrieve(rest.charge as string);
    expect(charge).toMatchObject({ amount_refunded: 8575, refunded: true });

    await expect(stripe.refunds.create({ payment_intent: pi })).rejects.toMatchObject({ code: 'charge_already_refunded', statusCode: 400 });
    expect(await stripe.refunds.retrieve(partial.id)).toMatchObject({ id: partial.id, amount: 1075 });

    const refunded = await waitFor(() => (receiver.ok('charge.refunded').length === 2 ? receiver.ok('charge.refunded') : null), 5000, 'two charge.refunded');
    const amounts = refunded.map((r) => (r.event.data.object as Stripe.Charge).amount_refunded).sort((a, b) => a - b);
    expect(amounts).toEqual([1075, 8575]);
  });

  it('refuses to refund an unpaid intent and an unknown one', async () => {
    const { session } = await newSession();
    await payOnPage(session.url!, '4000000000000002');
    const pi = (await stripe.checkout.sessions.retrieve(session.id)).payment_intent as string;
    await expect(stripe.refunds.create({ payment_intent: pi })).rejects.toMatchObject({ statusCode: 400, param: 'payment_intent' });
    await expect(stripe.refunds.create({ payment_intent: 'pi_unknown' })).rejects.toMatchObject({ statusCode: 400, code: 'resource_missing' });
    await expect(stripe.refunds.create({})).rejects.toMatchObject({ statusCode: 400, param: 'payment_intent' });
    await expect(stripe.refunds.retrieve('re_unknown')).rejects.toMatchObject({ statusCode: 404 });
  });
});
