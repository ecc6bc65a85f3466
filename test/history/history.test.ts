// History over a repository built here: commits that change a structure and a rule, a rename, a
// branch and its merge, commits with and without a ledger, a waiver added and expiring. Every
// transition, author and input change is asserted exactly.
//
// The numbers are aspect ratios of the test trenches, depth / cd (the definition of the aspect
// ratio, worked by hand): 200/25 = 8, 260/25 = 10.4, 150/30 = 5, 360/30 = 12. Margins of an at_most
// rule are (limit − value)/limit: (10 − 8)/10 = +20 %, (10 − 10.4)/10 = −4 %, (11 − 10.4)/11 =
// +5.45 %, (11 − 12)/11 = −9.09 %.
import { beforeAll, describe, expect, it } from 'vitest';
import { GitRepo } from '../../src/history/git.ts';
import { HistoryCache } from '../../src/history/cache.ts';
import { changeText, walkHistory, type HistoryReport, type Transition } from '../../src/history/history.ts';
import { LEDGER_FILE } from '../../src/history/ledger.ts';
import { run } from '../../src/cli/main.ts';
import { HANDBOOK, TestRepo, arRule, trench } from './repo.ts';

const ada = { name: 'Ada Example', email: 'ada@example.test' };
const ben = { name: 'Ben Sample', email: 'ben@example.test' };
const cora = { name: 'Cora Fictive', email: 'cora@example.test' };

const waiver = `id: W-TR-1
rule: TR-AR-1
structures: [trench-c]
reason: Deep trench-c is qualified by a split lot (invented).
owner: Dana Placeholder
approved_by: Eli Madeup
expires: 2026-02-15
`;

type Step = 'start' | 'deeper' | 'rename' | 'side' | 'relax' | 'merge' | 'notes' | 'waive';
interface Built {
  repo: TestRepo;
  c: Record<Step, string>;
}

async function cli(dir: string, ...args: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = '';
  let err = '';
  const code = await run(['--root', dir, ...args], { out: (s) => (out += `${s}\n`), err: (s) => (err += `${s}\n`) });
  return { code, out, err };
}

/** The scenario; commit ids by name. */
async function build(): Promise<Built> {
  const repo = new TestRepo('handbook');
  const c = {} as Record<Step, string>;
  repo.write({ 'handbook.yaml': HANDBOOK, 'structures/trench-a.yaml': trench('trench-a', '25 nm', '200 nm'), 'rules/geometry.yaml': arRule('10') });
  c.start = repo.commit('Start the handbook', ada, '2026-01-05T09:00:00+01:00');
  // A ledger committed with the change, written by the CLI as a team would.
  repo.write({ 'structures/trench-a.yaml': trench('trench-a', '25 nm', '260 nm') });
  expect((await cli(repo.dir, 'check', '--ledger', '--on', '2026-01-12')).code).toBe(1);
  c.deeper = repo.commit('Deepen trench-a', ben, '2026-01-12T10:30:00-05:00');
  // A rename: the structure's id is its file name, so both change.
  repo.move('structures/trench-a.yaml', 'structures/trench-b.yaml');
  repo.write({ 'structures/trench-b.yaml': trench('trench-b', '25 nm', '260 nm') });
  c.rename = repo.commit('Rename trench-a to trench-b', ada, '2026-01-19T09:00:00+01:00');
  // A branch adds a structure while the main line relaxes the rule; then the branch is merged.
  repo.git('checkout', '-q', '-b', 'side');
  repo.write({ 'structures/trench-c.yaml': trench('trench-c', '30 nm', '150 nm') });
  c.side = repo.commit('Add trench-c', cora, '2026-01-20T09:00:00+00:00');
  repo.git('checkout', '-q', 'main');
  repo.write({ 'rules/geometry.yaml': arRule('11') });
  c.relax = repo.commit('Relax the aspect-ratio limit to 11', ben, '2026-01-21T09:00:00+00:00');
  c.merge = repo.merge('side', 'Merge trench-c', ada, '2026-01-22T09:00:00+00:00');
  // A commit that changes nothing of the handbook (a file outside its folder).
  repo.write({ '../NOTES.md': 'notes\n' });
  c.notes = repo.commit('Notes only', ada, '2026-01-23T09:00:00+00:00');
  // trench-c deepens past the limit in the same commit that waives it (no ledger committed).
  repo.write({ 'structures/trench-c.yaml': trench('trench-c', '30 nm', '360 nm'), 'waivers/trench-c.yaml': waiver });
  c.waive = repo.commit('Deepen trench-c under waiver W-TR-1', cora, '2026-01-26T09:00:00+00:00');
  return { repo, c };
}

let built: Built;
let report: HistoryReport;
const short = (oid: string) => oid.slice(0, 7);
const brief = (t: Transition) => `${short(t.commit.oid)} ${t.kind} ${t.rule} ${t.structure}${t.renamedFrom ? ` (was ${t.renamedFrom})` : ''}: ${t.valueFrom ?? '·'} → ${t.valueTo ?? '·'} | ${t.causes.map(changeText).join('; ')}`;

beforeAll(async () => {
  built = await build();
  report = walkHistory(GitRepo.at(built.repo.dir), new HistoryCache(), { today: '2026-03-01' });
}, 60_000);

describe('history of a repository built in the test', () => {
  it('lists every transition, at the commit that made it, with the input change behind it', () => {
    const { c } = built;
    expect(report.transitions.map(brief)).toEqual([
      `${short(c.start)} new TR-AR-1 trench-a: · → 8 | rule TR-AR-1 added; structure trench-a added`,
      `${short(c.deeper)} pass-to-fail TR-AR-1 trench-a: 8 → 10.4 | geometry.depth 200 nm → 260 nm at structures/trench-a.yaml:6`,
      // The rename is followed: no "removed" and "new", and nothing changed, so no transition.
      `${short(c.side)} new TR-AR-1 trench-c: · → 5 | structure trench-c added`,
      `${short(c.relax)} fail-to-pass TR-AR-1 trench-b: 10.4 → 10.4 | TR-AR-1 limit at_most 10 → at_most 11`,
      // The merge brings nothing of its own: trench-c's arrival stays with the branch commit.
      `${short(c.waive)} waived TR-AR-1 trench-c: 5 → 12 | geometry.depth 150 nm → 360 nm at structures/trench-c.yaml:6; waiver added: W-TR-1 until 2026-02-15`,
    ]);
  });

  it('names commit, author, date and subject as git records them', () => {
    const t = report.transitions.find((x) => x.kind === 'pass-to-fail')!;
    expect(t.commit).toEqual({ oid: built.c.deeper, short: short(built.c.deeper), author: 'Ben Sample', email: 'ben@example.test', date: '2026-01-12T10:30:00-05:00', subject: 'Deepen trench-a' });
    expect([t.marginFrom, t.marginTo].map((m) => Math.round(m! * 1e4) / 1e4)).toEqual([0.2, -0.04]);
  });

  it('skips commits that change nothing the loader reads, and keeps the merge as a revision', () => {
    const { c } = built;
    expect(report.revisions.map((r) => short(r.commit.oid))).toEqual([c.start, c.deeper, c.rename, c.side, c.relax, c.merge, c.waive].map(short));
    expect(report.stats.commits).toBe(8);
  });

  it('shows when the waiver was added, by whom, and when it expired', () => {
    expect(report.waivers.map((w) => [w.kind, w.waiver, w.commit?.author ?? null, w.date, w.failsAgain ?? null])).toEqual([
      ['added', 'W-TR-1', 'Cora Fictive', '2026-01-26T09:00:00+00:00', null],
      // Its last day is 2026-02-15; from the 16th the failure counts again.
      ['expired', 'W-TR-1', null, '2026-02-16', ['TR-AR-1 trench-c']],
    ]);
  });

  it('finds no disagreement with a ledger the same engines wrote', () => {
    expect(report.disagreements).toEqual([]);
  });

  it('filters by rule or structure, following the rename', () => {
    const h = walkHistory(GitRepo.at(built.repo.dir), new HistoryCache(), { subject: 'trench-a', today: '2026-03-01' });
    expect(h.transitions.map((t) => t.kind)).toEqual(['new', 'pass-to-fail']);
    const b = walkHistory(GitRepo.at(built.repo.dir), new HistoryCache(), { subject: 'trench-b', today: '2026-03-01' });
    expect(b.transitions.map((t) => t.kind)).toEqual(['fail-to-pass']);
  });

  it('walks only the main line with firstParent, where the merge brings trench-c', () => {
    const h = walkHistory(GitRepo.at(built.repo.dir), new HistoryCache(), { firstParent: true, today: '2026-03-01' });
    expect(h.transitions.filter((t) => t.structure === 'trench-c').map((t) => [short(t.commit.oid), t.kind])).toEqual([
      [short(built.c.merge), 'new'],
      [short(built.c.waive), 'waived'],
    ]);
  });

  it('starts after --since, reporting nothing of the starting commit itself', () => {
    const h = walkHistory(GitRepo.at(built.repo.dir), new HistoryCache(), { since: built.c.rename, today: '2026-03-01' });
    expect(h.transitions.map((t) => `${short(t.commit.oid)} ${t.kind}`)).toEqual([`${short(built.c.side)} new`, `${short(built.c.relax)} fail-to-pass`, `${short(built.c.waive)} waived`]);
  });
});

describe('the cache', () => {
  it('a second run evaluates nothing, and a run after one new commit only what it changed', () => {
    const cache = new HistoryCache();
    const first = walkHistory(GitRepo.at(built.repo.dir), cache, { today: '2026-03-01' });
    // Pairs evaluated: one per distinct inputs hash (trench-a 8, trench-a 10.4 under ≤10, trench-b
    // under ≤11, trench-c 5 under ≤10 and ≤11, trench-c 12 under ≤11): 6.
    expect(first.stats.evaluated).toBe(6);
    const second = walkHistory(GitRepo.at(built.repo.dir), cache, { today: '2026-03-01' });
    expect(second.stats).toMatchObject({ evaluated: 0, loaded: 0 });
    expect(second.transitions).toEqual(first.transitions);
    built.repo.write({ 'structures/trench-b.yaml': trench('trench-b', '25 nm', '250 nm') });
    built.repo.commit('trench-b a little shallower', ben, '2026-01-27T09:00:00+00:00');
    const third = walkHistory(GitRepo.at(built.repo.dir), cache, { today: '2026-03-01' });
    expect(third.stats).toMatchObject({ evaluated: 1, loaded: 1 });
    built.repo.git('reset', '-q', '--hard', 'HEAD~1');
  });

  it('keeps the cache on disk inside the git folder, and reads it back', () => {
    const repo = GitRepo.at(built.repo.dir);
    const dir = HistoryCache.folderFor(repo.commonDir);
    const a = new HistoryCache(dir);
    walkHistory(repo, a, { today: '2026-03-01' });
    a.save();
    const b = new HistoryCache(dir);
    expect(walkHistory(GitRepo.at(built.repo.dir), b, { today: '2026-03-01' }).stats).toMatchObject({ evaluated: 0, loaded: 0 });
    expect(dir.startsWith(repo.commonDir)).toBe(true);
  });
});

describe('ledger disagreements', () => {
  it('says when a committed ledger disagrees with the engines for the same inputs', async () => {
    const repo = new TestRepo();
    repo.write({ 'handbook.yaml': HANDBOOK, 'structures/t.yaml': trench('t', '25 nm', '200 nm'), 'rules/geometry.yaml': arRule('10') });
    expect((await cli(repo.dir, 'check', '--ledger', '--on', '2026-01-05')).code).toBe(0);
    // As if older engines had said 9 (the inputs hash is unchanged).
    const { readFileSync, writeFileSync } = await import('node:fs');
    const path = `${repo.dir}/${LEDGER_FILE}`;
    writeFileSync(path, readFileSync(path, 'utf8').replace('\tpass\t8\t', '\tpass\t9\t'));
    repo.commit('Start', ada, '2026-01-05T09:00:00+01:00');
    const h = walkHistory(GitRepo.at(repo.dir), new HistoryCache(), {});
    expect(h.disagreements.map((d) => [d.rule, d.structure, d.committed, d.now, d.engines])).toEqual([['TR-AR-1', 't', 'pass 9', 'pass 8', true]]);
  });

  it('a revision that does not load is listed with its first problem, and skipped for transitions', async () => {
    const repo = new TestRepo();
    repo.write({ 'handbook.yaml': HANDBOOK, 'structures/t.yaml': trench('t', '25 nm', '200 nm'), 'rules/geometry.yaml': arRule('10') });
    repo.commit('Start', ada, '2026-01-05T09:00:00+01:00');
    repo.write({ 'structures/t.yaml': trench('t', '25 parsecs', '200 nm') });
    const broken = repo.commit('Typo', ada, '2026-01-06T09:00:00+01:00');
    repo.write({ 'structures/t.yaml': trench('t', '25 nm', '260 nm') });
    const fixed = repo.commit('Fix and deepen', ada, '2026-01-07T09:00:00+01:00');
    const h = walkHistory(GitRepo.at(repo.dir), new HistoryCache(), {});
    const b = h.revisions.find((r) => r.commit.oid === broken)!;
    expect([b.loaded, b.problems]).toEqual([false, 1]);
    // The position names the revision and the file; `  cd: 25 parsecs` is line 5, its value at column 7.
    expect(b.firstProblem).toMatch(new RegExp(`^${short(broken)}:structures/t\\.yaml:5:7 geometry\\.cd:`));
    // The fixed commit is compared with the last revision that loaded.
    expect(h.transitions.map((t) => [t.kind, t.commit.oid === fixed])).toEqual([
      ['new', false],
      ['pass-to-fail', true],
    ]);
  });
});

describe('edges of a history', () => {
  it('lists a handbook added after the first commit as new, and the shallow edge as a start, not as new', () => {
    const repo = new TestRepo();
    repo.write({ 'README.md': 'a repository that gains a handbook later\n' });
    repo.commit('Readme', ada, '2026-01-01T09:00:00+00:00');
    repo.write({ 'handbook.yaml': HANDBOOK, 'structures/t.yaml': trench('t', '25 nm', '200 nm'), 'rules/geometry.yaml': arRule('10') });
    const added = repo.commit('Add the handbook', ada, '2026-01-02T09:00:00+00:00');
    const h = walkHistory(GitRepo.at(repo.dir), new HistoryCache(), {});
    expect(h.transitions.map((t) => [t.kind, t.commit.oid === added])).toEqual([['new', true]]);
    const clone = `${repo.dir}-shallow`;
    repo.git('clone', '-q', '--depth', '1', `file://${repo.dir}`, clone);
    const s = walkHistory(GitRepo.at(clone), new HistoryCache(), {});
    expect([s.shallow, s.transitions.length]).toEqual([true, 0]);
  });

  it('lists an advisory failure made blocking, and diff gates on it', async () => {
    const repo = new TestRepo();
    const advisory = arRule('10').replace('at_most: 10\n', 'at_most: 10\n  severity: advisory\n');
    repo.write({ 'handbook.yaml': HANDBOOK, 'structures/t.yaml': trench('t', '25 nm', '260 nm'), 'rules/geometry.yaml': advisory });
    repo.commit('Advisory', ada, '2026-01-01T09:00:00+00:00');
    repo.write({ 'rules/geometry.yaml': arRule('10') });
    const r = await cli(repo.dir, 'diff', 'HEAD', '--json', '--on', '2026-01-02');
    const j = JSON.parse(r.out) as { introduces_blocking_failure: boolean; transitions: Array<{ kind: string }> };
    expect([r.code, j.introduces_blocking_failure, j.transitions.map((t) => t.kind)]).toEqual([1, true, ['status']]);
  });

  it('reads the handbook folder it is given, whatever GIT_DIR a hook exported', async () => {
    const repo = new TestRepo('hb');
    repo.write({ 'handbook.yaml': HANDBOOK, 'structures/t.yaml': trench('t', '25 nm', '200 nm'), 'rules/geometry.yaml': arRule('10') });
    repo.commit('Start', ada, '2026-01-01T09:00:00+00:00');
    const before = process.env.GIT_DIR;
    process.env.GIT_DIR = `${repo.dir}/../.git`;
    try {
      const h = walkHistory(GitRepo.at(repo.dir), new HistoryCache(), {});
      expect(h.transitions.map((t) => t.kind)).toEqual(['new']);
    } finally {
      if (before === undefined) delete process.env.GIT_DIR;
      else process.env.GIT_DIR = before;
    }
  });
});
