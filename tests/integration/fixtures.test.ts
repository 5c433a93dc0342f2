import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { demoSystem } from "@/lib/calc/demo-system";
import { runLoopCheck } from "@/lib/calc/loop-check";
import { REQUIRED_CREDENTIAL_KINDS } from "@/lib/credentials";
import { env } from "@/lib/env";
import {
  disputeOpenUntil,
  isTerminal,
  JOB_STATES,
  nextActions,
  splitFee,
  type JobFacts,
} from "@/lib/jobs";
import { authenticate } from "@/lib/data/accounts";
import { listBoard } from "@/lib/data/board";
import { getOwnProject } from "@/lib/data/projects";
import { getRequestForReviewer, listQuotesForHomeowner } from "@/lib/data/quotes";
import { getVerificationStatus, isVerifiedReviewer, type Actor } from "@/lib/data/reviewers";
import { boardQuerySchema } from "@/lib/validation/board";
import { systemSchema } from "@/lib/validation/system";
import { testKnex, truncateAll } from "../support/db";
import {
  daysFromNow,
  FIXTURE_PASSWORD,
  fromSqlDateTime,
  makeAdmin,
  makeHomeowner,
  makeJob,
  makeProject,
  makeQuote,
  makeRequest,
  makeReviewer,
} from "../support/fixtures";
import { statusOf } from "../support/status";

describe("fixture builders make what they say, against the real MariaDB", () => {
  let knex: Knex;
  beforeAll(async () => {
    knex = testKnex();
    await truncateAll(knex);
  });
  afterAll(async () => {
    await truncateAll(knex);
    await knex.destroy();
  });

  it("makes homeowners and admins who can sign in, as actors the data layer takes", async () => {
    const owner = await makeHomeowner(knex);
    const other = await makeHomeowner(knex);
    const admin = await makeAdmin(knex);
    const actors: Actor[] = [owner, other, admin];
    expect(new Set(actors.map((a) => a.id)).size).toBe(3);
    expect(await authenticate(knex, owner.email, FIXTURE_PASSWORD)).toMatchObject({
      id: owner.id,
      role: "homeowner",
    });
    expect(await authenticate(knex, admin.email, FIXTURE_PASSWORD)).toMatchObject({
      id: admin.id,
      role: "admin",
    });
    expect(await authenticate(knex, owner.email, "wrong-password")).toBeNull();
  });

  it("makes a verified reviewer by default, and unverified or suspended ones when asked", async () => {
    const verified = await makeReviewer(knex);
    const pending = await makeReviewer(knex, { verified: false });
    const suspended = await makeReviewer(knex, { suspended: true });
    expect(await isVerifiedReviewer(knex, verified.id)).toBe(true);
    expect(await getVerificationStatus(knex, verified.id)).toMatchObject({
      verified: true,
      missing: [],
    });
    expect(await isVerifiedReviewer(knex, pending.id)).toBe(false);
    expect((await getVerificationStatus(knex, pending.id)).missing.sort()).toEqual(
      [...REQUIRED_CREDENTIAL_KINDS].sort(),
    );
    expect(await getVerificationStatus(knex, suspended.id)).toMatchObject({
      verified: false,
      suspended: true,
    });
    expect([verified.verified, pending.verified, suspended.verified]).toEqual([true, false, false]);
    // The board, which is for verified reviewers only, agrees.
    const q = boardQuerySchema.parse({});
    expect(await statusOf(listBoard(knex, verified, q))).toBe(200);
    expect(await statusOf(listBoard(knex, pending, q))).toBe(403);
    expect(await statusOf(listBoard(knex, suspended, q))).toBe(403);
  });

  it("makes a complete project the owner can open and nobody else can", async () => {
    const owner = await makeHomeowner(knex);
    const project = await makeProject(knex, owner);
    const seen = await getOwnProject(knex, owner, project.id);
    expect(seen.status).toBe("ready");
    expect(systemSchema.safeParse(seen.system).success).toBe(true);
    const row = await knex("projects").where({ id: project.id }).first();
    expect(row.worst_level).toBe(runLoopCheck(project.system).worst);
    expect(await statusOf(getOwnProject(knex, await makeHomeowner(knex), project.id))).toBe(404);

    const tubes = structuredClone(demoSystem);
    tubes.collectors = { ...tubes.collectors, type: "evacuated_tube" };
    tubes.site = { ...tubes.site, region: "wales" };
    const other = await makeProject(knex, owner, { system: tubes });
    expect(
      await knex("projects").where({ id: other.id }).first("collector_type", "region"),
    ).toEqual({ collector_type: "evacuated_tube", region: "wales" });
  });

  it("makes requests that show on the board while open, and not once expired or awarded", async () => {
    const reviewer = await makeReviewer(knex);
    const owner = await makeHomeowner(knex);
    const project = await makeProject(knex, owner);
    const open = await makeRequest(knex, project);
    // A project has one open request at most: the site visit is on a second project.
    const visit = await makeRequest(knex, await makeProject(knex, owner), {
      kind: "site_visit",
      siteLat: 50.72,
      siteLng: -3.53,
    });
    const expired = await makeRequest(knex, project, { status: "expired" });
    const awarded = await makeRequest(knex, project, { status: "awarded" });
    const board = await listBoard(knex, reviewer, boardQuerySchema.parse({ limit: 50 }));
    const ids = board.items.map((i) => i.id);
    expect(ids).toEqual(expect.arrayContaining([open.id, visit.id]));
    expect(ids).not.toContain(expired.id);
    expect(ids).not.toContain(awarded.id);
    const visits = await listBoard(knex, reviewer, boardQuerySchema.parse({ kind: "site_visit" }));
    expect(visits.items.map((i) => i.id)).toEqual([visit.id]);
    expect(visits.items[0]).toMatchObject({ region: "south-west" });
    expect(visits.items[0]!.windowStart).toBeTruthy();
    const exp = await knex("requests").where({ id: expired.id }).first("expires_at");
    expect(fromSqlDateTime(exp.expires_at).getTime()).toBeLessThan(Date.now());
  });

  it("makes quotes the homeowner sees, hiding those from reviewers no longer verified", async () => {
    const owner = await makeHomeowner(knex);
    const request = await makeRequest(knex, await makeProject(knex, owner));
    const good = await makeReviewer(knex);
    const lapsed = await makeReviewer(knex, { suspended: true });
    const quote = await makeQuote(knex, request, good, { priceMinor: 12_345 });
    await makeQuote(knex, request, lapsed);
    const seen = await listQuotesForHomeowner(knex, owner, request.id);
    expect(seen).toHaveLength(1);
    expect(seen[0]).toMatchObject({
      id: quote.id,
      reviewerId: good.id,
      priceMinor: 12_345,
      status: "live",
    });
  });

  it.each(JOB_STATES)(
    "makes a job in state %s, with what its path leaves behind",
    async (state) => {
      const job = await makeJob(knex, state);
      const row = await knex("jobs").where({ id: job.id }).first();
      expect(row.state).toBe(state);
      expect(Number(row.homeowner_id)).toBe(job.homeowner.id);
      expect(Number(row.reviewer_id)).toBe(job.reviewer.id);
      expect(row.amount_minor).toBe(job.quote.priceMinor);
      expect(row.fee_minor).toBe(splitFee(row.amount_minor, env().PLATFORM_FEE_PERCENT).feeMinor);
      expect(await knex("quotes").where({ id: job.quote.id }).first("status")).toEqual({
        status: "accepted",
      });
      expect((await knex("requests").where({ id: job.request.id }).first("status")).status).toBe(
        state === "cancelled" ? "cancelled" : "awarded",
      );

      const took = (t: string) => job.path.includes(t as never);
      expect(row.funded_at !== null).toBe(took("fund"));
      expect(row.payment_intent_id !== null).toBe(took("fund"));
      expect(row.review_started_at !== null).toBe(took("startReview"));
      expect(row.delivered_at !== null).toBe(took("deliver"));
      expect(row.release_due_at !== null).toBe(took("deliver"));
      expect(row.closed_at !== null).toBe(isTerminal(state));

      // Timestamps in order: accepted, paid, started, delivered, closed; none in the future.
      const times = ["created_at", "funded_at", "review_started_at", "delivered_at", "closed_at"]
        .map((c) => row[c] as string | null)
        .filter((v): v is string => v !== null)
        .map((v) => fromSqlDateTime(v).getTime());
      expect(times).toEqual([...times].sort((a, b) => a - b));
      expect(Math.max(...times)).toBeLessThanOrEqual(Date.now());
      if (row.delivered_at) {
        expect(fromSqlDateTime(row.release_due_at).toISOString()).toBe(
          disputeOpenUntil(
            fromSqlDateTime(row.delivered_at),
            env().DISPUTE_WINDOW_DAYS,
          ).toISOString(),
        );
      }

      const report = await knex("reports")
        .where({ job_id: job.id })
        .first("status", "delivered_at");
      if (took("deliver")) expect(report).toMatchObject({ status: "delivered" });
      else if (took("startReview")) expect(report).toMatchObject({ status: "draft" });
      else expect(report).toBeUndefined();
      const dispute = await knex("disputes")
        .where({ job_id: job.id })
        .first("status", "resolution");
      if (!took("openDispute")) expect(dispute).toBeUndefined();
      else expect(dispute.status).toBe(state === "disputed" ? "open" : "settled");
    },
  );

  it("makes jobs the state machine and the data layer read as they should", async () => {
    const facts = (row: {
      state: JobFacts["state"];
      homeowner_id: number;
      reviewer_id: number;
      release_due_at: string | null;
    }): JobFacts => ({
      state: row.state,
      homeownerId: Number(row.homeowner_id),
      reviewerId: Number(row.reviewer_id),
      releaseDueAt: row.release_due_at ? fromSqlDateTime(row.release_due_at) : null,
    });
    const fresh = await makeJob(knex, "delivered");
    const old = await makeJob(knex, "delivered", {
      at: daysFromNow(-(env().DISPUTE_WINDOW_DAYS + 1)),
    });
    const load = async (id: number) => facts(await knex("jobs").where({ id }).first());
    expect(nextActions(await load(fresh.id), fresh.homeowner).map((r) => r.name)).toEqual([
      "release",
      "openDispute",
    ]);
    expect(nextActions(await load(old.id), old.homeowner).map((r) => r.name)).toEqual(["release"]);
    expect(nextActions(await load(old.id), { role: "system" }).map((r) => r.name)).toEqual([
      "release",
    ]);

    // The job's reviewer still sees the awarded request; another verified reviewer does not.
    const funded = await makeJob(knex, "funded", { kind: "site_visit" });
    expect(await getRequestForReviewer(knex, funded.reviewer, funded.request.id)).toMatchObject({
      id: funded.request.id,
      kind: "site_visit",
    });
    expect(
      await statusOf(getRequestForReviewer(knex, await makeReviewer(knex), funded.request.id)),
    ).toBe(404);
  });

  it("takes the other way in when asked, and shares people between jobs", async () => {
    const reviewer = await makeReviewer(knex);
    const admin = await makeAdmin(knex);
    const byAdmin = await makeJob(knex, "refunded", { via: "settleFullRefund", reviewer, admin });
    expect(byAdmin.path).toEqual([
      "fund",
      "startReview",
      "deliver",
      "openDispute",
      "settleFullRefund",
    ]);
    expect(await knex("disputes").where({ job_id: byAdmin.id }).first()).toMatchObject({
      status: "settled",
      resolution: "full_refund",
      refund_minor: byAdmin.amountMinor,
    });
    const early = await makeJob(knex, "refunded", { reviewer });
    expect(early.path).toEqual(["fund", "cancelForRefund"]);
    expect(await knex("disputes").where({ job_id: early.id }).first()).toBeUndefined();

    const part = await makeJob(knex, "partially_refunded", {
      reviewer,
      admin,
      priceMinor: 10_000,
      refundMinor: 2500,
    });
    const d = await knex("disputes").where({ job_id: part.id }).first();
    expect(d).toMatchObject({ resolution: "partial_refund", refund_minor: 2500 });
    expect(Number(d.settled_by)).toBe(admin.id);
    const settled = await makeJob(knex, "released", { via: "settleRelease", admin });
    expect(settled.admin?.id).toBe(admin.id);
    const reviewers = await knex("jobs")
      .whereIn("id", [byAdmin.id, early.id, part.id])
      .pluck("reviewer_id");
    expect(reviewers.map(Number)).toEqual([reviewer.id, reviewer.id, reviewer.id]);

    await expect(makeJob(knex, "released", { via: "settleFullRefund" })).rejects.toThrow(
      /does not lead to released/,
    );
    await expect(
      makeJob(knex, "partially_refunded", { priceMinor: 100, refundMinor: 101 }),
    ).rejects.toThrow(/more than the amount/);
  });
});
