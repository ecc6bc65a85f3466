// Yield and the probability of failure, held to closed-form probabilities: the normal distribution
// function from jstat (a general-purpose statistics library) and from the standard normal table,
// a numerical integral for a ratio of two normals, a uniform input's share of its band, and the
// sequential stop against a large fixed sample and its stated error rate over many seeds.
import jstat from 'jstat';
import { describe, expect, it } from 'vitest';
import { evaluateRule, PlanCache } from '../../src/checker/evaluate.ts';
import { sampleYield, type ReadyPlan } from '../../src/checker/excursions.ts';
import { buildPlan } from '../../src/checker/plan.ts';
import { normalCdf, normalQuantile, QuasiRandom, wilsonInterval } from '../../src/checker/statistics.ts';
import type { Structure } from '../../src/model/types.ts';
import { makeRule, makeStructure, nm } from '../helpers.ts';

const Phi = (x: number) => jstat.normal.cdf(x, 0, 1);

/** A hole whose aspect ratio depth/CD is the quantity: linear in the depth, a ratio in the CD. */
function hole(depth: number | [number, number, number], cd: number | [number, number, number], opts: Parameters<typeof makeStructure>[2] = {}): Structure {
  return makeStructure('hole', { depth, cd, pitch: 80 * nm }, { array: 'square', ...opts });
}
function planOf(s: Structure): ReadyPlan {
  const p = buildPlan(s, 'geometry.aspect_ratio');
  if (p.status !== 'ready') throw new Error('plan not ready');
  return p;
}
const fraction = (s: Structure, limit: number, n = 65536, seed = 1) =>
  sampleYield(planOf(s), { sides: [{ comparison: 'at_most', limit }], correlations: s.correlations, seed, confidence: 0.95, maxSamples: n }).estimate;

describe('the normal distribution the sampler draws from', () => {
  it('quantiles match the standard normal table and jstat', () => {
    // Standard normal table: z(0.975) = 1.959964, z(0.99865) = 3.0000 (to 4 places), z(0.5) = 0.
    expect(normalQuantile(0.975)).toBeCloseTo(1.959964, 6);
    expect(normalQuantile(0.99865)).toBeCloseTo(3.0, 3);
    expect(normalQuantile(0.5)).toBe(0);
    // The central and tail ranges of AS 241 against jstat, which is accurate there (not beyond
    // about 1e-9, where its own distribution function runs out of digits).
    for (const p of [1e-6, 0.001, 0.02, 0.074, 0.076, 0.3, 0.7, 0.93, 0.999, 1 - 1e-6]) {
      const ref = jstat.normal.inv(p, 0, 1);
      expect(Math.abs(normalQuantile(p) - ref) / Math.abs(ref)).toBeLessThan(1e-10);
    }
    // The far tail (r > 5, p below 1.4e-11): z(1e-12) = −7.0344838, z(1e-15) = −7.9413453, from
    // memory of R's qnorm, to 8 digits.
    expect(normalQuantile(1e-12)).toBeCloseTo(-7.0344838, 6);
    expect(normalQuantile(1e-15)).toBeCloseTo(-7.9413453, 6);
    expect(normalQuantile(1 - 1e-12)).toBeCloseTo(7.0344838, 3); // 1 − 1e-12 is not exact in binary
  });
  it('the distribution function matches jstat to its stated 1.2e-7', () => {
    for (const x of [-6, -3, -1.3, -0.2, 0, 0.4, 1, 2.5, 5]) expect(Math.abs(normalCdf(x) - Phi(x))).toBeLessThan(1.2e-7 * Math.max(Phi(x), 1e-3));
  });
  it('the shifted sequence fills the unit square evenly and the same seed repeats it', () => {
    const q = new QuasiRandom(2, 7);
    let inside = 0;
    for (let n = 0; n < 4096; n++) {
      const [a, b] = q.point(n);
      if (a! * a! + b! * b! < 1) inside++;
    }
    // The quarter disc holds π/4 = 0.785398 of the square; a quasi-random set of 4096 points is
    // within a few 1e-3 (a random one within ±0.013 at 2σ).
    expect(Math.abs(inside / 4096 - Math.PI / 4)).toBeLessThan(0.004);
    expect([...new QuasiRandom(3, 11).point(5)]).toEqual([...new QuasiRandom(3, 11).point(5)]);
    expect([...new QuasiRandom(3, 11).point(5)]).not.toEqual([...new QuasiRandom(3, 12).point(5)]);
  });
  it("Wilson's interval matches Newcombe's table of the score method", () => {
    // R. G. Newcombe, Stat. Med. 17, 857 (1998), Table I, method 3 (score, no continuity
    // correction), 95 %: 81/263 → 0.2553–0.3662, 15/148 → 0.0624–0.1605, 0/20 → 0–0.1611,
    // 1/29 → 0.0061–0.1718 (values from memory of the table; all four agree to its 4 places).
    const cases: Array<[number, number, number, number]> = [
      [81, 263, 0.2553, 0.3662],
      [15, 148, 0.0624, 0.1605],
      [0, 20, 0, 0.1611],
      [1, 29, 0.0061, 0.1718],
    ];
    for (const [k, n, low, high] of cases) {
      const w = wilsonInterval(k, n, 0.05);
      expect(w.low).toBeCloseTo(low, 4);
      expect(w.high).toBeCloseTo(high, 4);
    }
    expect(wilsonInterval(0, 20, 0.05).low).toBe(0);
    expect(wilsonInterval(20, 20, 0.05).high).toBe(1);
  });
});

describe('yield against closed-form probabilities', () => {
  // Depth 2000 nm ± 90 nm (±3σ, σ = 30 nm) at a fixed 30 nm CD: AR ≤ 68 ⇔ depth ≤ 2040 nm, z = 4/3.
  it('a quantity linear in one normal input: Φ(4/3) = 0.908789', () => {
    const s = hole([2000 * nm, 1910 * nm, 2090 * nm], 30 * nm);
    expect(Phi(4 / 3)).toBeCloseTo(0.908789, 6); // standard normal table: Φ(1.33) = 0.9082, Φ(1.34) = 0.9099
    expect(Math.abs(fraction(s, 68) - Phi(4 / 3))).toBeLessThan(0.002);
  });
  it('an uneven band is a split normal: half the samples fall on each side of nominal, Φ(1) within +1σ', () => {
    // +60/−30 nm: σ = 20 nm above, 10 nm below. AR ≤ 2020/30 ⇔ depth ≤ nominal + 1σ_high.
    const s = hole([2000 * nm, 1970 * nm, 2060 * nm], 30 * nm);
    expect(Math.abs(fraction(s, 2000 / 30) - 0.5)).toBeLessThan(0.002);
    expect(Math.abs(fraction(s, 2020 / 30) - Phi(1))).toBeLessThan(0.002); // Φ(1) = 0.841345
    expect(Math.abs(fraction(s, 1990 / 30) - Phi(-1))).toBeLessThan(0.002); // 1σ_low below
  });
  it('a uniform input: the share of its band below the crossing, (2040 − 1910)/180 = 0.72222', () => {
    const s = hole([2000 * nm, 1910 * nm, 2090 * nm], 30 * nm, { uniform: ['depth'] });
    expect(Math.abs(fraction(s, 68) - 130 / 180)).toBeLessThan(0.002);
  });
  it('a ratio of two normal inputs against a numerical integral over the CD', () => {
    // Depth N(2000, 30²) nm, CD N(30, 0.5²) nm: P(D/C ≤ 68) = ∫ φ_C(c) Φ((68c − 2000)/30) dc, by
    // Simpson's rule over ±8σ of the CD (2000 intervals; its error is far below 1e-6 here).
    const muC = 30;
    const sC = 0.5;
    const f = (c: number) => (Math.exp(-0.5 * ((c - muC) / sC) ** 2) / (sC * Math.sqrt(2 * Math.PI))) * Phi((68 * c - 2000) / 30);
    const a = muC - 8 * sC;
    const b = muC + 8 * sC;
    const m = 2000;
    const h = (b - a) / m;
    let sum = f(a) + f(b);
    for (let i = 1; i < m; i++) sum += (i % 2 ? 4 : 2) * f(a + i * h);
    const integral = (sum * h) / 3;
    // The CD spread lowers it from 0.9088, to near Φ(40/√(30² + 68²·0.5²)) = Φ(0.8822) = 0.8112.
    expect(integral).toBeGreaterThan(0.8);
    expect(integral).toBeLessThan(0.82);
    const s = hole([2000 * nm, 1910 * nm, 2090 * nm], [30 * nm, 28.5 * nm, 31.5 * nm]);
    expect(Math.abs(fraction(s, 68) - integral)).toBeLessThan(0.002);
  });
  it('correlated inputs: the linear combination D − 68·C of two correlated normals', () => {
    // With correlation ρ: P(D − 68C ≤ 0) = Φ((68·30 − 2000)/√(30² + 68²·0.5² − 2·68·ρ·30·0.5)).
    for (const rho of [0.8, -0.5]) {
      const s = hole([2000 * nm, 1910 * nm, 2090 * nm], [30 * nm, 28.5 * nm, 31.5 * nm], { correlations: [['depth', 'cd', rho]] });
      const sd = Math.sqrt(30 ** 2 + 68 ** 2 * 0.25 - 2 * 68 * rho * 30 * 0.5);
      // Exact for the normal linear combination; the ratio differs only where C ≤ 0 (60σ away).
      expect(Math.abs(fraction(s, 68) - Phi((68 * 30 - 2000) / sd))).toBeLessThan(0.002);
    }
  });
});

describe('the sequential stop', () => {
  // True yield Φ(4/3) = 0.9088 (above). Required 0.90 is close above it; 0.92 close below.
  const s = hole([2000 * nm, 1910 * nm, 2090 * nm], 30 * nm);
  const run = (required: number, seed: number) =>
    sampleYield(planOf(s), { sides: [{ comparison: 'at_most', limit: 68 }], correlations: [], seed, confidence: 0.95, maxSamples: 16384, required });
  it('agrees with a large fixed sample near the required yield, and stops early far from it', () => {
    const big = fraction(s, 68, 262144);
    for (const required of [0.9, 0.92]) {
      const r = run(required, 3);
      expect(r.decided).toBe(true);
      expect(r.low >= required).toBe(big >= required);
    }
    // Far from the requirement the first look (128 samples) already decides.
    expect(run(0.5, 3).samples).toBe(128);
  });
  it('decides wrongly in at most its stated 5 % of seeds', () => {
    let wrong = 0;
    let undecided = 0;
    const seeds = 200;
    for (let seed = 1; seed <= seeds; seed++) {
      const r = run(0.9, seed);
      if (!r.decided) undecided++;
      else if (r.low < 0.9) wrong++; // decided "below 90 %" while the truth is 90.88 %
    }
    // At most 5 % wrong; the Bonferroni looks make it far rarer. Binomial slack: 5 % of 200 is 10.
    expect(wrong).toBeLessThanOrEqual(10);
    expect(undecided).toBeLessThan(seeds);
  });
  it('is deterministic for a seed', () => {
    expect(run(0.9, 42)).toEqual(run(0.9, 42));
  });
});

describe('a yield rule', () => {
  const rule = (required: number) =>
    makeRule({ quantity: 'geometry.aspect_ratio', comparison: 'at_most', limit: 68, evaluateAt: 'yield', yield: { required, written: `${required * 100} %`, confidence: 0.95, maxSamples: 16384, seed: 1 } });
  it('passes when the yield is above the requirement and fails below, from the same nominal value', () => {
    const s = hole([2000 * nm, 1910 * nm, 2090 * nm], 30 * nm);
    const pass = evaluateRule(rule(0.85), s, new PlanCache());
    const fail = evaluateRule(rule(0.95), s, new PlanCache());
    expect(pass.status).toBe('pass');
    expect(fail.status).toBe('fail');
    // Both show the nominal aspect ratio 2000/30 and its margin against 68.
    expect(pass.value).toBeCloseTo(2000 / 30, 9);
    expect(fail.margin).toBeCloseTo((68 - 2000 / 30) / 68, 9);
    expect(fail.mode?.kind).toBe('yield');
    if (fail.mode?.kind !== 'yield') return;
    expect(fail.mode.high).toBeLessThan(0.95);
    expect(fail.mode.low).toBeLessThanOrEqual(Phi(4 / 3));
    expect(fail.mode.high).toBeGreaterThanOrEqual(Phi(4 / 3));
  });
  it('without a toleranced input the yield is 1 or 0 with one evaluation', () => {
    const v = evaluateRule(rule(0.99), hole(2000 * nm, 30 * nm), new PlanCache());
    expect(v.status).toBe('pass');
    expect(v.mode).toMatchObject({ kind: 'yield', estimate: 1, samples: 1, failures: 0 });
    const w = evaluateRule(rule(0.99), hole(2100 * nm, 30 * nm), new PlanCache());
    expect(w.status).toBe('fail');
    expect(w.mode).toMatchObject({ kind: 'yield', estimate: 0, samples: 1, failures: 1 });
  });
  it('a worst case reports its probability of failure when asked: Φ(−4/3) = 0.0912', () => {
    const s = hole([2000 * nm, 1910 * nm, 2090 * nm], 30 * nm);
    const r = makeRule({ quantity: 'geometry.aspect_ratio', comparison: 'at_most', limit: 68, evaluateAt: 'worst-case' });
    const v = evaluateRule(r, s, new PlanCache({ detail: true }));
    expect(v.status).toBe('fail'); // the high corner, 2090/30 = 69.7
    if (v.mode?.kind !== 'worst-case') throw new Error('not a worst case');
    const f = v.mode.failure!;
    expect(f.samples).toBe(512);
    expect(f.low).toBeLessThanOrEqual(Phi(-4 / 3));
    expect(f.high).toBeGreaterThanOrEqual(Phi(-4 / 3));
    expect(Math.abs(f.probability - Phi(-4 / 3))).toBeLessThan(0.01);
    // Not asked (a plain check), it is left out.
    const plain = evaluateRule(r, s, new PlanCache());
    expect(plain.mode).toMatchObject({ kind: 'worst-case' });
    expect(plain.mode?.kind === 'worst-case' && plain.mode.failure).toBeFalsy();
  });
});
