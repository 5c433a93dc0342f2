/**
 * The /v1 routes of the payments fake: parameters read and checked here, rules applied by
 * PaymentsCore. Each handler returns the response object; errors are thrown as ApiError.
 */
import { ApiError, freshMetadata, invalid, mergeMetadata, Params } from "./params";
import { PaymentsCore, publicView, type RequestInfo } from "./core";
import type { CheckoutSession, LineItem } from "./types";

export interface ApiContext {
  method: string;
  params: Params;
  match: string[];
  stripeAccount: string | null;
  req: RequestInfo;
}

type Handler = (core: PaymentsCore, ctx: ApiContext) => unknown;

interface Listable {
  id: string;
  created: number;
}

/** A list page, newest first, with limit / starting_after / ending_before / created filters. */
function listOf<T extends Listable>(
  all: T[],
  p: Params,
  url: string,
  filter: (item: T) => boolean = () => true,
) {
  const limit = p.int("limit", 1, 100) ?? 10;
  const after = p.str("starting_after");
  const before = p.str("ending_before");
  const created = p.object("created");
  const range = {
    gt: created?.int("gt"),
    gte: created?.int("gte"),
    lt: created?.int("lt"),
    lte: created?.int("lte"),
  };
  const exactCreated = created ? undefined : p.int("created");
  let items = [...all]
    .reverse()
    .filter(filter)
    .filter(
      (i) =>
        (exactCreated === undefined || i.created === exactCreated) &&
        (range.gt === undefined || i.created > range.gt) &&
        (range.gte === undefined || i.created >= range.gte) &&
        (range.lt === undefined || i.created < range.lt) &&
        (range.lte === undefined || i.created <= range.lte),
    );
  let hasMore: boolean;
  if (after) {
    const at = items.findIndex((i) => i.id === after);
    if (at < 0) throw invalid(`No such object: '${after}'`, "starting_after", "resource_missing");
    items = items.slice(at + 1);
    hasMore = items.length > limit;
    items = items.slice(0, limit);
  } else if (before) {
    const at = items.findIndex((i) => i.id === before);
    if (at < 0) throw invalid(`No such object: '${before}'`, "ending_before", "resource_missing");
    items = items.slice(0, at);
    hasMore = items.length > limit;
    items = items.slice(Math.max(0, items.length - limit));
  } else {
    hasMore = items.length > limit;
    items = items.slice(0, limit);
  }
  return { object: "list", data: items, has_more: hasMore, url };
}

function lineItemList(s: CheckoutSession, p?: Params) {
  const url = `/v1/checkout/sessions/${s.id}/line_items`;
  if (!p) return { object: "list", data: s._line_items, has_more: false, url };
  return listOf(
    s._line_items.map((li) => ({ ...li, created: s.created })),
    p,
    url,
  );
}

/** Replace id fields named in `expand` (dotted paths; "data." for lists) with the objects. */
export function expand(core: PaymentsCore, value: unknown, paths: string[]): unknown {
  const out = publicView(value) as Record<string, unknown>;
  for (const path of paths) expandPath(core, out, path.split("."), path);
  return out;
}

function expandPath(
  core: PaymentsCore,
  obj: Record<string, unknown>,
  parts: string[],
  full: string,
) {
  const [key, ...rest] = parts;
  if (!key) return;
  if (obj.object === "list" && key === "data" && Array.isArray(obj.data)) {
    for (const item of obj.data as Record<string, unknown>[]) expandPath(core, item, rest, full);
    return;
  }
  let v = obj[key];
  if (typeof v === "string") {
    const found = core.find(v);
    if (!found) throw invalid(`This property cannot be expanded (${full}).`, "expand");
    v = publicView(found);
    obj[key] = v;
  } else if (key === "line_items" && obj.object === "checkout.session") {
    const s = core.state.checkoutSessions[String(obj.id)];
    if (s) obj[key] = v = publicView(lineItemList(s));
  } else if (v === undefined || (v !== null && typeof v !== "object")) {
    throw invalid(`This property cannot be expanded (${full}).`, "expand");
  }
  if (rest.length && v && typeof v === "object")
    expandPath(core, v as Record<string, unknown>, rest, full);
}

function balanceBody(amounts: Map<string, number>, fallbackCurrency: string) {
  const entries = amounts.size ? [...amounts] : [[fallbackCurrency.toLowerCase(), 0] as const];
  return {
    object: "balance",
    available: entries.map(([currency, amount]) => ({
      amount,
      currency,
      source_types: { card: amount },
    })),
    pending: entries.map(([currency]) => ({ amount: 0, currency, source_types: { card: 0 } })),
    livemode: false,
  };
}

// ---------------------------------------------------------------- checkout sessions

const createCheckoutSession: Handler = (core, { params: p, req }) => {
  p.reqOneOf("mode", ["payment"] as const);
  const uiMode = p.oneOf("ui_mode", ["hosted"] as const);
  void uiMode;
  const successUrl = p.reqUrl("success_url");
  const cancelUrl = p.url("cancel_url") ?? null;
  let currency = p.currency("currency");
  const items = p.list("line_items");
  if (items.length === 0)
    throw invalid("line_items must have at least one item", "line_items", "parameter_missing");
  const lineItems: Omit<LineItem, "id" | "object">[] = items.map((li) => {
    const quantity = li.int("quantity", 1, 1000) ?? 1;
    const priceData = li.object("price_data");
    let unit: number;
    let cur: string;
    let name: string;
    if (priceData) {
      cur = priceData.reqCurrency("currency");
      unit = priceData.reqInt("unit_amount", 0);
      const product = priceData.object("product_data");
      if (!product)
        throw invalid(
          `Missing required parameter: ${priceData.name("product_data")}`,
          priceData.name("product_data"),
          "parameter_missing",
        );
      name = product.reqStr("name", 250);
      product.str("description", 500);
      product.metadata();
      priceData.metadata();
    } else if (li.has("amount")) {
      unit = li.reqInt("amount", 0);
      cur = li.reqCurrency("currency");
      name = li.reqStr("name", 250);
      li.str("description", 500);
    } else {
      if (li.has("price"))
        throw invalid("This fake does not keep prices; send price_data.", li.name("price"));
      throw invalid(
        `Missing required parameter: ${li.name("price_data")}`,
        li.name("price_data"),
        "parameter_missing",
      );
    }
    currency ??= cur;
    if (cur !== currency)
      throw invalid("All line items must use the session's currency", li.name("currency"));
    return {
      amount_subtotal: unit * quantity,
      amount_total: unit * quantity,
      currency: cur,
      description: name,
      quantity,
      price: { id: core.nextId("price"), object: "price", currency: cur, unit_amount: unit },
    };
  });
  const pid = p.object("payment_intent_data");
  const paymentIntentData = {
    transfer_group: pid?.str("transfer_group") ?? null,
    metadata: freshMetadata(pid?.metadata()),
    description: pid?.str("description", 1000) ?? null,
    capture_method: pid?.oneOf("capture_method", ["automatic", "manual"] as const) ?? "automatic",
  };
  pid?.str("receipt_email");
  pid?.str("statement_descriptor", 22);
  const types = p.strings("payment_method_types");
  if (types.some((t) => t !== "card"))
    throw invalid("This fake offers card payments only", "payment_method_types");
  p.oneOf("locale", ["auto", "en", "en-GB"] as const);
  p.oneOf("submit_type", ["auto", "pay", "book"] as const);
  const expiresAt = p.int("expires_at", 0, 4_102_444_800);
  const now = core.now();
  if (expiresAt !== undefined && (expiresAt < now + 1800 - 5 || expiresAt > now + 24 * 3600 + 5))
    throw invalid("expires_at must be between 30 minutes and 24 hours from now", "expires_at");
  const session = core.createCheckoutSession(
    {
      lineItems,
      currency: currency!,
      successUrl,
      cancelUrl,
      metadata: freshMetadata(p.metadata()),
      clientReferenceId: p.str("client_reference_id", 200) ?? null,
      customerEmail: p.str("customer_email", 512) ?? null,
      expiresAt: expiresAt ?? null,
      paymentIntentData,
    },
    req,
  );
  p.done();
  return session;
};

// ---------------------------------------------------------------- payment intents

const createPaymentIntent: Handler = (core, { params: p, req }) => {
  const amount = p.reqInt("amount", 1);
  const currency = p.reqCurrency("currency");
  const confirm = p.bool("confirm") ?? false;
  const input = {
    amount,
    currency,
    metadata: freshMetadata(p.metadata()),
    description: p.str("description", 1000) ?? null,
    transferGroup: p.str("transfer_group") ?? null,
    captureMethod: p.oneOf("capture_method", ["automatic", "manual"] as const) ?? "automatic",
    paymentMethod: p.str("payment_method") ?? null,
  };
  const types = p.strings("payment_method_types");
  if (types.some((t) => t !== "card"))
    throw invalid("This fake offers card payments only", "payment_method_types");
  p.object("automatic_payment_methods")?.bool("enabled");
  p.str("receipt_email");
  p.done();
  const pi = core.newPaymentIntent(input);
  if (confirm) core.confirmPaymentIntent(pi, undefined, req);
  return pi;
};

const updatePaymentIntent: Handler = (core, { params: p, match }) => {
  const pi = core.paymentIntent(match[0]!);
  const amount = p.int("amount", 1);
  const currency = p.currency("currency");
  const metadata = p.metadata();
  const description = p.str("description", 1000);
  const transferGroup = p.str("transfer_group");
  const paymentMethod = p.str("payment_method");
  p.done();
  const changesMoney = amount !== undefined || currency !== undefined || paymentMethod;
  if (
    changesMoney &&
    pi.status !== "requires_payment_method" &&
    pi.status !== "requires_confirmation"
  )
    throw new ApiError(
      400,
      "invalid_request_error",
      `This PaymentIntent's amount, currency or payment method cannot change in status ${pi.status}.`,
      "payment_intent_unexpected_state",
    );
  if (transferGroup !== undefined && pi.transfer_group && pi.transfer_group !== transferGroup)
    throw invalid("transfer_group cannot be changed once set", "transfer_group");
  if (paymentMethod) core.checkPaymentMethod(paymentMethod);
  if (amount !== undefined) pi.amount = amount;
  if (currency !== undefined) pi.currency = currency;
  if (metadata !== undefined) pi.metadata = mergeMetadata(pi.metadata, metadata);
  if (description !== undefined) pi.description = description;
  if (transferGroup !== undefined) pi.transfer_group = transferGroup;
  if (paymentMethod) {
    pi.payment_method = paymentMethod;
    pi.status = "requires_confirmation";
  }
  return pi;
};

// ---------------------------------------------------------------- routes

const routes: [string, RegExp, Handler][] = [
  ["POST", /^\/v1\/checkout\/sessions$/, createCheckoutSession],
  [
    "GET",
    /^\/v1\/checkout\/sessions$/,
    (core, { params: p }) => {
      core.sweepExpired();
      const pi = p.str("payment_intent");
      const status = p.oneOf("status", ["open", "complete", "expired"] as const);
      const list = listOf(
        Object.values(core.state.checkoutSessions),
        p,
        "/v1/checkout/sessions",
        (s) => (!pi || s.payment_intent === pi) && (!status || s.status === status),
      );
      p.done();
      return list;
    },
  ],
  [
    "GET",
    /^\/v1\/checkout\/sessions\/([^/]+)$/,
    (core, { params: p, match }) => {
      p.done();
      return core.checkoutSession(match[0]!);
    },
  ],
  [
    "POST",
    /^\/v1\/checkout\/sessions\/([^/]+)$/,
    (core, { params: p, match }) => {
      const s = core.checkoutSession(match[0]!);
      const metadata = p.metadata();
      p.done();
      if (metadata !== undefined) s.metadata = mergeMetadata(s.metadata, metadata);
      return s;
    },
  ],
  [
    "GET",
    /^\/v1\/checkout\/sessions\/([^/]+)\/line_items$/,
    (core, { params: p, match }) => {
      const list = lineItemList(core.checkoutSession(match[0]!), p);
      p.done();
      return list;
    },
  ],
  [
    "POST",
    /^\/v1\/checkout\/sessions\/([^/]+)\/expire$/,
    (core, { params: p, match, req }) => {
      p.done();
      return core.expireSession(core.checkoutSession(match[0]!), req);
    },
  ],

  ["POST", /^\/v1\/payment_intents$/, createPaymentIntent],
  [
    "GET",
    /^\/v1\/payment_intents$/,
    (core, { params: p }) => {
      const list = listOf(Object.values(core.state.paymentIntents), p, "/v1/payment_intents");
      p.done();
      return list;
    },
  ],
  [
    "GET",
    /^\/v1\/payment_intents\/([^/]+)$/,
    (core, { params: p, match }) => {
      p.str("client_secret");
      p.done();
      return core.paymentIntent(match[0]!);
    },
  ],
  ["POST", /^\/v1\/payment_intents\/([^/]+)$/, updatePaymentIntent],
  [
    "POST",
    /^\/v1\/payment_intents\/([^/]+)\/confirm$/,
    (core, { params: p, match, req }) => {
      const pi = core.paymentIntent(match[0]!);
      const pm = p.str("payment_method");
      p.str("return_url");
      p.done();
      return core.confirmPaymentIntent(pi, pm, req);
    },
  ],
  [
    "POST",
    /^\/v1\/payment_intents\/([^/]+)\/capture$/,
    (core, { params: p, match, req }) => {
      const pi = core.paymentIntent(match[0]!);
      const amount = p.int("amount_to_capture", 1);
      p.metadata();
      p.done();
      return core.capturePaymentIntent(pi, amount, req);
    },
  ],
  [
    "POST",
    /^\/v1\/payment_intents\/([^/]+)\/cancel$/,
    (core, { params: p, match, req }) => {
      const pi = core.paymentIntent(match[0]!);
      const reason = p.oneOf("cancellation_reason", [
        "duplicate",
        "fraudulent",
        "requested_by_customer",
        "abandoned",
      ] as const);
      p.done();
      return core.cancelPaymentIntent(pi, reason, req);
    },
  ],

  [
    "GET",
    /^\/v1\/charges$/,
    (core, { params: p }) => {
      const pi = p.str("payment_intent");
      const group = p.str("transfer_group");
      const list = listOf(
        Object.values(core.state.charges),
        p,
        "/v1/charges",
        (c) => (!pi || c.payment_intent === pi) && (!group || c.transfer_group === group),
      );
      p.done();
      return list;
    },
  ],
  [
    "GET",
    /^\/v1\/charges\/([^/]+)$/,
    (core, { params: p, match }) => {
      p.done();
      return core.charge(match[0]!);
    },
  ],

  [
    "POST",
    /^\/v1\/refunds$/,
    (core, { params: p, req }) => {
      const piId = p.str("payment_intent");
      const chId = p.str("charge");
      const amount = p.int("amount", 1);
      const reason =
        p.oneOf("reason", ["duplicate", "fraudulent", "requested_by_customer"] as const) ?? null;
      const metadata = freshMetadata(p.metadata());
      p.done();
      if (!piId && !chId)
        throw invalid(
          "Send payment_intent or charge to say what to refund.",
          "payment_intent",
          "parameter_missing",
        );
      let charge;
      if (piId) {
        const pi = core.paymentIntent(piId);
        charge = core.refundableCharge(pi);
        if (chId && chId !== charge.id)
          throw invalid("charge does not belong to payment_intent", "charge");
      } else {
        charge = core.charge(chId!, "charge");
        if (!charge.captured)
          throw invalid(
            `Charge ${charge.id} was not captured, so it cannot be refunded.`,
            "charge",
          );
      }
      return core.createRefund(charge, { amount, reason, metadata }, req);
    },
  ],
  [
    "GET",
    /^\/v1\/refunds$/,
    (core, { params: p }) => {
      const pi = p.str("payment_intent");
      const ch = p.str("charge");
      const list = listOf(
        Object.values(core.state.refunds),
        p,
        "/v1/refunds",
        (r) => (!pi || r.payment_intent === pi) && (!ch || r.charge === ch),
      );
      p.done();
      return list;
    },
  ],
  [
    "GET",
    /^\/v1\/refunds\/([^/]+)$/,
    (core, { params: p, match }) => {
      p.done();
      return core.refund(match[0]!);
    },
  ],

  [
    "POST",
    /^\/v1\/accounts$/,
    (core, { params: p }) => {
      p.reqOneOf("type", ["express"] as const);
      const country = (p.str("country", 2) ?? "GB").toUpperCase();
      if (!/^[A-Z]{2}$/.test(country)) throw invalid("Invalid country", "country");
      const caps = p.object("capabilities");
      const requested: string[] = [];
      for (const name of ["transfers", "card_payments"]) {
        const c = caps?.object(name);
        if (c?.bool("requested")) requested.push(name);
      }
      const input = {
        email: p.str("email", 512) ?? null,
        country,
        defaultCurrency: p.currency("default_currency") ?? null,
        businessType:
          p.oneOf("business_type", ["individual", "company", "non_profit"] as const) ?? null,
        businessProfile: p.loose("business_profile") ?? {},
        capabilities: requested,
        metadata: freshMetadata(p.metadata()),
      };
      p.done();
      return core.createAccount(input);
    },
  ],
  [
    "GET",
    /^\/v1\/accounts$/,
    (core, { params: p }) => {
      const list = listOf(Object.values(core.state.accounts), p, "/v1/accounts");
      p.done();
      return list;
    },
  ],
  [
    "GET",
    /^\/v1\/accounts\/([^/]+)$/,
    (core, { params: p, match }) => {
      p.done();
      return core.account(match[0]!);
    },
  ],
  [
    "POST",
    /^\/v1\/accounts\/([^/]+)$/,
    (core, { params: p, match }) => {
      const a = core.account(match[0]!);
      const email = p.str("email", 512);
      const metadata = p.metadata();
      const profile = p.loose("business_profile");
      p.done();
      if (email !== undefined) a.email = email;
      if (metadata !== undefined) a.metadata = mergeMetadata(a.metadata, metadata);
      if (profile) a.business_profile = { ...a.business_profile, ...profile };
      return a;
    },
  ],
  [
    "POST",
    /^\/v1\/accounts\/([^/]+)\/login_links$/,
    (core, { params: p, match }) => {
      const a = core.account(match[0]!, "account");
      p.done();
      if (!a.details_submitted)
        throw invalid(
          `Payout account ${a.id} has not finished setup, so it has no dashboard yet.`,
          "account",
          "account_invalid",
        );
      return {
        object: "login_link",
        created: core.now(),
        url: `${core.baseUrl()}/_fake/dashboard/${a.id}`,
      };
    },
  ],
  [
    "GET",
    /^\/v1\/account$/,
    (_core, { params: p }) => {
      p.done();
      return {
        id: "acct_platform_local",
        object: "account",
        type: "standard",
        charges_enabled: true,
        payouts_enabled: true,
        details_submitted: true,
        country: "GB",
        default_currency: "gbp",
        email: null,
        metadata: {},
        created: 0,
        livemode: false,
      };
    },
  ],
  [
    "POST",
    /^\/v1\/account_links$/,
    (core, { params: p }) => {
      const account = core.account(p.reqStr("account"), "account");
      const input = {
        account,
        refreshUrl: p.reqUrl("refresh_url"),
        returnUrl: p.reqUrl("return_url"),
        type: p.reqOneOf("type", ["account_onboarding", "account_update"] as const),
      };
      p.oneOf("collect", ["currently_due", "eventually_due"] as const);
      p.loose("collection_options");
      p.done();
      return core.createAccountLink(input);
    },
  ],

  [
    "POST",
    /^\/v1\/transfers$/,
    (core, { params: p, req }) => {
      const input = {
        amount: p.reqInt("amount", 1),
        currency: p.reqCurrency("currency"),
        destination: p.reqStr("destination"),
        transferGroup: p.str("transfer_group") ?? null,
        sourceTransaction: p.str("source_transaction") ?? null,
        description: p.str("description", 1000) ?? null,
        metadata: freshMetadata(p.metadata()),
      };
      p.done();
      return core.createTransfer(input, req);
    },
  ],
  [
    "GET",
    /^\/v1\/transfers$/,
    (core, { params: p }) => {
      const group = p.str("transfer_group");
      const dest = p.str("destination");
      const list = listOf(
        Object.values(core.state.transfers),
        p,
        "/v1/transfers",
        (t) => (!group || t.transfer_group === group) && (!dest || t.destination === dest),
      );
      p.done();
      return list;
    },
  ],
  [
    "GET",
    /^\/v1\/transfers\/([^/]+)$/,
    (core, { params: p, match }) => {
      p.done();
      return core.transfer(match[0]!);
    },
  ],
  [
    "POST",
    /^\/v1\/transfers\/([^/]+)$/,
    (core, { params: p, match }) => {
      const t = core.transfer(match[0]!);
      const metadata = p.metadata();
      const description = p.str("description", 1000);
      p.done();
      if (metadata !== undefined) t.metadata = mergeMetadata(t.metadata, metadata);
      if (description !== undefined) t.description = description;
      return t;
    },
  ],

  [
    "GET",
    /^\/v1\/balance$/,
    (core, { params: p, stripeAccount }) => {
      p.done();
      if (stripeAccount) {
        core.account(stripeAccount, "Stripe-Account");
        const a = core.state.accounts[stripeAccount]!;
        return balanceBody(core.accountBalance(stripeAccount), a.default_currency);
      }
      return balanceBody(core.platformBalance(), core.defaultCurrency());
    },
  ],

  [
    "GET",
    /^\/v1\/events$/,
    (core, { params: p }) => {
      const type = p.str("type");
      const types = p.strings("types");
      const list = listOf(
        Object.values(core.state.events).map((r) => r.event),
        p,
        "/v1/events",
        (e) =>
          (!type ||
            (type.endsWith(".*") ? e.type.startsWith(type.slice(0, -1)) : e.type === type)) &&
          (types.length === 0 || types.includes(e.type)),
      );
      p.done();
      return list;
    },
  ],
  [
    "GET",
    /^\/v1\/events\/([^/]+)$/,
    (core, { params: p, match }) => {
      p.done();
      const r = core.state.events[match[0]!];
      if (!r)
        throw new ApiError(
          404,
          "invalid_request_error",
          `No such event: '${match[0]}'`,
          "resource_missing",
          "id",
        );
      return r.event;
    },
  ],
];

/** Route one /v1 call. Returns null when no route matches the path at all. */
export function handleApi(
  core: PaymentsCore,
  method: string,
  path: string,
  raw: Record<string, unknown>,
  ctx: Omit<ApiContext, "params" | "match" | "method">,
): { found: false } | { found: true; body: unknown } {
  const params = new Params(raw);
  const expandPaths = params.strings("expand");
  for (const [m, re, handler] of routes) {
    if (m !== method) continue;
    const found = re.exec(path);
    if (!found) continue;
    const match = found.slice(1).map((s) => decodeURIComponent(s));
    const result = handler(core, { ...ctx, method, params, match });
    return { found: true, body: expand(core, result, expandPaths) };
  }
  return { found: false };
}
