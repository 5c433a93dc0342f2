/**
 * Ratings: once a job's payment is released, its homeowner rates the reviewer 1–5 with a
 * comment, once per job; the reviewer may reply once. The average and count show on the public
 * profile, the quote comparison table and the board.
 */
import type { JobState } from "@/lib/jobs";
import { ratingReplySchema, ratingSchema } from "@/lib/validation/review";
import { sqlDateTime } from "@/lib/time";
import type { Rating, RatingSummary } from "@/lib/types/aftercare";
import type { Actor } from "./actor";
import { audit } from "./audit";
import type { Db } from "./db";
import { conflict, forbidden, notFound, parseInput } from "./errors";

export type { Rating, RatingSummary } from "@/lib/types/aftercare";

/** A job can be rated once the reviewer has been paid for it (in full, or in part after a dispute). */
export const RATEABLE_STATES: readonly JobState[] = ["released", "partially_refunded"];

function toRating(r: Record<string, unknown>): Rating {
  return {
    jobId: Number(r.job_id),
    stars: Number(r.stars),
    comment: (r.comment as string | null) ?? "",
    createdAt: String(r.created_at),
    replyMd: (r.reply_md as string | null) ?? null,
    repliedAt: r.replied_at ? String(r.replied_at) : null,
  };
}

/** The homeowner rates the job's reviewer. A second rating of the same job is refused (409). */
export async function rateReviewer(
  db: Db,
  actor: Actor,
  jobId: number,
  input: unknown,
): Promise<void> {
  if (actor.role !== "homeowner") throw forbidden("Only the homeowner rates the reviewer.");
  const v = parseInput(ratingSchema, input);
  await db.transaction(async (trx) => {
    const job = await trx("jobs")
      .where({ id: jobId })
      .forUpdate()
      .first("id", "homeowner_id", "reviewer_id", "state");
    if (!job || Number(job.homeowner_id) !== actor.id) throw notFound("No such job.");
    if (!RATEABLE_STATES.includes(job.state))
      throw conflict("You can rate the reviewer once the payment has been released.");
    const existing = await trx("ratings").where({ job_id: jobId, rater_id: actor.id }).first("id");
    if (existing) throw conflict("You have already rated this review; a job is rated once.");
    try {
      await trx("ratings").insert({
        job_id: jobId,
        rater_id: actor.id,
        ratee_id: job.reviewer_id,
        stars: v.stars,
        comment: v.comment || null,
      });
    } catch (err) {
      if ((err as { code?: string }).code === "ER_DUP_ENTRY")
        throw conflict("You have already rated this review; a job is rated once.");
      throw err;
    }
    await audit(trx, actor.id, "job.rated", "job", jobId, { stars: v.stars });
  });
}

/** The reviewer's one reply to the rating of their job. */
export async function replyToRating(
  db: Db,
  actor: Actor,
  jobId: number,
  input: unknown,
): Promise<void> {
  if (actor.role !== "reviewer") throw forbidden("Only the reviewer replies to a rating.");
  const v = parseInput(ratingReplySchema, input);
  await db.transaction(async (trx) => {
    const rating = await trx("ratings")
      .where({ job_id: jobId, ratee_id: actor.id })
      .forUpdate()
      .first("id", "replied_at");
    if (!rating) throw notFound("This job has no rating to reply to.");
    if (rating.replied_at) throw conflict("You have already replied to this rating.");
    await trx("ratings")
      .where({ id: rating.id })
      .update({ reply_md: v.replyMd, replied_at: sqlDateTime() });
    await audit(trx, actor.id, "job.rating_replied", "job", jobId);
  });
}

/** The rating of one job, for its homeowner, its reviewer and admins; anyone else 404. */
export async function getJobRating(db: Db, actor: Actor, jobId: number): Promise<Rating | null> {
  const job = await db("jobs").where({ id: jobId }).first("homeowner_id", "reviewer_id");
  const takesPart =
    job &&
    (actor.role === "admin" ||
      Number(job.homeowner_id) === actor.id ||
      Number(job.reviewer_id) === actor.id);
  if (!takesPart) throw notFound("No such job.");
  const row = await db("ratings").where({ job_id: jobId }).orderBy("id").first();
  return row ? toRating(row) : null;
}

/** Average and count of each reviewer's ratings (public figures). */
export async function ratingSummaries(
  db: Db,
  reviewerIds: readonly number[],
): Promise<Map<number, RatingSummary>> {
  const out = new Map<number, RatingSummary>();
  for (const id of reviewerIds) out.set(id, { average: null, count: 0 });
  if (reviewerIds.length === 0) return out;
  const rows = await db("ratings")
    .whereIn("ratee_id", [...new Set(reviewerIds)])
    .groupBy("ratee_id")
    .select("ratee_id", db.raw("AVG(stars) AS average"), db.raw("COUNT(*) AS n"));
  for (const r of rows)
    out.set(Number(r.ratee_id), {
      average: Math.round(Number(r.average) * 10) / 10,
      count: Number(r.n),
    });
  return out;
}

export async function ratingSummary(db: Db, reviewerId: number): Promise<RatingSummary> {
  return (await ratingSummaries(db, [reviewerId])).get(reviewerId)!;
}

/** The newest ratings of a reviewer for the public profile: stars, comment, reply; no names. */
export async function listReviewerRatings(
  db: Db,
  reviewerId: number,
  limit = 20,
): Promise<Rating[]> {
  const rows = await db("ratings")
    .where({ ratee_id: reviewerId })
    .orderBy("id", "desc")
    .limit(limit)
    .select("job_id", "stars", "comment", "created_at", "reply_md", "replied_at");
  return rows.map(toRating);
}
