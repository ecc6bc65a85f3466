// Setup file of the mutation runs (vitest.mutate.config.ts): every test starts with empty engine
// memo tables, so the per-test coverage Stryker records names every test whose numbers come from a
// piece of engine code — not only the first test that happened to compute (and store) the result.
import { beforeEach } from 'vitest';
import { forgetMemos } from '../../src/engines/memo.ts';

beforeEach(() => forgetMemos());
