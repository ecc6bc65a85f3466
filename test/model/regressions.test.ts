// Regression tests named after the defects a hostile review of the loader found: values that
// changed meaning or lost their tolerance on the way to an engine, relations checked at nominal
// only, files and ids dropped without a word, and messages that misled. Each failed before its fix.
// Places (line:column) were read off the text written here by hand.
import { loadHandbookFolder } from '../../src/pipeline.ts';
import { cpSync, mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { evaluateHandbook } from '../../src/checker/evaluate.ts';
import type { Diagnostic } from '../../src/diagnostics/diagnostic.ts';
import { formatDiagnostics } from '../../src/diagnostics/messages.ts';

import type { Handbook } from '../../src/model/types.ts';
import { expectRel, worstCornerOf } from '../helpers.ts';

const ROOT = resolve(import.meta.dirname, '../..');
const BASE = join(ROOT, 'test/corpus/_base');

/** The corpus base handbook with some files replaced (null deletes). */
function handbook(files: Record<string, string | Buffer | null>): string {
  const dir = join(mkdtempSync(join(tmpdir(), 'plumbline-regress-')), 'hb');
  cpSync(BASE, dir, { recursive: true });
  for (const [path, text] of Object.entries(files)) {
    rmSync(join(dir, path), { recursive: true, force: true });
    if (text !== null) {
      mkdirSync(join(dir, path, '..'), { recursive: true });
      writeFileSync(join(dir, path), text);
    }
  }
  return dir;
}

/** A base file as text with edits applied; an edit whose text is not there throws, so a test
 * whose edit no longer applies fails instead of quietly testing the unchanged file. */
function base(path: string, ...edits: Array<[string, string]>): string {
  let text = readFileSync(join(BASE, path), 'utf8');
  for (const [from, to] of edits) {
    if (!text.includes(from)) throw new Error(`${path} no longer contains ${JSON.stringify(from)}`);
    text = text.replace(from, to);
  }
  return text;
}

function loaded(dir: string): Handbook {
  const r = loadHandbookFolder(dir);
  if (!r.ok) throw new Error(formatDiagnostics(r.diagnostics));
  return r.handbook;
}

function problems(dir: string): Array<Pick<Diagnostic, 'code' | 'file' | 'line' | 'column' | 'field'>> {
  const r = loadHandbookFolder(dir);
  if (r.ok) throw new Error('loaded without problems');
  return r.diagnostics.map(({ code, file, line, column, field }) => ({ code, file, line, column, field }));
}

describe('offset temperature units (regression: -250 degC was read as +23.15 K)', () => {
  it('refuses a temperature difference in degC, at the field', () => {
    const via = base('structures/via.yaml', ['temperature_change: -250 K', 'temperature_change: -250 degC']);
    // line 13: "anneal: { temperature_change: -250 degC }", the value at column 31.
    expect(problems(handbook({ 'structures/via.yaml': via }))).toEqual([{ code: 'offset-unit', file: 'structures/via.yaml', line: 13, column: 31, field: 'anneal.temperature_change' }]);
  });

  it('refuses degF for a difference too, and reads kelvin as written', () => {
    expect(problems(handbook({ 'structures/via.yaml': base('structures/via.yaml', ['-250 K', '-450 degF']) }))[0]?.code).toBe('offset-unit');
    // −250 K is a change of −250 K (no offset applies to a difference in kelvin).
    expect(loaded(handbook({})).structures.find((s) => s.id === 'via')!.params.get('anneal.temperature_change')!.value).toBe(-250);
  });

  it('converts an absolute temperature in degC with the offset, and its tolerance without it', () => {
    // 0 °C = 273.15 K (definition of the Celsius scale); a tolerance is a difference, so ±5 °C = ±5 K.
    const slot = base('structures/slot.yaml', ['  - film: liner\n    method: cvd', '  - film: liner\n    method: ald\n    exposure: 1 Pa*s\n    molar_mass: 200 g/mol\n    temperature: 280 degC ± 5 degC\n    site_density: 3e18 /m^2'], ['    sticking_probability: 0.0008\n', '']);
    const t = loaded(handbook({ 'structures/slot.yaml': slot })).structures.find((s) => s.id === 'slot')!.params.get('deposition.liner.temperature')!;
    expectRel(t.value, 553.15, 12);
    expectRel(t.low!, 548.15, 12);
    expectRel(t.high!, 558.15, 12);
  });
});

describe('tolerances from materials.yaml are dropped (regression: only the nominal reached the via)', () => {
  it('keeps a handbook material’s tolerance where a via conductor uses it', () => {
    // materials.yaml: bench-copper resistivity "2.0 µΩ·cm ± 0.1" = 2.0e-8 ± 0.1e-8 Ω·m (1 µΩ·cm = 1e-8 Ω·m).
    const p = loaded(handbook({})).structures.find((s) => s.id === 'via')!.params.get('via.conductor_resistivity')!;
    expectRel(p.value, 2.0e-8, 12);
    expectRel(p.low!, 1.9e-8, 12);
    expectRel(p.high!, 2.1e-8, 12);
  });

  it('gives the same worst-case verdict as the same tolerance written inline', () => {
    const fromTable = evaluateHandbook(loaded(handbook({})), { on: '2026-12-02' }).verdicts.find((v) => v.rule === 'VIA-R-1' && v.structure === 'via')!;
    const inline = base('structures/via.yaml', ['conductor: { material: bench-copper }', 'conductor: { material: copper, resistivity: 2.0 µΩ·cm ± 0.1 }']);
    const written = evaluateHandbook(loaded(handbook({ 'structures/via.yaml': inline })), { on: '2026-12-02' }).verdicts.find((v) => v.rule === 'VIA-R-1' && v.structure === 'via')!;
    expect(fromTable.value).not.toBeNull();
    expect(fromTable.value).toBe(written.value);
    expect(worstCornerOf(fromTable)?.map((c) => `${c.name}:${c.side}`)).toContain('via.conductor_resistivity:high');
  });

  it('keeps the tolerance of a liquid’s surface tension and of a dielectric’s permittivity', () => {
    const materials = `${base('materials.yaml')}- id: bench-rinse\n  title: Bench rinse\n  surface_tension: 30 mN/m ± 2 mN/m\n- id: bench-high-k\n  title: Bench high-k\n  dielectric_constant: 38 ± 3\n`;
    const cup = base('structures/cup.yaml', ['liquid: water', 'liquid: bench-rinse']) + 'cell:\n  dielectric: { material: bench-high-k, thickness: 5 nm }\n  electrode_surfaces: [inner, outer]\n';
    const s = loaded(handbook({ 'materials.yaml': materials, 'structures/cup.yaml': cup })).structures.find((x) => x.id === 'cup')!;
    expect([s.params.get('drying.surface_tension')!.low, s.params.get('drying.surface_tension')!.high]).toEqual([0.028, 0.032]);
    expect([s.params.get('cell.dielectric_dielectric_constant')!.low, s.params.get('cell.dielectric_dielectric_constant')!.high]).toEqual([35, 41]);
  });
});

describe('cross-field checks look at nominal values only (regression)', () => {
  it('refuses a support that the tolerances can put above the top', () => {
    // 1.89 µm + 60 nm = 1.95 µm > 1.9 µm − 40 nm = 1.86 µm. Line 17: "  supports: [0.9 um, 1.89 um ± 60 nm]";
    // the second entry starts at column 22.
    const cup = base('structures/cup.yaml', ['supports: [0.9 um, 1.7 um]', 'supports: [0.9 um, 1.89 um ± 60 nm]']);
    expect(problems(handbook({ 'structures/cup.yaml': cup }))).toEqual([{ code: 'relation-at-tolerance', file: 'structures/cup.yaml', line: 17, column: 22, field: 'drying.supports[1]' }]);
  });

  it('refuses a wall that one corner makes thicker than the radius', () => {
    // 2 × (16.5 + 1) nm = 35 nm > 34 − 1.5 = 32.5 nm; nominal 2 × 16.5 = 33 < 34 holds. Line 11, column 9.
    const cup = base('structures/cup.yaml', ['wall: 7 nm ± 0.5 nm', 'wall: 16.5 nm ± 1 nm']);
    expect(problems(handbook({ 'structures/cup.yaml': cup }))).toEqual([{ code: 'relation-at-tolerance', file: 'structures/cup.yaml', line: 11, column: 9, field: 'geometry.wall' }]);
  });

  it('accepts relations that hold at every corner', () => {
    // 1.8 µm + 20 nm = 1.82 µm ≤ 1.86 µm.
    const cup = base('structures/cup.yaml', ['1.7 um]', '1.8 um ± 20 nm]']);
    expect(loaded(handbook({ 'structures/cup.yaml': cup })).structures).toHaveLength(3);
  });
});

describe('duplicate material ids (regression: the second silently replaced the first)', () => {
  it('reports the second entry and names the first', () => {
    const materials = `${base('materials.yaml')}- id: bench-oxide\n  title: Another oxide\n  youngs_modulus: 70 GPa\n`;
    const r = loadHandbookFolder(handbook({ 'materials.yaml': materials }));
    expect(r.ok).toBe(false);
    if (r.ok) return;
    // The base file has two entries on nine lines; the third starts on line 10: "- id: bench-oxide",
    // id value at column 7; the first is on line 1.
    expect(r.diagnostics).toEqual([expect.objectContaining({ code: 'duplicate-id', file: 'materials.yaml', line: 10, column: 7, field: '[2].id', other: { file: 'materials.yaml', line: 1, column: 7 } })]);
  });
});

describe('files dropped without a word (regression)', () => {
  it('loads structures written .YAML and rules in subfolders', () => {
    const h = loaded(handbook({ 'structures/cup.yaml': null, 'structures/cup.YAML': base('structures/cup.yaml'), 'rules/via.yaml': null, 'rules/sub/via.yaml': base('rules/via.yaml') }));
    expect(h.structures.map((s) => s.id)).toContain('cup');
    expect(h.rules.find((r) => r.id === 'VIA-R-1')?.file).toBe('rules/sub/via.yaml');
  });

  it('names a file or folder whose name is not UTF-8 as an error (it was skipped without a word)', () => {
    const dir = handbook({});
    // Latin-1 "règles" (0xE8) as a folder of rules, and a structure file named by the byte 0xFF.
    mkdirSync(Buffer.from(join(dir, 'rules', 'r\u0000gles').replace('\u0000', '\u00e8'), 'latin1'));
    writeFileSync(Buffer.concat([Buffer.from(join(dir, 'structures') + '/'), Buffer.from([0xff]), Buffer.from('.yaml')]), 'id: x\n');
    expect(problems(dir)).toEqual([
      { code: 'name-not-utf8', file: 'rules/r\\xE8gles', line: 1, column: 1, field: '' },
      { code: 'name-not-utf8', file: 'structures/\\xFF.yaml', line: 1, column: 1, field: '' },
    ]);
  });

  it('refuses a structures/ that is a file', () => {
    expect(problems(handbook({ structures: 'not a folder' }))).toEqual([{ code: 'not-a-folder', file: 'structures', line: 1, column: 1, field: '' }]);
  });

  it('names every other file of the handbook folders in a warning, and still loads', () => {
    const h = loaded(handbook({ 'structures/README.md': '# notes', 'rules/old.bak': 'x', 'materials.yml': '[]' }));
    expect(h.warnings.map((w) => [w.code, w.file])).toEqual([
      ['not-loaded', 'materials.yml'],
      ['not-loaded', 'rules/old.bak'],
      ['not-loaded', 'structures/README.md'],
    ]);
  });
});

describe('messages that misled (regressions)', () => {
  it('a structure that fails to load is the only problem, not every rule that names it', () => {
    // rules/array.yaml names slot in applies_to.structures; slot.yaml now has an unknown kind (line 3, column 7).
    const slot = base('structures/slot.yaml', ['kind: trench', 'kind: trenhc']);
    expect(problems(handbook({ 'structures/slot.yaml': slot }))).toEqual([{ code: 'unknown-kind', file: 'structures/slot.yaml', line: 3, column: 7, field: 'kind' }]);
  });

  it('a structure file with a YAML syntax error hides the references to it as well', () => {
    const r = problems(handbook({ 'structures/slot.yaml': 'id: slot\ntitle: [unclosed\n' }));
    expect(r.map((d) => d.code)).toEqual(['yaml-syntax']);
  });

  it('a 300-character rule id is refused at load (it made build exit 3 with ENAMETOOLONG)', () => {
    const rule = base('rules/via.yaml', ['id: VIA-R-1', `id: ${'V'.repeat(300)}`]);
    expect(problems(handbook({ 'rules/via.yaml': rule }))).toEqual([{ code: 'id-too-long', file: 'rules/via.yaml', line: 1, column: 5, field: 'id' }]);
  });

  it('.inf is one problem, not a second contradictory "found number Infinity"', () => {
    const cup = base('structures/cup.yaml', ['pitch: 52 nm', 'pitch: .inf']);
    const r = loadHandbookFolder(handbook({ 'structures/cup.yaml': cup }));
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.diagnostics.map((d) => [d.code, d.line, d.column, d.found])).toEqual([['bad-value', 8, 10, '.inf']]);
  });

  it('calibration: [] says what a calibration needs, in our words', () => {
    const slot = base('structures/slot.yaml', ['  time_budget: 4 min\n', '  time_budget: 4 min\n  calibration: []\n']);
    const r = loadHandbookFolder(handbook({ 'structures/slot.yaml': slot }));
    expect(r.ok).toBe(false);
    if (r.ok) return;
    // Line 14: "  calibration: []", the empty list at column 16.
    expect(r.diagnostics.map((d) => [d.code, d.line, d.column, d.field])).toEqual([['bad-value', 14, 16, 'etch.calibration']]);
    expect(formatDiagnostics(r.diagnostics)).not.toMatch(/must NOT have/);
    expect(formatDiagnostics(r.diagnostics)).toContain('at least 1 entry');
  });

  it('a byte-order mark does not shift the columns of line 1', () => {
    const cup = Buffer.concat([Buffer.from([0xef, 0xbb, 0xbf]), Buffer.from(base('structures/cup.yaml', ['id: cup', 'idd: cup']))]);
    // "idd: cup" on line 1: the unknown key at column 1 (the mark is not a character of the text).
    expect(problems(handbook({ 'structures/cup.yaml': cup }))).toContainEqual({ code: 'unknown-field', file: 'structures/cup.yaml', line: 1, column: 1, field: 'idd' });
  });

  it('a reversed tolerance is a malformed tolerance, not an unknown unit', () => {
    const cup = base('structures/cup.yaml', ['cd: 34 nm ± 1.5 nm', 'cd: 34 nm -1/+2 nm']);
    expect(problems(handbook({ 'structures/cup.yaml': cup }))).toEqual([{ code: 'malformed-tolerance', file: 'structures/cup.yaml', line: 6, column: 7, field: 'geometry.cd' }]);
  });

  it('Latin-1 bytes are reported at their place, not turned into U+FFFD', () => {
    // "  height: 1.9 \xB5m" (Latin-1 micro sign) on line 7; the byte is the 15th character.
    const cup = Buffer.from(base('structures/cup.yaml', ['  height: 1.9 um ± 40 nm', '  height: 1.9 \u0000m']), 'utf8');
    cup[cup.indexOf(0)] = 0xb5;
    expect(problems(handbook({ 'structures/cup.yaml': cup }))).toEqual([{ code: 'not-utf8', file: 'structures/cup.yaml', line: 7, column: 15, field: '' }]);
  });
});
