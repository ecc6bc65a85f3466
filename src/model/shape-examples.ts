// Example shape facts of every input block, for the methods pages: each quantity's formulas are
// found by asking it for its variant on these shapes. The mapped type makes a new shape fact a
// compile error here until it has examples, so no formula is left unshown.
import { KINDS, type ArrayLayout, type Kind, type ShapeFacts } from './types.ts';

type BlockFacts = Omit<ShapeFacts, 'kind' | 'array'>;

/** For each block: the shape facts it can give, the first being the one every example shape has. */
export const BLOCK_EXAMPLES: { [K in keyof BlockFacts]-?: Array<{ facts: NonNullable<BlockFacts[K]>; label: string; film?: string }> } = {
  drying: [
    { facts: { liquid: 'water', supportCount: 0, supportHold: 'pinned' }, label: 'no supports' },
    { facts: { liquid: 'water', supportCount: 1, supportHold: 'pinned' }, label: 'one pinned support' },
    { facts: { liquid: 'water', supportCount: 1, supportHold: 'clamped' }, label: 'one clamped support' },
  ],
  etch: [
    { facts: { calibrationPoints: 1 }, label: 'calibrated recipe' },
    { facts: { calibrationPoints: 0 }, label: 'recipe with its reaction probability' },
    { facts: { calibrationPoints: 0, ion: { spread: false } }, label: 'ion–neutral synergy' },
    { facts: { calibrationPoints: 0, ion: { spread: true } }, label: 'ion synergy with angular spread' },
  ],
  deposition: [
    { facts: { films: [{ film: 'film', method: 'ald' }] }, film: 'film', label: 'ALD film' },
    { facts: { films: [{ film: 'film', method: 'cvd' }] }, film: 'film', label: 'CVD film' },
    { facts: { films: [{ film: 'film', method: 'pvd' }] }, film: 'film', label: 'PVD film' },
  ],
  fill: [
    { facts: { method: 'conformal' }, label: 'conformal fill' },
    { facts: { method: 'sticking-limited' }, label: 'sticking-limited fill' },
    { facts: { method: 'bottom-up' }, label: 'bottom-up fill' },
  ],
  cell: [
    { facts: { surfaces: ['inner', 'outer', 'bottom'] }, label: 'inner, outer and bottom electrode' },
    { facts: { surfaces: ['outer'] }, label: 'outer electrode only' },
  ],
  via: [{ facts: true, label: 'via block' }],
  isolation: [{ facts: true, label: 'isolation block' }],
  waferOrientation: [
    { facts: '001', label: '(001) wafer' },
    { facts: '111', label: '(111) wafer' },
  ],
};

export interface ExampleShape {
  shape: ShapeFacts & { film?: string };
  kind: Kind;
  array: ArrayLayout;
  /** The block alternative this shape differs from its kind's base shape by, if any. */
  alternative?: string;
}

const ELONGATED: readonly Kind[] = ['trench', 'line'];

/**
 * Per kind and array: a base shape with every block at its first example, then one shape for each
 * other example of each block (the rest at their first).
 */
export function exampleShapes(): ExampleShape[] {
  const blocks = Object.entries(BLOCK_EXAMPLES) as Array<[keyof BlockFacts, Array<{ facts: unknown; label: string; film?: string }>]>;
  const base = Object.fromEntries(blocks.map(([key, examples]) => [key, examples[0]!.facts])) as BlockFacts;
  const baseFilm = blocks.map(([, ex]) => ex[0]!.film).find((f) => f !== undefined);
  const out: ExampleShape[] = [];
  for (const kind of KINDS) {
    const arrays: ArrayLayout[] = ELONGATED.includes(kind) ? ['lines'] : ['square', 'hexagonal'];
    for (const array of arrays) {
      out.push({ kind, array, shape: { kind, array, ...base, ...(baseFilm ? { film: baseFilm } : {}) } });
      for (const [key, examples] of blocks) {
        for (const ex of examples.slice(1)) {
          const film = ex.film ?? baseFilm;
          out.push({ kind, array, alternative: ex.label, shape: { kind, array, ...base, [key]: ex.facts, ...(film ? { film } : {}) } });
        }
      }
    }
  }
  return out;
}
