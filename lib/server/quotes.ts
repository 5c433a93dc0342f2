import "server-only";
import type { Knex } from "knex";
import { z } from "zod";
import { quoteSchema, type QuoteInput } from "@/lib/validation/quote";
import { notifyNewQuote, notifyQuoteAccepted, notifyQuoteDeclined } from "@/lib/mail/notify";
import { env } from "@/lib/env";
import { haversineKm } from "@/lib/geo";
import { conflict, forbidden, notFound, unprocessable } from "./errors";
import { isVerifiedReviewer, type Actor } from "./reviewers";

const today = () => new Date().toISOString().slice(0, 10);
const nowSql = () => new Date().toISOString().slice(0, 23).replace("T", " ");

async function requireVerified(knex: Knex, actor: Actor) {
  if (actor.role !== "reviewer" || !(await isVerifiedReviewer(knex, actor.id)))
    throw forbidden("Only verified reviewers can see requests and quote.");
}

/**
 * Quote on an open request, or change one's live quote. One live quote per reviewer per
 * request (a unique index backs this up). A request that closed a moment ago answers 409.
 */
export async function submitQuote(
  knex: Knex,
  actor: Actor,
  requestId: number,
  input: QuoteInput,
  appUrl = env().APP_URL,
): Promise<number> {
  await requireVerified(knex, actor);
  const parsed = quoteSchema.safeParse(input);
  if (!parsed.success)
    throw unprocessable(
      "Some details need attention.",
      z.flattenError(parsed.error).fieldErrors as Record<string, string[]>,
    );
  const v = parsed.data;
  return knex.transaction(async (trx) => {
    const r = await trx("requests")
      .where({ id: requestId })
      .forUpdate()
      .first("id", "status", "kind", "expires_at", "window_start", "window_end", "currency");
    if (!r) throw notFound("No such request.");
    if (r.status !== "open" || new Date(`${r.expires_at}Z`).getTime() <= Date.now())
      throw conflict("This request has just closed: it no longer takes quotes.");
    let visit: string | null = null;
    if (r.kind === "site_visit") {
      visit = v.proposedVisitDate || null;
      if (
        !visit ||
        visit < String(r.window_start) ||
        visit > String(r.window_end) ||
        visit < today()
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
    await trx("audit_log").insert({
      actor_id: actor.id,
      action: "quote.submitted",
      entity_type: "request",
      entity_id: requestId,
      detail: JSON.stringify({ quoteId: Number(id) }),
    });
    return Number(id);
  });
}

export async function withdrawQuote(knex: Knex, actor: Actor, quoteId: number): Promise<void> {
  if (actor.role !== "reviewer") throw forbidden();
  const n = await knex("quotes")
    .where({ id: quoteId, reviewer_id: actor.id, status: "live" })
    .update({ status: "withdrawn" });
  if (n === 0) throw conflict("Only a live quote of yours can be withdrawn.");
}

export interface QuoteForHomeowner {
  id: number;
  reviewerId: number;
  tradingName: string;
  yearsInTrade: number;
  priceMinor: number;
  currency: string;
  turnaroundDays: number;
  scopeMd: string;
  proposedVisitDate: string | null;
  status: string;
  rating: number | null;
  /** From the reviewer's centre to the site, when both are known. */
  distanceKm: number | null;
}

/** The live quotes on one's own request; quotes from suspended or no-longer-verified reviewers are hidden. */
export async function listQuotesForHomeowner(
  knex: Knex,
  actor: Actor,
  requestId: number,
): Promise<QuoteForHomeowner[]> {
  if (actor.role !== "homeowner") throw forbidden();
  const r = await knex("requests")
    .where({ id: requestId, homeowner_id: actor.id })
    .first("id", "site_lat", "site_lng");
  if (!r) throw notFound("No such request.");
  const rows = await knex("quotes as q")
    .join("reviewer_profiles as p", "p.user_id", "q.reviewer_id")
    .where("q.request_id", requestId)
    .whereIn("q.status", ["live", "accepted"])
    .whereNull("p.suspended_at")
    .select(
      "q.*",
      "p.trading_name",
      "p.centre_lat",
      "p.centre_lng",
      "p.years_in_trade",
      knex.raw("(SELECT AVG(stars) FROM ratings WHERE ratee_id = q.reviewer_id) AS rating"),
    );
  const out: QuoteForHomeowner[] = [];
  for (const q of rows) {
    if (q.status === "live" && !(await isVerifiedReviewer(knex, Number(q.reviewer_id)))) continue;
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
      rating: q.rating === null ? null : Number(q.rating),
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
  knex: Knex,
  actor: Actor,
  quoteId: number,
  appUrl = env().APP_URL,
): Promise<number> {
  if (actor.role !== "homeowner") throw forbidden();
  return knex.transaction(async (trx) => {
    const q = await trx("quotes")
      .where({ id: quoteId })
      .first("id", "request_id", "reviewer_id", "price_minor", "currency", "status");
    if (!q) throw notFound("No such quote.");
    const r = await trx("requests")
      .where({ id: q.request_id })
      .forUpdate()
      .first("id", "homeowner_id", "status");
    if (!r || Number(r.homeowner_id) !== actor.id) throw notFound("No such quote.");
    if (r.status !== "open")
      throw conflict(
        "A quote on this request has already been accepted, or the request has closed.",
      );
    const fresh = await trx("quotes").where({ id: quoteId }).forUpdate().first("status");
    if (fresh?.status !== "live") throw conflict("This quote is no longer open to accept.");
    if (!(await isVerifiedReviewer(trx as unknown as Knex, Number(q.reviewer_id))))
      throw conflict("This reviewer cannot take work just now.");
    const fee = Math.round((q.price_minor * env().PLATFORM_FEE_PERCENT) / 100);
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
        .update({ status: "declined", decline_reason: "The homeowner chose another quote." });
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
    await trx("audit_log").insert({
      actor_id: actor.id,
      action: "quote.accepted",
      entity_type: "job",
      entity_id: jobId,
      detail: JSON.stringify({ quoteId, declined: others.map((o) => Number(o.id)) }),
    });
    return Number(jobId);
  });
}

export async function declineQuote(
  knex: Knex,
  actor: Actor,
  quoteId: number,
  reason: string | undefined,
  appUrl = env().APP_URL,
): Promise<void> {
  if (actor.role !== "homeowner") throw forbidden();
  await knex.transaction(async (trx) => {
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
        updated_at: nowSql(),
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
  } | null;
}

/**
 * A request as a verified reviewer sees it: the description, loop-check inputs, sketch and photos
 * and the questions. No name, address or e-mail of the homeowner: the project title is left out
 * too, since homeowners often put their street in it.
 */
export async function getRequestForReviewer(
  knex: Knex,
  actor: Actor,
  requestId: number,
): Promise<RequestForReviewer> {
  await requireVerified(knex, actor);
  const r = await knex("requests as r")
    .join("projects as p", "p.id", "r.project_id")
    .where("r.id", requestId)
    .first("r.*", "p.system", "p.id as pid");
  if (!r) throw notFound("No such request.");
  const mine = await knex("quotes")
    .where({ request_id: requestId, reviewer_id: actor.id })
    .whereIn("status", ["live", "accepted"])
    .first("id", "price_minor", "turnaround_days", "scope_md", "proposed_visit_date", "status");
  if (r.status !== "open" && !mine) throw notFound("This request is no longer open.");
  const files = await knex("attachments")
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
    system: typeof r.system === "string" ? JSON.parse(r.system) : r.system,
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
        }
      : null,
  };
}
