// The two pieces the mutation run adds to StrykerJS (test/mutation/): the reporter that turns a
// test file that fails to load into a failed test, checked with the runner's own result
// collection; and the ignorer that leaves prose lists alone but mutates lists of names.
import { describe, expect, it } from 'vitest';
import type { TestModule } from 'vitest/node';
// The runner's internal helpers (not exported by the package): the very functions it reads results with.
import { collectTestsFromSuite, convertTestToTestResult } from '../../node_modules/@stryker-mutator/vitest-runner/dist/src/vitest-helpers.js';
import LoadFailureReporter from '../mutation/load-failure-reporter.ts';
// @ts-expect-error: a plain JavaScript plugin module without types
import { strykerPlugins } from '../mutation/prose-ignorer.mjs';

/** A vitest file task as the runner sees it, wrapped as the reporter receives it. */
function moduleOf(state: 'pass' | 'fail', tasks: unknown[] = []) {
  const task = { type: 'suite', name: 'test/x.test.ts', id: 'x', filepath: '/p/test/x.test.ts', mode: 'run', tasks, result: { state, errors: state === 'fail' ? [{ message: 'Cannot read properties of undefined' }] : [] } };
  return { module: { task } as unknown as TestModule, task: task as unknown as Parameters<typeof collectTestsFromSuite>[0] & { tasks: unknown[] } };
}

describe('a test file that fails to load (StrykerJS vitest runner 9.6.1)', () => {
  it('counts as one failed test, with its load error, in the runner’s own collection', () => {
    const { module, task } = moduleOf('fail');
    expect(collectTestsFromSuite(task)).toEqual([]); // what the runner saw before: nothing, so "survived"
    new LoadFailureReporter().onTestRunEnd([module]);
    const tests = collectTestsFromSuite(task);
    expect(tests).toHaveLength(1);
    expect(convertTestToTestResult(tests[0]!)).toMatchObject({ status: 1, failureMessage: 'Cannot read properties of undefined' }); // 1 = Failed
  });
  it('leaves a file that loaded alone, whether its tests passed or failed', () => {
    const test = { type: 'test', name: 't', mode: 'run', result: { state: 'fail', errors: [] } };
    const failed = moduleOf('fail', [test]);
    const passed = moduleOf('pass');
    new LoadFailureReporter().onTestRunEnd([failed.module, passed.module]);
    expect(failed.task.tasks).toEqual([test]);
    expect(passed.task.tasks).toEqual([]);
  });
});

describe('the prose ignorer', () => {
  const ignorer = (strykerPlugins as Array<{ value: { shouldIgnore: (path: unknown) => string | undefined } }>)[0]!.value;
  const list = (...elements: unknown[]) => ({ node: { type: 'ArrayExpression', elements } });
  const text = (value: string) => ({ type: 'StringLiteral', value });
  it('leaves lists of sentences unmutated', () => {
    expect(ignorer.shouldIgnore(list(text('Neutral-limited etching; the walls do not react.')))).toBeTypeOf('string');
  });
  it('leaves a quantity’s assumptions alone, shared prose constants included, but no other mixed list', () => {
    const facts = { type: 'Identifier', name: 'SILICON_FACTS' };
    const node = { type: 'ArrayExpression', elements: [text('Uniform well doping.'), facts] };
    const under = (name: string) => ({ node, parent: { type: 'ObjectProperty', key: { type: 'Identifier', name }, value: node } });
    expect(ignorer.shouldIgnore(under('assumptions'))).toBeTypeOf('string');
    expect(ignorer.shouldIgnore(under('inputs'))).toBeUndefined();
    expect(ignorer.shouldIgnore({ node })).toBeUndefined();
  });
  it('mutates lists of names, numbers and empty lists as usual', () => {
    expect(ignorer.shouldIgnore(list(text('etch.open_rate')))).toBeUndefined();
    expect(ignorer.shouldIgnore(list({ type: 'NumericLiteral', value: 1 }))).toBeUndefined();
    expect(ignorer.shouldIgnore(list())).toBeUndefined();
    expect(ignorer.shouldIgnore({ node: text('a sentence alone') })).toBeUndefined();
  });
});
