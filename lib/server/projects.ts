import "server-only";
import type { Knex } from "knex";
import { z } from "zod";
import {
  collectorArraySchema,
  sectionSchemas,
  siteSchema,
  systemSchema,
  type SystemDraft,
  type SystemSection,
} from "@/lib/validation/system";
import { projectTitleSchema, requestSchema, type RequestInput } from "@/lib/validation/request";
import { runLoopCheck } from "@/lib/calc/loop-check";
import { env } from "@/lib/env";
import { forbidden, notFound, conflict, unprocessable } from "./errors";
import type { Actor } from "./reviewers";

const sqlNow = (offsetMs = 0) =>
  new Date(Date.now() + offsetMs).toISOString().slice(0, 23).replace("T", " ");
const parseJson = <T>(v: unknown): T => (typeof v === "string" ? (JSON.parse(v) as T) : (v as T));

function fieldErrorsOf(error: z.ZodError, prefix = ""): Record<string, string[]> {
  const out: Record<string, string[]> = {};
  for (const issue of error.issues) {
    const key = [prefix, ...issue.path.map(String)].filter(Boolean).join(".");
    (out[key] ??= []).push(issue.message);
  }
  return out;
}

export interface Project {
  id: number;
  ownerId: number;
  title: string;
  system: SystemDraft;
  status: "draft" | "ready" | "archived";
  createdAt: string;
  updatedAt: string;
}

function requireHomeowner(actor: Actor) {
  if (actor.role !== "homeowner") throw forbidden("Only homeowners have projects.");
}

export async function createProject(
  knex: Knex,
  actor: Actor,
  input: { title: string },
): Promise<number> {
  requireHomeowner(actor);
  const parsed = projectTitleSchema.safeParse(input);
  if (!parsed.success)
    throw unprocessable("Some details need attention.", fieldErrorsOf(parsed.error));
  return knex.transaction(async (trx) => {
    const [id] = await trx("projects").insert({
      owner_id: actor.id,
      title: parsed.data.title,
      system: "{}",
      status: "draft",
    });
    await trx("audit_log").insert({
      actor_id: actor.id,
      action: "project.created",
      entity_type: "project",
      entity_id: id,
      detail: "{}",
    });
    return Number(id);
  });
}

/** A project its owner (or an admin) may open; anyone else gets 404 so ids reveal nothing. */
export async function getOwnProject(
  knex: Knex,
  actor: Actor,
  id: number,
  trx: Knex = knex,
): Promise<Project> {
  const row = await trx("projects")
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
  knex: Knex,
  actor: Actor,
  projectId: number,
  section: SystemSection,
  value: unknown,
): Promise<void> {
  requireHomeowner(actor);
  const schema = sectionSchemas[section];
  if (!schema) throw unprocessable("Unknown step.");
  const parsed = schema.safeParse(value);
  if (!parsed.success)
    throw unprocessable("Some values need attention.", fieldErrorsOf(parsed.error, section));
  await knex.transaction(async (trx) => {
    const row = await trx("projects")
      .where({ id: projectId, owner_id: actor.id })
      .whereNull("deleted_at")
      .forUpdate()
      .first("system");
    if (!row) throw notFound("No such project.");
    const system = { ...parseJson<SystemDraft>(row.system), [section]: parsed.data };
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
  knex: Knex,
  actor: Actor,
  projectId: number,
): Promise<ProjectRequest[]> {
  await getOwnProject(knex, actor, projectId);
  const rows = await knex("requests")
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

function requestRow(v: z.output<typeof requestSchema>) {
  const site = v.kind === "site_visit";
  return {
    kind: v.kind,
    questions: v.questions,
    budget_min_minor: Math.round(v.budgetMinPounds * 100),
    budget_max_minor: Math.round(v.budgetMaxPounds * 100),
    window_start: site ? v.windowStart || null : null,
    window_end: site ? v.windowEnd || null : null,
    access_notes: site ? v.accessNotes || null : null,
    site_lat: site ? (v.siteLat ?? null) : null,
    site_lng: site ? (v.siteLng ?? null) : null,
  };
}

/** Post a request for review; the description must be complete so reviewers can quote on it. */
export async function createRequest(
  knex: Knex,
  actor: Actor,
  projectId: number,
  input: RequestInput,
): Promise<number> {
  requireHomeowner(actor);
  const parsed = requestSchema.safeParse(input);
  if (!parsed.success)
    throw unprocessable("Some details need attention.", fieldErrorsOf(parsed.error));
  return knex.transaction(async (trx) => {
    const project = await getOwnProject(knex, actor, projectId, trx);
    const full = systemSchema.safeParse(project.system);
    if (!full.success)
      throw unprocessable("Finish every step of the description before asking for a review.");
    const open = await trx("requests").where({ project_id: projectId, status: "open" }).first("id");
    if (open) throw conflict("This project already has an open request: edit that one instead.");
    const [id] = await trx("requests").insert({
      project_id: projectId,
      homeowner_id: actor.id,
      status: "open",
      currency: env().CURRENCY,
      region: full.data.site.region,
      collector_type: full.data.collectors.type,
      expires_at: sqlNow(env().REQUEST_EXPIRY_DAYS * 86_400_000),
      ...requestRow(parsed.data),
    });
    await trx("audit_log").insert({
      actor_id: actor.id,
      action: "request.posted",
      entity_type: "request",
      entity_id: id,
      detail: JSON.stringify({ projectId }),
    });
    return Number(id);
  });
}

async function lockOwnOpenRequest(trx: Knex.Transaction, actor: Actor, requestId: number) {
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
  knex: Knex,
  actor: Actor,
  requestId: number,
  input: RequestInput,
): Promise<void> {
  requireHomeowner(actor);
  const parsed = requestSchema.safeParse(input);
  if (!parsed.success)
    throw unprocessable("Some details need attention.", fieldErrorsOf(parsed.error));
  await knex.transaction(async (trx) => {
    await lockOwnOpenRequest(trx, actor, requestId);
    await trx("requests").where({ id: requestId }).update(requestRow(parsed.data));
    await trx("audit_log").insert({
      actor_id: actor.id,
      action: "request.edited",
      entity_type: "request",
      entity_id: requestId,
      detail: "{}",
    });
  });
}

export async function cancelRequest(knex: Knex, actor: Actor, requestId: number): Promise<void> {
  requireHomeowner(actor);
  await knex.transaction(async (trx) => {
    await lockOwnOpenRequest(trx, actor, requestId);
    await trx("requests").where({ id: requestId }).update({ status: "cancelled" });
    await trx("quotes")
      .where({ request_id: requestId, status: "live" })
      .update({ status: "declined", decline_reason: "The homeowner cancelled the request." });
    await trx("audit_log").insert({
      actor_id: actor.id,
      action: "request.cancelled",
      entity_type: "request",
      entity_id: requestId,
      detail: "{}",
    });
  });
}

export interface ProjectFile {
  id: number;
  purpose: "sketch" | "photo";
  fileName: string;
  mimeType: string;
  caption: string | null;
  tag: string | null;
}

export async function listProjectFiles(
  knex: Knex,
  actor: Actor,
  projectId: number,
): Promise<ProjectFile[]> {
  await getOwnProject(knex, actor, projectId);
  const rows = await knex("attachments")
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
  knex: Knex,
  actor: Actor,
  attachmentId: number,
): Promise<string> {
  requireHomeowner(actor);
  return knex.transaction(async (trx) => {
    const a = await trx("attachments")
      .where({ id: attachmentId, owner_id: actor.id })
      .whereNotNull("project_id")
      .whereNull("deleted_at")
      .forUpdate()
      .first("file_key");
    if (!a) throw notFound("No such file.");
    await trx("attachments").where({ id: attachmentId }).update({ deleted_at: sqlNow() });
    return a.file_key as string;
  });
}

/** Soft-delete a project, cancel its open request and return its file keys for deletion from the store. */
export async function deleteProject(
  knex: Knex,
  actor: Actor,
  projectId: number,
): Promise<string[]> {
  requireHomeowner(actor);
  return knex.transaction(async (trx) => {
    await getOwnProject(knex, actor, projectId, trx);
    const job = await trx("jobs as j")
      .join("requests as r", "r.id", "j.request_id")
      .where("r.project_id", projectId)
      .whereIn("j.state", ["funded", "in_review", "delivered", "disputed"])
      .first("j.id");
    if (job) throw conflict("This project has a review in progress and cannot be deleted yet.");
    await trx("requests")
      .where({ project_id: projectId, status: "open" })
      .update({ status: "cancelled" });
    const files = await trx("attachments")
      .where({ project_id: projectId })
      .whereNull("deleted_at")
      .select("file_key");
    await trx("attachments").where({ project_id: projectId }).update({ deleted_at: sqlNow() });
    await trx("projects").where({ id: projectId }).update({ deleted_at: sqlNow() });
    await trx("audit_log").insert({
      actor_id: actor.id,
      action: "project.deleted",
      entity_type: "project",
      entity_id: projectId,
      detail: "{}",
    });
    return files.map((f) => f.file_key as string);
  });
}
