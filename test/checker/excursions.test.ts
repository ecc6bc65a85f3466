// The pieces of the off-nominal runs, each against a value worked out by hand: where passing
// values are searched (a decade either side, ±20° for an angle, inside the physical range with
// the deciding corner's offset), how samples are held inside that range, where the structure's
// relations end the search, the looks of the sequential stop and the share of the confidence
// each gets, a correlation naming an input the plan does not read, and the ranking of levers.
import { describe, expect, it } from 'vitest';
import { evaluateRule, PlanCache } from '../../src/checker/evaluate.ts';
import { looksUpTo, sampleYield, samplerFor, searchRange, validRange, type ReadyPlan } from '../../src/checker/excursions.ts';
import { buildPlan } from '../../src/checker/plan.ts';
import { wilsonInterval } from '../../src/checker/statistics.ts';
import { windowAxis } from '../../src/checker/windows.ts';
import type { Param } from '../../src/model/types.ts';
import { deg, expectRel, makeRule, makeStructure, nm } from '../helpers.ts';

const param = (value: number, unit: string, extra: Partial<Param> = {}): Param => ({ name: 'x', value, unit, written: String(value), origin: { type: 'default', pos: { file: 't', line: 1, column: 1 } }, ...extra });

describe('where passing values are searched', () => {
  it('a decade either side of a length, and of a negative value', () => {
    const [a, b] = searchRange(param(30e-9, 'm'))!;
    expectRel(a, 3e-9, 12);
    expectRel(b, 300e-9, 12);
    const [lo, hi] = searchRange(param(-2, '1'))!;
    expectRel(lo, -20, 12);
    expectRel(hi, -0.2, 12);
  });
  it('±20° for an angle, held inside 0 … π', () => {
    const [lo, hi] = searchRange(param(deg(89), 'rad', { range: { min: 0, max: Math.PI } }))!;
    expectRel(lo, deg(69), 12);
    expectRel(hi, deg(109), 12);
    // At 170°, 190° is past π: the end is held a thousandth of the way back from π.
    const [, top] = searchRange(param(deg(170), 'rad', { range: { min: 0, max: Math.PI } }))!;
    expectRel(top, Math.PI - (Math.PI - deg(170)) * 1e-3, 12);
  });
  it('with the deciding corner’s offset, the value used stays above the physical minimum', () => {
    // A CD of 9 nm whose corner sits 1 nm lower: nominal x is used as x − 1 nm, so the search
    // stops a thousandth of the way from 1 nm (where x − 1 nm = 0) toward 9 nm.
    const [lo] = searchRange(param(9e-9, 'm', { range: { min: 0 } }), -1e-9)!;
    expectRel(lo, 1e-9 + 8e-9 * 1e-3, 12);
    // Without the offset a decade down is inside the range.
    expectRel(searchRange(param(9e-9, 'm', { range: { min: 0 } }))![0], 0.9e-9, 12);
  });
  it('none for a value of zero or one outside its own range', () => {
    expect(searchRange(param(0, 'm'))).toBeNull();
    expect(searchRange(param(1, '1', { range: { min: 2 } }))).toBeNull();
  });
  it('the structure’s relations end the search: a CD stops at the pitch, to 2^-32 of the way there', () => {
    const s = makeStructure('hole', { depth: 2000 * nm, cd: 30 * nm, pitch: 80 * nm, sidewall_angle: Math.PI / 2 }, { array: 'square' });
    const plan = buildPlan(s, 'geometry.space') as ReadyPlan;
    const cd = plan.params.findIndex((p) => p.name === 'geometry.cd');
    const pitch = plan.params.findIndex((p) => p.name === 'geometry.pitch');
    const base = plan.params.map((p) => p.value);
    const relations = [{ reads: [{ index: pitch }, { index: cd }], holds: ([p, c]: number[]) => p! > c! }];
    const [lo, hi] = validRange(base, cd, 0, 30 * nm, [3 * nm, 300 * nm], relations);
    expect(lo).toBe(3 * nm);
    expect(hi).toBeLessThan(80 * nm);
    expect(80 * nm - hi).toBeLessThan((270 * nm) / 2 ** 31);
    // A relation that does not read the input leaves the range as it is.
    expect(validRange(base, cd, 0, 30 * nm, [3 * nm, 300 * nm], [{ reads: [{ index: pitch }], holds: () => false }])).toEqual([3 * nm, 300 * nm]);
  });
  it('a window maps four half-bands either side (the wider side of an uneven band), ±20 % without a band', () => {
    const a = windowAxis(param(30, '1', { low: 29, high: 32 }));
    expect([a.from, a.to]).toEqual([22, 38]);
    const b = windowAxis(param(50, '1'));
    expect([b.from, b.to]).toEqual([40, 60]);
    // Held inside the physical range: a band of ±20 reaches below 0.
    const c = windowAxis(param(30, '1', { low: 10, high: 50, range: { min: 0 } }));
    expect(c.from).toBeCloseTo(0.03, 12);
  });
});

describe('sampling', () => {
  const hole = (cd: [number, number, number], opts: Parameters<typeof makeStructure>[2] = {}) => makeStructure('hole', { depth: 2000 * nm, cd, pitch: 80 * nm }, { array: 'square', ...opts });
  const planOf = (s: ReturnType<typeof hole>) => buildPlan(s, 'geometry.aspect_ratio') as ReadyPlan;
  it('holds a normal sample beyond the physical range just inside it', () => {
    // CD 1 nm ± 3 nm: σ = 1 nm, so about 16 % of samples fall below 0 and are held at 1e-6 of 1 nm.
    const s = hole([1 * nm, -2 * nm, 4 * nm]);
    const plan = planOf(s);
    const cd = plan.params.findIndex((p) => p.name === 'geometry.cd');
    const sampler = samplerFor(plan, [], 1);
    const values = Array.from({ length: 4096 }, (_, n) => sampler.draw(n)[cd]!);
    expect(Math.min(...values)).toBe(1e-15);
    const held = values.filter((v) => v === 1e-15).length / 4096;
    expect(Math.abs(held - 0.158655)).toBeLessThan(0.01); // Φ(−1) = 0.158655 (standard normal table)
  });
  it('ignores a correlation with an input the plan does not read', () => {
    const plain = hole([30 * nm, 28.5 * nm, 31.5 * nm]);
    const withPitch = hole([30 * nm, 28.5 * nm, 31.5 * nm], { correlations: [['cd', 'pitch', 0.9]] });
    const a = samplerFor(planOf(plain), plain.correlations, 3);
    const b = samplerFor(planOf(withPitch), withPitch.correlations, 3);
    for (const n of [0, 1, 17, 500]) expect(b.draw(n)).toEqual(a.draw(n));
  });
  it('looks at 128, 256, … samples up to the maximum, the maximum last', () => {
    expect(looksUpTo(16384)).toEqual([128, 256, 512, 1024, 2048, 4096, 8192, 16384]);
    expect(looksUpTo(1000)).toEqual([128, 256, 512, 1000]);
    expect(looksUpTo(100)).toEqual([100]);
  });
  it('gives each look its share of the confidence: the interval reported is Wilson’s at (1 − c)/looks', () => {
    const s = hole([30 * nm, 28.5 * nm, 31.5 * nm]);
    // AR ≤ 68 ⇔ CD ≥ 29.41 nm: the CD N(30, 0.5²) passes with Φ(1.176) = 0.88. Required 0.5 decides at 128.
    const r = sampleYield(planOf(s), { sides: [{ comparison: 'at_most', limit: 68 }], correlations: [], seed: 1, confidence: 0.95, maxSamples: 16384, required: 0.5 });
    expect(r.samples).toBe(128);
    expect(r.decided).toBe(true);
    const w = wilsonInterval(128 - r.failures, 128, 0.05 / 8);
    expect([r.low, r.high]).toEqual([w.low, w.high]);
    // Without a requirement: one look at the maximum, with the whole 5 %.
    const fixed = sampleYield(planOf(s), { sides: [{ comparison: 'at_most', limit: 68 }], correlations: [], seed: 1, confidence: 0.95, maxSamples: 1000 });
    expect(fixed.samples).toBe(1000);
    const wf = wilsonInterval(1000 - fixed.failures, 1000, 0.05);
    expect([fixed.low, fixed.high]).toEqual([wf.low, wf.high]);
    // A requirement no look can settle runs to the maximum, undecided.
    const close = sampleYield(planOf(s), { sides: [{ comparison: 'at_most', limit: 68 }], correlations: [], seed: 1, confidence: 0.95, maxSamples: 512, required: 0.88 });
    expect([close.samples, close.decided]).toEqual([512, false]);
  });
});

describe('levers', () => {
  it('rank untoleranced inputs by the size of their elasticity, then by name', () => {
    // AR = D/CD: elasticities +1 and −1, equal in size: the names decide (cd before depth).
    const v = evaluateRule(makeRule({ quantity: 'geometry.aspect_ratio', comparison: 'at_most', limit: 70 }), makeStructure('hole', { depth: 2000 * nm, cd: 30 * nm, pitch: 80 * nm }, { array: 'square' }), new PlanCache({ detail: true }));
    expect(v.levers!.map((l) => l.name)).toEqual(['geometry.cd', 'geometry.depth']);
    // A bottom CD reads the angle far more strongly than the depth near vertical walls: 30 nm − 2·D·cot θ.
    const w = evaluateRule(
      makeRule({ quantity: 'geometry.bottom_cd', comparison: 'at_least', limit: 10 * nm }),
      makeStructure('hole', { depth: 2000 * nm, cd: 30 * nm, pitch: 80 * nm, sidewall_angle: deg(89.8) }, { array: 'square' }),
      new PlanCache({ detail: true }),
    );
    const e = Object.fromEntries(w.levers!.map((l) => [l.name, l.elasticity]));
    // d/dD (CD − 2D cot θ) · D/CD_b = −2 cot θ · D / CD_b; cot 89.8° = 0.0034907: −13.963 nm / 16.037 nm = −0.87067.
    const cb = 30 - 2 * 2000 * Math.tan(deg(0.2));
    expect(e['geometry.depth']).toBeCloseTo((-2 * 2000 * Math.tan(deg(0.2))) / cb, 5);
    expect(e['geometry.cd']).toBeCloseTo(30 / cb, 5);
  });
});

describe('evaluations shared between rules', () => {
  it('share a corner sweep only with rules that ask the same: an at_least and an at_most rule get opposite corners', () => {
    // AR = D/CD over D 2000 ± 90 nm, CD 30 ± 1.5 nm: lowest 1910/31.5 = 60.635, highest 2090/28.5 = 73.333.
    const s = makeStructure('hole', { depth: [2000 * nm, 1910 * nm, 2090 * nm], cd: [30 * nm, 28.5 * nm, 31.5 * nm], pitch: 80 * nm }, { array: 'square' });
    const plans = new PlanCache();
    const low = evaluateRule(makeRule({ id: 'LOW', quantity: 'geometry.aspect_ratio', comparison: 'at_least', limit: 50, evaluateAt: 'worst-case' }), s, plans);
    const high = evaluateRule(makeRule({ id: 'HIGH', quantity: 'geometry.aspect_ratio', comparison: 'at_most', limit: 80, evaluateAt: 'worst-case' }), s, plans);
    expectRel(low.value, 1910 / 31.5, 12);
    expectRel(high.value, 2090 / 28.5, 12);
    // Two yield rules that differ only in the required yield share nothing either.
    const y = (required: number) => makeRule({ quantity: 'geometry.aspect_ratio', comparison: 'at_most', limit: 68, evaluateAt: 'yield', yield: { required, written: String(required), confidence: 0.95, maxSamples: 16384, seed: 1 } });
    expect(evaluateRule(y(0.3), s, plans).status).toBe('pass');
    expect(evaluateRule(y(0.95), s, plans).status).toBe('fail');
  });
});

describe('unbounded values off nominal', () => {
  // A hole's taper closes at depth (CD/2)·tan θ below 90°; at or past 90° it never closes (unbounded above).
  const hole = () => makeStructure('hole', { depth: 2000 * nm, cd: 40 * nm, pitch: 80 * nm, sidewall_angle: [deg(90), deg(89.5), deg(90.5)] }, { array: 'square' });
  const closure = (comparison: 'at_least' | 'at_most', limit: number) => makeRule({ quantity: 'geometry.closure_depth', comparison, limit, evaluateAt: 'worst-case' });
  it('an at_least rule takes the corner that closes shallowest; an unbounded corner is never the worst', () => {
    const v = evaluateRule(closure('at_least', 1e-6), hole(), new PlanCache());
    expect(v.status).toBe('pass');
    expectRel(v.value, 20 * nm * Math.tan(deg(89.5)), 12); // 20 nm · 114.59 = 2.2918 µm
  });
  it('an at_most rule fails at the corner that never closes, with no value and unbounded above', () => {
    const v = evaluateRule(closure('at_most', 5e-6), hole(), new PlanCache());
    expect(v.status).toBe('fail');
    expect(v.value).toBeNull();
    expect(v.unbounded).toBe('above');
    expect(v.margin).toBeNull();
  });
  it('at nominal, the vertical walls never close: unbounded above passes at_least and fails at_most', () => {
    const at = (comparison: 'at_least' | 'at_most') => evaluateRule(makeRule({ quantity: 'geometry.closure_depth', comparison, limit: 5e-6 }), hole(), new PlanCache());
    expect([at('at_least').status, at('at_least').unbounded]).toEqual(['pass', 'above']);
    expect(at('at_most').status).toBe('fail');
  });
});

describe('the chart a quantity declares', () => {
  it('runs the bottom CD from a quarter to twice the depth, 48 points, from the deciding corner', () => {
    // CD − 2·D·cot θ at θ = 89.9°: the worst corner of ≥ 10 nm is the narrowest top (28.5 nm) and
    // the deepest hole (2090 nm); the curve keeps that CD and runs D from 522.5 nm to 4180 nm.
    const s = makeStructure('hole', { depth: [2000 * nm, 1910 * nm, 2090 * nm], cd: [30 * nm, 28.5 * nm, 31.5 * nm], pitch: 80 * nm, sidewall_angle: deg(89.9) }, { array: 'square' });
    const v = evaluateRule(makeRule({ quantity: 'geometry.bottom_cd', comparison: 'at_least', limit: 10 * nm, evaluateAt: 'worst-case' }), s, new PlanCache({ detail: true }));
    const c = v.sweeps![0]!;
    expect(v.sweeps![1]).toBeNull(); // no second chart declared
    expect(c.input).toBe('geometry.depth');
    expect(c.axis).toEqual({ label: 'geometry.depth', unit: 'm' });
    const bottom = (d: number) => 28.5 * nm - 2 * d * Math.tan(deg(0.1));
    expectRel(c.own.x, 2090 * nm, 12);
    expectRel(c.own.y, bottom(2090 * nm), 12);
    expect(c.points).toHaveLength(48);
    expectRel(c.points[0]!.x, 0.25 * 2090 * nm, 12);
    expectRel(c.points[47]!.x, 2 * 2090 * nm, 12);
    for (const p of c.points) expectRel(p.y, bottom(p.x), 12);
    expectRel(c.points[1]!.x - c.points[0]!.x, (1.75 * 2090 * nm) / 47, 9);
  });
});
