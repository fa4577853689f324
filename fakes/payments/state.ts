// In-memory state and the operations behind the endpoints and the hosted pay page.
// Behaviour follows the provider's API reference and testing docs where noted, and memory of
// how the live API answers elsewhere.
import { createHash } from 'node:crypto';
import { docUrl, invalidParam, invalidRequest, missingParam, noSuch } from './errors.js';
import { newId, randomToken } from './ids.js';
import {
  isObject,
  paramPath,
  readArray,
  readEmail,
  readEnum,
  readInt,
  readMetadata,
  readString,
  readUrl,
  rejectUnknown,
  requireObject,
} from './params.js';
import type { ListParams, Params } from './params.js';
import type {
  ApiObject,
  CardDetails,
  Charge,
  CheckoutSession,
  Customer,
  LineItem,
  PaymentError,
  PaymentIntent,
  ProviderEvent,
  Refund,
  RequestContext,
} from './types.js';

const now = () => Math.floor(Date.now() / 1000);
const clone = <T>(value: T): T => structuredClone(value);

// Test card numbers and what they do: the provider's testing docs ("Test card numbers",
// "Declined payments"); messages as the live API words them, from memory.
interface CardBehaviour {
  outcome: 'succeeded' | 'declined';
  code?: string;
  declineCode?: string;
  message?: string;
  funding?: 'credit' | 'debit';
}

const TEST_CARDS: Record<string, CardBehaviour> = {
  '4242424242424242': { outcome: 'succeeded' },
  '4000056655665556': { outcome: 'succeeded', funding: 'debit' },
  '5555555555554444': { outcome: 'succeeded' },
  '4000000000000002': { outcome: 'declined', code: 'card_declined', declineCode: 'generic_decline', message: 'Your card was declined.' },
  '4000000000009995': {
    outcome: 'declined',
    code: 'card_declined',
    declineCode: 'insufficient_funds',
    message: 'Your card has insufficient funds.',
  },
  '4000000000000069': { outcome: 'declined', code: 'expired_card', declineCode: 'expired_card', message: 'Your card has expired.' },
  '4000000000000127': {
    outcome: 'declined',
    code: 'incorrect_cvc',
    declineCode: 'incorrect_cvc',
    message: "Your card's security code is incorrect.",
  },
  '4000000000000119': {
    outcome: 'declined',
    code: 'processing_error',
    declineCode: 'processing_error',
    message: 'An error occurred while processing your card. Try again in a little bit.',
  },
};

// Any other well-formed number is treated as a real card, which test mode refuses.
const LIVE_CARD_IN_TEST_MODE: CardBehaviour = {
  outcome: 'declined',
  code: 'card_declined',
  declineCode: 'test_mode_live_card',
  message:
    'Your card was declined. Your request was in test mode, but used a non test (live) card. For a list of valid test cards, visit: https://docs.stripe.com/testing.',
};

export const TEST_CARD_NUMBERS = Object.keys(TEST_CARDS);

/** The Luhn checksum every card number carries (ISO/IEC 7812-1). */
export function luhnValid(digits: string): boolean {
  let sum = 0;
  for (let i = 0; i < digits.length; i++) {
    let d = Number(digits[digits.length - 1 - i]);
    if (i % 2 === 1) {
      d *= 2;
      if (d > 9) d -= 9;
    }
    sum += d;
  }
  return sum % 10 === 0;
}

function cardBrand(digits: string): string {
  // Issuer prefixes (IIN ranges), common practice.
  if (digits.startsWith('4')) return 'visa';
  if (/^(5[1-5]|2(2[2-9]|[3-6]\d|7[01]|720))/.test(digits)) return 'mastercard';
  if (/^3[47]/.test(digits)) return 'amex';
  return 'unknown';
}

/** Minor units of a currency, so 1234 cents shows as 12.34 (ISO 4217 via Intl). */
export function currencyDigits(currency: string): number {
  try {
    return new Intl.NumberFormat('en', { style: 'currency', currency }).resolvedOptions().maximumFractionDigits ?? 2;
  } catch {
    return 2;
  }
}

export function formatAmount(amount: number, currency: string): string {
  const digits = currencyDigits(currency);
  try {
    return new Intl.NumberFormat('en-US', { style: 'currency', currency: currency.toUpperCase() }).format(amount / 10 ** digits);
  } catch {
    return `${(amount / 10 ** digits).toFixed(digits)} ${currency.toUpperCase()}`;
  }
}

// Smallest total a card payment may have: the provider's docs "Minimum and maximum charge
// amounts" (50 cents for most currencies; a few listed here, from memory).
const MINIMUM_CHARGE: Record<string, number> = { usd: 50, eur: 50, cad: 50, aud: 50, chf: 50, gbp: 30, jpy: 50, mxn: 1000 };

export type PayResult =
  | { outcome: 'succeeded'; session: CheckoutSession; paymentIntent: PaymentIntent; charge: Charge }
  | { outcome: 'already_paid'; session: CheckoutSession }
  | { outcome: 'expired'; session: CheckoutSession }
  | { outcome: 'invalid_number'; session: CheckoutSession; message: string; code: string }
  | { outcome: 'declined'; session: CheckoutSession; paymentIntent: PaymentIntent; charge: Charge; error: PaymentError };

export interface StateOptions {
  apiVersion: string;
  /** Builds a session's hosted page URL. */
  payUrl: (sessionId: string) => string;
  /** Called for each new event, after it is stored. */
  onEvent: (event: ProviderEvent) => void;
}

export class PaymentsState {
  customers = new Map<string, Customer>();
  sessions = new Map<string, CheckoutSession>();
  lineItems = new Map<string, LineItem[]>();
  paymentIntents = new Map<string, PaymentIntent>();
  charges = new Map<string, Charge>();
  refunds = new Map<string, Refund>();
  events = new Map<string, ProviderEvent>();
  /** What payment_intent_data asked for, applied when the payment intent is created. */
  private sessionExtras = new Map<string, { description: string | null; metadata: Record<string, string>; receiptEmail: string | null }>();
  /** Creation order of every object, for newest-first lists with stable cursors. */
  private sequence = new Map<string, number>();
  private counter = 0;

  constructor(private readonly options: StateOptions) {}

  reset(): void {
    for (const map of [this.customers, this.sessions, this.lineItems, this.paymentIntents, this.charges, this.refunds, this.events]) {
      map.clear();
    }
    this.sessionExtras.clear();
    this.sequence.clear();
  }

  private track(id: string): void {
    this.sequence.set(id, ++this.counter);
  }

  /** Newest first, cursor pagination (the provider's API reference: "Pagination"). */
  paginate<T extends { id: string }>(items: Iterable<T>, list: ListParams, url: string, kind: string) {
    const ordered = [...items].sort((a, b) => (this.sequence.get(b.id) ?? 0) - (this.sequence.get(a.id) ?? 0));
    let start = 0;
    let end = ordered.length;
    if (list.startingAfter) {
      const i = ordered.findIndex((o) => o.id === list.startingAfter);
      if (i < 0) throw noSuch(kind, list.startingAfter, 'starting_after');
      start = i + 1;
    } else if (list.endingBefore) {
      const i = ordered.findIndex((o) => o.id === list.endingBefore);
      if (i < 0) throw noSuch(kind, list.endingBefore, 'ending_before');
      end = i;
      start = Math.max(0, end - list.limit);
    }
    const page = ordered.slice(start, Math.min(end, start + list.limit));
    const hasMore = list.endingBefore ? start > 0 : start + page.length < end;
    return { object: 'list' as const, data: page.map(clone), has_more: hasMore, url };
  }

  // --- events ----------------------------------------------------------------------------

  private emit(type: string, object: ApiObject, ctx: RequestContext, previous?: Record<string, unknown>): ProviderEvent {
    const event: ProviderEvent = {
      id: newId('evt_'),
      object: 'event',
      api_version: this.options.apiVersion,
      created: now(),
      data: previous ? { object: clone(object), previous_attributes: previous } : { object: clone(object) },
      livemode: false,
      pending_webhooks: 0,
      request: { id: ctx.requestId, idempotency_key: ctx.idempotencyKey },
      type,
    };
    this.events.set(event.id, event);
    this.track(event.id);
    this.options.onEvent(event);
    return event;
  }

  // --- customers -------------------------------------------------------------------------

  createCustomer(params: Params): Customer {
    rejectUnknown(params, ['email', 'name', 'description', 'phone', 'metadata', 'address', 'preferred_locales', 'expand']);
    const customer: Customer = {
      id: newId('cus_'),
      object: 'customer',
      address: this.readAddress(params),
      balance: 0,
      created: now(),
      currency: null,
      default_source: null,
      delinquent: false,
      description: readString(params, 'description', { max: 350 }) ?? null,
      email: readEmail(params, 'email') ?? null,
      invoice_prefix: randomToken(8).toUpperCase(),
      invoice_settings: { custom_fields: null, default_payment_method: null, footer: null, rendering_options: null },
      livemode: false,
      metadata: readMetadata(params, 'metadata'),
      name: readString(params, 'name', { max: 256 }) ?? null,
      phone: readString(params, 'phone', { max: 20 }) ?? null,
      preferred_locales: (readArray(params.preferred_locales, 'preferred_locales') ?? []).map(String),
      shipping: null,
      tax_exempt: 'none',
      test_clock: null,
    };
    this.customers.set(customer.id, customer);
    this.track(customer.id);
    return customer;
  }

  updateCustomer(id: string, params: Params): Customer {
    const customer = this.getCustomer(id);
    rejectUnknown(params, ['email', 'name', 'description', 'phone', 'metadata', 'address', 'preferred_locales', 'expand']);
    // An empty string clears a field on update (the provider's API reference: "Update a customer").
    const set = <K extends 'email' | 'name' | 'description' | 'phone'>(key: K, value: string | undefined) => {
      if (params[key] === '') customer[key] = null;
      else if (value !== undefined) customer[key] = value;
    };
    set('email', readEmail(params, 'email'));
    set('name', readString(params, 'name', { max: 256 }));
    set('description', readString(params, 'description', { max: 350 }));
    set('phone', readString(params, 'phone', { max: 20 }));
    if (params.address !== undefined) customer.address = this.readAddress(params);
    customer.metadata = readMetadata(params, 'metadata', customer.metadata);
    return customer;
  }

  private readAddress(params: Params): Customer['address'] {
    if (params.address === undefined || params.address === '') return null;
    const address = requireObject(params.address, 'address');
    const fields = ['city', 'country', 'line1', 'line2', 'postal_code', 'state'];
    rejectUnknown(address, fields, 'address');
    return Object.fromEntries(fields.map((f) => [f, readString(address, f, { prefix: 'address' }) ?? null]));
  }

  getCustomer(id: string, param?: string): Customer {
    const customer = this.customers.get(id);
    if (!customer) throw noSuch('customer', id, param);
    return customer;
  }

  // --- checkout sessions -----------------------------------------------------------------

  createSession(params: Params): CheckoutSession {
    rejectUnknown(params, [
      'mode',
      'line_items',
      'customer',
      'customer_email',
      'success_url',
      'cancel_url',
      'metadata',
      'client_reference_id',
      'expires_at',
      'payment_method_types',
      'payment_intent_data',
      'locale',
      'submit_type',
      'customer_creation',
      'currency',
      'ui_mode',
      'expand',
    ]);
    const mode = readString(params, 'mode', { required: true });
    if (mode !== 'payment') {
      // subscription and setup modes exist on the real service; the product only takes payments.
      throw invalidParam('mode', `Invalid mode: this fake supports only mode=payment, not ${mode}`, 'parameter_invalid_string');
    }
    readEnum(params, 'ui_mode', ['hosted'] as const);
    const types = readArray(params.payment_method_types, 'payment_method_types');
    if (types && types.some((t) => t !== 'card')) {
      throw invalidParam('payment_method_types', 'This fake supports only the card payment method type.', 'parameter_invalid_string');
    }

    const customerId = readString(params, 'customer');
    const customer = customerId ? this.getCustomer(customerId, 'customer') : null;
    const customerEmail = readEmail(params, 'customer_email') ?? null;
    if (customer && customerEmail) {
      throw invalidRequest('You may only specify one of these parameters: customer, customer_email.', 'parameter_invalid_string', 'customer_email');
    }

    const rawItems = readArray(params.line_items, 'line_items');
    if (!rawItems || rawItems.length === 0) throw missingParam('line_items');
    // Payment mode takes at most 100 line items (the provider's API reference, from memory).
    if (rawItems.length > 100) throw invalidParam('line_items', 'You may only specify up to 100 line items.', 'parameter_invalid_array');
    const items = rawItems.map((raw, i) => this.readLineItem(raw, i));
    const currency = items[0].currency;
    items.forEach((item, i) => {
      if (item.currency !== currency) {
        throw invalidParam(`line_items[${i}][price_data][currency]`, 'All line items must use the same currency.', 'parameter_invalid_string');
      }
    });
    const declaredCurrency = readString(params, 'currency');
    if (declaredCurrency && declaredCurrency.toLowerCase() !== currency) {
      throw invalidParam('currency', `The currency ${declaredCurrency} does not match the line items' currency ${currency}.`);
    }
    const total = items.reduce((sum, item) => sum + item.amount_total, 0);
    const minimum = MINIMUM_CHARGE[currency] ?? 50;
    if (total < minimum) {
      throw invalidRequest(
        `The Checkout Session's total amount due must add up to at least ${formatAmount(minimum, currency)} ${currency}`,
        'amount_too_small',
        'line_items',
      );
    }

    const created = now();
    // Expiry between 30 minutes and 24 hours, default 24 hours (the provider's API reference).
    const expiresAt = readInt(params, 'expires_at', { min: created + 30 * 60 - 60, max: created + 24 * 3600 + 60 }) ?? created + 24 * 3600;

    const paymentIntentData = requireObject(params.payment_intent_data, 'payment_intent_data');
    rejectUnknown(paymentIntentData, ['description', 'metadata', 'receipt_email', 'statement_descriptor'], 'payment_intent_data');
    readString(paymentIntentData, 'description', { prefix: 'payment_intent_data', max: 1000 });
    readMetadata(paymentIntentData, 'metadata', {}, 'payment_intent_data');

    const id = newId('cs_test_');
    const session: CheckoutSession = {
      id,
      object: 'checkout.session',
      after_expiration: null,
      allow_promotion_codes: null,
      amount_subtotal: total,
      amount_total: total,
      automatic_tax: { enabled: false, liability: null, status: null },
      billing_address_collection: null,
      cancel_url: readUrl(params, 'cancel_url') ?? null,
      client_reference_id: readString(params, 'client_reference_id', { max: 200 }) ?? null,
      client_secret: null,
      consent: null,
      consent_collection: null,
      created,
      currency,
      custom_fields: [],
      custom_text: { after_submit: null, shipping_address: null, submit: null, terms_of_service_acceptance: null },
      customer: customer?.id ?? null,
      customer_creation: customer ? null : 'if_required',
      customer_details: null,
      customer_email: customerEmail,
      expires_at: expiresAt,
      invoice: null,
      invoice_creation: null,
      livemode: false,
      locale: readString(params, 'locale') ?? null,
      metadata: readMetadata(params, 'metadata'),
      mode: 'payment',
      // Created on the first payment attempt, not with the session (API versions since 2022-08-01).
      payment_intent: null,
      payment_link: null,
      payment_method_collection: 'if_required',
      payment_method_options: {},
      payment_method_types: ['card'],
      payment_status: 'unpaid',
      phone_number_collection: { enabled: false },
      recovered_from: null,
      setup_intent: null,
      shipping_address_collection: null,
      shipping_cost: null,
      shipping_options: [],
      status: 'open',
      submit_type: readEnum(params, 'submit_type', ['auto', 'book', 'donate', 'pay'] as const) ?? null,
      subscription: null,
      success_url: readUrl(params, 'success_url') ?? null,
      total_details: { amount_discount: 0, amount_shipping: 0, amount_tax: 0 },
      ui_mode: 'hosted',
      url: this.options.payUrl(id),
    };
    this.sessions.set(id, session);
    this.track(id);
    this.lineItems.set(id, items);
    this.sessionExtras.set(id, {
      description: readString(paymentIntentData, 'description', { prefix: 'payment_intent_data' }) ?? null,
      metadata: readMetadata(paymentIntentData, 'metadata', {}, 'payment_intent_data'),
      receiptEmail: readString(paymentIntentData, 'receipt_email', { prefix: 'payment_intent_data' }) ?? null,
    });
    return session;
  }

  private readLineItem(raw: unknown, index: number): LineItem {
    const prefix = `line_items[${index}]`;
    if (!isObject(raw)) throw invalidParam(prefix, 'Invalid object', 'parameter_invalid_object');
    rejectUnknown(raw, ['price_data', 'quantity', 'price', 'adjustable_quantity', 'tax_rates'], prefix);
    if (raw.price !== undefined) {
      // The fake has no price catalogue: a price id can never be found.
      throw noSuch('price', String(raw.price), paramPath(prefix, 'price'));
    }
    if (raw.price_data === undefined) {
      throw invalidParam(prefix, `You must specify either \`price\` or \`price_data\` in \`${prefix}\`.`, 'parameter_missing');
    }
    const quantity = readInt(raw, 'quantity', { prefix, required: true, min: 1, max: 999999 })!;
    const pdPrefix = `${prefix}[price_data]`;
    const priceData = requireObject(raw.price_data, pdPrefix);
    rejectUnknown(priceData, ['currency', 'unit_amount', 'unit_amount_decimal', 'product_data', 'product', 'tax_behavior'], pdPrefix);
    const currency = readString(priceData, 'currency', { prefix: pdPrefix, required: true })!.toLowerCase();
    if (!/^[a-z]{3}$/.test(currency)) throw invalidParam(`${pdPrefix}[currency]`, `Invalid currency: ${currency}`, 'parameter_invalid_string');
    let unitAmount = readInt(priceData, 'unit_amount', { prefix: pdPrefix, min: 0, max: 99999999 });
    if (unitAmount === undefined) {
      const decimal = readString(priceData, 'unit_amount_decimal', { prefix: pdPrefix });
      if (decimal === undefined) throw missingParam(`${pdPrefix}[unit_amount]`);
      if (!/^\d+$/.test(decimal)) {
        throw invalidParam(`${pdPrefix}[unit_amount_decimal]`, 'This fake accepts only whole minor units in unit_amount_decimal.', 'parameter_invalid_string');
      }
      unitAmount = Number(decimal);
    }
    if (priceData.product !== undefined) throw noSuch('product', String(priceData.product), `${pdPrefix}[product]`);
    const productPrefix = `${pdPrefix}[product_data]`;
    if (priceData.product_data === undefined) throw missingParam(`${productPrefix}[name]`);
    const productData = requireObject(priceData.product_data, productPrefix);
    rejectUnknown(productData, ['name', 'description', 'metadata', 'images', 'tax_code', 'unit_label'], productPrefix);
    const name = readString(productData, 'name', { prefix: productPrefix, required: true, max: 250 })!;
    const created = now();
    const amount = unitAmount * quantity;
    return {
      id: newId('li_'),
      object: 'item',
      amount_discount: 0,
      amount_subtotal: amount,
      amount_tax: 0,
      amount_total: amount,
      currency,
      description: name,
      price: {
        id: newId('price_'),
        object: 'price',
        active: false,
        billing_scheme: 'per_unit',
        created,
        currency,
        livemode: false,
        lookup_key: null,
        metadata: {},
        nickname: null,
        product: newId('prod_'),
        recurring: null,
        tax_behavior: 'unspecified',
        type: 'one_time',
        unit_amount: unitAmount,
        unit_amount_decimal: String(unitAmount),
      },
      quantity,
    };
  }

  /** A session past expires_at expires the next time anyone looks at it. */
  private refreshExpiry(session: CheckoutSession): void {
    if (session.status === 'open' && now() >= session.expires_at) this.expire(session, { requestId: null, idempotencyKey: null });
  }

  getSession(id: string, param?: string): CheckoutSession {
    const session = this.sessions.get(id);
    if (!session) throw noSuch('checkout.session', id, param);
    this.refreshExpiry(session);
    return session;
  }

  allSessions(): CheckoutSession[] {
    for (const s of this.sessions.values()) this.refreshExpiry(s);
    return [...this.sessions.values()];
  }

  expireSession(id: string, ctx: RequestContext): CheckoutSession {
    const session = this.getSession(id);
    if (session.status !== 'open') {
      // The provider refuses to expire a session that is not open (its API reference: "Expire a Session").
      throw invalidRequest(
        `Only Checkout Sessions with a status in ["open"] can be expired. This Checkout Session has a status of ${JSON.stringify(session.status)}.`,
        'checkout_session_not_open',
      );
    }
    this.expire(session, ctx);
    return session;
  }

  private expire(session: CheckoutSession, ctx: RequestContext): void {
    session.status = 'expired';
    session.url = null;
    if (session.payment_intent) {
      const pi = this.paymentIntents.get(session.payment_intent);
      if (pi && pi.status !== 'succeeded') {
        pi.status = 'canceled';
        pi.canceled_at = now();
        pi.cancellation_reason = 'abandoned';
        this.emit('payment_intent.canceled', pi, ctx);
      }
    }
    this.emit('checkout.session.expired', session, ctx);
  }

  // --- paying on the hosted page ---------------------------------------------------------

  pay(sessionId: string, cardNumber: string): PayResult {
    const session = this.getSession(sessionId);
    if (session.status === 'complete') return { outcome: 'already_paid', session };
    if (session.status === 'expired') return { outcome: 'expired', session };

    const digits = cardNumber.replace(/[\s-]/g, '');
    if (!/^\d{12,19}$/.test(digits) || !luhnValid(digits)) {
      // Caught by the page before anything is charged, so no payment intent or charge.
      return { outcome: 'invalid_number', session, message: 'Your card number is invalid.', code: 'incorrect_number' };
    }
    const behaviour = TEST_CARDS[digits] ?? LIVE_CARD_IN_TEST_MODE;
    const ctx: RequestContext = { requestId: null, idempotencyKey: null };
    const created = now();
    const customer = session.customer ? this.customers.get(session.customer) : undefined;
    const email = customer?.email ?? session.customer_email ?? null;

    let pi = session.payment_intent ? this.paymentIntents.get(session.payment_intent) : undefined;
    if (!pi) {
      const extras = this.sessionExtras.get(session.id);
      const id = newId('pi_');
      pi = {
        id,
        object: 'payment_intent',
        amount: session.amount_total,
        amount_capturable: 0,
        amount_received: 0,
        canceled_at: null,
        cancellation_reason: null,
        capture_method: 'automatic_async',
        client_secret: `${id}_secret_${randomToken(25)}`,
        confirmation_method: 'automatic',
        created,
        currency: session.currency,
        customer: session.customer,
        description: extras?.description ?? null,
        last_payment_error: null,
        latest_charge: null,
        livemode: false,
        // The session's own metadata stays on the session; only payment_intent_data.metadata
        // reaches the payment intent (the provider's Checkout docs, "metadata").
        metadata: extras?.metadata ?? {},
        payment_method: null,
        payment_method_types: ['card'],
        receipt_email: extras?.receiptEmail ?? null,
        status: 'requires_payment_method',
      };
      this.paymentIntents.set(id, pi);
      this.track(id);
      session.payment_intent = id;
    }

    const card: CardDetails = {
      brand: cardBrand(digits),
      country: 'US',
      exp_month: 12,
      exp_year: new Date().getUTCFullYear() + 3,
      fingerprint: createHash('sha256').update(digits).digest('base64url').slice(0, 16),
      funding: behaviour.funding ?? 'credit',
      last4: digits.slice(-4),
      network: cardBrand(digits),
    };
    const paymentMethodId = newId('pm_');
    const succeeded = behaviour.outcome === 'succeeded';
    const charge: Charge = {
      id: newId('ch_'),
      object: 'charge',
      amount: pi.amount,
      amount_captured: succeeded ? pi.amount : 0,
      amount_refunded: 0,
      balance_transaction: succeeded ? newId('txn_') : null,
      billing_details: { address: null, email, name: customer?.name ?? null, phone: null },
      captured: succeeded,
      created,
      currency: pi.currency,
      customer: pi.customer,
      description: pi.description,
      disputed: false,
      failure_code: succeeded ? null : behaviour.code!,
      failure_message: succeeded ? null : behaviour.message!,
      livemode: false,
      metadata: clone(pi.metadata),
      outcome: succeeded
        ? { network_status: 'approved_by_network', reason: null, risk_level: 'normal', seller_message: 'Payment complete.', type: 'authorized' }
        : {
            network_status: 'declined_by_network',
            reason: behaviour.declineCode ?? null,
            risk_level: 'normal',
            seller_message: 'The bank did not return any further details with this decline.',
            type: 'issuer_declined',
          },
      paid: succeeded,
      payment_intent: pi.id,
      payment_method: paymentMethodId,
      payment_method_details: { type: 'card', card },
      receipt_email: pi.receipt_email ?? email,
      receipt_url: null,
      refunded: false,
      status: succeeded ? 'succeeded' : 'failed',
    };
    this.charges.set(charge.id, charge);
    this.track(charge.id);
    pi.latest_charge = charge.id;
    pi.payment_method = paymentMethodId;

    if (!succeeded) {
      const error: PaymentError = {
        type: 'card_error',
        code: behaviour.code!,
        decline_code: behaviour.declineCode,
        message: behaviour.message!,
        doc_url: docUrl(behaviour.code!),
        charge: charge.id,
        payment_method: { id: paymentMethodId, object: 'payment_method', type: 'card', card, created, livemode: false },
      };
      pi.status = 'requires_payment_method';
      pi.last_payment_error = error;
      this.emit('charge.failed', charge, ctx);
      this.emit('payment_intent.payment_failed', pi, ctx);
      return { outcome: 'declined', session, paymentIntent: pi, charge, error };
    }

    pi.status = 'succeeded';
    pi.amount_received = pi.amount;
    pi.last_payment_error = null;
    session.status = 'complete';
    session.payment_status = 'paid';
    session.url = null;
    session.customer_details = { address: null, email, name: customer?.name ?? null, phone: null, tax_exempt: 'none', tax_ids: [] };
    // Event order as the fake sends them; the real service does not promise any order.
    this.emit('charge.succeeded', charge, ctx);
    this.emit('payment_intent.succeeded', pi, ctx);
    this.emit('checkout.session.completed', session, ctx);
    return { outcome: 'succeeded', session, paymentIntent: pi, charge };
  }

  // --- payment intents, charges ----------------------------------------------------------

  getPaymentIntent(id: string, param?: string): PaymentIntent {
    const pi = this.paymentIntents.get(id);
    if (!pi) throw noSuch('payment_intent', id, param);
    return pi;
  }

  getCharge(id: string, param?: string): Charge {
    const charge = this.charges.get(id);
    if (!charge) throw noSuch('charge', id, param);
    return charge;
  }

  // --- refunds ---------------------------------------------------------------------------

  createRefund(params: Params, ctx: RequestContext): Refund {
    rejectUnknown(params, ['payment_intent', 'charge', 'amount', 'reason', 'metadata', 'expand']);
    const piId = readString(params, 'payment_intent');
    const chargeId = readString(params, 'charge');
    if (!piId && !chargeId) {
      throw invalidRequest('One of the following params should be provided for this request: payment_intent or charge.', 'parameter_missing', 'payment_intent');
    }
    let charge: Charge | undefined;
    if (piId) {
      const pi = this.getPaymentIntent(piId, 'payment_intent');
      const latest = pi.latest_charge ? this.charges.get(pi.latest_charge) : undefined;
      if (pi.status !== 'succeeded' || !latest || latest.status !== 'succeeded') {
        throw invalidRequest(
          `This PaymentIntent (${pi.id}) does not have a successful charge to refund.`,
          'payment_intent_unexpected_state',
          'payment_intent',
        );
      }
      charge = latest;
      if (chargeId && chargeId !== charge.id) {
        throw invalidParam('charge', `The charge ${chargeId} does not belong to the PaymentIntent ${pi.id}.`);
      }
    } else {
      charge = this.getCharge(chargeId!, 'charge');
      if (charge.status !== 'succeeded') {
        throw invalidRequest(`Charge ${charge.id} has not succeeded and cannot be refunded.`, 'charge_not_refundable', 'charge');
      }
    }
    const remaining = charge.amount - charge.amount_refunded;
    if (remaining <= 0) throw invalidRequest(`Charge ${charge.id} has already been refunded.`, 'charge_already_refunded');
    const amount = readInt(params, 'amount', { min: 1 }) ?? remaining;
    if (amount > remaining) {
      throw invalidRequest(
        `Refund amount (${formatAmount(amount, charge.currency)}) is greater than unrefunded amount on charge (${formatAmount(remaining, charge.currency)})`,
        'amount_too_large',
        'amount',
      );
    }
    const reason = readEnum(params, 'reason', ['duplicate', 'fraudulent', 'requested_by_customer'] as const) ?? null;
    const refund: Refund = {
      id: newId('re_'),
      object: 'refund',
      amount,
      balance_transaction: newId('txn_'),
      charge: charge.id,
      created: now(),
      currency: charge.currency,
      metadata: readMetadata(params, 'metadata'),
      payment_intent: charge.payment_intent,
      reason,
      receipt_number: null,
      // Card refunds in test mode succeed at once (the provider's testing docs: "Refunds").
      status: 'succeeded',
    };
    this.refunds.set(refund.id, refund);
    this.track(refund.id);
    const previous = { amount_refunded: charge.amount_refunded, refunded: charge.refunded };
    charge.amount_refunded += amount;
    charge.refunded = charge.amount_refunded === charge.amount;
    // charge.refunded fires on partial refunds too (the provider's event types list).
    this.emit('charge.refunded', charge, ctx, previous);
    this.emit('refund.created', refund, ctx);
    return refund;
  }

  getRefund(id: string, param?: string): Refund {
    const refund = this.refunds.get(id);
    if (!refund) throw noSuch('refund', id, param);
    return refund;
  }

  // --- events ----------------------------------------------------------------------------

  getEvent(id: string): ProviderEvent {
    const event = this.events.get(id);
    if (!event) throw noSuch('event', id);
    return event;
  }

  // --- expansion -------------------------------------------------------------------------

  /**
   * `expand[]=payment_intent` replaces an id with its object, dotted paths go deeper
   * (the provider's API reference: "Expanding responses"). Only the fields listed here expand.
   */
  expand(object: Record<string, unknown>, paths: string[], prefix = ''): Record<string, unknown> {
    const out = clone(object);
    for (const path of paths) {
      const [head, ...rest] = path.split('.');
      const kind = String(out.object);
      const allowed = EXPANDABLE[kind] ?? [];
      if (!allowed.includes(head)) {
        throw invalidParam('expand', `This property cannot be expanded (${prefix}${head}).`, 'parameter_invalid_string');
      }
      let value: unknown = out[head];
      if (kind === 'checkout.session' && head === 'line_items') {
        const items = this.lineItems.get(String(out.id)) ?? [];
        value = { object: 'list', data: clone(items), has_more: false, url: `/v1/checkout/sessions/${String(out.id)}/line_items` };
      } else if (typeof value === 'string') {
        value = clone(this.lookup(value));
      } else if (isObject(value) && rest.length === 0) {
        continue;
      }
      if (rest.length && isObject(value)) value = this.expand(value, [rest.join('.')], `${prefix}${head}.`);
      out[head] = value;
    }
    return out;
  }

  private lookup(id: string): Record<string, unknown> {
    const found =
      this.customers.get(id) ?? this.paymentIntents.get(id) ?? this.charges.get(id) ?? this.refunds.get(id) ?? this.sessions.get(id);
    if (!found) throw noSuch('object', id);
    return found as unknown as Record<string, unknown>;
  }

  /** Lists expand each element with `data.` paths. */
  expandList<T extends { data: object[] }>(list: T, paths: string[]): T {
    if (!paths.length) return list;
    const inner = paths.map((p) => {
      if (!p.startsWith('data.')) throw invalidParam('expand', `This property cannot be expanded (${p}). You may want to try expanding 'data.${p}' instead.`);
      return p.slice(5);
    });
    return { ...list, data: list.data.map((o) => this.expand(o as Record<string, unknown>, inner)) };
  }
}

const EXPANDABLE: Record<string, string[]> = {
  'checkout.session': ['customer', 'payment_intent', 'line_items'],
  payment_intent: ['customer', 'latest_charge'],
  charge: ['customer', 'payment_intent'],
  refund: ['charge', 'payment_intent'],
  customer: [],
  event: [],
};

