import { notificationPreferencesSchema } from "@/lib/validation/auth";
import type { Actor } from "./actor";
import type { Db } from "./db";
import { parseInput } from "./errors";

export interface Preferences {
  notifyNewMessage: boolean;
  notifyNewQuote: boolean;
}

/** One's own e-mail preferences. */
export async function getPreferences(db: Db, actor: Actor): Promise<Preferences> {
  const row = await db("users")
    .where({ id: actor.id })
    .first("notify_new_message", "notify_new_quote");
  return {
    notifyNewMessage: Boolean(row?.notify_new_message),
    notifyNewQuote: Boolean(row?.notify_new_quote),
  };
}

/** Only the optional kinds can be switched off; money and security e-mails always go. */
export async function savePreferences(db: Db, actor: Actor, input: unknown): Promise<void> {
  const v = parseInput(notificationPreferencesSchema, input);
  await db("users")
    .where({ id: actor.id })
    .update({ notify_new_message: v.notifyNewMessage, notify_new_quote: v.notifyNewQuote });
}
