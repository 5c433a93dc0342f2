import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { parseJson } from "@/lib/data/json";
import {
  RESET_LIMITS,
  SIGN_IN_LIMITS,
  SIGN_UP_LIMITS,
  recordSignInFailure,
  recordSignInSuccess,
  signInWait,
} from "@/lib/data/rate-limit";
import { createAccount, requestPasswordReset } from "@/lib/data/accounts";
import { testKnex, truncateAll } from "../support/db";
import { makeHomeowner } from "../support/fixtures";
import { refusalOf } from "../support/status";

const APP = "http://app.test";
const HOME = "198.51.100.10"; // the account holder's network (RFC 5737 documentation range)
const ATTACKER = "203.0.113.66";

/**
 * Issue 13 items 1, 3 and 11 and issue 15 item 23: the limits of lib/data/rate-limit.ts, kept by
 * rate-limiter-flexible in the `rate_limits` table (so shared by every app process).
 */
describe("security: rate limits in MariaDB", () => {
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

  const fail = (email: string, address: string) => recordSignInFailure(knex, email, address, APP);

  it("makes an account-and-address pair wait after consecutive failures, with backoff", async () => {
    const email = "owner@example.test";
    for (let i = 0; i < SIGN_IN_LIMITS.perPair; i++) {
      expect(await signInWait(knex, email, ATTACKER)).toBe(0);
      await fail(email, ATTACKER);
    }
    expect(await signInWait(knex, email, ATTACKER)).toBe(0); // the limit is reached, not passed
    await fail(email, ATTACKER);
    const first = await signInWait(knex, email, ATTACKER);
    expect(first).toBeGreaterThan(SIGN_IN_LIMITS.firstBackoffS - 5);
    expect(first).toBeLessThanOrEqual(SIGN_IN_LIMITS.firstBackoffS);
    // The counters live in the database: the wait is a row, seen by every process.
    expect(await knex("rate_limits").where("key", "like", "signin_pair:%")).toHaveLength(1);

    // The wait runs out (moved into the past here); the next round waits twice as long.
    await knex("rate_limits").where("key", "like", "signin_pair:%").update({ expire: 1 });
    for (let i = 0; i <= SIGN_IN_LIMITS.perPair; i++) await fail(email, ATTACKER);
    const second = await signInWait(knex, email, ATTACKER);
    expect(second).toBeGreaterThan(2 * SIGN_IN_LIMITS.firstBackoffS - 5);
    expect(second).toBeLessThanOrEqual(2 * SIGN_IN_LIMITS.firstBackoffS);
  });

  it("never locks the real user out from their own address", async () => {
    const email = "owner@example.test";
    for (let i = 0; i < 30; i++) await fail(email, ATTACKER);
    expect(await signInWait(knex, email, ATTACKER)).toBeGreaterThan(0);
    expect(await signInWait(knex, email, HOME)).toBe(0);
  });

  it("counts failures only: correct sign-ins never use up the limit, and clear the pair", async () => {
    const email = "owner@example.test";
    await fail(email, HOME); // one typo
    for (let i = 0; i < 3 * SIGN_IN_LIMITS.perPair; i++) {
      expect(await signInWait(knex, email, HOME)).toBe(0);
      await recordSignInSuccess(knex, email, HOME);
    }
    // After a success, a full run of typos is allowed again.
    for (let i = 0; i < SIGN_IN_LIMITS.perPair; i++) await fail(email, HOME);
    expect(await signInWait(knex, email, HOME)).toBe(0);
  });

  it("limits one address spraying many accounts", async () => {
    for (let i = 0; i < SIGN_IN_LIMITS.perAddressPerDay; i++)
      await fail(`victim${i}@example.test`, ATTACKER);
    expect(await signInWait(knex, "fresh@example.test", ATTACKER)).toBeGreaterThan(0);
    expect(await signInWait(knex, "fresh@example.test", HOME)).toBe(0);
  }, 120_000);

  it("e-mails the account holder once when their account sees many failures", async () => {
    const owner = await makeHomeowner(knex);
    for (let i = 0; i < SIGN_IN_LIMITS.alertAfterAccountFailures + 5; i++)
      await fail(owner.email, `203.0.113.${i + 1}`);
    const mails = await knex("email_outbox").where({ template: "sign_in_failures" });
    expect(mails).toHaveLength(1);
    expect(mails[0].to_address).toBe(owner.email);
    const payload = parseJson(mails[0].payload) as { url: string };
    // A page that exists: app/(public)/forgot-password.
    expect(new URL(payload.url).pathname).toBe("/forgot-password");
    // Nobody is e-mailed for an unknown address.
    for (let i = 0; i < SIGN_IN_LIMITS.alertAfterAccountFailures; i++)
      await fail("nobody@example.test", `203.0.113.${i + 1}`);
    expect(await knex("email_outbox").where({ template: "sign_in_failures" })).toHaveLength(1);
  });

  it("limits sign-ups per address and per e-mail address", async () => {
    const signUp = (email: string, address: string) =>
      createAccount(
        knex,
        { role: "homeowner", displayName: "Pat", email, password: "correct-horse-loop" },
        APP,
        address,
      );
    for (let i = 0; i < SIGN_UP_LIMITS.perAddressPerHour; i++)
      await signUp(`new${i}@example.test`, ATTACKER);
    const tooMany = await refusalOf(signUp("one-more@example.test", ATTACKER));
    expect(tooMany.status).toBe(429);
    expect(tooMany.message).toMatch(/Too many new accounts/);
    expect(await knex("users").where({ email: "one-more@example.test" })).toHaveLength(0);

    // One target e-mail address from many networks.
    const target = "target@example.test";
    await signUp(target, "198.51.100.1");
    for (let i = 2; i <= SIGN_UP_LIMITS.perAccountPerDay; i++)
      expect((await refusalOf(signUp(target, `198.51.100.${i}`))).status).toBe(422); // taken
    expect((await refusalOf(signUp(target, "198.51.100.99"))).status).toBe(429);
  });

  it("limits password-reset e-mails per target account and per address", async () => {
    const owner = await makeHomeowner(knex);
    const statuses: number[] = [];
    for (let i = 0; i < 20; i++) {
      try {
        await requestPasswordReset(knex, owner.email, APP, `198.51.100.${i + 1}`);
        statuses.push(200);
      } catch (err) {
        statuses.push((err as { status: number }).status);
      }
    }
    expect(statuses.filter((s) => s === 200)).toHaveLength(RESET_LIMITS.perAccountPerHour);
    expect(statuses.slice(RESET_LIMITS.perAccountPerHour).every((s) => s === 429)).toBe(true);
    expect(await knex("email_outbox").where({ template: "reset_password" })).toHaveLength(
      RESET_LIMITS.perAccountPerHour,
    );
    // One address asking for many accounts.
    for (let i = 0; i < RESET_LIMITS.perAddressPerHour; i++)
      await requestPasswordReset(knex, `someone${i}@example.test`, APP, ATTACKER);
    expect(
      (await refusalOf(requestPasswordReset(knex, "another@example.test", APP, ATTACKER))).status,
    ).toBe(429);
  });
});
