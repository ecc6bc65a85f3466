// Every run of a plan away from its nominal inputs lives here: the tolerance corners, sampling the
// inputs' distributions (yield and the probability of failure), and the sensitivities. The
// evaluation modes (`modes.ts`) and the report read what these compute; nothing else re-runs a plan.
import { QUANTITIES } from '../engines/index.ts';
import type { Comparison, Correlation, Param, RuleSide, Structure } from '../model/types.ts';
import { runPlan, shapeOf, type Plan } from './plan.ts';
import { cholesky, normalCdf, normalQuantile, QuasiRandom, wilsonInterval } from './statistics.ts';

export type ReadyPlan = Extract<Plan, { status: 'ready' }>;
export type End = 'low' | 'high' | 'nominal';

/** The plan's target at one set of inputs. */
export interface Point {
  inputs: number[];
  value: number | null;
  reason?: string;
  unbounded?: 'above' | 'below';
  sides: End[];
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

export function evaluatePoint(plan: ReadyPlan, inputs: number[], sides: End[]): Point {
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

/** A limit a value must meet (one side of a rule). */
export type Side = Pick<RuleSide, 'comparison' | 'limit'>;

/** Whether a value meets every side of a rule. */
export function meetsAll(v: number, sides: readonly Side[]): boolean {
  return sides.every((s) => meets(v, s.limit, s.comparison));
}

/** Signed distance of a value to a side, in the side's relative margin (absolute for a zero limit): positive passes. */
function slackTo(v: number, s: Side): number {
  const d = s.comparison === 'at_least' ? v - s.limit : s.limit - v;
  return s.limit === 0 ? d : d / Math.abs(s.limit);
}

/** The side a value is closest to failing (or fails by most); the first for a value that is undefined. */
export function decidingSide(v: number, sides: readonly Side[]): number {
  if (Number.isNaN(v)) return 0;
  let best = 0;
  for (let k = 1; k < sides.length; k++) if (slackTo(v, sides[k]!) < slackTo(v, sides[best]!)) best = k;
  return best;
}

/**
 * The worst of the 2^n tolerance corners (n toleranced inputs) for each side of the rule — the
 * lowest value for `at_least`, the highest for `at_most`, an undefined value worst of all — and
 * which side decides: the one whose worst corner comes closest to failing it.
 */
export function worstCorner(plan: ReadyPlan, nominal: Point, sides: readonly Side[]): { decisive: Point; corners: number; side: number; worstBySide: number[] } {
  const tol = tolerancedInputs(plan);
  const v0 = comparable(nominal);
  if (tol.length === 0) return { decisive: nominal, corners: 1, side: decidingSide(v0, sides), worstBySide: sides.map(() => v0) };
  if (tol.length > MAX_CORNER_INPUTS) throw new Error(`${plan.quantity} reads ${tol.length} toleranced inputs; corners are limited to ${MAX_CORNER_INPUTS}`);
  const count = 1 << tol.length;
  const values = new Float64Array(count);
  const points: Point[] = new Array(count);
  for (let mask = 0; mask < count; mask++) {
    const inputs = nominal.inputs.slice();
    const cornerSides: End[] = plan.params.map(() => 'nominal');
    tol.forEach((pi, bit) => {
      const high = (mask >> bit) & 1;
      const p = plan.params[pi]!;
      inputs[pi] = high ? p.high! : p.low!;
      cornerSides[pi] = high ? 'high' : 'low';
    });
    points[mask] = evaluatePoint(plan, inputs, cornerSides);
    values[mask] = comparable(points[mask]!);
  }
  const worstMasks = sides.map((s) => {
    let worst = 0;
    for (let mask = 1; mask < count; mask++) {
      const v = values[mask]!;
      const w = values[worst]!;
      // An undefined value is the worst there is; otherwise lowest for at_least, highest for at_most.
      const worse = Number.isNaN(v) ? !Number.isNaN(w) : !Number.isNaN(w) && (s.comparison === 'at_least' ? v < w : v > w);
      if (worse) worst = mask;
    }
    return worst;
  });
  let side = 0;
  for (let k = 1; k < sides.length; k++) {
    const vk = values[worstMasks[k]!]!;
    const vs = values[worstMasks[side]!]!;
    if (!Number.isNaN(vs) && (Number.isNaN(vk) || slackTo(vk, sides[k]!) < slackTo(vs, sides[side]!))) side = k;
  }
  const mask = worstMasks[side]!;
  return { decisive: withoutIdleInputs(plan, points[mask]!, tol, values, mask), corners: count, side, worstBySide: worstMasks.map((m) => values[m]!) };
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
        // From the last row up, so each row reads deviates not yet replaced.
        // Stryker disable next-line EqualityOperator: row 0 of a correlation's Cholesky factor is (1, 0, …), so z[0] stays as it is
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
  // A normal sample beyond the physical range is held just inside it.
  return heldInside(p.value + (z * (z < 0 ? p.value - low : high - p.value)) / 3, p.value, p.range, 1e-6);
}

export interface SampleOptions {
  /** The rule's sides: a sample passes when its value meets every one. */
  sides: readonly Side[];
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
      if (!meetsAll(valueAt(plan, sampler.draw(n)), o.sides)) failures++;
    }
    interval = wilsonInterval(n - failures, n, alpha);
    if (o.required !== undefined && (interval.low >= o.required || interval.high < o.required)) {
      decided = true;
      break;
    }
  }
  return { samples: n, failures, estimate: (n - failures) / n, low: interval.low, high: interval.high, confidence: o.confidence, decided };
}

// ---------------------------------------------------------------------------------------------
// What drives the margin, and what would pass.

/** One input of a verdict: how strongly it moves the value, and which of its values would pass. */
export interface Lever {
  name: string;
  unit: string;
  /** The input at nominal. */
  value: number;
  /**
   * Elasticity at nominal, (∂Q/∂x)·(x/Q): the percent change of the value per percent of the
   * input, by central difference over ±0.1 % of x; null where x or Q is 0 or has no value there.
   */
  elasticity: number | null;
  /** The value with this input at the low and at the high end of its tolerance, every other at nominal. */
  ends?: { low: number; high: number; valueAtLow: number | null; valueAtHigh: number | null };
  /**
   * The nominal values of this input that meet the limit, as closed intervals inside `searched`,
   * every other input held where the verdict is decided (nominal, or the deciding corner, this
   * input keeping its offset there). Empty when no value in the searched range passes.
   */
  passes?: Array<[number, number]>;
  searched?: [number, number];
}

const ELASTICITY_STEP = 1e-3;
const SCAN_POINTS = 24;
const BISECTIONS = 32;

/** The plan's target at these inputs, as limits compare it (±∞ unbounded, NaN without a value). */
export function valueAt(plan: ReadyPlan, inputs: ArrayLike<number>): number {
  const run = runPlan(plan, inputs);
  const last = plan.steps.length - 1;
  return comparable({ value: run.values[last] ?? null, unbounded: run.unbounded[last] });
}
const finiteOrNull = (x: number): number | null => (Number.isFinite(x) ? x : null);

/**
 * The range the passing values of an input are searched in: a decade either side (±20° for an
 * angle), such that the value used, x + `offset` (the input's shift at the deciding corner), stays
 * strictly inside its physical range (a CD of exactly 0 has no aspect ratio).
 */
export function searchRange(p: Param, offset = 0): [number, number] | null {
  const v = p.value;
  if (v === 0 || !Number.isFinite(v)) return null;
  let lo = p.unit === 'rad' ? v - (20 * Math.PI) / 180 : v > 0 ? v / 10 : v * 10;
  let hi = p.unit === 'rad' ? v + (20 * Math.PI) / 180 : v > 0 ? v * 10 : v / 10;
  const shifted = { ...(p.range?.min !== undefined ? { min: p.range.min - offset } : {}), ...(p.range?.max !== undefined ? { max: p.range.max - offset } : {}) };
  lo = heldInside(lo, v, shifted, 1e-3);
  hi = heldInside(hi, v, shifted, 1e-3);
  return lo < hi && lo < v && v < hi ? [lo, hi] : null;
}

/**
 * x, or, when it reaches a bound of the physical range, a point just inside it: `fraction` of the
 * way from the bound back toward `anchor` (the written value), so an open bound is never met.
 */
export function heldInside(x: number, anchor: number, range: Param['range'], fraction: number): number {
  const min = range?.min;
  const max = range?.max;
  if (min !== undefined && x <= min) return min + (anchor - min) * fraction;
  if (max !== undefined && x >= max) return max - (max - anchor) * fraction;
  return x;
}

/** Whether a relation holds at these plan inputs. */
export function holdsAt(r: PlanRelation, inputs: ArrayLike<number>): boolean {
  return r.holds(r.reads.map((s) => ('index' in s ? inputs[s.index]! : s.value)));
}

/** The first step too costly to run hundreds of times (a fill march), as "name: why"; undefined when none is. */
export function costlyStep(plan: ReadyPlan): string | undefined {
  const st = plan.steps.find((x) => x.variant.costly);
  return st ? `${st.def.name}: ${st.variant.costly}` : undefined;
}

/** A relation between inputs a structure must keep (`src/model/relations.ts`), over plan indices. */
export interface PlanRelation {
  /** For each input the relation reads: its plan index, or its fixed value when the plan does not read it. */
  reads: Array<{ index: number } | { value: number }>;
  holds: (v: number[]) => boolean;
}

/**
 * The part of `range` around the input's current value x0 where every relation that reads it
 * still holds (a support stays below the top, a pitch above the CD), each end found by bisection
 * from x0, which holds.
 */
export function validRange(base: number[], i: number, offset: number, x0: number, range: [number, number], relations: readonly PlanRelation[]): [number, number] {
  const own = relations.filter((r) => r.reads.some((s) => 'index' in s && s.index === i));
  if (own.length === 0) return range;
  const inputs = base.slice();
  const valid = (x: number) => {
    inputs[i] = x + offset;
    return own.every((r) => holdsAt(r, inputs));
  };
  const edge = (end: number) => {
    if (valid(end)) return end;
    let good = x0;
    let bad = end;
    for (let n = 0; n < BISECTIONS; n++) {
      const m = (good + bad) / 2;
      if (valid(m)) good = m;
      else bad = m;
    }
    return good;
  };
  return [edge(range[0]), edge(range[1])];
}

/**
 * The nominal values x of input i inside `range` at which the plan meets the limit: a scan of
 * 24 points (evenly spaced, or geometrically for a range of one sign spanning more than a factor
 * of 3) together with the `also` points (the current value and its tolerance ends), each change
 * between pass and fail bisected 40 times to the last passing value. A passing or failing stretch
 * narrower than the scan's spacing that holds none of these points can be missed.
 */
export function passingValues(plan: ReadyPlan, base: number[], i: number, offset: number, range: [number, number], sides: readonly Side[], also: number[] = []): Array<[number, number]> {
  const [lo, hi] = range;
  const geometric = lo > 0 && hi / lo > 3;
  const grid = Array.from({ length: SCAN_POINTS }, (_, k) => {
    const t = k / (SCAN_POINTS - 1);
    return geometric ? lo * Math.pow(hi / lo, t) : lo + (hi - lo) * t;
  });
  const xs = [...new Set([...grid, ...also.filter((x) => x > lo && x < hi)])].sort((a, b) => a - b);
  const inputs = base.slice();
  const passAt = (x: number) => {
    inputs[i] = x + offset;
    return meetsAll(valueAt(plan, inputs), sides);
  };
  const ok = xs.map(passAt);
  const intervals: Array<[number, number]> = [];
  let start: number | null = ok[0] ? lo : null;
  for (let k = 1; k < xs.length; k++) {
    if (ok[k] === ok[k - 1]) continue;
    // Bisect between a passing and a failing point; keep the passing end.
    let a = xs[k - 1]!; // ok[k-1]
    let b = xs[k]!;
    for (let n = 0; n < BISECTIONS; n++) {
      const m = (a + b) / 2;
      if (passAt(m) === ok[k - 1]) a = m;
      else b = m;
    }
    const passing = ok[k - 1] ? a : b;
    if (ok[k]) start = passing;
    else {
      intervals.push([start!, passing]);
      start = null;
    }
  }
  if (start !== null) intervals.push([start, hi]);
  return intervals;
}

/**
 * Every input of a verdict ranked by how much of the value it moves across its tolerance (then by
 * elasticity), with the values of each dimensional or toleranced input that would pass. `decisive`
 * is where the verdict is decided; `solve` says whether to search passing values (a limit to meet).
 */
export function leversOf(plan: ReadyPlan, nominal: Point, decisive: Point, sides: readonly Side[], relations: readonly PlanRelation[] = []): Lever[] {
  const q0 = comparable(nominal);
  const levers = plan.params.map((p, i): Lever => {
    const x = nominal.inputs[i]!;
    const at = (v: number) => {
      const inputs = nominal.inputs.slice();
      inputs[i] = v;
      return valueAt(plan, inputs);
    };
    let elasticity: number | null = null;
    if (x !== 0 && Number.isFinite(q0) && q0 !== 0) {
      const h = Math.abs(x) * ELASTICITY_STEP;
      const e = ((at(x + h) - at(x - h)) / (2 * h)) * (x / q0);
      elasticity = finiteOrNull(e);
    }
    const lever: Lever = { name: p.name, unit: p.unit, value: x, elasticity };
    if (p.low !== undefined && p.high !== undefined) {
      lever.ends = { low: p.low, high: p.high, valueAtLow: finiteOrNull(at(p.low)), valueAtHigh: finiteOrNull(at(p.high)) };
    }
    const offset = decisive.inputs[i]! - x;
    const wide = p.unit === 'm' || p.unit === 'rad' || p.low !== undefined ? searchRange(p, offset) : null;
    if (wide) {
      const range = validRange(decisive.inputs, i, offset, x, wide, relations);
      lever.searched = range;
      lever.passes = passingValues(plan, decisive.inputs, i, offset, range, sides, [x, ...(p.low !== undefined ? [p.low, p.high!] : [])]);
    }
    return lever;
  });
  const swing = (l: Lever) => {
    if (!l.ends) return -1;
    const d = Math.abs((l.ends.valueAtHigh ?? NaN) - (l.ends.valueAtLow ?? NaN));
    return Number.isNaN(d) ? Infinity : d; // an end without a value moves the verdict most
  };
  return levers.sort((a, b) => swing(b) - swing(a) || Math.abs(b.elasticity ?? 0) - Math.abs(a.elasticity ?? 0) || (a.name < b.name ? -1 : a.name > b.name ? 1 : 0));
}

// ---------------------------------------------------------------------------------------------
// The chart a quantity's declaration asks for: the value against one input.

/** The value against one input, from the point a verdict is decided at (SI; x in the axis variable). */
export interface SweepCurve {
  /** The quantity charted: the verdict's, or the one its declaration charts instead (a fit's curve). */
  quantity: string;
  /** The input swept. */
  input: string;
  /** What the x axis shows: the swept input itself, or the variable the declaration maps it to. */
  axis: { label: string; unit: string };
  /** The structure's own point. */
  own: { x: number; y: number };
  points: Array<{ x: number; y: number }>;
  /** The same plan with some inputs replaced (the reference feature's CD and vertical walls, say). */
  companion?: { label: string; points: Array<{ x: number; y: number }> };
  /** Measured points to draw over the curve. */
  overlay?: { label: string; points: Array<{ x: number; y: number }> };
}

export const SWEEP_POINTS = 48;

/**
 * The sweep a quantity declares (`sweep`, or with `extra` its `extraSweep`), run from `decided`
 * (the inputs of the point the verdict is decided at; a charted quantity of its own takes its
 * nominal values for inputs the verdict's plan does not read). Null when the quantity declares
 * none, the plan does not read the input, or fewer than two points have a value.
 */
export function declaredSweep(
  quantity: string,
  planOf: (name: string) => Plan,
  decided: ReadonlyMap<string, number>,
  ownValue: number,
  s: Structure,
  film: string | undefined,
  extra: boolean,
): SweepCurve | null {
  const own = QUANTITIES.get(quantity);
  const ownSweep = extra ? own?.extraSweep : own?.sweep;
  if (!ownSweep) return null;
  const name = ownSweep.of ?? quantity;
  const def = QUANTITIES.get(name);
  const baseSweep = extra ? def?.extraSweep : def?.sweep;
  if (!def || !baseSweep) return null;
  const sweep = { ...baseSweep, ...ownSweep };
  const plan = planOf(name);
  if (plan.status !== 'ready') return null;
  const inputName = sweep.input(shapeOf(s, film));
  const idx = plan.params.findIndex((p) => p.name === inputName);
  if (idx < 0) return null;
  const base = plan.params.map((p) => decided.get(p.name) ?? p.value);
  const x0 = base[idx]!;
  const last = plan.steps.length - 1;
  const y0 = name === quantity ? ownValue : runPlan(plan, base).values[last];
  if (y0 === null || y0 === undefined) return null;
  const byName = Object.fromEntries(plan.params.map((p, i) => [p.name, base[i]!]));
  const axis = sweep.axis;
  const shown = (x: number) => (axis ? axis.map(x, byName) : x);
  const sweepFrom = (start: number[]) => {
    const points: Array<{ x: number; y: number }> = [];
    for (let k = 0; k < SWEEP_POINTS; k++) {
      const x = x0 * (sweep.from + ((sweep.to - sweep.from) * k) / (SWEEP_POINTS - 1));
      const inputs = start.slice();
      inputs[idx] = x;
      const y = runPlan(plan, inputs).values[last];
      if (y !== null && y !== undefined && Number.isFinite(y)) points.push({ x: shown(x), y });
    }
    return points;
  };
  const points = sweepFrom(base);
  if (points.length < 2) return null;
  const curve: SweepCurve = { quantity: name, input: inputName, axis: axis ? { label: axis.label, unit: axis.unit } : { label: inputName, unit: plan.params[idx]!.unit }, own: { x: shown(x0), y: y0 }, points };
  const comp = sweep.companion;
  if (comp) {
    // The companion curve: the same plan with some inputs replaced (all must be known).
    const start = base.slice();
    let complete = true;
    for (const [target, source] of Object.entries(comp.replace)) {
      const ti = plan.params.findIndex((p) => p.name === target);
      const value = typeof source === 'number' ? source : s.params.get(source)?.value;
      if (ti < 0 || value === undefined) complete = false;
      else start[ti] = value;
    }
    if (complete) curve.companion = { label: comp.label, points: sweepFrom(start) };
  }
  if (sweep.overlay) curve.overlay = { label: sweep.overlay.label, points: sweep.overlay.points(byName) };
  return curve;
}
