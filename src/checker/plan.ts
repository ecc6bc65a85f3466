// A plan is a quantity compiled for one structure: the leaf inputs it reads (in a fixed order) and
// the steps that compute it from them, in dependency order. Plans are built once per structure and
// quantity; running one is a loop over plain numbers, so corners and sampling stay cheap.
import { QUANTITIES } from '../engines/index.ts';
import type { Figure, Outcome, QuantityDef, Shape, Variant } from '../engines/quantity.ts';
import type { Param, Structure } from '../model/types.ts';

export type ArgSource = { param: number } | { step: number };

export interface Step {
  def: QuantityDef;
  variant: Variant;
  /** Argument name → where its value comes from. */
  args: Array<[string, ArgSource]>;
}

export type Plan =
  | { status: 'ready'; quantity: string; film?: string; params: Param[]; steps: Step[] }
  | { status: 'incomplete'; quantity: string; missing: string[] }
  | { status: 'not-applicable'; quantity: string; reason: string };

/** Values of every step of one run; `null` where a step has no value, with the reason. */
export interface Run {
  values: Array<number | null>;
  reasons: Array<string | undefined>;
  /** Direction a null step is unbounded in, when it is. */
  unbounded: Array<'above' | 'below' | undefined>;
  /** How a step's value was reached, when its engine says. */
  notes: Array<string | undefined>;
  /** Figure data a step hands to the report. */
  figures: Array<Figure | undefined>;
}

/** The shape facts of a structure that quantities branch on. */
/**
 * A structure's shape facts: everything but its identity, inputs and place, so a new shape fact
 * reaches the engines without being listed here.
 */
export function shapeOf(structure: Structure, film?: string): Shape {
  const { id: _id, title: _title, tags: _tags, description: _description, params: _params, materialRoles: _roles, correlations: _correlations, processWindow: _window, file: _file, pos: _pos, ...facts } = structure;
  return { ...facts, ...(film !== undefined ? { film } : {}) };
}

export function buildPlan(structure: Structure, quantity: string, film?: string): Plan {
  const params: Param[] = [];
  const paramIndex = new Map<string, number>();
  const steps: Step[] = [];
  const stepIndex = new Map<string, number>();
  const missing = new Set<string>();
  let notApplicable: string | null = null;

  const visit = (name: string, stack: string[]): ArgSource | null => {
    const def = QUANTITIES.get(name);
    if (!def) {
      const p = structure.params.get(name);
      if (!p) {
        missing.add(name);
        return null;
      }
      let i = paramIndex.get(name);
      if (i === undefined) {
        i = params.length;
        params.push(p);
        paramIndex.set(name, i);
      }
      return { param: i };
    }
    const done = stepIndex.get(name);
    if (done !== undefined) return { step: done };
    if (stack.includes(name)) throw new Error(`quantity cycle: ${[...stack, name].join(' → ')}`);
    const v = def.variant(shapeOf(structure, film));
    if ('notApplicable' in v) {
      notApplicable ??= name === quantity ? v.notApplicable : `${name}: ${v.notApplicable}`;
      return null;
    }
    if ('incomplete' in v) {
      v.incomplete.forEach((m) => missing.add(m));
      return null;
    }
    const args: Array<[string, ArgSource]> = [];
    let ok = true;
    for (const [arg, source] of Object.entries(v.inputs)) {
      const s = visit(source, [...stack, name]);
      if (s) args.push([arg, s]);
      else ok = false;
    }
    if (!ok) return null;
    const idx = steps.length;
    steps.push({ def, variant: v, args });
    stepIndex.set(name, idx);
    return { step: idx };
  };

  visit(quantity, []);
  if (notApplicable !== null) return { status: 'not-applicable', quantity, reason: notApplicable };
  if (missing.size > 0) return { status: 'incomplete', quantity, missing: [...missing].sort() };
  return { status: 'ready', quantity, ...(film !== undefined ? { film } : {}), params, steps };
}

/** Run a ready plan with one value per leaf input. The last step is the target. */
export function runPlan(plan: Extract<Plan, { status: 'ready' }>, inputs: ArrayLike<number>): Run {
  const n = plan.steps.length;
  const values: Array<number | null> = new Array(n);
  const reasons: Array<string | undefined> = new Array(n);
  const unbounded: Array<'above' | 'below' | undefined> = new Array(n);
  const notes: Array<string | undefined> = new Array(n);
  const figures: Array<Figure | undefined> = new Array(n);
  for (let i = 0; i < n; i++) {
    const step = plan.steps[i]!;
    const args: Record<string, number> = {};
    let blocked: string | undefined;
    for (const [arg, src] of step.args) {
      if ('param' in src) args[arg] = inputs[src.param]!;
      else {
        const v = values[src.step];
        if (v === null || v === undefined) {
          blocked = `${plan.steps[src.step]!.def.name} has no value (${reasons[src.step]})`;
          break;
        }
        args[arg] = v;
      }
    }
    if (blocked) {
      values[i] = null;
      reasons[i] = blocked;
      continue;
    }
    const out: Outcome = step.variant.compute(args);
    if (typeof out === 'number') {
      if (Number.isFinite(out)) values[i] = out;
      else {
        // Our own bug if an engine lets a non-finite number out: never let it reach a verdict.
        values[i] = null;
        reasons[i] = `the formula gave a non-finite result (${out}) for these inputs`;
      }
    } else if (out.value !== null) {
      values[i] = Number.isFinite(out.value) ? out.value : null;
      if (values[i] === null) reasons[i] = `the formula gave a non-finite result (${out.value}) for these inputs`;
      notes[i] = out.note;
      figures[i] = out.figure;
    } else {
      values[i] = null;
      reasons[i] = out.reason;
      unbounded[i] = out.unbounded;
    }
  }
  return { values, reasons, unbounded, notes, figures };
}
