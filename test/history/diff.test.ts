// `plumbline diff`: the change-request summary as a golden file, its links, its exit codes; and
// the handbook read from a revision (links, large files, shallow clones).
import { loadHandbook } from '../../src/pipeline.ts';
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { run } from '../../src/cli/main.ts';
import { GitRepo } from '../../src/history/git.ts';

import { HANDBOOK, TestRepo, arRule, trench } from './repo.ts';

const GOLDEN = resolve(import.meta.dirname, 'golden');
const ada = { name: 'Ada Example', email: 'ada@example.test' };

async function cli(dir: string, ...args: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = '';
  let err = '';
  const code = await run(['--root', dir, ...args], { out: (s) => (out += `${s}\n`), err: (s) => (err += `${s}\n`) });
  return { code, out, err };
}

/** Compare with a golden file; UPDATE_GOLDEN=1 rewrites it (then read the diff before committing). */
function golden(name: string, text: string): void {
  const path = join(GOLDEN, name);
  if (process.env.UPDATE_GOLDEN === '1') writeFileSync(path, text);
  expect(text).toBe(readFileSync(path, 'utf8'));
}

const withLinks = `${HANDBOOK}links:\n  report: https://handbooks.example/history-test/\n  commit: https://code.example/history-test/commit/{commit}\n`;
const twoRules = `${arRule('10')}- id: TR-SPACE-1\n  title: Trenches keep a gap\n  applies_to: { kinds: [trench] }\n  quantity: geometry.space\n  at_least: 30 nm\n  severity: advisory\n`;

let repo: TestRepo;
beforeAll(() => {
  repo = new TestRepo();
  // a: AR 200/25 = 8, space 60 − 25 = 35 nm; b: AR 260/25 = 10.4 (fails ≤ 10), space 35 nm;
  // c: AR 150/30 = 5, space 60 − 30 = 30 nm (at the limit: passes).
  repo.write({ 'handbook.yaml': withLinks, 'structures/a.yaml': trench('a', '25 nm', '200 nm'), 'structures/b.yaml': trench('b', '25 nm', '260 nm'), 'structures/c.yaml': trench('c', '30 nm', '150 nm'), 'rules/geometry.yaml': twoRules });
  repo.commit('Start', ada, '2026-02-02T09:00:00+00:00');
  repo.git('tag', 'base');
});

describe('diff', () => {
  it('prints new failures first, then fixes, then moved margins, each linked, with the input changes', async () => {
    // In the working tree: a deepens past the limit (AR 300/25 = 12), b is fixed (AR 240/25 =
    // 9.6), c widens (cd 32 nm: AR 150/32 = 4.6875, margin +20 % → +53.1 %; space 28 nm < 30 nm,
    // an advisory failure).
    repo.write({ 'structures/a.yaml': trench('a', '25 nm', '300 nm'), 'structures/b.yaml': trench('b', '25 nm', '240 nm'), 'structures/c.yaml': trench('c', '32 nm', '150 nm') });
    const r = await cli(repo.dir, 'diff', 'base', '--on', '2026-02-03');
    expect(r.code).toBe(1);
    golden('diff-working-tree.md', r.out);
    const json = JSON.parse((await cli(repo.dir, 'diff', 'base', '--json', '--on', '2026-02-03')).out) as { introduces_blocking_failure: boolean; transitions: Array<{ kind: string; rule: string; structure: string }> };
    expect(json.introduces_blocking_failure).toBe(true);
    expect(json.transitions.map((t) => `${t.kind} ${t.rule} ${t.structure}`).sort()).toEqual(['fail-to-pass TR-AR-1 b', 'moved TR-AR-1 c', 'pass-to-fail TR-AR-1 a', 'pass-to-fail TR-SPACE-1 c']);
    repo.git('checkout', '-q', '--', '.');
  });

  it('exits 0 when the change fixes and introduces no blocking failure, comparing two commits', async () => {
    repo.write({ 'structures/b.yaml': trench('b', '25 nm', '240 nm') });
    const head = repo.commit('Fix b', ada, '2026-02-03T09:00:00+00:00');
    const r = await cli(repo.dir, 'diff', 'base', head.slice(0, 10), '--on', '2026-02-03');
    expect(r.code).toBe(0);
    golden('diff-fix.md', r.out);
    repo.git('reset', '-q', '--hard', 'base');
  });

  it('says so plainly when nothing moves', async () => {
    const r = await cli(repo.dir, 'diff', 'base', '--on', '2026-02-03');
    expect([r.code, r.out.includes('No verdict changes')]).toEqual([0, true]);
  });

  it('never hands git a revision that reads as an option', () => {
    const g = GitRepo.at(repo.dir);
    const before = g.spawned;
    expect(() => g.resolveCommit('--output=/tmp/plumbline-x')).toThrow(expect.objectContaining({ code: 'unknown-revision' }));
    expect(g.spawned).toBe(before);
  });

  it('refuses an unknown revision and a folder outside git, with exit 2', async () => {
    expect((await cli(repo.dir, 'diff', 'no-such-branch')).code).toBe(2);
    expect((await cli(repo.dir, 'diff', '--', '--output=/tmp/x')).code).toBe(2);
    const plain = mkdtempSync(join(tmpdir(), 'plumbline-nogit-'));
    writeFileSync(join(plain, 'handbook.yaml'), HANDBOOK);
    const r = await cli(plain, 'history');
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/git/);
  });
});

describe('a handbook read from a revision', () => {
  it('names a committed link or a large file at its path and revision, and never follows the link', () => {
    const r = new TestRepo();
    r.write({ 'handbook.yaml': HANDBOOK, 'rules/geometry.yaml': arRule('10'), 'structures/big.yaml': `# ${'x'.repeat(1 << 20)}\n${trench('big', '25 nm', '200 nm')}` });
    execFileSync('ln', ['-s', '/etc/passwd', join(r.dir, 'structures/leak.yaml')]);
    const c = r.commit('Link and large file', ada, '2026-02-02T09:00:00+00:00');
    const g = GitRepo.at(r.dir);
    const loaded = loadHandbook(g.source(c));
    expect(loaded.ok).toBe(false);
    if (loaded.ok) return;
    expect(loaded.diagnostics.map((d) => [d.revision, d.file, d.code])).toEqual([
      [c.slice(0, 7), 'structures/big.yaml', 'file-too-large'],
      [c.slice(0, 7), 'structures/leak.yaml', 'not-a-regular-file'],
    ]);
  });

  it('reads a handbook in a subfolder of the repository, batching git calls across revisions', () => {
    const r = new TestRepo('deep/handbook');
    for (let i = 0; i < 12; i++) {
      r.write({ 'handbook.yaml': HANDBOOK, 'rules/geometry.yaml': arRule('10'), 'structures/a.yaml': trench('a', '25 nm', `${200 + i} nm`) });
      r.commit(`Step ${i}`, ada, `2026-02-${String(i + 1).padStart(2, '0')}T09:00:00+00:00`);
    }
    const g = GitRepo.at(r.dir);
    expect(g.prefix).toBe('deep/handbook');
    const commits = g.commits(g.resolveCommit('HEAD'));
    const before = g.spawned;
    g.prefetchTrees(commits.map((c) => c.oid));
    g.prefetchBlobs(commits.map((c) => g.snapshot(c.oid)));
    // One call for the roots, one per folder depth (root, structures/ and rules/), two for blobs.
    expect(g.spawned - before).toBeLessThanOrEqual(5);
    const values = commits.map((c) => {
      const l = loadHandbook(g.source(c.oid));
      return l.ok ? l.handbook.structures[0]!.params.get('geometry.depth')!.written : 'failed';
    });
    expect(values).toEqual(Array.from({ length: 12 }, (_, i) => `${200 + i} nm`));
    expect(g.spawned - before).toBeLessThanOrEqual(5);
  });

  it('a shallow clone says so and tells how to fetch the whole history', async () => {
    const r = new TestRepo();
    r.write({ 'handbook.yaml': HANDBOOK, 'rules/geometry.yaml': arRule('10'), 'structures/a.yaml': trench('a', '25 nm', '200 nm') });
    r.commit('One', ada, '2026-02-02T09:00:00+00:00');
    r.write({ 'structures/a.yaml': trench('a', '25 nm', '260 nm') });
    r.commit('Two', ada, '2026-02-03T09:00:00+00:00');
    const clone = join(mkdtempSync(join(tmpdir(), 'plumbline-shallow-')), 'c');
    execFileSync('git', ['clone', '-q', '--depth', '1', `file://${r.dir}`, clone]);
    const h = await cli(clone, 'history');
    expect(h.code).toBe(0);
    expect(h.out).toMatch(/shallow.*git fetch --unshallow/);
    const json = JSON.parse((await cli(clone, 'history', '--json')).out) as { shallow: boolean; note: string };
    expect([json.shallow, json.note.includes('--unshallow')]).toEqual([true, true]);
  });
});

describe('check --sarif', () => {
  it('writes a log that validates against the OASIS 2.1.0 schema, with baseline states against a revision', async () => {
    const { sarifValidator } = await import('../report/sarif-schema.ts');
    const r = new TestRepo();
    // At base: a passes (AR 8), b fails (AR 10.4 > 10). In the working tree b is unchanged, a
    // deepens to AR 12 (a new failure), c is added failing (AR 330/30 = 11).
    r.write({ 'handbook.yaml': withLinks, 'rules/geometry.yaml': arRule('10'), 'structures/a.yaml': trench('a', '25 nm', '200 nm'), 'structures/b.yaml': trench('b', '25 nm', '260 nm') });
    r.commit('Base', ada, '2026-02-02T09:00:00+00:00');
    r.write({ 'structures/a.yaml': trench('a', '25 nm', '300 nm'), 'structures/c.yaml': trench('c', '30 nm', '330 nm') });
    const file = join(r.dir, 'plumbline.sarif');
    expect((await cli(r.dir, 'check', '--sarif', file, '--baseline', 'HEAD', '--on', '2026-02-03')).code).toBe(1);
    const log = JSON.parse(readFileSync(file, 'utf8')) as { runs: Array<{ results: Array<{ ruleId: string; baselineState: string; partialFingerprints: Record<string, string>; locations: Array<{ physicalLocation: { artifactLocation: { uri: string } } }> }> }> };
    const validate = sarifValidator();
    expect(validate(log) ? [] : validate.errors).toEqual([]);
    expect(log.runs[0]!.results.map((x) => [x.locations[0]!.physicalLocation.artifactLocation.uri, x.baselineState])).toEqual([
      ['structures/a.yaml', 'new'],
      ['structures/b.yaml', 'unchanged'],
      ['structures/c.yaml', 'new'],
    ]);
    // A file that is not a SARIF log of ours is never replaced.
    const other = join(r.dir, 'notes.json');
    writeFileSync(other, '{"mine": true}\n');
    expect((await cli(r.dir, 'check', '--sarif', other, '--on', '2026-02-03')).code).toBe(2);
    expect(readFileSync(other, 'utf8')).toBe('{"mine": true}\n');
  });
});
