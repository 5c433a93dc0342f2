import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { seedDemo, DEMO_USERS } from "@/db/seeds/demo";
import {
  acceptQuote,
  declineQuote,
  listQuotesForHomeowner,
  submitQuote,
  withdrawQuote,
} from "@/lib/data/quotes";
import { testKnex, truncateAll } from "../support/db";
import { statusOf } from "../support/status";

const APP = "http://app.test";

describe("quotes and accepting one, against the real MariaDB", () => {
  let knex: Knex;
  const who: Record<string, { id: number; role: "homeowner" | "reviewer" }> = {};
  let requestId: number;

  beforeAll(() => {
    knex = testKnex();
  });
  beforeEach(async () => {
    await truncateAll(knex);
    await seedDemo(knex);
    const id = async (email: string) =>
      Number((await knex("users").where({ email }).first("id")).id);
    who.sol = { id: await id(DEMO_USERS.reviewers[0].email), role: "reviewer" };
    who.ines = { id: await id(DEMO_USERS.reviewers[1].email), role: "reviewer" };
    who.dev = { id: await id(DEMO_USERS.reviewers[2].email), role: "reviewer" };
    const open = await knex("requests")
      .where({ status: "open", kind: "remote_check" })
      .first("id", "homeowner_id");
    requestId = Number(open.id);
    who.owner = { id: Number(open.homeowner_id), role: "homeowner" };
    const stranger = await knex("users")
      .where({ role: "homeowner" })
      .whereNot({ id: who.owner.id })
      .first("id");
    who.stranger = { id: Number(stranger.id), role: "homeowner" };
    // Start from a request with no quotes on it, and an outbox without the demo's own e-mails.
    await knex("quotes").where({ request_id: requestId }).del();
    await knex("email_outbox").del();
  });
  afterAll(async () => {
    await truncateAll(knex);
    await knex.destroy();
  });

  const quote = {
    pricePounds: 95,
    turnaroundDays: 3,
    scopeMd: "Full checklist review with a written report.",
  };

  it("lets verified reviewers quote once (a second submit edits it) and e-mails the homeowner", async () => {
    const first = await submitQuote(knex, who.sol!, requestId, quote, APP);
    const again = await submitQuote(knex, who.sol!, requestId, { ...quote, pricePounds: 110 }, APP);
    expect(again).toBe(first);
    const live = await knex("quotes").where({
      request_id: requestId,
      reviewer_id: who.sol!.id,
      status: "live",
    });
    expect(live).toHaveLength(1);
    expect(live[0].price_minor).toBe(11000);
    expect(
      await knex("email_outbox").where({ template: "new_quote", to_user_id: who.owner!.id }),
    ).toHaveLength(1);
    expect(await statusOf(submitQuote(knex, who.dev!, requestId, quote, APP))).toBe(403); // not verified
  });

  it("refuses absurd prices with a field error, and a closed request with 409", async () => {
    const r = submitQuote(knex, who.sol!, requestId, { ...quote, pricePounds: 0 }, APP);
    await expect(r).rejects.toMatchObject({
      status: 422,
      fieldErrors: { pricePounds: [expect.stringMatching(/At least/)] },
    });
    await expect(
      submitQuote(knex, who.sol!, requestId, { ...quote, pricePounds: 99999 }, APP),
    ).rejects.toMatchObject({
      status: 422,
      message: "Some details need attention.",
      fieldErrors: { pricePounds: [expect.stringMatching(/At most/)] },
    });
    await knex("requests").where({ id: requestId }).update({ expires_at: "2020-01-01 00:00:00" });
    expect(await statusOf(submitQuote(knex, who.sol!, requestId, quote, APP))).toBe(409);
  });

  it("accepts exactly one quote when two tabs accept two quotes at once", async () => {
    const a = await submitQuote(knex, who.sol!, requestId, quote, APP);
    const b = await submitQuote(knex, who.ines!, requestId, { ...quote, pricePounds: 80 }, APP);
    const other = testKnex();
    try {
      const results = await Promise.allSettled([
        acceptQuote(knex, who.owner!, a, APP),
        acceptQuote(other, who.owner!, b, APP),
      ]);
      const ok = results.filter((r) => r.status === "fulfilled");
      const failed = results.filter((r) => r.status === "rejected") as PromiseRejectedResult[];
      expect(ok).toHaveLength(1);
      expect(failed).toHaveLength(1);
      expect(failed[0]!.reason).toMatchObject({ status: 409 });
    } finally {
      await other.destroy();
    }
    const jobs = await knex("jobs").where({ request_id: requestId });
    expect(jobs).toHaveLength(1);
    expect(jobs[0]).toMatchObject({ state: "awaiting_payment", homeowner_id: who.owner!.id });
    expect(jobs[0].fee_minor).toBe(Math.round(jobs[0].amount_minor * 0.12));
    expect((await knex("requests").where({ id: requestId }).first("status")).status).toBe(
      "awarded",
    );
    const statuses = (await knex("quotes").where({ request_id: requestId }).select("status"))
      .map((q) => q.status)
      .sort();
    expect(statuses).toEqual(["accepted", "declined"]);
    expect(await knex("email_outbox").where({ template: "quote_accepted" })).toHaveLength(1);
    expect(await knex("email_outbox").where({ template: "quote_declined" })).toHaveLength(1);
  });

  it("hides a suspended reviewer's quote and refuses to accept it", async () => {
    const a = await submitQuote(knex, who.sol!, requestId, quote, APP);
    await knex("reviewer_profiles")
      .where({ user_id: who.sol!.id })
      .update({ suspended_at: "2026-01-01 00:00:00", suspended_reason: "test" });
    expect(await listQuotesForHomeowner(knex, who.owner!, requestId)).toEqual([]);
    expect(await statusOf(acceptQuote(knex, who.owner!, a, APP))).toBe(409);
    expect(await knex("jobs").where({ request_id: requestId })).toHaveLength(0);
  });

  it("keeps quotes to the request's owner, and lets reviewers withdraw and homeowners decline", async () => {
    const a = await submitQuote(knex, who.sol!, requestId, quote, APP);
    const b = await submitQuote(knex, who.ines!, requestId, quote, APP);
    expect(await statusOf(listQuotesForHomeowner(knex, who.stranger!, requestId))).toBe(404);
    expect(await statusOf(acceptQuote(knex, who.stranger!, a, APP))).toBe(404);
    expect(await statusOf(acceptQuote(knex, who.sol! as never, a, APP))).toBe(403);
    expect(await statusOf(withdrawQuote(knex, who.ines!, a))).toBe(409); // not hers
    await withdrawQuote(knex, who.sol!, a);
    await declineQuote(knex, who.owner!, b, "Went with a local engineer", APP);
    expect((await knex("quotes").where({ id: b }).first("decline_reason")).decline_reason).toBe(
      "Went with a local engineer",
    );
    expect(await listQuotesForHomeowner(knex, who.owner!, requestId)).toEqual([]);
  });
});
