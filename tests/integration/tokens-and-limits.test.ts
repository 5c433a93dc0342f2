/**
 * Single-use e-mail tokens and the shared rate-limit counters, stated exactly: how long a link
 * lives, that it works once and for its own purpose only, and where a fixed window starts and
 * ends. Real MariaDB, fixed clocks.
 */
import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { consumeToken, issueToken, TOKEN_TTL_MS } from "@/lib/data/tokens";
import { hit } from "@/lib/data/rate-limit";
import { testKnex, truncateAll } from "../support/db";
import { makeHomeowner } from "../support/fixtures";

describe("tokens and rate limits", () => {
  let knex: Knex;
  beforeAll(() => {
    knex = testKnex();
  });
  beforeEach(async () => {
    await truncateAll(knex);
  });
  afterAll(async () => {
    await truncateAll(knex);
    await knex.destroy();
  });

  const t0 = new Date("2031-05-01T10:00:00.000Z");
  const at = (ms: number) => new Date(t0.getTime() + ms);

  it("a verification link lives 24 hours and a reset link 1 hour, to the millisecond", async () => {
    expect(TOKEN_TTL_MS).toEqual({ verify_email: 86_400_000, reset_password: 3_600_000 });
    const user = await makeHomeowner(knex);
    const verify = await issueToken(knex, user.id, "verify_email", t0);
    const reset = await issueToken(knex, user.id, "reset_password", t0);
    const rows = await knex("auth_tokens")
      .orderBy("id")
      .select("purpose", "expires_at", "token_hash");
    expect(rows.map((r) => [r.purpose, r.expires_at])).toEqual([
      ["verify_email", "2031-05-02 10:00:00.000"],
      ["reset_password", "2031-05-01 11:00:00.000"],
    ]);
    // Only the hash is stored.
    for (const r of rows) expect(r.token_hash).toMatch(/^[0-9a-f]{64}$/);
    expect(rows.map((r) => r.token_hash)).not.toContain(verify);
    // Still good at its last instant; gone a millisecond later.
    expect(await consumeToken(knex, reset, "reset_password", at(3_600_001))).toBeNull();
    expect(await consumeToken(knex, reset, "reset_password", at(3_600_000))).toBe(user.id);
    expect(await consumeToken(knex, verify, "verify_email", at(86_400_001))).toBeNull();
  });

  it("works once, and only for its own purpose", async () => {
    const user = await makeHomeowner(knex);
    const raw = await issueToken(knex, user.id, "verify_email", t0);
    const second = await issueToken(knex, user.id, "verify_email", t0);
    expect(await consumeToken(knex, raw, "reset_password", t0)).toBeNull();
    expect(await consumeToken(knex, raw, "verify_email", t0)).toBe(user.id);
    const row = await knex("auth_tokens").orderBy("id").first("used_at");
    expect(row.used_at).toBe("2031-05-01 10:00:00.000");
    expect(await consumeToken(knex, raw, "verify_email", t0)).toBeNull();
    expect(await consumeToken(knex, "not-a-token", "verify_email", t0)).toBeNull();
    // Using one link leaves the other unused.
    expect(await consumeToken(knex, second, "verify_email", t0)).toBe(user.id);
  });

  it("counts hits in fixed windows: the limit-th hit passes, the next is refused until the window turns", async () => {
    const w = 60_000;
    const start = new Date("2031-05-01T10:00:00.000Z");
    const results = [];
    for (let i = 0; i < 4; i++) results.push(await hit(knex, "b", 3, w, at(15_000)));
    expect(results.map((r) => r.allowed)).toEqual([true, true, true, false]);
    // 15 s into a 60 s window: 45 s to wait.
    expect(results[3]!.retryAfterS).toBe(45);
    expect((await hit(knex, "b", 3, w, new Date(start.getTime() + 59_999))).retryAfterS).toBe(1);
    // The next window starts at :01:00 exactly, with a fresh count.
    const fresh = await hit(knex, "b", 3, w, new Date(start.getTime() + w));
    expect(fresh).toEqual({ allowed: true, retryAfterS: 60 });
    const rows = await knex("rate_limit_hits")
      .orderBy("window_start")
      .select("window_start", "hits");
    expect(rows.map((r) => [String(r.window_start).slice(0, 19), r.hits])).toEqual([
      ["2031-05-01 10:00:00", 5],
      ["2031-05-01 10:01:00", 1],
    ]);
    // Buckets are separate, and a very long bucket name is cut to the column's 191 characters.
    expect((await hit(knex, "other", 3, w, at(15_000))).allowed).toBe(true);
    const long = "x".repeat(300);
    await hit(knex, long, 3, w, at(15_000));
    await hit(knex, long, 3, w, at(15_000));
    const cut = await knex("rate_limit_hits")
      .where({ bucket: "x".repeat(191) })
      .first("hits");
    expect(cut.hits).toBe(2);
    // … and still limited: a bucket with a long address is counted like any other.
    expect((await hit(knex, long, 3, w, at(15_000))).allowed).toBe(true);
    expect((await hit(knex, long, 3, w, at(15_000))).allowed).toBe(false);
  });
});
