/**
 * The first-fill record: after the install, the homeowner records what the loop showed when it
 * was first filled, against one of the project's jobs (one record per job); the job's reviewer
 * may countersign it with a comment. It stays on the project as its commissioning record, and is
 * compared with the design values of the project's loop check (lib/calc/first-fill.ts).
 */
import { compareFirstFill, firstFillDesign } from "@/lib/calc/first-fill";
import type { JobState } from "@/lib/jobs";
import { countersignSchema, firstFillSchema } from "@/lib/validation/first-fill";
import type { SystemDraft } from "@/lib/validation/system";
import { sqlDateTime } from "@/lib/time";
import type { FirstFillJob, FirstFillPage, FirstFillRecord } from "@/lib/types/aftercare";
import type { Actor } from "./actor";
import { audit } from "./audit";
import type { Db } from "./db";
import { conflict, forbidden, notFound, parseInput } from "./errors";
import { parseJson } from "./json";

export type { FirstFillPage, FirstFillRecord } from "@/lib/types/aftercare";

/** The first fill is recorded after the report: the design has been reviewed. */
export const FIRST_FILL_STATES: readonly JobState[] = [
  "delivered",
  "disputed",
  "released",
  "partially_refunded",
];

const num = (v: unknown) => (v === null || v === undefined ? null : Number(v));

function toRecord(r: Record<string, unknown>): FirstFillRecord {
  return {
    coldFillBar: Number(r.fill_pressure_cold_bar),
    prechargeBar: Number(r.precharge_measured_bar),
    hotBar: num(r.fill_pressure_hot_bar),
    hotTempC: num(r.hot_temperature_c),
    glycolPercentMass: num(r.glycol_percent_mass),
    freezePointC: num(r.freeze_point_c),
    flowLph: num(r.flow_rate_lph),
    notes: (r.notes as string | null) ?? "",
    recordedAt: String(r.recorded_at),
    countersignedBy: (r.countersigner_name as string | null) ?? null,
    countersignedAt: r.countersigned_at ? String(r.countersigned_at) : null,
    countersignComment: (r.countersign_comment as string | null) ?? null,
  };
}

/**
 * The project's commissioning record: its owner and admins see every job on it; a reviewer sees
 * the jobs they reviewed; anyone else gets 404.
 */
export async function getFirstFillPage(
  db: Db,
  actor: Actor,
  projectId: number,
): Promise<FirstFillPage> {
  const project = await db("projects")
    .where({ id: projectId })
    .whereNull("deleted_at")
    .first("id", "owner_id", "title", "system");
  if (!project) throw notFound("No such project.");
  const owner = Number(project.owner_id) === actor.id;
  const q = db("jobs as j")
    .join("requests as r", "r.id", "j.request_id")
    .join("users as u", "u.id", "j.reviewer_id")
    .leftJoin("reviewer_profiles as rp", "rp.user_id", "j.reviewer_id")
    .where("r.project_id", projectId)
    .whereNotIn("j.state", ["awaiting_payment", "cancelled", "refunded"])
    .orderBy("j.id", "desc")
    .select("j.id", "j.state", "j.reviewer_id", "u.display_name", "rp.trading_name");
  if (!owner && actor.role !== "admin") {
    if (actor.role !== "reviewer") throw notFound("No such project.");
    q.where("j.reviewer_id", actor.id);
  }
  const jobs = await q;
  if (!owner && actor.role !== "admin" && jobs.length === 0) throw notFound("No such project.");
  const records = jobs.length
    ? await db("first_fill_records as f")
        .leftJoin("users as c", "c.id", "f.countersigned_by")
        .whereIn(
          "f.job_id",
          jobs.map((j) => j.id),
        )
        .select("f.*", "c.display_name as countersigner_name")
    : [];
  const design = firstFillDesign(parseJson<SystemDraft>(project.system) ?? {});
  const out: FirstFillJob[] = jobs.map((j) => {
    const row = records.find((r) => Number(r.job_id) === Number(j.id));
    const record = row ? toRecord(row) : null;
    return {
      jobId: Number(j.id),
      state: j.state,
      reviewerId: Number(j.reviewer_id),
      reviewerName: j.trading_name ?? j.display_name,
      open: FIRST_FILL_STATES.includes(j.state),
      record,
      comparison: record ? compareFirstFill(record, design) : null,
    };
  });
  return {
    projectId: Number(project.id),
    projectTitle: project.title,
    viewer: owner ? "homeowner" : actor.role,
    design,
    jobs: out,
  };
}

/** Record (or correct, until it is countersigned) the first fill against one job. */
export async function saveFirstFill(
  db: Db,
  actor: Actor,
  jobId: number,
  input: unknown,
): Promise<void> {
  if (actor.role !== "homeowner") throw forbidden("Only the homeowner records the first fill.");
  const v = parseInput(firstFillSchema, input, "Some readings need attention.");
  await db.transaction(async (trx) => {
    const job = await trx("jobs as j")
      .join("requests as r", "r.id", "j.request_id")
      .where("j.id", jobId)
      .forUpdate()
      .first("j.id", "j.homeowner_id", "j.state", "r.project_id");
    if (!job || Number(job.homeowner_id) !== actor.id) throw notFound("No such job.");
    if (!FIRST_FILL_STATES.includes(job.state))
      throw conflict("Record the first fill once the reviewer's report has been delivered.");
    const existing = await trx("first_fill_records")
      .where({ job_id: jobId })
      .forUpdate()
      .first("id", "countersigned_at");
    if (existing?.countersigned_at)
      throw conflict(
        "The reviewer has countersigned this record, so it can no longer be changed. Add anything new in the notes of a message to the reviewer.",
      );
    const row = {
      project_id: job.project_id,
      job_id: jobId,
      fill_pressure_cold_bar: v.coldFillBar,
      precharge_measured_bar: v.prechargeBar,
      fill_pressure_hot_bar: v.hotBar ?? null,
      hot_temperature_c: v.hotTempC ?? null,
      glycol_percent_mass: v.glycolPercentMass ?? null,
      freeze_point_c: v.freezePointC ?? null,
      flow_rate_lph: v.flowLph ?? null,
      notes: v.notes || null,
      recorded_at: sqlDateTime(),
    };
    if (existing) await trx("first_fill_records").where({ id: existing.id }).update(row);
    else await trx("first_fill_records").insert(row);
    await audit(
      trx,
      actor.id,
      existing ? "first_fill.corrected" : "first_fill.recorded",
      "job",
      jobId,
      {
        projectId: Number(job.project_id),
      },
    );
  });
}

/** The job's reviewer countersigns the homeowner's first-fill record, once, with a comment. */
export async function countersignFirstFill(
  db: Db,
  actor: Actor,
  jobId: number,
  input: unknown,
): Promise<void> {
  if (actor.role !== "reviewer")
    throw forbidden("Only the job's reviewer countersigns the first fill.");
  const v = parseInput(countersignSchema, input);
  await db.transaction(async (trx) => {
    const job = await trx("jobs").where({ id: jobId }).forUpdate().first("id", "reviewer_id");
    if (!job || Number(job.reviewer_id) !== actor.id) throw notFound("No such job.");
    const record = await trx("first_fill_records")
      .where({ job_id: jobId })
      .forUpdate()
      .first("id", "countersigned_at");
    if (!record) throw notFound("The homeowner has not recorded the first fill yet.");
    if (record.countersigned_at) throw conflict("This record is already countersigned.");
    await trx("first_fill_records")
      .where({ id: record.id })
      .update({
        countersigned_by: actor.id,
        countersigned_at: sqlDateTime(),
        countersign_comment: v.comment || null,
      });
    await audit(trx, actor.id, "first_fill.countersigned", "job", jobId);
  });
}
