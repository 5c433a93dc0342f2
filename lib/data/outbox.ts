/**
 * The e-mail outbox. `enqueueEmail` is called inside the transaction of the change that causes
 * the e-mail, so either both are written or neither. The worker (lib/worker/mail.ts) sends.
 */
import { OPTIONAL_TEMPLATES, type TemplateName, type TemplatePayloads } from "@/lib/mail/kinds";
import type { MailAttachment } from "@/lib/mail/calendar";
import { sqlDateTime } from "@/lib/time";
import type { Actor } from "./actor";
import type { Db } from "./db";
import { forbidden } from "./errors";

export interface EnqueueEmail<K extends TemplateName> {
  to: { address: string; userId?: number | null };
  template: K;
  payload: TemplatePayloads[K];
  /** Set when one event must never produce two e-mails; a repeat is silently ignored. */
  dedupeKey?: string;
  /** Files sent with it (a calendar invitation), stored with the row. */
  attachments?: MailAttachment[];
  /** Hold the e-mail this long before the worker may send it (so related events can batch). */
  delayMs?: number;
}

export type EnqueueResult = "queued" | "duplicate" | "opted_out";

const PREFERENCE_COLUMN: Record<
  (typeof OPTIONAL_TEMPLATES)[number],
  "notify_new_message" | "notify_new_quote"
> = {
  new_message: "notify_new_message",
  new_quote: "notify_new_quote",
};

export async function enqueueEmail<K extends TemplateName>(
  trx: Db,
  e: EnqueueEmail<K>,
): Promise<EnqueueResult> {
  const optional = (OPTIONAL_TEMPLATES as readonly string[]).includes(e.template);
  if (optional && e.to.userId) {
    const column = PREFERENCE_COLUMN[e.template as (typeof OPTIONAL_TEMPLATES)[number]];
    const user = await trx("users").where({ id: e.to.userId }).first(column);
    if (user && !user[column]) return "opted_out";
  }
  const row = {
    to_user_id: e.to.userId ?? null,
    to_address: e.to.address,
    template: e.template,
    payload: JSON.stringify(e.payload),
    dedupe_key: e.dedupeKey ?? null,
    attachments: e.attachments?.length ? JSON.stringify(e.attachments) : null,
    next_attempt_at: sqlDateTime(new Date(Date.now() + (e.delayMs ?? 0))),
  };
  if (e.dedupeKey) {
    // INSERT IGNORE keeps the transaction alive on a repeated key (a plain insert would abort it).
    const [result] = (await trx.raw(
      "INSERT IGNORE INTO email_outbox (to_user_id, to_address, template, payload, dedupe_key, attachments, next_attempt_at) VALUES (?, ?, ?, ?, ?, ?, ?)",
      [
        row.to_user_id,
        row.to_address,
        row.template,
        row.payload,
        row.dedupe_key,
        row.attachments,
        row.next_attempt_at,
      ],
    )) as [{ affectedRows: number }];
    return result.affectedRows === 1 ? "queued" : "duplicate";
  }
  await trx("email_outbox").insert(row);
  return "queued";
}

/** A row the worker has claimed and must now send. */
export interface OutboxRow {
  id: number;
  to_address: string;
  template: string;
  payload: string | Record<string, unknown>;
  attachments: string | MailAttachment[] | null;
  attempts: number;
}

/** A row left `sending` by a worker that died is taken again after this long. */
export const CLAIM_TIMEOUT_MS = 2 * 60_000;

/**
 * Claim up to `limit` due rows for `workerId`. READ COMMITTED keeps InnoDB from taking gap
 * locks on the scan, which SKIP LOCKED cannot skip and which deadlock two claimants; a
 * deadlock that still happens is retried.
 */
export async function claimOutboxBatch(
  db: Db,
  workerId: string,
  limit: number,
  now = new Date(),
): Promise<OutboxRow[]> {
  for (let attempt = 1; ; attempt++) {
    try {
      return await claimOnce(db, workerId, limit, now);
    } catch (err) {
      const code = (err as { errno?: number }).errno;
      if ((code === 1213 || code === 1205) && attempt < 5) continue;
      throw err;
    }
  }
}

async function claimOnce(db: Db, workerId: string, limit: number, now: Date): Promise<OutboxRow[]> {
  return db.transaction(
    async (trx) => {
      const stale = sqlDateTime(now, -CLAIM_TIMEOUT_MS);
      const rows = (await trx("email_outbox")
        .select("id", "to_address", "template", "payload", "attachments", "attempts")
        .where((q) =>
          q.where({ status: "pending" }).andWhere("next_attempt_at", "<=", sqlDateTime(now)),
        )
        .orWhere((q) => q.where({ status: "sending" }).andWhere("claimed_at", "<", stale))
        .orderBy("id")
        .limit(limit)
        .forUpdate()
        .skipLocked()) as OutboxRow[];
      if (rows.length) {
        await trx("email_outbox")
          .whereIn(
            "id",
            rows.map((r) => r.id),
          )
          .update({ status: "sending", claimed_by: workerId, claimed_at: sqlDateTime(now) });
      }
      return rows;
    },
    { isolationLevel: "read committed" },
  );
}

/** The SMTP server accepted the row's message. Only the claimant may mark it. */
export async function markOutboxSent(
  db: Db,
  id: number,
  workerId: string,
  attempts: number,
  providerMessageId: string | null,
): Promise<void> {
  await db("email_outbox").where({ id, claimed_by: workerId }).update({
    status: "sent",
    attempts,
    sent_at: sqlDateTime(),
    provider_message_id: providerMessageId,
    last_error: null,
  });
}

/** A send failed: back to `pending` after `retryInMs`, or `failed` for good when permanent. */
export async function markOutboxFailed(
  db: Db,
  id: number,
  workerId: string,
  attempts: number,
  error: string,
  permanent: boolean,
  retryInMs: number,
): Promise<void> {
  await db("email_outbox")
    .where({ id, claimed_by: workerId })
    .update({
      status: permanent ? "failed" : "pending",
      attempts,
      last_error: error.slice(0, 2000),
      next_attempt_at: sqlDateTime(new Date(), retryInMs),
      claimed_by: null,
      claimed_at: null,
    });
}

export interface OutboxEntry {
  id: number;
  toAddress: string;
  template: string;
  status: "pending" | "sending" | "sent" | "failed";
  attempts: number;
  lastError: string | null;
  createdAt: string;
}

/** Admin: e-mails not yet sent, and those that failed for good, newest first. */
export async function listUnsentEmails(db: Db, actor: Actor, limit = 200): Promise<OutboxEntry[]> {
  if (actor.role !== "admin") throw forbidden();
  const rows = await db("email_outbox")
    .whereIn("status", ["failed", "pending", "sending"])
    .orderBy("id", "desc")
    .limit(limit)
    .select("id", "to_address", "template", "status", "attempts", "last_error", "created_at");
  return rows.map((r) => ({
    id: Number(r.id),
    toAddress: r.to_address,
    template: r.template,
    status: r.status,
    attempts: r.attempts,
    lastError: r.last_error,
    createdAt: String(r.created_at),
  }));
}
