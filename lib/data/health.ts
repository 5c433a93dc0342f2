import { getDb, type Db } from "./db";

export interface Health {
  status: "ok" | "degraded";
  database: "up" | "down";
  error?: string;
}

/** Ask the database for one row, with a short timeout so a dead server answers quickly. */
export async function getHealth(db: Db = getDb()): Promise<Health> {
  let timer: NodeJS.Timeout | undefined;
  try {
    await Promise.race([
      db.raw("SELECT 1"),
      new Promise((_, reject) => {
        timer = setTimeout(() => reject(new Error("database did not answer within 2 s")), 2000);
      }),
    ]);
    return { status: "ok", database: "up" };
  } catch (err) {
    // The page gate (proxy.ts) stops trusting its cached "up" at once.
    noteDatabaseDown();
    const message = err instanceof Error ? err.message : "unknown error";
    return { status: "degraded", database: "down", error: message.split("\n")[0] };
  } finally {
    clearTimeout(timer);
  }
}

// A process-local note of the last time this process saw the database fail, so the page gate in
// proxy.ts answers 503 at once instead of trusting its cached "up". Per process on purpose: it
// describes this process's connection, not shared state.
const state = globalThis as unknown as {
  loopwrightDbDownAt?: number;
  loopwrightDbUpUntil?: number;
};

/** Record that a query just failed because the database could not be reached. */
export function noteDatabaseDown(): void {
  state.loopwrightDbDownAt = Date.now();
  state.loopwrightDbUpUntil = 0;
}

/** Errors that mean the server cannot be reached at all (not merely slow). */
const UNREACHABLE = new Set([
  "ECONNREFUSED",
  "ECONNRESET",
  "PROTOCOL_CONNECTION_LOST",
  "ETIMEDOUT",
  "EHOSTUNREACH",
  "ENOTFOUND",
]);

/**
 * Is the database reachable? A healthy answer is trusted for `cacheMs` (so pages do not each
 * pay for a ping); a failure is never cached, so recovery is seen on the next request. Only a
 * connection that fails counts as down: a ping still waiting after `waitMs` (a busy pool under
 * load) lets the request through, to be slow rather than refused.
 */
export async function databaseReachable(
  cacheMs = 1000,
  db: Db = getDb(),
  waitMs = 1500,
): Promise<boolean> {
  if (Date.now() < (state.loopwrightDbUpUntil ?? 0)) return true;
  let timer: NodeJS.Timeout | undefined;
  try {
    const answered = await Promise.race([
      db.raw("SELECT 1").then(() => true),
      new Promise<false>((r) => (timer = setTimeout(() => r(false), waitMs))),
    ]);
    if (answered) state.loopwrightDbUpUntil = Date.now() + cacheMs;
    return true;
  } catch (err) {
    const code = (err as { code?: string } | null)?.code ?? "";
    const name = (err as { name?: string } | null)?.name ?? "";
    if (UNREACHABLE.has(code) || name === "KnexTimeoutError") {
      noteDatabaseDown();
      return false;
    }
    return true;
  } finally {
    clearTimeout(timer);
  }
}
