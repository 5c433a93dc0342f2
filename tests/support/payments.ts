/** Test controls of the payments fake (mocks/payments): reset, faults, events, deliveries. */
import { createServer } from "node:http";
import type { AddressInfo } from "node:net";
import type { Knex } from "knex";
import Stripe from "stripe";
import { env } from "@/lib/env";
import { handlePaymentEvent } from "@/lib/data/payments";
import { verifyPaymentEvent } from "@/lib/payments/client";
import type { EventRecord } from "../../mocks/payments/types";

export interface RequestLogEntry {
  id: string;
  method: string;
  path: string;
  status: number | null;
  idempotencyKey: string | null;
  replayed: boolean;
  fault: "fail" | "hang" | "hang_after" | null;
}

export function paymentsFakeControl(base: string, secretKey: string) {
  const auth = { authorization: `Bearer ${secretKey}` };
  const post = async (path: string, body?: unknown) => {
    const res = await fetch(`${base}${path}`, {
      method: "POST",
      headers: { ...auth, "content-type": "application/json" },
      body: body === undefined ? undefined : JSON.stringify(body),
    });
    if (!res.ok) throw new Error(`${path} answered ${res.status}: ${await res.text()}`);
    return res.json() as Promise<Record<string, unknown>>;
  };
  return {
    base,
    /** An SDK client pointed at the fake. */
    client: (options: Stripe.StripeConfig = {}) =>
      new Stripe(secretKey, {
        host: "127.0.0.1",
        port: Number(new URL(base).port),
        protocol: "http",
        maxNetworkRetries: 1,
        telemetry: false,
        ...options,
      }),
    reset: () => post("/_fake/reset"),
    faults: (f: { fail?: number; hang?: number; hangAfter?: number; dropWebhooks?: number }) =>
      post("/_fake/faults", f),
    config: (c: { webhookUrl: string | null }) => post("/_fake/config", c),
    redeliver: (eventId: string) => post(`/_fake/events/${eventId}/redeliver`),
    /** Waits until no webhook delivery is queued or in flight. */
    async flush(timeoutMs = 10_000) {
      const r = await post("/_fake/webhooks/flush", { timeoutMs });
      if (r.settled !== true) throw new Error(`webhook deliveries still pending: ${r.pending}`);
    },
    async events(type?: string): Promise<EventRecord[]> {
      const res = await fetch(`${base}/_fake/events${type ? `?type=${type}` : ""}`);
      return (await res.json()) as EventRecord[];
    },
    async requests(): Promise<RequestLogEntry[]> {
      return (await (await fetch(`${base}/_fake/requests`)).json()) as RequestLogEntry[];
    },
    /** The hosted checkout page's buttons, as a browser submits them. */
    payCheckout: (sessionUrl: string, card: "ok" | "decline" = "ok") =>
      fetch(`${sessionUrl}/pay`, {
        method: "POST",
        body: new URLSearchParams({ card }),
        redirect: "manual",
      }),
  };
}

/**
 * The app's webhook route, in small, for integration tests: verify the signature with the SDK,
 * then call the same data function. `close()` takes it down (as an app that stops), and
 * `start(port)` brings a fresh one up on the same port, with its own database pool.
 */
export async function startWebhookReceiver(
  makeDb: () => Knex,
  webhookSecret: string,
  appUrl = "http://app.test",
  port = 0,
) {
  const db = makeDb();
  const handled: string[] = [];
  const server = createServer((req, res) => {
    const chunks: Buffer[] = [];
    req.on("data", (c: Buffer) => chunks.push(c));
    req.on("end", async () => {
      try {
        const event = verifyPaymentEvent(
          Buffer.concat(chunks).toString("utf8"),
          String(req.headers["stripe-signature"] ?? ""),
          { ...env(), STRIPE_WEBHOOK_SECRET: webhookSecret },
        );
        handled.push(await handlePaymentEvent(db, event, appUrl));
        res.writeHead(200).end("{}");
      } catch (err) {
        res
          .writeHead(err instanceof Stripe.errors.StripeSignatureVerificationError ? 400 : 500)
          .end();
      }
    });
  });
  await new Promise<void>((r) => server.listen(port, "127.0.0.1", r));
  const bound = (server.address() as AddressInfo).port;
  return {
    port: bound,
    url: `http://127.0.0.1:${bound}/webhook`,
    handled,
    async close() {
      server.closeAllConnections();
      await new Promise((r) => server.close(r));
      await db.destroy();
    },
  };
}
