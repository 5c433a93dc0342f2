/**
 * Receipts: every charge and refund in the ledger is one, for the homeowner who paid (and
 * admins). Read-only over ledger_entries; the e-mail is queued by notifyReceipt in the
 * transaction that writes the row.
 */
import type { Actor } from "./actor";
import type { Db } from "./db";
import { jobWithPeople } from "./job-query";
import { notFound } from "./errors";
import { receiptNumber } from "./notify";
import type { Receipt } from "@/lib/types/receipts";

export type { Receipt } from "@/lib/types/receipts";

/** The job's receipts, oldest first; 404 for anyone but its homeowner and admins. */
export async function listReceipts(db: Db, actor: Actor, jobId: number): Promise<Receipt[]> {
  const job = await jobWithPeople(db, jobId).first(
    "j.id",
    "j.homeowner_id",
    "q.kind",
    "p.title",
    "h.display_name as payer_name",
    "h.email as payer_email",
    "v.display_name as reviewer_name",
    "rp.trading_name",
  );
  const allowed =
    job &&
    (actor.role === "admin" ||
      (actor.role === "homeowner" && actor.id === Number(job.homeowner_id)));
  if (!allowed) throw notFound("No such receipt.");
  const rows = await db("ledger_entries")
    .where({ job_id: jobId })
    .whereIn("kind", ["charge", "refund"])
    .orderBy("id")
    .select("id", "kind", "amount_minor", "currency", "provider_ref", "created_at");
  const charge = rows.find((r) => r.kind === "charge");
  return rows.map((r) => ({
    ledgerId: Number(r.id),
    number: receiptNumber(Number(r.id)),
    kind: r.kind === "charge" ? "payment" : "refund",
    amountMinor: Math.abs(Number(r.amount_minor)),
    currency: String(r.currency),
    at: String(r.created_at),
    providerRef: (r.provider_ref as string | null) ?? null,
    jobId,
    service: job.kind,
    projectTitle: job.title,
    reviewerName: job.trading_name ?? job.reviewer_name,
    payerName: job.payer_name,
    payerEmail: job.payer_email,
    refundOf: r.kind === "refund" && charge ? receiptNumber(Number(charge.id)) : null,
  }));
}

/** One receipt by its ledger row; 404 when it is not one of this job's charges or refunds. */
export async function getReceipt(
  db: Db,
  actor: Actor,
  jobId: number,
  ledgerId: number,
): Promise<Receipt> {
  const found = (await listReceipts(db, actor, jobId)).find((r) => r.ledgerId === ledgerId);
  if (!found) throw notFound("No such receipt.");
  return found;
}
