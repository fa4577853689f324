// A local stand-in for the payment provider: the subset of its REST API (v1) the product
// uses, in its wire format, so the official SDK works against it unmodified when pointed here
// with `new Stripe(key, {host, port, protocol: 'http'})`. Also the hosted pay page and
// signed webhooks to the product.
import express from 'express';
import type { NextFunction, Request, Response } from 'express';
import Stripe from 'stripe';
import { listenHttp } from '../common.js';
import { ApiError, invalidRequest, unauthorized } from './errors.js';
import type { ProviderError } from './errors.js';
import { newId } from './ids.js';
import { PAY_CSS, renderMessage, renderPayForm } from './pay-page.js';
import { readCreatedFilter, readExpand, readListParams, readString, rejectUnknown, stableStringify } from './params.js';
import type { Params } from './params.js';
import { PaymentsState } from './state.js';
import type { CheckoutSession, ProviderEvent, RequestContext } from './types.js';
import { DEFAULT_RETRY, WebhookSender } from './webhooks.js';
import type { DeliveryAttempt, RetryPolicy, WebhookConfig } from './webhooks.js';

export interface PaymentsFakeOptions {
  /** 0 picks a free port. */
  port: number;
  host?: string;
  /** Where webhooks go; null or '' stores events without sending them. */
  webhookUrl?: string | null;
  /** Endpoint signing secret, as the app passes to constructEvent. */
  webhookSecret?: string;
  /** Base URL of the hosted pay page as the browser reaches it; default http://host:port. */
  publicUrl?: string;
  webhookRetry?: Partial<RetryPolicy>;
  /** Event types sent to the webhook URL (default all: ['*']). Every event is stored regardless. */
  enabledEvents?: string[];
  /** false holds events until a test resends them (default true). */
  autoDeliver?: boolean;
  /** api_version stamped on events; default the version the installed SDK pins. */
  apiVersion?: string;
}

export interface PaymentsFakeHandle {
  port: number;
  /** Base URL of the fake, for SDK host/port settings and the hosted pages. */
  url: string;
  close(): Promise<void>;
  /** Forgets every object, event, idempotency key and pending webhook. */
  reset(): Promise<void>;
  /** Resolves once every webhook delivery, retries included, has finished. */
  idle(): Promise<void>;
  /** Changes webhook settings at run time. */
  configure(changes: Partial<Pick<WebhookConfig, 'url' | 'secret' | 'enabledEvents' | 'autoDeliver'>> & { retry?: Partial<RetryPolicy> }): void;
  deliveries(): DeliveryAttempt[];
  events(): ProviderEvent[];
  /** Sends an event again, as the test-only resend endpoint does. */
  resend(eventId: string): Promise<DeliveryAttempt | null>;
  state: PaymentsState;
}

export const DEFAULT_WEBHOOK_SECRET = 'whsec_titrata_local';

// Idempotency: the provider's API reference, "Idempotent requests" — a key replays the first
// result for 24 hours; reusing it with other parameters is an idempotency_error; results are
// saved only once the endpoint has started executing, so rejected-parameter errors are not.
const IDEMPOTENCY_TTL_MS = 24 * 3600 * 1000;
interface SavedResponse {
  fingerprint: string;
  status: number;
  body: unknown;
  requestId: string;
  savedAt: number;
}

export async function startPaymentsFake(options: PaymentsFakeOptions): Promise<PaymentsFakeHandle> {
  const host = options.host ?? '127.0.0.1';
  const apiVersion = options.apiVersion ?? Stripe.API_VERSION;
  const config: WebhookConfig = {
    url: options.webhookUrl || null,
    secret: options.webhookSecret ?? DEFAULT_WEBHOOK_SECRET,
    retry: { ...DEFAULT_RETRY, ...options.webhookRetry },
    enabledEvents: options.enabledEvents ?? ['*'],
    autoDeliver: options.autoDeliver ?? true,
  };
  let baseUrl = options.publicUrl?.replace(/\/+$/, '') ?? '';

  const sender = new WebhookSender(() => config);
  const state = new PaymentsState({
    apiVersion,
    payUrl: (id) => `${baseUrl}/pay/${id}`,
    onEvent: (event) => {
      if (config.autoDeliver) void sender.send(event, 'auto');
    },
  });
  const idempotency = new Map<string, SavedResponse>();

  const app = express();
  app.disable('x-powered-by');
  app.set('etag', false);
  // Bracketed keys in query strings too (expand[0]=…, created[gte]=…).
  app.set('query parser', 'extended');
  // The real API pretty-prints its JSON.
  app.set('json spaces', 2);

  // ---------------------------------------------------------------------------------------
  // REST API under /v1
  // ---------------------------------------------------------------------------------------
  const api = express.Router();

  api.use((req, res, next) => {
    res.locals.requestId = newId('req_');
    res.set('Request-Id', res.locals.requestId);
    // The API answers in the version the request pinned (the provider's docs: "Versioning").
    res.set('Stripe-Version', req.get('stripe-version') ?? apiVersion);
    res.set('Cache-Control', 'no-cache, no-store');
    next();
  });

  // Authentication: the provider's API reference, "Authentication" — the secret key as a
  // Bearer token (or as the Basic auth user name); test-mode keys start with sk_test_.
  api.use((req, res, next) => {
    const header = req.get('authorization') ?? '';
    let key = '';
    if (/^bearer /i.test(header)) key = header.slice(7).trim();
    else if (/^basic /i.test(header)) key = Buffer.from(header.slice(6).trim(), 'base64').toString('utf8').split(':')[0];
    if (!key) {
      throw unauthorized(
        "You did not provide an API key. You need to provide your API key in the Authorization header, using Bearer auth (e.g. 'Authorization: Bearer YOUR_SECRET_KEY').",
      );
    }
    if (!key.startsWith('sk_test_')) {
      // Echo only enough of the key to recognise it, as the live API does.
      const shown = key.length > 12 ? `${key.slice(0, 8)}${'*'.repeat(Math.min(key.length - 12, 20))}${key.slice(-4)}` : `${key.slice(0, 3)}***`;
      throw unauthorized(`Invalid API Key provided: ${shown}`);
    }
    res.locals.apiKey = key;
    next();
  });

  // The SDK sends form-encoded bodies with bracketed nested keys.
  api.use(express.urlencoded({ extended: true, limit: '1mb' }));

  api.use((req, res, next) => {
    if (req.method !== 'POST') return next();
    const key = req.get('idempotency-key');
    if (!key) return next();
    if (key.length > 255) throw invalidRequest('Idempotency-Key must be at most 255 characters long.', 'idempotency_key_too_long');
    res.set('Idempotency-Key', key);
    const storeKey = `${String(res.locals.apiKey)}\n${key}`;
    const fingerprint = `${req.method} ${req.baseUrl}${req.path}\n${stableStringify(req.body ?? {})}`;
    const saved = idempotency.get(storeKey);
    if (saved && Date.now() - saved.savedAt < IDEMPOTENCY_TTL_MS) {
      if (saved.fingerprint !== fingerprint) {
        throw new ApiError(400, {
          type: 'idempotency_error',
          message: `Keys for idempotent requests can only be used with the same parameters they were first used with. Try using a key other than '${key}' if you meant to execute a different request.`,
        });
      }
      res.set('Idempotent-Replayed', 'true');
      res.set('Original-Request', saved.requestId);
      return res.status(saved.status).json(saved.body);
    }
    const json = res.json.bind(res);
    res.json = (body: unknown) => {
      if (res.statusCode < 300 || res.statusCode === 402) {
        idempotency.set(storeKey, { fingerprint, status: res.statusCode, body, requestId: String(res.locals.requestId), savedAt: Date.now() });
      }
      return json(body);
    };
    next();
  });

  const ctx = (req: Request, res: Response): RequestContext => ({
    requestId: typeof res.locals.requestId === 'string' ? res.locals.requestId : null,
    idempotencyKey: req.get('idempotency-key') ?? null,
  });
  const body = (req: Request): Params => (req.body && typeof req.body === 'object' ? (req.body as Params) : {});
  const query = (req: Request): Params => req.query as Params;
  const id = (req: Request): string => String(req.params.id);
  const send = (req: Request, res: Response, object: object) => {
    const params = req.method === 'GET' ? query(req) : body(req);
    res.json(state.expand(object as Record<string, unknown>, readExpand(params)));
  };
  const LIST = ['limit', 'starting_after', 'ending_before', 'expand'];
  const sendList = <T extends { id: string; created: number }>(req: Request, res: Response, items: T[], kind: string) => {
    const params = query(req);
    const created = readCreatedFilter(params);
    const list = state.paginate(items.filter((o) => created(o.created)), readListParams(params), `/v1${req.path}`, kind);
    res.json(state.expandList(list, readExpand(params)));
  };

  // Customers
  api.post('/customers', (req, res) => send(req, res, state.createCustomer(body(req))));
  api.get('/customers', (req, res) => {
    const params = query(req);
    rejectUnknown(params, [...LIST, 'email', 'created']);
    const email = readString(params, 'email');
    // The email filter is exact and case-sensitive (the provider's API reference: "List all customers").
    sendList(req, res, [...state.customers.values()].filter((c) => !email || c.email === email), 'customer');
  });
  api.get('/customers/:id', (req, res) => {
    rejectUnknown(query(req), ['expand']);
    send(req, res, state.getCustomer(id(req)));
  });
  api.post('/customers/:id', (req, res) => send(req, res, state.updateCustomer(id(req), body(req))));

  // Checkout sessions
  api.post('/checkout/sessions', (req, res) => send(req, res, state.createSession(body(req))));
  api.get('/checkout/sessions', (req, res) => {
    const params = query(req);
    rejectUnknown(params, [...LIST, 'customer', 'payment_intent', 'status', 'created']);
    const customer = readString(params, 'customer');
    const pi = readString(params, 'payment_intent');
    const status = readString(params, 'status');
    const sessions = state
      .allSessions()
      .filter((s) => (!customer || s.customer === customer) && (!pi || s.payment_intent === pi) && (!status || s.status === status));
    sendList(req, res, sessions, 'checkout.session');
  });
  api.get('/checkout/sessions/:id', (req, res) => {
    rejectUnknown(query(req), ['expand']);
    send(req, res, state.getSession(id(req)));
  });
  api.get('/checkout/sessions/:id/line_items', (req, res) => {
    rejectUnknown(query(req), LIST);
    const session = state.getSession(id(req));
    const params = query(req);
    // Line items are not sequenced, so the stable sort keeps them in the order given.
    res.json(state.paginate(state.lineItems.get(session.id) ?? [], readListParams(params), `/v1${req.path}`, 'line_item'));
  });
  api.post('/checkout/sessions/:id/expire', (req, res) => {
    rejectUnknown(body(req), ['expand']);
    send(req, res, state.expireSession(id(req), ctx(req, res)));
  });

  // Payment intents and charges (read only: the hosted page creates them)
  api.get('/payment_intents', (req, res) => {
    const params = query(req);
    rejectUnknown(params, [...LIST, 'customer', 'created']);
    const customer = readString(params, 'customer');
    sendList(req, res, [...state.paymentIntents.values()].filter((p) => !customer || p.customer === customer), 'payment_intent');
  });
  api.get('/payment_intents/:id', (req, res) => {
    rejectUnknown(query(req), ['expand', 'client_secret']);
    send(req, res, state.getPaymentIntent(id(req)));
  });
  api.get('/charges', (req, res) => {
    const params = query(req);
    rejectUnknown(params, [...LIST, 'customer', 'payment_intent', 'created']);
    const customer = readString(params, 'customer');
    const pi = readString(params, 'payment_intent');
    sendList(
      req,
      res,
      [...state.charges.values()].filter((c) => (!customer || c.customer === customer) && (!pi || c.payment_intent === pi)),
      'charge',
    );
  });
  api.get('/charges/:id', (req, res) => {
    rejectUnknown(query(req), ['expand']);
    send(req, res, state.getCharge(id(req)));
  });

  // Refunds
  api.post('/refunds', (req, res) => send(req, res, state.createRefund(body(req), ctx(req, res))));
  api.get('/refunds', (req, res) => {
    const params = query(req);
    rejectUnknown(params, [...LIST, 'charge', 'payment_intent', 'created']);
    const charge = readString(params, 'charge');
    const pi = readString(params, 'payment_intent');
    sendList(
      req,
      res,
      [...state.refunds.values()].filter((r) => (!charge || r.charge === charge) && (!pi || r.payment_intent === pi)),
      'refund',
    );
  });
  api.get('/refunds/:id', (req, res) => {
    rejectUnknown(query(req), ['expand']);
    send(req, res, state.getRefund(id(req)));
  });

  // Events
  api.get('/events', (req, res) => {
    const params = query(req);
    rejectUnknown(params, [...LIST, 'type', 'types', 'created']);
    const type = readString(params, 'type');
    const types = Array.isArray(params.types) ? params.types.map(String) : typeof params.types === 'string' ? [params.types] : null;
    // `type` may end in `*` to match a prefix, e.g. charge.* (the provider's API reference: "List all events").
    const matches = (t: string) => !type || (type.endsWith('*') ? t.startsWith(type.slice(0, -1)) : t === type);
    sendList(req, res, [...state.events.values()].filter((e) => matches(e.type) && (!types || types.includes(e.type))), 'event');
  });
  api.get('/events/:id', (req, res) => {
    rejectUnknown(query(req), ['expand']);
    res.json(state.getEvent(id(req)));
  });

  // Anything else under /v1 (the live API's wording for an unknown route, from memory).
  api.use((req) => {
    throw new ApiError(404, {
      type: 'invalid_request_error',
      message: `Unrecognized request URL (${req.method}: ${req.originalUrl.split('?')[0]}). Please see https://docs.stripe.com or we can help at https://support.stripe.com/.`,
    });
  });

  api.use((err: unknown, _req: Request, res: Response, _next: NextFunction) => {
    let status = 500;
    let error: ProviderError = { type: 'api_error', message: 'An unknown error occurred in the payments fake.' };
    if (err instanceof ApiError) {
      status = err.status;
      error = err.body;
    } else if (isHttpError(err) && err.status < 500) {
      // body-parser refusals: malformed or oversized bodies.
      status = err.status;
      error = { type: 'invalid_request_error', message: `Invalid request body: ${err.message}` };
    } else {
      console.error('[payments fake]', err);
    }
    res.status(status).json({ error });
  });

  app.use('/v1', api);

  // ---------------------------------------------------------------------------------------
  // Hosted pay page
  // ---------------------------------------------------------------------------------------
  const pageHeaders = (res: Response, session?: CheckoutSession) => {
    // form-action covers the redirect after a submit, so the product's own origins are listed.
    const origins = new Set<string>();
    for (const u of [session?.success_url, session?.cancel_url]) {
      if (!u) continue;
      try {
        origins.add(new URL(u).origin);
      } catch {
        /* validated at creation */
      }
    }
    res.set(
      'Content-Security-Policy',
      `default-src 'none'; style-src 'self'; img-src 'self'; form-action 'self' ${[...origins].join(' ')}; frame-ancestors 'none'; base-uri 'none'`.replace(/ +;/g, ';'),
    );
    res.set('Referrer-Policy', 'no-referrer');
    res.set('X-Content-Type-Options', 'nosniff');
    res.set('Cache-Control', 'no-store');
  };

  app.get('/pay/assets/pay.css', (_req, res) => {
    res.type('text/css').set('Cache-Control', 'no-cache').send(PAY_CSS);
  });

  const findSession = (req: Request): CheckoutSession | undefined => {
    try {
      return state.getSession(String(req.params.sessionId));
    } catch {
      return undefined;
    }
  };
  const formView = (session: CheckoutSession, error?: string) => {
    const customer = session.customer ? state.customers.get(session.customer) : undefined;
    return renderPayForm({
      session,
      items: state.lineItems.get(session.id) ?? [],
      email: customer?.email ?? session.customer_email,
      error,
    });
  };
  const successUrl = (session: CheckoutSession) =>
    // The template variable is filled in on success_url only (the provider's Checkout docs).
    session.success_url ? session.success_url.split('{CHECKOUT_SESSION_ID}').join(session.id) : null;

  const showClosed = (res: Response, session: CheckoutSession) => {
    if (session.status === 'complete') {
      const url = successUrl(session);
      return res
        .status(200)
        .type('html')
        .send(renderMessage('Payment complete', 'This payment has been made. Thank you.', url ? { href: url, text: 'Return to the merchant' } : undefined));
    }
    return res
      .status(410)
      .type('html')
      .send(
        renderMessage(
          'This payment page has expired',
          'Start the payment again from the merchant.',
          session.cancel_url ? { href: session.cancel_url, text: 'Return to the merchant' } : undefined,
        ),
      );
  };

  app.get('/pay/:sessionId', (req, res) => {
    const session = findSession(req);
    pageHeaders(res, session);
    if (!session) return res.status(404).type('html').send(renderMessage('Payment page not found', 'There is no payment with this link.'));
    if (session.status !== 'open') return showClosed(res, session);
    const pi = session.payment_intent ? state.paymentIntents.get(session.payment_intent) : undefined;
    res.type('html').send(formView(session, pi?.last_payment_error?.message));
  });

  app.post('/pay/:sessionId', express.urlencoded({ extended: false, limit: '16kb' }), (req, res) => {
    const session = findSession(req);
    pageHeaders(res, session);
    const wantsJson = req.accepts(['html', 'json']) === 'json';
    if (!session) {
      if (wantsJson) return res.status(404).json({ error: { type: 'invalid_request_error', code: 'resource_missing', message: `No such checkout.session: '${req.params.sessionId}'` } });
      return res.status(404).type('html').send(renderMessage('Payment page not found', 'There is no payment with this link.'));
    }
    const form = (req.body ?? {}) as Record<string, string>;
    if (form.action === 'cancel') {
      // Leaving the page does not expire the session; the product may send the payer back.
      if (session.cancel_url) return res.redirect(303, session.cancel_url);
      return res.type('html').send(renderMessage('Payment cancelled', 'Nothing was charged.'));
    }
    const result = state.pay(session.id, String(form.card_number ?? ''));
    switch (result.outcome) {
      case 'succeeded':
      case 'already_paid': {
        const url = successUrl(result.session);
        if (wantsJson) return res.json({ status: 'complete', redirect_url: url, session: result.session });
        if (url) return res.redirect(303, url);
        return res.type('html').send(renderMessage('Payment complete', 'This payment has been made. Thank you.'));
      }
      case 'expired':
        if (wantsJson) {
          return res.status(400).json({ error: { type: 'invalid_request_error', code: 'checkout_session_expired', message: 'This Checkout Session has expired.' } });
        }
        return showClosed(res, result.session);
      case 'invalid_number':
        if (wantsJson) return res.status(402).json({ error: { type: 'card_error', code: result.code, message: result.message, param: 'number' } });
        return res.status(400).type('html').send(formView(result.session, result.message));
      case 'declined': {
        // 402 with the card error, as the API answers a failed confirmation
        // (the provider's API reference: "Errors", card_error).
        if (wantsJson) {
          return res.status(402).json({
            error: {
              type: 'card_error',
              code: result.error.code,
              decline_code: result.error.decline_code,
              message: result.error.message,
              doc_url: result.error.doc_url,
              charge: result.charge.id,
              payment_intent: result.paymentIntent,
            },
          });
        }
        return res.status(402).type('html').send(formView(result.session, result.error.message));
      }
    }
  });

  // ---------------------------------------------------------------------------------------
  // Test controls (not part of the provider's API)
  // ---------------------------------------------------------------------------------------
  const control = express.Router();
  control.use(express.json());
  control.post('/reset', async (_req, res) => {
    await handle.reset();
    res.json({ reset: true });
  });
  control.get('/webhooks/deliveries', (_req, res) => res.json(sender.log));
  control.get('/webhooks/idle', async (_req, res) => {
    await handle.idle();
    res.json({ idle: true });
  });
  control.post('/webhooks/resend/:eventId', async (req, res) => {
    const event = state.events.get(String(req.params.eventId));
    if (!event) return res.status(404).json({ error: { type: 'invalid_request_error', code: 'resource_missing', message: `No such event: '${req.params.eventId}'` } });
    const delivery = await sender.send(event, 'resend');
    res.json({ event: event.id, delivery });
  });
  control.get('/config', (_req, res) => res.json({ ...config, secret: undefined }));
  control.put('/config', (req, res) => {
    const b = (req.body ?? {}) as Record<string, unknown>;
    handle.configure({
      url: typeof b.webhookUrl === 'string' ? b.webhookUrl : undefined,
      secret: typeof b.webhookSecret === 'string' ? b.webhookSecret : undefined,
      autoDeliver: typeof b.autoDeliver === 'boolean' ? b.autoDeliver : undefined,
      enabledEvents: Array.isArray(b.enabledEvents) ? b.enabledEvents.map(String) : undefined,
      retry: typeof b.retry === 'object' && b.retry ? (b.retry as Partial<RetryPolicy>) : undefined,
    });
    res.json({ ...config, secret: undefined });
  });
  app.use('/_fake', control);

  app.get('/', (_req, res) => {
    res.type('text').send('Payments fake: REST API under /v1, hosted pay pages under /pay/:sessionId, test controls under /_fake.\n');
  });
  app.use((_req: Request, res: Response) => {
    res.status(404).type('text').send('Not found\n');
  });
  app.use((err: unknown, _req: Request, res: Response, _next: NextFunction) => {
    const status = isHttpError(err) && err.status < 500 ? err.status : 500;
    if (status === 500) console.error('[payments fake]', err);
    res.status(status).type('text').send(status === 500 ? 'Internal error\n' : `${(err as Error).message}\n`);
  });

  const listening = await listenHttp(app, options.port, host);
  if (!baseUrl) baseUrl = `http://${host === '0.0.0.0' || host === '::' ? '127.0.0.1' : host}:${listening.port}`;

  const handle: PaymentsFakeHandle = {
    port: listening.port,
    url: baseUrl,
    async close() {
      await sender.cancelAll();
      await listening.close();
    },
    async reset() {
      await sender.cancelAll();
      state.reset();
      idempotency.clear();
    },
    idle: () => sender.idle(),
    configure(changes) {
      if (changes.url !== undefined) config.url = changes.url || null;
      if (changes.secret !== undefined) config.secret = changes.secret;
      if (changes.enabledEvents !== undefined) config.enabledEvents = changes.enabledEvents;
      if (changes.autoDeliver !== undefined) config.autoDeliver = changes.autoDeliver;
      if (changes.retry) config.retry = { ...config.retry, ...changes.retry };
    },
    deliveries: () => [...sender.log],
    events: () => [...state.events.values()],
    async resend(eventId) {
      return sender.send(state.getEvent(eventId), 'resend');
    },
    state,
  };
  return handle;
}

function isHttpError(err: unknown): err is Error & { status: number } {
  return err instanceof Error && typeof (err as { status?: unknown }).status === 'number';
}
