import "server-only";
import type { Knex } from "knex";
import {
  notificationPreferencesSchema,
  type NotificationPreferencesInput,
} from "@/lib/validation/auth";

export async function getPreferences(knex: Knex, userId: number) {
  const row = await knex("users")
    .where({ id: userId })
    .first("notify_new_message", "notify_new_quote");
  return {
    notifyNewMessage: Boolean(row?.notify_new_message),
    notifyNewQuote: Boolean(row?.notify_new_quote),
  };
}

/** Only the optional kinds can be switched off; money and security e-mails always go. */
export async function savePreferences(
  knex: Knex,
  userId: number,
  input: NotificationPreferencesInput,
) {
  const v = notificationPreferencesSchema.parse(input);
  await knex("users")
    .where({ id: userId })
    .update({ notify_new_message: v.notifyNewMessage, notify_new_quote: v.notifyNewQuote });
}
