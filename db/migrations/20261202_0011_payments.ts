import type { Knex } from "knex";

/**
 * What the payments and the job page need beyond the first schema: how many checkout sessions a
 * job has had (each attempt's idempotency key is job + attempt), when a payout account became
 * ready, and the site-visit appointment (proposed by the reviewer inside the homeowner's window,
 * confirmed by the homeowner; the sequence number goes into the calendar invitation so an update
 * replaces the old one).
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("jobs", (t) => {
    t.smallint("checkout_attempts").unsigned().notNullable().defaultTo(0);
    t.dateTime("visit_at", { precision: 3 }).nullable();
    t.enu("visit_state", ["proposed", "confirmed", "declined"]).nullable();
    t.text("visit_note").nullable();
    t.smallint("visit_sequence").unsigned().notNullable().defaultTo(0);
  });
  await knex.schema.alterTable("reviewer_profiles", (t) => {
    t.dateTime("payouts_ready_at", { precision: 3 }).nullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("reviewer_profiles", (t) => t.dropColumn("payouts_ready_at"));
  await knex.schema.alterTable("jobs", (t) => {
    t.dropColumn("visit_sequence");
    t.dropColumn("visit_note");
    t.dropColumn("visit_state");
    t.dropColumn("visit_at");
    t.dropColumn("checkout_attempts");
  });
}
