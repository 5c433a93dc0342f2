import type { Knex } from "knex";

const now = (knex: Knex) => knex.raw("CURRENT_TIMESTAMP(3)");
const onUpdate = (knex: Knex) => knex.raw("CURRENT_TIMESTAMP(3) ON UPDATE CURRENT_TIMESTAMP(3)");

/** Jobs and their state, the review workspace, reports, disputes, ratings, the ledger, payment events. */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("jobs", (t) => {
    t.bigIncrements("id").primary();
    t.bigInteger("request_id")
      .unsigned()
      .notNullable()
      .unique()
      .references("requests.id")
      .onDelete("RESTRICT");
    t.bigInteger("quote_id")
      .unsigned()
      .notNullable()
      .unique()
      .references("quotes.id")
      .onDelete("RESTRICT");
    t.bigInteger("homeowner_id")
      .unsigned()
      .notNullable()
      .references("users.id")
      .onDelete("RESTRICT");
    t.bigInteger("reviewer_id")
      .unsigned()
      .notNullable()
      .references("users.id")
      .onDelete("RESTRICT");
    // The states of lib/jobs/state-machine.ts; only its transitions write this column.
    t.enu("state", [
      "awaiting_payment",
      "funded",
      "in_review",
      "delivered",
      "disputed",
      "released",
      "partially_refunded",
      "refunded",
      "cancelled",
    ])
      .notNullable()
      .defaultTo("awaiting_payment");
    t.integer("amount_minor").unsigned().notNullable();
    t.integer("fee_minor").unsigned().notNullable();
    t.specificType("currency", "CHAR(3)").notNullable().defaultTo("GBP");
    t.string("checkout_session_id", 100).nullable().unique();
    t.string("payment_intent_id", 100).nullable().unique();
    t.string("transfer_id", 100).nullable();
    t.dateTime("funded_at", { precision: 3 }).nullable();
    t.dateTime("review_started_at", { precision: 3 }).nullable();
    t.dateTime("delivered_at", { precision: 3 }).nullable();
    t.dateTime("release_due_at", { precision: 3 }).nullable();
    t.dateTime("closed_at", { precision: 3 }).nullable();
    t.dateTime("created_at", { precision: 3 }).notNullable().defaultTo(now(knex));
    t.dateTime("updated_at", { precision: 3 }).notNullable().defaultTo(onUpdate(knex));
    t.index(["state", "release_due_at"]);
    t.index(["homeowner_id", "state"]);
    t.index(["reviewer_id", "state"]);
  });
  await knex.schema.alterTable("first_fill_records", (t) => {
    t.foreign("job_id").references("jobs.id").onDelete("SET NULL");
  });

  await knex.schema.createTable("reports", (t) => {
    t.bigIncrements("id").primary();
    t.bigInteger("job_id")
      .unsigned()
      .notNullable()
      .unique()
      .references("jobs.id")
      .onDelete("CASCADE");
    t.string("catalogue_version", 20).notNullable();
    t.enu("status", ["draft", "delivered"]).notNullable().defaultTo("draft");
    t.enu("outcome", ["ready_to_commission", "fix_before_filling", "do_not_proceed"]).nullable();
    t.text("summary_md").nullable();
    t.json("required_changes").notNullable();
    // Frozen on delivery: the checklist items and the loop-check findings the report was made against.
    t.json("checklist_snapshot").nullable();
    t.json("findings_snapshot").nullable();
    t.dateTime("delivered_at", { precision: 3 }).nullable();
    t.dateTime("created_at", { precision: 3 }).notNullable().defaultTo(now(knex));
    t.dateTime("updated_at", { precision: 3 }).notNullable().defaultTo(onUpdate(knex));
  });

  await knex.schema.createTable("checklist_answers", (t) => {
    t.bigIncrements("id").primary();
    t.bigInteger("report_id").unsigned().notNullable().references("reports.id").onDelete("CASCADE");
    t.string("item_key", 64).notNullable();
    t.enu("verdict", [
      "sound",
      "concern",
      "unsafe",
      "not_applicable",
      "could_not_verify",
    ]).nullable();
    t.text("note_md").nullable();
    // Pins: [{ attachmentId, x, y, label }] with x, y as fractions of the image.
    t.json("pins").notNullable();
    t.dateTime("created_at", { precision: 3 }).notNullable().defaultTo(now(knex));
    t.dateTime("updated_at", { precision: 3 }).notNullable().defaultTo(onUpdate(knex));
    t.unique(["report_id", "item_key"]);
  });

  await knex.schema.createTable("disputes", (t) => {
    t.bigIncrements("id").primary();
    t.bigInteger("job_id")
      .unsigned()
      .notNullable()
      .unique()
      .references("jobs.id")
      .onDelete("CASCADE");
    t.bigInteger("opened_by").unsigned().notNullable().references("users.id");
    t.text("reason").notNullable();
    t.enu("status", ["open", "settled"]).notNullable().defaultTo("open");
    t.enu("resolution", ["release", "partial_refund", "full_refund"]).nullable();
    t.integer("refund_minor").unsigned().nullable();
    t.bigInteger("settled_by").unsigned().nullable().references("users.id");
    t.text("admin_note").nullable();
    t.dateTime("settled_at", { precision: 3 }).nullable();
    t.dateTime("created_at", { precision: 3 }).notNullable().defaultTo(now(knex));
    t.dateTime("updated_at", { precision: 3 }).notNullable().defaultTo(onUpdate(knex));
    t.index(["status", "created_at"]);
  });

  await knex.schema.createTable("ratings", (t) => {
    t.bigIncrements("id").primary();
    t.bigInteger("job_id").unsigned().notNullable().references("jobs.id").onDelete("CASCADE");
    t.bigInteger("rater_id").unsigned().notNullable().references("users.id");
    t.bigInteger("ratee_id").unsigned().notNullable().references("users.id");
    t.tinyint("stars").unsigned().notNullable();
    t.text("comment").nullable();
    t.dateTime("created_at", { precision: 3 }).notNullable().defaultTo(now(knex));
    t.unique(["job_id", "rater_id"]);
    t.index(["ratee_id"]);
  });

  // Every charge, transfer, refund and fee; the idempotency key is the one sent to the payment service.
  await knex.schema.createTable("ledger_entries", (t) => {
    t.bigIncrements("id").primary();
    t.bigInteger("job_id").unsigned().nullable().references("jobs.id").onDelete("RESTRICT");
    t.enu("kind", ["charge", "transfer", "refund", "fee"]).notNullable();
    t.bigInteger("amount_minor").notNullable();
    t.specificType("currency", "CHAR(3)").notNullable();
    t.string("provider_ref", 100).nullable();
    t.string("idempotency_key", 160).notNullable().unique();
    t.dateTime("created_at", { precision: 3 }).notNullable().defaultTo(now(knex));
    t.index(["job_id", "kind"]);
  });

  // Webhook events from the payment service, each stored once by its id.
  await knex.schema.createTable("payment_events", (t) => {
    t.bigIncrements("id").primary();
    t.string("event_id", 100).notNullable().unique();
    t.string("type", 100).notNullable();
    t.json("payload").notNullable();
    t.dateTime("received_at", { precision: 3 }).notNullable().defaultTo(now(knex));
    t.dateTime("processed_at", { precision: 3 }).nullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("payment_events");
  await knex.schema.dropTable("ledger_entries");
  await knex.schema.dropTable("ratings");
  await knex.schema.dropTable("disputes");
  await knex.schema.dropTable("checklist_answers");
  await knex.schema.dropTable("reports");
  await knex.schema.alterTable("first_fill_records", (t) => t.dropForeign(["job_id"]));
  await knex.schema.dropTable("jobs");
}
