import type { Knex } from "knex";

/**
 * The distance sort and filter work the distance out for every site visit in range, so their
 * index carries every column the board filters on: the board's inner query then reads this index
 * alone, never the wide request rows (each holds the system and loop-check snapshots). It
 * replaces requests_board_site, a prefix of it.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.raw(
    "ALTER TABLE requests ADD INDEX requests_board_distance " +
      "(status, site_lat, site_lng, expires_at, kind, region, collector_type, budget_max_minor, " +
      "budget_min_minor, created_at), DROP INDEX requests_board_site",
  );
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw(
    "ALTER TABLE requests ADD INDEX requests_board_site (status, site_lat, id), " +
      "DROP INDEX requests_board_distance",
  );
}
