// Shared test helpers: relative comparison, degrees, and Structure/Rule builders that bypass YAML
// so engine and checker tests state their inputs directly in SI.
import { expect } from 'vitest';
import type { ArrayLayout, Comparison, Kind, Param, Rule, Structure } from '../src/model/types.ts';
import { QUANTITIES } from '../src/engines/index.ts';
import type { Variant } from '../src/engines/quantity.ts';
import { shapeOf } from '../src/checker/plan.ts';
import type { CornerNote, Verdict } from '../src/checker/evaluate.ts';

/** Assert `actual` equals `expected` to `digits` significant decimal places, relatively. */
export function expectRel(actual: number | null | undefined, expected: number, digits = 9): void {
  expect(actual).not.toBeNull();
  expect(actual).toBeTypeOf('number');
  if (expected === 0) {
    expect(actual as number).toBeCloseTo(0, digits);
    return;
  }
  expect((actual as number) / expected).toBeCloseTo(1, digits);
}

export const deg = (d: number): number => (d * Math.PI) / 180;
export const nm = 1e-9;
export const um = 1e-6;

/** A value, or [value, low, high] for a toleranced one. */
export type P = number | [number, number, number];

const POS = { file: 'test', line: 1, column: 1 };

/** Build a Structure in SI, geometry keys without the `geometry.` prefix. */
export function makeStructure(
  kind: Kind,
  geometry: Record<string, P>,
  opts: { id?: string; array?: ArrayLayout; tags?: string[]; uniform?: string[]; correlations?: Array<[string, string, number]> } = {},
): Structure {
  const params = new Map<string, Param>();
  for (const [k, v] of Object.entries(geometry)) {
    const name = `geometry.${k}`;
    const unit = k === 'sidewall_angle' ? 'rad' : 'm';
    const [value, low, high] = Array.isArray(v) ? v : [v, undefined, undefined];
    params.set(name, {
      name,
      value,
      ...(low !== undefined ? { low, high } : {}),
      unit,
      written: String(value),
      origin: { type: 'handbook', pos: POS },
      ...(opts.uniform?.includes(k) ? { spread: 'uniform' as const } : {}),
      // The physical range the loader carries from the declarations (GEOMETRY_PARAMS).
      range: unit === 'rad' ? { min: 0, max: Math.PI } : { min: 0 },
    });
  }
  const array = opts.array ?? (kind === 'trench' || kind === 'line' ? 'lines' : undefined);
  return {
    id: opts.id ?? `test-${kind}`,
    title: `test ${kind}`,
    kind,
    ...(array ? { array } : {}),
    tags: opts.tags ?? [],
    params,
    materialRoles: {},
    correlations: (opts.correlations ?? []).map(([a, b, coefficient]) => ({ inputs: [`geometry.${a}`, `geometry.${b}`] as [string, string], coefficient, pos: POS })),
    file: 'test',
    pos: POS,
  };
}

/** A rule in SI: one side from `comparison` and `limit`, or its `sides` as given (a window). */
export function makeRule(r: Partial<Rule> & Pick<Rule, 'quantity'> & ({ comparison: Comparison; limit: number } | { sides: Rule['sides'] })): Rule {
  const { comparison: _c, limit: _l, ...rest } = r as Partial<Rule> & { comparison?: Comparison; limit?: number };
  const sides = 'sides' in r && r.sides ? r.sides : [{ comparison: (r as { comparison: Comparison }).comparison, limit: (r as { limit: number }).limit, written: String((r as { limit: number }).limit) }];
  return {
    id: 'TEST-1',
    title: 'test rule',
    appliesTo: {},
    evaluateAt: 'nominal',
    severity: 'blocking',
    rationale: '',
    references: [],
    file: 'test',
    pos: POS,
    ...rest,
    quantity: r.quantity,
    sides,
  };
}

/**
 * A 10 µm copper via in isotropic silicon (E 120/130 GPa, ν 0.34/0.28, α 16.7/2.6 ppm/K; typical
 * values, [memory]), channels lightly doped (1e15 cm⁻³) at 300 K; `set` adds or replaces an input.
 */
/** Add or replace an input of a structure, in SI, as if the handbook wrote it. */
export function setParam(s: Structure, name: string, v: P): void {
  const [value, low, high] = Array.isArray(v) ? v : [v, undefined, undefined];
  s.params.set(name, { name, value, ...(low !== undefined ? { low, high } : {}), unit: '1', written: String(value), origin: { type: 'handbook', pos: POS } } satisfies Param);
}

export function copperVia(depth: P, dT: P): { s: Structure; set: (name: string, value: P) => void } {
  const s = makeStructure('via', { cd: 10 * um, depth }, { array: 'square' });
  const set = (name: string, v: P) => setParam(s, name, v);
  set('via.conductor_youngs_modulus', 120e9);
  set('via.conductor_poisson_ratio', 0.34);
  set('via.conductor_thermal_expansion', 16.7e-6);
  set('materials.substrate.isotropic_youngs_modulus', 130e9);
  set('materials.substrate.isotropic_poisson_ratio', 0.28);
  set('materials.substrate.thermal_expansion', 2.6e-6);
  set('anneal.temperature_change', dT);
  set('keep_out.channel_doping', 1e21);
  set('keep_out.temperature', 300);
  return { s, set };
}

/** The variant quantity `name` takes for structure `s` (its label, inputs, symbols, formula); throws where it does not apply. */
export function variantOf(name: string, s: Structure): Variant {
  const v = QUANTITIES.get(name)!.variant(shapeOf(s));
  if (!('compute' in v)) throw new Error(`${name} has no variant for ${s.id}: ${JSON.stringify(v)}`);
  return v;
}

/** The deciding corner of a worst-case verdict (undefined for other modes). */
export function worstCornerOf(v: Pick<Verdict, 'mode'>): CornerNote[] | undefined {
  return v.mode?.kind === 'worst-case' ? v.mode.worstCorner : undefined;
}

/** How many tolerance corners a worst-case verdict evaluated (undefined for other modes). */
export function cornersOf(v: Pick<Verdict, 'mode'>): number | undefined {
  return v.mode?.kind === 'worst-case' ? v.mode.corners : undefined;
}
