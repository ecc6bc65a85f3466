// The verdict ledger: canonical bytes (any run, file order, locale or time zone), `--verify`
// naming exactly the lines that differ, and a file plumbline did not write is never replaced.
import { loadHandbook } from '../../src/pipeline.ts';
import { execFileSync, spawnSync } from 'node:child_process';
import { cpSync, lstatSync, mkdtempSync, readFileSync, rmSync, symlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';

import { MemorySource } from '../../src/model/memory-source.ts';
import { LEDGER_FILE, LEDGER_HEADER, ledgerText, parseLedger } from '../../src/history/ledger.ts';
import { evaluateRows } from '../../src/history/rows.ts';
import { run } from '../../src/cli/main.ts';
import { HANDBOOK, arRule, trench } from './repo.ts';

const ROOT = resolve(import.meta.dirname, '../..');
const BIN = join(ROOT, 'bin/plumbline.js');

function demoCopy(): string {
  const dir = mkdtempSync(join(tmpdir(), 'plumbline-ledger-'));
  for (const p of ['handbook.yaml', 'materials.yaml', 'structures', 'rules', 'waivers']) cpSync(join(ROOT, p), join(dir, p), { recursive: true });
  return dir;
}

async function cli(dir: string, ...args: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = '';
  let err = '';
  const code = await run(['--root', dir, ...args], { out: (s) => (out += `${s}\n`), err: (s) => (err += `${s}\n`) });
  return { code, out, err };
}

function ledgerOf(files: Record<string, string>): string {
  const r = loadHandbook(new MemorySource(files));
  if (!r.ok) throw new Error(JSON.stringify(r.diagnostics));
  return ledgerText(evaluateRows(r.handbook).rows);
}

describe('ledger text', () => {
  it('is one line per verdict, tab-separated, sorted by rule then structure', () => {
    const text = ledgerOf({ 'handbook.yaml': HANDBOOK, 'structures/b.yaml': trench('b', '25 nm', '260 nm'), 'structures/a.yaml': trench('a', '25 nm', '200 nm'), 'rules/r.yaml': arRule('10') });
    const lines = text.split('\n');
    expect(lines[0]).toBe(LEDGER_HEADER);
    // Aspect ratios 200/25 = 8 and 260/25 = 10.4 (worked by hand); margins (10 − 8)/10 = +20 %
    // and (10 − 10.4)/10 = −4 %. The inputs hash is not checked by value: it is ours.
    expect(lines.slice(2, 4).map((l) => l.split('\t').filter((_, i) => i !== 8))).toEqual([
      ['TR-AR-1', 'a', 'pass', '8', '≤ 10', '+20 %', 'nominal', 'blocking', '-'],
      ['TR-AR-1', 'b', 'fail', '10.4', '≤ 10', '-4 %', 'nominal', 'blocking', '-'],
    ]);
    expect(lines[4]).toBe('');
    expect(lines.length).toBe(5);
  });

  it('does not depend on file order, file names of rules, or where a value is written', () => {
    const a = ledgerOf({ 'handbook.yaml': HANDBOOK, 'structures/a.yaml': trench('a', '25 nm', '200 nm'), 'structures/b.yaml': trench('b', '25 nm', '260 nm'), 'rules/r.yaml': arRule('10') });
    const b = ledgerOf({ 'rules/sub/other-name.yaml': `# moved\n\n${arRule('10')}`, 'structures/z/b.yaml': trench('b', '25 nm', '260 nm'), 'structures/a.yaml': `# a comment first\n${trench('a', '25 nm', '200 nm')}`, 'handbook.yaml': HANDBOOK });
    expect(b).toBe(a);
  });

  it('changes its inputs hash when a tolerance changes, and only then', () => {
    const hash = (depth: string) => ledgerOf({ 'handbook.yaml': HANDBOOK, 'structures/a.yaml': trench('a', '25 nm', depth), 'rules/r.yaml': arRule('10') }).split('\n')[2]!.split('\t')[8];
    expect(hash('200 nm')).toBe(hash('0.2 um'));
    expect(hash('200 nm ± 5 nm')).not.toBe(hash('200 nm ± 6 nm'));
    expect(hash('200 nm')).not.toBe(hash('200 nm ± 5 nm'));
  });

  it('parses back what it wrote', () => {
    const text = ledgerOf({ 'handbook.yaml': HANDBOOK, 'structures/a.yaml': trench('a', '25 nm', '200 nm'), 'rules/r.yaml': arRule('10') });
    const p = parseLedger(text);
    expect(p.ok && p.lines.get('TR-AR-1 a')?.value).toBe('8');
    expect(parseLedger('not a ledger\n')).toMatchObject({ ok: false });
  });
});

describe('check --ledger', () => {
  it('writes the same bytes in another locale and time zone, run after run', () => {
    const dir = demoCopy();
    const write = (env: Record<string, string>) => {
      spawnSync(process.execPath, [BIN, '--root', dir, 'check', '--ledger', '--on', '2026-12-02'], { env: { PATH: process.env.PATH ?? '', ...env } });
      return readFileSync(join(dir, LEDGER_FILE));
    };
    const first = write({ LC_ALL: 'C', TZ: 'UTC' });
    rmSync(join(dir, LEDGER_FILE));
    const second = write({ LC_ALL: 'de_DE.UTF-8', LANG: 'de_DE.UTF-8', TZ: 'Pacific/Kiritimati' });
    expect(second.equals(first)).toBe(true);
    expect(first.toString('utf8').split('\n').length).toBeGreaterThan(40);
  }, 60_000);

  it('--verify exits 0 on a current ledger and 1 on a stale one, printing exactly the lines that differ', async () => {
    const dir = demoCopy();
    expect((await cli(dir, 'check', '--ledger', '--on', '2026-12-02')).code).toBe(1); // the demo has blocking failures
    expect((await cli(dir, 'check', '--ledger', '--verify', '--on', '2026-12-02')).code).toBe(0);
    const path = join(dir, 'structures/channel-hole.yaml');
    writeFileSync(path, readFileSync(path, 'utf8').replace('time_budget: 25 min', 'time_budget: 20 min'));
    const stale = await cli(dir, 'check', '--ledger', '--verify', '--on', '2026-12-02');
    expect(stale.code).toBe(1);
    const diff = stale.err.split('\n').filter((l) => l.startsWith('- ') || l.startsWith('+ '));
    // The time budget feeds the etch rules of the channel hole and nothing else.
    expect(new Set(diff.map((l) => l.slice(2).split('\t').slice(0, 2).join(' ')))).toEqual(new Set(['CH-ETCH-1 channel-hole']));
    expect(diff.map((l) => l[0])).toEqual(['-', '+']);
    // Nothing was written by --verify.
    expect((await cli(dir, 'check', '--ledger', '--verify', '--on', '2026-12-02')).code).toBe(1);
  }, 60_000);

  it('--verify without a ledger says how to write one', async () => {
    const dir = demoCopy();
    const r = await cli(dir, 'check', '--ledger', '--verify', '--on', '2026-12-02');
    expect(r.code).toBe(1);
    expect(r.err).toMatch(/check --ledger/);
  });

  it('never replaces a file it did not write, or a link', async () => {
    const dir = demoCopy();
    writeFileSync(join(dir, LEDGER_FILE), 'our own notes\n');
    const r = await cli(dir, 'check', '--ledger', '--on', '2026-12-02');
    expect(r.code).toBe(2);
    expect(readFileSync(join(dir, LEDGER_FILE), 'utf8')).toBe('our own notes\n');
    rmSync(join(dir, LEDGER_FILE));
    const target = join(mkdtempSync(join(tmpdir(), 'plumbline-elsewhere-')), 'x');
    writeFileSync(target, `${LEDGER_HEADER}\n`);
    symlinkSync(target, join(dir, LEDGER_FILE));
    expect((await cli(dir, 'check', '--ledger', '--on', '2026-12-02')).code).toBe(2);
    expect(lstatSync(join(dir, LEDGER_FILE)).isSymbolicLink()).toBe(true);
    expect(readFileSync(target, 'utf8')).toBe(`${LEDGER_HEADER}\n`);
  });

  it('leaves no temporary file behind', async () => {
    const dir = demoCopy();
    await cli(dir, 'check', '--ledger', '--on', '2026-12-02');
    expect(execFileSync('ls', ['-a', dir], { encoding: 'utf8' }).split('\n').filter((n) => n.includes('.tmp'))).toEqual([]);
  });
});
