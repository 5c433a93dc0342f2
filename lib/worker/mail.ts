/**
 * Sends what the outbox holds. Safe to run in several processes at once: rows are claimed with
 * SELECT … FOR UPDATE SKIP LOCKED and marked `sending` by the claimant before the SMTP call, so
 * no two workers take the same row. Each row is marked `sent` right after the server accepts it.
 * A row left in `sending` by a worker that died is taken again after CLAIM_TIMEOUT_MS; its
 * Message-ID is fixed by the row id, so a receiving system can recognise the rare repeat.
 */
import nodemailer, { type Transporter } from "nodemailer";
import { isTemplateName, renderEmail } from "@/lib/mail/templates";
import type { MailAttachment } from "@/lib/mail/calendar";
import type { Db } from "@/lib/data/db";
import { claimOutboxBatch, markOutboxFailed, markOutboxSent } from "@/lib/data/outbox";

export { CLAIM_TIMEOUT_MS } from "@/lib/data/outbox";
export const MAX_ATTEMPTS = 8;

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
  db: Db,
  transport: Transporter,
  from: string,
  workerId: string,
  limit = 20,
  now = new Date(),
): Promise<SendResult> {
  const rows = await claimOutboxBatch(db, workerId, limit, now);
  const result: SendResult = { sent: 0, retried: 0, failed: 0 };
  for (const row of rows) {
    const attempts = row.attempts + 1;
    try {
      if (!isTemplateName(row.template))
        throw Object.assign(new Error(`unknown template ${row.template}`), { responseCode: 554 });
      const payload = typeof row.payload === "string" ? JSON.parse(row.payload) : row.payload;
      const email = await renderEmail(row.template, payload as never);
      const files = (
        typeof row.attachments === "string" ? JSON.parse(row.attachments) : (row.attachments ?? [])
      ) as MailAttachment[];
      const info = await transport.sendMail({
        from,
        to: row.to_address,
        subject: email.subject,
        text: email.text,
        html: email.html,
        messageId: `<outbox-${row.id}@loopwright.mail>`,
        attachments: files.map((f) => ({
          filename: f.filename,
          contentType: f.contentType,
          content: f.content,
        })),
      });
      await markOutboxSent(db, row.id, workerId, attempts, info.messageId ?? null);
      result.sent += 1;
    } catch (err) {
      const message = (err instanceof Error ? err.message : String(err)).slice(0, 2000);
      const permanent = isPermanent(err) || attempts >= MAX_ATTEMPTS;
      await markOutboxFailed(
        db,
        row.id,
        workerId,
        attempts,
        message,
        permanent,
        backoffMs(attempts),
      );
      if (permanent) result.failed += 1;
      else result.retried += 1;
    }
  }
  return result;
}
