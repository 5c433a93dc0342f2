// @ts-check
/**
 * Mutation testing of the data layer's access and state rules (lib/data) against the
 * integration project on the real MariaDB: `npm run mutate:data`. It uses a database of its own
 * (MUTATE_DB_NAME, default loopwright_test_mutate, made by tests/mutation/prepare-db.ts) and
 * fake ports of its own; one test runner at a time, because the tests share that database.
 * Scoped: `npm run mutate:data -- --mutate "lib/data/quotes.ts"`.
 * HTML report: reports/mutation/data/index.html (git-ignored).
 * @type {import('@stryker-mutator/api/core').PartialStrykerOptions}
 */
const config = {
  testRunner: "vitest",
  vitest: { configFile: "tests/mutation/vitest.data.config.ts", related: true },
  checkers: ["typescript"],
  tsconfigFile: "tsconfig.mutate.json",
  typescriptChecker: { prioritizePerformanceOverAccuracy: true },
  coverageAnalysis: "perTest",
  mutate: [
    "lib/data/**/*.ts",
    // Connection set-up and re-exports: no access or state rule in them.
    "!lib/data/db.ts",
    "!lib/data/json.ts",
    "!lib/data/actor.ts",
  ],
  // One database and one set of fake ports: the runs must not overlap.
  concurrency: 1,
  timeoutMS: 60_000,
  // The first run (every related integration test, with coverage) takes over Stryker's default
  // 5 minutes on a loaded 2-core machine.
  dryRunTimeoutMinutes: 30,
  incremental: true,
  incrementalFile: "reports/mutation/data/stryker-incremental.json",
  reporters: ["clear-text", "progress-append-only", "html", "json"],
  htmlReporter: { fileName: "reports/mutation/data/index.html" },
  jsonReporter: { fileName: "reports/mutation/data/mutation.json" },
  clearTextReporter: { allowColor: false, logTests: false, reportScoreTable: true },
  thresholds: { high: 85, low: 80, break: null },
  ignorePatterns: [".next", ".data", "reports", "tests/e2e/screenshots", "coverage"],
  tempDirName: ".stryker-tmp",
  cleanTempDir: "always",
};

export default config;
