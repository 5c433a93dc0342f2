/** Seeds the demo scenario once (idempotent). DB_TARGET=test seeds the test database. */
import knexFactory from "knex";
import { knexConfig } from "../knexfile";
import { seedDemo } from "./seeds/demo";

async function main(): Promise<void> {
  const knex = knexFactory(knexConfig());
  try {
    const r = await seedDemo(knex);
    console.log(
      r.seeded
        ? `[seed] demo scenario written: ${r.users} users, ${r.projects} projects, ${r.requests} requests, ${r.jobs} jobs`
        : "[seed] demo scenario already present; nothing written",
    );
  } finally {
    await knex.destroy();
  }
}

main().catch((err: unknown) => {
  console.error("[seed] failed:", err instanceof Error ? err.message : err);
  process.exit(1);
});
