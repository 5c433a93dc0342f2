import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { parseJson } from "@/lib/data/json";
import { listMessages, postMessage } from "@/lib/data/messages";
import { setSuspension } from "@/lib/data/reviewers";
import { testKnex, truncateAll } from "../support/db";
import {
  makeAdmin,
  makeHomeowner,
  makeProject,
  makeQuote,
  makeRequest,
  makeReviewer,
  type HomeownerFixture,
  type QuoteStatus,
  type RequestFixture,
  type ReviewerFixture,
} from "../support/fixtures";
import { refusalOf } from "../support/status";

/** Issue 13 items 6 and 12: who learns whose name, and who may write, in request threads. */
describe("security: request messages, against the real MariaDB", () => {
  let knex: Knex;
  let owner: HomeownerFixture;
  let request: RequestFixture;
  const PROJECT_TITLE = "Loft loop at Fenwick Row";
  beforeAll(() => {
    knex = testKnex();
  });
  beforeEach(async () => {
    await truncateAll(knex);
    owner = await makeHomeowner(knex, { displayName: "Marta Quill" });
    request = await makeRequest(knex, await makeProject(knex, owner, { title: PROJECT_TITLE }));
  });
  afterAll(async () => {
    await truncateAll(knex);
    await knex.destroy();
  });

  async function quoting(status: QuoteStatus = "live"): Promise<ReviewerFixture> {
    const reviewer = await makeReviewer(knex);
    await makeQuote(knex, request, reviewer, { status });
    await knex("message_threads").insert({ request_id: request.id, reviewer_id: reviewer.id });
    return reviewer;
  }

  it("keeps the homeowner's name and the project title from a reviewer until acceptance", async () => {
    const reviewer = await quoting();
    await postMessage(knex, owner, request.id, { body: "Is the vessel sized?" }, reviewer.id);
    const before = await listMessages(knex, reviewer, request.id);
    expect(before[0]!.senderName).toBe("The homeowner");
    expect(JSON.stringify(before)).not.toContain("Marta");

    const mail = await knex("email_outbox").where({ template: "new_message" }).first("payload");
    const payload = parseJson(mail.payload) as Record<string, string>;
    expect(JSON.stringify(payload)).not.toContain("Marta");
    expect(JSON.stringify(payload)).not.toContain(PROJECT_TITLE);
    // The reply link opens the request page, which exists (app/(app)/requests/[id]/page.tsx).
    expect(new URL(payload.url!).pathname).toBe(`/requests/${request.id}`);

    // After acceptance the reviewer works with the homeowner by name.
    await knex("quotes").where({ reviewer_id: reviewer.id }).update({ status: "accepted" });
    const after = await listMessages(knex, reviewer, request.id);
    expect(after[0]!.senderName).toBe("Marta Quill");
  });

  it("lets only the homeowner and reviewers with a live or accepted quote write", async () => {
    const live = await quoting("live");
    const declined = await quoting("declined");
    const withdrawn = await quoting("withdrawn");
    const accepted = await quoting("accepted");
    expect(await postMessage(knex, live, request.id, { body: "A question" })).toBeGreaterThan(0);
    expect(await postMessage(knex, accepted, request.id, { body: "Job note" })).toBeGreaterThan(0);
    expect(
      await postMessage(knex, owner, request.id, { body: "Thanks" }, declined.id),
    ).toBeGreaterThan(0);
    for (const r of [declined, withdrawn]) {
      const refused = await refusalOf(postMessage(knex, r, request.id, { body: "Still here" }));
      expect(refused.status).toBe(403);
      expect(refused.message).toMatch(/no longer open/);
    }
    // A declined reviewer may still read what was said.
    expect((await listMessages(knex, declined, request.id)).length).toBe(1);
    expect(await knex("messages")).toHaveLength(3);
  });

  it("stops a suspended reviewer writing, and lets an admin read but not write", async () => {
    const reviewer = await quoting();
    const admin = await makeAdmin(knex);
    await postMessage(knex, reviewer, request.id, { body: "Before" });
    await setSuspension(knex, admin, {
      reviewerId: reviewer.id,
      suspend: true,
      reason: "Credential under review",
    });
    const suspended = await refusalOf(postMessage(knex, reviewer, request.id, { body: "After" }));
    expect(suspended.status).toBe(403);
    expect(suspended.message).toMatch(/suspended/);

    const read = await listMessages(knex, admin, request.id, reviewer.id);
    expect(read.map((m) => m.bodyMd)).toEqual(["Before"]);
    const write = await refusalOf(
      postMessage(knex, admin, request.id, { body: "Admin here" }, reviewer.id),
    );
    expect(write.status).toBe(403);
    expect(await knex("messages")).toHaveLength(1);
  });
});
