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

/**
 * A transaction retried when InnoDB picks it as a deadlock victim (1213) or its lock wait times
 * out (1205): both roll the whole transaction back, so running it again is safe. Call it on the
 * pool, not inside another transaction.
 */
export async function transactionWithRetry<T>(
  db: Db,
  work: (trx: Trx) => Promise<T>,
  attempts = 5,
): Promise<T> {
  for (let attempt = 1; ; attempt++) {
    try {
      return await db.transaction(work);
    } catch (err) {
      const errno = (err as { errno?: number } | null)?.errno;
      if ((errno === 1213 || errno === 1205) && attempt < attempts) {
        await new Promise((r) => setTimeout(r, 5 * attempt + Math.random() * 20 * attempt));
        continue;
      }
      throw err;
    }
  }
}
