import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { seedDemo, DEMO_USERS } from "@/db/seeds/demo";
import { submitQuote } from "@/lib/data/quotes";
import { countUnread, listMessages, postMessage } from "@/lib/data/messages";
import { testKnex, truncateAll } from "../support/db";
import { statusOf } from "../support/status";

describe("messages on a request, against the real MariaDB", () => {
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
    await knex("quotes").where({ request_id: requestId }).del();
    await knex("message_threads").where({ request_id: requestId }).del();
    await submitQuote(
      knex,
      who.sol,
      requestId,
      { pricePounds: 90, turnaroundDays: 2, scopeMd: "Checklist review and written report." },
      "http://x",
    );
  });
  afterAll(async () => {
    await truncateAll(knex);
    await knex.destroy();
  });

  it("lets the homeowner and the quoting reviewer talk, and nobody else read it", async () => {
    await postMessage(knex, who.sol!, requestId, { body: "Is the vessel on a cooling leg?" });
    await postMessage(knex, who.owner!, requestId, { body: "Yes, about 1 m below." }, who.sol!.id);
    const seenByReviewer = await listMessages(knex, who.sol!, requestId);
    expect(seenByReviewer.map((m) => [m.mine, m.bodyMd])).toEqual([
      [true, "Is the vessel on a cooling leg?"],
      [false, "Yes, about 1 m below."],
    ]);
    expect((await listMessages(knex, who.owner!, requestId, who.sol!.id)).length).toBe(2);
    expect(await statusOf(listMessages(knex, who.ines!, requestId))).toBe(403); // has not quoted
    expect(await statusOf(listMessages(knex, who.stranger!, requestId, who.sol!.id))).toBe(404);
    expect(
      await statusOf(postMessage(knex, who.stranger!, requestId, { body: "hi" }, who.sol!.id)),
    ).toBe(404);
    expect(await statusOf(postMessage(knex, who.sol!, requestId, { body: "   " }))).toBe(422);
  });

  it("counts unread messages until the thread is opened, and e-mails the other side", async () => {
    await postMessage(knex, who.sol!, requestId, { body: "First question" });
    await postMessage(knex, who.sol!, requestId, { body: "Second question" });
    expect(await countUnread(knex, who.owner!)).toBe(2);
    expect(await countUnread(knex, who.sol!)).toBe(0);
    await listMessages(knex, who.owner!, requestId, who.sol!.id);
    expect(await countUnread(knex, who.owner!)).toBe(0);
    // Batched: two messages in a row give one e-mail.
    expect(
      await knex("email_outbox").where({ template: "new_message", to_user_id: who.owner!.id }),
    ).toHaveLength(1);
  });
});
