// Loading bad handbooks: one fixture folder per kind of bad input under test/fixtures/invalid_*.
// Diagnostics are asserted by code, file, line, column and field (never by sentence). Lines and
// columns are 1-based and were read off the fixture text by hand; the fixture line is quoted beside
// each check.
import { loadHandbookFolder } from '../../src/pipeline.ts';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import type { Diagnostic } from '../../src/diagnostics/diagnostic.ts';

const FIXTURES = fileURLToPath(new URL('../fixtures/', import.meta.url));

function diagnosticsOf(name: string): Diagnostic[] {
  const r = loadHandbookFolder(FIXTURES + name);
  if (r.ok) throw new Error(`${name} loaded without problems`);
  return r.diagnostics;
}

type Where = Pick<Diagnostic, 'code' | 'file' | 'line' | 'column' | 'field'>;
const where = (d: Diagnostic): Where => ({ code: d.code, file: d.file, line: d.line, column: d.column, field: d.field });
const byPlace = (a: Where, b: Where) => a.file.localeCompare(b.file) || a.line - b.line || a.column - b.column;

/** The only diagnostic of a fixture with exactly one problem. */
function single(name: string): Diagnostic {
  const list = diagnosticsOf(name);
  expect(list.map(where)).toHaveLength(1);
  return list[0]!;
}

describe('one kind of bad input per fixture', () => {
  it('YAML syntax errors, one per file, both reported', () => {
    // structures/probe-hole.yaml line 5: "\tcd: 40 nm" (a tab at column 1 in the indentation).
    // rules/probe.yaml line 6: "at_most: 13" (the key at_most a second time, at column 1).
    expect(diagnosticsOf('invalid_yaml_syntax').map(where).sort(byPlace)).toEqual([
      { code: 'yaml-syntax', file: 'rules/probe.yaml', line: 6, column: 1, field: '' },
      { code: 'yaml-syntax', file: 'structures/probe-hole.yaml', line: 5, column: 1, field: '' },
    ]);
  });

  it('unknown field, placed at its key, with the nearest name suggested', () => {
    // line 6: "  hieght: 500 nm" — key at column 3.
    const d = single('invalid_unknown_field');
    expect(where(d)).toEqual({ code: 'unknown-field', file: 'structures/probe-pillar.yaml', line: 6, column: 3, field: 'geometry.hieght' });
    expect(d.suggestions).toContain('height');
  });

  it('missing required field, placed at the mapping that lacks it', () => {
    // No "title:" anywhere; the top-level mapping starts at line 1, column 1 ("id: probe-hole").
    expect(where(single('invalid_missing_field'))).toEqual({ code: 'missing-field', file: 'structures/probe-hole.yaml', line: 1, column: 1, field: 'title' });
  });

  it('wrong type', () => {
    // line 4: "tags: probe" — a text where a list belongs; value at column 7.
    expect(where(single('invalid_wrong_type'))).toEqual({ code: 'wrong-type', file: 'structures/probe-hole.yaml', line: 4, column: 7, field: 'tags' });
  });

  it('unknown kind, with the nearest kind suggested', () => {
    // line 3: "kind: cilinder" — value at column 7.
    const d = single('invalid_unknown_kind');
    expect(where(d)).toEqual({ code: 'unknown-kind', file: 'structures/probe-cylinder.yaml', line: 3, column: 7, field: 'kind' });
    expect(d.suggestions).toContain('cylinder');
  });

  it('duplicate id across two files names both places', () => {
    // rules/b-second.yaml line 8: "- id: PROBE-AR-1" (second rule of the list, id value at column 7);
    // rules/a-first.yaml line 1: "- id: PROBE-AR-1" (first file in name order, column 7).
    const d = single('invalid_duplicate_id');
    expect(d).toMatchObject({ code: 'duplicate-id', file: 'rules/b-second.yaml', line: 8, column: 7 });
    expect(d.other).toEqual({ file: 'rules/a-first.yaml', line: 1, column: 7 });
  });

  it('duplicate id: the field is the path of the id within its file', () => {
    // The Diagnostic contract (src/diagnostics/diagnostic.ts): field is the path within the file,
    // as in "[2].quantity". The repeated id is in the second rule of rules/b-second.yaml: "[1].id".
    expect(single('invalid_duplicate_id').field).toBe('[1].id');
  });

  it('duplicate id within one file points at the second occurrence', () => {
    // rules/probe.yaml line 7: "- id: PROBE-AR-1" (second rule); line 1 holds the first.
    const d = single('invalid_duplicate_id_same_file');
    expect(d).toMatchObject({ code: 'duplicate-id', file: 'rules/probe.yaml', line: 7, column: 7 });
    expect(d.other).toEqual({ file: 'rules/probe.yaml', line: 1, column: 7 });
  });

  it('id that cannot be a URL', () => {
    // line 1: "- id: Probe AR/1" — value at column 7.
    expect(where(single('invalid_id_not_url_safe'))).toEqual({ code: 'id-not-url-safe', file: 'rules/probe.yaml', line: 1, column: 7, field: '[0].id' });
  });

  it('unit of the wrong dimension, naming the field', () => {
    // line 6: "  depth: 3 fF" — value at column 10.
    expect(where(single('invalid_wrong_dimension'))).toEqual({ code: 'wrong-dimension', file: 'structures/probe-hole.yaml', line: 6, column: 10, field: 'geometry.depth' });
  });

  it('malformed tolerance', () => {
    // line 5: "  cd: 32 nm ± x" — value at column 7.
    expect(where(single('invalid_malformed_tolerance'))).toEqual({ code: 'malformed-tolerance', file: 'structures/probe-hole.yaml', line: 5, column: 7, field: 'geometry.cd' });
  });

  it('quantity no engine provides, with the nearest name suggested first', () => {
    // line 4: "  quantity: geometry.aspect_ration" — value at column 13.
    const d = single('invalid_unknown_quantity');
    expect(where(d)).toEqual({ code: 'unknown-quantity', file: 'rules/probe.yaml', line: 4, column: 13, field: '[0].quantity' });
    expect(d.suggestions?.[0]).toBe('geometry.aspect_ratio');
  });

  it('unknown material, with the nearest material suggested', () => {
    // line 9: "  fill: tungstem" — value at column 9.
    const d = single('invalid_unknown_material');
    expect(where(d)).toEqual({ code: 'unknown-material', file: 'structures/probe-hole.yaml', line: 9, column: 9, field: 'materials.fill' });
    expect(d.suggestions).toContain('tungsten');
  });

  it('a folder with no structures/ or rules/ is no handbook', () => {
    expect(diagnosticsOf('standalone').map((d) => d.code)).toEqual(['no-handbook']);
  });
});

describe('all problems of a run are reported together', () => {
  it('reports every problem of several files in one run', () => {
    expect(diagnosticsOf('invalid_many_problems').map(where).sort(byPlace)).toEqual([
      // line 4: "  quantity: geometry.aspect_ration"
      { code: 'unknown-quantity', file: 'rules/broken.yaml', line: 4, column: 13, field: '[0].quantity' },
      // line 11: "  at_least: 5 fF" — a capacitance as the limit of a length quantity
      { code: 'wrong-dimension', file: 'rules/broken.yaml', line: 11, column: 13, field: '[1].at_least' },
      // line 6: "  depth: 3 fF"
      { code: 'wrong-dimension', file: 'structures/alpha-hole.yaml', line: 6, column: 10, field: 'geometry.depth' },
      // line 7: "  pitch: 90 nm ± x"
      { code: 'malformed-tolerance', file: 'structures/alpha-hole.yaml', line: 7, column: 10, field: 'geometry.pitch' },
      // line 8: "  body: silicone"
      { code: 'unknown-material', file: 'structures/beta-trench.yaml', line: 8, column: 9, field: 'materials.body' },
    ]);
  });

  it('reports a schema problem and a unit problem of the same file together', () => {
    expect(diagnosticsOf('invalid_mixed_phases').map(where).sort(byPlace)).toEqual([
      // line 4: "colour: blue" — key at column 1
      { code: 'unknown-field', file: 'structures/probe-hole.yaml', line: 4, column: 1, field: 'colour' },
      // line 7: "  depth: 3 fF" — value at column 10
      { code: 'wrong-dimension', file: 'structures/probe-hole.yaml', line: 7, column: 10, field: 'geometry.depth' },
    ]);
  });
});

describe('a clean fixture', () => {
  it('loads ok_small with its structures, rules and positions', () => {
    const r = loadHandbookFolder(FIXTURES + 'ok_small');
    if (!r.ok) throw new Error(JSON.stringify(r.diagnostics));
    const h = r.handbook;
    expect(h.meta.title).toBe('Fixture handbook, all rules pass');
    expect(h.structures.map((s) => s.id)).toEqual(['probe-hole', 'probe-pillar']);
    expect(h.rules.map((x) => x.id)).toEqual(['PROBE-AR-1', 'PROBE-BOTTOM-1', 'PROBE-SPACE-1']);
    const cd = h.structures[0]!.params.get('geometry.cd')!;
    // line 6: "  cd: 40 nm ± 2 nm" → 40e-9 m in [38e-9, 42e-9], written at 6:7.
    expect([cd.value, cd.low, cd.high]).toEqual([40e-9, 38e-9, 42e-9]);
    expect(cd.origin).toEqual({ type: 'handbook', pos: { file: 'structures/probe-hole.yaml', line: 6, column: 7 } });
    // The pillar overrides its body's modulus inline: "body: { material: silicon, youngs_modulus: 160 GPa }".
    const e = h.structures[1]!.params.get('materials.body.youngs_modulus')!;
    expect(e.value).toBe(160e9);
    expect(e.origin.type).toBe('handbook');
    // A single-mapping rule file: "at_least: 25 nm" in rules/single.yaml.
    expect(h.rules.find((x) => x.id === 'PROBE-BOTTOM-1')?.sides).toEqual([{ comparison: 'at_least', limit: 25e-9, written: '25 nm' }]);
  });
});
