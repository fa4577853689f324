// Signed webhook delivery with retries.
// Signature scheme: the provider's docs "Verify webhook signatures" — header
// `Stripe-Signature: t=<unix seconds>,v1=<hex HMAC-SHA256 of "<t>.<raw body>" keyed by the
// endpoint secret>`; the SDK's webhooks.constructEvent checks exactly this (node_modules/stripe
// esm/Webhooks.js) and refuses timestamps older than 300 s, so every attempt is signed afresh.
// Retries: the real service retries non-2xx answers with exponential backoff for up to three
// days; here the schedule is short and configurable.
import { createHmac } from 'node:crypto';
import type { ProviderEvent } from './types.js';

export interface RetryPolicy {
  /** Total attempts per delivery, the first included. */
  attempts: number;
  /** Delay before the second attempt; doubles each time. */
  baseDelayMs: number;
  maxDelayMs: number;
  /** How long to wait for the endpoint to answer one attempt. */
  timeoutMs: number;
}

export const DEFAULT_RETRY: RetryPolicy = { attempts: 6, baseDelayMs: 1000, maxDelayMs: 60_000, timeoutMs: 10_000 };

export interface WebhookConfig {
  url: string | null;
  secret: string;
  retry: RetryPolicy;
  /** Event types delivered to the endpoint; '*' for all (the provider's "enabled_events"). */
  enabledEvents: string[];
  /** false: events are stored but only sent through resend(), so tests can choose the order. */
  autoDeliver: boolean;
}

export interface DeliveryAttempt {
  eventId: string;
  type: string;
  attempt: number;
  /** 'auto' for the event's own delivery, 'resend' for a replay requested by a test. */
  reason: 'auto' | 'resend';
  url: string;
  at: string;
  status: number | null;
  ok: boolean;
  error: string | null;
  durationMs: number;
}

export function signatureHeader(payload: string, secret: string, timestamp = Math.floor(Date.now() / 1000)): string {
  const signature = createHmac('sha256', secret).update(`${timestamp}.${payload}`, 'utf8').digest('hex');
  return `t=${timestamp},v1=${signature}`;
}

export function wantsEvent(enabled: string[], type: string): boolean {
  return enabled.includes('*') || enabled.includes(type);
}

export class WebhookSender {
  readonly log: DeliveryAttempt[] = [];
  private pending = new Set<Promise<void>>();
  private abort = new AbortController();
  /** First attempts go out one at a time in event order; retries run on their own. */
  private queue: Promise<unknown> = Promise.resolve();

  constructor(private readonly config: () => WebhookConfig) {}

  /**
   * Sends an event, retrying on failure. Resolves with the first attempt (null when there is no
   * endpoint or it does not take this type); retries continue in the background.
   */
  send(event: ProviderEvent, reason: 'auto' | 'resend'): Promise<DeliveryAttempt | null> {
    const { url, enabledEvents } = this.config();
    if (!url || !wantsEvent(enabledEvents, event.type)) return Promise.resolve(null);
    event.pending_webhooks = 1;
    let resolveFirst!: (a: DeliveryAttempt | null) => void;
    const first = new Promise<DeliveryAttempt | null>((r) => (resolveFirst = r));
    const chain = (async () => {
      await (this.queue = this.queue.then(async () => {
        const result = await this.attempt(event, 1, reason);
        resolveFirst(result);
        return result;
      }));
      const firstResult = await first;
      if (!firstResult || firstResult.ok) return;
      for (let n = 2; n <= this.config().retry.attempts; n++) {
        if (this.abort.signal.aborted) return;
        const retry = this.config().retry;
        await this.sleep(Math.min(retry.baseDelayMs * 2 ** (n - 2), retry.maxDelayMs));
        if (this.abort.signal.aborted) return;
        const result = await this.attempt(event, n, reason);
        if (result.ok) return;
      }
    })().catch(() => resolveFirst(null));
    this.pending.add(chain);
    void chain.finally(() => this.pending.delete(chain));
    return first;
  }

  private async attempt(event: ProviderEvent, attempt: number, reason: 'auto' | 'resend'): Promise<DeliveryAttempt> {
    const { url, secret, retry } = this.config();
    const target = url ?? '';
    // Pretty-printed like the real payloads; the signature covers these exact bytes.
    const payload = JSON.stringify(event, null, 2);
    const started = Date.now();
    const record: DeliveryAttempt = {
      eventId: event.id,
      type: event.type,
      attempt,
      reason,
      url: target,
      at: new Date(started).toISOString(),
      status: null,
      ok: false,
      error: null,
      durationMs: 0,
    };
    try {
      const response = await fetch(target, {
        method: 'POST',
        headers: {
          'Content-Type': 'application/json; charset=utf-8',
          'Stripe-Signature': signatureHeader(payload, secret),
          'User-Agent': 'Stripe/1.0 (+https://stripe.com/docs/webhooks)',
        },
        body: payload,
        redirect: 'manual',
        signal: AbortSignal.any([this.abort.signal, AbortSignal.timeout(retry.timeoutMs)]),
      });
      // Only 2xx counts; a redirect is a failure too (the provider's docs: "Webhook endpoints").
      record.status = response.status;
      record.ok = response.status >= 200 && response.status < 300;
      await response.body?.cancel().catch(() => {});
    } catch (err) {
      record.error = err instanceof Error ? err.message : String(err);
    }
    record.durationMs = Date.now() - started;
    this.log.push(record);
    // The event's pending_webhooks counts endpoints still to acknowledge it (one here).
    if (record.ok) event.pending_webhooks = 0;
    return record;
  }

  private sleep(ms: number): Promise<void> {
    const signal = this.abort.signal;
    return new Promise((resolve) => {
      const done = () => {
        clearTimeout(timer);
        signal.removeEventListener('abort', done);
        resolve();
      };
      const timer = setTimeout(done, ms);
      signal.addEventListener('abort', done, { once: true });
    });
  }

  /** Resolves once no delivery or retry is pending. */
  async idle(): Promise<void> {
    while (this.pending.size) await Promise.allSettled([...this.pending]);
  }

  /** Stops every retry and in-flight request; used by reset() and close(). */
  async cancelAll(): Promise<void> {
    this.abort.abort();
    await this.idle();
    this.abort = new AbortController();
    this.queue = Promise.resolve();
    this.log.length = 0;
  }
}
