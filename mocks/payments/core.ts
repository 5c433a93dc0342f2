/**
 * The payments fake's business rules over its state: checkout sessions, payment intents and
 * their charges, refunds, payout accounts and their onboarding, transfers and the platform
 * balance. Every method is synchronous, so one request's changes never interleave with
 * another's. Events are recorded here and handed to `onEvent` for delivery.
 */
import { ApiError, invalid, missing } from "./params";
import type {
  Account,
  Charge,
  CheckoutSession,
  EventRecord,
  FakeEvent,
  FakeState,
  LineItem,
  Metadata,
  PaymentIntent,
  PaymentIntentData,
  Refund,
  Transfer,
} from "./types";

export interface RequestInfo {
  requestId: string | null;
  idempotencyKey: string | null;
}

const NO_REQUEST: RequestInfo = { requestId: null, idempotencyKey: null };

/**
 * Smallest charge per currency, in minor units. From memory of the service's published
 * minimums (GBP 30p, USD/EUR 50 cents); other currencies are only checked to be positive.
 */
const MINIMUM_CHARGE: Record<string, number> = { gbp: 30, usd: 50, eur: 50 };

const COUNTRY_CURRENCY: Record<string, string> = { GB: "gbp", US: "usd", IE: "eur", DE: "eur" };

/** Payment methods the fake knows: test card tokens; any token naming a decline is refused. */
export const TEST_CARD = "pm_card_visa";
export const DECLINING_CARD = "pm_card_chargeDeclined";

const deepCopy = <T>(v: T): T => JSON.parse(JSON.stringify(v)) as T;

/** An object as the API shows it: a deep copy without the fake's own "_" fields. */
export function publicView<T>(obj: T): T {
  return JSON.parse(JSON.stringify(obj, (k, v: unknown) => (k.startsWith("_") ? undefined : v)));
}

export function checkMinimum(amount: number, currency: string, param = "amount") {
  const min = MINIMUM_CHARGE[currency] ?? 1;
  if (amount < min)
    throw invalid(
      `Amount must be at least ${min} (minor units) in ${currency.toUpperCase()}`,
      param,
      "amount_too_small",
    );
}

export class PaymentsCore {
  constructor(
    public state: FakeState,
    private readonly options: {
      baseUrl: () => string;
      defaultCurrency: string;
      webhooksEnabled: () => boolean;
      onEvent: (record: EventRecord) => void;
    },
  ) {}

  baseUrl(): string {
    return this.options.baseUrl();
  }

  defaultCurrency(): string {
    return this.options.defaultCurrency.toLowerCase();
  }

  now(): number {
    return Math.floor(Date.now() / 1000);
  }

  nextId(prefix: string): string {
    const n = (this.state.counters[prefix] ?? 0) + 1;
    this.state.counters[prefix] = n;
    return `${prefix}_test_${String(n).padStart(6, "0")}`;
  }

  emit(
    type: string,
    object: unknown,
    request: RequestInfo = NO_REQUEST,
    extra: { previous?: Record<string, unknown>; account?: string } = {},
  ): FakeEvent {
    const event: FakeEvent = {
      id: this.nextId("evt"),
      object: "event",
      ...(extra.account ? { account: extra.account } : {}),
      api_version: this.state.apiVersion,
      created: this.now(),
      data: {
        object: publicView(object),
        ...(extra.previous ? { previous_attributes: extra.previous } : {}),
      },
      livemode: false,
      pending_webhooks: this.options.webhooksEnabled() ? 1 : 0,
      request: { id: request.requestId, idempotency_key: request.idempotencyKey },
      type,
    };
    const record: EventRecord = {
      event,
      delivery: this.options.webhooksEnabled() ? "pending" : "disabled",
      attempts: [],
    };
    this.state.events[event.id] = record;
    this.options.onEvent(record);
    return event;
  }

  /** Any object by id, for `expand`. */
  find(id: string): { object: string } | undefined {
    const s = this.state;
    for (const map of [
      s.checkoutSessions,
      s.paymentIntents,
      s.charges,
      s.refunds,
      s.accounts,
      s.transfers,
    ] as Record<string, { object: string }>[]) {
      if (map[id]) return map[id];
    }
    return undefined;
  }

  // ---------------------------------------------------------------- checkout sessions

  createCheckoutSession(
    input: {
      lineItems: Omit<LineItem, "id" | "object">[];
      currency: string;
      successUrl: string;
      cancelUrl: string | null;
      metadata: Metadata;
      clientReferenceId: string | null;
      customerEmail: string | null;
      expiresAt: number | null;
      paymentIntentData: PaymentIntentData;
    },
    _req: RequestInfo,
  ): CheckoutSession {
    const id = this.nextId("cs");
    const created = this.now();
    const lineItems: LineItem[] = input.lineItems.map((li) => ({
      ...li,
      id: this.nextId("li"),
      object: "item",
    }));
    const total = lineItems.reduce((sum, li) => sum + li.amount_total, 0);
    checkMinimum(total, input.currency, "line_items");
    const session: CheckoutSession = {
      id,
      object: "checkout.session",
      amount_subtotal: total,
      amount_total: total,
      cancel_url: input.cancelUrl,
      client_reference_id: input.clientReferenceId,
      created,
      currency: input.currency,
      customer_email: input.customerEmail,
      expires_at: input.expiresAt ?? created + 24 * 3600,
      livemode: false,
      metadata: input.metadata,
      mode: "payment",
      payment_intent: null,
      payment_method_types: ["card"],
      payment_status: "unpaid",
      status: "open",
      success_url: input.successUrl,
      url: `${this.options.baseUrl()}/_fake/checkout/${id}`,
      _line_items: lineItems,
      _payment_intent_data: input.paymentIntentData,
      _pending_pi: null,
    };
    this.state.checkoutSessions[id] = session;
    return session;
  }

  checkoutSession(id: string): CheckoutSession {
    const s = this.state.checkoutSessions[id];
    if (!s) throw missing("checkout.session", id);
    this.expireIfDue(s);
    return s;
  }

  /** Sessions past their expiry become expired (as the service does in the background). */
  expireIfDue(s: CheckoutSession) {
    if (s.status === "open" && this.now() >= s.expires_at) this.expireSession(s, NO_REQUEST);
  }

  sweepExpired() {
    for (const s of Object.values(this.state.checkoutSessions)) this.expireIfDue(s);
  }

  expireSession(s: CheckoutSession, req: RequestInfo): CheckoutSession {
    if (s.status !== "open")
      throw invalid(
        `Only open checkout sessions can be expired; this one is ${s.status}.`,
        "session",
        "checkout_session_unexpected_state",
      );
    s.status = "expired";
    s.url = null;
    if (s._pending_pi) {
      const pi = this.state.paymentIntents[s._pending_pi];
      if (pi && pi.status !== "succeeded") {
        pi.status = "canceled";
        pi.canceled_at = this.now();
        pi.cancellation_reason = "automatic";
      }
    }
    this.emit("checkout.session.expired", s, req);
    return s;
  }

  private sessionPaymentIntent(s: CheckoutSession): PaymentIntent {
    const existing = s._pending_pi ? this.state.paymentIntents[s._pending_pi] : undefined;
    if (existing) return existing;
    const d = s._payment_intent_data;
    const pi = this.newPaymentIntent({
      amount: s.amount_total,
      currency: s.currency,
      metadata: { ...d.metadata },
      description: d.description,
      transferGroup: d.transfer_group,
      captureMethod: d.capture_method,
      paymentMethod: null,
    });
    pi._checkout_session = s.id;
    s._pending_pi = pi.id;
    return pi;
  }

  /**
   * The hosted checkout page's buttons. A decline leaves the session open (the buyer can try
   * again) and fires payment_intent.payment_failed; paying completes it and fires the
   * payment intent's events and checkout.session.completed.
   */
  payCheckoutSession(s: CheckoutSession, card: "ok" | "decline"): "paid" | "declined" | "closed" {
    this.expireIfDue(s);
    if (s.status !== "open") return "closed";
    const pi = this.sessionPaymentIntent(s);
    const outcome = this.attemptPayment(pi, card === "ok" ? TEST_CARD : DECLINING_CARD, NO_REQUEST);
    if (outcome === "declined") return "declined";
    s.status = "complete";
    s.payment_status = pi.status === "succeeded" ? "paid" : "unpaid";
    s.payment_intent = pi.id;
    s.url = null;
    this.emit("checkout.session.completed", s);
    return "paid";
  }

  // ---------------------------------------------------------------- payment intents

  newPaymentIntent(input: {
    amount: number;
    currency: string;
    metadata: Metadata;
    description: string | null;
    transferGroup: string | null;
    captureMethod: "automatic" | "manual";
    paymentMethod: string | null;
  }): PaymentIntent {
    checkMinimum(input.amount, input.currency);
    if (input.paymentMethod) this.checkPaymentMethod(input.paymentMethod);
    const id = this.nextId("pi");
    const pi: PaymentIntent = {
      id,
      object: "payment_intent",
      amount: input.amount,
      amount_capturable: 0,
      amount_received: 0,
      canceled_at: null,
      cancellation_reason: null,
      capture_method: input.captureMethod,
      client_secret: `${id}_secret_local`,
      confirmation_method: "automatic",
      created: this.now(),
      currency: input.currency,
      description: input.description,
      last_payment_error: null,
      latest_charge: null,
      livemode: false,
      metadata: input.metadata,
      payment_method: input.paymentMethod,
      payment_method_types: ["card"],
      status: input.paymentMethod ? "requires_confirmation" : "requires_payment_method",
      transfer_group: input.transferGroup,
      _checkout_session: null,
    };
    this.state.paymentIntents[id] = pi;
    return pi;
  }

  paymentIntent(id: string): PaymentIntent {
    const pi = this.state.paymentIntents[id];
    if (!pi) throw missing("payment_intent", id);
    return pi;
  }

  checkPaymentMethod(pm: string) {
    if (!/^pm_card_\w+$/.test(pm)) throw missing("PaymentMethod", pm, "payment_method");
  }

  private unexpectedState(pi: PaymentIntent, action: string) {
    return new ApiError(
      400,
      "invalid_request_error",
      `This PaymentIntent's status is ${pi.status}, so it cannot be ${action}.`,
      "payment_intent_unexpected_state",
      undefined,
      { payment_intent: publicView(pi) },
    );
  }

  /** One attempt to charge a card; records a charge either way. */
  private attemptPayment(
    pi: PaymentIntent,
    paymentMethod: string,
    req: RequestInfo,
  ): "succeeded" | "declined" {
    const declined = /declin/i.test(paymentMethod);
    const manual = pi.capture_method === "manual";
    const charge: Charge = {
      id: this.nextId("ch"),
      object: "charge",
      amount: pi.amount,
      amount_captured: declined || manual ? 0 : pi.amount,
      amount_refunded: 0,
      balance_transaction: null,
      captured: !declined && !manual,
      created: this.now(),
      currency: pi.currency,
      description: pi.description,
      failure_code: declined ? "card_declined" : null,
      failure_message: declined ? "The card was declined (declining test card)." : null,
      livemode: false,
      metadata: { ...pi.metadata },
      paid: !declined,
      payment_intent: pi.id,
      payment_method: paymentMethod,
      refunded: false,
      status: declined ? "failed" : "succeeded",
      transfer_group: pi.transfer_group,
    };
    this.state.charges[charge.id] = charge;
    pi.latest_charge = charge.id;
    if (declined) {
      pi.status = "requires_payment_method";
      pi.payment_method = null;
      pi.last_payment_error = {
        type: "card_error",
        code: "card_declined",
        decline_code: "generic_decline",
        message: "The card was declined (declining test card).",
        charge: charge.id,
      };
      this.emit("charge.failed", charge, req);
      this.emit("payment_intent.payment_failed", pi, req);
      return "declined";
    }
    pi.payment_method = paymentMethod;
    pi.last_payment_error = null;
    if (manual) {
      pi.status = "requires_capture";
      pi.amount_capturable = pi.amount;
      this.emit("charge.succeeded", charge, req);
      this.emit("payment_intent.amount_capturable_updated", pi, req);
    } else {
      pi.status = "succeeded";
      pi.amount_received = pi.amount;
      this.emit("charge.succeeded", charge, req);
      this.emit("payment_intent.succeeded", pi, req);
    }
    return "succeeded";
  }

  confirmPaymentIntent(pi: PaymentIntent, paymentMethod: string | undefined, req: RequestInfo) {
    if (pi.status !== "requires_payment_method" && pi.status !== "requires_confirmation")
      throw this.unexpectedState(pi, "confirmed");
    if (pi._checkout_session)
      throw invalid(
        "This PaymentIntent belongs to a checkout session; pay it on the checkout page.",
        undefined,
        "payment_intent_unexpected_state",
      );
    if (paymentMethod) this.checkPaymentMethod(paymentMethod);
    const pm = paymentMethod ?? pi.payment_method;
    if (!pm)
      throw invalid(
        "A payment method is needed to confirm this PaymentIntent.",
        "payment_method",
        "parameter_missing",
      );
    if (this.attemptPayment(pi, pm, req) === "declined") {
      throw new ApiError(
        402,
        "card_error",
        "The card was declined (declining test card).",
        "card_declined",
        undefined,
        {
          decline_code: "generic_decline",
          charge: pi.latest_charge,
          payment_intent: publicView(pi),
        },
      );
    }
    return pi;
  }

  capturePaymentIntent(pi: PaymentIntent, amount: number | undefined, req: RequestInfo) {
    if (pi.status !== "requires_capture") throw this.unexpectedState(pi, "captured");
    const amt = amount ?? pi.amount_capturable;
    if (amt > pi.amount_capturable)
      throw invalid(
        `amount_to_capture ${amt} is more than the ${pi.amount_capturable} that can be captured.`,
        "amount_to_capture",
        "amount_too_large",
      );
    const charge = this.state.charges[pi.latest_charge ?? ""];
    if (!charge) throw this.unexpectedState(pi, "captured");
    charge.captured = true;
    charge.amount_captured = amt;
    pi.amount_received = amt;
    pi.amount_capturable = 0;
    pi.status = "succeeded";
    this.emit("charge.captured", charge, req);
    this.emit("payment_intent.succeeded", pi, req);
    return pi;
  }

  cancelPaymentIntent(pi: PaymentIntent, reason: string | undefined, req: RequestInfo) {
    if (pi.status === "succeeded" || pi.status === "canceled")
      throw this.unexpectedState(pi, "canceled");
    const session = pi._checkout_session
      ? this.state.checkoutSessions[pi._checkout_session]
      : undefined;
    if (session && session.status === "open")
      throw invalid(
        "This PaymentIntent belongs to an open checkout session; expire the session instead.",
        undefined,
        "payment_intent_unexpected_state",
      );
    if (pi.status === "requires_capture") {
      const charge = this.state.charges[pi.latest_charge ?? ""];
      if (charge) {
        charge.refunded = true;
        charge.amount_refunded = charge.amount;
      }
      pi.amount_capturable = 0;
    }
    pi.status = "canceled";
    pi.canceled_at = this.now();
    pi.cancellation_reason = reason ?? null;
    this.emit("payment_intent.canceled", pi, req);
    return pi;
  }

  // ---------------------------------------------------------------- refunds

  refundableCharge(pi: PaymentIntent): Charge {
    const charge = pi.latest_charge ? this.state.charges[pi.latest_charge] : undefined;
    if (pi.status !== "succeeded" || !charge || !charge.captured)
      throw invalid(
        `PaymentIntent ${pi.id} has no captured payment to refund (status ${pi.status}).`,
        "payment_intent",
        "payment_intent_unexpected_state",
      );
    return charge;
  }

  createRefund(
    charge: Charge,
    input: { amount: number | undefined; reason: string | null; metadata: Metadata },
    req: RequestInfo,
  ): Refund {
    const remaining = charge.amount_captured - charge.amount_refunded;
    if (remaining <= 0)
      throw invalid(
        `Charge ${charge.id} has already been refunded in full.`,
        "amount",
        "charge_already_refunded",
      );
    const amount = input.amount ?? remaining;
    if (amount > remaining)
      throw invalid(
        `Refund of ${amount} is more than the ${remaining} left to refund on charge ${charge.id}.`,
        "amount",
        "amount_too_large",
      );
    const refund: Refund = {
      id: this.nextId("re"),
      object: "refund",
      amount,
      charge: charge.id,
      created: this.now(),
      currency: charge.currency,
      livemode: false,
      metadata: input.metadata,
      payment_intent: charge.payment_intent,
      reason: input.reason,
      status: "succeeded",
    };
    this.state.refunds[refund.id] = refund;
    charge.amount_refunded += amount;
    charge.refunded = charge.amount_refunded >= charge.amount_captured;
    this.emit("refund.created", refund, req);
    this.emit("charge.refunded", charge, req);
    return refund;
  }

  refund(id: string): Refund {
    const r = this.state.refunds[id];
    if (!r) throw missing("refund", id);
    return r;
  }

  charge(id: string, param = "id"): Charge {
    const c = this.state.charges[id];
    if (!c) throw missing("charge", id, param);
    return c;
  }

  // ---------------------------------------------------------------- payout accounts

  createAccount(input: {
    email: string | null;
    country: string;
    defaultCurrency: string | null;
    businessType: string | null;
    businessProfile: Record<string, unknown>;
    capabilities: string[];
    metadata: Metadata;
  }): Account {
    const caps: Record<string, "inactive"> = { transfers: "inactive" };
    for (const c of input.capabilities) caps[c] = "inactive";
    const account: Account = {
      id: this.nextId("acct"),
      object: "account",
      type: "express",
      business_profile: input.businessProfile,
      business_type: input.businessType,
      capabilities: caps,
      charges_enabled: false,
      country: input.country,
      created: this.now(),
      default_currency:
        input.defaultCurrency ??
        COUNTRY_CURRENCY[input.country] ??
        this.options.defaultCurrency.toLowerCase(),
      details_submitted: false,
      email: input.email,
      livemode: false,
      metadata: input.metadata,
      payouts_enabled: false,
      requirements: {
        currently_due: ["external_account", "individual.verification.document", "tos_acceptance"],
        eventually_due: ["external_account", "individual.verification.document", "tos_acceptance"],
        past_due: [],
        disabled_reason: "requirements.past_due",
      },
    };
    this.state.accounts[account.id] = account;
    return account;
  }

  account(id: string, param = "id"): Account {
    const a = this.state.accounts[id];
    if (!a) throw missing("account", id, param);
    return a;
  }

  /** The connect page's "complete" button: everything enabled, account.updated fired. */
  onboardAccount(account: Account) {
    if (account.details_submitted && account.payouts_enabled) return;
    const previous = {
      charges_enabled: account.charges_enabled,
      payouts_enabled: account.payouts_enabled,
      details_submitted: account.details_submitted,
      capabilities: deepCopy(account.capabilities),
      requirements: deepCopy(account.requirements),
    };
    account.charges_enabled = true;
    account.payouts_enabled = true;
    account.details_submitted = true;
    for (const k of Object.keys(account.capabilities)) account.capabilities[k] = "active";
    account.requirements = {
      currently_due: [],
      eventually_due: [],
      past_due: [],
      disabled_reason: null,
    };
    this.emit("account.updated", account, NO_REQUEST, { previous, account: account.id });
  }

  createAccountLink(input: {
    account: Account;
    refreshUrl: string;
    returnUrl: string;
    type: "account_onboarding" | "account_update";
  }) {
    const id = this.nextId("link");
    const created = this.now();
    const expires = created + 300;
    this.state.accountLinks[id] = {
      id,
      account: input.account.id,
      refresh_url: input.refreshUrl,
      return_url: input.returnUrl,
      type: input.type,
      expires_at: expires,
      used: false,
    };
    return {
      object: "account_link" as const,
      created,
      expires_at: expires,
      url: `${this.options.baseUrl()}/_fake/connect/${input.account.id}?link=${id}`,
    };
  }

  // ---------------------------------------------------------------- transfers and balance

  /** Available platform balance per currency: captured charges − refunds − transfers. */
  platformBalance(): Map<string, number> {
    const b = new Map<string, number>();
    const add = (cur: string, n: number) => b.set(cur, (b.get(cur) ?? 0) + n);
    for (const c of Object.values(this.state.charges)) add(c.currency, c.amount_captured);
    for (const r of Object.values(this.state.refunds)) add(r.currency, -r.amount);
    for (const t of Object.values(this.state.transfers))
      add(t.currency, -(t.amount - t.amount_reversed));
    return b;
  }

  /** A payout account's balance: what was transferred to it. */
  accountBalance(accountId: string): Map<string, number> {
    const b = new Map<string, number>();
    for (const t of Object.values(this.state.transfers))
      if (t.destination === accountId)
        b.set(t.currency, (b.get(t.currency) ?? 0) + t.amount - t.amount_reversed);
    return b;
  }

  createTransfer(
    input: {
      amount: number;
      currency: string;
      destination: string;
      transferGroup: string | null;
      sourceTransaction: string | null;
      description: string | null;
      metadata: Metadata;
    },
    req: RequestInfo,
  ): Transfer {
    const account = this.state.accounts[input.destination];
    if (!account)
      throw invalid(
        `No such destination: '${input.destination}'`,
        "destination",
        "resource_missing",
      );
    if (account.capabilities.transfers !== "active" || !account.payouts_enabled)
      throw invalid(
        `Payout account ${account.id} has not finished setup, so it cannot receive transfers yet.`,
        "destination",
        "insufficient_capabilities_for_transfer",
      );
    if (input.sourceTransaction) {
      const charge = this.charge(input.sourceTransaction, "source_transaction");
      if (charge.currency !== input.currency)
        throw invalid(
          `The transfer's currency (${input.currency}) differs from the source charge's (${charge.currency}).`,
          "currency",
        );
      const used = Object.values(this.state.transfers)
        .filter((t) => t.source_transaction === charge.id)
        .reduce((sum, t) => sum + t.amount - t.amount_reversed, 0);
      const left = charge.amount_captured - charge.amount_refunded - used;
      if (input.amount > left)
        throw invalid(
          `Transfer of ${input.amount} is more than the ${left} left on source charge ${charge.id}.`,
          "amount",
          "amount_too_large",
        );
    }
    const available = this.platformBalance().get(input.currency) ?? 0;
    if (input.amount > available)
      throw invalid(
        `The platform's available ${input.currency.toUpperCase()} balance (${available}) is less than the transfer (${input.amount}).`,
        "amount",
        "balance_insufficient",
      );
    const transfer: Transfer = {
      id: this.nextId("tr"),
      object: "transfer",
      amount: input.amount,
      amount_reversed: 0,
      created: this.now(),
      currency: input.currency,
      description: input.description,
      destination: account.id,
      destination_payment: null,
      livemode: false,
      metadata: input.metadata,
      reversed: false,
      source_transaction: input.sourceTransaction,
      transfer_group: input.transferGroup,
    };
    this.state.transfers[transfer.id] = transfer;
    this.emit("transfer.created", transfer, req);
    return transfer;
  }

  transfer(id: string): Transfer {
    const t = this.state.transfers[id];
    if (!t) throw missing("transfer", id);
    return t;
  }
}
