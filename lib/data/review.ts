/**
 * The review: the workspace the job's reviewer fills in, the questions to the homeowner about
 * one item, the report draft, delivery (which freezes a versioned snapshot) and the delivered
 * report with its addenda.
 *
 * The checklist is the one the request kept when it was posted (requests.loop_check_snapshot:
 * item keys, findings, catalogue version; requests.system_snapshot), never the live project, so
 * the reviewer judges exactly what the homeowner asked about. Answers and the draft carry a
 * version raised on every save: a save based on an older version is refused with 409 and the
 * newer text (`StaleWriteError`), so two tabs never silently overwrite each other.
 */
import { runLoopCheck } from "@/lib/calc/loop-check";
import { worstLevel, type Finding, type Level } from "@/lib/calc/findings";
import { buildChecklist } from "@/lib/checklist/build";
import { CATALOGUE, CATALOGUE_VERSION, SECTIONS } from "@/lib/checklist/catalogue";
import { checkDelivery } from "@/lib/checklist/delivery";
import { itemTitle } from "@/lib/checklist/item-titles";
import { photoGuidanceFor } from "@/lib/checklist/photo-guidance";
import { disputeOpenUntil } from "@/lib/jobs";
import { env } from "@/lib/env";
import { sqlDateTime } from "@/lib/time";
import type {
  Addendum,
  Answer,
  ItemRequest,
  Pin,
  ReportDraft,
  ReportItem,
  ReportSnapshot,
  ReportView,
  RequiredChange,
  ReviewFile,
  ReviewItem,
  ReviewState,
  ReviewWorkspace,
  ProjectItemRequest,
} from "@/lib/types/review";
import {
  addendumSchema,
  answerSchema,
  itemAnswerSchema,
  itemRequestSchema,
  reportDraftSchema,
} from "@/lib/validation/review";
import { systemSchema } from "@/lib/validation/system";
import type { Actor } from "./actor";
import { audit } from "./audit";
import type { Db } from "./db";
import { jobWithPeople } from "./job-query";
import { conflict, forbidden, HttpError, notFound, parseInput, unprocessable } from "./errors";
import { startReview, transitionJob } from "./jobs";
import { parseJson } from "./json";
import { notifyItemRequested, notifyNewMessage, notifyReportDelivered } from "./notify";

export type { ReviewState, ReviewWorkspace, ReportView } from "@/lib/types/review";

/** The format of reports.checklist_snapshot written by `deliverReport`. */
export const SNAPSHOT_FORMAT = 1;

/** A save based on an older version: 409, with what is saved now so the client can show it. */
export class StaleWriteError<T> extends HttpError {
  constructor(
    message: string,
    readonly current: T,
  ) {
    super(409, message);
  }
}

// ---------------------------------------------------------------- loading a job's review

interface JobContext {
  jobId: number;
  requestId: number;
  projectId: number;
  projectTitle: string;
  homeownerId: number;
  homeownerName: string;
  reviewerId: number;
  reviewerName: string;
  kind: "remote_check" | "site_visit";
  state: string;
  questions: string;
  catalogueVersion: string;
  worst: Level;
  findings: Finding[];
  items: ReviewItem[];
}

interface LoopCheckSnapshot {
  worst?: Level;
  findings?: Finding[];
  catalogueVersion?: string;
  itemKeys?: string[];
}

const SECTION_OTHER = "Other";

/**
 * The checklist the request kept. A request posted before snapshots were kept (or a fixture
 * without one) falls back to the system it kept, or the project's, run through today's rules.
 */
function checklistOf(
  snap: LoopCheckSnapshot | null,
  systemRaw: unknown,
): { version: string; worst: Level; findings: Finding[]; items: ReviewItem[] } {
  let keys: string[];
  let findings: Finding[];
  let version: string;
  let worst: Level;
  if (snap?.itemKeys && snap.findings) {
    keys = snap.itemKeys;
    findings = snap.findings;
    version = snap.catalogueVersion ?? CATALOGUE_VERSION;
    worst = snap.worst ?? worstLevel(findings);
  } else {
    const system = systemSchema.safeParse(systemRaw);
    if (!system.success)
      return { version: CATALOGUE_VERSION, worst: "ok", findings: [], items: [] };
    const check = runLoopCheck(system.data);
    const list = buildChecklist(system.data, check.findings);
    keys = list.items.map((i) => i.key);
    findings = check.findings;
    version = list.version;
    worst = check.worst;
  }
  const byKey = new Map(CATALOGUE.map((c) => [c.key, c]));
  const items = keys.map((key): ReviewItem => {
    const c = byKey.get(key);
    const guidance = photoGuidanceFor(key);
    return {
      key,
      title: itemTitle(key),
      section: c?.section ?? SECTION_OTHER,
      check: c?.check ?? "",
      basis: c?.basis ?? "",
      appliesWhen: c ? c.appliesWhen : "",
      evidence: c?.computed ? findings.filter((f) => f.key === c.computed) : [],
      photoGuidance: guidance?.photo ?? c?.photo ?? null,
      photoIds: [],
      suggestedPhotoIds: [],
    };
  });
  // Grouped by section in the catalogue's order, catalogue order within a section.
  const rank = (s: string) => {
    const i = (SECTIONS as readonly string[]).indexOf(s);
    return i < 0 ? SECTIONS.length : i;
  };
  items.sort((a, b) => rank(a.section) - rank(b.section));
  return { version, worst, findings, items };
}

async function jobContext(db: Db, jobId: number): Promise<JobContext | null> {
  const r = await jobWithPeople(db, jobId).first(
    "j.id",
    "j.state",
    "j.request_id",
    "j.homeowner_id",
    "j.reviewer_id",
    "q.kind",
    "q.questions",
    "q.system_snapshot",
    "q.loop_check_snapshot",
    "p.id as project_id",
    "p.title",
    "p.system",
    "h.display_name as homeowner_name",
    "v.display_name as reviewer_name",
    "rp.trading_name",
  );
  if (!r) return null;
  const snap = r.loop_check_snapshot ? parseJson<LoopCheckSnapshot>(r.loop_check_snapshot) : null;
  const list = checklistOf(snap, parseJson(r.system_snapshot ?? r.system));
  return {
    jobId: Number(r.id),
    requestId: Number(r.request_id),
    projectId: Number(r.project_id),
    projectTitle: r.title,
    homeownerId: Number(r.homeowner_id),
    homeownerName: r.homeowner_name,
    reviewerId: Number(r.reviewer_id),
    reviewerName: r.trading_name ?? r.reviewer_name,
    kind: r.kind,
    state: r.state,
    questions: r.questions,
    catalogueVersion: list.version,
    worst: list.worst,
    findings: list.findings,
    items: list.items,
  };
}

/** The workspace is the job's reviewer's; admins may read it. Anyone else: 403. */
async function reviewContext(
  db: Db,
  actor: Actor,
  jobId: number,
  mode: "read" | "write",
): Promise<JobContext> {
  const ctx = await jobContext(db, jobId);
  if (!ctx) throw notFound("No such job.");
  const mine = actor.role === "reviewer" && actor.id === ctx.reviewerId;
  if (mode === "write" ? !mine : !mine && actor.role !== "admin")
    throw forbidden(
      actor.role === "admin"
        ? "Admins can read the review but not change it."
        : "Only the reviewer on this job can work on its review.",
    );
  return ctx;
}

function toAnswer(r: Record<string, unknown>): Answer {
  return {
    itemKey: String(r.item_key),
    verdict: (r.verdict as Answer["verdict"]) ?? null,
    noteMd: (r.note_md as string | null) ?? "",
    pins: parseJson<Pin[]>(r.pins ?? "[]") ?? [],
    version: Number(r.version ?? 0),
    updatedAt: r.updated_at ? String(r.updated_at) : null,
  };
}

const blankAnswer = (itemKey: string): Answer => ({
  itemKey,
  verdict: null,
  noteMd: "",
  pins: [],
  version: 0,
  updatedAt: null,
});

/** Required changes as stored; an early report kept plain strings. */
function toChanges(raw: unknown): RequiredChange[] {
  const list = parseJson<unknown[]>(raw ?? "[]");
  if (!Array.isArray(list)) return [];
  return list.map((c) =>
    typeof c === "string"
      ? { text: c, itemKeys: [] }
      : {
          text: String((c as RequiredChange).text ?? ""),
          itemKeys: Array.isArray((c as RequiredChange).itemKeys)
            ? (c as RequiredChange).itemKeys.map(String)
            : [],
        },
  );
}

function toDraft(r: Record<string, unknown> | undefined): ReportDraft {
  if (!r) return { outcome: null, summaryMd: "", requiredChanges: [], version: 0 };
  return {
    outcome: (r.outcome as ReportDraft["outcome"]) ?? null,
    summaryMd: (r.summary_md as string | null) ?? "",
    requiredChanges: toChanges(r.required_changes),
    version: Number(r.draft_version ?? 0),
  };
}

function toItemRequest(r: Record<string, unknown>): ItemRequest {
  return {
    id: Number(r.id),
    itemKey: String(r.item_key),
    itemTitle: itemTitle(String(r.item_key)),
    kind: r.kind as ItemRequest["kind"],
    questionMd: String(r.question_md),
    answerMd: (r.answer_md as string | null) ?? null,
    answerAttachmentId: r.answer_attachment_id === null ? null : Number(r.answer_attachment_id),
    answeredAt: r.answered_at ? String(r.answered_at) : null,
    createdAt: String(r.created_at),
  };
}

async function readState(db: Db, ctx: JobContext): Promise<ReviewState> {
  const report = await db("reports").where({ job_id: ctx.jobId }).first();
  const rows = report ? await db("checklist_answers").where({ report_id: report.id }).select() : [];
  const answers: Record<string, Answer> = {};
  for (const item of ctx.items) answers[item.key] = blankAnswer(item.key);
  for (const r of rows) answers[String(r.item_key)] = toAnswer(r);
  const requests = await db("item_requests").where({ job_id: ctx.jobId }).orderBy("id").select();
  return { answers, draft: toDraft(report), itemRequests: requests.map(toItemRequest) };
}

async function projectFiles(db: Db, projectId: number): Promise<ReviewFile[]> {
  const rows = await db("attachments")
    .where({ project_id: projectId })
    .whereIn("purpose", ["sketch", "photo"])
    .whereNull("deleted_at")
    .orderBy([{ column: "purpose", order: "desc" }, "id"])
    .select("id", "purpose", "file_name", "caption", "tag", "mime_type");
  const tags = rows.length
    ? await db("attachment_items")
        .whereIn(
          "attachment_id",
          rows.map((r) => r.id),
        )
        .select("attachment_id", "item_key")
    : [];
  return rows.map((r) => ({
    id: Number(r.id),
    purpose: r.purpose,
    fileName: r.file_name,
    caption: r.caption ?? null,
    tag: r.tag ?? null,
    isImage: String(r.mime_type).startsWith("image/"),
    itemKeys: tags
      .filter((t) => Number(t.attachment_id) === Number(r.id))
      .map((t) => String(t.item_key)),
  }));
}

/** Everything the workspace shows: the checklist with its evidence and photos, and what is saved. */
export async function getReviewWorkspace(
  db: Db,
  actor: Actor,
  jobId: number,
): Promise<ReviewWorkspace> {
  const ctx = await reviewContext(db, actor, jobId, "read");
  const [state, files, report] = await Promise.all([
    readState(db, ctx),
    projectFiles(db, ctx.projectId),
    db("reports").where({ job_id: ctx.jobId }).first("status"),
  ]);
  const items = ctx.items.map((item) => {
    const areas = new Set<string>(photoGuidanceFor(item.key)?.areas ?? []);
    const photoIds = files.filter((f) => f.itemKeys.includes(item.key)).map((f) => f.id);
    return {
      ...item,
      photoIds,
      suggestedPhotoIds: files
        .filter((f) => f.purpose === "photo" && f.tag && areas.has(f.tag))
        .map((f) => f.id)
        .filter((id) => !photoIds.includes(id)),
    };
  });
  return {
    jobId: ctx.jobId,
    projectId: ctx.projectId,
    projectTitle: ctx.projectTitle,
    homeownerName: ctx.homeownerName,
    kind: ctx.kind,
    state: ctx.state,
    reportDelivered: report?.status === "delivered",
    questions: ctx.questions,
    catalogueVersion: ctx.catalogueVersion,
    worst: ctx.worst,
    items,
    files,
    ...state,
  };
}

/** What the client refetches: the answers, the draft and the questions with their answers. */
export async function getReviewState(db: Db, actor: Actor, jobId: number): Promise<ReviewState> {
  return readState(db, await reviewContext(db, actor, jobId, "read"));
}

// ---------------------------------------------------------------- writing

/** Lock the job and its draft report for a write; 409 unless the review is under way. */
async function lockDraft(
  trx: Db,
  ctx: JobContext,
): Promise<{ id: number; row: Record<string, unknown> }> {
  const job = await trx("jobs").where({ id: ctx.jobId }).forUpdate().first("state");
  if (job.state !== "in_review")
    throw conflict(
      job.state === "funded"
        ? "Start the review first."
        : "The review is finished: the report is delivered and can no longer be changed. Add an addendum instead.",
    );
  let report = await trx("reports").where({ job_id: ctx.jobId }).forUpdate().first();
  if (!report) {
    await trx("reports").insert({
      job_id: ctx.jobId,
      catalogue_version: ctx.catalogueVersion,
      status: "draft",
      required_changes: "[]",
    });
    report = await trx("reports").where({ job_id: ctx.jobId }).forUpdate().first();
  }
  if (report.status !== "draft")
    throw conflict(
      "The report is delivered and can no longer be changed. Add an addendum instead.",
    );
  return { id: Number(report.id), row: report };
}

function requireItem(ctx: JobContext, itemKey: string) {
  const item = ctx.items.find((i) => i.key === itemKey);
  if (!item) throw notFound("That item is not on this job's checklist.");
  return item;
}

/** Pins only on this project's own sketch and photos, and only on images. */
async function checkPins(trx: Db, ctx: JobContext, pins: readonly Pin[]): Promise<void> {
  if (!pins.length) return;
  const ids = [...new Set(pins.map((p) => p.attachmentId))];
  const rows = await trx("attachments")
    .whereIn("id", ids)
    .where({ project_id: ctx.projectId })
    .whereIn("purpose", ["sketch", "photo"])
    .whereNull("deleted_at")
    .select("id", "mime_type");
  const ok = new Set(
    rows.filter((r) => String(r.mime_type).startsWith("image/")).map((r) => Number(r.id)),
  );
  const bad = pins.findIndex((p) => !ok.has(p.attachmentId));
  if (bad >= 0)
    throw unprocessable("A pin can only go on this project's own sketch or photos.", {
      [`pins.${bad}.attachmentId`]: ["Not an image of this project"],
    });
}

/**
 * Autosave one item's answer: any of verdict, note and pins, based on `expectedVersion`.
 * 403 off the job, 409 unless in review, 409 (StaleWriteError, with the saved answer) when
 * someone saved since, 422 for bad input. Nothing is written on any refusal.
 */
export async function saveAnswer(
  db: Db,
  actor: Actor,
  jobId: number,
  itemKey: string,
  input: unknown,
): Promise<Answer> {
  const ctx = await reviewContext(db, actor, jobId, "write");
  requireItem(ctx, itemKey);
  const v = parseInput(
    answerSchema,
    input,
    "The answer was not saved: some details need attention.",
  );
  return db.transaction(async (trx) => {
    const report = await lockDraft(trx, ctx);
    const row = await trx("checklist_answers")
      .where({ report_id: report.id, item_key: itemKey })
      .forUpdate()
      .first();
    const current = row ? toAnswer(row) : blankAnswer(itemKey);
    if (current.version !== v.expectedVersion)
      throw new StaleWriteError(
        "This item was changed in another tab or window since you loaded it. The newer text is shown.",
        current,
      );
    if (v.pins) await checkPins(trx, ctx, v.pins);
    const next = {
      verdict: v.verdict === undefined ? current.verdict : v.verdict,
      note_md: v.noteMd === undefined ? current.noteMd : v.noteMd,
      pins: JSON.stringify(v.pins ?? current.pins),
      version: current.version + 1,
      updated_by: actor.id,
    };
    if (row) await trx("checklist_answers").where({ id: row.id }).update(next);
    else
      await trx("checklist_answers").insert({ report_id: report.id, item_key: itemKey, ...next });
    const saved = await trx("checklist_answers")
      .where({ report_id: report.id, item_key: itemKey })
      .first();
    return toAnswer(saved);
  });
}

/** Autosave the report's outcome, summary and required changes, like `saveAnswer`. */
export async function saveReportDraft(
  db: Db,
  actor: Actor,
  jobId: number,
  input: unknown,
): Promise<ReportDraft> {
  const ctx = await reviewContext(db, actor, jobId, "write");
  const v = parseInput(
    reportDraftSchema,
    input,
    "The report was not saved: some details need attention.",
  );
  if (v.requiredChanges) {
    const known = new Set(ctx.items.map((i) => i.key));
    const bad = v.requiredChanges.findIndex((c) => c.itemKeys.some((k) => !known.has(k)));
    if (bad >= 0)
      throw unprocessable("A required change names an item that is not on this checklist.", {
        [`requiredChanges.${bad}.itemKeys`]: ["Choose items of this checklist"],
      });
  }
  return db.transaction(async (trx) => {
    const report = await lockDraft(trx, ctx);
    const current = toDraft(report.row);
    if (current.version !== v.expectedVersion)
      throw new StaleWriteError(
        "The report was changed in another tab or window since you loaded it. The newer text is shown.",
        current,
      );
    await trx("reports")
      .where({ id: report.id })
      .update({
        outcome: v.outcome === undefined ? current.outcome : v.outcome,
        summary_md: v.summaryMd === undefined ? current.summaryMd : v.summaryMd,
        required_changes: JSON.stringify(v.requiredChanges ?? current.requiredChanges),
        draft_version: current.version + 1,
      });
    return toDraft(await trx("reports").where({ id: report.id }).first());
  });
}

/** The reviewer starts the review (funded → in review) and the draft report is made. */
export async function startJobReview(db: Db, actor: Actor, jobId: number): Promise<void> {
  const ctx = await reviewContext(db, actor, jobId, "write");
  await startReview(db, actor, jobId, async ({ trx }) => {
    await trx.raw(
      "INSERT IGNORE INTO reports (job_id, catalogue_version, status, required_changes) VALUES (?, ?, 'draft', '[]')",
      [jobId, ctx.catalogueVersion],
    );
  });
}

// ---------------------------------------------------------------- asking the homeowner

async function threadId(trx: Db, ctx: JobContext): Promise<number> {
  await trx.raw("INSERT IGNORE INTO message_threads (request_id, reviewer_id) VALUES (?, ?)", [
    ctx.requestId,
    ctx.reviewerId,
  ]);
  const t = await trx("message_threads")
    .where({ request_id: ctx.requestId, reviewer_id: ctx.reviewerId })
    .first("id");
  return Number(t.id);
}

async function postToThread(trx: Db, ctx: JobContext, senderId: number, body: string) {
  const thread = await threadId(trx, ctx);
  const [id] = await trx("messages").insert({
    thread_id: thread,
    sender_id: senderId,
    body_md: body,
  });
  await trx("message_threads").where({ id: thread }).update({ last_message_at: sqlDateTime() });
  return Number(id);
}

/**
 * The reviewer asks the homeowner for a photo or a fact about one item: recorded with the item,
 * posted in the request's conversation and e-mailed with a link to the project page.
 */
export async function askForItem(
  db: Db,
  actor: Actor,
  jobId: number,
  input: unknown,
  appUrl = env().APP_URL,
): Promise<ItemRequest> {
  const ctx = await reviewContext(db, actor, jobId, "write");
  const v = parseInput(itemRequestSchema, input, "The question needs attention.");
  const item = requireItem(ctx, v.itemKey);
  return db.transaction(async (trx) => {
    await lockDraft(trx, ctx);
    const [id] = await trx("item_requests").insert({
      job_id: jobId,
      item_key: item.key,
      kind: v.kind,
      question_md: v.questionMd,
      asked_by: actor.id,
    });
    await postToThread(
      trx,
      ctx,
      actor.id,
      `**${v.kind === "photo" ? "Photo" : "Question"} for “${item.title}”:** ${v.questionMd}\n\nAnswer on your project page.`,
    );
    await notifyItemRequested(trx, appUrl, Number(id));
    await audit(trx, actor.id, "review.item_requested", "job", jobId, { itemKey: item.key });
    return toItemRequest(await trx("item_requests").where({ id }).first());
  });
}

/** The reviewer's questions on the homeowner's own project, newest last. */
export async function listItemRequestsForProject(
  db: Db,
  actor: Actor,
  projectId: number,
): Promise<ProjectItemRequest[]> {
  if (actor.role !== "homeowner") return [];
  const rows = await db("item_requests as i")
    .join("jobs as j", "j.id", "i.job_id")
    .join("requests as q", "q.id", "j.request_id")
    .join("users as v", "v.id", "j.reviewer_id")
    .leftJoin("reviewer_profiles as rp", "rp.user_id", "j.reviewer_id")
    .where({ "q.project_id": projectId, "j.homeowner_id": actor.id })
    .orderBy("i.id")
    .limit(100)
    .select("i.*", "j.state", "v.display_name", "rp.trading_name");
  return rows.map((r) => ({
    ...toItemRequest(r),
    jobId: Number(r.job_id),
    reviewerName: r.trading_name ?? r.display_name,
    open: r.state === "in_review",
  }));
}

/**
 * The homeowner answers one question, in words or with one of the project's photos (uploaded
 * on the project page). The photo is tagged to the item; the answer goes to the conversation.
 */
export async function answerItemRequest(
  db: Db,
  actor: Actor,
  itemRequestId: number,
  input: unknown,
  appUrl = env().APP_URL,
): Promise<ItemRequest> {
  const r = await db("item_requests as i")
    .join("jobs as j", "j.id", "i.job_id")
    .where("i.id", itemRequestId)
    .first("i.job_id", "j.homeowner_id");
  if (!r || actor.role !== "homeowner" || Number(r.homeowner_id) !== actor.id)
    throw notFound("No such question.");
  const v = parseInput(itemAnswerSchema, input, "The answer needs attention.");
  const ctx = (await jobContext(db, Number(r.job_id)))!;
  return db.transaction(async (trx) => {
    const job = await trx("jobs").where({ id: ctx.jobId }).forUpdate().first("state");
    if (job.state !== "in_review")
      throw conflict("The review is finished, so this question can no longer be answered here.");
    const q = await trx("item_requests").where({ id: itemRequestId }).forUpdate().first();
    if (q.answered_at) throw conflict("This question is already answered.");
    if (v.attachmentId !== undefined) {
      const file = await trx("attachments")
        .where({ id: v.attachmentId, project_id: ctx.projectId })
        .whereIn("purpose", ["sketch", "photo"])
        .whereNull("deleted_at")
        .first("id");
      if (!file)
        throw unprocessable("Choose one of this project's photos.", {
          attachmentId: ["Not a photo of this project"],
        });
      await trx.raw("INSERT IGNORE INTO attachment_items (attachment_id, item_key) VALUES (?, ?)", [
        v.attachmentId,
        q.item_key,
      ]);
    }
    await trx("item_requests")
      .where({ id: itemRequestId })
      .update({
        answer_md: v.answerMd || null,
        answer_attachment_id: v.attachmentId ?? null,
        answered_at: sqlDateTime(),
      });
    const title = itemTitle(String(q.item_key));
    const body = [
      `**Answer for “${title}”:** ${v.answerMd || "a photo."}`,
      v.attachmentId !== undefined ? `![Photo for ${title}](/api/files/${v.attachmentId})` : "",
    ]
      .filter(Boolean)
      .join("\n\n");
    const messageId = await postToThread(trx, ctx, actor.id, body);
    await notifyNewMessage(trx, appUrl, messageId);
    await audit(trx, actor.id, "review.item_answered", "job", ctx.jobId, { itemKey: q.item_key });
    return toItemRequest(await trx("item_requests").where({ id: itemRequestId }).first());
  });
}

// ---------------------------------------------------------------- delivery

/**
 * Deliver: the delivery rules (lib/checklist/delivery.ts) must hold; the report is frozen as a
 * versioned snapshot (items, verdicts, notes, pins, loop-check values, catalogue version), the
 * job moves to delivered and the homeowner is e-mailed, all in one transaction.
 */
export async function deliverReport(
  db: Db,
  actor: Actor,
  jobId: number,
  appUrl = env().APP_URL,
  now = new Date(),
): Promise<ReportSnapshot> {
  const ctx = await reviewContext(db, actor, jobId, "write");
  const { result } = await transitionJob(
    db,
    actor,
    jobId,
    "deliver",
    async ({ trx }) => {
      const report = await lockDraft(trx, ctx);
      const state = await readState(trx, ctx);
      const draft = state.draft;
      const verdicts = Object.fromEntries(
        Object.values(state.answers).map((a) => [a.itemKey, a.verdict]),
      );
      const check = checkDelivery({
        itemKeys: ctx.items.map((i) => i.key),
        verdicts,
        outcome: draft.outcome,
        summaryMd: draft.summaryMd,
        requiredChanges: draft.requiredChanges,
      });
      if (!check.ok)
        throw unprocessable(
          `The report cannot be delivered yet: ${check.problems.map((p) => p.message).join(" ")}`,
          { report: check.problems.map((p) => p.message) },
        );
      const files = await projectFiles(trx, ctx.projectId);
      const items: ReportItem[] = ctx.items.map((i) => {
        const a = state.answers[i.key]!;
        return {
          key: i.key,
          title: i.title,
          section: i.section,
          check: i.check,
          basis: i.basis,
          verdict: a.verdict,
          noteMd: a.noteMd,
          pins: a.pins,
          evidence: i.evidence,
        };
      });
      const snapshot: ReportSnapshot = {
        format: SNAPSHOT_FORMAT,
        catalogueVersion: ctx.catalogueVersion,
        worst: ctx.worst,
        outcome: draft.outcome!,
        summaryMd: draft.summaryMd,
        requiredChanges: draft.requiredChanges,
        items,
        files: files
          .filter((f) => f.isImage)
          .map((f) => ({ id: f.id, purpose: f.purpose, fileName: f.fileName, caption: f.caption })),
      };
      await trx("reports")
        .where({ id: report.id })
        .update({
          status: "delivered",
          catalogue_version: ctx.catalogueVersion,
          checklist_snapshot: JSON.stringify(snapshot),
          findings_snapshot: JSON.stringify(ctx.findings),
          snapshot_format: SNAPSHOT_FORMAT,
          delivered_at: sqlDateTime(now),
        });
      // The e-mail names the dispute deadline, which transitionJob writes after this work.
      await trx("jobs")
        .where({ id: jobId })
        .update({
          release_due_at: sqlDateTime(disputeOpenUntil(now, env().DISPUTE_WINDOW_DAYS)),
        });
      await notifyReportDelivered(trx, appUrl, jobId, snapshot.outcome);
      return snapshot;
    },
    { now },
  );
  return result!;
}

/** A dated note added to a delivered report by its reviewer. */
export async function addAddendum(
  db: Db,
  actor: Actor,
  jobId: number,
  input: unknown,
): Promise<number> {
  const ctx = await reviewContext(db, actor, jobId, "write");
  const v = parseInput(addendumSchema, input, "The addendum needs attention.");
  return db.transaction(async (trx) => {
    const report = await trx("reports")
      .where({ job_id: ctx.jobId })
      .forUpdate()
      .first("id", "status");
    if (!report || report.status !== "delivered")
      throw conflict("An addendum can only be added once the report is delivered.");
    const [id] = await trx("report_addenda").insert({
      report_id: report.id,
      author_id: actor.id,
      body_md: v.bodyMd,
    });
    await audit(trx, actor.id, "report.addendum", "report", Number(report.id));
    return Number(id);
  });
}

// ---------------------------------------------------------------- reading the report

/** The delivered report: its homeowner, its reviewer and admins; anyone else 404. */
export async function getReport(db: Db, actor: Actor, jobId: number): Promise<ReportView> {
  const ctx = await jobContext(db, jobId);
  const viewer =
    actor.role === "admin"
      ? "admin"
      : ctx && actor.role === "homeowner" && actor.id === ctx.homeownerId
        ? "homeowner"
        : ctx && actor.role === "reviewer" && actor.id === ctx.reviewerId
          ? "reviewer"
          : null;
  if (!ctx || !viewer) throw notFound("No such report.");
  const r = await db("reports").where({ job_id: jobId }).first();
  if (!r || r.status !== "delivered") throw notFound("The report is not delivered yet.");
  const stored = r.checklist_snapshot ? parseJson<ReportSnapshot>(r.checklist_snapshot) : null;
  const snapshot: ReportSnapshot = stored ?? {
    format: SNAPSHOT_FORMAT,
    catalogueVersion: r.catalogue_version,
    worst: ctx.worst,
    outcome: r.outcome,
    summaryMd: r.summary_md ?? "",
    requiredChanges: toChanges(r.required_changes),
    items: [],
    files: [],
  };
  const addenda = await db("report_addenda as a")
    .join("users as u", "u.id", "a.author_id")
    .where("a.report_id", r.id)
    .orderBy("a.id")
    .select("a.id", "a.body_md", "a.created_at", "u.display_name");
  return {
    jobId,
    projectId: ctx.projectId,
    projectTitle: ctx.projectTitle,
    reviewerName: ctx.reviewerName,
    reviewerId: ctx.reviewerId,
    homeownerName: ctx.homeownerName,
    kind: ctx.kind,
    jobState: ctx.state,
    deliveredAt: String(r.delivered_at),
    hasChecklist: stored !== null,
    snapshot,
    findings: r.findings_snapshot ? parseJson<Finding[]>(r.findings_snapshot) : ctx.findings,
    addenda: addenda.map((a): Addendum => ({
      id: Number(a.id),
      bodyMd: a.body_md,
      authorName: a.display_name,
      createdAt: String(a.created_at),
    })),
    viewer,
  };
}
