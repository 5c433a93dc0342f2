import { defineConfig } from "vitest/config";
import { fileURLToPath } from "node:url";

const root = fileURLToPath(new URL("../..", import.meta.url));

/**
 * The integration project alone, for `npm run mutate:data`: the data layer's tests on the real
 * MariaDB, in a database of its own (MUTATE_DB_NAME, default `loopwright_test_mutate`, made and
 * migrated by tests/mutation/prepare-db.ts), so a mutation run never wipes the test database
 * that `npm test` uses. The fakes take the ports of TEST_PORT_OFFSET + 50, so a run can go on
 * beside the integration tests of the same checkout.
 */
process.env.DB_TEST_NAME = process.env.MUTATE_DB_NAME ?? "loopwright_test_mutate";
process.env.TEST_PORT_OFFSET = String(Number(process.env.TEST_PORT_OFFSET ?? 0) + 50);

export default defineConfig({
  root,
  resolve: {
    alias: [
      { find: /^@\//, replacement: root },
      { find: /^server-only$/, replacement: `${root}tests/support/empty.ts` },
    ],
  },
  test: {
    environment: "node",
    include: ["tests/integration/**/*.test.ts"],
    // The migrations test rolls everything back and forth; the data rules do not need it.
    exclude: ["tests/integration/migrations.test.ts"],
    globalSetup: ["tests/support/global-setup-integration.ts"],
    env: {
      DB_TEST_NAME: process.env.DB_TEST_NAME,
      TEST_PORT_OFFSET: process.env.TEST_PORT_OFFSET,
      // As in vitest.config.ts: code that builds its own payment client (the demo seed) reaches
      // this run's payment fake.
      STRIPE_API_HOST: "127.0.0.1",
      STRIPE_API_PORT: String(12112 + Number(process.env.TEST_PORT_OFFSET)),
      STRIPE_API_PROTOCOL: "http",
    },
    fileParallelism: false,
    testTimeout: 30_000,
    hookTimeout: 120_000,
  },
});
