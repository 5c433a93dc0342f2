import { townById } from "@/lib/towns";
import {
  collectorArraySchema,
  sectionSchemas,
  siteSchema,
  systemSchema,
  type SystemDraft,
  type SystemSection,
} from "@/lib/validation/system";
import { projectTitleSchema, requestSchema } from "@/lib/validation/request";
import { runLoopCheck } from "@/lib/calc/loop-check";
import { buildChecklist } from "@/lib/checklist/build";
import { env } from "@/lib/env";
import { DAY_MS, sqlDateTime } from "@/lib/time";
import type { Actor } from "./actor";
import { audit } from "./audit";
import type { Db, Trx } from "./db";
import { conflict, forbidden, notFound, parseInput, unprocessable } from "./errors";
import { parseJson } from "./json";
import type { ProjectFile } from "@/lib/types/projects";

export type { ProjectFile } from "@/lib/types/projects";

export interface Project {
  id: number;
  ownerId: number;
  title: string;
  system: SystemDraft;
  status: "draft" | "ready" | "archived";
  createdAt: string;
  updatedAt: string;
}

type RequestValues = ReturnType<typeof requestSchema.parse>;

/** Jobs in these states hold money or work in progress: their project cannot be deleted. */
const ACTIVE_JOB_STATES = ["funded", "in_review", "delivered", "disputed"];

function requireHomeowner(actor: Actor) {
  if (actor.role !== "homeowner") throw forbidden("Only homeowners have projects.");
}

export async function createProject(db: Db, actor: Actor, input: unknown): Promise<number> {
  requireHomeowner(actor);
  const v = parseInput(projectTitleSchema, input);
  return db.transaction(async (trx) => {
    const [id] = await trx("projects").insert({
      owner_id: actor.id,
      title: v.title,
      system: "{}",
      status: "draft",
    });
    await audit(trx, actor.id, "project.created", "project", Number(id));
    return Number(id);
  });
}

/** A project its owner (or an admin) may open; anyone else gets 404 so ids reveal nothing. */
export async function getOwnProject(db: Db, actor: Actor, id: number): Promise<Project> {
  const row = await db("projects")
    .where({ id })
    .whereNull("deleted_at")
    .first("id", "owner_id", "title", "system", "status", "created_at", "updated_at");
  if (!row || (Number(row.owner_id) !== actor.id && actor.role !== "admin"))
    throw notFound("No such project.");
  return {
    id: Number(row.id),
    ownerId: Number(row.owner_id),
    title: row.title,
    system: parseJson<SystemDraft>(row.system),
    status: row.status,
    createdAt: row.created_at,
    updatedAt: row.updated_at,
  };
}

/**
 * Save one step of the description. A valid section is written with the columns the board
 * filters on; an invalid one is refused with field errors and the saved draft stays as it was.
 */
export async function saveProjectSection(
  db: Db,
  actor: Actor,
  projectId: number,
  section: SystemSection,
  value: unknown,
): Promise<void> {
  requireHomeowner(actor);
  const schema = sectionSchemas[section];
  if (!schema) throw unprocessable("Unknown step.");
  const data = parseInput(schema, value, "Some values need attention.", section);
  await db.transaction(async (trx) => {
    const row = await trx("projects")
      .where({ id: projectId, owner_id: actor.id })
      .whereNull("deleted_at")
      .forUpdate()
      .first("system");
    if (!row) throw notFound("No such project.");
    const system = { ...parseJson<SystemDraft>(row.system), [section]: data };
    const full = systemSchema.safeParse(system);
    const check = runLoopCheck(system);
    const collectors = collectorArraySchema.safeParse(system.collectors);
    const site = siteSchema.safeParse(system.site);
    await trx("projects")
      .where({ id: projectId })
      .update({
        system: JSON.stringify(system),
        status: full.success ? "ready" : "draft",
        region: site.success ? site.data.region : null,
        collector_type: collectors.success ? collectors.data.type : null,
        collector_area_m2: collectors.success
          ? collectors.data.count * collectors.data.apertureAreaM2Each
          : null,
        worst_level: check.worst,
      });
  });
}

export interface ProjectRequest {
  id: number;
  kind: "remote_check" | "site_visit";
  status: "open" | "awarded" | "cancelled" | "expired";
  questions: string;
  budgetMinMinor: number;
  budgetMaxMinor: number;
  currency: string;
  windowStart: string | null;
  windowEnd: string | null;
  accessNotes: string | null;
  expiresAt: string;
  createdAt: string;
}

export async function listProjectRequests(
  db: Db,
  actor: Actor,
  projectId: number,
): Promise<ProjectRequest[]> {
  await getOwnProject(db, actor, projectId);
  const rows = await db("requests")
    .where({ project_id: projectId })
    .orderBy("created_at", "desc")
    .select("*");
  return rows.map((r) => ({
    id: Number(r.id),
    kind: r.kind,
    status: r.status,
    questions: r.questions,
    budgetMinMinor: r.budget_min_minor,
    budgetMaxMinor: r.budget_max_minor,
    currency: r.currency,
    windowStart: r.window_start,
    windowEnd: r.window_end,
    accessNotes: r.access_notes,
    expiresAt: r.expires_at,
    createdAt: r.created_at,
  }));
}

function requestRow(v: RequestValues) {
  const site = v.kind === "site_visit";
  // Coordinates typed in (the advanced option) win; otherwise the nearest town's point.
  const town = site && v.siteLat === undefined && v.siteTownId ? townById(v.siteTownId) : null;
  if (site && v.siteLat === undefined && v.siteTownId && !town)
    throw unprocessable("Choose the nearest town from the list.", {
      siteTownId: ["Choose a town from the list"],
    });
  return {
    kind: v.kind,
    questions: v.questions,
    budget_min_minor: Math.round(v.budgetMinPounds * 100),
    budget_max_minor: Math.round(v.budgetMaxPounds * 100),
    window_start: site ? v.windowStart || null : null,
    window_end: site ? v.windowEnd || null : null,
    access_notes: site ? v.accessNotes || null : null,
    site_lat: site ? (v.siteLat ?? town?.lat ?? null) : null,
    site_lng: site ? (v.siteLng ?? town?.lng ?? null) : null,
  };
}

/**
 * Post a request for review; the description must be complete so reviewers can quote on it.
 * The request keeps a snapshot of the validated system, the loop check's findings and the
 * checklist (with its catalogue version) as they were now, so the reviewer and later the report
 * read exactly what the homeowner saw. The project row is locked, so two posts at once make one
 * request (a unique key on the open request backs this up).
 */
export async function createRequest(
  db: Db,
  actor: Actor,
  projectId: number,
  input: unknown,
): Promise<number> {
  requireHomeowner(actor);
  const v = parseInput(requestSchema, input);
  return db.transaction(async (trx) => {
    const locked = await trx("projects")
      .where({ id: projectId, owner_id: actor.id })
      .whereNull("deleted_at")
      .forUpdate()
      .first("id");
    if (!locked) throw notFound("No such project.");
    const project = await getOwnProject(trx, actor, projectId);
    const full = systemSchema.safeParse(project.system);
    if (!full.success)
      throw unprocessable("Finish every step of the description before asking for a review.");
    const open = await trx("requests").where({ project_id: projectId, status: "open" }).first("id");
    if (open) throw conflict("This project already has an open request: edit that one instead.");
    const check = runLoopCheck(full.data);
    if (check.worst === "stop" && !v.acknowledgeStop)
      throw unprocessable(
        "The loop check found something that stops the work: read why, and confirm the loop will not be filled or run until it is resolved.",
        {
          acknowledgeStop: [
            "Confirm you have read the stop findings and will not fill or run the loop until they are resolved",
          ],
        },
      );
    const checklist = buildChecklist(full.data, check.findings);
    const [id] = await trx("requests").insert({
      project_id: projectId,
      homeowner_id: actor.id,
      status: "open",
      currency: env().CURRENCY,
      region: full.data.site.region,
      collector_type: full.data.collectors.type,
      expires_at: sqlDateTime(new Date(), env().REQUEST_EXPIRY_DAYS * DAY_MS),
      system_snapshot: JSON.stringify(full.data),
      loop_check_snapshot: JSON.stringify({
        worst: check.worst,
        findings: check.findings,
        catalogueVersion: checklist.version,
        itemKeys: checklist.items.map((i) => i.key),
      }),
      ...requestRow(v),
    });
    await audit(trx, actor.id, "request.posted", "request", Number(id), {
      projectId,
      ...(check.worst === "stop" ? { acknowledgedStop: true } : {}),
    });
    return Number(id);
  });
}

async function lockOwnOpenRequest(trx: Trx, actor: Actor, requestId: number) {
  const r = await trx("requests")
    .where({ id: requestId })
    .forUpdate()
    .first("id", "homeowner_id", "status");
  if (!r || Number(r.homeowner_id) !== actor.id) throw notFound("No such request.");
  if (r.status !== "open")
    throw conflict(`This request is ${r.status} and can no longer be changed.`);
  return r;
}

export async function updateRequest(
  db: Db,
  actor: Actor,
  requestId: number,
  input: unknown,
): Promise<void> {
  requireHomeowner(actor);
  const v = parseInput(requestSchema, input);
  await db.transaction(async (trx) => {
    await lockOwnOpenRequest(trx, actor, requestId);
    await trx("requests").where({ id: requestId }).update(requestRow(v));
    await audit(trx, actor.id, "request.edited", "request", requestId);
  });
}

export async function cancelRequest(db: Db, actor: Actor, requestId: number): Promise<void> {
  requireHomeowner(actor);
  await db.transaction(async (trx) => {
    await lockOwnOpenRequest(trx, actor, requestId);
    await trx("requests").where({ id: requestId }).update({ status: "cancelled" });
    await trx("quotes")
      .where({ request_id: requestId, status: "live" })
      .update({ status: "declined", decline_reason: "The homeowner cancelled the request." });
    await audit(trx, actor.id, "request.cancelled", "request", requestId);
  });
}

export async function listProjectFiles(
  db: Db,
  actor: Actor,
  projectId: number,
): Promise<ProjectFile[]> {
  await getOwnProject(db, actor, projectId);
  const rows = await db("attachments")
    .where({ project_id: projectId })
    .whereNull("deleted_at")
    .orderBy("id")
    .select("id", "purpose", "file_name", "mime_type", "caption", "tag");
  return rows.map((r) => ({
    id: Number(r.id),
    purpose: r.purpose,
    fileName: r.file_name,
    mimeType: r.mime_type,
    caption: r.caption,
    tag: r.tag,
  }));
}

/** Mark a project file deleted and return its storage key, for the caller to delete from the store. */
export async function removeProjectFile(
  db: Db,
  actor: Actor,
  attachmentId: number,
): Promise<string> {
  requireHomeowner(actor);
  return db.transaction(async (trx) => {
    const a = await trx("attachments")
      .where({ id: attachmentId, owner_id: actor.id })
      .whereNotNull("project_id")
      .whereNull("deleted_at")
      .forUpdate()
      .first("file_key");
    if (!a) throw notFound("No such file.");
    await trx("attachments").where({ id: attachmentId }).update({ deleted_at: sqlDateTime() });
    await audit(trx, actor.id, "file.removed", "attachment", attachmentId);
    return a.file_key as string;
  });
}

/** Soft-delete a project, cancel its open request and return its file keys for deletion from the store. */
export async function deleteProject(db: Db, actor: Actor, projectId: number): Promise<string[]> {
  requireHomeowner(actor);
  return db.transaction(async (trx) => {
    await getOwnProject(trx, actor, projectId);
    const job = await trx("jobs as j")
      .join("requests as r", "r.id", "j.request_id")
      .where("r.project_id", projectId)
      .whereIn("j.state", ACTIVE_JOB_STATES)
      .first("j.id");
    if (job) throw conflict("This project has a review in progress and cannot be deleted yet.");
    await trx("requests")
      .where({ project_id: projectId, status: "open" })
      .update({ status: "cancelled" });
    const files = await trx("attachments")
      .where({ project_id: projectId })
      .whereNull("deleted_at")
      .select("file_key");
    await trx("attachments").where({ project_id: projectId }).update({ deleted_at: sqlDateTime() });
    await trx("projects").where({ id: projectId }).update({ deleted_at: sqlDateTime() });
    await audit(trx, actor.id, "project.deleted", "project", projectId);
    return files.map((f) => f.file_key as string);
  });
}

/** The worker's pass, as the system: open requests whose expiry has passed close. */
export async function expireOpenRequests(db: Db, now = new Date()): Promise<number> {
  return db("requests")
    .where({ status: "open" })
    .andWhere("expires_at", "<=", sqlDateTime(now))
    .update({ status: "expired" });
}
