// Example shapes for the methods pages: each quantity's formulas are found by asking it for its
// variant on these shapes. The examples of each shape fact are declared with the fact in
// blocks.ts, so a new fact has examples before it compiles.
import { SHAPE_FACTS, type BlockFacts } from './blocks.ts';
import { KINDS, type ArrayLayout, type Kind, type ShapeFacts } from './types.ts';

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
  const blocks = Object.entries(SHAPE_FACTS).map(([key, f]) => [key, f.examples]) as Array<[keyof BlockFacts, Array<{ facts: unknown; label: string; film?: string }>]>;
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
