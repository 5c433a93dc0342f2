/**
 * The rules of lib/data/quotes.ts stated exactly, against the real MariaDB: what a quote stores,
 * the site-visit date window, who may withdraw, what the homeowner's list shows (and hides) and
 * in which order, what accepting writes and leaves alone, and what a reviewer reads of a request
 * before and after it closes. quotes.test.ts and access-state-rules.test.ts hold the rough rules
 * (one live quote each, two tabs accepting at once, strangers refused).
 */
import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { env } from "@/lib/env";
import { parseJson } from "@/lib/data/json";
import {
  acceptQuote,
  declineQuote,
  getRequestForHomeowner,
  getRequestForReviewer,
  listQuotesForHomeowner,
  submitQuote,
  withdrawQuote,
} from "@/lib/data/quotes";
import { refusalOf } from "../support/status";
import { testKnex, truncateAll } from "../support/db";
import {
  daysFromNow,
  makeHomeowner,
  makeJob,
  makeProject,
  makeQuote,
  makeRequest,
  makeReviewer,
} from "../support/fixtures";

const APP = "http://app.test";
const quote = { pricePounds: 95.5, turnaroundDays: 4, scopeMd: "Full checklist review, written." };
const day = (d: Date) => d.toISOString().slice(0, 10);

describe("quote rules, exactly", () => {
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

  const openRequest = async (o: Parameters<typeof makeRequest>[2] = {}) => {
    const owner = await makeHomeowner(knex);
    const project = await makeProject(knex, owner);
    return { owner, project, request: await makeRequest(knex, project, o) };
  };

  describe("submitting", () => {
    it("stores the price in minor units, the request's currency, the days and scope; opens a thread; audits", async () => {
      const { request } = await openRequest();
      const reviewer = await makeReviewer(knex);
      const id = await submitQuote(
        knex,
        reviewer,
        request.id,
        { ...quote, proposedVisitDate: "2031-01-01" },
        APP,
      );
      expect(
        await knex("quotes")
          .where({ id })
          .first(
            "request_id",
            "reviewer_id",
            "status",
            "price_minor",
            "currency",
            "turnaround_days",
            "scope_md",
            "proposed_visit_date",
          ),
      ).toEqual({
        request_id: request.id,
        reviewer_id: reviewer.id,
        status: "live",
        price_minor: 9550,
        currency: env().CURRENCY,
        turnaround_days: 4,
        scope_md: "Full checklist review, written.",
        // A remote check has no visit: a date sent anyway is not kept.
        proposed_visit_date: null,
      });
      expect(
        await knex("message_threads").where({ request_id: request.id, reviewer_id: reviewer.id }),
      ).toHaveLength(1);
      const audits = await knex("audit_log").where({ action: "quote.submitted" });
      expect(audits).toHaveLength(1);
      expect(audits[0]).toMatchObject({
        actor_id: reviewer.id,
        entity_type: "request",
        entity_id: request.id,
      });
      expect(parseJson(audits[0].detail)).toEqual({ quoteId: id });
      // Changing the live quote edits it: no second thread, e-mail or audit row.
      expect(
        await submitQuote(knex, reviewer, request.id, { ...quote, turnaroundDays: 9 }, APP),
      ).toBe(id);
      expect((await knex("quotes").where({ id }).first("turnaround_days")).turnaround_days).toBe(9);
      expect(await knex("quotes")).toHaveLength(1);
      expect(await knex("message_threads")).toHaveLength(1);
      expect(await knex("audit_log").where({ action: "quote.submitted" })).toHaveLength(1);
      expect(await knex("email_outbox").where({ template: "new_quote" })).toHaveLength(1);
    });

    it("a withdrawn quote is not edited: quoting again makes a new live quote", async () => {
      const { request } = await openRequest();
      const reviewer = await makeReviewer(knex);
      const old = await makeQuote(knex, request, reviewer, { status: "withdrawn" });
      const id = await submitQuote(knex, reviewer, request.id, quote, APP);
      expect(id).not.toBe(old.id);
      expect((await knex("quotes").where({ id: old.id }).first("status")).status).toBe("withdrawn");
    });

    it("no such request: 404 with its message", async () => {
      const reviewer = await makeReviewer(knex);
      const r = await refusalOf(submitQuote(knex, reviewer, 987654, quote, APP));
      expect([r.status, r.message]).toEqual([404, "No such request."]);
    });

    it("only verified reviewers quote: homeowners and unverified reviewers get 403 with the reason", async () => {
      const { owner, request } = await openRequest();
      for (const actor of [owner as never, await makeReviewer(knex, { verified: false })]) {
        const r = await refusalOf(submitQuote(knex, actor, request.id, quote, APP));
        expect([r.status, r.message]).toEqual([
          403,
          "Only verified reviewers can see requests and quote.",
        ]);
      }
      expect(await knex("quotes")).toHaveLength(0);
    });

    it("a site visit needs a date inside the request's window, not in the past; the ends count", async () => {
      const { request } = await openRequest({ kind: "site_visit" });
      const reviewer = await makeReviewer(knex);
      const w = await knex("requests")
        .where({ id: request.id })
        .first("window_start", "window_end");
      const start = String(w.window_start);
      const end = String(w.window_end);
      const dayBefore = day(daysFromNow(-1, new Date(`${start}T12:00:00Z`)));
      const dayAfter = day(daysFromNow(1, new Date(`${end}T12:00:00Z`)));
      for (const bad of [undefined, "", dayBefore, dayAfter]) {
        const r = await refusalOf(
          submitQuote(knex, reviewer, request.id, { ...quote, proposedVisitDate: bad }, APP),
        );
        expect([r.status, r.message, r.fieldErrors], String(bad)).toEqual([
          422,
          "Some details need attention.",
          { proposedVisitDate: [`Propose a date between ${start} and ${end}`] },
        ]);
      }
      expect(await knex("quotes")).toHaveLength(0);
      const id = await submitQuote(
        knex,
        reviewer,
        request.id,
        { ...quote, proposedVisitDate: start },
        APP,
      );
      expect(
        (await knex("quotes").where({ id }).first("proposed_visit_date")).proposed_visit_date,
      ).toBe(start);
      await submitQuote(knex, reviewer, request.id, { ...quote, proposedVisitDate: end }, APP);
      expect(
        (await knex("quotes").where({ id }).first("proposed_visit_date")).proposed_visit_date,
      ).toBe(end);
    });

    it("a site-visit date inside the window but already past is refused", async () => {
      const { request } = await openRequest({ kind: "site_visit" });
      const yesterday = day(daysFromNow(-1));
      await knex("requests")
        .where({ id: request.id })
        .update({ window_start: day(daysFromNow(-5)), window_end: day(daysFromNow(5)) });
      const reviewer = await makeReviewer(knex);
      const r = await refusalOf(
        submitQuote(knex, reviewer, request.id, { ...quote, proposedVisitDate: yesterday }, APP),
      );
      expect(r.status).toBe(422);
      expect(r.fieldErrors?.proposedVisitDate).toHaveLength(1);
      const today = day(new Date());
      expect(
        await submitQuote(knex, reviewer, request.id, { ...quote, proposedVisitDate: today }, APP),
      ).toBeGreaterThan(0);
    });
  });

  describe("withdrawing", () => {
    it("is for the quote's reviewer while it is live; homeowners get 403", async () => {
      const { owner, request } = await openRequest();
      const reviewer = await makeReviewer(knex);
      const q = await makeQuote(knex, request, reviewer);
      const h = await refusalOf(withdrawQuote(knex, owner as never, q.id));
      expect(h.status).toBe(403);
      const other = await refusalOf(withdrawQuote(knex, await makeReviewer(knex), q.id));
      expect([other.status, other.message]).toEqual([
        409,
        "Only a live quote of yours can be withdrawn.",
      ]);
      expect((await knex("quotes").where({ id: q.id }).first("status")).status).toBe("live");
      await withdrawQuote(knex, reviewer, q.id);
      expect((await knex("quotes").where({ id: q.id }).first("status")).status).toBe("withdrawn");
      expect((await refusalOf(withdrawQuote(knex, reviewer, q.id))).status).toBe(409);
      // An accepted or declined quote is not withdrawn either.
      for (const status of ["accepted", "declined"] as const) {
        const done = await makeQuote(knex, request, await makeReviewer(knex), { status });
        expect((await refusalOf(withdrawQuote(knex, reviewer, done.id))).status).toBe(409);
        const mine = await refusalOf(withdrawQuote(knex, done.reviewer, done.id));
        expect(mine.status, status).toBe(409);
        expect((await knex("quotes").where({ id: done.id }).first("status")).status).toBe(status);
      }
    });
  });

  describe("the homeowner's list", () => {
    it("shows each live quote's details, rating and distance, cheapest first", async () => {
      // A site at 51.0 N and reviewers' centres on the same meridian: one degree of latitude is
      // 111.19 km on the sphere of the IUGG mean Earth radius, 6371.0 km (2π·6371/360).
      const { owner, request } = await openRequest({
        kind: "site_visit",
        siteLat: 51,
        siteLng: -2,
      });
      const near = await makeReviewer(knex, { centreLat: 52, centreLng: -2 });
      const far = await makeReviewer(knex);
      const dear = await makeQuote(knex, request, near, { priceMinor: 12000, turnaroundDays: 5 });
      const cheap = await makeQuote(knex, request, far, { priceMinor: 8000 });
      // Two ratings of the near reviewer, 4 and 5 stars: 4.5 from 2.
      const job = await makeJob(knex, "released", { reviewer: near });
      const rater = await makeHomeowner(knex);
      await knex("ratings").insert([
        { job_id: job.id, rater_id: job.homeowner.id, ratee_id: near.id, stars: 4 },
        { job_id: job.id, rater_id: rater.id, ratee_id: near.id, stars: 5 },
      ]);
      const list = await listQuotesForHomeowner(knex, owner, request.id);
      expect(list.map((q) => q.id)).toEqual([cheap.id, dear.id]);
      expect(list[1]).toEqual({
        id: dear.id,
        reviewerId: near.id,
        tradingName: `${near.displayName} Heating`,
        yearsInTrade: 12,
        priceMinor: 12000,
        currency: env().CURRENCY,
        turnaroundDays: 5,
        scopeMd: "Full checklist review of the sketch, photos and loop check. (test)",
        proposedVisitDate: day(daysFromNow(10)),
        status: "live",
        rating: 4.5,
        ratingCount: 2,
        distanceKm: 111,
      });
      // No centre given: no distance; no ratings: none shown.
      expect(list[0]).toMatchObject({ distanceKm: null, rating: null, ratingCount: 0 });
    });

    it("orders by price whatever order the quotes came in", async () => {
      const { owner, request } = await openRequest();
      for (const priceMinor of [12000, 8000, 10000, 9000])
        await makeQuote(knex, request, await makeReviewer(knex), { priceMinor });
      expect(
        (await listQuotesForHomeowner(knex, owner, request.id)).map((q) => q.priceMinor),
      ).toEqual([8000, 9000, 10000, 12000]);
    });

    it("a suspended reviewer's quote is hidden even once accepted", async () => {
      const { owner, request } = await openRequest();
      const reviewer = await makeReviewer(knex);
      await makeQuote(knex, request, reviewer, { status: "accepted" });
      await knex("reviewer_profiles")
        .where({ user_id: reviewer.id })
        .update({ suspended_at: "2031-01-01 00:00:00", suspended_reason: "test" });
      expect(await listQuotesForHomeowner(knex, owner, request.id)).toEqual([]);
    });

    it("no distance for a request without a site (a remote check)", async () => {
      const { owner, request } = await openRequest();
      await makeQuote(knex, request, await makeReviewer(knex, { centreLat: 52, centreLng: -2 }));
      expect((await listQuotesForHomeowner(knex, owner, request.id))[0]!.distanceKm).toBeNull();
    });

    it("hides a live quote whose reviewer is no longer verified, but keeps the accepted one", async () => {
      const { owner, request } = await openRequest();
      const lapsed = await makeReviewer(knex);
      const q = await makeQuote(knex, request, lapsed);
      const keep = await makeQuote(knex, request, await makeReviewer(knex));
      await knex("credentials").where({ reviewer_id: lapsed.id }).update({ status: "expired" });
      expect((await listQuotesForHomeowner(knex, owner, request.id)).map((x) => x.id)).toEqual([
        keep.id,
      ]);
      await knex("quotes").where({ id: q.id }).update({ status: "accepted" });
      expect(
        (await listQuotesForHomeowner(knex, owner, request.id)).map((x) => [x.id, x.status]),
      ).toEqual([
        [q.id, "accepted"],
        [keep.id, "live"],
      ]);
    });

    it("is for homeowners: a reviewer gets 403; another's request 404 with its message", async () => {
      const { request } = await openRequest();
      const reviewer = await makeReviewer(knex);
      expect(
        (await refusalOf(listQuotesForHomeowner(knex, reviewer as never, request.id))).status,
      ).toBe(403);
      const r = await refusalOf(
        listQuotesForHomeowner(knex, await makeHomeowner(knex), request.id),
      );
      expect([r.status, r.message]).toEqual([404, "No such request."]);
    });
  });

  describe("accepting", () => {
    it("writes the job from the quote, declines only the other live quotes, e-mails and audits", async () => {
      const { owner, request } = await openRequest();
      const chosen = await makeQuote(knex, request, await makeReviewer(knex), {
        priceMinor: 12345,
      });
      const other = await makeQuote(knex, request, await makeReviewer(knex));
      const withdrawn = await makeQuote(knex, request, await makeReviewer(knex), {
        status: "withdrawn",
      });
      const earlier = await makeQuote(knex, request, await makeReviewer(knex), {
        status: "declined",
      });
      const jobId = await acceptQuote(knex, owner, chosen.id, APP);
      const fee = Math.round(12345 * 0.12); // PLATFORM_FEE_PERCENT 12 in the test environment
      expect(
        await knex("jobs")
          .where({ id: jobId })
          .first(
            "request_id",
            "quote_id",
            "homeowner_id",
            "reviewer_id",
            "state",
            "amount_minor",
            "fee_minor",
            "currency",
          ),
      ).toEqual({
        request_id: request.id,
        quote_id: chosen.id,
        homeowner_id: owner.id,
        reviewer_id: chosen.reviewerId,
        state: "awaiting_payment",
        amount_minor: 12345,
        fee_minor: fee,
        currency: env().CURRENCY,
      });
      const status = async (id: number) =>
        knex("quotes").where({ id }).first("status", "decline_reason");
      expect(await status(chosen.id)).toEqual({ status: "accepted", decline_reason: null });
      expect(await status(other.id)).toEqual({ status: "declined", decline_reason: null });
      expect(await status(withdrawn.id)).toEqual({ status: "withdrawn", decline_reason: null });
      // Declined before: keeps the reason it was given, and is not e-mailed again.
      expect(await status(earlier.id)).toEqual({
        status: "declined",
        decline_reason: "The homeowner chose another quote.",
      });
      const mails = await knex("email_outbox").orderBy("id").select("template", "to_user_id");
      expect(mails).toEqual([
        { template: "quote_accepted", to_user_id: chosen.reviewerId },
        { template: "quote_declined", to_user_id: other.reviewerId },
      ]);
      const audits = await knex("audit_log").where({ action: "quote.accepted" });
      expect(audits).toHaveLength(1);
      expect(audits[0]).toMatchObject({ actor_id: owner.id, entity_type: "job", entity_id: jobId });
      expect(parseJson(audits[0].detail)).toEqual({ quoteId: chosen.id, declined: [other.id] });
      expect(await getRequestForHomeowner(knex, owner, request.id)).toEqual({
        id: request.id,
        projectId: request.projectId,
        status: "awarded",
        kind: "remote_check",
        jobId,
      });
    });

    it("another homeowner may not accept: 404, and nothing changes", async () => {
      const { request } = await openRequest();
      const q = await makeQuote(knex, request, await makeReviewer(knex));
      const r = await refusalOf(acceptQuote(knex, await makeHomeowner(knex), q.id, APP));
      expect([r.status, r.message]).toEqual([404, "No such quote."]);
      expect((await knex("quotes").where({ id: q.id }).first("status")).status).toBe("live");
      expect((await knex("requests").where({ id: request.id }).first("status")).status).toBe(
        "open",
      );
      expect(await knex("jobs")).toHaveLength(0);
    });

    it("refuses an unknown quote (404), a lapsed reviewer's quote (409), and leaves the request open", async () => {
      const { owner, request } = await openRequest();
      const missing = await refusalOf(acceptQuote(knex, owner, 987654, APP));
      expect([missing.status, missing.message]).toEqual([404, "No such quote."]);
      const lapsed = await makeReviewer(knex);
      const q = await makeQuote(knex, request, lapsed);
      await knex("credentials").where({ reviewer_id: lapsed.id }).update({ status: "expired" });
      const r = await refusalOf(acceptQuote(knex, owner, q.id, APP));
      expect([r.status, r.message]).toEqual([409, "This reviewer cannot take work just now."]);
      expect((await knex("requests").where({ id: request.id }).first("status")).status).toBe(
        "open",
      );
      expect((await knex("quotes").where({ id: q.id }).first("status")).status).toBe("live");
      expect(await knex("jobs")).toHaveLength(0);
      expect(await knex("email_outbox")).toHaveLength(0);
    });
  });

  describe("declining", () => {
    it("declining without a reason keeps none, and e-mails the reviewer", async () => {
      const { owner, request } = await openRequest();
      const q = await makeQuote(knex, request, await makeReviewer(knex));
      await declineQuote(knex, owner, q.id, undefined, APP);
      expect(await knex("quotes").where({ id: q.id }).first("status", "decline_reason")).toEqual({
        status: "declined",
        decline_reason: null,
      });
      expect(
        await knex("email_outbox").where({ template: "quote_declined", to_user_id: q.reviewerId }),
      ).toHaveLength(1);
    });

    it("keeps no empty reason, cuts a long one to 1,000 characters; an unknown quote is 404", async () => {
      const { owner, request } = await openRequest();
      const a = await makeQuote(knex, request, await makeReviewer(knex));
      const b = await makeQuote(knex, request, await makeReviewer(knex));
      await declineQuote(knex, owner, a.id, "   ", APP);
      await declineQuote(knex, owner, b.id, ` ${"x".repeat(1200)}`, APP);
      expect(
        (await knex("quotes").where({ id: a.id }).first("decline_reason")).decline_reason,
      ).toBeNull();
      expect(
        (await knex("quotes").where({ id: b.id }).first("decline_reason")).decline_reason,
      ).toBe("x".repeat(1000));
      const r = await refusalOf(declineQuote(knex, owner, 987654, undefined, APP));
      expect([r.status, r.message]).toEqual([404, "No such quote."]);
    });
  });

  describe("a request as its reviewers and its homeowner read it", () => {
    it("shows the request's own details, the posted system, and the project's files in order, without removed ones", async () => {
      const { project, request } = await openRequest({ kind: "site_visit" });
      // The project changed after posting: the reviewer reads the snapshot.
      await knex("projects")
        .where({ id: project.id })
        .update({ system: JSON.stringify({ changed: true }) });
      const file = (purpose: string, name: string, deleted = false) =>
        knex("attachments").insert({
          owner_id: project.ownerId,
          project_id: project.id,
          purpose,
          file_key: `k-${name}`,
          file_name: name,
          mime_type: "image/jpeg",
          size_bytes: 10,
          caption: `${name} caption`,
          tag: purpose === "photo" ? "collector" : null,
          deleted_at: deleted ? "2031-01-01 00:00:00" : null,
        });
      const [sketch] = await file("sketch", "sketch.jpg");
      const [photo] = await file("photo", "roof.jpg");
      await file("photo", "gone.jpg", true);
      const reviewer = await makeReviewer(knex);
      const r = await getRequestForReviewer(knex, reviewer, request.id);
      const w = await knex("requests")
        .where({ id: request.id })
        .first("window_start", "window_end");
      expect(r).toEqual({
        id: request.id,
        kind: "site_visit",
        status: "open",
        region: request.region,
        questions: "Is the expansion vessel big enough for steam at this static height? (test)",
        budgetMinMinor: 6000,
        budgetMaxMinor: 15000,
        currency: env().CURRENCY,
        windowStart: w.window_start,
        windowEnd: w.window_end,
        accessNotes: "Loft hatch on the landing. (test)",
        system: JSON.parse(JSON.stringify(project.system)),
        files: [
          {
            id: Number(sketch),
            purpose: "sketch",
            caption: "sketch.jpg caption",
            tag: null,
            mimeType: "image/jpeg",
            fileName: "sketch.jpg",
          },
          {
            id: Number(photo),
            purpose: "photo",
            caption: "roof.jpg caption",
            tag: "collector",
            mimeType: "image/jpeg",
            fileName: "roof.jpg",
          },
        ],
        myQuote: null,
      });
      const missing = await refusalOf(getRequestForReviewer(knex, reviewer, 987654));
      expect([missing.status, missing.message]).toEqual([404, "No such request."]);
    });

    it("after it closes: a reviewer whose quote was declined still reads it and the reason; a withdrawn one does not", async () => {
      const { request } = await openRequest();
      const declined = await makeQuote(knex, request, await makeReviewer(knex), {
        status: "declined",
        turnaroundDays: 6,
      });
      const withdrawn = await makeQuote(knex, request, await makeReviewer(knex), {
        status: "withdrawn",
      });
      await knex("requests").where({ id: request.id }).update({ status: "awarded" });
      const r = await getRequestForReviewer(knex, declined.reviewer, request.id);
      expect(r.myQuote).toEqual({
        id: declined.id,
        priceMinor: 9500,
        turnaroundDays: 6,
        scopeMd: "Full checklist review of the sketch, photos and loop check. (test)",
        proposedVisitDate: null,
        status: "declined",
        declineReason: "The homeowner chose another quote.",
      });
      const w = await refusalOf(getRequestForReviewer(knex, withdrawn.reviewer, request.id));
      expect([w.status, w.message]).toEqual([404, "This request is no longer open."]);
    });

    it("while open, a reviewer's newest quote is the one shown", async () => {
      const { request } = await openRequest();
      const reviewer = await makeReviewer(knex);
      await makeQuote(knex, request, reviewer, { status: "declined" });
      const live = await makeQuote(knex, request, reviewer, { priceMinor: 7000 });
      const r = await getRequestForReviewer(knex, reviewer, request.id);
      expect(r.myQuote).toMatchObject({ id: live.id, status: "live", declineReason: null });
    });

    it("the homeowner's view: own requests only, homeowners only, no job until one is accepted", async () => {
      const { owner, request } = await openRequest();
      expect(await getRequestForHomeowner(knex, owner, request.id)).toEqual({
        id: request.id,
        projectId: request.projectId,
        status: "open",
        kind: "remote_check",
        jobId: null,
      });
      const r = await refusalOf(
        getRequestForHomeowner(knex, await makeHomeowner(knex), request.id),
      );
      expect([r.status, r.message]).toEqual([404, "No such request."]);
      const reviewer = await makeReviewer(knex);
      expect(
        (await refusalOf(getRequestForHomeowner(knex, reviewer as never, request.id))).status,
      ).toBe(403);
    });
  });
});
