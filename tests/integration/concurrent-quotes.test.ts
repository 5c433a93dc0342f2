/**
 * Many reviewers quoting at once (what `npm run soak` does) take InnoDB gap locks on quotes and
 * deadlock; the loser's transaction is retried, so every reviewer's quote is saved and none sees
 * "something went wrong".
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { submitQuote } from "@/lib/data/quotes";
import { postMessage } from "@/lib/data/messages";
import { testKnex, truncateAll } from "../support/db";
import {
  makeHomeowner,
  makeProject,
  makeQuote,
  makeRequest,
  makeReviewer,
} from "../support/fixtures";

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

  it("saves every message when both sides of many threads write at the same moment", async () => {
    const owner = await makeHomeowner(knex);
    const request = await makeRequest(knex, await makeProject(knex, owner));
    const reviewers = [];
    for (let i = 0; i < 6; i++) {
      const r = await makeReviewer(knex);
      await makeQuote(knex, request, r);
      await knex("message_threads").insert({ request_id: request.id, reviewer_id: r.id });
      reviewers.push(r);
    }
    const before = Number((await knex("messages").count({ n: "*" }))[0]!.n);
    const pools = Array.from({ length: 12 }, () => testKnex());
    try {
      const results = await Promise.allSettled(
        reviewers.flatMap((r, i) =>
          [0, 1, 2].flatMap(() => [
            postMessage(pools[i]!, r, request.id, { body: "A question (concurrency test)." }),
            postMessage(pools[i + 6]!, owner, request.id, { body: "An answer." }, r.id),
          ]),
        ),
      );
      const failed = results.filter((r) => r.status === "rejected");
      expect(failed.map((f) => String((f as PromiseRejectedResult).reason))).toEqual([]);
      expect(Number((await knex("messages").count({ n: "*" }))[0]!.n) - before).toBe(36);
    } finally {
      await Promise.all(pools.map((p) => p.destroy()));
    }
  });
});
