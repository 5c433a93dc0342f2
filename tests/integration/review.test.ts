/**
 * The review against the real MariaDB: the checklist each demo system gets, the workspace's
 * access rules, autosave with versions and conflicts, every bad input refused with nothing
 * changed, the reviewer's question about one item and the homeowner's answer, the delivery
 * rules, the frozen snapshot, and the report after delivery.
 *
 * The expected checklists are the catalogue's own rules (lib/checklist/catalogue.ts, from
 * ../shared/design/checklist.md): every "always" item, the unvented-cylinder items only for an
 * unvented cylinder, the high-point vent only where one is fitted, other heat sources only with
 * more than one. The demo systems (db/seeds/demo.ts) all have a manual vent and a solar and a
 * boiler coil; every other project's cylinder is unvented.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { seedDemo } from "@/db/seeds/demo";
import { DEMO_USERS } from "@/db/seeds/demo";
import { CATALOGUE } from "@/lib/checklist/catalogue";
import { buildChecklist } from "@/lib/checklist/build";
import { runLoopCheck } from "@/lib/calc/loop-check";
import {
  addAddendum,
  answerItemRequest,
  askForItem,
  deliverReport,
  getReport,
  getReviewState,
  getReviewWorkspace,
  listItemRequestsForProject,
  saveAnswer,
  saveReportDraft,
  StaleWriteError,
  startJobReview,
} from "@/lib/data/review";
import { parseJson } from "@/lib/data/json";
import { testKnex, truncateAll } from "../support/db";
import {
  makeAdmin,
  makeHomeowner,
  makeJob,
  makeProject,
  makeReviewer,
  type JobFixture,
} from "../support/fixtures";
import { refusalOf } from "../support/status";

const ALWAYS = [
  "roof-access",
  "roof-fixing",
  "orientation",
  "hot-zone-joints",
  "hot-zone-insulation",
  "sensor",
  "steam-reach",
  "vessel-rating",
  "vessel-size",
  "vessel-precharge",
  "vessel-cooling",
  "vessel-isolation",
  "relief-valve",
  "return-side",
  "relief-temperature",
  "fill-pressure",
  "night-pressure",
  "pump-rating",
  "component-ratings",
  "check-valve",
  "fluid-type",
  "freeze",
  "fluid-testing",
  "fluid-volume",
  "flow-rate",
  "pipe-sizing",
  "air-separation",
  "pipe-insulation",
  "controller",
  "coil-connection",
  "heat-trap",
  "store-size",
  "scald",
  "legionella",
  "relief-discharge",
  "fill-drain",
  "bonding",
  "pressure-test",
  "first-run",
];
const sorted = (a: readonly string[]) => [...a].sort();

describe("the review workspace and the report", () => {
  let knex: Knex;
  const app = "http://app.test";
  beforeAll(async () => {
    knex = testKnex();
    await truncateAll(knex);
  });
  afterAll(async () => {
    await truncateAll(knex);
    await knex.destroy();
  });

  let fileSeq = 0;
  async function file(
    projectId: number,
    ownerId: number,
    o: { purpose?: "sketch" | "photo"; mime?: string; tag?: string } = {},
  ) {
    const [id] = await knex("attachments").insert({
      owner_id: ownerId,
      project_id: projectId,
      purpose: o.purpose ?? "sketch",
      file_key: `review-test-${Date.now()}-${fileSeq++}`,
      file_name: "sketch.png",
      mime_type: o.mime ?? "image/png",
      size_bytes: 1000,
      caption: "The loop sketch",
      tag: o.tag ?? null,
    });
    return Number(id);
  }

  async function inReview(): Promise<JobFixture & { sketch: number }> {
    const job = await makeJob(knex, "in_review");
    const sketch = await file(job.project.id, job.homeowner.id);
    return { ...job, sketch };
  }

  const answerRow = (jobId: number, itemKey: string) =>
    knex("checklist_answers as a")
      .join("reports as r", "r.id", "a.report_id")
      .where({ "r.job_id": jobId, "a.item_key": itemKey })
      .first("a.verdict", "a.note_md", "a.pins", "a.version");

  it("each seeded demo system gets the checklist its description calls for, kept with its request", async () => {
    await seedDemo(knex);
    const requests = await knex("requests as r")
      .join("projects as p", "p.id", "r.project_id")
      .select("r.id", "r.loop_check_snapshot", "p.system");
    expect(requests.length).toBe(13);
    for (const r of requests) {
      const system = parseJson<{ cylinder: { type: string } }>(r.system);
      const expected = [
        ...ALWAYS,
        "high-point-vent",
        "other-sources",
        ...(system.cylinder.type === "unvented" ? ["unvented", "unvented-cutout"] : []),
      ];
      const snap = parseJson<{ itemKeys: string[]; catalogueVersion: string }>(
        r.loop_check_snapshot,
      );
      expect(sorted(snap.itemKeys)).toEqual(sorted(expected));
      expect(snap.catalogueVersion).toBe("2026-12.2");
    }
    expect(
      new Set(
        requests.map(
          (r) => parseJson<{ itemKeys: string[] }>(r.loop_check_snapshot).itemKeys.length,
        ),
      ),
    ).toEqual(new Set([41, 43]));
    // The seeded job under review: the workspace shows that request's checklist, by section.
    const reviewer = await knex("users")
      .where({ email: DEMO_USERS.reviewers[0]!.email })
      .first("id");
    const job = await knex("jobs").where({ state: "in_review" }).first("id", "request_id");
    const ws = await getReviewWorkspace(
      knex,
      { id: Number(reviewer.id), role: "reviewer" },
      Number(job.id),
    );
    const snap = parseJson<{ itemKeys: string[] }>(
      (await knex("requests").where({ id: job.request_id }).first("loop_check_snapshot"))
        .loop_check_snapshot,
    );
    expect(sorted(ws.items.map((i) => i.key))).toEqual(sorted(snap.itemKeys));
    const sectionOrder = ws.items.map((i) => i.section).filter((s, i, a) => a.indexOf(s) === i);
    expect(sectionOrder[0]).toBe("Roof and access");
    expect(sectionOrder.at(-1)).toBe("Commissioning");
    // Evidence is the loop-check finding linked to the item, with numbers and units.
    const vessel = ws.items.find((i) => i.key === "vessel-size")!;
    expect(vessel.evidence.length).toBeGreaterThan(0);
    expect(vessel.evidence[0]!.values.some((v) => v.unit)).toBe(true);
    expect(vessel.evidence[0]!.source).toBeTruthy();
    // The seeded delivered report reads with its frozen checklist.
    const deliveredJob = await knex("jobs")
      .where({ state: "delivered" })
      .first("id", "homeowner_id");
    const read = await getReport(
      knex,
      { id: Number(deliveredJob.homeowner_id), role: "homeowner" },
      Number(deliveredJob.id),
    );
    expect(read.hasChecklist).toBe(true);
    expect(read.snapshot.items.find((i) => i.key === "vessel-size")!.verdict).toBe("concern");
    expect(read.snapshot.requiredChanges[0]!.itemKeys).toEqual(["vessel-size"]);
    await truncateAll(knex);
  }, 120_000); // the demo seed answers five whole reviews through lib/data

  it("the workspace uses the request's snapshot, not the project as it is now", async () => {
    const job = await inReview();
    // The homeowner changes the cylinder to vented after posting: the checklist stays as posted.
    const system = {
      ...job.project.system,
      cylinder: { ...job.project.system.cylinder, type: "vented" },
    };
    await knex("projects")
      .where({ id: job.project.id })
      .update({ system: JSON.stringify(system) });
    const ws = await getReviewWorkspace(knex, job.reviewer, job.id);
    expect(ws.items.map((i) => i.key)).toContain("unvented-cutout");
  });

  it("only the job's reviewer works in it; admins read; others are refused", async () => {
    const job = await inReview();
    const other = await makeReviewer(knex);
    const admin = await makeAdmin(knex);
    expect((await refusalOf(getReviewWorkspace(knex, other, job.id))).status).toBe(403);
    expect((await refusalOf(getReviewWorkspace(knex, job.homeowner, job.id))).status).toBe(403);
    expect((await getReviewWorkspace(knex, admin, job.id)).jobId).toBe(job.id);
    const write = { verdict: "sound", expectedVersion: 0 };
    expect((await refusalOf(saveAnswer(knex, other, job.id, "scald", write))).status).toBe(403);
    expect((await refusalOf(saveAnswer(knex, admin, job.id, "scald", write))).status).toBe(403);
    expect((await refusalOf(saveAnswer(knex, job.homeowner, job.id, "scald", write))).status).toBe(
      403,
    );
    expect(await answerRow(job.id, "scald")).toBeUndefined();
  });

  it("starting moves funded → in review, makes the draft and tells the homeowner", async () => {
    const job = await makeJob(knex, "funded");
    expect(
      (
        await refusalOf(
          saveAnswer(knex, job.reviewer, job.id, "scald", { verdict: "sound", expectedVersion: 0 }),
        )
      ).status,
    ).toBe(409);
    await startJobReview(knex, job.reviewer, job.id);
    expect((await knex("jobs").where({ id: job.id }).first("state")).state).toBe("in_review");
    expect(await knex("reports").where({ job_id: job.id, status: "draft" })).toHaveLength(1);
    const mail = await knex("email_outbox").where({
      to_user_id: job.homeowner.id,
      template: "review_started",
    });
    expect(mail).toHaveLength(1);
    expect((await refusalOf(startJobReview(knex, job.reviewer, job.id))).status).toBe(409);
  });

  it("autosave: each save raises the version; a stale save is 409 with the newer text, and changes nothing", async () => {
    const job = await inReview();
    const a1 = await saveAnswer(knex, job.reviewer, job.id, "vessel-size", {
      verdict: "concern",
      expectedVersion: 0,
    });
    expect(a1).toMatchObject({ verdict: "concern", noteMd: "", version: 1 });
    const a2 = await saveAnswer(knex, job.reviewer, job.id, "vessel-size", {
      noteMd: "An **18 L** vessel is needed (tab A).",
      expectedVersion: 1,
    });
    expect(a2).toMatchObject({ verdict: "concern", version: 2 });
    // Tab B still thinks version 1 is the latest.
    const stale = await refusalOf(
      saveAnswer(knex, job.reviewer, job.id, "vessel-size", {
        noteMd: "Looks fine (tab B).",
        expectedVersion: 1,
      }),
    );
    expect(stale.status).toBe(409);
    expect(stale).toBeInstanceOf(StaleWriteError);
    expect((stale as StaleWriteError<{ noteMd: string; version: number }>).current).toMatchObject({
      noteMd: "An **18 L** vessel is needed (tab A).",
      version: 2,
    });
    expect(await answerRow(job.id, "vessel-size")).toMatchObject({
      note_md: "An **18 L** vessel is needed (tab A).",
      version: 2,
    });
    // Choosing "keep mine" saves against the newer version.
    const a3 = await saveAnswer(knex, job.reviewer, job.id, "vessel-size", {
      noteMd: "Looks fine (tab B).",
      expectedVersion: 2,
    });
    expect(a3.version).toBe(3);
    // The draft has the same rule.
    const d1 = await saveReportDraft(knex, job.reviewer, job.id, {
      summaryMd: "One",
      expectedVersion: 0,
    });
    expect(d1.version).toBe(1);
    const staleDraft = await refusalOf(
      saveReportDraft(knex, job.reviewer, job.id, { summaryMd: "Two", expectedVersion: 0 }),
    );
    expect(staleDraft.status).toBe(409);
    expect((await getReviewState(knex, job.reviewer, job.id)).draft.summaryMd).toBe("One");
  });

  it("bad input: each refused with its status and the saved answer unchanged", async () => {
    const job = await inReview();
    const otherJob = await inReview();
    const saved = await saveAnswer(knex, job.reviewer, job.id, "relief-valve", {
      verdict: "sound",
      noteMd: "Kept.",
      pins: [{ attachmentId: job.sketch, x: 0.5, y: 0.5, label: "Relief valve" }],
      expectedVersion: 0,
    });
    const before = await answerRow(job.id, "relief-valve");
    const tryAnswer = (input: unknown) =>
      refusalOf(saveAnswer(knex, job.reviewer, job.id, "relief-valve", input));

    const outside = await tryAnswer({
      pins: [{ attachmentId: job.sketch, x: 1.2, y: 0.5, label: "Off the edge" }],
      expectedVersion: saved.version,
    });
    expect(outside.status).toBe(422);
    expect(JSON.stringify(outside.fieldErrors)).toContain("outside the image");

    const theirs = await tryAnswer({
      pins: [{ attachmentId: otherJob.sketch, x: 0.2, y: 0.2, label: "Their sketch" }],
      expectedVersion: saved.version,
    });
    expect(theirs.status).toBe(422);
    expect(theirs.message).toContain("this project's own sketch or photos");

    const pdf = await file(job.project.id, job.homeowner.id, { mime: "application/pdf" });
    expect(
      (
        await tryAnswer({
          pins: [{ attachmentId: pdf, x: 0.2, y: 0.2, label: "On a PDF" }],
          expectedVersion: saved.version,
        })
      ).status,
    ).toBe(422);

    const verdict = await tryAnswer({ verdict: "great", expectedVersion: saved.version });
    expect(verdict.status).toBe(422);
    expect(verdict.fieldErrors?.verdict?.[0]).toContain("sound, concern, unsafe");

    const long = await tryAnswer({ noteMd: "x".repeat(8001), expectedVersion: saved.version });
    expect(long.status).toBe(422);
    expect(long.fieldErrors?.noteMd?.[0]).toBe("A note is at most 8,000 characters");

    expect((await tryAnswer({ verdict: "sound" })).status).toBe(422); // no version
    expect(
      (
        await refusalOf(
          saveAnswer(knex, job.reviewer, job.id, "no-such-item", {
            verdict: "sound",
            expectedVersion: 0,
          }),
        )
      ).status,
    ).toBe(404);
    expect(
      (
        await refusalOf(
          saveReportDraft(knex, job.reviewer, job.id, {
            requiredChanges: [{ text: "Do it", itemKeys: ["no-such-item"] }],
            expectedVersion: 0,
          }),
        )
      ).status,
    ).toBe(422);

    // Not in review: a delivered job answers 409.
    const delivered = await makeJob(knex, "delivered");
    expect(
      (
        await refusalOf(
          saveAnswer(knex, delivered.reviewer, delivered.id, "scald", {
            verdict: "sound",
            expectedVersion: 0,
          }),
        )
      ).status,
    ).toBe(409);

    expect(await answerRow(job.id, "relief-valve")).toEqual(before);
  });

  it("asking for a missing photo: thread, e-mail, project page, the answer beside the item", async () => {
    const job = await inReview();
    const photo = await file(job.project.id, job.homeowner.id, { purpose: "photo", tag: "vessel" });
    const asked = await askForItem(
      knex,
      job.reviewer,
      job.id,
      {
        itemKey: "vessel-rating",
        kind: "photo",
        questionMd: "A photo of the vessel's rating plate, please.",
      },
      app,
    );
    expect(asked).toMatchObject({
      itemKey: "vessel-rating",
      itemTitle: "Expansion vessel rating",
      answeredAt: null,
    });
    // In the request's conversation.
    const thread = await knex("message_threads")
      .where({ request_id: job.request.id, reviewer_id: job.reviewer.id })
      .first("id");
    const msgs = await knex("messages")
      .where({ thread_id: thread.id })
      .orderBy("id")
      .select("body_md", "sender_id");
    expect(msgs[0]!.body_md).toContain("rating plate");
    expect(msgs[0]!.body_md).toContain("Expansion vessel rating");
    // E-mailed with a link to the project page.
    const mail = await knex("email_outbox")
      .where({ to_user_id: job.homeowner.id, template: "item_requested" })
      .first("payload");
    expect(parseJson<{ url: string }>(mail.payload).url).toBe(
      `${app}/projects/${job.project.id}#reviewer-questions`,
    );
    // On the homeowner's project, and nobody else's.
    const mine = await listItemRequestsForProject(knex, job.homeowner, job.project.id);
    expect(mine.map((q) => q.id)).toEqual([asked.id]);
    expect(mine[0]!.open).toBe(true);
    const stranger = await makeHomeowner(knex);
    expect(await listItemRequestsForProject(knex, stranger, job.project.id)).toEqual([]);
    expect(
      (await refusalOf(answerItemRequest(knex, stranger, asked.id, { answerMd: "Hi" }, app)))
        .status,
    ).toBe(404);
    // Another project's photo is refused, nothing answered.
    const other = await makeProject(knex, job.homeowner);
    const otherPhoto = await file(other.id, job.homeowner.id, { purpose: "photo" });
    expect(
      (
        await refusalOf(
          answerItemRequest(knex, job.homeowner, asked.id, { attachmentId: otherPhoto }, app),
        )
      ).status,
    ).toBe(422);
    expect(
      (await refusalOf(answerItemRequest(knex, job.homeowner, asked.id, { answerMd: "" }, app)))
        .status,
    ).toBe(422);
    expect(
      (await knex("item_requests").where({ id: asked.id }).first("answered_at")).answered_at,
    ).toBeNull();
    // The answer, with a photo.
    await answerItemRequest(
      knex,
      job.homeowner,
      asked.id,
      { answerMd: "Here it is: 10 bar.", attachmentId: String(photo) },
      app,
    );
    const state = await getReviewState(knex, job.reviewer, job.id);
    expect(state.itemRequests[0]).toMatchObject({
      answerMd: "Here it is: 10 bar.",
      answerAttachmentId: photo,
    });
    expect(state.itemRequests[0]!.answeredAt).not.toBeNull();
    // The photo is now tagged to the item, so the workspace shows it beside it.
    const ws = await getReviewWorkspace(knex, job.reviewer, job.id);
    expect(ws.items.find((i) => i.key === "vessel-rating")!.photoIds).toContain(photo);
    const after = await knex("messages")
      .where({ thread_id: thread.id })
      .orderBy("id")
      .select("body_md");
    expect(after.at(-1)!.body_md).toContain("10 bar");
    expect(after.at(-1)!.body_md).toContain(`/api/files/${photo}`);
    expect(
      (
        await refusalOf(
          answerItemRequest(knex, job.homeowner, asked.id, { answerMd: "Again" }, app),
        )
      ).status,
    ).toBe(409);
    // Not for an item off the checklist.
    expect(
      (
        await refusalOf(
          askForItem(
            knex,
            job.reviewer,
            job.id,
            { itemKey: "nope", kind: "fact", questionMd: "What is it?" },
            app,
          ),
        )
      ).status,
    ).toBe(404);
  });

  async function answerAll(job: JobFixture, verdict = "sound", except: string[] = []) {
    const ws = await getReviewWorkspace(knex, job.reviewer, job.id);
    for (const item of ws.items) {
      if (except.includes(item.key)) continue;
      await saveAnswer(knex, job.reviewer, job.id, item.key, {
        verdict,
        expectedVersion: ws.answers[item.key]!.version,
      });
    }
    return ws;
  }

  it("delivery refusals: unanswered items, unsafe with ready to commission, no required change", async () => {
    const job = await inReview();
    await answerAll(job, "sound", ["scald"]);
    await saveReportDraft(knex, job.reviewer, job.id, {
      outcome: "ready_to_commission",
      summaryMd: "All sound.",
      expectedVersion: 0,
    });
    const unanswered = await refusalOf(deliverReport(knex, job.reviewer, job.id, app));
    expect(unanswered.status).toBe(422);
    expect(unanswered.message).toContain("no verdict yet");
    expect(unanswered.message).toContain("Scald protection");

    await saveAnswer(knex, job.reviewer, job.id, "scald", {
      verdict: "unsafe",
      expectedVersion: 0,
    });
    const unsafe = await refusalOf(deliverReport(knex, job.reviewer, job.id, app));
    expect(unsafe.status).toBe(422);
    expect(unsafe.message).toContain("cannot be “Ready to commission”");

    await saveReportDraft(knex, job.reviewer, job.id, {
      outcome: "fix_before_filling",
      expectedVersion: 1,
    });
    const none = await refusalOf(deliverReport(knex, job.reviewer, job.id, app));
    expect(none.status).toBe(422);
    expect(none.message).toContain("at least one required change");

    expect((await knex("jobs").where({ id: job.id }).first("state")).state).toBe("in_review");
    expect((await knex("reports").where({ job_id: job.id }).first("status")).status).toBe("draft");
    expect(
      await knex("email_outbox").where({
        template: "report_delivered",
        to_user_id: job.homeowner.id,
      }),
    ).toHaveLength(0);
    expect(
      (await refusalOf(deliverReport(knex, await makeReviewer(knex), job.id, app))).status,
    ).toBe(403);
  });

  it("delivery freezes the report; later edits are 409; an addendum is dated; the snapshot outlives catalogue changes", async () => {
    const job = await inReview();
    await answerAll(job, "sound", ["scald"]);
    await saveAnswer(knex, job.reviewer, job.id, "scald", {
      verdict: "unsafe",
      noteMd: "No mixing valve at the outlet.",
      pins: [{ attachmentId: job.sketch, x: 0.25, y: 0.75, label: "Hot outlet" }],
      expectedVersion: 0,
    });
    await saveReportDraft(knex, job.reviewer, job.id, {
      outcome: "fix_before_filling",
      summaryMd: "Fit a **mixing valve**.",
      requiredChanges: [
        { text: "Fit a thermostatic mixing valve at the outlet.", itemKeys: ["scald"] },
      ],
      expectedVersion: 0,
    });
    const snapshot = await deliverReport(knex, job.reviewer, job.id, app);
    expect(snapshot.format).toBe(1);
    const row = await knex("jobs").where({ id: job.id }).first("state", "release_due_at");
    expect(row.state).toBe("delivered");
    const mail = await knex("email_outbox")
      .where({ template: "report_delivered", to_user_id: job.homeowner.id })
      .first("payload");
    const payload = parseJson<{ url: string; outcome: string; releaseBy: string }>(mail.payload);
    expect(payload.url).toBe(`${app}/jobs/${job.id}/report`);
    expect(payload.outcome).toBe("fix before filling");
    expect(payload.releaseBy).toBe(String(row.release_due_at).slice(0, 10));

    const report = await knex("reports").where({ job_id: job.id }).first();
    expect(report.status).toBe("delivered");
    expect(report.snapshot_format).toBe(1);
    const stored = parseJson<typeof snapshot>(report.checklist_snapshot);
    expect(stored.catalogueVersion).toBe("2026-12.2");
    const scald = stored.items.find((i) => i.key === "scald")!;
    expect(scald).toMatchObject({ verdict: "unsafe", noteMd: "No mixing valve at the outlet." });
    expect(scald.pins).toEqual([
      { attachmentId: job.sketch, x: 0.25, y: 0.75, label: "Hot outlet" },
    ]);
    expect(
      stored.items.find((i) => i.key === "vessel-size")!.evidence[0]!.values.length,
    ).toBeGreaterThan(0);

    // Frozen: answers and draft refuse with 409; nothing changes.
    expect(
      (
        await refusalOf(
          saveAnswer(knex, job.reviewer, job.id, "scald", { verdict: "sound", expectedVersion: 1 }),
        )
      ).status,
    ).toBe(409);
    expect(
      (
        await refusalOf(
          saveReportDraft(knex, job.reviewer, job.id, { summaryMd: "Changed", expectedVersion: 1 }),
        )
      ).status,
    ).toBe(409);
    expect(
      (
        await refusalOf(
          askForItem(
            knex,
            job.reviewer,
            job.id,
            { itemKey: "scald", kind: "fact", questionMd: "Which valve?" },
            app,
          ),
        )
      ).status,
    ).toBe(409);
    expect((await refusalOf(deliverReport(knex, job.reviewer, job.id, app))).status).toBe(409);
    expect(
      parseJson<typeof snapshot>(
        (await knex("reports").where({ job_id: job.id }).first()).checklist_snapshot,
      ),
    ).toEqual(stored);

    // A dated addendum is allowed; only by the reviewer.
    await addAddendum(knex, job.reviewer, job.id, {
      bodyMd: "The valve model I meant is any to EN 1111.",
    });
    expect(
      (await refusalOf(addAddendum(knex, job.homeowner, job.id, { bodyMd: "Not mine to add" })))
        .status,
    ).toBe(403);
    expect(
      (
        await refusalOf(
          addAddendum(knex, (await inReview()).reviewer, job.id, { bodyMd: "Not my job" }),
        )
      ).status,
    ).toBe(403);

    // The catalogue changes afterwards: wording and a rule. The delivered report does not.
    const item = CATALOGUE.find((c) => c.key === "scald")! as { check: string; applies: unknown };
    const was = { check: item.check, applies: item.applies };
    try {
      item.check = "Reworded in a later catalogue.";
      item.applies = () => false;
      const now = buildChecklist(job.project.system, runLoopCheck(job.project.system).findings);
      expect(now.items.map((i) => i.key)).not.toContain("scald");
      const read = await getReport(knex, job.homeowner, job.id);
      const frozen = read.snapshot.items.find((i) => i.key === "scald")!;
      expect(frozen.check).toBe(was.check);
      expect(frozen.verdict).toBe("unsafe");
      expect(read.snapshot.catalogueVersion).toBe("2026-12.2");
      expect(read.addenda).toHaveLength(1);
      expect(read.viewer).toBe("homeowner");
    } finally {
      item.check = was.check;
      item.applies = was.applies;
    }
    // The report: its homeowner, its reviewer and admins; anyone else 404.
    expect((await getReport(knex, job.reviewer, job.id)).viewer).toBe("reviewer");
    expect((await getReport(knex, await makeAdmin(knex), job.id)).viewer).toBe("admin");
    expect((await refusalOf(getReport(knex, await makeHomeowner(knex), job.id))).status).toBe(404);
    const undelivered = await inReview();
    expect((await refusalOf(getReport(knex, undelivered.homeowner, undelivered.id))).status).toBe(
      404,
    );
  });
});
