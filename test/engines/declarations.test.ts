// What every quantity declaration owes the report, over every example shape of the methods pages:
// - each argument of a formula has a TeX symbol, so a derivation never shows a bare input name;
// - a chart sweeps an input the value actually depends on (directly or through the quantities it
//   reads), or the chart would be a flat line;
// - a comparison curve replaces inputs the value reads, constants within the input's range.
import { describe, expect, it } from 'vitest';
import { QUANTITIES } from '../../src/engines/index.ts';
import type { Shape } from '../../src/engines/quantity.ts';
import { GEOMETRY_PARAMS } from '../../src/model/parameters.ts';
import { exampleShapes } from '../../src/model/shape-examples.ts';

/** Every parameter and quantity a quantity reads on a shape, followed through the quantities. */
function reads(name: string, shape: Shape, found = new Set<string>(), visited = new Set<string>()): Set<string> {
  const q = QUANTITIES.get(name);
  if (!q || visited.has(name)) return found;
  visited.add(name);
  const v = q.variant(shape);
  if (!('compute' in v)) return found;
  for (const input of Object.values(v.inputs)) {
    found.add(input);
    reads(input, shape, found, visited);
  }
  return found;
}

// Built inside each test, not when the file loads: mutation testing attributes the engine code a
// test runs to that test, and code run while the file loads to no test at all.
const computable = () =>
  exampleShapes().flatMap(({ shape }) =>
    [...QUANTITIES.values()].flatMap((q) => {
      const v = q.variant(shape);
      return 'compute' in v ? [{ q, v, shape }] : [];
    }),
  );

describe('quantity declarations, over every example shape', () => {
  it('reach a formula on some example shape for every quantity', () => {
    const reached = new Set(computable().map(({ q }) => q.name));
    expect([...QUANTITIES.keys()].filter((n) => !reached.has(n))).toEqual([]);
  });

  it('give every argument of a formula a symbol', () => {
    const bare = computable().flatMap(({ q, v }) => Object.keys(v.inputs).filter((k) => !v.symbols?.[k]).map((k) => `${q.name}: ${k}`));
    expect([...new Set(bare)]).toEqual([]);
  });

  it('sweep charts over an input the value depends on', () => {
    const flat: string[] = [];
    for (const { q, shape } of computable()) {
      for (const sweep of [q.sweep, q.extraSweep]) {
        if (!sweep) continue;
        const input = sweep.input(shape);
        if (!reads(sweep.of ?? q.name, shape).has(input)) flat.push(`${q.name}: ${input}`);
      }
    }
    expect([...new Set(flat)]).toEqual([]);
  });

  it('compare against curves that replace inputs the value reads, constants within range', () => {
    const wrong: string[] = [];
    for (const { q, shape } of computable()) {
      const companion = q.sweep?.companion;
      if (!companion) continue;
      const read = reads(q.name, shape);
      if (Object.keys(companion.replace).length === 0) wrong.push(`${q.name}: a comparison curve that replaces nothing`);
      for (const [input, by] of Object.entries(companion.replace)) {
        if (!read.has(input)) wrong.push(`${q.name}: replaces ${input}, which it does not read`);
        const spec = GEOMETRY_PARAMS[input.replace(/^geometry\./, '') as keyof typeof GEOMETRY_PARAMS];
        if (typeof by === 'number' && spec && !((spec.min ?? -Infinity) < by && by < (spec.max ?? Infinity))) wrong.push(`${q.name}: ${input} = ${by} is out of range`);
      }
    }
    expect([...new Set(wrong)]).toEqual([]);
  });
});
