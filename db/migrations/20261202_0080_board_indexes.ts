import type { Knex } from "knex";

/**
 * Indexes for the board's other sorts, so every sort reads in index order (or, for distance,
 * narrows by latitude) with keyset cursors instead of offsets: budget (highest first), soonest
 * visit window (earliest first, ties by newest id) and the site's latitude.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.raw(
    "ALTER TABLE requests ADD INDEX requests_board_budget (status, budget_max_minor DESC, id DESC), " +
      "ADD INDEX requests_board_soonest (status, window_start ASC, id DESC), " +
      "ADD INDEX requests_board_site (status, site_lat, id)",
  );
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw(
    "ALTER TABLE requests DROP INDEX requests_board_budget, DROP INDEX requests_board_soonest, " +
      "DROP INDEX requests_board_site",
  );
}
