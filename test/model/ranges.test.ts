// Inputs outside the physical domain are load errors at the field, never values that reach an
// engine: non-finite numbers, a tolerance that reaches past zero, an angle of 180°.
import { loadHandbookFolder } from '../../src/pipeline.ts';
import { cpSync, mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';

import { evaluateRule, PlanCache } from '../../src/checker/evaluate.ts';
import { makeRule, makeStructure, nm } from '../helpers.ts';

const ROOT = resolve(import.meta.dirname, '../..');

function loadWithGeometry(geometryYaml: string) {
  const dir = mkdtempSync(join(tmpdir(), 'plumbline-range-'));
  cpSync(join(ROOT, 'test/fixtures/ok_minimal'), dir, { recursive: true });
  writeFileSync(join(dir, 'structures', 'test-pillar.yaml'), `id: test-pillar\ntitle: Test pillar\nkind: pillar\ngeometry:\n${geometryYaml}`);
  return loadHandbookFolder(dir);
}

describe('input ranges', () => {
  it.each([
    ['a tolerance that reaches zero', '  cd: 5 nm ± 5 nm\n', 'geometry.cd'],
    ['a non-finite value', '  cd: 1e400 nm\n', 'geometry.cd'],
    ['a sidewall angle of 180°', '  cd: 5 nm\n  sidewall_angle: 180 deg\n', 'geometry.sidewall_angle'],
    ['an angle whose tolerance passes 180°', '  cd: 5 nm\n  sidewall_angle: 179.9 deg ± 1 deg\n', 'geometry.sidewall_angle'],
    ['a negative height', '  cd: 5 nm\n  height: -2 um\n', 'geometry.height'],
  ])('rejects %s at the field', (_what, yaml, field) => {
    const r = loadWithGeometry(yaml);
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.diagnostics).toEqual([expect.objectContaining({ code: 'bad-value', file: 'structures/test-pillar.yaml', field })]);
  });

  it('rejects a wall as thick as the cylinder is tall', () => {
    const dir = mkdtempSync(join(tmpdir(), 'plumbline-range-'));
    cpSync(join(ROOT, 'test/fixtures/ok_minimal'), dir, { recursive: true });
    writeFileSync(join(dir, 'structures', 'test-pillar.yaml'), 'id: test-pillar\ntitle: Cup\nkind: cylinder\ngeometry:\n  cd: 100 nm\n  height: 20 nm\n  wall: 30 nm\n');
    const r = loadHandbookFolder(dir);
    expect(r.ok).toBe(false);
    if (r.ok) return;
    // The wall fails "thinner than half the CD"? No: 2·30 < 100. It fails "thinner than tall": line 7.
    expect(r.diagnostics).toEqual([expect.objectContaining({ code: 'bad-value', field: 'geometry.wall', line: 7, column: 9 })]);
  });
});

describe('zero limits', () => {
  it('give a verdict but no relative margin (the margin divides by |limit|)', () => {
    const s = makeStructure('pillar', { cd: 40 * nm, height: 200 * nm, pitch: 100 * nm, sidewall_angle: Math.PI / 2 }, { array: 'square' });
    const v = evaluateRule(makeRule({ quantity: 'geometry.space', comparison: 'at_least', limit: 0 }), s, new PlanCache());
    expect(v.status).toBe('pass');
    expect(v.margin).toBeNull();
  });
});
