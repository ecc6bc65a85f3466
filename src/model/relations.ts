// Relations between a structure's inputs that the geometry needs (neighbours must not overlap, a
// wall must leave a hole, supports must stand inside the body). A worst-case verdict moves every
// toleranced input to either end of its range independently, so a relation has to hold at every
// combination of ends, not only at nominal: a support at 1.89 µm ± 60 nm on a 1.9 µm ± 40 nm body
// is above the top at one corner.
import type { Param } from './types.ts';
import { formatValue } from './format.ts';

export interface Relation {
  /** Inputs it reads; a violation is reported at the first. */
  reads: string[];
  /** Where the first input is written (a JSON pointer into its file). */
  pointer: string;
  holds: (v: number[]) => boolean;
  /** What the format wants, worded for the message: "a pitch larger than the CD". */
  expected: string;
}

export type RelationCheck =
  | { ok: true }
  | { ok: false; at: 'nominal' }
  | { ok: false; at: 'tolerance'; corner: Array<{ name: string; side: 'low' | 'high'; value: number }> };

/** Check at nominal, then at every combination of tolerance ends (at most 2^reads corners). */
export function checkRelation(r: Relation, params: ReadonlyMap<string, Param>): RelationCheck {
  const ps = r.reads.map((n) => params.get(n));
  if (ps.some((p) => p === undefined)) return { ok: true }; // an input is absent: nothing to relate
  const list = ps as Param[];
  if (!r.holds(list.map((p) => p.value))) return { ok: false, at: 'nominal' };
  const tol = list.map((p, i) => (p.low !== undefined && p.high !== undefined ? i : -1)).filter((i) => i >= 0);
  for (let mask = 0; mask < 1 << tol.length; mask++) {
    const v = list.map((p) => p.value);
    const sides: Array<'low' | 'high' | undefined> = list.map(() => undefined);
    tol.forEach((i, bit) => {
      const high = (mask >> bit) & 1;
      v[i] = high ? list[i]!.high! : list[i]!.low!;
      sides[i] = high ? 'high' : 'low';
    });
    if (!r.holds(v)) {
      return { ok: false, at: 'tolerance', corner: list.flatMap((p, i) => (sides[i] ? [{ name: p.name, side: sides[i]!, value: v[i]! }] : [])) };
    }
  }
  return { ok: true };
}

/** "geometry.pitch at 50 nm (its low end) and geometry.cd at 52 nm (its high end)". */
export function describeCorner(corner: Extract<RelationCheck, { at: 'tolerance' }>['corner'], unitOf: (name: string) => string): string {
  return corner.map((c) => `${c.name} at ${formatValue(c.value, unitOf(c.name))} (its ${c.side} end)`).join(' and ');
}

/** The relations a structure's geometry and supports must satisfy. */
export function structureRelations(supportCount: number): Relation[] {
  const relations: Relation[] = [
    { reads: ['geometry.pitch', 'geometry.cd'], pointer: '/geometry/pitch', holds: ([pitch, cd]) => pitch! > cd!, expected: 'a pitch larger than the CD (neighbours would overlap)' },
    { reads: ['geometry.wall', 'geometry.cd'], pointer: '/geometry/wall', holds: ([wall, cd]) => 2 * wall! < cd!, expected: 'a wall thinner than half the CD' },
    { reads: ['geometry.wall', 'geometry.height'], pointer: '/geometry/wall', holds: ([wall, h]) => wall! < h!, expected: 'a wall thinner than the cylinder is tall' },
    { reads: ['etch.reference_cd', 'geometry.cd'], pointer: '/etch/reference_cd', holds: ([ref, cd]) => ref! > cd!, expected: 'a reference feature wider than the opening' },
    // Trenches and lines are long: their models (the long-slot transmission, areas per length)
    // assume it, so one shorter than it is wide is refused.
    { reads: ['geometry.length', 'geometry.cd'], pointer: '/geometry/length', holds: ([length, cd]) => length! > cd!, expected: 'a length greater than the width (trench and line models assume a long section)' },
  ];
  for (let i = 1; i <= supportCount; i++) {
    const pointer = `/drying/supports/${i - 1}`;
    if (i > 1) relations.push({ reads: [`drying.support_${i}`, `drying.support_${i - 1}`], pointer, holds: ([a, b]) => a! > b!, expected: 'support heights in rising order' });
    relations.push({ reads: [`drying.support_${i}`, 'geometry.height'], pointer, holds: ([a, h]) => a! <= h!, expected: 'a support height within the structure (at most its height)' });
  }
  return relations;
}
