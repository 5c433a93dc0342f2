import knexFactory, { type Knex } from "knex";
import { knexConfig } from "@/knexfile";

/** The database handle every lib/data function takes first: the pool or a transaction. */
export type Db = Knex;
export type Trx = Knex.Transaction;

const globalForDb = globalThis as unknown as { loopwrightDb?: Knex };

/**
 * The one Knex instance of this process (kept on globalThis so hot reload reuses its pool).
 * Framework-free: the app reaches it through lib/server/db.ts, the worker and scripts directly.
 */
export function getDb(): Db {
  globalForDb.loopwrightDb ??= knexFactory(knexConfig());
  return globalForDb.loopwrightDb;
}
