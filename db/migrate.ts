/**
 * Migration runner (the knex CLI cannot load a TypeScript knexfile by itself).
 *   tsx db/migrate.ts latest | rollback | rollback-all | status
 * DB_TARGET=test points it at the test database.
 */
import knexFactory from "knex";
import { knexConfig } from "../knexfile";

async function main(): Promise<void> {
  const command = process.argv[2] ?? "latest";
  const knex = knexFactory(knexConfig());
  try {
    if (command === "latest") {
      const [batch, names] = await knex.migrate.latest();
      console.log(
        names.length
          ? `[migrate] batch ${batch}: ${names.join(", ")}`
          : "[migrate] schema is up to date",
      );
    } else if (command === "rollback" || command === "rollback-all") {
      const [batch, names] = await knex.migrate.rollback(undefined, command === "rollback-all");
      console.log(`[migrate] rolled back batch ${batch}: ${names.join(", ") || "nothing"}`);
    } else if (command === "status") {
      const [done, pending] = await knex.migrate.list();
      console.log(`[migrate] applied ${done.length}, pending ${pending.length}`);
    } else {
      throw new Error(`unknown command ${command}`);
    }
  } finally {
    await knex.destroy();
  }
}

main().catch((err: unknown) => {
  console.error("[migrate] failed:", err instanceof Error ? err.message : err);
  process.exit(1);
});
