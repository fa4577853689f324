// Webhook signing, retries with backoff, replays and delivery controls.
import { afterEach, describe, expect, it } from 'vitest';
import Stripe from 'stripe';
import { startPaymentsFake } from '../../../fakes/payments/server.js';
import type { PaymentsFakeHandle, PaymentsFakeOptions } from '../../../fakes/payments/server.js';
import { signatureHeader } from '../../../fakes/payments/webhooks.js';
import { payOnPage, sdk, sessionParams, startReceiver, waitFor, WEBHOOK_SECRET } from './helpers.js';

const cleanups: (() => Promise<void>)[] = [];
afterEach(async () => {
  while (cleanups.length) await cleanups.pop()!();
});

async function setup(respond?: (event: Stripe.Event, n: number) => number, options: Partial<PaymentsFakeOptions> = {}) {
  const receiver = await startReceiver({ respond });
  cleanups.push(() => receiver.close());
  const fake: PaymentsFakeHandle = await startPaymentsFake({
    port: 0,
    webhookUrl: receiver.url,
    webhookSecret: WEBHOOK_SECRET,
    webhookRetry: { attempts: 3, baseDelayMs: 40 },
    ...options,
  });
  cleanups.push(() => fake.close());
  const stripe = sdk(fake.port);
  const pay = async (card = '4242424242424242') => {
    const session = await stripe.checkout.sessions.create(sessionParams());
    await payOnPage(session.url!, card);
    return session;
  };
  return { receiver, fake, stripe, pay };
}

describe('payments fake: webhook signatures', () => {
  it('signs exactly as constructEvent verifies, and a tampered body or wrong secret fails', async () => {
    const { receiver, pay } = await setup();
    await pay();
    const delivered = await waitFor(() => receiver.ok('checkout.session.completed')[0], 5000, 'delivery');

    // Verified once more here, outside the receiver, with the raw body it got.
    const event = Stripe.webhooks.constructEvent(delivered.raw, delivered.signature, WEBHOOK_SECRET);
    expect(event.id).toBe(delivered.event.id);

    const tampered = delivered.raw.replace('"paid"', '"unpaid"');
    expect(() => Stripe.webhooks.constructEvent(tampered, delivered.signature, WEBHOOK_SECRET)).toThrow(
      Stripe.errors.StripeSignatureVerificationError,
    );
    expect(() => Stripe.webhooks.constructEvent(delivered.raw, delivered.signature, 'whsec_other')).toThrow(
      Stripe.errors.StripeSignatureVerificationError,
    );
  });

  it('matches the SDK’s own test header for the same timestamp', () => {
    const payload = JSON.stringify({ id: 'evt_1', object: 'event' });
    const timestamp = 1_700_000_000;
    expect(signatureHeader(payload, WEBHOOK_SECRET, timestamp)).toBe(
      Stripe.webhooks.generateTestHeaderString({ payload, secret: WEBHOOK_SECRET, timestamp }),
    );
  });

  it('is refused by a receiver holding another secret (the receiver answers 400, the fake retries)', async () => {
    const receiver = await startReceiver({ secret: 'whsec_not_the_same' });
    cleanups.push(() => receiver.close());
    const fake = await startPaymentsFake({ port: 0, webhookUrl: receiver.url, webhookSecret: WEBHOOK_SECRET, webhookRetry: { attempts: 2, baseDelayMs: 10 } });
    cleanups.push(() => fake.close());
    const stripe = sdk(fake.port);
    const session = await stripe.checkout.sessions.create(sessionParams());
    await payOnPage(session.url!, '4242424242424242');
    await fake.idle();
    expect(receiver.received).toEqual([]);
    expect(receiver.rejected.length).toBeGreaterThan(0);
    expect(fake.deliveries().every((d) => d.status === 400 && !d.ok)).toBe(true);
  });
});

describe('payments fake: webhook retries', () => {
  it('retries with backoff when the receiver first answers 500', async () => {
    const { receiver, fake, pay } = await setup((event, n) => (event.type === 'checkout.session.completed' && n === 1 ? 500 : 200));
    await pay();
    await fake.idle();

    const completed = receiver.received.filter((r) => r.event.type === 'checkout.session.completed');
    expect(completed.map((r) => r.status)).toEqual([500, 200]);
    // Same event both times, each attempt freshly signed.
    expect(completed[0].event.id).toBe(completed[1].event.id);

    const attempts = fake.deliveries().filter((d) => d.type === 'checkout.session.completed');
    expect(attempts.map((a) => [a.attempt, a.status, a.ok])).toEqual([
      [1, 500, false],
      [2, 200, true],
    ]);
    const gap = Date.parse(attempts[1].at) - Date.parse(attempts[0].at);
    expect(gap).toBeGreaterThanOrEqual(35);

    const event = fake.events().find((e) => e.type === 'checkout.session.completed')!;
    expect(event.pending_webhooks).toBe(0);
  });

  it('gives up after the configured number of attempts, doubling the delay', async () => {
    const { receiver, fake, pay } = await setup(() => 503, { enabledEvents: ['checkout.session.completed'] });
    await pay();
    await fake.idle();
    expect(receiver.received.map((r) => r.status)).toEqual([503, 503, 503]);
    const at = fake.deliveries().map((d) => Date.parse(d.at));
    expect(at[2] - at[1]).toBeGreaterThanOrEqual(at[1] - at[0]);
    expect(fake.events().find((e) => e.type === 'checkout.session.completed')!.pending_webhooks).toBe(1);
  });

  it('treats an unreachable endpoint as a failed attempt', async () => {
    const fake = await startPaymentsFake({ port: 0, webhookUrl: 'http://127.0.0.1:9/nothing-listens', webhookRetry: { attempts: 2, baseDelayMs: 10 } });
    cleanups.push(() => fake.close());
    const stripe = sdk(fake.port);
    const session = await stripe.checkout.sessions.create(sessionParams());
    await payOnPage(session.url!, '4242424242424242');
    await fake.idle();
    const attempts = fake.deliveries().filter((d) => d.type === 'checkout.session.completed');
    expect(attempts).toHaveLength(2);
    expect(attempts[0]).toMatchObject({ status: null, ok: false, error: expect.any(String) });
  });
});

describe('payments fake: replays and delivery controls', () => {
  it('resends an event on request, so the same event id arrives twice', async () => {
    const { receiver, fake, pay } = await setup();
    await pay();
    const first = await waitFor(() => receiver.ok('checkout.session.completed')[0], 5000, 'first delivery');
    const res = await fetch(`${fake.url}/_fake/webhooks/resend/${first.event.id}`, { method: 'POST' });
    expect(res.status).toBe(200);
    expect((await res.json()).delivery).toMatchObject({ eventId: first.event.id, status: 200, ok: true, reason: 'resend' });
    const both = receiver.ok('checkout.session.completed');
    expect(both.map((r) => r.event.id)).toEqual([first.event.id, first.event.id]);
    expect(both[1].raw).toBe(both[0].raw);

    expect((await fetch(`${fake.url}/_fake/webhooks/resend/evt_unknown`, { method: 'POST' })).status).toBe(404);
  });

  it('holds events when autoDeliver is off, so a test can deliver them in any order', async () => {
    const { receiver, fake, pay } = await setup(undefined, { autoDeliver: false });
    await pay();
    await fake.idle();
    expect(receiver.received).toEqual([]);
    const types = fake.events().map((e) => e.type);
    expect(types).toEqual(['charge.succeeded', 'payment_intent.succeeded', 'checkout.session.completed']);

    // Out of order: the session completes before its payment intent succeeds.
    for (const type of ['checkout.session.completed', 'payment_intent.succeeded']) {
      await fake.resend(fake.events().find((e) => e.type === type)!.id);
    }
    expect(receiver.received.map((r) => r.event.type)).toEqual(['checkout.session.completed', 'payment_intent.succeeded']);
  });

  it('sends only the enabled event types but stores them all', async () => {
    const { receiver, fake, pay } = await setup(undefined, { enabledEvents: ['checkout.session.completed', 'payment_intent.payment_failed'] });
    await pay('4000000000000002');
    await pay();
    await fake.idle();
    expect(receiver.received.map((r) => r.event.type).sort()).toEqual(['checkout.session.completed', 'payment_intent.payment_failed']);
    expect(fake.events().length).toBeGreaterThan(2);
  });

  it('reset over HTTP forgets objects, events and deliveries', async () => {
    const { fake, stripe, pay } = await setup();
    await pay();
    await fake.idle();
    expect(fake.deliveries().length).toBeGreaterThan(0);
    const res = await fetch(`${fake.url}/_fake/reset`, { method: 'POST' });
    expect(res.status).toBe(200);
    expect(fake.events()).toEqual([]);
    expect(fake.deliveries()).toEqual([]);
    expect((await stripe.checkout.sessions.list()).data).toEqual([]);
  });
});
