/**
 * What the payment service tells us (webhook events), reviewers' payout accounts, the ledger's
 * pages and the reconciliation of the ledger against the payment service's own records.
 */
import type Stripe from "stripe";
import { env } from "@/lib/env";
import { sqlDateTime } from "@/lib/time";
import type { Actor } from "./actor";
import { audit } from "./audit";
import type { Db } from "./db";
import { conflict, forbidden } from "./errors";
import { fundJob, jobServices, type JobServices } from "./jobs";
import { notifyPayoutAccountReady } from "./notify";
import type { LedgerRow, ReconciliationReport, ReviewerEarnings } from "@/lib/types/payments";

export type { LedgerRow, ReconciliationReport, ReviewerEarnings } from "@/lib/types/payments";

const jobIdOf = (metadata: Stripe.Metadata | null | undefined): number | null => {
  const n = Number(metadata?.jobId);
  return Number.isInteger(n) && n > 0 ? n : null;
};

/**
 * Handle one verified webhook event. Each event id is stored once: a repeat is a no-op. The
 * handlers themselves are idempotent too (funding a funded job changes nothing), so events that
 * arrive late or out of order change nothing twice. Returns what happened, for the log.
 */
export async function handlePaymentEvent(
  db: Db,
  event: Stripe.Event,
  appUrl = env().APP_URL,
): Promise<"duplicate" | "handled" | "ignored"> {
  const [inserted] = (await db.raw(
    "INSERT IGNORE INTO payment_events (event_id, type, payload) VALUES (?, ?, ?)",
    [event.id, event.type, JSON.stringify(event)],
  )) as [{ affectedRows: number }];
  if (inserted.affectedRows === 0) {
    const seen = await db("payment_events").where({ event_id: event.id }).first("processed_at");
    // Stored but not processed: the handler failed last time; the service retries, so do we.
    if (seen?.processed_at) return "duplicate";
  }
  let outcome: "handled" | "ignored" = "ignored";
  if (
    event.type === "checkout.session.completed" ||
    event.type === "checkout.session.async_payment_succeeded"
  ) {
    const s = event.data.object as Stripe.Checkout.Session;
    const jobId = jobIdOf(s.metadata);
    if (jobId && s.payment_status === "paid" && s.payment_intent) {
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
        appUrl,
      );
      outcome = "handled";
    }
  } else if (event.type === "payment_intent.payment_failed") {
    const pi = event.data.object as Stripe.PaymentIntent;
    const jobId = jobIdOf(pi.metadata);
    if (jobId) {
      await audit(db, null, "job.payment_failed", "job", jobId, {
        reason: pi.last_payment_error?.message ?? "declined",
      });
      outcome = "handled";
    }
  } else if (event.type === "account.updated") {
    const a = event.data.object as Stripe.Account;
    await markPayoutAccount(db, a, appUrl);
    outcome = "handled";
  }
  await db("payment_events").where({ event_id: event.id }).update({ processed_at: sqlDateTime() });
  return outcome;
}

async function markPayoutAccount(db: Db, a: Stripe.Account, appUrl: string): Promise<void> {
  const ready = Boolean(a.payouts_enabled && a.details_submitted);
  await db.transaction(async (trx) => {
    const p = await trx("reviewer_profiles")
      .where({ payment_account_id: a.id })
      .forUpdate()
      .first("user_id", "payouts_enabled");
    if (!p) return;
    if (Boolean(p.payouts_enabled) === ready) return;
    await trx("reviewer_profiles")
      .where({ user_id: p.user_id })
      .update({ payouts_enabled: ready, payouts_ready_at: ready ? sqlDateTime() : null });
    await audit(trx, null, ready ? "payout.ready" : "payout.paused", "reviewer", Number(p.user_id));
    if (ready) await notifyPayoutAccountReady(trx, appUrl, Number(p.user_id));
  });
}

// ---------------------------------------------------------------- payout accounts

export interface PayoutAccountStatus {
  accountId: string | null;
  ready: boolean;
}

export async function getPayoutAccount(db: Db, actor: Actor): Promise<PayoutAccountStatus> {
  if (actor.role !== "reviewer") throw forbidden("Only reviewers have payout accounts.");
  const p = await db("reviewer_profiles")
    .where({ user_id: actor.id })
    .first("payment_account_id", "payouts_enabled");
  return { accountId: p?.payment_account_id ?? null, ready: Boolean(p?.payouts_enabled) };
}

/**
 * A reviewer sets up (or finishes setting up) their payout account: an express account is made
 * once (idempotency key per reviewer), and a fresh onboarding link is returned to send them to.
 */
export async function startPayoutSetup(
  db: Db,
  actor: Actor,
  svc: JobServices = jobServices(),
): Promise<string> {
  if (actor.role !== "reviewer") throw forbidden("Only reviewers have payout accounts.");
  const profile = await db("reviewer_profiles")
    .where({ user_id: actor.id })
    .first("payment_account_id", "payouts_enabled");
  if (!profile) throw conflict("Fill in your trade profile first.");
  let accountId: string | null = profile.payment_account_id;
  if (!accountId) {
    const user = await db("users").where({ id: actor.id }).first("email");
    const account = await svc.pay.accounts.create(
      { type: "express", email: user?.email, metadata: { reviewerId: String(actor.id) } },
      { idempotencyKey: `reviewer-${actor.id}-payout-account` },
    );
    accountId = account.id;
    await db("reviewer_profiles")
      .where({ user_id: actor.id })
      .update({ payment_account_id: accountId });
    await audit(db, actor.id, "payout.account_created", "reviewer", actor.id);
  }
  const link = await svc.pay.accountLinks.create({
    account: accountId,
    type: "account_onboarding",
    refresh_url: `${svc.appUrl}/reviewer/earnings?setup=again`,
    return_url: `${svc.appUrl}/reviewer/earnings?setup=done`,
  });
  return link.url;
}

/** The return page's check: ask the service whether the payout account is ready now. */
export async function syncPayoutAccount(
  db: Db,
  actor: Actor,
  svc: JobServices = jobServices(),
): Promise<PayoutAccountStatus> {
  const status = await getPayoutAccount(db, actor);
  if (!status.accountId || status.ready) return status;
  const a = await svc.pay.accounts.retrieve(status.accountId);
  await markPayoutAccount(db, a, svc.appUrl);
  return getPayoutAccount(db, actor);
}

// ---------------------------------------------------------------- the ledger

const toLedgerRow = (r: Record<string, unknown>): LedgerRow => ({
  id: Number(r.id),
  jobId: r.job_id === null ? null : Number(r.job_id),
  kind: r.kind as LedgerRow["kind"],
  amountMinor: Number(r.amount_minor),
  currency: String(r.currency),
  providerRef: (r.provider_ref as string | null) ?? null,
  createdAt: String(r.created_at),
});

/** The reviewer's earnings: what was paid out to them, and what is held for their jobs. */
export async function getReviewerEarnings(db: Db, actor: Actor): Promise<ReviewerEarnings> {
  if (actor.role !== "reviewer") throw forbidden("Only reviewers have earnings.");
  const rows = await db("ledger_entries as l")
    .join("jobs as j", "j.id", "l.job_id")
    .where("j.reviewer_id", actor.id)
    .where("l.kind", "transfer")
    .orderBy("l.id", "desc")
    .limit(500)
    .select("l.*");
  const held = await db("jobs")
    .where({ reviewer_id: actor.id })
    .whereIn("state", ["funded", "in_review", "delivered", "disputed"])
    .select("currency", db.raw("SUM(amount_minor - fee_minor) AS total"), db.raw("COUNT(*) AS n"))
    .groupBy("currency");
  return {
    payouts: rows.map(toLedgerRow),
    paidOutMinor: rows.reduce((a, r) => a + Number(r.amount_minor), 0),
    heldForYou: held.map((h) => ({
      currency: String(h.currency),
      amountMinor: Number(h.total),
      jobs: Number(h.n),
    })),
  };
}

/** Admin: every ledger row, newest first, with the totals by kind. */
export async function listLedger(
  db: Db,
  actor: Actor,
  limit = 200,
): Promise<{ rows: LedgerRow[]; totals: Record<LedgerRow["kind"], number>; heldMinor: number }> {
  if (actor.role !== "admin") throw forbidden();
  const [rows, sums] = await Promise.all([
    db("ledger_entries").orderBy("id", "desc").limit(limit).select("*"),
    db("ledger_entries").groupBy("kind").select("kind", db.raw("SUM(amount_minor) AS total")),
  ]);
  const totals = { charge: 0, refund: 0, transfer: 0, fee: 0 };
  for (const s of sums) totals[s.kind as LedgerRow["kind"]] = Number(s.total);
  return {
    rows: rows.map(toLedgerRow),
    totals,
    // Refunds are stored negative: held = charges + refunds − transfers − fees.
    heldMinor: totals.charge + totals.refund - totals.transfer - totals.fee,
  };
}

/**
 * Admin: compare the ledger with the payment service, job by job, to the minor unit: the amount
 * received on the payment, the refunds on it, and the transfers in the job's transfer group.
 * Every difference is listed; an empty list means the two agree.
 */
export async function reconcile(
  db: Db,
  actor: Actor,
  svc: JobServices = jobServices(),
): Promise<ReconciliationReport> {
  if (actor.role !== "admin") throw forbidden();
  const jobs = await db("jobs").whereNotNull("payment_intent_id").select("id", "payment_intent_id");
  const differences: ReconciliationReport["differences"] = [];
  for (const j of jobs) {
    const sums = await db("ledger_entries")
      .where({ job_id: j.id })
      .groupBy("kind")
      .select("kind", db.raw("SUM(amount_minor) AS total"));
    const ours = (k: string) => Number(sums.find((s) => s.kind === k)?.total ?? 0);
    let charged = 0;
    let refunded = 0;
    let transferred = 0;
    try {
      const pi = await svc.pay.paymentIntents.retrieve(j.payment_intent_id);
      charged = pi.amount_received ?? 0;
      const refunds = await svc.pay.refunds.list({
        payment_intent: j.payment_intent_id,
        limit: 100,
      });
      refunded = refunds.data
        .filter((r) => r.status !== "failed" && r.status !== "canceled")
        .reduce((a, r) => a + r.amount, 0);
      const transfers = await svc.pay.transfers.list({ transfer_group: `job-${j.id}`, limit: 100 });
      transferred = transfers.data.reduce((a, t) => a + t.amount - (t.amount_reversed ?? 0), 0);
    } catch (err) {
      differences.push({
        jobId: Number(j.id),
        what: "lookup",
        ledgerMinor: 0,
        serviceMinor: 0,
        note: `The payment service could not be asked: ${(err as Error).message}`,
      });
      continue;
    }
    const compare = (
      what: "charge" | "refund" | "transfer",
      ledgerMinor: number,
      serviceMinor: number,
    ) => {
      if (ledgerMinor !== serviceMinor)
        differences.push({ jobId: Number(j.id), what, ledgerMinor, serviceMinor, note: null });
    };
    compare("charge", ours("charge"), charged);
    compare("refund", 0 - ours("refund"), refunded);
    compare("transfer", ours("transfer"), transferred);
  }
  return {
    checkedJobs: jobs.length,
    differences,
    at: sqlDateTime(),
  };
}
