/**
 * The rules of lib/data/rate-limit.ts stated exactly, against the real MariaDB: which counter
 * each limit keeps, how an e-mail address is normalised into its key, how long a refusal says
 * to wait, the backoff after a correct password, and the account holder's alert. The rough
 * behaviour (limits reached, backoff doubling) is in security-limits.test.ts.
 */
import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { parseJson } from "@/lib/data/json";
import {
  RESET_LIMITS,
  SIGN_IN_LIMITS,
  SIGN_UP_LIMITS,
  limitPasswordReset,
  limitSignUp,
  recordSignInFailure,
  recordSignInSuccess,
  signInWait,
} from "@/lib/data/rate-limit";
import { testKnex, truncateAll } from "../support/db";
import { makeHomeowner } from "../support/fixtures";
import { refusalOf } from "../support/status";

const APP = "http://app.test";
const HOME = "198.51.100.10"; // RFC 5737 documentation range
const ATTACKER = "203.0.113.66";

describe("rate-limit rules, exactly", () => {
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
  const keys = async () =>
    (await knex("rate_limits").orderBy("key").select("key")).map((r) => r.key as string);
  /** Moves a counter's end to `ms` from now, as if it had been set that long ago. */
  const endsIn = (key: string, ms: number) =>
    knex("rate_limits")
      .where({ key })
      .update({ expire: Date.now() + ms });

  it("keeps each limit in a counter of its own, keyed by the normalised e-mail and the address", async () => {
    await fail("  Owner@Example.TEST ", HOME);
    await limitSignUp(knex, HOME, " New@Example.TEST");
    await limitPasswordReset(knex, HOME, "Reset@Example.TEST ");
    expect(await keys()).toEqual([
      `reset_acct:reset@example.test`,
      `reset_addr:${HOME}`,
      `signin_acct:owner@example.test`,
      `signin_addr:${HOME}`,
      `signin_pair:owner@example.test|${HOME}`,
      `signup_acct:new@example.test`,
      `signup_addr:${HOME}`,
    ]);
    // The backoff round counter appears only once the pair is made to wait.
    for (let i = 0; i < SIGN_IN_LIMITS.perPair; i++) await fail("OWNER@example.test", HOME);
    expect(await keys()).toContain(`signin_rounds:owner@example.test|${HOME}`);
    // However the address is typed, it is the same pair: it waits.
    expect(await signInWait(knex, " owner@EXAMPLE.test", HOME)).toBeGreaterThan(0);
  });

  it("cuts a very long e-mail and address so every key fits its column (255), and still counts them", async () => {
    // Before the cut fitted the column, the 6th failure of such a pair threw "Data too long".
    const long = `${"a".repeat(300)}@example.test`;
    const address = "2001:db8:1:2:3:4:5:6%a-very-long-interface-name-0123456789-abcdef";
    expect(address.length).toBeGreaterThan(60);
    for (let i = 0; i <= SIGN_IN_LIMITS.perPair; i++) await fail(long, address);
    expect(await signInWait(knex, long, address)).toBeGreaterThan(0);
    // A different address of the same first 60 characters is the same pair (cut, not hashed).
    expect(await signInWait(knex, long, `${address}-other`)).toBeGreaterThan(0);
    await limitSignUp(knex, address, long);
    await limitPasswordReset(knex, address, long);
    const cut = { email: "a".repeat(180), address: address.slice(0, 60) };
    expect(await keys()).toEqual([
      `reset_acct:${cut.email}`,
      `reset_addr:${cut.address}`,
      `signin_acct:${cut.email}`,
      `signin_addr:${cut.address}`,
      `signin_pair:${cut.email}|${cut.address}`,
      `signin_rounds:${cut.email}|${cut.address}`,
      `signup_acct:${cut.email}`,
      `signup_addr:${cut.address}`,
    ]);
    expect(Math.max(...(await keys()).map((k) => k.length))).toBe(255);
  });

  it("says how long to wait in whole seconds, rounded up", async () => {
    for (let i = 0; i <= SIGN_IN_LIMITS.perPair; i++) await fail("owner@example.test", HOME);
    await endsIn(`signin_pair:owner@example.test|${HOME}`, 30_500);
    expect(await signInWait(knex, "owner@example.test", HOME)).toBe(31);
    // The address limit alone (many accounts from one address) says its own wait.
    for (let i = 0; i < SIGN_IN_LIMITS.perAddressPerDay; i++)
      await fail(`victim${i}@example.test`, ATTACKER);
    await endsIn(`signin_addr:${ATTACKER}`, 45_500);
    expect(await signInWait(knex, "fresh@example.test", ATTACKER)).toBe(46);
    // Both counters over: the longer wait.
    for (let i = 0; i <= SIGN_IN_LIMITS.perPair; i++) await fail("fresh@example.test", ATTACKER);
    await endsIn(`signin_pair:fresh@example.test|${ATTACKER}`, 20_500);
    expect(await signInWait(knex, "fresh@example.test", ATTACKER)).toBe(46);
    await endsIn(`signin_pair:fresh@example.test|${ATTACKER}`, 50_500);
    expect(await signInWait(knex, "fresh@example.test", ATTACKER)).toBe(51);
  }, 120_000);

  it("a correct password also resets the backoff: the next round waits the first wait again", async () => {
    const email = "owner@example.test";
    for (let i = 0; i <= SIGN_IN_LIMITS.perPair; i++) await fail(email, HOME);
    const first = await signInWait(knex, email, HOME);
    expect(first).toBeGreaterThan(SIGN_IN_LIMITS.firstBackoffS - 5);
    expect(first).toBeLessThanOrEqual(SIGN_IN_LIMITS.firstBackoffS);
    await recordSignInSuccess(knex, email, HOME);
    expect(await keys()).not.toContain(`signin_rounds:${email}|${HOME}`);
    expect(await keys()).not.toContain(`signin_pair:${email}|${HOME}`);
    expect(await signInWait(knex, email, HOME)).toBe(0);
    for (let i = 0; i <= SIGN_IN_LIMITS.perPair; i++) await fail(email, HOME);
    const again = await signInWait(knex, email, HOME);
    expect(again).toBeGreaterThan(SIGN_IN_LIMITS.firstBackoffS - 5);
    expect(again).toBeLessThanOrEqual(SIGN_IN_LIMITS.firstBackoffS);
  });

  it("the backoff doubles each round up to its cap of an hour", async () => {
    const email = "owner@example.test";
    const key = `signin_pair:${email}|${ATTACKER}`;
    const waits: number[] = [];
    for (let round = 0; round < 8; round++) {
      // Each round: the counter's window has run out, and the pair fails past its limit again.
      if (round > 0) await knex("rate_limits").where({ key }).update({ expire: 1 });
      for (let i = 0; i <= SIGN_IN_LIMITS.perPair; i++) await fail(email, ATTACKER);
      const w = await signInWait(knex, email, ATTACKER);
      waits.push(Math.round(w / 10) * 10);
    }
    expect(waits).toEqual([60, 120, 240, 480, 960, 1920, 3600, 3600]);
  }, 120_000);

  it("e-mails the account holder at exactly the alert count, with their name, the count and the reset page", async () => {
    const owner = await makeHomeowner(knex, { email: "pat@example.test", displayName: "Pat" });
    const other = await makeHomeowner(knex, { email: "sam@example.test", displayName: "Sam" });
    for (let i = 1; i < SIGN_IN_LIMITS.alertAfterAccountFailures; i++)
      await fail(" PAT@example.test", `203.0.113.${i}`);
    expect(await knex("email_outbox")).toHaveLength(0);
    await fail("pat@example.test", "203.0.113.200");
    const mails = await knex("email_outbox").where({ template: "sign_in_failures" });
    expect(mails).toHaveLength(1);
    expect(mails[0]).toMatchObject({ to_address: owner.email, to_user_id: owner.id });
    expect(parseJson(mails[0].payload)).toEqual({
      name: "Pat",
      count: SIGN_IN_LIMITS.alertAfterAccountFailures,
      url: `${APP}/forgot-password`,
    });
    const today = new Date().toISOString().slice(0, 10);
    expect(mails[0].dedupe_key).toBe(`signin-failures-${owner.id}-${today}`);
    // Another account's alert is its own e-mail, not deduplicated against the first.
    for (let i = 0; i < SIGN_IN_LIMITS.alertAfterAccountFailures; i++)
      await fail(other.email, `203.0.113.${i + 1}`);
    expect(
      (await knex("email_outbox").where({ template: "sign_in_failures" }).select("to_user_id"))
        .map((m) => m.to_user_id)
        .sort(),
    ).toEqual([owner.id, other.id].sort());
  });

  it("refuses sign-ups and reset e-mails over each limit with its own message and the minutes left", async () => {
    for (let i = 0; i < SIGN_UP_LIMITS.perAddressPerHour; i++)
      await limitSignUp(knex, ATTACKER, `new${i}@example.test`);
    await endsIn(`signup_addr:${ATTACKER}`, 90_500);
    const addr = await refusalOf(limitSignUp(knex, ATTACKER, "one-more@example.test"));
    expect([addr.status, addr.message]).toEqual([
      429,
      "Too many new accounts from this network. Try again in 2 minutes.",
    ]);

    for (let i = 0; i < SIGN_UP_LIMITS.perAccountPerDay; i++)
      await limitSignUp(knex, `198.51.100.${i + 1}`, "target@example.test");
    const acct = await refusalOf(limitSignUp(knex, "198.51.100.99", " Target@example.test"));
    expect([acct.status, acct.message]).toEqual([
      429,
      "Too many sign-ups for this e-mail address. Try again in 1440 minutes.",
    ]);

    for (let i = 0; i < RESET_LIMITS.perAddressPerHour; i++)
      await limitPasswordReset(knex, ATTACKER, `someone${i}@example.test`);
    const resetAddr = await refusalOf(limitPasswordReset(knex, ATTACKER, "x@example.test"));
    expect([resetAddr.status, resetAddr.message]).toEqual([
      429,
      "Too many reset requests from this network. Try again in 60 minutes.",
    ]);

    for (let i = 0; i < RESET_LIMITS.perAccountPerHour; i++)
      await limitPasswordReset(knex, `198.51.100.${i + 1}`, "pat@example.test");
    const resetAcct = await refusalOf(
      limitPasswordReset(knex, "198.51.100.99", "PAT@example.test"),
    );
    expect([resetAcct.status, resetAcct.message]).toEqual([
      429,
      "Too many reset e-mails for this address. Try again in 60 minutes.",
    ]);
  });
});
