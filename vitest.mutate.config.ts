// The suites Stryker runs for every mutant of src/engines/ and src/checker/ (`npm run mutate`):
// the fast unit suites that exercise them. Left out: the browser tests (they start a browser), and
// integration suites that do not test engine or checker numbers but would run for every static
// mutant — git history, report site builds and publishing, the CLI, the bad-input corpus, the
// package checks, and the property tests (the engines' one only asks for finite values, over
// seven seconds a run).
import { configDefaults, defineConfig, mergeConfig } from 'vitest/config';
import base from './vitest.config.ts';

export default mergeConfig(
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
