/** Test controls of the payments fake (mocks/payments): reset, faults, events, deliveries. */
import Stripe from "stripe";
import type { EventRecord } from "../../mocks/payments/types";

export interface RequestLogEntry {
  id: string;
  method: string;
  path: string;
  status: number | null;
  idempotencyKey: string | null;
  replayed: boolean;
  fault: "fail" | "hang" | null;
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
    faults: (f: { fail?: number; hang?: number; dropWebhooks?: number }) =>
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
