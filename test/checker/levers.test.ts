// What moves a verdict's value and what would pass, held to closed forms: the aspect ratio D/CD
// (elasticities exactly +1 and −1, the passing depth L·CD), a trench's sidewall area 2·L·D/sin θ
// (not monotonic: smallest at 90°, so it passes on both sides), a limit no value in range meets,
// the structure's relations bounding the search, and the deciding corner's offset.
import { describe, expect, it } from 'vitest';
import { evaluateRule, PlanCache, type Verdict } from '../../src/checker/evaluate.ts';
import { passingValues, type Lever, type ReadyPlan } from '../../src/checker/excursions.ts';
import { buildPlan } from '../../src/checker/plan.ts';
import { passingPhrase } from '../../src/report/words.ts';
import { deg, expectRel, makeRule, makeStructure, nm, type P } from '../helpers.ts';

const hole = (depth: P, cd: P) => makeStructure('hole', { depth, cd, pitch: 80 * nm }, { array: 'square' });
const detailed = (v: Verdict) => v.levers ?? [];
const lever = (v: Verdict, name: string): Lever => detailed(v).find((l) => l.name === name)!;
const ar = (limit: number, evaluateAt: 'nominal' | 'worst-case' = 'nominal', comparison: 'at_most' | 'at_least' = 'at_most') =>
  makeRule({ quantity: 'geometry.aspect_ratio', comparison, limit, evaluateAt });
const withDetail = () => new PlanCache({ detail: true });

describe('sensitivity', () => {
  it('the aspect ratio D/CD has elasticity +1 in the depth and −1 in the CD', () => {
    const v = evaluateRule(ar(70), hole([2000 * nm, 1910 * nm, 2090 * nm], [30 * nm, 28.5 * nm, 31.5 * nm]), withDetail());
    // d(D/C)/dD · D/(D/C) = 1; d(D/C)/dC · C/(D/C) = −1 (a central difference is exact to O(h²): 1e-6 here).
    expect(lever(v, 'geometry.depth').elasticity).toBeCloseTo(1, 5);
    expect(lever(v, 'geometry.cd').elasticity).toBeCloseTo(-1, 5);
  });
  it('ranks inputs by how far each moves the value across its tolerance, with the values at its ends', () => {
    const v = evaluateRule(ar(70), hole([2000 * nm, 1910 * nm, 2090 * nm], [30 * nm, 28.5 * nm, 31.5 * nm]), withDetail());
    // Depth: 1910/30 … 2090/30 = 63.67 … 69.67 (a swing of 6.00); CD: 2000/28.5 … 2000/31.5 =
    // 70.18 … 63.49 (6.68): the CD ranks first.
    expect(detailed(v).map((l) => l.name)).toEqual(['geometry.cd', 'geometry.depth']);
    const cd = lever(v, 'geometry.cd');
    expectRel(cd.ends!.valueAtLow, 2000 / 28.5, 12);
    expectRel(cd.ends!.valueAtHigh, 2000 / 31.5, 12);
    // An input without a tolerance has no ends and ranks after every toleranced one.
    const w = evaluateRule(ar(70), hole(2000 * nm, [30 * nm, 29.9 * nm, 30.1 * nm]), withDetail());
    expect(detailed(w).map((l) => l.name)).toEqual(['geometry.cd', 'geometry.depth']);
    expect(lever(w, 'geometry.depth').ends).toBeUndefined();
  });
  it('is left out of a plain check', () => {
    const v = evaluateRule(ar(70), hole(2000 * nm, 30 * nm), new PlanCache());
    expect(v.levers).toBeUndefined();
  });
});

describe('what would pass', () => {
  it('a monotone quantity: AR ≤ 68 at CD 30 nm passes for depth ≤ 2040 nm, and forward evaluation agrees', () => {
    const s = hole(2000 * nm, 30 * nm);
    const v = evaluateRule(ar(68), s, withDetail());
    const depth = lever(v, 'geometry.depth');
    expect(depth.passes).toHaveLength(1);
    const [lo, hi] = depth.passes![0]!;
    expect(lo).toBe(depth.searched![0]); // from the bottom of the searched range (200 nm)
    expectRel(hi, 2040 * nm, 9);
    expect(passingPhrase(depth)).toBe('passes for geometry.depth ≤ 2.04 µm (now 2 µm)');
    // Forward: the returned value passes, a part in a million beyond it fails.
    const at = (d: number) => evaluateRule(ar(68), hole(d, 30 * nm), new PlanCache()).status;
    expect(at(hi)).toBe('pass');
    expect(at(hi * (1 + 1e-6))).toBe('fail');
    // The CD: AR ≤ 68 ⇔ CD ≥ 2000/68 = 29.412 nm, up to the pitch (80 nm: CD < pitch).
    const cd = lever(v, 'geometry.cd');
    expectRel(cd.passes![0]![0], (2000 / 68) * nm, 9);
    expect(cd.searched![1]).toBeLessThanOrEqual(80 * nm);
    expect(cd.searched![1]).toBeGreaterThan(79.99 * nm);
  });
  it('a quantity that is not monotonic: a trench sidewall 2·L·D/sin θ passes on both sides of 90°', () => {
    // A ≥ 1.01·2LD ⇔ sin θ ≤ 1/1.01 ⇔ θ ≤ asin(1/1.01) = 81.931° or θ ≥ 98.069° (by hand).
    const s = makeStructure('trench', { depth: 100 * nm, cd: 200 * nm, pitch: 400 * nm, sidewall_angle: deg(89), length: 1e-6 });
    const area = 2 * 1e-6 * 100 * nm;
    const v = evaluateRule(makeRule({ quantity: 'geometry.sidewall_area', comparison: 'at_least', limit: 1.01 * area }), s, withDetail());
    const angle = lever(v, 'geometry.sidewall_angle');
    const edge = Math.asin(1 / 1.01);
    expect(angle.passes).toHaveLength(2);
    expectRel(angle.passes![0]![1], edge, 8);
    expectRel(angle.passes![1]![0], Math.PI - edge, 8);
    expect(passingPhrase(angle)).toMatch(/^passes for geometry\.sidewall_angle ≤ 81\.9\d*° or geometry\.sidewall_angle ≥ 98\.0\d*° \(now 89°\)$/);
  });
  it('no value in the range: AR ≤ 0.5 at CD 30 nm needs a depth below 15 nm, under the searched 200 nm', () => {
    const v = evaluateRule(ar(0.5), hole(2000 * nm, 30 * nm), withDetail());
    const depth = lever(v, 'geometry.depth');
    expect(depth.passes).toEqual([]);
    expect(passingPhrase(depth)).toBe('no geometry.depth in 200 nm … 20 µm passes (now 2 µm)');
  });
  it('a worst case holds the other inputs at the deciding corner and keeps this input’s offset there', () => {
    // Worst corner of AR ≤ 68: depth high (+90 nm). The nominal depth passes up to 2040 − 90 = 1950 nm.
    const v = evaluateRule(ar(68, 'worst-case'), hole([2000 * nm, 1910 * nm, 2090 * nm], 30 * nm), withDetail());
    expectRel(lever(v, 'geometry.depth').passes![0]![1], 1950 * nm, 9);
  });
  it('the bisection keeps the passing end of each crossing', () => {
    const s = hole(2000 * nm, 30 * nm);
    const plan = buildPlan(s, 'geometry.aspect_ratio') as ReadyPlan;
    const depthIndex = plan.params.findIndex((p) => p.name === 'geometry.depth');
    const base = plan.params.map((p) => p.value);
    // at_least 68: passes for depth ≥ 2040 nm; the start is the passing end, at or just above it.
    const [[start, end]] = passingValues(plan, base, depthIndex, 0, [1000 * nm, 3000 * nm], [{ comparison: 'at_least', limit: 68 }]) as [[number, number]];
    expect(start).toBeGreaterThanOrEqual(2040 * nm * (1 - 1e-12));
    expectRel(start, 2040 * nm, 9);
    expect(end).toBe(3000 * nm);
  });
});
