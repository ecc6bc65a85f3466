// Process windows: where in the plane of two inputs a rule (or every blocking rule of a structure)
// passes, the other inputs at nominal. The plane is sampled on a coarse grid whose cells are split
// where their corners disagree, so the boundary is found finely without a dense grid everywhere;
// the edges of the window along each axis through the nominal point are solved exactly and named
// by the rule that bounds them.
import type { Param, Rule } from '../model/types.ts';
import { costlyStep, heldInside, holdsAt, meetsAll, passingValues, validRange, valueAt, type PlanRelation, type ReadyPlan } from './excursions.ts';
import type { Plan } from './plan.ts';

/** One axis of a window: an input and the range mapped. */
export interface WindowAxis {
  input: string;
  unit: string;
  from: number;
  to: number;
  /** The written value, and its tolerance band when it has one. */
  nominal: number;
  low?: number;
  high?: number;
}

/** A leaf cell of the refined grid, with whether its centre passes and, if not, which rules fail there. */
export interface WindowCell {
  x0: number;
  x1: number;
  y0: number;
  y1: number;
  pass: boolean;
  failing?: string[];
}

/** An edge of the window along one axis through the nominal point, and the rule that sets it. */
export interface WindowEdge {
  axis: 0 | 1;
  side: 'low' | 'high';
  /** The last passing value of that input (the other at nominal), or the end of the range mapped when nothing bounds it there. */
  at: number;
  /** The rule whose limit bounds it; absent when the range ends first. */
  rule?: string;
}

export interface ProcessWindow {
  axes: [WindowAxis, WindowAxis];
  /** The rules mapped (for a verdict, its own; for a structure, every blocking rule that applies and reads an axis). */
  rules: string[];
  /** Rules that read an axis but are left off the map, and why (a fill march too costly to run at thousands of points). */
  notMapped?: Array<{ rule: string; why: string }>;
  cells: WindowCell[];
  /** Whether the nominal point passes every rule mapped. */
  nominalPasses: boolean;
  /** Present when the nominal point passes: the window's four edges through it. */
  edges?: WindowEdge[];
  /** Plan evaluations the refined grid spent. */
  evaluations: number;
}

/** A rule compiled for the structure, with where the two axes sit among its inputs. */
export interface MappedRule {
  rule: Rule;
  plan: ReadyPlan;
  /** Plan indices of the two axes (−1 where the plan does not read that input). */
  at: [number, number];
  relations: PlanRelation[];
}

const COARSE = 9;
/** Marks a cell whose centre breaks the structure's relations. */
export const OUTSIDE = '(not a valid structure)';
const DEPTH = 3;

/**
 * The range mapped for an input: four half-widths of its tolerance either side of nominal (±20 %
 * without one), inside its physical range.
 */
export function windowAxis(p: Param): WindowAxis {
  const half = p.low !== undefined && p.high !== undefined ? Math.max(p.value - p.low, p.high - p.value) : 0;
  const reach = half > 0 ? 4 * half : 0.2 * Math.abs(p.value);
  let from = p.value - reach;
  let to = p.value + reach;
  from = heldInside(from, p.value, p.range, 1e-3);
  to = heldInside(to, p.value, p.range, 1e-3);
  return { input: p.name, unit: p.unit, from, to, nominal: p.value, ...(p.low !== undefined ? { low: p.low, high: p.high } : {}) };
}

export function mapWindow(rules: MappedRule[], axes: [WindowAxis, WindowAxis], notMapped: Array<{ rule: string; why: string }> = []): ProcessWindow {
  let evaluations = 0;
  const failingAt = (x: number, y: number): string[] => {
    const failing: string[] = [];
    for (const m of rules) {
      const inputs = m.plan.params.map((p) => p.value);
      if (m.at[0] >= 0) inputs[m.at[0]] = x;
      if (m.at[1] >= 0) inputs[m.at[1]] = y;
      // A point where the structure breaks its own relations (a CD above the pitch) is no structure.
      if (!m.relations.every((r) => holdsAt(r, inputs))) return [OUTSIDE];
      evaluations++;
      if (!meetsAll(valueAt(m.plan, inputs), m.rule.sides)) failing.push(m.rule.id);
    }
    return failing;
  };
  const memo = new Map<string, boolean>();
  const passAt = (x: number, y: number) => {
    const key = `${x} ${y}`;
    let ok = memo.get(key);
    if (ok === undefined) memo.set(key, (ok = failingAt(x, y).length === 0));
    return ok;
  };
  const [ax, ay] = axes;
  const cells: WindowCell[] = [];
  const leaf = (x0: number, x1: number, y0: number, y1: number) => {
    const failing = failingAt((x0 + x1) / 2, (y0 + y1) / 2);
    cells.push({ x0, x1, y0, y1, pass: failing.length === 0, ...(failing.length ? { failing } : {}) });
  };
  const refine = (x0: number, x1: number, y0: number, y1: number, depth: number) => {
    const corners = [passAt(x0, y0), passAt(x1, y0), passAt(x0, y1), passAt(x1, y1)];
    if (depth === DEPTH || corners.every((c) => c === corners[0])) return leaf(x0, x1, y0, y1);
    const xm = (x0 + x1) / 2;
    const ym = (y0 + y1) / 2;
    refine(x0, xm, y0, ym, depth + 1);
    refine(xm, x1, y0, ym, depth + 1);
    refine(x0, xm, ym, y1, depth + 1);
    refine(xm, x1, ym, y1, depth + 1);
  };
  const dx = (ax.to - ax.from) / COARSE;
  const dy = (ay.to - ay.from) / COARSE;
  for (let i = 0; i < COARSE; i++) for (let j = 0; j < COARSE; j++) refine(ax.from + i * dx, ax.from + (i + 1) * dx, ay.from + j * dy, ay.from + (j + 1) * dy, 0);

  const nominalPasses = failingAt(ax.nominal, ay.nominal).length === 0;
  const window: ProcessWindow = { axes, rules: rules.map((m) => m.rule.id), ...(notMapped.length ? { notMapped } : {}), cells, nominalPasses, evaluations };
  if (nominalPasses) window.edges = ([0, 1] as const).flatMap((axis) => edgesAlong(rules, axes, axis));
  window.evaluations = evaluations;
  return window;
}

/**
 * The window's two edges along one axis through the nominal point: each rule's passing interval
 * that holds the nominal value (solved by bisection, `passingValues`), intersected; the rule with
 * the tightest bound names each edge.
 */
function edgesAlong(rules: MappedRule[], axes: [WindowAxis, WindowAxis], axis: 0 | 1): WindowEdge[] {
  const a = axes[axis];
  let low: WindowEdge = { axis, side: 'low', at: a.from };
  let high: WindowEdge = { axis, side: 'high', at: a.to };
  for (const m of rules) {
    const i = m.at[axis];
    if (i < 0) continue;
    const base = m.plan.params.map((p) => p.value);
    const other = m.at[1 - axis]!;
    if (other >= 0) base[other] = axes[1 - axis]!.nominal;
    const range = validRange(base, i, 0, a.nominal, [a.from, a.to], m.relations);
    const around = passingValues(m.plan, base, i, 0, range, m.rule.sides, [a.nominal]).find(([lo, hi]) => lo <= a.nominal && a.nominal <= hi);
    if (!around) continue; // the nominal point fails this rule: no window (not reached: nominalPasses)
    if (around[0] > low.at) low = { axis, side: 'low', at: around[0], ...(around[0] > range[0] ? { rule: m.rule.id } : {}) };
    if (around[1] < high.at) high = { axis, side: 'high', at: around[1], ...(around[1] < range[1] ? { rule: m.rule.id } : {}) };
  }
  return [low, high];
}

/**
 * Compile the rules to map for a structure: those whose plans are ready and read at least one
 * axis; a plan with a costly step (a fill march) is left off, with the reason.
 */
export function mappedRules(
  rules: Rule[],
  inputs: [string, string],
  planOf: (rule: Rule) => Plan,
  relationsOf: (plan: ReadyPlan) => PlanRelation[],
): { mapped: MappedRule[]; notMapped: Array<{ rule: string; why: string }> } {
  const mapped: MappedRule[] = [];
  const notMapped: Array<{ rule: string; why: string }> = [];
  for (const rule of rules) {
    const plan = planOf(rule);
    if (plan.status !== 'ready') continue;
    const at: [number, number] = [plan.params.findIndex((p) => p.name === inputs[0]), plan.params.findIndex((p) => p.name === inputs[1])];
    if (at[0] < 0 && at[1] < 0) continue;
    const costly = costlyStep(plan);
    if (costly) notMapped.push({ rule: rule.id, why: costly });
    else mapped.push({ rule, plan, at, relations: relationsOf(plan) });
  }
  return { mapped, notMapped };
}
