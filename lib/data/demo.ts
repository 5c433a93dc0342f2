/**
 * What only the demo scenario does (db/seeds/demo.ts): mark its invented people as demo
 * accounts. Everything else the seed writes goes through the same functions as the app.
 */
import { sqlDateTime } from "@/lib/time";
import type { Db } from "./db";

/**
 * A demo account: flagged `is_demo`, its address taken as confirmed, and the confirmation
 * e-mail queued at sign-up withdrawn (nobody is there to click it).
 */
export async function markDemoAccount(db: Db, userId: number): Promise<void> {
  await db.transaction(async (trx) => {
    await trx("users")
      .where({ id: userId })
      .update({ is_demo: true, email_verified_at: sqlDateTime() });
    await trx("email_outbox")
      .where({ to_user_id: userId, template: "verify_email", status: "pending" })
      .del();
    await trx("auth_tokens").where({ user_id: userId, purpose: "verify_email" }).del();
  });
}
