// @ts-check
/**
 * Mutation testing of the pure rules (lib/calc, lib/checklist, lib/jobs) against the unit
 * project: `npm run mutate`. Scoped while working: `npm run mutate -- --mutate "lib/jobs/**"`.
 * Incremental: results are kept in reports/mutation/ (git-ignored) and a rerun tests only the
 * mutants whose code or covering tests changed. The HTML report lands in
 * reports/mutation/unit/index.html. Survivors left on purpose: tests/mutation/survivors.md.
 * @type {import('@stryker-mutator/api/core').PartialStrykerOptions}
 */
const config = {
  testRunner: "vitest",
  vitest: { configFile: "tests/mutation/vitest.unit.config.ts", related: true },
  checkers: ["typescript"],
  tsconfigFile: "tsconfig.mutate.json",
  typescriptChecker: { prioritizePerformanceOverAccuracy: true },
  coverageAnalysis: "perTest",
  mutate: [
    "lib/calc/**/*.ts",
    "lib/checklist/**/*.ts",
    "lib/jobs/**/*.ts",
    // The example scenario is demo data, not a rule; index.ts only re-exports.
    "!lib/calc/demo-system.ts",
    "!lib/jobs/index.ts",
  ],
  // The machine is shared: two cores at most (use 1 beside other work: --concurrency 1).
  concurrency: 2,
  timeoutMS: 20_000,
  incremental: true,
  incrementalFile: "reports/mutation/unit/stryker-incremental.json",
  reporters: ["clear-text", "progress-append-only", "html", "json"],
  htmlReporter: { fileName: "reports/mutation/unit/index.html" },
  jsonReporter: { fileName: "reports/mutation/unit/mutation.json" },
  clearTextReporter: { allowColor: false, logTests: false, reportScoreTable: true },
  thresholds: { high: 90, low: 85, break: null },
  ignorePatterns: [".next", ".data", "reports", "tests/e2e/screenshots", "coverage"],
  tempDirName: ".stryker-tmp",
  cleanTempDir: "always",
};

export default config;
