import type { Knex } from "knex";

/**
 * Counters of `rate-limiter-flexible` (lib/data/rate-limit.ts), shared by every app process.
 * The library's MySQL store reads and writes exactly these three columns, in this order; it would
 * create the table itself, but the schema belongs to the migrations. The hand-written
 * fixed-window table it replaces goes.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("rate_limits", (t) => {
    t.string("key", 255).notNullable().primary();
    t.integer("points").notNullable().defaultTo(0);
    t.bigInteger("expire").unsigned().nullable();
    t.index(["expire"]);
  });
  await knex.schema.dropTable("rate_limit_hits");
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.createTable("rate_limit_hits", (t) => {
    t.string("bucket", 191).notNullable();
    t.dateTime("window_start", { precision: 0 }).notNullable();
    t.integer("hits").unsigned().notNullable().defaultTo(0);
    t.primary(["bucket", "window_start"]);
    t.index(["window_start"]);
  });
  await knex.schema.dropTable("rate_limits");
}
