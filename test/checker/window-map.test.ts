// Process windows held to closed forms on a hole: AR = D/CD ≤ 68 passes where D ≤ 68·CD, and
// space = pitch − CD ≥ 30 nm where CD ≤ pitch − 30 nm. Every cell of the refined map is checked
// against those inequalities at its centre, the edges through the nominal point against their exact
// values, each named by the rule that sets it, and the refinement against a dense grid's cost.
import { describe, expect, it } from 'vitest';
import { evaluateRule, PlanCache, structureWindow } from '../../src/checker/evaluate.ts';
import { OUTSIDE } from '../../src/checker/windows.ts';
import { expectRel, makeRule, makeStructure, nm } from '../helpers.ts';

const hole = () => {
  const s = makeStructure('hole', { depth: [2000 * nm, 1910 * nm, 2090 * nm], cd: [30 * nm, 28.5 * nm, 31.5 * nm], pitch: 64 * nm, sidewall_angle: Math.PI / 2 }, { array: 'square' });
  return { ...s, processWindow: ['geometry.cd', 'geometry.depth'] as [string, string] };
};
const ar = makeRule({ id: 'AR', quantity: 'geometry.aspect_ratio', comparison: 'at_most', limit: 68, map: ['geometry.cd', 'geometry.depth'] });
const space = makeRule({ id: 'SPACE', quantity: 'geometry.space', comparison: 'at_least', limit: 30 * nm });

describe('a rule’s process window', () => {
  it('passes exactly where D ≤ 68·CD, cell by cell, with its edges at D0/68 and 68·CD0', () => {
    const v = evaluateRule(ar, hole(), new PlanCache({ detail: true }));
    const w = v.window!;
    // Ranges: four half-bands either side, CD 24 … 36 nm, depth 1640 … 2360 nm.
    expectRel(w.axes[0].from, 24 * nm, 12);
    expectRel(w.axes[1].to, 2360 * nm, 12);
    for (const c of w.cells) {
      const cd = (c.x0 + c.x1) / 2;
      const d = (c.y0 + c.y1) / 2;
      expect(c.pass, `cell at CD ${cd / nm} nm, depth ${d / nm} nm`).toBe(d / cd <= 68 * (1 + 1e-12));
    }
    const edge = (axis: 0 | 1, side: 'low' | 'high') => w.edges!.find((e) => e.axis === axis && e.side === side)!;
    expectRel(edge(0, 'low').at, (2000 / 68) * nm, 9); // CD ≥ 29.412 nm
    expect(edge(0, 'low').rule).toBe('AR');
    expect(edge(0, 'high').rule).toBeUndefined(); // nothing bounds a wider CD: the range ends
    expectRel(edge(1, 'high').at, 68 * 30 * nm, 9); // depth ≤ 2040 nm
    expect(edge(1, 'low').rule).toBeUndefined();
  });
  it('refines only near the boundary: cells there are an eighth of the coarse ones, at far less than a dense grid’s cost', () => {
    const w = evaluateRule(ar, hole(), new PlanCache({ detail: true })).window!;
    const coarse = (w.axes[0].to - w.axes[0].from) / 9;
    const widths = w.cells.map((c) => c.x1 - c.x0);
    expect(Math.min(...widths)).toBeCloseTo(coarse / 8, 15);
    expect(Math.max(...widths)).toBeCloseTo(coarse, 15);
    // A dense grid at the finest spacing: 72 × 72 = 5184 evaluations.
    expect(w.evaluations).toBeLessThan(5184 / 2);
    // Every cell of the plane is covered once: the cells' areas add up to the range mapped.
    const area = w.cells.reduce((a, c) => a + (c.x1 - c.x0) * (c.y1 - c.y0), 0);
    expectRel(area, (w.axes[0].to - w.axes[0].from) * (w.axes[1].to - w.axes[1].from), 9);
  });
  it('says why a structure without one of the inputs has no map', () => {
    // A hole has no length: a rule that maps CD against length draws nothing for it, and says so.
    const v = evaluateRule(makeRule({ quantity: 'geometry.aspect_ratio', comparison: 'at_most', limit: 68, map: ['geometry.cd', 'geometry.length'] }), hole(), new PlanCache({ detail: true }));
    expect(v.window).toBeUndefined();
    expect(v.windowNotMapped).toMatch(/has no geometry\.length/);
  });
});

describe('a structure’s process window', () => {
  it('is where every blocking rule passes, each edge named by the rule that sets it', () => {
    const w = structureWindow({ rules: [ar, space] }, hole(), new PlanCache())!;
    expect(w.rules).toEqual(['AR', 'SPACE']);
    for (const c of w.cells) {
      const cd = (c.x0 + c.x1) / 2;
      const d = (c.y0 + c.y1) / 2;
      const expected = d / cd <= 68 * (1 + 1e-12) && 64 * nm - cd >= 30 * nm * (1 - 1e-12);
      expect(c.pass).toBe(expected);
      if (!c.pass) expect(c.failing).toEqual([...(d / cd > 68 * (1 + 1e-12) ? ['AR'] : []), ...(64 * nm - cd < 30 * nm * (1 - 1e-12) ? ['SPACE'] : [])]);
    }
    const edge = (axis: 0 | 1, side: 'low' | 'high') => w.edges!.find((e) => e.axis === axis && e.side === side)!;
    expect(edge(0, 'low').rule).toBe('AR');
    expect(edge(0, 'high').rule).toBe('SPACE');
    expectRel(edge(0, 'high').at, 34 * nm, 9); // CD ≤ 64 − 30 nm
    expect(edge(1, 'high').rule).toBe('AR');
  });
  it('greys out points where the structure breaks its relations (a CD above the pitch)', () => {
    const s = { ...makeStructure('hole', { depth: 2000 * nm, cd: [30 * nm, 20 * nm, 40 * nm], pitch: 50 * nm }, { array: 'square' }), processWindow: ['geometry.cd', 'geometry.depth'] as [string, string] };
    const w = structureWindow({ rules: [ar] }, s, new PlanCache())!;
    // CD mapped 0.03 … 70 nm (four half-bands of 10 nm, held above 0); CD ≥ 50 nm is no structure.
    const outside = w.cells.filter((c) => c.failing?.includes(OUTSIDE));
    expect(outside.length).toBeGreaterThan(0);
    for (const c of outside) expect((c.x0 + c.x1) / 2).toBeGreaterThanOrEqual(50 * nm);
  });
});
