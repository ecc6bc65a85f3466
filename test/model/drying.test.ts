// The `drying:` block at load: where each problem is reported, and what the block becomes.
import { loadHandbookFolder } from '../../src/pipeline.ts';
import { cpSync, mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { evaluateStructure } from '../../src/checker/evaluate.ts';

const ROOT = resolve(import.meta.dirname, '../..');

function load(structureYaml: string) {
  const dir = mkdtempSync(join(tmpdir(), 'plumbline-drying-'));
  cpSync(join(ROOT, 'test/fixtures/ok_minimal'), dir, { recursive: true });
  writeFileSync(join(dir, 'structures', 'test-pillar.yaml'), structureYaml);
  return loadHandbookFolder(dir);
}

const PILLAR = 'id: test-pillar\ntitle: Pillar\nkind: pillar\ngeometry:\n  cd: 40 nm\n  height: 400 nm\n  pitch: 100 nm\n  array: square\n  sidewall_angle: 90 deg\nmaterials:\n  body: silicon\n';

describe('drying block', () => {
  it('takes the liquid’s surface tension from the materials table, with its source', () => {
    const r = load(`${PILLAR}drying:\n  liquid: isopropanol\n  contact_angle: 0 deg\n  supports: [100 nm, 300 nm]\n`);
    if (!r.ok) throw new Error(JSON.stringify(r.diagnostics));
    const s = r.handbook.structures[0]!;
    expect(s.drying).toEqual({ liquid: 'isopropanol', supportCount: 2, supportHold: 'pinned' });
    const g = s.params.get('drying.surface_tension')!;
    expect(g.value).toBeCloseTo(0.0209, 6); // CRC, 25 °C (from memory)
    expect(g.origin).toMatchObject({ type: 'material-table', material: 'isopropanol' });
    expect(s.params.get('drying.support_2')?.value).toBeCloseTo(300e-9, 15);
  });

  it('treats liquid: none as no liquid–vapour interface (surface tension 0)', () => {
    const r = load(`${PILLAR}drying:\n  liquid: none\n  contact_angle: 0 deg\n`);
    if (!r.ok) throw new Error(JSON.stringify(r.diagnostics));
    expect(r.handbook.structures[0]!.params.get('drying.surface_tension')?.value).toBe(0);
    expect(evaluateStructure(r.handbook.structures[0]!).quantities['mechanics.collapse_margin']).toMatchObject({ value: null, unbounded: 'above' });
  });

  it.each([
    ['an unknown liquid, with a suggestion', 'drying:\n  liquid: watter\n  contact_angle: 0 deg\n', 'unknown-material', 'drying.liquid', 13, 11],
    ['a liquid without a surface tension', 'drying:\n  liquid: copper\n  contact_angle: 0 deg\n', 'bad-value', 'drying.liquid', 13, 11],
    ['supports out of order', 'drying:\n  liquid: water\n  supports: [300 nm, 100 nm]\n', 'bad-value', 'drying.supports[1]', 14, 22],
    ['a support above the top', 'drying:\n  liquid: water\n  supports: [500 nm]\n', 'bad-value', 'drying.supports[0]', 14, 14],
    ['a contact angle of the wrong dimension', 'drying:\n  liquid: water\n  contact_angle: 3 nm\n', 'wrong-dimension', 'drying.contact_angle', 14, 18],
  ])('reports %s at the field', (_what, block, code, field, line, column) => {
    const r = load(PILLAR + block);
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.diagnostics).toEqual([expect.objectContaining({ code, field, line, column, file: 'structures/test-pillar.yaml' })]);
    if (code === 'unknown-material') expect(r.diagnostics[0]!.suggestions).toContain('water');
  });

  it('refuses a surface tension together with liquid: none', () => {
    const r = load(`${PILLAR}drying:\n  liquid: none\n  surface_tension: 72 mN/m\n`);
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.diagnostics).toEqual([expect.objectContaining({ code: 'bad-value', field: 'drying.surface_tension', line: 14, column: 3 })]);
  });

  it('is refused on an opening', () => {
    const r = load('id: test-pillar\ntitle: Hole\nkind: hole\ngeometry:\n  cd: 40 nm\n  depth: 400 nm\ndrying:\n  liquid: water\n');
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.diagnostics).toEqual([expect.objectContaining({ code: 'unknown-field', field: 'drying', line: 7, column: 1 })]);
  });

  it('a zero space is a load error, not a NaN (pitch equal to the CD)', () => {
    const r = load(PILLAR.replace('pitch: 100 nm', 'pitch: 40 nm') + 'drying:\n  liquid: water\n  contact_angle: 0 deg\n');
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.diagnostics).toEqual([expect.objectContaining({ code: 'bad-value', field: 'geometry.pitch' })]);
  });

  it('a base that widens into its neighbour leaves collapse with no value and a reason, never NaN', () => {
    // 40 nm top, 400 nm tall at 85°: base 40 + 2·400·cot 85° = 40 + 69.99 = 110 nm > the 100 nm pitch.
    const r = load(PILLAR.replace('sidewall_angle: 90 deg', 'sidewall_angle: 85 deg') + 'drying:\n  liquid: water\n  contact_angle: 0 deg\n');
    if (!r.ok) throw new Error(JSON.stringify(r.diagnostics));
    const m = evaluateStructure(r.handbook.structures[0]!).quantities['mechanics.collapse_margin'];
    expect(m?.value).toBeNull();
    expect(m?.unbounded).toBeUndefined();
    expect(m?.reason).toMatch(/geometry\.space has no value/);
  });
});
