// The checker: every rule against every structure it applies to. Evaluates the rule's quantity at
// nominal or over the tolerance corners, compares it with the limit, and keeps the derivation.
// Pure: the same handbook gives the same results, in the same order.
import type { Param, Rule, Structure, Handbook, Comparison, Selector, Waiver } from '../model/types.ts';
import { isCalendarDate } from '../model/calendar.ts';
import { QUANTITIES } from '../engines/index.ts';
import type { Figure, QuantityDef } from '../engines/quantity.ts';
import { buildPlan, runPlan, shapeOf, type Plan } from './plan.ts';
import { comparable, costlyStep, declaredSweep, leversOf, meets, meetsAll, type SweepCurve, type Lever, type PlanRelation, type Point, type ReadyPlan } from './excursions.ts';
import { structureRelations } from '../model/relations.ts';
import { mappedRules, mapWindow, windowAxis, type ProcessWindow } from './windows.ts';

export type { ProcessWindow } from './windows.ts';

export type { Lever, SweepCurve } from './excursions.ts';
import { MODES, type ModeContext, type ModeOutcome, type ModeResult } from './modes.ts';

export type { CornerNote, FailureEstimate, ModeResult } from './modes.ts';

/** `waived`: a failure an unexpired waiver of the handbook excuses (see `Verdict.waiver`). */
export type Status = 'pass' | 'fail' | 'waived' | 'incomplete' | 'not-applicable';

/** The waiver a `waived` verdict stands on (or, on a `fail`, the one that no longer holds). */
export interface WaiverRef {
  id: string;
  reason: string;
  owner: string;
  approvedBy: string;
  /** Last day the waiver holds, `YYYY-MM-DD` (a calendar date, read as UTC). */
  expires: string;
  file: string;
  line: number;
  column: number;
  /** The limit the waived value must still meet, in the verdict's SI unit (the rule's comparison). */
  stillWithin?: { comparison: Comparison; limit: number };
  /** Why it does not waive this failure (expired, or the value is beyond the limit it must still meet). */
  lapsed?: Lapse;
}

export type Lapse = 'expired' | 'beyond-floor';

/** What became of one waiver on the evaluation date. */
export interface WaiverUse {
  id: string;
  rule: string;
  expires: string;
  /** The evaluation date is after `expires`. */
  expired: boolean;
  /** Structures whose failure of `rule` it waives. */
  waives: string[];
  /** Failures it selects but no longer excuses, and no other waiver does: they count again. */
  lapsed: Array<{ structure: string; lapsed: Lapse }>;
  /** It selects no failing verdict (left over after a fix, or a selector that misses). */
  unused: boolean;
  /** `expired` when past its date; otherwise `unused` when it selects no failure; else `active`. */
  state: 'active' | 'expired' | 'unused';
}

/** One input as it entered the evaluation. */
export interface TraceInput {
  name: string;
  value: number;
  unit: string;
  written: string;
  low?: number;
  high?: number;
  /** At the deciding corner, which end of the tolerance was used. */
  side?: 'low' | 'high' | 'nominal';
  origin: Param['origin'];
}

/** One computed quantity in the derivation. */
export interface TraceStep {
  name: string;
  title: string;
  unit: string;
  symbol: string;
  formula: string;
  label?: string;
  source: string;
  value: number | null;
  reason?: string;
  /** How the value was reached (which case of the model applied). */
  note?: string;
  /** Figure data for the report. */
  figure?: Figure;
  /** Argument name → (symbol, value) actually used. */
  /** `null` where the input is a step that has no value. */
  args: Array<{ arg: string; symbol: string; from: string; value: number | null }>;
  /** Validity notes raised for these inputs. */
  warnings: string[];
}

export interface Trace {
  inputs: TraceInput[];
  steps: TraceStep[];
}

export interface Verdict {
  rule: string;
  structure: string;
  status: Status;
  severity: Rule['severity'];
  quantity: string;
  unit: string;
  /** The deciding limit: the rule's only one, or of a window's two the side the value comes closest to failing. */
  comparison: Comparison;
  limit: number;
  /** Both limits of a rule that gives a window (`at_least` first); absent for a one-sided rule. */
  sides?: Array<{ comparison: Comparison; limit: number }>;
  /** The deciding value (nominal, or the worst corner); null when it has none. */
  value: number | null;
  /** Why the value is null, or why the verdict is not-applicable. */
  reason?: string;
  unbounded?: 'above' | 'below';
  /** The value at nominal, when the verdict is decided elsewhere (the worst corner). */
  nominal?: number | null;
  margin: number | null;
  evaluateAt: Rule['evaluateAt'];
  /** What the evaluation mode found (absent when the verdict was not evaluated). */
  mode?: ModeResult;
  /** With details: every input ranked by how much it moves the value, with the values that would pass. */
  levers?: Lever[];
  /** With details, why the levers were not worked out (a step too costly to run hundreds of times). */
  leversNotComputed?: string;
  /** With details: the charts the quantity's declaration asks for (its `sweep`, then its `extraSweep`). */
  sweeps?: Array<SweepCurve | null>;
  /** With details, for a rule that names two inputs to `map`: where in their plane it passes. */
  window?: ProcessWindow;
  /** Why a rule's map was not drawn for this structure (it lacks an input, or the plan reads neither). */
  windowNotMapped?: string;
  missing?: string[];
  /** For `waived`: the waiver. For a `fail` whose waiver lapsed: that waiver, with `lapsed`. */
  waiver?: WaiverRef;
  trace?: Trace;
}

export interface Results {
  verdicts: Verdict[];
  counts: Record<Status, number>;
  /** Blocking rules that fail (a waived verdict is not a failure; a lapsed waiver's is). */
  blockingFailures: number;
  /** The date waivers were judged on, `YYYY-MM-DD`. */
  on: string;
  /** Every waiver of the handbook, by id, with what it did on that date. */
  waivers: WaiverUse[];
  /** With details: each structure's process window (`process_window:`), by structure id. */
  windows?: Record<string, ProcessWindow>;
}

/** Whether a rule, or a waiver, selects a structure. */
export function appliesTo(item: { appliesTo: Selector }, s: Structure): boolean {
  const a = item.appliesTo;
  if (a.kinds && !a.kinds.includes(s.kind)) return false;
  if (a.tags && !a.tags.some((t) => s.tags.includes(t))) return false;
  if (a.structures && !a.structures.includes(s.id)) return false;
  return true;
}

/** Signed relative margin: positive passes. A zero limit has no relative margin. */
export function margin(value: number, limit: number, comparison: Comparison): number | null {
  if (limit === 0) return null;
  const scale = Math.abs(limit);
  return comparison === 'at_least' ? (value - limit) / scale : (limit - value) / scale;
}

/** The validity ranges a step's arguments leave (a `holds` check needs every argument known). */
function validityWarnings(def: QuantityDef, args: Array<{ arg: string; value: number | null }>): string[] {
  const warnings: string[] = [];
  const known = Object.fromEntries(args.filter((a) => a.value !== null).map((a) => [a.arg, a.value as number]));
  for (const check of def.validity ?? []) {
    if ('holds' in check) {
      if (args.every((a) => a.value !== null) && !check.holds(known)) warnings.push(check.why);
      continue;
    }
    const v = known[check.arg];
    if (v === undefined) continue;
    if ((check.min !== undefined && v < check.min) || (check.max !== undefined && v > check.max)) warnings.push(check.why);
  }
  return warnings;
}

/** Every step's validity warnings at these inputs, once each, in step order. */
function planWarnings(plan: ReadyPlan, inputs: ArrayLike<number>, run: ReturnType<typeof runPlan>): string[] {
  const all = plan.steps.flatMap((s) =>
    validityWarnings(
      s.def,
      s.args.map(([arg, src]) => ({ arg, value: 'param' in src ? inputs[src.param]! : (run.values[src.step] ?? null) })),
    ),
  );
  return [...new Set(all)];
}

function traceOf(plan: ReadyPlan, point: Point): Trace {
  const run = runPlan(plan, point.inputs);
  const inputs: TraceInput[] = plan.params.map((p, i) => ({
    name: p.name,
    value: point.inputs[i]!,
    unit: p.unit,
    written: p.written,
    ...(p.low !== undefined ? { low: p.low, high: p.high } : {}),
    side: point.sides[i],
    origin: p.origin,
  }));
  const steps: TraceStep[] = plan.steps.map((s, i) => {
    const args = s.args.map(([arg, src]) => {
      const from = 'param' in src ? plan.params[src.param]!.name : plan.steps[src.step]!.def.name;
      const value = 'param' in src ? point.inputs[src.param]! : (run.values[src.step] ?? null);
      return { arg, symbol: s.variant.symbols?.[arg] ?? arg, from, value };
    });
    const warnings = validityWarnings(s.def, args);
    const value = run.values[i] ?? null;
    return {
      name: s.def.name,
      title: s.def.title,
      unit: s.def.unit,
      symbol: s.def.symbol,
      formula: s.variant.formula,
      ...(s.variant.label ? { label: s.variant.label } : {}),
      source: s.def.source,
      value,
      ...(value === null && run.reasons[i] ? { reason: run.reasons[i] } : {}),
      ...(run.notes[i] ? { note: run.notes[i] } : {}),
      ...(run.figures[i] ? { figure: run.figures[i] } : {}),
      args,
      warnings,
    };
  });
  return { inputs, steps };
}

interface Evaluated extends ModeOutcome {
  trace: Trace;
}

/**
 * Plans are per structure and quantity, and evaluations per structure, quantity, mode and what
 * the mode reads of the rule: rules that share a quantity (one at_least, one at_most, or the same
 * limit checked at several severities) share the nominal run, the corner sweep and its trace.
 */
export class PlanCache {
  private readonly plans = new Map<Structure, Map<string, Plan>>();
  private readonly evaluations = new Map<Structure, Map<string, Evaluated>>();
  constructor(readonly context: ModeContext = { detail: false }) {}
  get(s: Structure, quantity: string, film?: string): Plan {
    let byQ = this.plans.get(s);
    if (!byQ) this.plans.set(s, (byQ = new Map()));
    const key = film === undefined ? quantity : `${quantity}[${film}]`;
    let plan = byQ.get(key);
    if (!plan) byQ.set(key, (plan = buildPlan(s, quantity, film)));
    return plan;
  }
  evaluate(s: Structure, plan: ReadyPlan, rule: Rule): Evaluated {
    let byKey = this.evaluations.get(s);
    if (!byKey) this.evaluations.set(s, (byKey = new Map()));
    const mode = MODES[rule.evaluateAt];
    const key = `${plan.quantity}[${plan.film ?? ''}]|${mode.id}|${mode.key(rule)}`;
    let e = byKey.get(key);
    if (!e) {
      const r = mode.evaluate(plan, rule, s, this.context);
      e = { ...r, trace: traceOf(plan, r.decisive) };
      byKey.set(key, e);
    }
    return e;
  }
}

/** The structure's relations between inputs, over the plan's inputs (others fixed at their value). */
function planRelations(plan: ReadyPlan, s: Structure): PlanRelation[] {
  const index = new Map(plan.params.map((p, i) => [p.name, i]));
  return structureRelations(s.drying?.supportCount ?? 0).flatMap((r): PlanRelation[] => {
    if (!r.reads.some((n) => index.has(n)) || !r.reads.every((n) => index.has(n) || s.params.has(n))) return [];
    return [{ reads: r.reads.map((n) => (index.has(n) ? { index: index.get(n)! } : { value: s.params.get(n)!.value })), holds: r.holds }];
  });
}

/** A rule's own process window on a structure, or why there is none. */
function ruleWindow(rule: Rule, inputs: [string, string], s: Structure, plan: ReadyPlan): Pick<Verdict, 'window' | 'windowNotMapped'> {
  const missing = inputs.filter((n) => !s.params.has(n));
  if (missing.length) return { windowNotMapped: `${s.id} has no ${missing.join(' or ')}` };
  const { mapped, notMapped } = mappedRules([rule], inputs, () => plan, (p) => planRelations(p, s));
  if (notMapped.length) return { windowNotMapped: notMapped[0]!.why };
  if (mapped.length === 0) return { windowNotMapped: `${rule.quantity} reads neither ${inputs[0]} nor ${inputs[1]} here` };
  return { window: mapWindow(mapped, [windowAxis(s.params.get(inputs[0])!), windowAxis(s.params.get(inputs[1])!)]) };
}

/**
 * A structure's process window (`process_window:`): every blocking rule that applies and reads one
 * of the two inputs, at once. Rules that read neither are the same everywhere in the plane.
 */
export function structureWindow(h: Pick<Handbook, 'rules'>, s: Structure, plans: PlanCache): ProcessWindow | undefined {
  if (!s.processWindow) return undefined;
  const inputs = s.processWindow;
  const rules = h.rules.filter((r) => r.severity === 'blocking' && appliesTo(r, s));
  const { mapped, notMapped } = mappedRules(rules, inputs, (r) => plans.get(s, r.quantity, r.film), (p) => planRelations(p, s));
  return mapWindow(mapped, [windowAxis(s.params.get(inputs[0])!), windowAxis(s.params.get(inputs[1])!)], notMapped);
}

export function evaluateRule(rule: Rule, s: Structure, plans: PlanCache): Verdict {
  const unit = QUANTITIES.get(rule.quantity)?.unit ?? '1';
  const verdict = (status: Status, reason?: string, missing?: string[]): Verdict => ({
    rule: rule.id,
    structure: s.id,
    status,
    severity: rule.severity,
    quantity: rule.quantity,
    unit,
    comparison: rule.sides[0]!.comparison,
    limit: rule.sides[0]!.limit,
    ...(rule.sides.length > 1 ? { sides: rule.sides.map(({ comparison, limit }) => ({ comparison, limit })) } : {}),
    value: null,
    ...(reason !== undefined ? { reason } : {}),
    margin: null,
    evaluateAt: rule.evaluateAt,
    ...(missing ? { missing } : {}),
  });
  if (!appliesTo(rule, s)) return verdict('not-applicable', 'outside the scope the rule applies to');
  const plan = plans.get(s, rule.quantity, rule.film);
  if (plan.status === 'not-applicable') return verdict('not-applicable', plan.reason);
  if (plan.status === 'incomplete') return verdict('incomplete', `missing input${plan.missing.length > 1 ? 's' : ''}: ${plan.missing.join(', ')}`, plan.missing);
  const refusal = MODES[rule.evaluateAt].refuse?.(plan);
  if (refusal !== undefined) return verdict('incomplete', refusal, []);

  const e = plans.evaluate(s, plan, rule);
  const d = e.decisive;
  const pass = e.pass ?? meetsAll(comparable(d), rule.sides);
  const side = rule.sides[e.side]!;
  const elsewhere = d !== e.nominal;
  const costly = plans.context.detail ? costlyStep(plan) : undefined;
  const levers = plans.context.detail && !costly ? leversOf(plan, e.nominal, d, rule.sides, planRelations(plan, s)) : undefined;
  const decided = new Map(plan.params.map((p, i) => [p.name, d.inputs[i]!]));
  const sweeps =
    plans.context.detail && d.value !== null
      ? [false, true].map((extra) => declaredSweep(rule.quantity, (name) => plans.get(s, name, rule.film), decided, d.value!, s, rule.film, extra))
      : undefined;
  // One literal of fixed shape: absent facts are left undefined (and dropped from JSON).
  return {
    rule: rule.id,
    structure: s.id,
    status: pass ? 'pass' : 'fail',
    severity: rule.severity,
    quantity: rule.quantity,
    unit,
    comparison: side.comparison,
    limit: side.limit,
    sides: rule.sides.length > 1 ? rule.sides.map(({ comparison, limit }) => ({ comparison, limit })) : undefined,
    value: d.value,
    reason: d.value === null ? (d.reason ?? 'no value') : undefined,
    unbounded: d.unbounded,
    nominal: elsewhere ? e.nominal.value : undefined,
    margin: d.value === null ? null : margin(d.value, side.limit, side.comparison),
    evaluateAt: rule.evaluateAt,
    mode: e.result,
    levers,
    leversNotComputed: costly,
    sweeps: sweeps?.some((x) => x !== null) ? sweeps : undefined,
    ...(plans.context.detail && rule.map ? ruleWindow(rule, rule.map, s, plan) : {}),
    waiver: undefined,
    trace: e.trace,
  };
}

const STATUS_ORDER: Status[] = ['fail', 'waived', 'incomplete', 'pass', 'not-applicable'];

export interface EvaluateOptions {
  /** The evaluation date, `YYYY-MM-DD` (UTC): a waiver holds on and before its `expires`. The
   * checker reads no clock; the command says which day it is. */
  on: string;
  /** Work out each verdict's details: probability of failure, sensitivities, passing values (slower). */
  detail?: boolean;
}

/** Every rule on every structure, then the handbook's waivers on the failures, as of `options.on`. */
export function evaluateHandbook(h: Handbook, options: EvaluateOptions): Results {
  const plans = new PlanCache({ detail: options.detail ?? false });
  const evaluated: Verdict[] = [];
  for (const rule of h.rules) for (const s of h.structures) evaluated.push(evaluateRule(rule, s, plans));
  const { verdicts, waivers } = applyWaivers(evaluated, h, options.on);
  const counts = Object.fromEntries(STATUS_ORDER.map((k) => [k, 0])) as Record<Status, number>;
  let blockingFailures = 0;
  for (const v of verdicts) {
    counts[v.status]++;
    if (v.status === 'fail' && v.severity === 'blocking') blockingFailures++;
  }
  const windows = options.detail ? Object.fromEntries(h.structures.flatMap((s) => { const w = structureWindow(h, s, plans); return w ? [[s.id, w] as const] : []; })) : undefined;
  return { verdicts, counts, blockingFailures, on: options.on, waivers, ...(windows && Object.keys(windows).length ? { windows } : {}) };
}

/** Why a waiver does not excuse a failure on `on`, or undefined when it does (history re-judges
 * cached verdicts with this too, so there is one rule for expiry and floors). */
export function lapseOf(w: Pick<Waiver, 'expires' | 'stillWithin'>, v: Pick<Verdict, 'value' | 'unbounded'>, on: string): Lapse | undefined {
  // Dates in one fixed form compare as text; `expires` is the last day the waiver holds.
  if (on > w.expires) return 'expired';
  const floor = w.stillWithin;
  if (floor) {
    // An unbounded value compares as ±∞; a failure with no value at all cannot be shown to be
    // within the floor, so it is beyond it.
    const value = v.value ?? (v.unbounded === 'above' ? Infinity : v.unbounded === 'below' ? -Infinity : NaN);
    if (!meets(value, floor.limit, floor.comparison)) return 'beyond-floor';
  }
  return undefined;
}

function waiverRef(w: Waiver, lapsed?: Lapse): WaiverRef {
  return {
    id: w.id,
    reason: w.reason,
    owner: w.owner,
    approvedBy: w.approvedBy,
    expires: w.expires,
    file: w.pos.file,
    line: w.pos.line,
    column: w.pos.column,
    ...(w.stillWithin ? { stillWithin: { comparison: w.stillWithin.comparison, limit: w.stillWithin.limit } } : {}),
    ...(lapsed ? { lapsed } : {}),
  };
}

/**
 * The handbook's waivers applied to evaluated verdicts, as of `on` (`YYYY-MM-DD`). Only a `fail`
 * changes: to `waived` when a waiver selecting its rule and structure holds (on or before its
 * expiry, the value within its still_within); otherwise it stays `fail` and names the waiver that
 * lapsed. Of several waivers for one failure the first by id that holds is used. Pure: the
 * verdicts given are not changed.
 */
export function applyWaivers(verdicts: Verdict[], h: Pick<Handbook, 'waivers' | 'structures'>, on: string): { verdicts: Verdict[]; waivers: WaiverUse[] } {
  if (!isCalendarDate(on)) throw new Error(`evaluation date ${JSON.stringify(on)} is not a calendar date YYYY-MM-DD (the caller must check it)`);
  const structureById = new Map(h.structures.map((s) => [s.id, s]));
  const waivers = [...h.waivers].sort((a, b) => (a.id < b.id ? -1 : a.id > b.id ? 1 : 0));
  const uses = new Map<string, WaiverUse & { selects: number }>(
    waivers.map((w) => [w.id, { id: w.id, rule: w.rule, expires: w.expires, expired: on > w.expires, waives: [], lapsed: [], unused: true, state: 'active', selects: 0 }]),
  );
  const out = verdicts.map((v): Verdict => {
    if (v.status !== 'fail') return v;
    const s = structureById.get(v.structure);
    const candidates = s ? waivers.filter((w) => w.rule === v.rule && appliesTo(w, s)) : [];
    let firstLapse: { w: Waiver; lapse: Lapse } | undefined;
    for (const w of candidates) {
      uses.get(w.id)!.selects++;
      const lapse = lapseOf(w, v, on);
      if (lapse === undefined) {
        uses.get(w.id)!.waives.push(v.structure);
        return { ...v, status: 'waived', waiver: waiverRef(w) };
      }
      firstLapse ??= { w, lapse };
    }
    if (!firstLapse) return v;
    // No waiver holds: the failure counts, and says which waiver no longer excuses it.
    uses.get(firstLapse.w.id)!.lapsed.push({ structure: v.structure, lapsed: firstLapse.lapse });
    return { ...v, waiver: waiverRef(firstLapse.w, firstLapse.lapse) };
  });
  const list = [...uses.values()].map(({ selects, ...u }): WaiverUse => {
    const unused = selects === 0;
    return { ...u, unused, state: u.expired ? 'expired' : unused ? 'unused' : 'active' };
  });
  return { verdicts: out, waivers: list };
}

export interface StructureQuantity {
  value: number | null;
  unit: string;
  reason?: string;
  unbounded?: 'above' | 'below';
  /** How the value was reached, when the engine says (e.g. which span governs). */
  note?: string;
  /** Validity ranges the value or the steps it rests on leave (the value is still computed). */
  outside_validity?: string[];
}

/** Every quantity the engines can compute for a structure, at nominal; and what blocks the others. */
export function evaluateStructure(s: Structure, plans: PlanCache = new PlanCache()): {
  quantities: Record<string, StructureQuantity>;
  incomplete: Record<string, string[]>;
} {
  const quantities: Record<string, StructureQuantity> = {};
  const incomplete: Record<string, string[]> = {};
  const listed: Array<[string, string, string | undefined]> = [];
  for (const name of [...QUANTITIES.keys()].sort()) {
    const steps = QUANTITIES.get(name)!.steps?.(shapeOf(s)) ?? [];
    if (steps.length > 1) for (const film of steps) listed.push([`${name}[${film}]`, name, film]);
    else listed.push([name, name, steps[0]]);
  }
  for (const [key, name, film] of listed) {
    const plan = plans.get(s, name, film);
    if (plan.status === 'incomplete') incomplete[key] = plan.missing;
    if (plan.status !== 'ready') continue;
    const inputs = plan.params.map((p) => p.value);
    const run = runPlan(plan, inputs);
    const last = plan.steps.length - 1;
    const value = run.values[last] ?? null;
    const unit = QUANTITIES.get(name)!.unit;
    const warnings = planWarnings(plan, inputs, run);
    quantities[key] = {
      ...(value === null
        ? { value: null, unit, reason: run.reasons[last] ?? 'no value', ...(run.unbounded[last] ? { unbounded: run.unbounded[last] } : {}) }
        : { value, unit, ...(run.notes[last] ? { note: run.notes[last] } : {}) }),
      ...(warnings.length ? { outside_validity: warnings } : {}),
    };
  }
  return { quantities, incomplete };
}
