/**
 * Local fake of the payment service for the stripe SDK (v23), on 127.0.0.1:PAYMENTS_FAKE_PORT
 * (default STRIPE_API_PORT, 12111). Point the SDK with `new Stripe(key, { host: '127.0.0.1',
 * port, protocol: 'http' })`. Stateful and deterministic (ids from counters); with `dir`
 * the state is kept in <dir>/state.json so it survives a restart of the fake.
 *
 * Service API (Authorization: Bearer <the fake's sk_test_ key>; form-encoded POST bodies):
 *   /v1/checkout/sessions[/:id[/expire|/line_items]], /v1/payment_intents[/:id[/confirm|
 *   /capture|/cancel]], /v1/charges[/:id], /v1/refunds[/:id], /v1/accounts[/:id[/login_links]],
 *   /v1/account, /v1/account_links, /v1/transfers[/:id], /v1/balance, /v1/events[/:id]
 *   Every POST with Idempotency-Key is replayed for the same key and body (header
 *   idempotent-replayed: true) and refused (400 idempotency_error) for another body.
 *   Successful answers and card declines (402) are kept under their key; other refusals are
 *   not, so a retry after fixing the cause goes through.
 *
 * Pages (a browser follows these from the API's urls):
 *   GET  /_fake/checkout/:id            hosted checkout ("Pay with a test card" / "Use a declining card")
 *   POST /_fake/checkout/:id/pay        card=ok|decline → 303 success_url, or back with a decline notice
 *   GET  /_fake/connect/:acct?link=…    payout account setup; POST completes it → 303 return_url
 *   GET  /_fake/dashboard/:acct         what a login link opens
 *   GET  /_fake                         overview of checkouts and events
 *
 * Test controls (JSON; those marked * need Authorization: Bearer <secret key>):
 *   GET  /_fake/health
 *   POST /_fake/reset *                 forget everything, clear faults and queued deliveries
 *   POST /_fake/faults *                {"fail":N} next N API calls → 500; {"hang":N} never
 *                                       answered until reset/close; {"hangAfter":N} done and
 *                                       kept (idempotency record too) but never answered, as
 *                                       when the answer is lost on the way; {"dropWebhooks":N}
 *   GET  /_fake/events[?type=]          every event with its delivery attempts
 *   POST /_fake/webhooks/flush          {"timeoutMs"?} wait until no delivery is pending
 *   POST /_fake/events/:id/redeliver *  deliver an event again
 *   POST /_fake/config *                {"webhookUrl": "…" | null}
 *   GET  /_fake/requests                the API calls received (method, path, status, key)
 *
 * Webhooks are POSTed to webhookUrl (PAYMENTS_FAKE_WEBHOOK_URL, default
 * <APP_URL>/api/webhooks/payments) signed with webhookSecret (STRIPE_WEBHOOK_SECRET).
 * The fake refuses to start when APP_ENV=production.
 */
import { createServer, type IncomingMessage, type ServerResponse } from "node:http";
import { existsSync, mkdirSync, readFileSync, renameSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import type { AddressInfo } from "node:net";
import qs from "qs";
import { handleApi } from "./api";
import { PaymentsCore } from "./core";
import {
  checkoutPage,
  connectPage,
  dashboardPage,
  messagePage,
  overviewPage,
  successUrl,
} from "./pages";
import { ApiError } from "./params";
import { emptyState, type EventRecord, type FakeState } from "./types";
import { DEFAULT_RETRY, WebhookQueue, type RetryPolicy } from "./webhooks";

export interface PaymentsFakeOptions {
  port?: number;
  secretKey?: string;
  webhookSecret?: string;
  /** Where events are POSTed; null or "" turns delivery off (events are still recorded). */
  webhookUrl?: string | null;
  /** Keep the state in <dir>/state.json; without it the state lives in memory only. */
  dir?: string;
  /** Base of the page URLs handed out (checkout, setup links); default http://127.0.0.1:<port>. */
  publicUrl?: string;
  defaultCurrency?: string;
  webhookRetry?: Partial<RetryPolicy>;
}

export interface PaymentsFake {
  port: number;
  url: string;
  close: () => Promise<void>;
}

interface RequestLogEntry {
  id: string;
  at: string;
  method: string;
  path: string;
  status: number | null;
  idempotencyKey: string | null;
  replayed: boolean;
  fault: "fail" | "hang" | "hang_after" | null;
}

const QS_OPTIONS = { depth: 10, arrayLimit: 1000, parameterLimit: 10_000 } as const;
const MAX_BODY = 1024 * 1024;

function readBody(req: IncomingMessage): Promise<string> {
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    let size = 0;
    req.on("data", (c: Buffer) => {
      size += c.length;
      if (size > MAX_BODY) {
        reject(new ApiError(400, "invalid_request_error", "Request body is too large"));
        req.destroy();
      } else chunks.push(c);
    });
    req.on("end", () => resolve(Buffer.concat(chunks).toString("utf8")));
    req.on("error", reject);
  });
}

function loadState(file: string | null): FakeState {
  if (!file || !existsSync(file)) return emptyState();
  try {
    const parsed = JSON.parse(readFileSync(file, "utf8")) as FakeState;
    return parsed.version === 1 ? { ...emptyState(), ...parsed } : emptyState();
  } catch {
    return emptyState();
  }
}

export async function startPaymentsFake(options: PaymentsFakeOptions = {}): Promise<PaymentsFake> {
  if (process.env.APP_ENV === "production")
    throw new Error("The payments fake does not run with APP_ENV=production.");
  const secretKey = options.secretKey ?? process.env.STRIPE_SECRET_KEY ?? "sk_test_local";
  if (!secretKey.startsWith("sk_test_"))
    throw new Error("The payments fake needs a test secret key (sk_test_…).");
  const webhookSecret =
    options.webhookSecret ?? (process.env.STRIPE_WEBHOOK_SECRET || "whsec_local");
  const appUrl = (process.env.APP_URL || "http://127.0.0.1:3000").replace(/\/$/, "");
  let webhookUrl: string | null =
    options.webhookUrl === undefined
      ? process.env.PAYMENTS_FAKE_WEBHOOK_URL || `${appUrl}/api/webhooks/payments`
      : options.webhookUrl || null;
  const stateFile = options.dir ? join(options.dir, "state.json") : null;
  if (options.dir) mkdirSync(options.dir, { recursive: true });
  let base = "";

  const faults = { fail: 0, hang: 0, hangAfter: 0 };
  const hanging = new Set<ServerResponse>();
  const requestLog: RequestLogEntry[] = [];
  let requestCounter = 0;
  /** Events made by the change in progress; delivered only once the change is kept. */
  const outbox: EventRecord[] = [];

  const save = () => {
    if (!stateFile) return;
    writeFileSync(`${stateFile}.tmp`, JSON.stringify(core.state));
    renameSync(`${stateFile}.tmp`, stateFile);
  };

  const queue = new WebhookQueue({
    url: () => webhookUrl,
    secret: webhookSecret,
    retry: { ...DEFAULT_RETRY, ...options.webhookRetry },
    get: (id) => core.state.events[id],
    changed: save,
  });

  const core = new PaymentsCore(loadState(stateFile), {
    baseUrl: () => base,
    defaultCurrency: options.defaultCurrency ?? process.env.CURRENCY ?? "gbp",
    webhooksEnabled: () => webhookUrl !== null,
    onEvent: (record) => outbox.push(record),
  });

  /**
   * Run one change: kept (events queued, state saved) when it succeeds or ends in a card
   * decline, which the service also records; rolled back on any other error.
   */
  function change<T>(fn: () => T): T {
    const snapshot = JSON.stringify(core.state);
    outbox.length = 0;
    try {
      const result = fn();
      commit();
      return result;
    } catch (err) {
      if (err instanceof ApiError && err.status === 402) commit();
      else {
        core.state = JSON.parse(snapshot) as FakeState;
        outbox.length = 0;
      }
      throw err;
    }
  }
  function commit() {
    const records = outbox.splice(0);
    save();
    for (const r of records) queue.enqueue(r);
  }

  const sendJson = (
    res: ServerResponse,
    status: number,
    body: unknown,
    headers: Record<string, string> = {},
  ) => {
    res.writeHead(status, { "content-type": "application/json", ...headers });
    res.end(typeof body === "string" ? body : JSON.stringify(body, null, 2));
  };
  const sendHtml = (res: ServerResponse, status: number, html: string) => {
    res.writeHead(status, { "content-type": "text/html; charset=utf-8" });
    res.end(html);
  };
  const redirect = (res: ServerResponse, location: string) => {
    res.writeHead(303, { location });
    res.end();
  };
  const hasKey = (req: IncomingMessage) => req.headers.authorization === `Bearer ${secretKey}`;
  const keyRefusal = (res: ServerResponse) =>
    sendJson(res, 401, {
      error: {
        type: "invalid_request_error",
        message: "This test control needs Authorization: Bearer <the fake's secret key>.",
      },
    });

  function authError(req: IncomingMessage): ApiError | null {
    const header = req.headers.authorization;
    const m = header ? /^Bearer (\S+)$/.exec(header) : null;
    if (!m)
      return new ApiError(
        401,
        "invalid_request_error",
        "No API key provided. Send Authorization: Bearer sk_test_….",
      );
    const key = m[1]!;
    if (key !== secretKey) {
      const shown = key.length > 12 ? `${key.slice(0, 8)}****${key.slice(-4)}` : "****";
      return new ApiError(401, "invalid_request_error", `Invalid API key provided: ${shown}`);
    }
    return null;
  }

  async function api(req: IncomingMessage, res: ServerResponse, url: URL, requestId: string) {
    const method = req.method ?? "GET";
    const path = url.pathname;
    const keyHeader = req.headers["idempotency-key"];
    const idempotencyKey = method === "POST" && typeof keyHeader === "string" ? keyHeader : null;
    const entry: RequestLogEntry = {
      id: requestId,
      at: new Date().toISOString(),
      method,
      path,
      status: null,
      idempotencyKey,
      replayed: false,
      fault: null,
    };
    requestLog.push(entry);
    if (requestLog.length > 2000) requestLog.shift();

    if (faults.hang > 0) {
      faults.hang -= 1;
      entry.fault = "hang";
      hanging.add(res);
      res.on("close", () => hanging.delete(res));
      return;
    }
    const headers: Record<string, string> = {};
    if (idempotencyKey) headers["idempotency-key"] = idempotencyKey;
    const version = req.headers["stripe-version"];
    if (typeof version === "string") headers["stripe-version"] = version;
    const fail = (err: ApiError) => {
      entry.status = err.status;
      sendJson(res, err.status, err.body(), headers);
    };
    if (faults.fail > 0) {
      faults.fail -= 1;
      entry.fault = "fail";
      return fail(
        new ApiError(
          500,
          "api_error",
          "The payments fake was told to fail this call (fault switch).",
        ),
      );
    }
    const refused = authError(req);
    if (refused) return fail(refused);

    let body: string;
    try {
      body = method === "POST" ? await readBody(req) : "";
    } catch (err) {
      return fail(
        err instanceof ApiError
          ? err
          : new ApiError(400, "invalid_request_error", "Bad request body"),
      );
    }
    if (idempotencyKey) {
      const stored = core.state.idempotency[idempotencyKey];
      if (stored) {
        if (stored.method !== method || stored.path !== path || stored.body !== body)
          return fail(
            new ApiError(
              400,
              "idempotency_error",
              `Idempotency-Key ${idempotencyKey} was used before with other parameters or another endpoint; use a new key for a different request.`,
              "idempotency_key_in_use",
            ),
          );
        entry.status = stored.status;
        entry.replayed = true;
        return sendJson(res, stored.status, stored.response, {
          ...headers,
          "idempotent-replayed": "true",
        });
      }
    }
    if (typeof version === "string" && version) core.state.apiVersion = version;
    const raw = qs.parse(method === "POST" ? body : url.search.slice(1), QS_OPTIONS) as Record<
      string,
      unknown
    >;
    const account = req.headers["stripe-account"];
    const ctx = {
      stripeAccount: typeof account === "string" ? account : null,
      req: { requestId, idempotencyKey },
    };
    let status = 200;
    let payload: string;
    try {
      const run = () => handleApi(core, method, path, raw, ctx);
      const result = method === "POST" ? change(run) : run();
      if (!result.found) {
        throw new ApiError(
          404,
          "invalid_request_error",
          `Unrecognized request URL (${method}: ${path}). The payments fake does not offer this endpoint.`,
        );
      }
      payload = JSON.stringify(result.body, null, 2);
    } catch (err) {
      const e =
        err instanceof ApiError
          ? err
          : new ApiError(500, "api_error", `The payments fake failed: ${String(err)}`);
      if (!(err instanceof ApiError)) console.error("[payments-fake]", err);
      status = e.status;
      payload = JSON.stringify(e.body(), null, 2);
    }
    if (idempotencyKey && (status < 400 || status === 402)) {
      core.state.idempotency[idempotencyKey] = {
        method,
        path,
        body,
        status,
        response: payload,
        at: Date.now(),
      };
      save();
    }
    entry.status = status;
    if (faults.hangAfter > 0) {
      // The change is made and kept; only the answer never arrives.
      faults.hangAfter -= 1;
      entry.fault = "hang_after";
      hanging.add(res);
      res.on("close", () => hanging.delete(res));
      return;
    }
    sendJson(res, status, payload, headers);
  }

  function reset() {
    core.state = emptyState();
    faults.fail = 0;
    faults.hang = 0;
    faults.hangAfter = 0;
    queue.clear();
    for (const r of hanging) r.destroy();
    hanging.clear();
    requestLog.length = 0;
    outbox.length = 0;
    save();
  }

  async function readJson(req: IncomingMessage): Promise<Record<string, unknown>> {
    const text = await readBody(req);
    if (!text.trim()) return {};
    const parsed: unknown = JSON.parse(text);
    if (typeof parsed !== "object" || parsed === null || Array.isArray(parsed))
      throw new ApiError(400, "invalid_request_error", "Send a JSON object");
    return parsed as Record<string, unknown>;
  }

  const count = (v: unknown, name: string): number => {
    if (v === undefined) return 0;
    if (typeof v !== "number" || !Number.isInteger(v) || v < 0)
      throw new ApiError(400, "invalid_request_error", `${name} must be a whole number ≥ 0`);
    return v;
  };

  async function fake(req: IncomingMessage, res: ServerResponse, url: URL) {
    const path = url.pathname;
    const method = req.method ?? "GET";
    if (path === "/_fake/health")
      return sendJson(res, 200, { ok: true, service: "payments-fake", webhookUrl });
    if (path === "/_fake/reset" && method === "POST") {
      if (process.env.APP_ENV === "production") return sendJson(res, 404, { error: "not found" });
      if (!hasKey(req)) return keyRefusal(res);
      reset();
      return sendJson(res, 200, { ok: true });
    }
    if (path === "/_fake/faults" && method === "GET")
      return sendJson(res, 200, { ...faults, dropWebhooks: queue.drops });
    if (path === "/_fake/faults" && method === "POST") {
      if (!hasKey(req)) return keyRefusal(res);
      const body = await readJson(req);
      for (const k of Object.keys(body))
        if (!["fail", "hang", "hangAfter", "dropWebhooks"].includes(k))
          throw new ApiError(400, "invalid_request_error", `Unknown fault: ${k}`);
      if (body.fail !== undefined) faults.fail = count(body.fail, "fail");
      if (body.hang !== undefined) faults.hang = count(body.hang, "hang");
      if (body.hangAfter !== undefined) faults.hangAfter = count(body.hangAfter, "hangAfter");
      if (body.dropWebhooks !== undefined) queue.drops = count(body.dropWebhooks, "dropWebhooks");
      return sendJson(res, 200, { ...faults, dropWebhooks: queue.drops });
    }
    if (path === "/_fake/events" && method === "GET") {
      const type = url.searchParams.get("type");
      return sendJson(
        res,
        200,
        Object.values(core.state.events).filter((r) => !type || r.event.type === type),
      );
    }
    const redeliver = /^\/_fake\/events\/([^/]+)\/redeliver$/.exec(path);
    if (redeliver && method === "POST") {
      if (!hasKey(req)) return keyRefusal(res);
      const record = core.state.events[decodeURIComponent(redeliver[1]!)];
      if (!record)
        return sendJson(res, 404, {
          error: { type: "invalid_request_error", message: "No such event" },
        });
      queue.enqueue(record);
      return sendJson(res, 200, { ok: true, pending: queue.pending });
    }
    if (path === "/_fake/webhooks/flush" && method === "POST") {
      const body = await readJson(req);
      const ms = body.timeoutMs === undefined ? 15_000 : count(body.timeoutMs, "timeoutMs");
      const settled = await queue.settle(ms);
      return sendJson(res, 200, { settled, pending: queue.pending });
    }
    if (path === "/_fake/config" && method === "POST") {
      if (!hasKey(req)) return keyRefusal(res);
      const body = await readJson(req);
      if ("webhookUrl" in body) {
        const v = body.webhookUrl;
        if (v !== null && typeof v !== "string")
          throw new ApiError(400, "invalid_request_error", "webhookUrl must be a string or null");
        webhookUrl = v || null;
      }
      return sendJson(res, 200, { webhookUrl });
    }
    if (path === "/_fake/requests" && method === "GET") return sendJson(res, 200, requestLog);

    const checkout = /^\/_fake\/checkout\/([^/]+)(\/pay)?$/.exec(path);
    if (checkout) {
      const id = decodeURIComponent(checkout[1]!);
      const session = core.state.checkoutSessions[id];
      if (!session)
        return sendHtml(
          res,
          404,
          messagePage(
            "No such checkout",
            "This checkout link is not known to the payments stand-in.",
          ),
        );
      if (method === "GET" && !checkout[2]) {
        change(() => core.expireIfDue(session));
        return sendHtml(
          res,
          200,
          checkoutPage(core.state.checkoutSessions[id]!, url.searchParams.has("declined")),
        );
      }
      if (method === "POST" && checkout[2]) {
        const form = new URLSearchParams(await readBody(req));
        const card = form.get("card") === "decline" ? "decline" : "ok";
        const outcome = change(() =>
          core.payCheckoutSession(core.state.checkoutSessions[id]!, card),
        );
        const s = core.state.checkoutSessions[id]!;
        if (outcome === "paid") return redirect(res, successUrl(s));
        return redirect(
          res,
          `/_fake/checkout/${encodeURIComponent(id)}${outcome === "declined" ? "?declined=1" : ""}`,
        );
      }
    }

    const connect = /^\/_fake\/connect\/([^/]+)$/.exec(path);
    if (connect && (method === "GET" || method === "POST")) {
      const accountId = decodeURIComponent(connect[1]!);
      const account = core.state.accounts[accountId];
      const form = method === "POST" ? new URLSearchParams(await readBody(req)) : url.searchParams;
      const linkId = form.get("link") ?? "";
      const link = core.state.accountLinks[linkId];
      if (!account || !link || link.account !== accountId)
        return sendHtml(
          res,
          404,
          messagePage(
            "Setup link not valid",
            "This payout account setup link is not known to the payments stand-in. Start the setup again from the app.",
          ),
        );
      if (link.used || core.now() > link.expires_at) return redirect(res, link.refresh_url);
      if (method === "GET") return sendHtml(res, 200, connectPage(account, linkId));
      const action = form.get("action") === "leave" ? "leave" : "complete";
      change(() => {
        const l = core.state.accountLinks[linkId]!;
        l.used = true;
        if (action === "complete") core.onboardAccount(core.state.accounts[accountId]!);
      });
      return redirect(res, link.return_url);
    }

    const dashboard = /^\/_fake\/dashboard\/([^/]+)$/.exec(path);
    if (dashboard && method === "GET") {
      const a = core.state.accounts[decodeURIComponent(dashboard[1]!)];
      if (!a)
        return sendHtml(
          res,
          404,
          messagePage(
            "No such payout account",
            "This payout account is not known to the payments stand-in.",
          ),
        );
      const transfers = Object.values(core.state.transfers)
        .filter((t) => t.destination === a.id)
        .reverse();
      return sendHtml(res, 200, dashboardPage(a, transfers, core.accountBalance(a.id)));
    }
    return sendJson(res, 404, {
      error: { type: "invalid_request_error", message: `No such page: ${method} ${path}` },
    });
  }

  const server = createServer((req, res) => {
    const url = new URL(req.url ?? "/", base || "http://127.0.0.1");
    requestCounter += 1;
    const requestId = `req_test_${String(requestCounter).padStart(6, "0")}`;
    res.setHeader("request-id", requestId);
    const path = url.pathname;
    const work = path.startsWith("/v1/")
      ? api(req, res, url, requestId)
      : path === "/" || path === "/_fake" || path === "/_fake/"
        ? Promise.resolve(
            sendHtml(
              res,
              200,
              overviewPage({
                sessions: Object.values(core.state.checkoutSessions),
                events: Object.values(core.state.events),
                balance: core.platformBalance(),
                webhookUrl,
              }),
            ),
          )
        : path.startsWith("/_fake/")
          ? fake(req, res, url)
          : Promise.resolve(
              sendJson(res, 404, {
                error: {
                  type: "invalid_request_error",
                  message: `Unrecognized request URL (${req.method}: ${path}).`,
                },
              }),
            );
    work.catch((err: unknown) => {
      if (res.headersSent) return res.destroy();
      if (err instanceof ApiError) return sendJson(res, err.status, err.body());
      if (err instanceof SyntaxError)
        return sendJson(res, 400, {
          error: { type: "invalid_request_error", message: "Send valid JSON" },
        });
      console.error("[payments-fake]", err);
      sendJson(res, 500, { error: { type: "api_error", message: String(err) } });
    });
  });

  const sweep = setInterval(() => {
    try {
      change(() => {
        core.sweepExpired();
        // Keys are kept for a day, as the service keeps them.
        const cutoff = Date.now() - 24 * 3600 * 1000;
        for (const [k, r] of Object.entries(core.state.idempotency))
          if (r.at < cutoff) delete core.state.idempotency[k];
      });
    } catch (err) {
      console.error("[payments-fake] expiry sweep failed:", err);
    }
  }, 30_000);
  sweep.unref();

  const port = await new Promise<number>((resolve, reject) => {
    server.once("error", reject);
    server.listen(
      options.port ?? Number(process.env.PAYMENTS_FAKE_PORT ?? 12111),
      "127.0.0.1",
      () => resolve((server.address() as AddressInfo).port),
    );
  });
  base = (
    options.publicUrl ??
    process.env.PAYMENTS_FAKE_PUBLIC_URL ??
    `http://127.0.0.1:${port}`
  ).replace(/\/$/, "");
  // Deliveries still pending when the fake last stopped go out again.
  for (const r of Object.values(core.state.events)) if (r.delivery === "pending") queue.enqueue(r);

  return {
    port,
    url: base,
    close: () =>
      new Promise<void>((done) => {
        clearInterval(sweep);
        queue.stop();
        for (const r of hanging) r.destroy();
        hanging.clear();
        server.close(() => done());
        server.closeAllConnections();
      }),
  };
}

// Run directly: `tsx mocks/payments/server.ts`.
if (process.argv[1] && /mocks[\\/]payments[\\/]server\.ts$/.test(process.argv[1])) {
  startPaymentsFake({
    port: Number(process.env.PAYMENTS_FAKE_PORT || process.env.STRIPE_API_PORT || 12111),
    dir: process.env.PAYMENTS_FAKE_DIR || join(process.cwd(), ".data", "payments"),
  }).then(
    ({ url }) => console.log(`[payments-fake] listening on ${url} (overview at ${url}/_fake)`),
    (err: unknown) => {
      console.error("[payments-fake] failed to start:", err instanceof Error ? err.message : err);
      process.exit(1);
    },
  );
}
