/**
 * Webhook delivery for the payments fake: each event is POSTed to the configured URL, signed
 * as the service signs it (`Stripe-Signature: t=<unix>,v1=<hex HMAC-SHA256(secret,
 * "<t>.<body>")>`, freshly at each attempt), and retried with doubling delays while the
 * receiver answers non-2xx or cannot be reached, up to a bounded number of attempts.
 * The queue lives in memory and holds event ids only: each attempt looks the record up in the
 * current state (which a rolled-back change or a reset may have replaced) and writes there.
 */
import { createHmac } from "node:crypto";
import type { EventRecord } from "./types";

export interface RetryPolicy {
  /** Delay before the second attempt; each later delay doubles. */
  baseMs: number;
  maxMs: number;
  maxAttempts: number;
  /** How long one delivery may take before it counts as failed. */
  timeoutMs: number;
}

export const DEFAULT_RETRY: RetryPolicy = {
  baseMs: 500,
  maxMs: 30_000,
  maxAttempts: 8,
  timeoutMs: 10_000,
};

export function signatureHeader(body: string, secret: string, timestamp: number): string {
  const v1 = createHmac("sha256", secret).update(`${timestamp}.${body}`, "utf8").digest("hex");
  return `t=${timestamp},v1=${v1}`;
}

export class WebhookQueue {
  private readonly timers = new Set<NodeJS.Timeout>();
  /** Event id → attempts made in the current run of deliveries. */
  private readonly active = new Map<string, number>();
  private readonly waiters = new Set<() => void>();
  private dropsLeft = 0;
  /** Bumped by clear(), so a delivery in flight across a reset records nothing. */
  private generation = 0;
  private stopped = false;

  constructor(
    private readonly config: {
      url: () => string | null;
      secret: string;
      retry: RetryPolicy;
      /** The event's record in the current state. */
      get: (eventId: string) => EventRecord | undefined;
      changed: () => void;
    },
  ) {}

  set drops(n: number) {
    this.dropsLeft = Math.max(0, n);
  }

  get drops() {
    return this.dropsLeft;
  }

  /** Queue an event for delivery now. */
  enqueue(record: EventRecord) {
    if (this.stopped || !this.config.url()) {
      if (!this.config.url()) record.delivery = "disabled";
      return;
    }
    record.delivery = "pending";
    if (this.active.has(record.event.id)) return;
    this.active.set(record.event.id, 0);
    this.schedule(record.event.id, 0);
  }

  /** Deliveries queued or in flight. */
  get pending(): number {
    return this.active.size;
  }

  /** Resolves true once nothing is queued or in flight, false if `ms` passes first. */
  settle(ms: number): Promise<boolean> {
    if (this.active.size === 0) return Promise.resolve(true);
    return new Promise((resolve) => {
      const done = () => {
        clearTimeout(timer);
        this.waiters.delete(done);
        resolve(true);
      };
      const timer = setTimeout(() => {
        this.waiters.delete(done);
        resolve(false);
      }, ms);
      this.waiters.add(done);
    });
  }

  /** Forget every queued delivery (reset / close). */
  clear() {
    for (const t of this.timers) clearTimeout(t);
    this.timers.clear();
    this.active.clear();
    this.generation += 1;
    this.dropsLeft = 0;
    this.notify();
  }

  stop() {
    this.stopped = true;
    this.clear();
  }

  private schedule(eventId: string, delay: number) {
    const timer = setTimeout(() => {
      this.timers.delete(timer);
      void this.attempt(eventId);
    }, delay);
    this.timers.add(timer);
  }

  private finish(eventId: string, outcome: EventRecord["delivery"] | null) {
    const record = this.config.get(eventId);
    if (record && outcome) record.delivery = outcome;
    this.active.delete(eventId);
    this.config.changed();
    this.notify();
  }

  private notify() {
    if (this.active.size === 0) for (const w of [...this.waiters]) w();
  }

  private async attempt(eventId: string) {
    if (!this.active.has(eventId)) return;
    const record = this.config.get(eventId);
    if (!record) return this.finish(eventId, null);
    const url = this.config.url();
    if (!url) return this.finish(eventId, "disabled");
    const at = new Date();
    if (this.dropsLeft > 0) {
      this.dropsLeft -= 1;
      record.attempts.push({
        at: at.toISOString(),
        status: null,
        error: null,
        ms: 0,
        dropped: true,
      });
      return this.finish(eventId, "dropped");
    }
    const body = JSON.stringify(record.event, null, 2);
    const generation = this.generation;
    const started = Date.now();
    let status: number | null = null;
    let error: string | null = null;
    try {
      const res = await fetch(url, {
        method: "POST",
        headers: {
          "content-type": "application/json; charset=utf-8",
          "user-agent": "LoopwrightPaymentsFake/1.0 (local test stand-in)",
          "stripe-signature": signatureHeader(
            body,
            this.config.secret,
            Math.floor(at.getTime() / 1000),
          ),
        },
        body,
        signal: AbortSignal.timeout(this.config.retry.timeoutMs),
        redirect: "manual",
      });
      status = res.status;
      await res.arrayBuffer().catch(() => undefined);
    } catch (err) {
      error =
        err instanceof Error
          ? err.cause instanceof Error
            ? err.cause.message
            : err.message
          : String(err);
    }
    // A reset or close while the request was in flight: do not record into the new state.
    if (generation !== this.generation || this.stopped) return;
    const current = this.config.get(eventId);
    if (!current) return this.finish(eventId, null);
    current.attempts.push({ at: at.toISOString(), status, error, ms: Date.now() - started });
    if (status !== null && status >= 200 && status < 300) return this.finish(eventId, "delivered");
    const { baseMs, maxMs, maxAttempts } = this.config.retry;
    const tries = (this.active.get(eventId) ?? 0) + 1;
    this.active.set(eventId, tries);
    if (tries >= maxAttempts) return this.finish(eventId, "failed");
    this.config.changed();
    this.schedule(eventId, Math.min(baseMs * 2 ** (tries - 1), maxMs));
  }
}
