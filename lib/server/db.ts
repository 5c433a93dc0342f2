import "server-only";
import knexFactory, { type Knex } from "knex";
import { knexConfig } from "@/knexfile";

const globalForDb = globalThis as unknown as { loopwrightDb?: Knex };

/** The one Knex instance of the app process (kept on globalThis so hot reload reuses its pool). */
export function db(): Knex {
  globalForDb.loopwrightDb ??= knexFactory(knexConfig());
  return globalForDb.loopwrightDb;
}
