/**
 * Jobs: the only writer of a job's state. Every change goes through `transitionJob`, which locks
 * the job row, asks the state machine in lib/jobs whether this actor may take this transition
 * now, runs the transition's own work (a payment call, ledger rows, a report), writes the new
 * state with its timestamp and an audit row, and queues the e-mails, all in one transaction.
 *
 * Money moves only inside these transitions. Each call to the payment service carries an
 * idempotency key made of the job and the transition, so a retry after a failure or a crash
 * replays the stored answer instead of moving money twice; the job row stays locked while the
 * call is made, so ten "release" clicks at once make one transfer and nine polite refusals.
 */
import type Stripe from "stripe";
import {
  canTransition,
  disputeOpenUntil,
  nextActions,
  refundSplit,
  refusalStatus,
  splitFee,
  TRANSITIONS,
  type JobActor,
  type JobFacts,
  type JobState,
  type TransitionName,
} from "@/lib/jobs";
import { env } from "@/lib/env";
import { paymentClient } from "@/lib/payments/client";
import { fromSqlDateTime, sqlDateTime } from "@/lib/time";
import type { Actor } from "./actor";
import { audit } from "./audit";
import type { Db } from "./db";
import { jobWithPeople } from "./job-query";
import { conflict, HttpError, notFound, parseInput, unprocessable } from "./errors";
import {
  notifyDisputeOpened,
  notifyDisputeSettled,
  notifyFundsReleased,
  notifyPaymentReceived,
  notifyReceipt,
  notifyRefundIssued,
  notifyReviewStarted,
} from "./notify";
import { callOffVisit } from "./site-visits";
import { disputeSchema, settlementSchema } from "@/lib/validation/job";
import type { JobListItem, JobMoney, JobTimelineEntry, JobView } from "@/lib/types/jobs";

export type { JobListItem, JobMoney, JobTimelineEntry, JobView } from "@/lib/types/jobs";

/** What the money transitions need from outside: the payment service and the settings. */
export interface JobServices {
  pay: Stripe;
  appUrl: string;
  feePercent: number;
  disputeWindowDays: number;
}

export function jobServices(overrides: Partial<JobServices> = {}): JobServices {
  const e = env();
  return {
    pay: overrides.pay ?? paymentClient(e),
    appUrl: overrides.appUrl ?? e.APP_URL,
    feePercent: overrides.feePercent ?? e.PLATFORM_FEE_PERCENT,
    disputeWindowDays: overrides.disputeWindowDays ?? e.DISPUTE_WINDOW_DAYS,
  };
}

/** The job row as the transitions see it, locked. */
export interface JobRow {
  id: number;
  requestId: number;
  homeownerId: number;
  reviewerId: number;
  state: JobState;
  amountMinor: number;
  feeMinor: number;
  currency: string;
  checkoutSessionId: string | null;
  paymentIntentId: string | null;
  transferId: string | null;
  checkoutAttempts: number;
  deliveredAt: string | null;
  releaseDueAt: string | null;
}

function toJobRow(r: Record<string, unknown>): JobRow {
  return {
    id: Number(r.id),
    requestId: Number(r.request_id),
    homeownerId: Number(r.homeowner_id),
    reviewerId: Number(r.reviewer_id),
    state: r.state as JobState,
    amountMinor: Number(r.amount_minor),
    feeMinor: Number(r.fee_minor),
    currency: String(r.currency),
    checkoutSessionId: (r.checkout_session_id as string | null) ?? null,
    paymentIntentId: (r.payment_intent_id as string | null) ?? null,
    transferId: (r.transfer_id as string | null) ?? null,
    checkoutAttempts: Number(r.checkout_attempts ?? 0),
    deliveredAt: (r.delivered_at as string | null) ?? null,
    releaseDueAt: (r.release_due_at as string | null) ?? null,
  };
}

const facts = (j: JobRow): JobFacts => ({
  state: j.state,
  homeownerId: j.homeownerId,
  reviewerId: j.reviewerId,
  releaseDueAt: j.releaseDueAt ? fromSqlDateTime(j.releaseDueAt) : null,
});

/** A person takes part in a job when they are its homeowner, its reviewer, or an admin. */
function takesPart(j: JobRow, actor: JobActor): boolean {
  if (actor.role === "system" || actor.role === "admin") return true;
  return actor.role === "homeowner" ? actor.id === j.homeownerId : actor.id === j.reviewerId;
}

async function lockJob(trx: Db, jobId: number): Promise<JobRow | null> {
  const row = await trx("jobs").where({ id: jobId }).forUpdate().first();
  return row ? toJobRow(row) : null;
}

/** The timestamp column each state sets when it is entered. */
const ENTERED_AT: Partial<Record<JobState, string>> = {
  funded: "funded_at",
  in_review: "review_started_at",
  delivered: "delivered_at",
  released: "closed_at",
  partially_refunded: "closed_at",
  refunded: "closed_at",
  cancelled: "closed_at",
};

export interface TransitionContext {
  trx: Db;
  job: JobRow;
  now: Date;
  /** Columns to write with the state change (ids from the payment service, say). */
  set: Record<string, unknown>;
}

/**
 * Take one transition on a job, in one transaction. `work` runs after the checks, with the job
 * locked, before the state is written: it does the transition's own work and may add columns to
 * `set`. A refusal is an HttpError: 404 for someone with no part in the job (ids reveal nothing),
 * 403 for the wrong role, 409 for a state or dispute window that does not allow it.
 */
export async function transitionJob<R = void>(
  db: Db,
  actor: JobActor,
  jobId: number,
  name: TransitionName,
  work?: (ctx: TransitionContext) => Promise<R>,
  opts: { now?: Date; disputeWindowDays?: number; detail?: Record<string, unknown> } = {},
): Promise<{ job: JobRow; result: R | undefined }> {
  const now = opts.now ?? new Date();
  return db.transaction(async (trx) => {
    const job = await lockJob(trx, jobId);
    if (!job || !takesPart(job, actor)) throw notFound("No such job.");
    const check = canTransition(facts(job), name, actor, now);
    if (!check.ok) throw new HttpError(refusalStatus(check.code), check.reason);
    const set: Record<string, unknown> = {};
    const result = work ? await work({ trx, job, now, set }) : undefined;
    const to = check.rule.to;
    const column = ENTERED_AT[to];
    if (column) set[column] = sqlDateTime(now);
    if (to === "delivered")
      set.release_due_at = sqlDateTime(
        disputeOpenUntil(now, opts.disputeWindowDays ?? env().DISPUTE_WINDOW_DAYS),
      );
    await trx("jobs")
      .where({ id: jobId })
      .update({ state: to, ...set });
    await audit(trx, actor.role === "system" ? null : actor.id, `job.${name}`, "job", jobId, {
      from: job.state,
      to,
      ...opts.detail,
    });
    return { job: { ...job, state: to }, result };
  });
}

/** A ledger row, once per idempotency key (a replayed transition writes nothing new). */
async function ledger(
  trx: Db,
  row: {
    jobId: number;
    kind: "charge" | "transfer" | "refund" | "fee";
    amountMinor: number;
    currency: string;
    providerRef?: string | null;
    key: string;
  },
): Promise<void> {
  await trx.raw(
    "INSERT IGNORE INTO ledger_entries (job_id, kind, amount_minor, currency, provider_ref, idempotency_key) VALUES (?, ?, ?, ?, ?, ?)",
    [row.jobId, row.kind, row.amountMinor, row.currency, row.providerRef ?? null, row.key],
  );
}

/** The payment service's refusal or outage as a plain message; nothing has changed. */
function paymentFailure(err: unknown, what: string): HttpError {
  const e = err as { type?: string; message?: string; code?: string };
  if (e?.type === "StripeCardError")
    return new HttpError(409, e.message ?? "The card was declined.");
  if (e?.type === "StripeInvalidRequestError" || e?.type === "StripeIdempotencyError")
    return new HttpError(
      409,
      `The payment service refused ${what}: ${(e.message ?? "no reason given").replace(/\.$/, "")}.`,
    );
  console.error(`[payments] ${what}:`, e?.type ?? "", e?.message ?? err);
  return new HttpError(
    503,
    `The payment service did not answer while ${what}. Nothing has changed; please try again in a moment.`,
  );
}

async function callPayments<T>(what: string, call: () => Promise<T>): Promise<T> {
  try {
    return await call();
  } catch (err) {
    if (err instanceof HttpError) throw err;
    throw paymentFailure(err, what);
  }
}

// ---------------------------------------------------------------- funding

/**
 * The homeowner's way to pay: a hosted checkout session for the quote's amount, in the job's
 * currency, tagged with the job (metadata and transfer group). An open session is reused; a new
 * attempt gets its own idempotency key (job + attempt number). Returns the page to send them to.
 */
export async function startCheckout(
  db: Db,
  actor: Actor,
  jobId: number,
  svc: JobServices = jobServices(),
): Promise<string> {
  return db.transaction(async (trx) => {
    const job = await lockJob(trx, jobId);
    if (!job || !takesPart(job, actor) || actor.role === "reviewer") throw notFound("No such job.");
    if (actor.role !== "homeowner") throw new HttpError(403, "Only the homeowner pays for a job.");
    if (job.state !== "awaiting_payment")
      throw conflict("This job is already paid for, or closed.");
    if (job.checkoutSessionId) {
      const s = await callPayments("looking up the payment", () =>
        svc.pay.checkout.sessions.retrieve(job.checkoutSessionId!).catch((err: unknown) => {
          // A session the service no longer knows is as good as none.
          if ((err as { code?: string }).code === "resource_missing") return null;
          throw err;
        }),
      );
      if (s?.payment_status === "paid")
        throw conflict("This payment has gone through; the job page shows it in a moment.");
      if (s?.status === "open" && s.url) return s.url;
    }
    const info = await trx("jobs as j")
      .join("requests as r", "r.id", "j.request_id")
      .where("j.id", jobId)
      .first("r.kind");
    const attempt = job.checkoutAttempts + 1;
    const session = await callPayments("starting the payment", () =>
      svc.pay.checkout.sessions.create(
        {
          mode: "payment",
          line_items: [
            {
              quantity: 1,
              price_data: {
                currency: job.currency.toLowerCase(),
                unit_amount: job.amountMinor,
                product_data: {
                  name:
                    info?.kind === "site_visit"
                      ? "Loopwright site visit"
                      : "Loopwright remote design check",
                },
              },
            },
          ],
          success_url: `${svc.appUrl}/jobs/${jobId}?checkout=done`,
          cancel_url: `${svc.appUrl}/jobs/${jobId}?checkout=cancelled`,
          client_reference_id: String(jobId),
          metadata: { jobId: String(jobId) },
          payment_intent_data: {
            transfer_group: `job-${jobId}`,
            metadata: { jobId: String(jobId) },
          },
        },
        { idempotencyKey: `job-${jobId}-checkout-${attempt}` },
      ),
    );
    await trx("jobs")
      .where({ id: jobId })
      .update({ checkout_session_id: session.id, checkout_attempts: attempt });
    await audit(trx, actor.id, "job.checkout_started", "job", jobId, { attempt });
    if (!session.url) throw paymentFailure(new Error("no checkout page"), "starting the payment");
    return session.url;
  });
}

/**
 * Record a verified payment: the `fund` transition, as the system, with the charge in the
 * ledger. Safe to call for the same payment any number of times and in any order: a job
 * already past `awaiting_payment` is left as it is. Returns true when this call funded it.
 */
export async function fundJob(
  db: Db,
  jobId: number,
  payment: { sessionId: string; paymentIntentId: string; amountMinor: number; currency: string },
  appUrl = env().APP_URL,
): Promise<boolean> {
  const current = await db("jobs").where({ id: jobId }).first("state", "amount_minor", "currency");
  if (!current || current.state !== "awaiting_payment") return false;
  if (
    payment.amountMinor !== Number(current.amount_minor) ||
    payment.currency.toUpperCase() !== String(current.currency)
  )
    throw unprocessable("The payment does not match the job's amount.");
  try {
    await transitionJob(
      db,
      { role: "system" },
      jobId,
      "fund",
      async ({ trx, job, set }) => {
        set.checkout_session_id = payment.sessionId;
        set.payment_intent_id = payment.paymentIntentId;
        await ledger(trx, {
          jobId,
          kind: "charge",
          amountMinor: job.amountMinor,
          currency: job.currency,
          providerRef: payment.paymentIntentId,
          key: `job-${jobId}-charge`,
        });
        await notifyPaymentReceived(trx, appUrl, jobId);
        await notifyReceipt(trx, appUrl, `job-${jobId}-charge`);
      },
      { detail: { paymentIntent: payment.paymentIntentId } },
    );
    return true;
  } catch (err) {
    // Another delivery of the same payment funded it a moment ago.
    if (err instanceof HttpError && err.status === 409) return false;
    throw err;
  }
}

/**
 * The return page's check, which does not trust the redirect: ask the payment service about the
 * job's checkout session, and fund the job if it is paid (for when the webhook is late).
 */
export async function syncCheckout(
  db: Db,
  actor: Actor,
  jobId: number,
  svc: JobServices = jobServices(),
): Promise<"funded" | "unpaid" | "unchanged"> {
  const view = await getJob(db, actor, jobId);
  if (view.state !== "awaiting_payment") return "unchanged";
  const row = await db("jobs").where({ id: jobId }).first("checkout_session_id");
  if (!row?.checkout_session_id) return "unpaid";
  const s = await callPayments("looking up the payment", () =>
    svc.pay.checkout.sessions.retrieve(row.checkout_session_id),
  );
  if (s.payment_status !== "paid" || !s.payment_intent) return "unpaid";
  const pi = typeof s.payment_intent === "string" ? s.payment_intent : s.payment_intent.id;
  await fundJob(
    db,
    jobId,
    {
      sessionId: s.id,
      paymentIntentId: pi,
      amountMinor: s.amount_total ?? 0,
      currency: s.currency ?? "",
    },
    svc.appUrl,
  );
  return "funded";
}

// ---------------------------------------------------------------- cancelling

/** Before anything is paid: the homeowner cancels the job; nothing to refund. */
export async function cancelJob(db: Db, actor: Actor, jobId: number): Promise<void> {
  await transitionJob(db, actor, jobId, "cancel");
}

/** Paid but not started: the homeowner cancels for a full refund through the payment service. */
export async function cancelJobWithRefund(
  db: Db,
  actor: Actor,
  jobId: number,
  svc: JobServices = jobServices(),
): Promise<void> {
  await transitionJob(db, actor, jobId, "cancelForRefund", async ({ trx, job }) => {
    await refund(trx, job, job.amountMinor, "cancel", svc);
    await callOffVisit(trx, job.id, svc.appUrl);
  });
}

async function refund(
  trx: Db,
  job: JobRow,
  amountMinor: number,
  reason: "cancel" | "settle",
  svc: JobServices,
): Promise<void> {
  if (amountMinor <= 0) return;
  if (!job.paymentIntentId) throw conflict("This job has no payment to refund.");
  const key = `job-${job.id}-refund-${reason}`;
  const r = await callPayments("refunding the payment", () =>
    svc.pay.refunds.create(
      {
        payment_intent: job.paymentIntentId!,
        amount: amountMinor,
        metadata: { jobId: String(job.id) },
      },
      { idempotencyKey: key },
    ),
  );
  await ledger(trx, {
    jobId: job.id,
    kind: "refund",
    amountMinor: -amountMinor,
    currency: job.currency,
    providerRef: r.id,
    key,
  });
  await notifyRefundIssued(trx, svc.appUrl, job.id, amountMinor);
  await notifyReceipt(trx, svc.appUrl, key);
}

// ---------------------------------------------------------------- paying out

async function payoutAccount(trx: Db, reviewerId: number): Promise<string> {
  const p = await trx("reviewer_profiles")
    .where({ user_id: reviewerId })
    .first("payment_account_id", "payouts_enabled");
  if (!p?.payment_account_id || !p.payouts_enabled)
    throw conflict(
      "The reviewer's payout account is not set up yet, so the payment stays held until it is.",
    );
  return String(p.payment_account_id);
}

/** One transfer of `payoutMinor` to the reviewer, and the fee the platform keeps, in the ledger. */
async function payOut(
  trx: Db,
  job: JobRow,
  payoutMinor: number,
  feeMinor: number,
  svc: JobServices,
  set: Record<string, unknown>,
): Promise<void> {
  if (payoutMinor > 0) {
    const destination = await payoutAccount(trx, job.reviewerId);
    const key = `job-${job.id}-transfer`;
    const t = await callPayments("paying the reviewer", () =>
      svc.pay.transfers.create(
        {
          amount: payoutMinor,
          currency: job.currency.toLowerCase(),
          destination,
          transfer_group: `job-${job.id}`,
          metadata: { jobId: String(job.id) },
        },
        { idempotencyKey: key },
      ),
    );
    set.transfer_id = t.id;
    await ledger(trx, {
      jobId: job.id,
      kind: "transfer",
      amountMinor: payoutMinor,
      currency: job.currency,
      providerRef: t.id,
      key,
    });
  }
  if (feeMinor > 0)
    await ledger(trx, {
      jobId: job.id,
      kind: "fee",
      amountMinor: feeMinor,
      currency: job.currency,
      key: `job-${job.id}-fee`,
    });
}

/**
 * Release the held payment to the reviewer, less the platform fee: the homeowner after reading
 * the report, or the system (the worker) once the dispute window has closed.
 */
export async function releaseJob(
  db: Db,
  actor: JobActor,
  jobId: number,
  svc: JobServices = jobServices(),
  now = new Date(),
): Promise<void> {
  await transitionJob(
    db,
    actor,
    jobId,
    "release",
    async ({ trx, job, set }) => {
      const split = splitFee(job.amountMinor, svc.feePercent);
      await payOut(trx, job, split.payoutMinor, split.feeMinor, svc, set);
      set.fee_minor = split.feeMinor;
      await notifyFundsReleased(trx, svc.appUrl, jobId);
    },
    { now, detail: { by: actor.role === "system" ? "dispute window closed" : "homeowner" } },
  );
}

/**
 * The worker's pass: every delivered job whose dispute window has closed is released. A job the
 * system cannot release yet (the reviewer's payout account not ready, the service away) stays
 * delivered and is tried again on the next pass. Returns how many were released.
 */
export async function releaseDueJobs(
  db: Db,
  now = new Date(),
  svc: JobServices = jobServices(),
): Promise<{ released: number; waiting: number }> {
  const due = await db("jobs")
    .where({ state: "delivered" })
    .andWhere("release_due_at", "<=", sqlDateTime(now))
    .orderBy("release_due_at")
    .limit(200)
    .select("id");
  let released = 0;
  let waiting = 0;
  for (const { id } of due) {
    try {
      await releaseJob(db, { role: "system" }, Number(id), svc, now);
      released += 1;
    } catch (err) {
      if (!(err instanceof HttpError)) throw err;
      waiting += 1;
    }
  }
  return { released, waiting };
}

// ---------------------------------------------------------------- disputes

/** Within the window, the homeowner disputes the report: the payment stays held. */
export async function openDispute(
  db: Db,
  actor: Actor,
  jobId: number,
  input: unknown,
  appUrl = env().APP_URL,
): Promise<void> {
  const v = parseInput(disputeSchema, input);
  await transitionJob(db, actor, jobId, "openDispute", async ({ trx }) => {
    await trx("disputes").insert({ job_id: jobId, opened_by: actor.id, reason: v.reason });
    await notifyDisputeOpened(trx, appUrl, jobId, v.reason);
  });
}

/**
 * An admin settles a dispute: release in full, refund part (an amount) and pay the rest out
 * less the fee on that part, or refund in full. Refunds and the transfer go through the payment
 * service with keys of their own, so a retried settlement moves nothing twice.
 */
export async function settleDispute(
  db: Db,
  actor: Actor,
  jobId: number,
  input: unknown,
  svc: JobServices = jobServices(),
): Promise<void> {
  const v = parseInput(settlementSchema, input);
  const name: TransitionName =
    v.resolution === "release"
      ? "settleRelease"
      : v.resolution === "partial_refund"
        ? "settlePartialRefund"
        : "settleFullRefund";
  await transitionJob(
    db,
    actor,
    jobId,
    name,
    async ({ trx, job, set, now }) => {
      const refundMinor =
        v.resolution === "release"
          ? 0
          : v.resolution === "full_refund"
            ? job.amountMinor
            : v.refundMinor;
      if (v.resolution === "partial_refund" && (refundMinor <= 0 || refundMinor >= job.amountMinor))
        throw unprocessable("Some details need attention.", {
          refundMinor: ["A part refund is more than nothing and less than the whole payment"],
        });
      const split = refundSplit(job.amountMinor, refundMinor, svc.feePercent);
      await refund(trx, job, split.refundMinor, "settle", svc);
      await payOut(trx, job, split.payoutMinor, split.feeMinor, svc, set);
      set.fee_minor = split.feeMinor;
      await trx("disputes")
        .where({ job_id: jobId })
        .update({
          status: "settled",
          resolution: v.resolution,
          refund_minor: split.refundMinor || null,
          settled_by: actor.id,
          admin_note: v.note || null,
          settled_at: sqlDateTime(now),
        });
      await notifyDisputeSettled(trx, svc.appUrl, jobId, v.resolution);
    },
    { detail: { resolution: v.resolution } },
  );
}

// ---------------------------------------------------------------- the review's transitions

/** The job's reviewer starts work (funded → in review); the homeowner can no longer cancel. */
export async function startReview(
  db: Db,
  actor: Actor,
  jobId: number,
  work?: (ctx: TransitionContext) => Promise<void>,
  appUrl = env().APP_URL,
): Promise<void> {
  await transitionJob(db, actor, jobId, "startReview", async (ctx) => {
    if (work) await work(ctx);
    await notifyReviewStarted(ctx.trx, appUrl, jobId);
  });
}

// ---------------------------------------------------------------- reading

/** One job for the job page: its homeowner, its reviewer and admins; anyone else 404. */
export async function getJob(
  db: Db,
  actor: Actor,
  jobId: number,
  now = new Date(),
): Promise<JobView> {
  const r = await jobWithPeople(db, jobId)
    .leftJoin("disputes as d", "d.job_id", "j.id")
    .first(
      "j.*",
      "q.kind",
      "q.window_start",
      "q.window_end",
      "p.id as project_id",
      "p.title",
      "h.display_name as homeowner_name",
      "v.display_name as reviewer_name",
      "rp.trading_name",
      "rp.payouts_enabled",
      "d.reason as dispute_reason",
      "d.status as dispute_status",
      "d.resolution as dispute_resolution",
      "d.refund_minor as dispute_refund_minor",
      "d.admin_note as dispute_note",
      "d.created_at as dispute_opened_at",
    );
  if (!r) throw notFound("No such job.");
  const job = toJobRow(r);
  if (!takesPart(job, actor)) throw notFound("No such job.");
  const [money, timeline] = await Promise.all([jobMoney(db, job), jobTimeline(db, jobId)]);
  const viewer = { id: actor.id, role: actor.role } as JobActor;
  return {
    id: job.id,
    requestId: job.requestId,
    projectId: Number(r.project_id),
    // The homeowner's project title can carry their address: the reviewer sees it once accepted.
    projectTitle: r.title,
    kind: r.kind,
    state: job.state,
    homeownerId: job.homeownerId,
    homeownerName: r.homeowner_name,
    reviewerId: job.reviewerId,
    reviewerName: r.trading_name ?? r.reviewer_name,
    payoutAccountReady: Boolean(r.payouts_enabled),
    currency: job.currency,
    money,
    createdAt: String(r.created_at),
    fundedAt: r.funded_at,
    reviewStartedAt: r.review_started_at,
    deliveredAt: r.delivered_at,
    releaseDueAt: r.release_due_at,
    closedAt: r.closed_at,
    windowStart: r.window_start,
    windowEnd: r.window_end,
    visit: r.visit_at
      ? {
          at: String(r.visit_at),
          state: r.visit_state,
          note: r.visit_note ?? null,
          sequence: Number(r.visit_sequence),
        }
      : null,
    dispute: r.dispute_status
      ? {
          reason: r.dispute_reason,
          status: r.dispute_status,
          resolution: r.dispute_resolution,
          refundMinor: r.dispute_refund_minor === null ? null : Number(r.dispute_refund_minor),
          note: r.dispute_note,
          openedAt: String(r.dispute_opened_at),
        }
      : null,
    timeline,
    actions: nextActions(facts(job), viewer, now).map((t) => t.name),
  };
}

async function jobMoney(db: Db, job: JobRow): Promise<JobMoney> {
  const rows = await db("ledger_entries")
    .where({ job_id: job.id })
    .groupBy("kind")
    .select("kind", db.raw("SUM(amount_minor) AS total"));
  const sum = (k: string) => Number(rows.find((r) => r.kind === k)?.total ?? 0);
  const charged = sum("charge");
  const refunded = 0 - sum("refund");
  const paidOut = sum("transfer");
  const fee = sum("fee");
  return {
    amountMinor: job.amountMinor,
    chargedMinor: charged,
    refundedMinor: refunded,
    paidOutMinor: paidOut,
    feeMinor: fee,
    heldMinor: charged - refunded - paidOut - fee,
    expectedFeeMinor: job.feeMinor,
    expectedPayoutMinor: job.amountMinor - job.feeMinor,
  };
}

async function jobTimeline(db: Db, jobId: number): Promise<JobTimelineEntry[]> {
  const rows = await db("audit_log as a")
    .leftJoin("users as u", "u.id", "a.actor_id")
    .where({ "a.entity_type": "job", "a.entity_id": jobId })
    .orderBy("a.id")
    .select("a.action", "a.detail", "a.created_at", "u.role");
  return rows.map((r) => {
    const detail = typeof r.detail === "string" ? JSON.parse(r.detail) : (r.detail ?? {});
    return {
      action: String(r.action),
      to: (detail.to as JobState | undefined) ?? null,
      by: (r.role as string | null) ?? "system",
      at: String(r.created_at),
      visitAt: typeof detail.visitAt === "string" ? detail.visitAt : null,
    };
  });
}

/** The signed-in person's jobs, newest first, for the dashboard. */
export async function listJobs(db: Db, actor: Actor): Promise<JobListItem[]> {
  const q = db("jobs as j")
    .join("requests as r", "r.id", "j.request_id")
    .join("projects as p", "p.id", "r.project_id")
    .leftJoin("reviewer_profiles as rp", "rp.user_id", "j.reviewer_id")
    .orderBy("j.id", "desc")
    .limit(200)
    .select(
      "j.id",
      "j.state",
      "j.amount_minor",
      "j.currency",
      "j.updated_at",
      "r.kind",
      "p.title",
      "p.region",
      "rp.trading_name",
    );
  if (actor.role === "homeowner") q.where("j.homeowner_id", actor.id);
  else if (actor.role === "reviewer") q.where("j.reviewer_id", actor.id);
  const rows = await q;
  return rows.map((r) => ({
    id: Number(r.id),
    state: r.state,
    kind: r.kind,
    // Reviewers see the job by its region until they open it; homeowners by their own title.
    title:
      actor.role === "homeowner" || actor.role === "admin"
        ? r.title
        : `${r.kind === "site_visit" ? "Site visit" : "Remote design check"}, ${r.region ?? ""}`,
    reviewerName: r.trading_name ?? null,
    amountMinor: Number(r.amount_minor),
    currency: r.currency,
    updatedAt: String(r.updated_at),
  }));
}

/** What each transition is called on a button, for the job page. */
export const TRANSITION_LABELS = Object.fromEntries(
  Object.values(TRANSITIONS).map((t) => [t.name, t.label]),
) as Record<TransitionName, string>;

export interface DisputeSummary {
  jobId: number;
  projectTitle: string;
  reviewerName: string;
  homeownerName: string;
  amountMinor: number;
  currency: string;
  reason: string;
  openedAt: string;
}

/** Admin: the open disputes, oldest first, to settle. */
export async function listOpenDisputes(db: Db, actor: Actor): Promise<DisputeSummary[]> {
  if (actor.role !== "admin")
    throw new HttpError(403, "Only the Loopwright team settles disputes.");
  const rows = await db("disputes as d")
    .join("jobs as j", "j.id", "d.job_id")
    .join("requests as r", "r.id", "j.request_id")
    .join("projects as p", "p.id", "r.project_id")
    .join("users as h", "h.id", "j.homeowner_id")
    .join("users as v", "v.id", "j.reviewer_id")
    .leftJoin("reviewer_profiles as rp", "rp.user_id", "j.reviewer_id")
    .where("d.status", "open")
    .orderBy("d.created_at")
    .select(
      "j.id",
      "p.title",
      "rp.trading_name",
      "v.display_name as reviewer_name",
      "h.display_name as homeowner_name",
      "j.amount_minor",
      "j.currency",
      "d.reason",
      "d.created_at",
    );
  return rows.map((r) => ({
    jobId: Number(r.id),
    projectTitle: r.title,
    reviewerName: r.trading_name ?? r.reviewer_name,
    homeownerName: r.homeowner_name,
    amountMinor: Number(r.amount_minor),
    currency: r.currency,
    reason: r.reason,
    openedAt: String(r.created_at),
  }));
}
