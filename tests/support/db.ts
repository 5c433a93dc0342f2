import knexFactory, { type Knex } from "knex";
import { knexConfig } from "@/knexfile";

/** A Knex instance on the test database (or another database on the same server). */
export function testKnex(database?: string): Knex {
  const config = knexConfig("test");
  const connection = { ...(config.connection as object), ...(database ? { database } : {}) };
  return knexFactory({ ...config, connection, pool: { min: 0, max: 4 } });
}

/** Every table the migrations create, for wiping data between integration tests. */
export async function truncateAll(knex: Knex): Promise<void> {
  const rows = (await knex.raw("SHOW TABLES"))[0] as Record<string, string>[];
  const tables = rows.map((r) => Object.values(r)[0]!).filter((t) => !t.startsWith("knex_"));
  await knex.raw("SET FOREIGN_KEY_CHECKS = 0");
  try {
    for (const t of tables) await knex.raw("TRUNCATE TABLE ??", [t]);
  } finally {
    await knex.raw("SET FOREIGN_KEY_CHECKS = 1");
  }
}
