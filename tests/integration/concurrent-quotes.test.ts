/**
 * Many reviewers quoting at once (what `npm run soak` does) take InnoDB gap locks on quotes and
 * deadlock; the loser's transaction is retried, so every reviewer's quote is saved and none sees
 * "something went wrong".
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { submitQuote } from "@/lib/data/quotes";
import { testKnex, truncateAll } from "../support/db";
import { makeHomeowner, makeProject, makeRequest, makeReviewer } from "../support/fixtures";

describe("concurrent quotes", () => {
  let knex: Knex;
  beforeAll(async () => {
    knex = testKnex();
    await truncateAll(knex);
  });
  afterAll(async () => {
    await truncateAll(knex);
    await knex.destroy();
  });

  it("saves every quote when twelve reviewers quote on four requests at the same moment", async () => {
    // One pool per reviewer, as separate app processes would have.
    const owner = await makeHomeowner(knex);
    const requests: Awaited<ReturnType<typeof makeRequest>>[] = [];
    for (let i = 0; i < 4; i++)
      requests.push(await makeRequest(knex, await makeProject(knex, owner)));
    const reviewers = [];
    for (let i = 0; i < 12; i++) reviewers.push(await makeReviewer(knex));
    const pools = reviewers.map(() => testKnex());
    try {
      const results = await Promise.allSettled(
        reviewers.flatMap((r, i) =>
          requests.map((req) =>
            submitQuote(pools[i]!, r, req.id, {
              pricePounds: 90,
              turnaroundDays: 3,
              scopeMd: "Full checklist review of the loop (concurrency test).",
            }),
          ),
        ),
      );
      const failed = results.filter((r) => r.status === "rejected");
      expect(failed.map((f) => String((f as PromiseRejectedResult).reason))).toEqual([]);
      expect(Number((await knex("quotes").count({ n: "*" }))[0]!.n)).toBe(48);
    } finally {
      await Promise.all(pools.map((p) => p.destroy()));
    }
  });
});
