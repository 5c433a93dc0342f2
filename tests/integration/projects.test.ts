import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { demoSystem } from "@/lib/calc/demo-system";
import { systemSections } from "@/lib/validation/system";
import {
  cancelRequest,
  createProject,
  createRequest,
  deleteProject,
  getOwnProject,
  saveProjectSection,
  updateRequest,
} from "@/lib/data/projects";
import { expireRequests } from "@/lib/worker/schedule";
import { testKnex, truncateAll } from "../support/db";
import { statusOf } from "../support/status";

const status = statusOf;

describe("projects and requests against the real MariaDB", () => {
  let knex: Knex;
  let owner: { id: number; role: "homeowner" };
  let other: { id: number; role: "homeowner" };
  let reviewer: { id: number; role: "reviewer" };
  beforeAll(() => {
    knex = testKnex();
  });
  beforeEach(async () => {
    await truncateAll(knex);
    const mk = async (email: string, role: string) =>
      Number(
        (await knex("users").insert({ email, role, display_name: email, password_hash: "x" }))[0],
      );
    owner = { id: await mk("o@x.test", "homeowner"), role: "homeowner" };
    other = { id: await mk("p@x.test", "homeowner"), role: "homeowner" };
    reviewer = { id: await mk("r@x.test", "reviewer"), role: "reviewer" };
  });
  afterAll(async () => {
    await truncateAll(knex);
    await knex.destroy();
  });

  async function completeProject() {
    const id = await createProject(knex, owner, { title: "Complete one" });
    for (const s of systemSections) await saveProjectSection(knex, owner, id, s, demoSystem[s]);
    return id;
  }
  const request = {
    kind: "remote_check" as const,
    questions: "Is the vessel big enough for steam?",
    budgetMinPounds: 60,
    budgetMaxPounds: 120,
  };

  it("saves each valid step as a draft and refuses an invalid one without losing the saved draft", async () => {
    const id = await createProject(knex, owner, { title: "Draft" });
    await saveProjectSection(knex, owner, id, "site", demoSystem.site);
    const bad = saveProjectSection(knex, owner, id, "site", {
      ...demoSystem.site,
      designMinTempC: 40,
    });
    await expect(bad).rejects.toMatchObject({
      status: 422,
      fieldErrors: { "site.designMinTempC": [expect.stringMatching(/At most 15/)] },
    });
    const p = await getOwnProject(knex, owner, id);
    expect(p.system.site).toEqual(demoSystem.site);
    expect(p.status).toBe("draft");
    expect((await knex("projects").where({ id }).first("region")).region).toBe("south-west");
  });

  it("marks a project ready when every step is valid and keeps the board columns in step", async () => {
    const id = await completeProject();
    const row = await knex("projects")
      .where({ id })
      .first("status", "collector_type", "collector_area_m2", "worst_level");
    expect(row).toMatchObject({
      status: "ready",
      collector_type: "flat_plate",
      // The example's 12 L vessel is too small once the steam reach is computed (VDI 6002-1).
      worst_level: "fix",
    });
    expect(Number(row.collector_area_m2)).toBeCloseTo(4.2, 2);
  });

  it("keeps projects to their owner", async () => {
    const id = await createProject(knex, owner, { title: "Mine" });
    expect(await status(getOwnProject(knex, other, id))).toBe(404);
    expect(await status(saveProjectSection(knex, other, id, "site", demoSystem.site))).toBe(404);
    expect(await status(createProject(knex, reviewer as never, { title: "Nope" }))).toBe(403);
    expect(await status(createRequest(knex, other, id, request))).toBe(404);
  });

  it("runs the request lifecycle: complete description first, one open at a time, edit, cancel, expire", async () => {
    const draft = await createProject(knex, owner, { title: "Unfinished" });
    expect(await status(createRequest(knex, owner, draft, request))).toBe(422);
    const id = await completeProject();
    const rid = await createRequest(knex, owner, id, request);
    const row = await knex("requests").where({ id: rid }).first();
    expect(row).toMatchObject({
      status: "open",
      region: "south-west",
      collector_type: "flat_plate",
      budget_min_minor: 6000,
      currency: "GBP",
    });
    expect(new Date(`${row.expires_at}Z`).getTime()).toBeGreaterThan(Date.now() + 29 * 86_400_000);
    expect(await status(createRequest(knex, owner, id, request))).toBe(409);
    await updateRequest(knex, owner, rid, { ...request, budgetMaxPounds: 200 });
    expect(
      (await knex("requests").where({ id: rid }).first("budget_max_minor")).budget_max_minor,
    ).toBe(20000);
    expect(await status(updateRequest(knex, other, rid, request))).toBe(404);
    await cancelRequest(knex, owner, rid);
    expect(await status(updateRequest(knex, owner, rid, request))).toBe(409);
    const again = await createRequest(knex, owner, id, request);
    await knex("requests").where({ id: again }).update({ expires_at: "2020-01-01 00:00:00" });
    await expireRequests.run({ db: knex, now: new Date(), appUrl: "http://x" });
    expect((await knex("requests").where({ id: again }).first("status")).status).toBe("expired");
  });

  it("a site visit needs a window of dates", async () => {
    const id = await completeProject();
    const r = createRequest(knex, owner, id, { ...request, kind: "site_visit" });
    await expect(r).rejects.toMatchObject({
      status: 422,
      fieldErrors: { windowStart: [expect.any(String)], windowEnd: [expect.any(String)] },
    });
  });

  it("deleting a project cancels its open request and returns its file keys for the store", async () => {
    const id = await completeProject();
    const rid = await createRequest(knex, owner, id, request);
    await knex("attachments").insert({
      owner_id: owner.id,
      project_id: id,
      purpose: "photo",
      file_key: "KEY0000000001",
      file_name: "a.png",
      mime_type: "image/png",
      size_bytes: 10,
    });
    expect(await deleteProject(knex, owner, id)).toEqual(["KEY0000000001"]);
    expect((await knex("requests").where({ id: rid }).first("status")).status).toBe("cancelled");
    expect(await status(getOwnProject(knex, owner, id))).toBe(404);
  });
});
