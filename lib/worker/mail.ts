/**
 * Sends what the outbox holds. Safe to run in several processes at once: rows are claimed with
 * SELECT … FOR UPDATE SKIP LOCKED and marked `sending` by the claimant before the SMTP call, so
 * no two workers take the same row. Each row is marked `sent` right after the server accepts it.
 * A row left in `sending` by a worker that died is taken again after CLAIM_TIMEOUT_MS; its
 * Message-ID is fixed by the row id, so a receiving system can recognise the rare repeat.
 */
import type { Knex } from "knex";
import nodemailer, { type Transporter } from "nodemailer";
import { isTemplateName, renderEmail } from "@/lib/mail/templates";

export const MAX_ATTEMPTS = 8;
export const CLAIM_TIMEOUT_MS = 2 * 60_000;

/** Exponential backoff: 30 s, 1 min, 2 min … capped at 1 h. */
export function backoffMs(attempts: number): number {
  return Math.min(30_000 * 2 ** Math.max(0, attempts - 1), 3_600_000);
}

export interface MailTransportOptions {
  host: string;
  port: number;
  from: string;
}

export function createTransport(o: MailTransportOptions): Transporter {
  return nodemailer.createTransport({
    host: o.host,
    port: o.port,
    secure: false,
    ignoreTLS: true,
    // A small pool: one SMTP connection carries many messages.
    pool: true,
    maxConnections: 2,
    connectionTimeout: 5000,
    greetingTimeout: 5000,
    socketTimeout: 10_000,
  });
}

interface OutboxRow {
  id: number;
  to_address: string;
  template: string;
  payload: string | Record<string, unknown>;
  attempts: number;
}

const toSql = (d: Date) => d.toISOString().slice(0, 23).replace("T", " ");

/**
 * Claim up to `limit` due rows for `workerId`. READ COMMITTED keeps InnoDB from taking gap
 * locks on the scan, which SKIP LOCKED cannot skip and which deadlock two claimants; a
 * deadlock that still happens is retried.
 */
export async function claimBatch(
  knex: Knex,
  workerId: string,
  limit: number,
  now = new Date(),
): Promise<OutboxRow[]> {
  for (let attempt = 1; ; attempt++) {
    try {
      return await claimOnce(knex, workerId, limit, now);
    } catch (err) {
      const code = (err as { errno?: number }).errno;
      if ((code === 1213 || code === 1205) && attempt < 5) continue;
      throw err;
    }
  }
}

async function claimOnce(
  knex: Knex,
  workerId: string,
  limit: number,
  now: Date,
): Promise<OutboxRow[]> {
  return knex.transaction(
    async (trx) => {
      const stale = toSql(new Date(now.getTime() - CLAIM_TIMEOUT_MS));
      const rows = (await trx("email_outbox")
        .select("id", "to_address", "template", "payload", "attempts")
        .where((q) => q.where({ status: "pending" }).andWhere("next_attempt_at", "<=", toSql(now)))
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
          .update({ status: "sending", claimed_by: workerId, claimed_at: toSql(now) });
      }
      return rows;
    },
    { isolationLevel: "read committed" },
  );
}

/** The SMTP reply code of a failure: 5xx is permanent, anything else is worth retrying. */
function isPermanent(err: unknown): boolean {
  const code = (err as { responseCode?: number }).responseCode;
  return typeof code === "number" && code >= 500 && code < 600;
}

export interface SendResult {
  sent: number;
  retried: number;
  failed: number;
}

/** Send one claimed batch. Returns what happened to each row. */
export async function sendBatch(
  knex: Knex,
  transport: Transporter,
  from: string,
  workerId: string,
  limit = 20,
  now = new Date(),
): Promise<SendResult> {
  const rows = await claimBatch(knex, workerId, limit, now);
  const result: SendResult = { sent: 0, retried: 0, failed: 0 };
  for (const row of rows) {
    const attempts = row.attempts + 1;
    try {
      if (!isTemplateName(row.template))
        throw Object.assign(new Error(`unknown template ${row.template}`), { responseCode: 554 });
      const payload = typeof row.payload === "string" ? JSON.parse(row.payload) : row.payload;
      const email = renderEmail(row.template, payload as never);
      const info = await transport.sendMail({
        from,
        to: row.to_address,
        subject: email.subject,
        text: email.text,
        html: email.html,
        messageId: `<outbox-${row.id}@loopwright.mail>`,
      });
      await knex("email_outbox")
        .where({ id: row.id, claimed_by: workerId })
        .update({
          status: "sent",
          attempts,
          sent_at: toSql(new Date()),
          provider_message_id: info.messageId ?? null,
          last_error: null,
        });
      result.sent += 1;
    } catch (err) {
      const message = (err instanceof Error ? err.message : String(err)).slice(0, 2000);
      const permanent = isPermanent(err) || attempts >= MAX_ATTEMPTS;
      await knex("email_outbox")
        .where({ id: row.id, claimed_by: workerId })
        .update({
          status: permanent ? "failed" : "pending",
          attempts,
          last_error: message,
          next_attempt_at: toSql(new Date(Date.now() + backoffMs(attempts))),
          claimed_by: null,
          claimed_at: null,
        });
      if (permanent) result.failed += 1;
      else result.retried += 1;
    }
  }
  return result;
}
