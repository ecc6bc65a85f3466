// A vitest reporter for mutation runs only (vitest.mutate.config.ts): a test file that fails to
// load becomes one failed test, so a mutant that stops a module from loading counts as killed.
//
// Why: StrykerJS's vitest runner (9.6.1) builds a mutant's result from the tests vitest collected,
// and a test file whose import throws collects none. A static mutant such as `etchEngine = {}`
// makes every suite that imports the engine registry fail to load, yet was reported as survived,
// with only the suites that never import it counted. This reporter runs before the runner reads
// the results and adds, to each failed file that holds no test, a failed test carrying the file's
// load error. Files that loaded are left exactly as they are.
import type { Reporter, TestModule } from 'vitest/node';

/** The parts of vitest's internal file task this reporter reads and writes. */
interface FileTask {
  type: 'suite';
  name: string;
  id: string;
  filepath: string;
  mode: string;
  tasks: unknown[];
  result?: { state?: string; errors?: Array<{ message?: string }> };
}

function holdsTests(tasks: unknown[]): boolean {
  return tasks.some((t) => {
    const task = t as { type?: string; tasks?: unknown[] };
    return task.type === 'test' || (task.type === 'suite' && holdsTests(task.tasks ?? []));
  });
}

export default class LoadFailureReporter implements Reporter {
  onTestRunEnd(testModules: ReadonlyArray<TestModule>): void {
    for (const module of testModules) {
      // `task` is vitest's internal file task: the object the mutation runner reads afterwards.
      const file = (module as unknown as { task: FileTask }).task;
      if (file.result?.state !== 'fail' || holdsTests(file.tasks)) continue;
      const errors = file.result.errors?.length ? file.result.errors : [{ message: 'the test file failed to load' }];
      file.tasks.push({
        type: 'test',
        name: 'loads its modules',
        id: `${file.id}_load`,
        mode: 'run',
        file,
        suite: file,
        meta: {},
        result: { state: 'fail', errors, duration: 0 },
      });
    }
  }
}
