// Mutation testing of the engines and the checker (`npm run mutate`; DEVELOPERS.md, "Mutation
// testing"). Narrow a run with `npm run mutate -- --mutate src/engines/geometry/index.ts`.
// Stryker mutates copies in a sandbox under .stryker-tmp/, never the working tree.

/** @type {import('@stryker-mutator/api/core').PartialStrykerOptions} */
export default {
  testRunner: 'vitest',
  plugins: ['@stryker-mutator/vitest-runner', './test/mutation/prose-ignorer.mjs'],
  // Only the fast unit suites (no browser, history, site, CLI or corpus suites).
  vitest: { configFile: 'vitest.mutate.config.ts' },
  // Not the test-particle Monte Carlo: no engine computes with it; it is the independent method the
  // tests hold the engines to (itself held to Cole's values and exact view factors), and its
  // instrumented particle loops would make every run many times slower.
  mutate: ['src/engines/**/*.ts', '!src/engines/transport/montecarlo.ts', 'src/checker/**/*.ts'],
  // Strings here are prose and TeX (titles, sources, reasons, formulas shown on the pages), not
  // computation: the report's own tests read them. Every other mutator runs.
  mutator: { excludedMutations: ['StringLiteral'] },
  // Nor are lists made only of strings (assumptions, reasons): test/mutation/prose-ignorer.mjs.
  ignorers: ['prose'],
  // Each mutant runs only the tests that reached it in the first, instrumented run.
  coverageAnalysis: 'perTest',
  // Re-test only mutants whose code or covering tests changed since the last run.
  incremental: true,
  incrementalFile: 'reports/mutation/stryker-incremental.json',
  // Two test processes, one per core of this machine (lower it when the machine is shared).
  concurrency: 2,
  // Added to each mutant's expected time (its covering tests' time in the first run × 1.5): on a
  // loaded machine the default 5 s turned survivors into false timeouts, which count as detected;
  // 30 s made every endless loop a mutant creates cost half a minute.
  timeoutMS: 12_000,
  reporters: ['clear-text', 'progress', 'html', 'json'],
  htmlReporter: { fileName: 'reports/mutation/mutation.html' },
  jsonReporter: { fileName: 'reports/mutation/mutation.json' },
  clearTextReporter: { allowColor: false, logTests: false },
  tempDirName: '.stryker-tmp',
  // Build output and caches need not be copied into the sandbox.
  ignorePatterns: ['site', '.site-*', 'coverage', '.cache'],
  thresholds: { high: 80, low: 60, break: null },
};
