// Rules with two sides (a window, at_least and at_most together), held to closed forms on the
// aspect ratio D/CD: which side decides, each side's own worst corner, the yield of a normal input
// between two limits, Φ(b) − Φ(a) (jstat), and the passing values of a window, an interval.
import jstat from 'jstat';
import { describe, expect, it } from 'vitest';
import { evaluateRule, PlanCache } from '../../src/checker/evaluate.ts';
import { sampleYield, type ReadyPlan } from '../../src/checker/excursions.ts';
import { buildPlan } from '../../src/checker/plan.ts';
import { expectRel, makeRule, makeStructure, nm, type P } from '../helpers.ts';

const hole = (depth: P, cd: P) => makeStructure('hole', { depth, cd, pitch: 80 * nm }, { array: 'square' });
const window = (low: number, high: number, evaluateAt: 'nominal' | 'worst-case' | 'yield' = 'nominal') =>
  makeRule({
    quantity: 'geometry.aspect_ratio',
    sides: [
      { comparison: 'at_least', limit: low, written: String(low) },
      { comparison: 'at_most', limit: high, written: String(high) },
    ],
    evaluateAt,
    ...(evaluateAt === 'yield' ? { yield: { required: 0.5, written: '50 %', confidence: 0.95, maxSamples: 65536, seed: 1 } } : {}),
  });

describe('a window', () => {
  it('passes inside, fails outside on either side, and names the side that decides', () => {
    // AR = 2000/30 = 66.667.
    const inside = evaluateRule(window(60, 70), hole(2000 * nm, 30 * nm), new PlanCache());
    expect(inside.status).toBe('pass');
    // Margins to each side: (66.667 − 60)/60 = 11.1 %, (70 − 66.667)/70 = 4.76 %: the upper decides.
    expect([inside.comparison, inside.limit]).toEqual(['at_most', 70]);
    expectRel(inside.margin, (70 - 2000 / 30) / 70, 12);
    expect(inside.sides).toEqual([
      { comparison: 'at_least', limit: 60 },
      { comparison: 'at_most', limit: 70 },
    ]);
    const below = evaluateRule(window(68, 80), hole(2000 * nm, 30 * nm), new PlanCache());
    expect([below.status, below.comparison]).toEqual(['fail', 'at_least']);
    expectRel(below.margin, (2000 / 30 - 68) / 68, 12);
    const above = evaluateRule(window(50, 60), hole(2000 * nm, 30 * nm), new PlanCache());
    expect([above.status, above.comparison]).toEqual(['fail', 'at_most']);
  });

  it('takes each side at its own worst corner: the lowest AR against at_least, the highest against at_most', () => {
    // Depth 2000 ± 90 nm, CD 30 ± 1.5 nm: lowest 1910/31.5 = 60.635, highest 2090/28.5 = 73.333.
    const v = evaluateRule(window(55, 75, 'worst-case'), hole([2000 * nm, 1910 * nm, 2090 * nm], [30 * nm, 28.5 * nm, 31.5 * nm]), new PlanCache());
    expect(v.status).toBe('pass');
    if (v.mode?.kind !== 'worst-case') throw new Error('not a worst case');
    expectRel(v.mode.bySide![0]!.value, 1910 / 31.5, 12);
    expectRel(v.mode.bySide![1]!.value, 2090 / 28.5, 12);
    // Margins (60.635 − 55)/55 = 10.2 % and (75 − 73.333)/75 = 2.22 %: the upper side decides.
    expect(v.comparison).toBe('at_most');
    expectRel(v.value, 2090 / 28.5, 12);
    // Tightened below, the lower side's corner fails and decides.
    const w = evaluateRule(window(61, 75, 'worst-case'), hole([2000 * nm, 1910 * nm, 2090 * nm], [30 * nm, 28.5 * nm, 31.5 * nm]), new PlanCache());
    expect([w.status, w.comparison]).toEqual(['fail', 'at_least']);
    expectRel(w.value, 1910 / 31.5, 12);
  });

  it('yields the probability of landing between its limits: Φ(b) − Φ(a) for a normal depth', () => {
    // Depth N(2000, 30²) nm at CD 30 nm: 65 ≤ AR ≤ 68 ⇔ 1950 ≤ D ≤ 2040 nm ⇔ −5/3 ≤ z ≤ 4/3.
    const s = hole([2000 * nm, 1910 * nm, 2090 * nm], 30 * nm);
    const exact = jstat.normal.cdf(4 / 3, 0, 1) - jstat.normal.cdf(-5 / 3, 0, 1); // 0.86100
    // A fixed 65 536 samples of the window's sides.
    const fixed = sampleYield(buildPlan(s, 'geometry.aspect_ratio') as ReadyPlan, { sides: window(65, 68).sides, correlations: [], seed: 1, confidence: 0.95, maxSamples: 65536 });
    expect(Math.abs(fixed.estimate - exact)).toBeLessThan(0.002);
    // The rule decides against its required yield: 50 % is far below 86 %, 90 % above it.
    expect(evaluateRule(window(65, 68, 'yield'), s, new PlanCache()).status).toBe('pass');
    const strict = { ...window(65, 68, 'yield'), yield: { required: 0.9, written: '90 %', confidence: 0.95, maxSamples: 65536, seed: 1 } };
    expect(evaluateRule(strict, s, new PlanCache()).status).toBe('fail');
  });

  it('passes for the values of an input between the two crossings', () => {
    // 60 ≤ 2000/CD ≤ 70 ⇔ 28.571 nm ≤ CD ≤ 33.333 nm; 60 ≤ D/30 ≤ 70 ⇔ 1.8 µm ≤ D ≤ 2.1 µm.
    const v = evaluateRule(window(60, 70), hole(2000 * nm, 30 * nm), new PlanCache({ detail: true }));
    const cd = v.levers!.find((l) => l.name === 'geometry.cd')!;
    expect(cd.passes).toHaveLength(1);
    expectRel(cd.passes![0]![0], (2000 / 70) * nm, 9);
    expectRel(cd.passes![0]![1], (2000 / 60) * nm, 9);
    const depth = v.levers!.find((l) => l.name === 'geometry.depth')!;
    expectRel(depth.passes![0]![0], 1800 * nm, 9);
    expectRel(depth.passes![0]![1], 2100 * nm, 9);
  });
});
