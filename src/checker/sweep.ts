// A structure's rules across a range of one or two of its inputs (`plumbline sweep`): every rule
// that applies, evaluated in its own mode at each point of a grid, the structure otherwise as written.
import { QUANTITIES } from '../engines/index.ts';
import type { Handbook, Param, Structure } from '../model/types.ts';
import { checkRelation, structureRelations } from '../model/relations.ts';
import { appliesTo, evaluateRule, PlanCache, type Status } from './evaluate.ts';

export interface SweepAxis {
  /** The input's path (`geometry.height`). */
  input: string;
  unit: string;
  from: number;
  to: number;
  /** Points along the axis, ends included. */
  steps: number;
}

export interface SweepPoint {
  /** The value of each swept input at this point, in the order of the axes. */
  at: number[];
  /** Why the point was not evaluated: the structure breaks one of its relations there. */
  invalid?: string;
  verdicts: Array<{ rule: string; status: Status; value: number | null; margin: number | null }>;
}

export interface StructureSweep {
  structure: string;
  axes: SweepAxis[];
  /** The rules that apply to the structure, with the unit of each one's value. */
  rules: Array<{ id: string; quantity: string; unit: string; mode: string }>;
  points: SweepPoint[];
}

/** The structure with `input` moved to `x`: a toleranced input keeps the width of its band around the new value. */
export function withInput(s: Structure, input: string, x: number): Structure {
  const p = s.params.get(input)!;
  const shift = x - p.value;
  const moved: Param = { ...p, value: x, written: `${x} ${p.unit} (swept)`, ...(p.low !== undefined ? { low: p.low + shift, high: p.high! + shift } : {}) };
  const params = new Map(s.params);
  params.set(input, moved);
  // The isotropic stand-in of a material's modulus moves with it.
  const stand = input.replace(/\.(youngs_modulus|poisson_ratio)$/, '.isotropic_$1');
  if (stand !== input && params.get(stand)?.origin === p.origin) params.set(stand, { ...moved, name: stand });
  return { ...s, params };
}

/** Every point of the grid the axes span (the first axis varies slowest). */
function grid(axes: SweepAxis[]): number[][] {
  let points: number[][] = [[]];
  for (const a of axes) {
    const values = Array.from({ length: a.steps }, (_, k) => (a.steps === 1 ? a.from : a.from + ((a.to - a.from) * k) / (a.steps - 1)));
    points = points.flatMap((p) => values.map((v) => [...p, v]));
  }
  return points;
}

/** Evaluate every rule that applies to `s` at each point of the axes' grid. */
export function sweepStructure(h: Pick<Handbook, 'rules'>, s: Structure, axes: SweepAxis[]): StructureSweep {
  const rules = h.rules.filter((r) => appliesTo(r, s));
  const relations = structureRelations(s.drying?.supportCount ?? 0);
  const points = grid(axes).map((at): SweepPoint => {
    const moved = axes.reduce((acc, a, k) => withInput(acc, a.input, at[k]!), s);
    const broken = relations.find((r) => {
      const c = checkRelation(r, moved.params);
      return !c.ok && c.at === 'nominal';
    });
    if (broken) return { at, invalid: broken.expected, verdicts: [] };
    const plans = new PlanCache();
    return {
      at,
      verdicts: rules.map((r) => {
        const v = evaluateRule(r, moved, plans);
        return { rule: r.id, status: v.status, value: v.value, margin: v.margin };
      }),
    };
  });
  return { structure: s.id, axes, rules: rules.map((r) => ({ id: r.id, quantity: r.quantity, unit: QUANTITIES.get(r.quantity)?.unit ?? '1', mode: r.evaluateAt })), points };
}
