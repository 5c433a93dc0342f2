/**
 * Single-use e-mail tokens and the shared rate-limit counters, stated exactly: how long a link
 * lives, that it works once and for its own purpose only, and where a fixed window starts and
 * ends. Real MariaDB, fixed clocks.
 */
import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { consumeToken, issueToken, TOKEN_TTL_MS } from "@/lib/data/tokens";
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
});
