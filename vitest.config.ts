import { defineConfig } from "vitest/config";
import { fileURLToPath } from "node:url";

const root = fileURLToPath(new URL(".", import.meta.url));

// The test stack's payment fake (tests/support/fakes.ts keeps the same numbers): code under test
// that builds its own payment client from the environment, such as the demo seed, reaches it.
const testPaymentsEnv = {
  STRIPE_API_HOST: "127.0.0.1",
  STRIPE_API_PORT: String(12112 + Number(process.env.TEST_PORT_OFFSET ?? 0)),
  STRIPE_API_PROTOCOL: "http",
};

/**
 * Three projects; `vitest run` runs them all, one group after another (unit, then integration,
 * then e2e), because integration and e2e share the test database. Run one with
 * `npx vitest run --project unit` (or `npm run test:unit`).
 */
export default defineConfig({
  resolve: {
    alias: [
      { find: /^@\//, replacement: root },
      // `server-only` throws outside a React Server Components build; tests run server code directly.
      { find: /^server-only$/, replacement: `${root}tests/support/empty.ts` },
    ],
  },
  test: {
    environment: "node",
    reporters: ["default"],
    projects: [
      {
        // Pure functions: no database, no build, no fakes.
        extends: true,
        test: {
          name: "unit",
          include: ["tests/unit/**/*.test.ts"],
          // Pure functions share nothing mutable: one module cache for all files keeps the
          // project's wall time in seconds.
          isolate: false,
          sequence: { groupOrder: 0 },
        },
      },
      {
        // The real MariaDB test database, and the mail fake for the outbox tests.
        extends: true,
        test: {
          name: "integration",
          env: testPaymentsEnv,
          include: ["tests/integration/**/*.test.ts"],
          globalSetup: ["tests/support/global-setup-integration.ts"],
          // The files share one database: run them one at a time.
          fileParallelism: false,
          testTimeout: 30_000,
          hookTimeout: 120_000,
          sequence: { groupOrder: 1 },
        },
      },
      {
        // The built app on a test port, the fakes, and Debian's Chromium.
        extends: true,
        test: {
          name: "e2e",
          env: testPaymentsEnv,
          include: ["tests/e2e/**/*.test.ts"],
          globalSetup: ["tests/support/global-setup.ts"],
          // The files share one database and one server: run them one at a time.
          fileParallelism: false,
          testTimeout: 30_000,
          hookTimeout: 120_000,
          sequence: { groupOrder: 2 },
        },
      },
    ],
  },
});
