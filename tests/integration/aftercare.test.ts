import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import {
  getJobRating,
  listReviewerRatings,
  rateReviewer,
  ratingSummary,
  replyToRating,
} from "@/lib/data/ratings";
import { getPhotoGuidance, setPhotoItems } from "@/lib/data/photo-tags";
import { countersignFirstFill, getFirstFillPage, saveFirstFill } from "@/lib/data/first-fill";
import { listQuotesForHomeowner } from "@/lib/data/quotes";
import { testKnex, truncateAll } from "../support/db";
import {
  makeHomeowner,
  makeJob,
  makeProject,
  makeQuote,
  makeRequest,
  makeReviewer,
  type HomeownerFixture,
} from "../support/fixtures";
import { refusalOf, statusOf } from "../support/status";

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

describe("ratings", () => {
  it("lets the homeowner rate once after release, the reviewer reply once, and shows the average", async () => {
    const reviewer = await makeReviewer(knex);
    const a = await makeJob(knex, "released", { reviewer });
    const b = await makeJob(knex, "partially_refunded", { reviewer });

    await rateReviewer(knex, a.homeowner, a.id, { stars: "5", comment: "Clear and quick." });
    const again = await refusalOf(rateReviewer(knex, a.homeowner, a.id, { stars: 1 }));
    expect(again.status).toBe(409);
    expect(again.message).toMatch(/already rated/);
    await rateReviewer(knex, b.homeowner, b.id, { stars: 4, comment: "" });

    // Average (5 + 4) / 2 = 4.5 from two ratings; the second attempt changed nothing.
    expect(await ratingSummary(knex, reviewer.id)).toEqual({ average: 4.5, count: 2 });
    expect((await getJobRating(knex, a.homeowner, a.id))?.stars).toBe(5);

    await replyToRating(knex, reviewer, a.id, { replyMd: "Thank you — enjoy the hot water." });
    expect(await statusOf(replyToRating(knex, reviewer, a.id, { replyMd: "Again" }))).toBe(409);
    const listed = await listReviewerRatings(knex, reviewer.id);
    expect(listed.find((r) => r.jobId === a.id)).toMatchObject({
      stars: 5,
      comment: "Clear and quick.",
      replyMd: "Thank you — enjoy the hot water.",
    });
  });

  it("refuses a rating before release, from the wrong person, and out of range", async () => {
    const delivered = await makeJob(knex, "delivered");
    expect(
      await statusOf(rateReviewer(knex, delivered.homeowner, delivered.id, { stars: 5 })),
    ).toBe(409);
    const released = await makeJob(knex, "released");
    const stranger = await makeHomeowner(knex);
    expect(await statusOf(rateReviewer(knex, stranger, released.id, { stars: 5 }))).toBe(404);
    expect(await statusOf(rateReviewer(knex, released.reviewer, released.id, { stars: 5 }))).toBe(
      403,
    );
    const bad = await refusalOf(rateReviewer(knex, released.homeowner, released.id, { stars: 6 }));
    expect(bad.status).toBe(422);
    expect(bad.fieldErrors?.stars?.[0]).toMatch(/1 to 5/);
    // Only the rated reviewer replies; nothing to reply to is 404.
    await rateReviewer(knex, released.homeowner, released.id, { stars: 3 });
    const other = await makeReviewer(knex);
    expect(await statusOf(replyToRating(knex, other, released.id, { replyMd: "Not mine" }))).toBe(
      404,
    );
    expect(
      await statusOf(replyToRating(knex, released.homeowner, released.id, { replyMd: "Me" })),
    ).toBe(403);
    expect(await statusOf(getJobRating(knex, stranger, released.id))).toBe(404);
    expect(await knex("ratings").count({ n: "*" }).first()).toMatchObject({ n: 1 });
  });

  it("shows the average and the count in the quote comparison", async () => {
    const reviewer = await makeReviewer(knex);
    const done = await makeJob(knex, "released", { reviewer });
    await rateReviewer(knex, done.homeowner, done.id, { stars: 4 });
    const owner = await makeHomeowner(knex);
    const request = await makeRequest(knex, await makeProject(knex, owner));
    await makeQuote(knex, request, reviewer);
    const [q] = await listQuotesForHomeowner(knex, owner, request.id);
    expect(q).toMatchObject({ rating: 4, ratingCount: 1 });
  });
});

describe("photo tags", () => {
  async function photo(owner: HomeownerFixture, projectId: number, purpose = "photo") {
    const [id] = await knex("attachments").insert({
      owner_id: owner.id,
      project_id: projectId,
      purpose,
      file_key: `K${Math.random().toString(36).slice(2)}`,
      file_name: "vessel.jpg",
      mime_type: "image/jpeg",
      size_bytes: 10,
      tag: purpose === "photo" ? "vessel" : null,
    });
    return Number(id);
  }

  it("lists the items that need a photo, tags a photo to them and shows which still have none", async () => {
    const owner = await makeHomeowner(knex);
    const project = await makeProject(knex, owner);
    const id = await photo(owner, project.id);
    const before = await getPhotoGuidance(knex, owner, project.id);
    expect(before.ready).toBe(true);
    const vessel = before.items.find((i) => i.key === "vessel-rating")!;
    expect(vessel.photo).toMatch(/rating plate/);
    expect(vessel.photoIds).toEqual([]);
    expect(before.items.find((i) => i.key === "hot-zone-joints")?.fromRoof).toBe(true);
    // The example system has a manual high-point vent, so that item applies; an item without
    // photo guidance (the legionella check) is not in the photo list.
    expect(before.items.some((i) => i.key === "legionella")).toBe(false);

    await setPhotoItems(knex, owner, project.id, id, {
      itemKeys: ["vessel-rating", "vessel-size"],
    });
    const after = await getPhotoGuidance(knex, owner, project.id);
    expect(after.items.find((i) => i.key === "vessel-rating")!.photoIds).toEqual([id]);
    expect(after.photos[0]!.itemKeys.sort()).toEqual(["vessel-rating", "vessel-size"]);
    expect(after.items.filter((i) => i.photoIds.length === 0).length).toBe(after.items.length - 2);
  });

  it("refuses an item that does not apply, another owner's photo, a sketch, and a reviewer", async () => {
    const owner = await makeHomeowner(knex);
    // The example's cylinder is unvented; make it vented so the unvented checks do not apply.
    const vented = await makeProject(knex, owner);
    await knex("projects")
      .where({ id: vented.id })
      .update({
        system: JSON.stringify({
          ...vented.system,
          cylinder: { ...vented.system.cylinder, type: "vented" },
        }),
      });
    const id = await photo(owner, vented.id);
    await setPhotoItems(knex, owner, vented.id, id, { itemKeys: ["relief-valve"] });
    const bad = await refusalOf(
      setPhotoItems(knex, owner, vented.id, id, { itemKeys: ["unvented", "no-such-item"] }),
    );
    expect(bad.status).toBe(422);
    expect(bad.fieldErrors?.itemKeys).toEqual([
      "“Unvented cylinder safety” does not apply to this project",
      "“No such item” does not apply to this project",
    ]);
    // Nothing saved was lost.
    expect(await knex("attachment_items").where({ attachment_id: id }).pluck("item_key")).toEqual([
      "relief-valve",
    ]);

    const other = await makeHomeowner(knex);
    const theirs = await makeProject(knex, other);
    const theirPhoto = await photo(other, theirs.id);
    expect(
      await statusOf(setPhotoItems(knex, owner, vented.id, theirPhoto, { itemKeys: [] })),
    ).toBe(404);
    expect(
      await statusOf(setPhotoItems(knex, owner, theirs.id, theirPhoto, { itemKeys: [] })),
    ).toBe(404);
    const sketch = await photo(owner, vented.id, "sketch");
    expect(
      await statusOf(setPhotoItems(knex, owner, vented.id, sketch, { itemKeys: ["relief-valve"] })),
    ).toBe(422);
    const reviewer = await makeReviewer(knex);
    expect(await statusOf(setPhotoItems(knex, reviewer, vented.id, id, { itemKeys: [] }))).toBe(
      403,
    );
    expect(await statusOf(getPhotoGuidance(knex, other, vented.id))).toBe(404);
  });
});

describe("the first-fill record", () => {
  const reading = {
    coldFillBar: "1.9",
    prechargeBar: "1.2",
    hotBar: "2.1",
    hotTempC: "60",
    glycolPercentMass: "30",
    flowLph: "170",
    notes: "Filled on a dull morning, collector covered.",
  };

  it("records the reading after delivery, compares it with the design, and the reviewer countersigns once", async () => {
    const job = await makeJob(knex, "delivered");
    await saveFirstFill(knex, job.homeowner, job.id, reading);
    const page = await getFirstFillPage(knex, job.homeowner, job.project.id);
    const entry = page.jobs.find((j) => j.jobId === job.id)!;
    expect(entry.record).toMatchObject({ coldFillBar: 1.9, glycolPercentMass: 30, hotTempC: 60 });
    // The example's design fill is 1.93 bar (matches); 30 % glycol freezes near −12.8 °C
    // (Melinder 2010), above the −17 °C clear night at the collector: that one differs.
    const byKey = Object.fromEntries(entry.comparison!.items.map((i) => [i.key, i.status]));
    expect(byKey["cold-fill"]).toBe("matches");
    expect(byKey.glycol).toBe("differs");

    // The homeowner may correct it before the countersign.
    await saveFirstFill(knex, job.homeowner, job.id, { ...reading, glycolPercentMass: "40" });
    expect(await knex("first_fill_records").where({ job_id: job.id }).count({ n: "*" })).toEqual([
      { n: 1 },
    ]);

    // The reviewer sees it through the project page, and countersigns once.
    const seen = await getFirstFillPage(knex, job.reviewer, job.project.id);
    expect(seen.viewer).toBe("reviewer");
    expect(seen.jobs.map((j) => j.jobId)).toEqual([job.id]);
    await countersignFirstFill(knex, job.reviewer, job.id, { comment: "Readings look right." });
    expect(
      await statusOf(countersignFirstFill(knex, job.reviewer, job.id, { comment: "Again" })),
    ).toBe(409);
    const signed = (await getFirstFillPage(knex, job.homeowner, job.project.id)).jobs[0]!.record!;
    expect(signed.countersignedBy).toBe(job.reviewer.displayName);
    expect(signed.countersignComment).toBe("Readings look right.");
    // Countersigned: the homeowner can no longer change it.
    expect(await statusOf(saveFirstFill(knex, job.homeowner, job.id, reading))).toBe(409);
  });

  it("refuses values outside physical bounds as field errors and keeps what was saved", async () => {
    const job = await makeJob(knex, "released");
    await saveFirstFill(knex, job.homeowner, job.id, reading);
    const bad = await refusalOf(
      saveFirstFill(knex, job.homeowner, job.id, {
        ...reading,
        coldFillBar: "40",
        glycolPercentMass: "120",
      }),
    );
    expect(bad.status).toBe(422);
    expect(bad.fieldErrors?.coldFillBar?.[0]).toMatch(/At most 10 bar/);
    expect(bad.fieldErrors?.glycolPercentMass?.[0]).toMatch(/At most 100 % by mass/);
    const row = await knex("first_fill_records").where({ job_id: job.id }).first();
    expect(Number(row.fill_pressure_cold_bar)).toBe(1.9);
    expect(Number(row.glycol_percent_mass)).toBe(30);
  });

  it("refuses the wrong people and a job whose report is not delivered", async () => {
    const early = await makeJob(knex, "in_review");
    expect(await statusOf(saveFirstFill(knex, early.homeowner, early.id, reading))).toBe(409);
    const job = await makeJob(knex, "delivered");
    const stranger = await makeHomeowner(knex);
    expect(await statusOf(saveFirstFill(knex, stranger, job.id, reading))).toBe(404);
    expect(await statusOf(saveFirstFill(knex, job.reviewer, job.id, reading))).toBe(403);
    // Nothing to countersign yet; another reviewer and the homeowner may not countersign.
    expect(await statusOf(countersignFirstFill(knex, job.reviewer, job.id, {}))).toBe(404);
    await saveFirstFill(knex, job.homeowner, job.id, reading);
    const other = await makeReviewer(knex);
    expect(await statusOf(countersignFirstFill(knex, other, job.id, {}))).toBe(404);
    expect(await statusOf(countersignFirstFill(knex, job.homeowner, job.id, {}))).toBe(403);
    expect(await statusOf(getFirstFillPage(knex, other, job.project.id))).toBe(404);
    expect(await statusOf(getFirstFillPage(knex, stranger, job.project.id))).toBe(404);
  });
});
