import type { Knex } from "knex";

/**
 * What a request was posted against: the validated system and the loop check (findings, the
 * checklist's catalogue version and item keys), so the reviewer and the report read exactly what
 * the homeowner saw. And one open request per project, held by the database itself: a generated
 * column that is the project id while the request is open and NULL otherwise, under a unique key.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("requests", (t) => {
    t.json("system_snapshot").nullable();
    t.json("loop_check_snapshot").nullable();
  });
  await knex.raw(
    "ALTER TABLE requests ADD COLUMN open_project_id BIGINT UNSIGNED AS (IF(status = 'open', project_id, NULL)) PERSISTENT, ADD UNIQUE KEY requests_one_open_per_project (open_project_id)",
  );
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw("ALTER TABLE requests DROP INDEX requests_one_open_per_project");
  await knex.schema.alterTable("requests", (t) => {
    t.dropColumn("open_project_id");
    t.dropColumn("loop_check_snapshot");
    t.dropColumn("system_snapshot");
  });
}
