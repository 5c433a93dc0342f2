import { quoteSchema } from "@/lib/validation/quote";
import { env } from "@/lib/env";
import { splitFee } from "@/lib/jobs";
import { haversineKm } from "@/lib/geo";
import { fromSqlDateTime, sqlDate, sqlDateTime } from "@/lib/time";
import type { Actor } from "./actor";
import { audit } from "./audit";
import { transactionWithRetry, type Db } from "./db";
import { conflict, forbidden, notFound, parseInput, unprocessable } from "./errors";
import { parseJson } from "./json";
import { notifyNewQuote, notifyQuoteAccepted, notifyQuoteDeclined } from "./notify";
import { isVerifiedReviewer } from "./reviewers";
import type { QuoteForHomeowner } from "@/lib/types/quotes";
import { ratingSummaries } from "./ratings";

export type { QuoteForHomeowner } from "@/lib/types/quotes";

async function requireVerified(db: Db, actor: Actor) {
  if (actor.role !== "reviewer" || !(await isVerifiedReviewer(db, actor.id)))
    throw forbidden("Only verified reviewers can see requests and quote.");
}

/**
 * Quote on an open request, or change one's live quote. One live quote per reviewer per
 * request (a unique index backs this up). A request that closed a moment ago answers 409.
 */
export async function submitQuote(
  db: Db,
  actor: Actor,
  requestId: number,
  input: unknown,
  appUrl = env().APP_URL,
): Promise<number> {
  await requireVerified(db, actor);
  const v = parseInput(quoteSchema, input);
  // Reviewers quoting one request at once take gap locks on quotes: a deadlock victim retries.
  return transactionWithRetry(db, async (trx) => {
    const r = await trx("requests")
      .where({ id: requestId })
      .forUpdate()
      .first("id", "status", "kind", "expires_at", "window_start", "window_end", "currency");
    if (!r) throw notFound("No such request.");
    if (r.status !== "open" || fromSqlDateTime(r.expires_at).getTime() <= Date.now())
      throw conflict("This request has just closed: it no longer takes quotes.");
    let visit: string | null = null;
    if (r.kind === "site_visit") {
      visit = v.proposedVisitDate || null;
      if (
        !visit ||
        visit < String(r.window_start) ||
        visit > String(r.window_end) ||
        visit < sqlDate()
      ) {
        throw unprocessable("Some details need attention.", {
          proposedVisitDate: [`Propose a date between ${r.window_start} and ${r.window_end}`],
        });
      }
    }
    const row = {
      price_minor: Math.round(v.pricePounds * 100),
      currency: r.currency,
      turnaround_days: v.turnaroundDays,
      scope_md: v.scopeMd,
      proposed_visit_date: visit,
    };
    const live = await trx("quotes")
      .where({ request_id: requestId, reviewer_id: actor.id, status: "live" })
      .forUpdate()
      .first("id");
    if (live) {
      await trx("quotes").where({ id: live.id }).update(row);
      return Number(live.id);
    }
    const [id] = await trx("quotes").insert({
      request_id: requestId,
      reviewer_id: actor.id,
      status: "live",
      ...row,
    });
    await trx.raw("INSERT IGNORE INTO message_threads (request_id, reviewer_id) VALUES (?, ?)", [
      requestId,
      actor.id,
    ]);
    await notifyNewQuote(trx, appUrl, Number(id));
    await audit(trx, actor.id, "quote.submitted", "request", requestId, { quoteId: Number(id) });
    return Number(id);
  });
}

export async function withdrawQuote(db: Db, actor: Actor, quoteId: number): Promise<void> {
  if (actor.role !== "reviewer") throw forbidden();
  const n = await db("quotes")
    .where({ id: quoteId, reviewer_id: actor.id, status: "live" })
    .update({ status: "withdrawn" });
  if (n === 0) throw conflict("Only a live quote of yours can be withdrawn.");
}

/** The live quotes on one's own request; quotes from suspended or no-longer-verified reviewers are hidden. */
export async function listQuotesForHomeowner(
  db: Db,
  actor: Actor,
  requestId: number,
): Promise<QuoteForHomeowner[]> {
  if (actor.role !== "homeowner") throw forbidden();
  const r = await db("requests")
    .where({ id: requestId, homeowner_id: actor.id })
    .first("id", "site_lat", "site_lng");
  if (!r) throw notFound("No such request.");
  const rows = await db("quotes as q")
    .join("reviewer_profiles as p", "p.user_id", "q.reviewer_id")
    .where("q.request_id", requestId)
    .whereIn("q.status", ["live", "accepted"])
    .whereNull("p.suspended_at")
    .select("q.*", "p.trading_name", "p.centre_lat", "p.centre_lng", "p.years_in_trade");
  const ratings = await ratingSummaries(
    db,
    rows.map((q) => Number(q.reviewer_id)),
  );
  const out: QuoteForHomeowner[] = [];
  for (const q of rows) {
    if (q.status === "live" && !(await isVerifiedReviewer(db, Number(q.reviewer_id)))) continue;
    out.push({
      id: Number(q.id),
      reviewerId: Number(q.reviewer_id),
      tradingName: q.trading_name,
      yearsInTrade: q.years_in_trade,
      priceMinor: q.price_minor,
      currency: q.currency,
      turnaroundDays: q.turnaround_days,
      scopeMd: q.scope_md,
      proposedVisitDate: q.proposed_visit_date,
      status: q.status,
      rating: ratings.get(Number(q.reviewer_id))?.average ?? null,
      ratingCount: ratings.get(Number(q.reviewer_id))?.count ?? 0,
      distanceKm:
        r.site_lat != null && q.centre_lat != null
          ? Math.round(
              haversineKm(
                { lat: Number(q.centre_lat), lng: Number(q.centre_lng) },
                { lat: Number(r.site_lat), lng: Number(r.site_lng) },
              ),
            )
          : null,
    });
  }
  return out.sort((a, b) => a.priceMinor - b.priceMinor);
}

/**
 * Accept a quote. In one transaction, with the request row locked: the request is awarded,
 * the quote accepted, every other live quote declined (each reviewer e-mailed), and a job is
 * created awaiting payment. A second accept, from another tab, finds the request awarded: 409.
 */
export async function acceptQuote(
  db: Db,
  actor: Actor,
  quoteId: number,
  appUrl = env().APP_URL,
): Promise<number> {
  if (actor.role !== "homeowner") throw forbidden();
  return db.transaction(async (trx) => {
    const q = await trx("quotes")
      .where({ id: quoteId })
      .first("id", "request_id", "reviewer_id", "price_minor", "currency", "status");
    if (!q) throw notFound("No such quote.");
    const r = await trx("requests")
      .where({ id: q.request_id })
      .forUpdate()
      .first("id", "homeowner_id", "status", "expires_at");
    if (!r || Number(r.homeowner_id) !== actor.id) throw notFound("No such quote.");
    // Past its expiry the request is closed, even before the worker's pass marks it expired.
    if (r.status !== "open" || fromSqlDateTime(r.expires_at).getTime() <= Date.now())
      throw conflict(
        "A quote on this request has already been accepted, or the request has closed.",
      );
    const fresh = await trx("quotes").where({ id: quoteId }).forUpdate().first("status");
    if (fresh?.status !== "live") throw conflict("This quote is no longer open to accept.");
    if (!(await isVerifiedReviewer(trx, Number(q.reviewer_id))))
      throw conflict("This reviewer cannot take work just now.");
    const fee = splitFee(Number(q.price_minor), env().PLATFORM_FEE_PERCENT).feeMinor;
    await trx("requests").where({ id: r.id }).update({ status: "awarded" });
    await trx("quotes").where({ id: quoteId }).update({ status: "accepted" });
    const others = await trx("quotes")
      .where({ request_id: r.id, status: "live" })
      .whereNot({ id: quoteId })
      .select("id");
    if (others.length)
      await trx("quotes")
        .whereIn(
          "id",
          others.map((o) => o.id),
        )
        .update({ status: "declined", decline_reason: null });
    const [jobId] = await trx("jobs").insert({
      request_id: r.id,
      quote_id: quoteId,
      homeowner_id: actor.id,
      reviewer_id: q.reviewer_id,
      state: "awaiting_payment",
      amount_minor: q.price_minor,
      fee_minor: fee,
      currency: q.currency,
    });
    await notifyQuoteAccepted(trx, appUrl, quoteId, Number(jobId));
    for (const o of others) await notifyQuoteDeclined(trx, appUrl, Number(o.id));
    await audit(trx, actor.id, "quote.accepted", "job", Number(jobId), {
      quoteId,
      declined: others.map((o) => Number(o.id)),
    });
    return Number(jobId);
  });
}

export async function declineQuote(
  db: Db,
  actor: Actor,
  quoteId: number,
  reason: string | undefined,
  appUrl = env().APP_URL,
): Promise<void> {
  if (actor.role !== "homeowner") throw forbidden();
  await db.transaction(async (trx) => {
    const q = await trx("quotes as q")
      .join("requests as r", "r.id", "q.request_id")
      .where("q.id", quoteId)
      .forUpdate()
      .first("q.id", "q.status", "r.homeowner_id");
    if (!q || Number(q.homeowner_id) !== actor.id) throw notFound("No such quote.");
    if (q.status !== "live") throw conflict("Only a live quote can be declined.");
    await trx("quotes")
      .where({ id: quoteId })
      .update({
        status: "declined",
        decline_reason: reason?.trim().slice(0, 1000) || null,
        updated_at: sqlDateTime(),
      });
    await notifyQuoteDeclined(trx, appUrl, quoteId);
  });
}

export interface RequestForReviewer {
  id: number;
  kind: "remote_check" | "site_visit";
  status: string;
  region: string;
  questions: string;
  budgetMinMinor: number;
  budgetMaxMinor: number;
  currency: string;
  windowStart: string | null;
  windowEnd: string | null;
  accessNotes: string | null;
  system: Record<string, unknown>;
  files: {
    id: number;
    purpose: string;
    caption: string | null;
    tag: string | null;
    mimeType: string;
    fileName: string;
  }[];
  myQuote: {
    id: number;
    priceMinor: number;
    turnaroundDays: number;
    scopeMd: string;
    proposedVisitDate: string | null;
    status: string;
    declineReason: string | null;
  } | null;
}

/**
 * A request as a verified reviewer sees it: the description, loop-check inputs, sketch and photos
 * and the questions. No name, address or e-mail of the homeowner: the project title is left out
 * too, since homeowners often put their street in it.
 */
export async function getRequestForReviewer(
  db: Db,
  actor: Actor,
  requestId: number,
): Promise<RequestForReviewer> {
  await requireVerified(db, actor);
  const r = await db("requests as r")
    .join("projects as p", "p.id", "r.project_id")
    .where("r.id", requestId)
    .first("r.*", "p.system", "p.id as pid");
  if (!r) throw notFound("No such request.");
  const mine = await db("quotes")
    .where({ request_id: requestId, reviewer_id: actor.id })
    .whereIn("status", ["live", "accepted", "declined"])
    .orderBy("id", "desc")
    .first(
      "id",
      "price_minor",
      "turnaround_days",
      "scope_md",
      "proposed_visit_date",
      "status",
      "decline_reason",
    );
  if (r.status !== "open" && !mine) throw notFound("This request is no longer open.");
  const files = await db("attachments")
    .where({ project_id: r.pid })
    .whereNull("deleted_at")
    .orderBy("id")
    .select("id", "purpose", "caption", "tag", "mime_type", "file_name");
  return {
    id: Number(r.id),
    kind: r.kind,
    status: r.status,
    region: r.region,
    questions: r.questions,
    budgetMinMinor: r.budget_min_minor,
    budgetMaxMinor: r.budget_max_minor,
    currency: r.currency,
    windowStart: r.window_start,
    windowEnd: r.window_end,
    accessNotes: r.access_notes,
    system: parseJson<Record<string, unknown>>(r.system_snapshot ?? r.system),
    files: files.map((f) => ({
      id: Number(f.id),
      purpose: f.purpose,
      caption: f.caption,
      tag: f.tag,
      mimeType: f.mime_type,
      fileName: f.file_name,
    })),
    myQuote: mine
      ? {
          id: Number(mine.id),
          priceMinor: mine.price_minor,
          turnaroundDays: mine.turnaround_days,
          scopeMd: mine.scope_md,
          proposedVisitDate: mine.proposed_visit_date,
          status: mine.status,
          declineReason: mine.decline_reason ?? null,
        }
      : null,
  };
}

export interface RequestForHomeowner {
  id: number;
  projectId: number;
  status: "open" | "awarded" | "cancelled" | "expired";
  kind: "remote_check" | "site_visit";
  jobId: number | null;
}

/** One's own request, for the quote comparison page; anyone else's is 404. */
export async function getRequestForHomeowner(
  db: Db,
  actor: Actor,
  requestId: number,
): Promise<RequestForHomeowner> {
  if (actor.role !== "homeowner") throw forbidden();
  const r = await db("requests as r")
    .leftJoin("jobs as j", "j.request_id", "r.id")
    .where({ "r.id": requestId, "r.homeowner_id": actor.id })
    .first("r.id", "r.project_id", "r.status", "r.kind", "j.id as job_id");
  if (!r) throw notFound("No such request.");
  return {
    id: Number(r.id),
    projectId: Number(r.project_id),
    status: r.status,
    kind: r.kind,
    jobId: r.job_id === null ? null : Number(r.job_id),
  };
}
