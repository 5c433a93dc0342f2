/**
 * Site visits: on a site-visit job, the reviewer proposes a date and time inside the homeowner's
 * window; the homeowner confirms it or asks for another. The appointment lives in the job row's
 * visit_* columns (it is not a job state: the job's state changes only through lib/data/jobs.ts).
 * Each change locks the job row, raises visit_sequence, writes an audit row and queues both
 * e-mails with the updated calendar invitation, in one transaction.
 */
import { env } from "@/lib/env";
import { formatWhen, fromSqlDateTime, sqlDateTime, zonedWallTime } from "@/lib/time";
import {
  askAnotherVisitSchema,
  confirmVisitSchema,
  proposeVisitSchema,
} from "@/lib/validation/visit";
import type { Actor } from "./actor";
import { audit } from "./audit";
import type { Db } from "./db";
import { conflict, forbidden, notFound, parseInput, unprocessable } from "./errors";
import { notifyVisitChanged } from "./notify";

export interface VisitOptions {
  appUrl?: string;
  timeZone?: string;
  now?: Date;
}

/** While a visit can be arranged: the payment is held and the report is not yet delivered. */
const ARRANGEABLE = ["funded", "in_review"];

interface LockedVisitJob {
  id: number;
  state: string;
  kind: string;
  homeownerId: number;
  reviewerId: number;
  windowStart: string | null;
  windowEnd: string | null;
  visitAt: string | null;
  visitState: "proposed" | "confirmed" | "declined" | null;
  visitSequence: number;
}

async function lockVisitJob(trx: Db, actor: Actor, jobId: number): Promise<LockedVisitJob> {
  const j = await trx("jobs").where({ id: jobId }).forUpdate().first();
  const party =
    j &&
    (actor.role === "admin" ||
      (actor.role === "homeowner" && Number(j.homeowner_id) === actor.id) ||
      (actor.role === "reviewer" && Number(j.reviewer_id) === actor.id));
  if (!party) throw notFound("No such job.");
  const r = await trx("requests")
    .where({ id: j.request_id })
    .first("kind", "window_start", "window_end");
  return {
    id: Number(j.id),
    state: String(j.state),
    kind: String(r?.kind),
    homeownerId: Number(j.homeowner_id),
    reviewerId: Number(j.reviewer_id),
    windowStart: r?.window_start ? String(r.window_start).slice(0, 10) : null,
    windowEnd: r?.window_end ? String(r.window_end).slice(0, 10) : null,
    visitAt: j.visit_at ? String(j.visit_at) : null,
    visitState: j.visit_state ?? null,
    visitSequence: Number(j.visit_sequence ?? 0),
  };
}

function requireArrangeable(j: LockedVisitJob) {
  if (j.kind !== "site_visit") throw conflict("This job is a remote check: it has no site visit.");
  if (!ARRANGEABLE.includes(j.state))
    throw conflict(
      "A site visit can be arranged once the payment is held, and until the report is delivered.",
    );
}

const longDay = (d: string) =>
  new Intl.DateTimeFormat("en-GB", { dateStyle: "long", timeZone: "UTC" }).format(
    new Date(`${d}T00:00:00Z`),
  );

/** The job's reviewer proposes (or moves) the visit: a time inside the homeowner's window. */
export async function proposeVisit(
  db: Db,
  actor: Actor,
  jobId: number,
  input: unknown,
  o: VisitOptions = {},
): Promise<{ at: string; sequence: number }> {
  const v = parseInput(proposeVisitSchema, input);
  const timeZone = o.timeZone ?? env().APP_TIME_ZONE;
  const now = o.now ?? new Date();
  return db.transaction(async (trx) => {
    const j = await lockVisitJob(trx, actor, jobId);
    if (actor.role !== "reviewer") throw forbidden("The reviewer proposes the visit time.");
    requireArrangeable(j);
    const day = v.at.slice(0, 10);
    if (j.windowStart && j.windowEnd && (day < j.windowStart || day > j.windowEnd))
      throw unprocessable("Some details need attention.", {
        at: [
          `Pick a day inside the homeowner's window: ${longDay(j.windowStart)} to ${longDay(j.windowEnd)}`,
        ],
      });
    const at = zonedWallTime(v.at, timeZone);
    if (at.getTime() <= now.getTime())
      throw unprocessable("Some details need attention.", { at: ["Pick a time in the future"] });
    const sequence = j.visitSequence + 1;
    const visitAt = sqlDateTime(at);
    await trx("jobs")
      .where({ id: jobId })
      .update({
        visit_at: visitAt,
        visit_state: "proposed",
        visit_note: v.note || null,
        visit_sequence: sequence,
      });
    await audit(trx, actor.id, "job.visit_proposed", "job", jobId, {
      visitAt,
      sequence,
      moved: j.visitAt !== null,
    });
    await notifyVisitChanged(trx, o.appUrl ?? env().APP_URL, jobId, "proposed", timeZone);
    return { at: visitAt, sequence };
  });
}

/** The homeowner confirms the proposal they saw (its sequence); a moved one is refused. */
export async function confirmVisit(
  db: Db,
  actor: Actor,
  jobId: number,
  input: unknown,
  o: VisitOptions = {},
): Promise<void> {
  const v = parseInput(confirmVisitSchema, input);
  const now = o.now ?? new Date();
  await db.transaction(async (trx) => {
    const j = await lockVisitJob(trx, actor, jobId);
    if (actor.role !== "homeowner") throw forbidden("The homeowner confirms the visit.");
    requireArrangeable(j);
    if (j.visitState !== "proposed" || !j.visitAt)
      throw conflict(
        j.visitState === "confirmed"
          ? "The visit is already confirmed."
          : "There is no proposed visit time to confirm.",
      );
    if (v.sequence !== j.visitSequence)
      throw conflict("The reviewer has changed the proposal since; look at the new time.");
    if (fromSqlDateTime(j.visitAt).getTime() <= now.getTime())
      throw conflict("That time has passed; ask the reviewer for another.");
    const sequence = j.visitSequence + 1;
    await trx("jobs")
      .where({ id: jobId })
      .update({ visit_state: "confirmed", visit_sequence: sequence });
    await audit(trx, actor.id, "job.visit_confirmed", "job", jobId, {
      visitAt: j.visitAt,
      sequence,
    });
    await notifyVisitChanged(
      trx,
      o.appUrl ?? env().APP_URL,
      jobId,
      "confirmed",
      o.timeZone ?? env().APP_TIME_ZONE,
    );
  });
}

/** The homeowner asks for another time (a proposed or a confirmed visit), with a note. */
export async function askForAnotherVisit(
  db: Db,
  actor: Actor,
  jobId: number,
  input: unknown,
  o: VisitOptions = {},
): Promise<void> {
  const v = parseInput(askAnotherVisitSchema, input);
  await db.transaction(async (trx) => {
    const j = await lockVisitJob(trx, actor, jobId);
    if (actor.role !== "homeowner") throw forbidden("The homeowner answers the proposal.");
    requireArrangeable(j);
    if ((j.visitState !== "proposed" && j.visitState !== "confirmed") || !j.visitAt)
      throw conflict("There is no visit time to change.");
    if (v.sequence !== j.visitSequence)
      throw conflict("The reviewer has changed the proposal since; look at the new time.");
    const sequence = j.visitSequence + 1;
    await trx("jobs")
      .where({ id: jobId })
      .update({ visit_state: "declined", visit_note: v.note, visit_sequence: sequence });
    await audit(trx, actor.id, "job.visit_declined", "job", jobId, {
      visitAt: j.visitAt,
      sequence,
    });
    await notifyVisitChanged(
      trx,
      o.appUrl ?? env().APP_URL,
      jobId,
      "declined",
      o.timeZone ?? env().APP_TIME_ZONE,
    );
  });
}

/** The visit's time for people, in the configured time zone. */
export const visitWhen = (visitAt: string, timeZone = env().APP_TIME_ZONE) =>
  formatWhen(fromSqlDateTime(visitAt), timeZone);

/**
 * The job is cancelled while a visit is proposed or booked: called inside the cancelling
 * transition, it calls the visit off and sends both the cancellation for their calendars.
 */
export async function callOffVisit(
  trx: Db,
  jobId: number,
  appUrl: string,
  timeZone = env().APP_TIME_ZONE,
): Promise<boolean> {
  const j = await trx("jobs").where({ id: jobId }).first("visit_state", "visit_sequence");
  if (j?.visit_state !== "proposed" && j?.visit_state !== "confirmed") return false;
  const sequence = Number(j.visit_sequence) + 1;
  await trx("jobs").where({ id: jobId }).update({
    visit_state: "declined",
    visit_note: "The job was cancelled.",
    visit_sequence: sequence,
  });
  await audit(trx, null, "job.visit_cancelled", "job", jobId, { sequence });
  await notifyVisitChanged(trx, appUrl, jobId, "cancelled", timeZone);
  return true;
}
