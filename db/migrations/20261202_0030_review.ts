import type { Knex } from "knex";

const now = (knex: Knex) => knex.raw("CURRENT_TIMESTAMP(3)");

/**
 * What the review workspace, the report and what follows it need beyond the first schema:
 * - a version per checklist answer and per report draft, raised on every save, so a stale
 *   write (another tab, a slow network) is refused with 409 instead of overwriting newer text;
 * - the delivered snapshot's format number;
 * - dated addenda to a delivered report;
 * - the reviewer's one reply to a rating;
 * - the reviewer's questions to the homeowner about one item (a photo or a fact) and the answer;
 * - which checklist items a project photo shows (tagged by the homeowner);
 * - the first-fill record: a freeze-point reading instead of a concentration, and the reviewer's
 *   countersign comment.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("checklist_answers", (t) => {
    t.integer("version").unsigned().notNullable().defaultTo(0);
    t.bigInteger("updated_by").unsigned().nullable().references("users.id").onDelete("SET NULL");
  });
  await knex.schema.alterTable("reports", (t) => {
    t.integer("draft_version").unsigned().notNullable().defaultTo(0);
    t.smallint("snapshot_format").unsigned().nullable();
  });

  await knex.schema.createTable("report_addenda", (t) => {
    t.bigIncrements("id").primary();
    t.bigInteger("report_id").unsigned().notNullable().references("reports.id").onDelete("CASCADE");
    t.bigInteger("author_id").unsigned().notNullable().references("users.id");
    t.text("body_md").notNullable();
    t.dateTime("created_at", { precision: 3 }).notNullable().defaultTo(now(knex));
    t.index(["report_id", "id"]);
  });

  await knex.schema.alterTable("ratings", (t) => {
    t.text("reply_md").nullable();
    t.dateTime("replied_at", { precision: 3 }).nullable();
  });

  await knex.schema.createTable("item_requests", (t) => {
    t.bigIncrements("id").primary();
    t.bigInteger("job_id").unsigned().notNullable().references("jobs.id").onDelete("CASCADE");
    t.string("item_key", 64).notNullable();
    t.enu("kind", ["photo", "fact"]).notNullable();
    t.text("question_md").notNullable();
    t.bigInteger("asked_by").unsigned().notNullable().references("users.id");
    t.text("answer_md").nullable();
    t.bigInteger("answer_attachment_id")
      .unsigned()
      .nullable()
      .references("attachments.id")
      .onDelete("SET NULL");
    t.dateTime("answered_at", { precision: 3 }).nullable();
    t.dateTime("created_at", { precision: 3 }).notNullable().defaultTo(now(knex));
    t.index(["job_id", "item_key"]);
  });

  await knex.schema.createTable("attachment_items", (t) => {
    t.bigInteger("attachment_id")
      .unsigned()
      .notNullable()
      .references("attachments.id")
      .onDelete("CASCADE");
    t.string("item_key", 64).notNullable();
    t.dateTime("created_at", { precision: 3 }).notNullable().defaultTo(now(knex));
    t.primary(["attachment_id", "item_key"]);
  });

  await knex.schema.alterTable("first_fill_records", (t) => {
    t.decimal("glycol_percent_mass", 4, 1).nullable().alter();
    t.decimal("freeze_point_c", 4, 1).nullable();
    t.text("countersign_comment").nullable();
    t.unique(["job_id"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  // The unique key serves the job foreign key too: drop the key with the foreign key, then put it back.
  await knex.schema.alterTable("first_fill_records", (t) => t.dropForeign(["job_id"]));
  await knex.schema.alterTable("first_fill_records", (t) => {
    t.dropUnique(["job_id"]);
    t.foreign("job_id").references("jobs.id").onDelete("SET NULL");
  });
  await knex.schema.alterTable("first_fill_records", (t) => {
    t.dropColumn("countersign_comment");
    t.dropColumn("freeze_point_c");
  });
  await knex("first_fill_records").whereNull("glycol_percent_mass").del();
  await knex.schema.alterTable("first_fill_records", (t) => {
    t.decimal("glycol_percent_mass", 4, 1).notNullable().alter();
  });
  await knex.schema.dropTable("attachment_items");
  await knex.schema.dropTable("item_requests");
  await knex.schema.alterTable("ratings", (t) => {
    t.dropColumn("replied_at");
    t.dropColumn("reply_md");
  });
  await knex.schema.dropTable("report_addenda");
  await knex.schema.alterTable("reports", (t) => {
    t.dropColumn("snapshot_format");
    t.dropColumn("draft_version");
  });
  await knex.schema.alterTable("checklist_answers", (t) => {
    t.dropForeign(["updated_by"]);
    t.dropColumn("updated_by");
    t.dropColumn("version");
  });
}
