import type { Knex } from "knex";

const now = (knex: Knex) => knex.raw("CURRENT_TIMESTAMP(3)");
const onUpdate = (knex: Knex) => knex.raw("CURRENT_TIMESTAMP(3) ON UPDATE CURRENT_TIMESTAMP(3)");

/** Projects (the system description), review requests, quotes, messages, first-fill records. */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("projects", (t) => {
    t.bigIncrements("id").primary();
    t.bigInteger("owner_id").unsigned().notNullable().references("users.id").onDelete("CASCADE");
    t.string("title", 120).notNullable();
    // The full description, validated by lib/validation/system.ts before it is written.
    t.json("system").notNullable();
    t.smallint("system_version").unsigned().notNullable().defaultTo(1);
    // Copies of what the board filters on, kept in step with `system` by the data layer.
    t.string("region", 64).nullable();
    t.enu("collector_type", ["flat_plate", "evacuated_tube"]).nullable();
    t.decimal("collector_area_m2", 6, 2).nullable();
    t.enu("worst_level", ["ok", "note", "fix", "stop"]).nullable();
    t.enu("status", ["draft", "ready", "archived"]).notNullable().defaultTo("draft");
    t.dateTime("deleted_at", { precision: 3 }).nullable();
    t.dateTime("created_at", { precision: 3 }).notNullable().defaultTo(now(knex));
    t.dateTime("updated_at", { precision: 3 }).notNullable().defaultTo(onUpdate(knex));
    t.index(["owner_id", "created_at"]);
  });
  await knex.schema.alterTable("attachments", (t) => {
    t.foreign("project_id").references("projects.id").onDelete("CASCADE");
  });

  await knex.schema.createTable("requests", (t) => {
    t.bigIncrements("id").primary();
    t.bigInteger("project_id")
      .unsigned()
      .notNullable()
      .references("projects.id")
      .onDelete("CASCADE");
    t.bigInteger("homeowner_id")
      .unsigned()
      .notNullable()
      .references("users.id")
      .onDelete("CASCADE");
    t.enu("kind", ["remote_check", "site_visit"]).notNullable();
    t.enu("status", ["open", "awarded", "cancelled", "expired"]).notNullable().defaultTo("open");
    t.text("questions").notNullable();
    t.integer("budget_min_minor").unsigned().notNullable();
    t.integer("budget_max_minor").unsigned().notNullable();
    t.specificType("currency", "CHAR(3)").notNullable().defaultTo("GBP");
    t.string("region", 64).notNullable();
    t.enu("collector_type", ["flat_plate", "evacuated_tube"]).nullable();
    t.decimal("site_lat", 9, 6).nullable();
    t.decimal("site_lng", 9, 6).nullable();
    t.date("window_start").nullable();
    t.date("window_end").nullable();
    t.text("access_notes").nullable();
    t.dateTime("expires_at", { precision: 3 }).notNullable();
    t.dateTime("created_at", { precision: 3 }).notNullable().defaultTo(now(knex));
    t.dateTime("updated_at", { precision: 3 }).notNullable().defaultTo(onUpdate(knex));
    // The board: open requests by kind and region, newest first, keyset-paginated.
    t.index(["status", "kind", "region", "created_at", "id"], "requests_board_kind_region");
    t.index(["status", "kind", "created_at", "id"], "requests_board_kind");
    t.index(["status", "region", "created_at", "id"], "requests_board_region");
    t.index(["status", "created_at", "id"], "requests_board_all");
    t.index(["status", "expires_at"], "requests_expiry");
    t.index(["project_id"]);
  });

  await knex.schema.createTable("quotes", (t) => {
    t.bigIncrements("id").primary();
    t.bigInteger("request_id")
      .unsigned()
      .notNullable()
      .references("requests.id")
      .onDelete("CASCADE");
    t.bigInteger("reviewer_id").unsigned().notNullable().references("users.id").onDelete("CASCADE");
    t.integer("price_minor").unsigned().notNullable();
    t.specificType("currency", "CHAR(3)").notNullable().defaultTo("GBP");
    t.smallint("turnaround_days").unsigned().notNullable();
    t.text("scope_md").notNullable();
    t.date("proposed_visit_date").nullable();
    t.enu("status", ["live", "withdrawn", "declined", "accepted"]).notNullable().defaultTo("live");
    t.text("decline_reason").nullable();
    t.dateTime("created_at", { precision: 3 }).notNullable().defaultTo(now(knex));
    t.dateTime("updated_at", { precision: 3 }).notNullable().defaultTo(onUpdate(knex));
    t.index(["request_id", "status"]);
    t.index(["reviewer_id", "status"]);
  });
  // One live (or accepted) quote per reviewer per request: NULL for the others, and NULLs never clash.
  await knex.raw(
    "ALTER TABLE quotes ADD COLUMN live_marker TINYINT AS (IF(status IN ('live','accepted'), 1, NULL)) PERSISTENT, " +
      "ADD UNIQUE INDEX quotes_one_live_per_reviewer (request_id, reviewer_id, live_marker)",
  );

  // A thread per request and quoting reviewer; it carries on into the job after acceptance.
  await knex.schema.createTable("message_threads", (t) => {
    t.bigIncrements("id").primary();
    t.bigInteger("request_id")
      .unsigned()
      .notNullable()
      .references("requests.id")
      .onDelete("CASCADE");
    t.bigInteger("reviewer_id").unsigned().notNullable().references("users.id").onDelete("CASCADE");
    t.dateTime("last_message_at", { precision: 3 }).nullable();
    t.dateTime("created_at", { precision: 3 }).notNullable().defaultTo(now(knex));
    t.unique(["request_id", "reviewer_id"]);
    t.index(["reviewer_id", "last_message_at"]);
  });

  await knex.schema.createTable("messages", (t) => {
    t.bigIncrements("id").primary();
    t.bigInteger("thread_id")
      .unsigned()
      .notNullable()
      .references("message_threads.id")
      .onDelete("CASCADE");
    t.bigInteger("sender_id").unsigned().notNullable().references("users.id").onDelete("CASCADE");
    t.text("body_md").notNullable();
    t.dateTime("created_at", { precision: 3 }).notNullable().defaultTo(now(knex));
    t.index(["thread_id", "id"]);
  });

  await knex.schema.createTable("message_reads", (t) => {
    t.bigInteger("thread_id")
      .unsigned()
      .notNullable()
      .references("message_threads.id")
      .onDelete("CASCADE");
    t.bigInteger("user_id").unsigned().notNullable().references("users.id").onDelete("CASCADE");
    t.bigInteger("last_read_message_id").unsigned().notNullable().defaultTo(0);
    t.dateTime("last_emailed_at", { precision: 3 }).nullable();
    t.primary(["thread_id", "user_id"]);
  });

  // What the homeowner measured at first fill, compared with the design; the reviewer may countersign.
  await knex.schema.createTable("first_fill_records", (t) => {
    t.bigIncrements("id").primary();
    t.bigInteger("project_id")
      .unsigned()
      .notNullable()
      .references("projects.id")
      .onDelete("CASCADE");
    t.bigInteger("job_id").unsigned().nullable(); // FK added with jobs
    t.decimal("fill_pressure_cold_bar", 4, 2).notNullable();
    t.decimal("fill_pressure_hot_bar", 4, 2).nullable();
    t.decimal("hot_temperature_c", 5, 1).nullable();
    t.decimal("precharge_measured_bar", 4, 2).notNullable();
    t.decimal("glycol_percent_mass", 4, 1).notNullable();
    t.decimal("flow_rate_lph", 6, 1).nullable();
    t.text("notes").nullable();
    t.dateTime("recorded_at", { precision: 3 }).notNullable().defaultTo(now(knex));
    t.bigInteger("countersigned_by")
      .unsigned()
      .nullable()
      .references("users.id")
      .onDelete("SET NULL");
    t.dateTime("countersigned_at", { precision: 3 }).nullable();
    t.dateTime("created_at", { precision: 3 }).notNullable().defaultTo(now(knex));
    t.dateTime("updated_at", { precision: 3 }).notNullable().defaultTo(onUpdate(knex));
    t.index(["project_id"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("first_fill_records");
  await knex.schema.dropTable("message_reads");
  await knex.schema.dropTable("messages");
  await knex.schema.dropTable("message_threads");
  await knex.schema.dropTable("quotes");
  await knex.schema.dropTable("requests");
  await knex.schema.alterTable("attachments", (t) => t.dropForeign(["project_id"]));
  await knex.schema.dropTable("projects");
}
