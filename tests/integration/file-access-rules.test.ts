/**
 * Who may read a stored file (lib/data/files.ts), the cases access-state-rules.test.ts leaves
 * out: a reviewer's job on one project opens nothing on another, even where that other project
 * once had a request.
 */
import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { getReadableAttachment } from "@/lib/data/files";
import { refusalOf } from "../support/status";
import { testKnex, truncateAll } from "../support/db";
import {
  makeHomeowner,
  makeJob,
  makeProject,
  makeRequest,
  makeReviewer,
} from "../support/fixtures";

describe("file access across projects", () => {
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

  it("a reviewer with a live job elsewhere may not read the photos of a project whose request closed", async () => {
    const reviewer = await makeReviewer(knex);
    await makeJob(knex, "in_review", { reviewer });
    const owner = await makeHomeowner(knex);
    const project = await makeProject(knex, owner);
    await makeRequest(knex, project, { status: "cancelled" });
    const [id] = await knex("attachments").insert({
      owner_id: owner.id,
      project_id: project.id,
      purpose: "photo",
      file_key: "photo-key",
      file_name: "roof.jpg",
      mime_type: "image/jpeg",
      size_bytes: 10,
    });
    const r = await refusalOf(getReadableAttachment(knex, reviewer, Number(id)));
    expect([r.status, r.message]).toEqual([403, "You do not have access to this file."]);
    // Their own job on this project does open it.
    await makeJob(knex, "in_review", { reviewer, project });
    expect((await getReadableAttachment(knex, reviewer, Number(id))).fileKey).toBe("photo-key");
  });
});
