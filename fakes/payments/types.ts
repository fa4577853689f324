// The objects the fake keeps, in the provider's shapes (the provider's API reference: the
// Customer, Checkout Session, PaymentIntent, Charge, Refund and Event objects). Only the fields
// the product can reasonably read are modelled; the rest of a real object is left out.

export type Metadata = Record<string, string>;

export interface Customer {
  id: string;
  object: 'customer';
  address: null | Record<string, string | null>;
  balance: number;
  created: number;
  currency: string | null;
  default_source: null;
  delinquent: boolean;
  description: string | null;
  email: string | null;
  invoice_prefix: string;
  invoice_settings: { custom_fields: null; default_payment_method: null; footer: null; rendering_options: null };
  livemode: false;
  metadata: Metadata;
  name: string | null;
  phone: string | null;
  preferred_locales: string[];
  shipping: null;
  tax_exempt: 'none';
  test_clock: null;
}

export interface Price {
  id: string;
  object: 'price';
  active: boolean;
  billing_scheme: 'per_unit';
  created: number;
  currency: string;
  livemode: false;
  lookup_key: null;
  metadata: Metadata;
  nickname: null;
  product: string;
  recurring: null;
  tax_behavior: 'unspecified';
  type: 'one_time';
  unit_amount: number;
  unit_amount_decimal: string;
}

export interface LineItem {
  id: string;
  object: 'item';
  amount_discount: number;
  amount_subtotal: number;
  amount_tax: number;
  amount_total: number;
  currency: string;
  description: string;
  price: Price;
  quantity: number;
}

export type SessionStatus = 'open' | 'complete' | 'expired';

export interface CheckoutSession {
  id: string;
  object: 'checkout.session';
  after_expiration: null;
  allow_promotion_codes: null;
  amount_subtotal: number;
  amount_total: number;
  automatic_tax: { enabled: false; liability: null; status: null };
  billing_address_collection: null;
  cancel_url: string | null;
  client_reference_id: string | null;
  client_secret: null;
  consent: null;
  consent_collection: null;
  created: number;
  currency: string;
  custom_fields: [];
  custom_text: { after_submit: null; shipping_address: null; submit: null; terms_of_service_acceptance: null };
  customer: string | null;
  customer_creation: 'if_required' | null;
  customer_details: null | {
    address: null;
    email: string | null;
    name: string | null;
    phone: null;
    tax_exempt: 'none';
    tax_ids: [];
  };
  customer_email: string | null;
  expires_at: number;
  invoice: null;
  invoice_creation: null;
  livemode: false;
  locale: string | null;
  metadata: Metadata;
  mode: 'payment';
  payment_intent: string | null;
  payment_link: null;
  payment_method_collection: 'if_required';
  payment_method_options: Record<string, never>;
  payment_method_types: string[];
  payment_status: 'unpaid' | 'paid';
  phone_number_collection: { enabled: false };
  recovered_from: null;
  setup_intent: null;
  shipping_address_collection: null;
  shipping_cost: null;
  shipping_options: [];
  status: SessionStatus;
  submit_type: string | null;
  subscription: null;
  success_url: string | null;
  total_details: { amount_discount: number; amount_shipping: number; amount_tax: number };
  ui_mode: 'hosted';
  url: string | null;
}

export interface CardDetails {
  brand: string;
  country: string;
  exp_month: number;
  exp_year: number;
  fingerprint: string;
  funding: 'credit' | 'debit';
  last4: string;
  network: string;
}

export interface PaymentError {
  type: 'card_error';
  code: string;
  decline_code?: string;
  message: string;
  doc_url: string;
  charge: string;
  payment_method: { id: string; object: 'payment_method'; type: 'card'; card: CardDetails; created: number; livemode: false };
}

export type PaymentIntentStatus = 'requires_payment_method' | 'succeeded' | 'canceled';

export interface PaymentIntent {
  id: string;
  object: 'payment_intent';
  amount: number;
  amount_capturable: number;
  amount_received: number;
  canceled_at: number | null;
  cancellation_reason: string | null;
  capture_method: 'automatic_async';
  client_secret: string;
  confirmation_method: 'automatic';
  created: number;
  currency: string;
  customer: string | null;
  description: string | null;
  last_payment_error: PaymentError | null;
  latest_charge: string | null;
  livemode: false;
  metadata: Metadata;
  payment_method: string | null;
  payment_method_types: string[];
  receipt_email: string | null;
  status: PaymentIntentStatus;
}

export interface Charge {
  id: string;
  object: 'charge';
  amount: number;
  amount_captured: number;
  amount_refunded: number;
  balance_transaction: string | null;
  billing_details: { address: null; email: string | null; name: string | null; phone: null };
  captured: boolean;
  created: number;
  currency: string;
  customer: string | null;
  description: string | null;
  disputed: boolean;
  failure_code: string | null;
  failure_message: string | null;
  livemode: false;
  metadata: Metadata;
  outcome: {
    network_status: 'approved_by_network' | 'declined_by_network';
    reason: string | null;
    risk_level: 'normal';
    seller_message: string;
    type: 'authorized' | 'issuer_declined';
  };
  paid: boolean;
  payment_intent: string;
  payment_method: string;
  payment_method_details: { type: 'card'; card: CardDetails };
  receipt_email: string | null;
  receipt_url: string | null;
  refunded: boolean;
  status: 'succeeded' | 'failed';
}

export interface Refund {
  id: string;
  object: 'refund';
  amount: number;
  balance_transaction: string;
  charge: string;
  created: number;
  currency: string;
  metadata: Metadata;
  payment_intent: string;
  reason: string | null;
  receipt_number: null;
  status: 'succeeded';
}

export type ApiObject = Customer | CheckoutSession | PaymentIntent | Charge | Refund;

export interface ProviderEvent {
  id: string;
  object: 'event';
  api_version: string;
  created: number;
  data: { object: ApiObject; previous_attributes?: Record<string, unknown> };
  livemode: false;
  pending_webhooks: number;
  request: { id: string | null; idempotency_key: string | null };
  type: string;
}

/** Who caused a change: an API request (its id and idempotency key) or the hosted page (nulls). */
export interface RequestContext {
  requestId: string | null;
  idempotencyKey: string | null;
}
