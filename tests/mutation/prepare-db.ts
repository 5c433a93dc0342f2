/**
 * Makes and migrates the database of `npm run mutate:data` (MUTATE_DB_NAME, default
 * `loopwright_test_mutate`) on the test server, so mutation runs never touch the test database.
 */
import knexFactory from "knex";
import { knexConfig } from "../../knexfile";

async function main(): Promise<void> {
  const name = process.env.MUTATE_DB_NAME ?? "loopwright_test_mutate";
  if (!/^[A-Za-z0-9_]+$/.test(name)) throw new Error("MUTATE_DB_NAME: letters, digits and _ only");
  process.env.DB_TEST_NAME = name;
  const config = knexConfig("test");
  const server = knexFactory({
    ...config,
    connection: { ...(config.connection as object), database: undefined },
  });
  try {
    await server.raw(
      "CREATE DATABASE IF NOT EXISTS ?? CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci",
      [name],
    );
  } finally {
    await server.destroy();
  }
  const knex = knexFactory({
    ...config,
    connection: { ...(config.connection as object), database: name },
  });
  try {
    const [, names] = await knex.migrate.latest();
    console.log(
      `[mutate] ${name}: ${names.length ? `migrated ${names.join(", ")}` : "up to date"}`,
    );
  } finally {
    await knex.destroy();
  }
}

main().catch((err: unknown) => {
  console.error("[mutate] database not ready:", err instanceof Error ? err.message : err);
  process.exit(1);
});
