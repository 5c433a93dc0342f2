import knexFactory, { type Knex } from "knex";
import { knexConfig } from "@/knexfile";
import { TEST_PAYMENT_KEYS, TEST_PORTS } from "./fakes";

/** A Knex instance on the test database (or another database on the same server). */
export function testKnex(database?: string): Knex {
  const config = knexConfig("test");
  const connection = { ...(config.connection as object), ...(database ? { database } : {}) };
  return knexFactory({ ...config, connection, pool: { min: 0, max: 4 } });
}

/**
 * Every table the migrations create, for wiping data between integration tests. The test
 * payment fake is reset with it: ids start again from 1 after a wipe, and the fake must not
 * answer a new job's idempotency key with an old job's stored payment.
 */
export async function truncateAll(knex: Knex): Promise<void> {
  await resetPaymentsFake();
  const rows = (await knex.raw("SHOW TABLES"))[0] as Record<string, string>[];
  const tables = rows.map((r) => Object.values(r)[0]!).filter((t) => !t.startsWith("knex_"));
  await knex.raw("SET FOREIGN_KEY_CHECKS = 0");
  try {
    for (const t of tables) await knex.raw("TRUNCATE TABLE ??", [t]);
  } finally {
    await knex.raw("SET FOREIGN_KEY_CHECKS = 1");
  }
}

async function resetPaymentsFake(): Promise<void> {
  const res = await fetch(`http://127.0.0.1:${TEST_PORTS.payments}/_fake/reset`, {
    method: "POST",
    headers: { authorization: `Bearer ${TEST_PAYMENT_KEYS.secretKey}` },
  }).catch((err: unknown) => {
    // Only the migration tests run without the test stack's fakes.
    if ((err as { cause?: { code?: string } }).cause?.code === "ECONNREFUSED") return null;
    throw err;
  });
  if (res && !res.ok) throw new Error(`the payment fake's reset answered ${res.status}`);
}
