import type { Knex } from "knex";
import { parseEnv } from "./lib/env";
import { migrationSource } from "./db/migrations/index";

/**
 * Knex settings for the CLI-free migration runner (db/migrate.ts) and the app.
 * `DB_TARGET=test` selects the separate test database.
 */
export function knexConfig(
  target: "app" | "test" = process.env.DB_TARGET === "test" ? "test" : "app",
): Knex.Config {
  const e = parseEnv();
  return {
    client: "mysql2",
    connection: {
      host: e.DB_HOST,
      port: e.DB_PORT,
      user: e.DB_USER,
      password: e.DB_PASSWORD,
      database: target === "test" ? e.DB_TEST_NAME : e.DB_NAME,
      charset: "utf8mb4",
      timezone: "Z",
      // DATETIME(3) values come back as exact strings: no time-zone round trip, exact cursors.
      dateStrings: true,
      supportBigNumbers: true,
    },
    pool: { min: 0, max: 10 },
    migrations: { migrationSource, tableName: "knex_migrations" },
  };
}

export default knexConfig();
