// Properties of loading: whatever bytes or YAML a handbook holds, the loader answers with its own
// diagnostics (every one at a real place, with a sentence the catalogue can word) and never throws.
import { loadHandbook } from '../../src/pipeline.ts';
import fc from 'fast-check';
import { dump } from 'js-yaml';
import { describe, expect, it } from 'vitest';
import { formatDiagnostic } from '../../src/diagnostics/messages.ts';
import { type LoadResult } from '../../src/model/load.ts';
import { MemorySource } from '../../src/model/memory-source.ts';
import { GEOMETRY_PARAMS, MATERIAL_PROPERTIES } from '../../src/model/parameters.ts';
import { BLOCK_LIST, keysOf } from '../../src/model/blocks.ts';
import { KINDS } from '../../src/model/types.ts';

const RULE = 'id: P-1\ntitle: Probe\napplies_to: { kinds: [hole] }\nquantity: geometry.aspect_ratio\nat_most: 20\n';
const HOLE = 'id: probe\ntitle: Probe\nkind: hole\ngeometry: { cd: 40 nm, depth: 400 nm }\n';
const RUNS = Number(process.env.FC_RUNS ?? 300);

/** Loading never throws, and every diagnostic is placed in a file the run read, at line ≥ 1, column ≥ 1. */
function wellFormed(files: Record<string, string | Uint8Array>): LoadResult {
  const r = loadHandbook(new MemorySource(files));
  const list = r.ok ? r.handbook.warnings : r.diagnostics;
  const lineCount = (path: string) => {
    const f = files[path];
    if (f === undefined) return Infinity;
    return (typeof f === 'string' ? f : new TextDecoder().decode(f)).split(/\r\n|\r|\n/).length;
  };
  for (const d of list) {
    expect(Number.isInteger(d.line) && d.line >= 1, formatDiagnostic(d)).toBe(true);
    expect(Number.isInteger(d.column) && d.column >= 1, formatDiagnostic(d)).toBe(true);
    expect(d.line, formatDiagnostic(d)).toBeLessThanOrEqual(lineCount(d.file));
    expect(formatDiagnostic(d).length).toBeLessThan(800);
  }
  return r;
}

describe('the loader on arbitrary input', () => {
  it('arbitrary bytes as a structure file', () => {
    fc.assert(fc.property(fc.uint8Array({ maxLength: 400 }), (bytes) => void wellFormed({ 'structures/probe.yaml': bytes, 'rules/p.yaml': RULE })), { numRuns: RUNS });
  });

  it('arbitrary text as a rules file and as materials.yaml', () => {
    fc.assert(
      fc.property(fc.string({ maxLength: 300, unit: 'binary' }), fc.string({ maxLength: 300 }), (rules, materials) => void wellFormed({ 'structures/probe.yaml': HOLE, 'rules/p.yaml': rules, 'materials.yaml': materials })),
      { numRuns: RUNS },
    );
  });

  it('arbitrary YAML values in every file', () => {
    const value = fc.jsonValue({ maxDepth: 4 });
    fc.assert(
      fc.property(value, value, value, value, (s, r, m, h) =>
        void wellFormed({ 'structures/probe.yaml': dump(s), 'rules/p.yaml': dump(r), 'materials.yaml': dump(m), 'handbook.yaml': dump(h) }),
      ),
      { numRuns: RUNS },
    );
  });

  it('structures shaped like ours, with values drawn from good and bad spellings', () => {
    const spelled = fc.oneof(
      fc.constantFrom('40 nm', '1.8 um ± 40 nm', '89.7 deg', '-250 degC', '34 nm -1/+2 nm', '5 nm ± 5 nm', '3 fF', '.inf', '1e400 nm', '0', '50%', 'nm', '± 2', '32 nm +/- 5%', '1.9 µΩ·cm', '2e17 /cm^3', '180 deg', '', ' ', '300 degC ± 1%'),
      fc.double(),
      fc.string({ maxLength: 12 }),
      fc.constant(null),
      fc.array(fc.constantFrom('0.9 um', '1.7 um', 'x'), { maxLength: 4 }),
    );
    const block = (keys: string[]) => fc.dictionary(fc.constantFrom(...keys, 'unknown_key'), spelled, { maxKeys: 6 });
    const structure = fc.record(
      {
        id: fc.constantFrom('probe', 'Probe', 'other', 'p'.repeat(80)),
        title: fc.constantFrom('t', ''),
        kind: fc.constantFrom(...KINDS, 'cilinder'),
        geometry: block([...Object.keys(GEOMETRY_PARAMS), 'array']),
        // Every input block, with the keys its declaration accepts.
        ...Object.fromEntries(BLOCK_LIST.map((b) => [b.key, block(keysOf(b))])),
        materials: fc.dictionary(fc.constantFrom('body', 'fill', 'Bad Role'), fc.oneof(fc.constantFrom('silicon', 'copper', 'unobtainium'), block(['material', ...Object.keys(MATERIAL_PROPERTIES)])), { maxKeys: 3 }),
      },
      { requiredKeys: [] },
    );
    fc.assert(fc.property(structure, (s) => void wellFormed({ 'structures/probe.yaml': dump(s), 'rules/p.yaml': RULE })), { numRuns: RUNS });
  });
});
