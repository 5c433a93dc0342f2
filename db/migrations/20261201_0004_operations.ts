import type { Knex } from "knex";

const now = (knex: Knex) => knex.raw("CURRENT_TIMESTAMP(3)");
const onUpdate = (knex: Knex) => knex.raw("CURRENT_TIMESTAMP(3) ON UPDATE CURRENT_TIMESTAMP(3)");

/** The e-mail outbox, the audit log and the worker's schedule (shared by every worker process). */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("email_outbox", (t) => {
    t.bigIncrements("id").primary();
    t.bigInteger("to_user_id").unsigned().nullable().references("users.id").onDelete("SET NULL");
    t.string("to_address", 254).notNullable();
    t.string("template", 64).notNullable();
    t.json("payload").notNullable();
    // Set where the same event must never produce two e-mails (e.g. "credential 12 expiring").
    t.string("dedupe_key", 191).nullable().unique();
    t.enu("status", ["pending", "sending", "sent", "failed"]).notNullable().defaultTo("pending");
    t.smallint("attempts").unsigned().notNullable().defaultTo(0);
    t.dateTime("next_attempt_at", { precision: 3 }).notNullable().defaultTo(now(knex));
    t.string("claimed_by", 100).nullable();
    t.dateTime("claimed_at", { precision: 3 }).nullable();
    t.text("last_error").nullable();
    t.string("provider_message_id", 255).nullable();
    t.dateTime("sent_at", { precision: 3 }).nullable();
    t.dateTime("created_at", { precision: 3 }).notNullable().defaultTo(now(knex));
    t.dateTime("updated_at", { precision: 3 }).notNullable().defaultTo(onUpdate(knex));
    t.index(["status", "next_attempt_at"]);
    t.index(["to_user_id", "created_at"]);
  });

  await knex.schema.createTable("audit_log", (t) => {
    t.bigIncrements("id").primary();
    t.bigInteger("actor_id").unsigned().nullable().references("users.id").onDelete("SET NULL");
    t.string("action", 64).notNullable();
    t.string("entity_type", 32).notNullable();
    t.bigInteger("entity_id").unsigned().notNullable();
    t.json("detail").notNullable();
    t.dateTime("created_at", { precision: 3 }).notNullable().defaultTo(now(knex));
    t.index(["entity_type", "entity_id", "created_at"]);
    t.index(["actor_id", "created_at"]);
  });

  // One row per scheduled task: a worker takes the lease with a conditional UPDATE, so two
  // workers never run the same task at once and a crashed worker's lease simply runs out.
  await knex.schema.createTable("worker_schedule", (t) => {
    t.string("task", 64).primary();
    t.string("lease_owner", 100).nullable();
    t.dateTime("lease_until", { precision: 3 }).nullable();
    t.dateTime("last_run_at", { precision: 3 }).nullable();
    t.dateTime("next_run_at", { precision: 3 }).notNullable().defaultTo(now(knex));
    t.text("last_error").nullable();
    t.dateTime("updated_at", { precision: 3 }).notNullable().defaultTo(onUpdate(knex));
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("worker_schedule");
  await knex.schema.dropTable("audit_log");
  await knex.schema.dropTable("email_outbox");
}
