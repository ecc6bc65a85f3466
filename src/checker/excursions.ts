// Every run of a plan away from its nominal inputs lives here: the tolerance corners, sampling the
// inputs' distributions (yield and the probability of failure), and the sensitivities. The
// evaluation modes (`modes.ts`) and the report read what these compute; nothing else re-runs a plan.
import type { Comparison, Correlation, Param } from '../model/types.ts';
import { runPlan, type Plan } from './plan.ts';
import { cholesky, normalCdf, normalQuantile, QuasiRandom, wilsonInterval } from './statistics.ts';

export type ReadyPlan = Extract<Plan, { status: 'ready' }>;
export type Side = 'low' | 'high' | 'nominal';

/** The plan's target at one set of inputs. */
export interface Point {
  inputs: number[];
  value: number | null;
  reason?: string;
  unbounded?: 'above' | 'below';
  sides: Side[];
}

/** The value compared with limits: unbounded values compare as ±∞, undefined ones as NaN. */
export function comparable(p: Pick<Point, 'value' | 'unbounded'>): number {
  if (p.value !== null) return p.value;
  if (p.unbounded === 'above') return Infinity;
  if (p.unbounded === 'below') return -Infinity;
  return NaN;
}

/**
 * Whether a value meets a limit. A value at the limit passes; a relative 1e-12 absorbs
 * floating-point noise (20 V / 22 nm against 10 MV/cm × 1.1 must not fail by 2e-14 %). A value that
 * is undefined meets nothing.
 */
export function meets(v: number, limit: number, comparison: Comparison): boolean {
  const slack = 1e-12 * Math.abs(limit);
  if (Number.isNaN(v)) return false;
  return comparison === 'at_least' ? v >= limit - slack : v <= limit + slack;
}

export function evaluatePoint(plan: ReadyPlan, inputs: number[], sides: Side[]): Point {
  const run = runPlan(plan, inputs);
  const last = plan.steps.length - 1;
  const value = run.values[last] ?? null;
  const p: Point = { inputs, value, sides };
  if (value === null) {
    p.reason = run.reasons[last];
    if (run.unbounded[last]) p.unbounded = run.unbounded[last];
  }
  return p;
}

export function nominalPoint(plan: ReadyPlan): Point {
  return evaluatePoint(
    plan,
    plan.params.map((p) => p.value),
    plan.params.map(() => 'nominal'),
  );
}

/** Indices of the plan's inputs that carry a tolerance. */
export function tolerancedInputs(plan: ReadyPlan): number[] {
  return plan.params.map((p, i) => (p.low !== undefined && p.high !== undefined ? i : -1)).filter((i) => i >= 0);
}

export const MAX_CORNER_INPUTS = 16;

/** The worst of the 2^n tolerance corners (n toleranced inputs), and how many were evaluated. */
export function worstCorner(plan: ReadyPlan, nominal: Point, comparison: Comparison): { decisive: Point; corners: number } {
  const tol = tolerancedInputs(plan);
  if (tol.length === 0) return { decisive: nominal, corners: 1 };
  if (tol.length > MAX_CORNER_INPUTS) throw new Error(`${plan.quantity} reads ${tol.length} toleranced inputs; corners are limited to ${MAX_CORNER_INPUTS}`);
  let worst: Point | null = null;
  let worstMask = 0;
  const count = 1 << tol.length;
  const values = new Float64Array(count);
  for (let mask = 0; mask < count; mask++) {
    const inputs = nominal.inputs.slice();
    const sides: Side[] = plan.params.map(() => 'nominal');
    tol.forEach((pi, bit) => {
      const high = (mask >> bit) & 1;
      const p = plan.params[pi]!;
      inputs[pi] = high ? p.high! : p.low!;
      sides[pi] = high ? 'high' : 'low';
    });
    const pt = evaluatePoint(plan, inputs, sides);
    const v = comparable(pt);
    values[mask] = v;
    if (worst === null) worst = pt;
    else {
      const w = comparable(worst);
      // An undefined value is the worst there is; otherwise lowest for at_least, highest for at_most.
      const worse = Number.isNaN(v) ? !Number.isNaN(w) : !Number.isNaN(w) && (comparison === 'at_least' ? v < w : v > w);
      if (worse) {
        worst = pt;
        worstMask = mask;
      }
    }
  }
  return { decisive: withoutIdleInputs(plan, worst!, tol, values, worstMask), corners: count };
}

/**
 * The worst corner with every toleranced input the value does not depend on put back at nominal,
 * so the corner lists only the inputs that decide it (a keep-out radius that reads the depth only
 * for a validity flag does not list the depth). An input is idle when the corner across its
 * tolerance, already in the sweep, has the same value; the point is then evaluated once more, and
 * kept only if it still gives the deciding value.
 */
function withoutIdleInputs(plan: ReadyPlan, worst: Point, tol: number[], values: Float64Array, worstMask: number): Point {
  const target = values[worstMask]!;
  const idle = tol.filter((_, bit) => Object.is(values[worstMask ^ (1 << bit)], target));
  if (idle.length === 0) return worst;
  const inputs = worst.inputs.slice();
  const sides = worst.sides.slice();
  for (const i of idle) {
    inputs[i] = plan.params[i]!.value;
    sides[i] = 'nominal';
  }
  const trial = evaluatePoint(plan, inputs, sides);
  return Object.is(comparable(trial), target) ? trial : worst;
}

// ---------------------------------------------------------------------------------------------
// Sampling the inputs' distributions.

/**
 * How a toleranced input varies: by default its tolerance band is ±3σ of a normal distribution
 * (a band written unevenly, `+3/−1`, is a split normal with σ = 1/3 of each side); `uniform` spreads
 * it evenly over the band. Correlations join inputs through a Gaussian copula: the coefficient is
 * that of the underlying normals (for two normal inputs, their Pearson coefficient).
 */
export interface Sampler {
  /** Plan input indices that vary. */
  readonly varying: number[];
  /** The inputs of sample n (0-based). */
  draw(n: number): number[];
}

export function samplerFor(plan: ReadyPlan, correlations: readonly Correlation[], seed: number): Sampler {
  const varying = tolerancedInputs(plan);
  const d = varying.length;
  const seq = new QuasiRandom(Math.max(d, 1), seed);
  const indexOf = new Map(varying.map((pi, k) => [plan.params[pi]!.name, k]));
  const c = new Float64Array(d * d);
  for (let k = 0; k < d; k++) c[k * d + k] = 1;
  let correlated = false;
  for (const r of correlations) {
    const a = indexOf.get(r.inputs[0]);
    const b = indexOf.get(r.inputs[1]);
    if (a === undefined || b === undefined) continue; // an input this plan does not read
    c[a * d + b] = c[b * d + a] = r.coefficient;
    correlated = true;
  }
  const l = correlated ? cholesky(c, d) : null;
  // Loading checks that every structure's correlations can be a joint distribution.
  if (correlated && !l) throw new Error(`${plan.quantity}: the correlations of its inputs are not positive definite`);
  const u = new Float64Array(Math.max(d, 1));
  const z = new Float64Array(d);
  const nominal = plan.params.map((p) => p.value);
  return {
    varying,
    draw(n: number): number[] {
      seq.point(n, u);
      for (let k = 0; k < d; k++) z[k] = normalQuantile(u[k]!);
      if (l) {
        for (let i = d - 1; i >= 0; i--) {
          let s = 0;
          for (let k = 0; k <= i; k++) s += l[i * d + k]! * z[k]!;
          z[i] = s;
        }
      }
      const inputs = nominal.slice();
      varying.forEach((pi, k) => {
        inputs[pi] = sampleOf(plan.params[pi]!, z[k]!, l ? normalCdf(z[k]!) : u[k]!);
      });
      return inputs;
    },
  };
}

/** One input's value from a standard normal deviate z (and the same probability u = Φ(z)). */
function sampleOf(p: Param, z: number, u: number): number {
  const low = p.low!;
  const high = p.high!;
  if (p.spread === 'uniform') return low + u * (high - low);
  return p.value + z * (z < 0 ? p.value - low : high - p.value) / 3;
}

export interface SampleOptions {
  comparison: Comparison;
  limit: number;
  correlations: readonly Correlation[];
  seed: number;
}

export interface YieldEstimate {
  /** Samples drawn. */
  samples: number;
  /** Of them, those that fail the limit (no value counts as a failure). */
  failures: number;
  /** Passing fraction. */
  estimate: number;
  /** The confidence interval of the passing fraction (simultaneous over every look of a sequential stop). */
  low: number;
  high: number;
  /** Two-sided confidence of the interval. */
  confidence: number;
}

/** Sample sizes at which a sequential stop looks: 128, doubling, ending at the maximum. */
export function looksUpTo(maxSamples: number): number[] {
  const looks: number[] = [];
  for (let n = 128; n < maxSamples; n *= 2) looks.push(n);
  looks.push(maxSamples);
  return looks;
}

/**
 * The fraction of samples meeting the limit, drawn until the confidence interval lies wholly above
 * or below `required` at one of the looks, or until `maxSamples`. The interval is Wilson's at
 * confidence 1 − (1 − confidence)/looks at each look (Bonferroni), so the chance that any look
 * decides wrongly is at most 1 − confidence (for independent samples; the shifted quasi-random
 * sequence is as good or better in practice). Without `required`, it draws `maxSamples` and looks
 * once.
 */
export function sampleYield(plan: ReadyPlan, o: SampleOptions & { confidence: number; maxSamples: number; required?: number }): YieldEstimate & { decided: boolean } {
  const sampler = samplerFor(plan, o.correlations, o.seed);
  const looks = o.required === undefined ? [o.maxSamples] : looksUpTo(o.maxSamples);
  const alpha = (1 - o.confidence) / looks.length;
  let n = 0;
  let failures = 0;
  let interval = { low: 0, high: 1 };
  let decided = false;
  for (const target of looks) {
    for (; n < target; n++) {
      const run = runPlan(plan, sampler.draw(n));
      const last = plan.steps.length - 1;
      const v = comparable({ value: run.values[last] ?? null, unbounded: run.unbounded[last] });
      if (!meets(v, o.limit, o.comparison)) failures++;
    }
    interval = wilsonInterval(n - failures, n, alpha);
    if (o.required !== undefined && (interval.low >= o.required || interval.high < o.required)) {
      decided = true;
      break;
    }
  }
  return { samples: n, failures, estimate: (n - failures) / n, low: interval.low, high: interval.high, confidence: o.confidence, decided };
}
