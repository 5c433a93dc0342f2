/**
 * Shapes of the objects the payments fake keeps. Public fields follow the payment service's
 * API as the stripe SDK (v23) reads them; fields starting with "_" are the fake's own
 * bookkeeping and are never sent over the wire.
 */
export type Metadata = Record<string, string>;

interface Base {
  id: string;
  created: number;
  livemode: false;
}

export interface LineItem {
  id: string;
  object: "item";
  amount_subtotal: number;
  amount_total: number;
  currency: string;
  description: string;
  quantity: number;
  price: { id: string; object: "price"; currency: string; unit_amount: number };
}

export interface PaymentIntentData {
  transfer_group: string | null;
  metadata: Metadata;
  description: string | null;
  capture_method: "automatic" | "manual";
}

export interface CheckoutSession extends Base {
  object: "checkout.session";
  amount_subtotal: number;
  amount_total: number;
  cancel_url: string | null;
  client_reference_id: string | null;
  currency: string;
  customer_email: string | null;
  expires_at: number;
  metadata: Metadata;
  mode: "payment";
  payment_intent: string | null;
  payment_method_types: string[];
  payment_status: "unpaid" | "paid";
  status: "open" | "complete" | "expired";
  success_url: string;
  url: string | null;
  _line_items: LineItem[];
  _payment_intent_data: PaymentIntentData;
  /** The payment intent made on the first attempt (a decline), reused when paid. */
  _pending_pi: string | null;
}

export type PaymentIntentStatus =
  | "requires_payment_method"
  | "requires_confirmation"
  | "requires_action"
  | "processing"
  | "requires_capture"
  | "canceled"
  | "succeeded";

export interface PaymentError {
  type: "card_error";
  code: string;
  decline_code: string;
  message: string;
  charge: string | null;
}

export interface PaymentIntent extends Base {
  object: "payment_intent";
  amount: number;
  amount_capturable: number;
  amount_received: number;
  canceled_at: number | null;
  cancellation_reason: string | null;
  capture_method: "automatic" | "manual";
  client_secret: string;
  confirmation_method: "automatic";
  currency: string;
  description: string | null;
  last_payment_error: PaymentError | null;
  latest_charge: string | null;
  metadata: Metadata;
  payment_method: string | null;
  payment_method_types: string[];
  status: PaymentIntentStatus;
  transfer_group: string | null;
  /** Set when a checkout session made this payment intent. */
  _checkout_session: string | null;
}

export interface Charge extends Base {
  object: "charge";
  amount: number;
  amount_captured: number;
  amount_refunded: number;
  balance_transaction: null;
  captured: boolean;
  currency: string;
  description: string | null;
  failure_code: string | null;
  failure_message: string | null;
  metadata: Metadata;
  paid: boolean;
  payment_intent: string;
  payment_method: string;
  refunded: boolean;
  status: "succeeded" | "failed";
  transfer_group: string | null;
}

export interface Refund extends Base {
  object: "refund";
  amount: number;
  charge: string;
  currency: string;
  metadata: Metadata;
  payment_intent: string;
  reason: string | null;
  status: "succeeded";
}

export type CapabilityStatus = "active" | "inactive" | "pending";

export interface Account extends Base {
  object: "account";
  type: "express";
  business_profile: Record<string, unknown>;
  business_type: string | null;
  capabilities: Record<string, CapabilityStatus>;
  charges_enabled: boolean;
  country: string;
  default_currency: string;
  details_submitted: boolean;
  email: string | null;
  metadata: Metadata;
  payouts_enabled: boolean;
  requirements: {
    currently_due: string[];
    eventually_due: string[];
    past_due: string[];
    disabled_reason: string | null;
  };
}

export interface Transfer extends Base {
  object: "transfer";
  amount: number;
  amount_reversed: number;
  currency: string;
  description: string | null;
  destination: string;
  destination_payment: null;
  metadata: Metadata;
  reversed: boolean;
  source_transaction: string | null;
  transfer_group: string | null;
}

export interface AccountLinkRecord {
  id: string;
  account: string;
  refresh_url: string;
  return_url: string;
  type: "account_onboarding" | "account_update";
  expires_at: number;
  used: boolean;
}

export interface FakeEvent {
  id: string;
  object: "event";
  account?: string;
  api_version: string;
  created: number;
  data: { object: unknown; previous_attributes?: Record<string, unknown> };
  livemode: false;
  pending_webhooks: number;
  request: { id: string | null; idempotency_key: string | null };
  type: string;
}

export interface DeliveryAttempt {
  at: string;
  /** HTTP status the receiver answered, or null when it could not be reached. */
  status: number | null;
  error: string | null;
  ms: number;
  dropped?: boolean;
}

export interface EventRecord {
  event: FakeEvent;
  /** pending: queued or being retried; failed: gave up; dropped: a fault switch ate it. */
  delivery: "pending" | "delivered" | "failed" | "dropped" | "disabled";
  attempts: DeliveryAttempt[];
}

export interface IdempotencyRecord {
  method: string;
  path: string;
  body: string;
  status: number;
  response: string;
  at: number;
}

export interface FakeState {
  version: 1;
  counters: Record<string, number>;
  apiVersion: string;
  checkoutSessions: Record<string, CheckoutSession>;
  paymentIntents: Record<string, PaymentIntent>;
  charges: Record<string, Charge>;
  refunds: Record<string, Refund>;
  accounts: Record<string, Account>;
  accountLinks: Record<string, AccountLinkRecord>;
  transfers: Record<string, Transfer>;
  events: Record<string, EventRecord>;
  idempotency: Record<string, IdempotencyRecord>;
}

/** The API version the SDK pins (stripe 23.1); used for events when no request named one. */
export const DEFAULT_API_VERSION = "2026-10-28.endive";

export function emptyState(): FakeState {
  return {
    version: 1,
    counters: {},
    apiVersion: DEFAULT_API_VERSION,
    checkoutSessions: {},
    paymentIntents: {},
    charges: {},
    refunds: {},
    accounts: {},
    accountLinks: {},
    transfers: {},
    events: {},
    idempotency: {},
  };
}
