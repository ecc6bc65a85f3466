// A structure's rules across a range of its inputs (`plumbline sweep`), held to hand-worked values
// of the demo's periphery fin and storage node: worst-case aspect ratios at each height with the
// band moved along, a point where the structure breaks its own relations, and a two-input grid.
import { fileURLToPath } from 'node:url';
import { beforeAll, describe, expect, it } from 'vitest';
import { sweepStructure, withInput } from '../../src/checker/sweep.ts';
import { loadHandbookFolder } from '../../src/pipeline.ts';
import type { Handbook } from '../../src/model/types.ts';
import { expectRel, nm, um } from '../helpers.ts';
import { run } from '../../src/cli/main.ts';

const ROOT = fileURLToPath(new URL('../../', import.meta.url));
let h: Handbook;
beforeAll(() => {
  const r = loadHandbookFolder(ROOT);
  if (!r.ok) throw new Error('demo does not load');
  h = r.handbook;
});
const structure = (id: string) => h.structures.find((s) => s.id === id)!;

describe('sweeping a structure', () => {
  it('moves a toleranced input with its band: the fin’s worst-case aspect ratios at each height', () => {
    // periphery-fin: CD 9 ± 1 nm, height swept 50 … 80 nm keeping ±3 nm. FIN-AR-1 (≥ 5) takes the
    // lowest (h − 3)/(CD + 1), FIN-AR-2 (≤ 10) the highest (h + 3)/(CD − 1).
    const r = sweepStructure(h, structure('periphery-fin'), [{ input: 'geometry.height', unit: 'm', from: 50 * nm, to: 80 * nm, steps: 4 }]);
    expect(r.rules.map((x) => x.id)).toEqual(['FIN-AR-1', 'FIN-AR-2', 'FIN-BASE-1', 'FIN-STAND-1', 'FIN-STAND-Y', 'FIN-WIDTH-1']);
    const at = (k: number, rule: string) => r.points[k]!.verdicts.find((v) => v.rule === rule)!;
    for (const [k, hh] of [50, 60, 70, 80].entries()) {
      expectRel(at(k, 'FIN-AR-1').value, (hh - 3) / 10, 12);
      expectRel(at(k, 'FIN-AR-2').value, (hh + 3) / 8, 12);
    }
    expect(at(0, 'FIN-AR-1').status).toBe('fail'); // 4.7 < 5
    expect(at(3, 'FIN-AR-2').status).toBe('fail'); // 83/8 = 10.375 > 10
    expect(at(1, 'FIN-AR-2').status).toBe('pass');
  });
  it('leaves out a point where the structure breaks its relations (a support above the top)', () => {
    // storage-node: supports at 0.9 and 1.7 µm; a 1.6 µm node would have its upper support above it.
    const r = sweepStructure(h, structure('storage-node'), [{ input: 'geometry.height', unit: 'm', from: 1.6 * um, to: 2.0 * um, steps: 3 }]);
    expect(r.points[0]!.invalid).toMatch(/support height within the structure/);
    expect(r.points[0]!.verdicts).toEqual([]);
    expect(r.points[1]!.invalid).toBeUndefined();
    // SN-AR-1 at 1.8 µm: the worst corner (1.8 + 0.04)/(34 − 1.5) = 56.615.
    expectRel(r.points[1]!.verdicts.find((v) => v.rule === 'SN-AR-1')!.value, 1840 / 32.5, 12);
  });
  it('spans a grid over two inputs, the first varying slowest', () => {
    const r = sweepStructure(h, structure('periphery-fin'), [
      { input: 'geometry.height', unit: 'm', from: 50 * nm, to: 70 * nm, steps: 2 },
      { input: 'geometry.cd', unit: 'm', from: 8 * nm, to: 12 * nm, steps: 3 },
    ]);
    expect(r.points.map((p) => p.at.map((x) => Math.round(x / nm)))).toEqual([
      [50, 8], [50, 10], [50, 12], [70, 8], [70, 10], [70, 12],
    ]);
    // FIN-AR-2 at 70 nm, CD 12 ± 1: (73)/(11) = 6.6364.
    expectRel(r.points[5]!.verdicts.find((v) => v.rule === 'FIN-AR-2')!.value, 73 / 11, 12);
  });
  it('keeps the written structure untouched', () => {
    const s = structure('periphery-fin');
    const before = s.params.get('geometry.height')!.value;
    withInput(s, 'geometry.height', 70 * nm);
    expect(s.params.get('geometry.height')!.value).toBe(before);
  });
});

describe('plumbline sweep', () => {
  const cli = async (...argv: string[]) => {
    let out = '';
    let err = '';
    const code = await run(argv, { out: (s) => (out += s + '\n'), err: (s) => (err += s + '\n') });
    return { code, out, err };
  };
  it('prints the grid as JSON in SI', async () => {
    const r = await cli('sweep', 'periphery-fin', '--root', ROOT, '--vary', 'height=50nm..80nm', '--steps', '4', '--json');
    expect(r.code).toBe(0);
    const j = JSON.parse(r.out) as { axes: Array<{ input: string; from: number }>; points: unknown[] };
    expect(j.axes[0]).toMatchObject({ input: 'geometry.height', from: 5e-8 });
    expect(j.points).toHaveLength(4);
  });
  it('refuses an input the structure lacks, a wrong unit and a malformed range, each with exit 2', async () => {
    for (const vary of ['hight=50nm..80nm', 'height=1V..2V', 'height=50nm']) {
      const r = await cli('sweep', 'periphery-fin', '--root', ROOT, '--vary', vary);
      expect([vary, r.code]).toEqual([vary, 2]);
      expect(r.err).toContain(`--vary ${vary}`);
    }
  });
});

describe('plumbline check --json --detail', () => {
  it('carries each verdict’s levers and mode, and each structure’s process window', async () => {
    const { mkdtempSync, mkdirSync, writeFileSync } = await import('node:fs');
    const { tmpdir } = await import('node:os');
    const { join } = await import('node:path');
    const root = mkdtempSync(join(tmpdir(), 'plumbline-detail-'));
    mkdirSync(join(root, 'structures'));
    mkdirSync(join(root, 'rules'));
    writeFileSync(join(root, 'handbook.yaml'), 'title: Detail probe\n');
    writeFileSync(
      join(root, 'structures', 'probe-hole.yaml'),
      'id: probe-hole\ntitle: Probe hole\nkind: hole\ngeometry:\n  cd: 30 nm ± 1.5 nm\n  depth: 2 um ± 90 nm\n  pitch: 80 nm\n  array: square\nprocess_window:\n  inputs: [geometry.cd, geometry.depth]\n',
    );
    writeFileSync(join(root, 'rules', 'ar.yaml'), 'id: PROBE-AR-1\ntitle: Aspect ratio\napplies_to: {}\nquantity: geometry.aspect_ratio\nat_most: 68\nevaluate_at: worst-case\n');
    let out = '';
    const code = await run(['check', '--root', root, '--json', '--detail', '--on', '2026-12-02'], { out: (s) => (out += s), err: () => {} });
    expect(code).toBe(1); // the worst corner 2.09 µm / 28.5 nm = 73.3 fails 68
    const j = JSON.parse(out) as { verdicts: Array<{ mode: { kind: string }; levers: Array<{ name: string; passes: number[][] }> }>; windows: Record<string, { edges: Array<{ rule?: string }> }> };
    expect(j.verdicts[0]!.mode.kind).toBe('worst-case');
    // Passing depths at the deciding corner (CD 28.5 nm, depth +90 nm): D ≤ 68·28.5 − 90 = 1848 nm.
    const depth = j.verdicts[0]!.levers.find((l) => l.name === 'geometry.depth')!;
    expectRel(depth.passes[0]![1], 1848 * nm, 9);
    expect(j.windows['probe-hole']!.edges.some((e) => e.rule === 'PROBE-AR-1')).toBe(true);
  });
});
