// The suites Stryker runs for every mutant of src/engines/ and src/checker/ (`npm run mutate`):
// the fast unit suites that exercise them. Left out: the browser tests (they start a browser), and
// integration suites that do not test engine or checker numbers but would run for every static
// mutant — git history, report site builds and publishing, the CLI, the bad-input corpus, the
// package checks, and the property tests (the engines' one only asks for finite values, over
// seven seconds a run).
import { configDefaults, defineConfig, mergeConfig } from 'vitest/config';
import base from './vitest.config.ts';

const config = mergeConfig(
  base,
  defineConfig({
    test: {
      // A test file that fails to load counts as a failed test (see the reporter's header).
      reporters: ['default', './test/mutation/load-failure-reporter.ts'],
      // Engine memo tables start empty in every test (see the file's header).
      setupFiles: ['./test/mutation/forget-memos.ts'],
      exclude: [
        ...configDefaults.exclude,
        'test/browser/**',
        'test/history/**',
        'test/report/**',
        'test/cli/**',
        'test/corpus/**',
        'test/project/**',
        'test/property/loader.property.test.ts',
        'test/property/engines.property.test.ts',
        'test/property/units.property.test.ts',
      ],
    },
  }),
);

// PLUMBLINE_MUTATE_SUITES narrows a run to the test files it lists (comma-separated globs, such as
// test/engines/deposition.test.ts). For a file the fill march calls in its inner loops
// (deposition/models.ts), instrumentation makes a test that marches a fill a hundred times
// slower (one took over a minute), and a run over every suite that reaches the file takes many
// hours. A score measured so is a lower bound (fewer tests, never more). Replaced, not merged:
// mergeConfig would append to the include list.
const only = process.env.PLUMBLINE_MUTATE_SUITES;
if (only) config.test = { ...config.test, include: only.split(',') };

export default config;
