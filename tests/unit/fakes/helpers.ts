// Shared pieces for the fakes' tests: the real SDK pointed at the fake, a tiny webhook
// receiver that verifies signatures the way the product will, and polling.
import express from 'express';
import Stripe from 'stripe';
import { listenHttp } from '../../../fakes/common.js';

export const TEST_KEY = 'sk_test_titrata_unit';
export const WEBHOOK_SECRET = 'whsec_unit_tests';

export function sdk(port: number, key = TEST_KEY): Stripe {
  return new Stripe(key, { host: '127.0.0.1', port, protocol: 'http', maxNetworkRetries: 0, telemetry: false });
}

export async function waitFor<T>(probe: () => T | undefined | null | false, timeoutMs = 5000, what = 'condition'): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const value = probe();
    if (value) return value;
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 10));
  }
}

export interface Received {
  event: Stripe.Event;
  raw: string;
  signature: string;
  status: number;
}

/**
 * A stand-in for the product's webhook endpoint: raw body, signature checked with the SDK's
 * constructEvent, answer chosen by `respond` (default 200).
 */
export async function startReceiver(opts: { secret?: string; respond?: (event: Stripe.Event, deliveryNumber: number) => number } = {}) {
  const secret = opts.secret ?? WEBHOOK_SECRET;
  const received: Received[] = [];
  const rejected: { raw: string; signature: string; error: string }[] = [];
  const perEvent = new Map<string, number>();
  const app = express();
  app.post('/webhook', express.raw({ type: 'application/json' }), (req, res) => {
    const raw = (req.body as Buffer).toString('utf8');
    const signature = req.get('stripe-signature') ?? '';
    let event: Stripe.Event;
    try {
      event = Stripe.webhooks.constructEvent(req.body as Buffer, signature, secret);
    } catch (err) {
      rejected.push({ raw, signature, error: (err as Error).message });
      return res.status(400).send('bad signature');
    }
    const n = (perEvent.get(event.id) ?? 0) + 1;
    perEvent.set(event.id, n);
    const status = opts.respond?.(event, n) ?? 200;
    received.push({ event, raw, signature, status });
    res.status(status).json({ received: status < 300 });
  });
  const server = await listenHttp(app, 0, '127.0.0.1');
  return {
    url: `http://127.0.0.1:${server.port}/webhook`,
    received,
    rejected,
    /** Accepted (2xx) deliveries of one event type. */
    ok: (type: string) => received.filter((r) => r.event.type === type && r.status < 300),
    close: () => server.close(),
  };
}

/** Pays on the hosted page the way a browser form would. */
export function payOnPage(url: string, cardNumber: string, extra: Record<string, string> = {}, accept?: string) {
  return fetch(url, {
    method: 'POST',
    headers: accept ? { Accept: accept } : {},
    body: new URLSearchParams({ card_number: cardNumber, action: 'pay', ...extra }),
    redirect: 'manual',
  });
}

export function sessionParams(extra: Partial<Stripe.Checkout.SessionCreateParams> = {}): Stripe.Checkout.SessionCreateParams {
  return {
    mode: 'payment',
    success_url: 'http://127.0.0.1:8080/billing/paid?session={CHECKOUT_SESSION_ID}',
    cancel_url: 'http://127.0.0.1:8080/billing/invoices/42',
    client_reference_id: 'inv_42',
    metadata: { invoiceId: '42' },
    line_items: [
      { quantity: 3, price_data: { currency: 'usd', unit_amount: 2500, product_data: { name: 'Total alkalinity' } } },
      { quantity: 1, price_data: { currency: 'usd', unit_amount: 1075, product_data: { name: 'Rush surcharge' } } },
    ],
    ...extra,
  };
}
