// The command line refuses what it cannot do safely with exit 2 and a sentence, never a stack
// trace; warnings go to stderr and into --json without changing the exit code.
import { execFileSync } from 'node:child_process';
import { cpSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, relative, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { run } from '../../src/cli/main.ts';

const ROOT = resolve(import.meta.dirname, '../..');

async function cli(...argv: string[]): Promise<{ code: number; out: string; err: string }> {
  const out: string[] = [];
  const err: string[] = [];
  const code = await run(argv, { out: (s) => out.push(s), err: (s) => err.push(s) });
  return { code, out: out.join('\n'), err: err.join('\n') };
}

function handbook(): string {
  const dir = join(mkdtempSync(join(tmpdir(), 'plumbline-refuse-')), 'hb');
  cpSync(join(ROOT, 'test/fixtures/ok_minimal'), dir, { recursive: true });
  return dir;
}

const noStack = (s: string) => expect(s).not.toMatch(/\n\s+at |internal error/);

describe('refusals', () => {
  it('eval of a FIFO named like a structure file answers at once, exit 2 (it used to hang)', async () => {
    const dir = handbook();
    const fifo = join(dir, '..', 'pipe.yaml');
    execFileSync('mkfifo', [fifo]);
    const r = await cli('eval', fifo, '--root', dir);
    expect(r.code).toBe(2);
    expect(r.err).toContain('FIFO');
    noStack(r.err);
  });

  it('a report folder that cannot be written is exit 2 with the reason, not exit 3', async () => {
    // /sys refuses new folders even to root (EPERM), unlike permission bits.
    const r = await cli('build', '--root', handbook(), '--out', '/sys/kernel/plumbline-test/site');
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/could not be written|cannot create the lock/);
    noStack(r.err);
  });

  it('warnings go to stderr and into check --json, and leave the exit code alone', async () => {
    const dir = handbook();
    writeFileSync(join(dir, 'structures', 'notes.txt'), 'not a structure');
    const r = await cli('check', '--root', dir, '--json');
    expect(r.code).toBe(0);
    expect(r.err).toContain('structures/notes.txt');
    const j = JSON.parse(r.out) as { warnings: Array<{ code: string; file: string }> };
    expect(j.warnings.map((w) => [w.code, w.file])).toEqual([['not-loaded', 'structures/notes.txt']]);
  });

  it('eval FILE names the file as it was given, so an editor can open the place', async () => {
    const dir = handbook();
    const file = join(dir, 'structures', 'test-pillar.yaml');
    writeFileSync(file, readFileSync(file, 'utf8').replace('kind: pillar', 'kind: pilar'));
    const shown = relative(process.cwd(), file);
    const r = await cli('eval', shown, '--root', dir);
    expect(r.code).toBe(2);
    // line 3: "kind: pilar", the value at column 7.
    expect(r.err).toContain(`${shown}:3:7 kind:`);
  });
});
