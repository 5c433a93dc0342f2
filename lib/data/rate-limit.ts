import type { Db } from "./db";

/**
 * Fixed-window counters in MariaDB, shared by every app process: `hit` adds one and says
 * whether the bucket is still within its limit. Old windows are swept now and then.
 */
export async function hit(
  knex: Db,
  bucket: string,
  limit: number,
  windowMs: number,
  now = new Date(),
): Promise<{ allowed: boolean; retryAfterS: number }> {
  const start = new Date(Math.floor(now.getTime() / windowMs) * windowMs);
  const startSql = start.toISOString().slice(0, 19).replace("T", " ");
  await knex.raw(
    "INSERT INTO rate_limit_hits (bucket, window_start, hits) VALUES (?, ?, 1) ON DUPLICATE KEY UPDATE hits = hits + 1",
    [bucket.slice(0, 191), startSql],
  );
  const row = await knex("rate_limit_hits")
    .where({ bucket: bucket.slice(0, 191), window_start: startSql })
    .first("hits");
  if (Math.random() < 0.01) {
    await knex("rate_limit_hits")
      .where(
        "window_start",
        "<",
        new Date(now.getTime() - 86_400_000).toISOString().slice(0, 19).replace("T", " "),
      )
      .del();
  }
  const retryAfterS = Math.ceil((start.getTime() + windowMs - now.getTime()) / 1000);
  return { allowed: Number(row?.hits ?? 0) <= limit, retryAfterS };
}

export const SIGN_IN_LIMITS = {
  windowMs: 15 * 60_000,
  perAccount: 8,
  perAddress: 40,
} as const;
