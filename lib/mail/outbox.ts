/**
 * The e-mail outbox. `enqueueEmail` is called inside the transaction of the change that causes
 * the e-mail, so either both are written or neither. The worker (lib/worker/mail.ts) sends.
 */
import type { Knex } from "knex";
import { OPTIONAL_TEMPLATES, type TemplateName, type TemplatePayloads } from "./kinds";

export interface EnqueueEmail<K extends TemplateName> {
  to: { address: string; userId?: number | null };
  template: K;
  payload: TemplatePayloads[K];
  /** Set when one event must never produce two e-mails; a repeat is silently ignored. */
  dedupeKey?: string;
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
  trx: Knex | Knex.Transaction,
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
  };
  if (e.dedupeKey) {
    // INSERT IGNORE keeps the transaction alive on a repeated key (a plain insert would abort it).
    const [result] = (await trx.raw(
      "INSERT IGNORE INTO email_outbox (to_user_id, to_address, template, payload, dedupe_key) VALUES (?, ?, ?, ?, ?)",
      [row.to_user_id, row.to_address, row.template, row.payload, row.dedupe_key],
    )) as [{ affectedRows: number }];
    return result.affectedRows === 1 ? "queued" : "duplicate";
  }
  await trx("email_outbox").insert(row);
  return "queued";
}
