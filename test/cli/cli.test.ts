// The `plumbline` command through run(argv, io) with captured output, plus one run of the real
// binary. Exit codes are the design brief's: 0 no blocking failure, 1 a blocking failure, 2 the
// handbook cannot be loaded. Expected numbers are worked by hand beside each check.
import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { run } from '../../src/cli/main.ts';
import { expectRel } from '../helpers.ts';

const ROOT = fileURLToPath(new URL('../../', import.meta.url));
const FIXTURES = fileURLToPath(new URL('../fixtures/', import.meta.url));

async function cli(...argv: string[]): Promise<{ code: number; out: string; err: string }> {
  const out: string[] = [];
  const err: string[] = [];
  const code = await run(argv, { out: (s) => out.push(s), err: (s) => err.push(s) });
  return { code, out: out.join('\n'), err: err.join('\n') };
}

describe('check', () => {
  it('exits 1 on the demo handbook, which has a blocking failure', async () => {
    // MH-TAPER-1 fails on storage-node-mold-hole: (38 − 2·1980·tan 0.5°)/38 = 0.0906 < 0.33 (hand;
    // see test/checker/checker.test.ts for every demo verdict worked out).
    const r = await cli('check', '--root', ROOT);
    expect(r.code).toBe(1);
    expect(r.out).toContain('MH-TAPER-1');
  });

  it('finds the committed demo ledger current (an auditor reads it beside the YAML)', async () => {
    // Regenerate with `plumbline check --ledger --on 2026-12-02` after changing the demo.
    const r = await cli('check', '--root', ROOT, '--ledger', '--verify', '--on', '2026-12-02');
    expect(r.out + r.err).toContain('up to date');
    expect(r.code).toBe(0);
  });

  it('prints parseable JSON with counts', async () => {
    // 55 applicable pairs of 528 (48 rules × 11 structures): 39 pass, 15 fail (11 blocking), 1
    // incomplete — each worked out in test/checker/checker.test.ts; on 2026-12-02 waiver
    // W-ISO-PT-1 (last day 2027-06-30) excuses the blocking ISO-PT-1 failure: 14 fail (10 blocking).
    const r = await cli('check', '--root', ROOT, '--json', '--on', '2026-12-02');
    expect(r.code).toBe(1);
    const j = JSON.parse(r.out) as { counts: Record<string, number>; blocking_failures: number; verdicts: Array<{ rule: string; structure: string; status: string; waiver?: { id: string; expires: string } }> };
    expect(j.counts).toEqual({ pass: 39, fail: 14, waived: 1, incomplete: 1, 'not-applicable': 473 });
    expect(j.blocking_failures).toBe(10);
    expect(j.verdicts).toHaveLength(528);
    const waived = j.verdicts.find((v) => v.rule === 'ISO-PT-1' && v.structure === 'cell-isolation-trench');
    expect([waived?.status, waived?.waiver?.id, waived?.waiver?.expires]).toEqual(['waived', 'W-ISO-PT-1', '2027-06-30']);
  });

  it('names a waived failure, and an expired waiver whose failure counts again', async () => {
    // W-ISO-PT-1 (waivers/isolation.yaml): last day 2027-06-30; the day after, ISO-PT-1 fails again.
    const before = await cli('check', '--root', ROOT, '--on', '2027-06-30');
    expect(before.out).toMatch(/^waived +ISO-PT-1 +cell-isolation-trench/m);
    expect(before.out).toMatch(/ISO-PT-1 on cell-isolation-trench: waived by W-ISO-PT-1 through 2027-06-30; owner Ines Vardaker/);
    const after = await cli('check', '--root', ROOT, '--on', '2027-07-01');
    expect(after.code).toBe(1);
    expect(after.out).toContain('waiver W-ISO-PT-1 expired: its last day was 2027-06-30; ISO-PT-1 on cell-isolation-trench fails again');
    expect(after.out).toMatch(/^FAIL +ISO-PT-1 +cell-isolation-trench/m);
  });

  it('accepts --root before the command too', async () => {
    expect((await cli('--root', ROOT, 'check')).code).toBe(1);
  });

  it('exits 0 on a handbook whose rules all pass', async () => {
    // ok_small by hand: AR 410/38 = 10.8 ≤ 12; pillar space 120 − 52 = 68 nm ≥ 50 nm;
    // bottom 40 − 2·400·tan 0.5° = 33.0 nm ≥ 25 nm.
    const r = await cli('check', '--root', FIXTURES + 'ok_small', '--json');
    expect(r.code).toBe(0);
    const j = JSON.parse(r.out) as { counts: Record<string, number>; verdicts: Array<{ quantity: string; status: string; value: number | null }> };
    expect(j.counts).toEqual({ pass: 3, fail: 0, waived: 0, incomplete: 0, 'not-applicable': 3 });
    const valueOf = (q: string) => j.verdicts.find((v) => v.quantity === q && v.status === 'pass')?.value ?? null;
    expectRel(valueOf('geometry.aspect_ratio'), 410 / 38, 9);
    expectRel(valueOf('geometry.space'), 68e-9, 9);
    expectRel(valueOf('geometry.bottom_cd'), 40e-9 - 2 * 400e-9 * Math.tan((0.5 * Math.PI) / 180), 9);
  });

  it('exits 2 on an invalid handbook and names file:line:column', async () => {
    // structures/probe-hole.yaml line 6: "  depth: 3 fF" — value at column 10.
    const r = await cli('check', '--root', FIXTURES + 'invalid_wrong_dimension');
    expect(r.code).toBe(2);
    expect(r.err).toContain('structures/probe-hole.yaml:6:10');
    expect(r.out).toBe('');
  });
});

describe('eval', () => {
  it('prints { id, kind, quantities } in SI for a standalone structure file', async () => {
    const r = await cli('eval', FIXTURES + 'standalone/tall-cylinder.yaml', '--json');
    expect(r.code).toBe(0);
    const j = JSON.parse(r.out) as { id: string; kind: string; quantities: Record<string, { value: number | null; unit: string; reason?: string }> };
    expect(j.id).toBe('tall-cylinder');
    expect(j.kind).toBe('cylinder');
    const ar = j.quantities['geometry.aspect_ratio']!;
    // 2 µm / 30 nm = 66.67 (hand); common practice: storage-node cylinders reach AR ≈ 66.
    expectRel(ar.value, 2000 / 30, 12);
    expect(ar.unit).toBe('1');
    // Vertical walls: bottom CD = top CD = 30 nm = 3e-8 m, in metres.
    expect(j.quantities['geometry.bottom_cd']!.unit).toBe('m');
    expectRel(j.quantities['geometry.bottom_cd']!.value, 30e-9, 9);
    // Space 45 − 30 = 15 nm (hand).
    expectRel(j.quantities['geometry.space']!.value, 15e-9, 9);
    // Cup volume π/4·(30²·2000 − 20²·1995) nm³ = 7.86969e-22 m³ (hand).
    expect(j.quantities['geometry.volume']!.unit).toBe('m^3');
    expectRel(j.quantities['geometry.volume']!.value, (Math.PI / 4) * (900 * 2000 - 400 * 1995) * 1e-27, 9);
    // A standing cylinder has no closure depth: not listed rather than given a fake number.
    expect(j.quantities['geometry.closure_depth']).toBeUndefined();
  });

  it('evaluates a structure of the handbook by id', async () => {
    // periphery-fin nominal: 62 nm / 9 nm = 6.889 (hand).
    const r = await cli('--root', ROOT, 'eval', 'periphery-fin', '--json');
    expect(r.code).toBe(0);
    const j = JSON.parse(r.out) as { quantities: Record<string, { value: number }> };
    expectRel(j.quantities['geometry.aspect_ratio']!.value, 62 / 9, 12);
  });

  it('exits 2 for a structure id the handbook does not have', async () => {
    expect((await cli('--root', ROOT, 'eval', 'no-such-structure')).code).toBe(2);
  });
});

describe('explain, help', () => {
  it('explains SN-AR-1 on storage-node with its worst corner', async () => {
    // Worst corner for "at most": height high (1.9 µm + 40 nm), CD low (34 − 1.5 nm): 1940/32.5 = 59.69 (hand).
    const r = await cli('--root', ROOT, 'explain', 'SN-AR-1', 'storage-node');
    expect(r.code).toBe(0);
    const line = r.out.split('\n').find((l) => /worst corner/i.test(l)) ?? '';
    expect(line).toMatch(/geometry\.height high/);
    expect(line).toMatch(/geometry\.cd low/);
    expect(r.out).toContain('59.69');
  });

  it('--help exits 0 and lists the commands', async () => {
    const r = await cli('--help');
    expect(r.code).toBe(0);
    for (const c of ['check', 'eval', 'explain']) expect(r.out).toContain(c);
  });

  it('an unknown command exits 2', async () => {
    expect((await cli('no-such-command')).code).toBe(2);
  });
});

describe('the real binary', () => {
  it('node bin/plumbline.js check on an invalid handbook exits 2', () => {
    const p = spawnSync(process.execPath, ['bin/plumbline.js', 'check', '--root', 'test/fixtures/invalid_wrong_dimension'], { cwd: ROOT, encoding: 'utf8' });
    expect(p.status).toBe(2);
    expect(p.stderr).toContain('structures/probe-hole.yaml:6:10');
  });

  it('gives byte-identical JSON from two separate processes (the brief: results are deterministic)', () => {
    // One fixed day for both, so a run across midnight compares like with like.
    const once = () => spawnSync(process.execPath, ['bin/plumbline.js', 'check', '--root', '.', '--json', '--on', '2026-12-02'], { cwd: ROOT, encoding: 'utf8', maxBuffer: 256 * 1024 * 1024, env: { ...process.env, LANG: 'C' } });
    const a = once();
    const b = spawnSync(process.execPath, ['bin/plumbline.js', 'check', '--root', '.', '--json', '--on', '2026-12-02'], { cwd: ROOT, encoding: 'utf8', maxBuffer: 256 * 1024 * 1024, env: { ...process.env, LANG: 'tr_TR.UTF-8', LC_ALL: 'tr_TR.UTF-8' } });
    expect(a.status).toBe(1);
    expect(b.stdout).toBe(a.stdout);
  });
});
