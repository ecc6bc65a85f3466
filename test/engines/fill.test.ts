// Gap fill marched in time. Sources beside each check: geometric truths of conformal and
// bottom-up growth worked by hand (walls that move at one rate keep the gap's shape), the
// line-of-sight view factor of a slot's wall, ½(1 − x/√(1 + x²)) at depth x (the strip-to-point
// factor of Howell, Mengüç & Siegel's catalogue, the first-wall-hit density of Clausing's slot
// equation halved), and the reacting-wall test-particle Monte Carlo (src/engines/transport/
// montecarlo.ts), an independent method, for the sticking-limited growth profile.
import { cpSync, mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { beforeEach, describe, expect, it } from 'vitest';
import { evaluateRule, evaluateStructure, PlanCache } from '../../src/checker/evaluate.ts';
import type { Noted } from '../../src/engines/quantity.ts';
import { deg, makeRule, variantOf } from '../helpers.ts';
import { loadHandbookFolder } from '../../src/pipeline.ts';
import { marchFill, SEAM_WIDTH_DEFAULT } from '../../src/engines/deposition/fill.ts';
import { straightOpening } from '../../src/engines/deposition/models.ts';
import { depositionMonteCarlo } from '../../src/engines/transport/montecarlo.ts';
import { referenceMarch } from './fill-reference.ts';

const ROOT = resolve(import.meta.dirname, '../..');

/** The one structure of a handbook that loads without diagnostics. */
function structureOf(yaml: string) {
  const dir = mkdtempSync(join(tmpdir(), 'plumbline-fill-'));
  cpSync(join(ROOT, 'test/fixtures/ok_minimal'), dir, { recursive: true });
  writeFileSync(join(dir, 'structures', 'test-pillar.yaml'), yaml);
  const r = loadHandbookFolder(dir);
  if (!r.ok) throw new Error(JSON.stringify(r.diagnostics));
  return r.handbook.structures[0]!;
}

function quantities(yaml: string) {
  return evaluateStructure(structureOf(yaml)).quantities;
}

/** A long march keeps its cross-section frames thinned to between 21 and 41, the first at time 0. */
function expectThinnedFrames(history: Array<{ time: number }>): void {
  expect(history.length).toBeGreaterThanOrEqual(21);
  expect(history.length).toBeLessThanOrEqual(41);
  expect(history[0]!.time).toBe(0);
}

const trench = (geometry: string, rest: string) => `id: test-pillar\ntitle: Trench\nkind: trench\ngeometry: { ${geometry} }\n${rest}`;

describe('conformal and bottom-up fills: geometric truths', () => {
  it('a conformal film in a vertical trench closes with a seam the full depth and no void, at half the width over the rate', () => {
    // Walls 1 apart grow at rate 1 each: they meet at t = w/(2·rate) everywhere at once (closure
    // time 1 in these units); the bottom has risen w/2 = 0.5 by then, so the seam is 10 − 0.5.
    const r = marchFill({ opening: straightOpening(true, 10, 1, 1), method: 'conformal' });
    expect(r.voidHeight).toBe(0);
    expect(r.trappedWidth).toBe(0);
    // Slices centred above 9.5: (i + ½)·0.05 < 9.5 for i = 0…189, so 190 of them.
    expect(r.seamLength).toBeCloseTo(9.5, 9);
    expect(r.closureTime).toBeCloseTo(1, 2);
  });

  it('a conformal film in a re-entrant trench traps the difference between the deepest open width and the mouth’s', () => {
    // Top 1, bottom 1.4, depth 10, 200 slices of 0.05. The mouth slice (centre 0.025, width 1.001)
    // closes at t = 0.5005, when the bottom has risen to 9.4995: the deepest slice still open is
    // the one centred at 9.475 (width 1.379). Every wall moved alike, so the trapped gap is
    // 1.379 − 1.001 = 0.378 wide and slices 1…189 (9.45) are the void.
    const r = marchFill({ opening: straightOpening(true, 10, 1, 1.4), method: 'conformal' });
    expect(r.trappedWidth).toBeCloseTo(0.378, 2);
    expect(r.voidHeight).toBeCloseTo(9.45, 6);
  });

  it('a conformal film in a V-shaped trench (100 → 2 nm over 1 µm) closes from the bottom up, every slice by its walls, the mouth last', () => {
    // Slice i is w_i = 100 − 98·(i + ½)/200 nm wide and its walls meet at t = w_i/2, when the bottom has
    // risen t: the deepest slice (2.245 nm, centre 997.5 nm) closes at 1.12 nm of growth with the
    // bottom at 998.9 nm, below it. So all 200 slices form the seam (1 µm), the mouth (centre 2.5 nm)
    // closes last at t = 99.755/2 nm: closure time 0.99755 in units of CD/2 over the rate, plus at
    // most one step's overshoot (the smallest step moves a wall 5e-4 CD: 1e-3 in these units).
    const r = marchFill({ opening: straightOpening(true, 1000e-9, 100e-9, 2e-9), method: 'conformal' });
    expect(r.voidHeight).toBe(0);
    expect(r.seamLength / 1e-9).toBeCloseTo(1000, 6);
    expect(r.closureDepth / 1e-9).toBeCloseTo(2.5, 9);
    expect(r.closureTime).toBeGreaterThanOrEqual(0.99755);
    expect(r.closureTime).toBeLessThan(0.99755 + 1e-3);
    // A long march (over a thousand steps): its frames thinned to between 21 and 41, in time order.
    expectThinnedFrames(r.history);
    r.history.slice(1).forEach((h, i) => expect(h.time).toBeGreaterThan(r.history[i]!.time));
  });

  it('a conformal film in a narrowing opening closes from the bottom up without a void', () => {
    const r = marchFill({ opening: straightOpening(false, 10, 1, 0.6), method: 'conformal' });
    expect(r.voidHeight).toBe(0);
    expect(r.trappedWidth).toBe(0);
  });

  it('bottom-up at 30× the wall rate fills a 1 µm trench when the bottom reaches the mouth, at t = 1000 nm/30', () => {
    // Closure time 2t/CD = 2 · 33.333/100 = 0.66667 (hand), less at most one step: the bottom may
    // cross half a slice (0.25 nm of 2000 slices) a step, 0.25/30 nm of time, 1.7e-4 in these units.
    // Some 4000 steps: the cross-section frames are thinned to between 21 and 41.
    const r = marchFill({ opening: straightOpening(true, 1000e-9, 100e-9, 100e-9), method: 'bottom-up', ratio: 30, slices: 2000 });
    expect(r.voidHeight).toBe(0);
    expect(Math.abs(r.closureTime - 2 / 3)).toBeLessThan(1.7e-4);
    expectThinnedFrames(r.history);
  });

  it('bottom-up growth fast enough to reach the top first leaves neither void nor seam', () => {
    // The bottom must rise 10 before the walls meet at t = 0.5: a ratio above 20.
    const r = marchFill({ opening: straightOpening(true, 10, 1, 1), method: 'bottom-up', ratio: 30 });
    expect(r.voidHeight).toBe(0);
    expect(r.seamLength).toBe(0);
  });
});

describe('trapped width and the seam width that makes a gap a void', () => {
  // A trench re-entrant by 1 nm over 1 µm: 100 nm at the top, 101 nm at the bottom, 200 slices of
  // 5 nm. The mouth slice (100.0025 nm) closes after 50 nm of growth; the bottom has risen to 950 nm,
  // so the deepest open slice is centred at 947.5 nm (100.9475 nm): a 0.945 nm gap is trapped (hand).
  // Before each test, not at load (DEVELOPERS.md, "Mutation testing").
  let opening!: ReturnType<typeof straightOpening>;
  beforeEach(() => {
    opening = straightOpening(true, 1000e-9, 100e-9, 101e-9);
  });

  it('is a seam below the default seam width of 1 nm, a void of slices 1…189 (945 nm) below a 0.5 nm one', () => {
    const seam = marchFill({ opening, method: 'conformal' });
    expect(SEAM_WIDTH_DEFAULT).toBe(1e-9);
    expect(seam.trappedWidth / 1e-9).toBeCloseTo(0.945, 3);
    expect(seam.voidHeight).toBe(0);
    // The mouth slice and the sliver below it (slices 1…189) close as one seam: 190 × 5 nm.
    expect(seam.seamLength / 1e-9).toBeCloseTo(950, 6);
    const strict = marchFill({ opening, method: 'conformal', seamWidth: 0.5e-9 });
    expect(strict.voidHeight / 1e-9).toBeCloseTo(945, 6);
    expect(strict.voidWidth / 1e-9).toBeCloseTo(0.945, 3);
    // Above the void only the mouth slice met: a seam of one 5 nm slice.
    expect(strict.seamLength / 1e-9).toBeCloseTo(5, 6);
  });

  it('measures the gap below the pinch, not the open column above it: a 100 nm trench narrowing to 40 nm halfway down', () => {
    // Knots at 500 nm: 100 nm above, 40 nm widening to 41 nm below (slices of 5 nm). The top slice
    // of the narrow part (centre 502.5 nm, 40.005 nm) closes after 20.0025 nm of growth, while the
    // 100 nm column above is still 60 nm open; the bottom has risen to 979.9975 nm, so the deepest
    // open slice is centred at 977.5 nm (40.955 nm): a 0.950 nm gap, slices 101…195 (hand).
    const opening = { elongated: true, z: [0, 500e-9, 500.001e-9, 1000e-9], width: [100e-9, 100e-9, 40e-9, 41e-9] };
    const seam = marchFill({ opening, method: 'conformal' });
    expect(seam.trappedWidth / 1e-9).toBeCloseTo(0.95, 4);
    expect(seam.voidHeight).toBe(0);
    const strict = marchFill({ opening, method: 'conformal', seamWidth: 0.5e-9 });
    expect(strict.voidWidth / 1e-9).toBeCloseTo(0.95, 4);
    expect(strict.closureDepth / 1e-9).toBeCloseTo(505, 6);
    expect(strict.voidHeight / 1e-9).toBeCloseTo(475, 6);
  });

  it('publishes the trapped width as a quantity a rule can limit', () => {
    // The same trench as a structure: 90.0573 deg makes the bottom 100 + 2 × 1000 × tan 0.0573° = 101.0 nm.
    const angle = 90 + (Math.atan(0.5 / 1000) * 180) / Math.PI;
    const q = quantities(trench(`cd: 100 nm, depth: 1 um, sidewall_angle: ${angle.toPrecision(12)} deg`, 'fill: { method: conformal }\n'));
    expect(q['fill.trapped_width']!.value! / 1e-9).toBeCloseTo(0.945, 3);
    expect(q['fill.void_height']?.value).toBe(0);
  });

  it('takes the seam width from the fill block: written at 0.5 nm, the same gap is a 945 nm void', () => {
    const angle = 90 + (Math.atan(0.5 / 1000) * 180) / Math.PI;
    const q = quantities(trench(`cd: 100 nm, depth: 1 um, sidewall_angle: ${angle.toPrecision(12)} deg`, 'fill: { method: conformal, seam_width: 0.5 nm }\n'));
    expect(q['fill.void_height']!.value! / 1e-9).toBeCloseTo(945, 6);
  });
});

describe('the largest aspect ratio filled void-free', () => {
  it('bottom-up at 30× the wall rate in a re-entrant trench: the bottom must reach the mouth before it pinches, AR = 30/2 = 15', () => {
    // The mouth (≈ CD wide) pinches after CD/2 of wall growth, when the bottom has risen 30 × CD/2:
    // the deepest fillable trench is 15 CD (hand). The re-entrance (5°) makes the mouth pinch first
    // and the pocket below it wider than the 1 nm seam width within a slice (2 × 7.5 nm × tan 5°).
    const q = quantities(trench('cd: 100 nm, depth: 1 um, sidewall_angle: 95 deg', 'fill: { method: bottom-up, bottom_up_ratio: 30 }\n'));
    expect(Math.abs(q['fill.max_fillable_aspect_ratio']!.value! / 15 - 1)).toBeLessThan(0.02);
  });

  it('a conformal fill of a narrowing trench never voids: the limit is where the taper closes it, (CD/2)·tan θ / CD', () => {
    // 89°: tan 89° / 2 = 28.64, taken at 0.999 of the closing depth (hand).
    const q = quantities(trench('cd: 100 nm, depth: 1 um, sidewall_angle: 89 deg', 'fill: { method: conformal }\n'));
    expect(q['fill.max_fillable_aspect_ratio']?.value).toBeCloseTo((0.999 * Math.tan((89 * Math.PI) / 180)) / 2, 6);
  });
});

describe('sticking-limited growth: the march’s first step grows the profile the Monte Carlo gives', () => {
  // The growth rate in the first step is the arriving flux over that on the top surface: each wall
  // moved 2·rate·t, the bottom rose rate·t. Against the reacting-wall Monte Carlo in ten depth bins:
  // 4 σ plus 3 % (the march solves its transport on 32 bands and interpolates to its slices).
  it.each([
    ['trench', 10, 0.01, true],
    ['hole', 5, 0.1, false],
  ] as const)('%s of aspect ratio %s, s = %s', (_kind, ar, s, elongated) => {
    const r = marchFill({ opening: straightOpening(elongated, ar, 1, 1), method: 'sticking-limited', sticking: s });
    const [f0, f1] = [r.history[0]!, r.history[1]!];
    const rate = f0.widths.map((w, i) => (w - f1.widths[i]!) / (2 * f1.time));
    const mc = depositionMonteCarlo({ shape: elongated ? 'slot' : 'tube', depth: ar, topWidth: 1, bottomWidth: 1 }, s, 40_000, { bins: 10, seed: 43 });
    mc.wall.forEach((m, b) => {
      const slices = rate.slice(20 * b, 20 * (b + 1));
      const model = slices.reduce((x, y) => x + y, 0) / slices.length;
      expect(Math.abs(model - m), `bin ${b}: ${model} against ${m}`).toBeLessThan(4 * mc.wallSigma[b]! + 0.03 * model);
    });
    const bottom = (ar - f1.bottom) / f1.time;
    expect(Math.abs(bottom - mc.bottom)).toBeLessThan(4 * mc.bottomSigma + 0.03 * bottom);
  });
});

describe('sticking-limited growth to the end: the march against a plainer reference march (./fill-reference.ts)', () => {
  // Both take 200 slices; the reference steps so that the fastest wall moves 0.2 % of the top width,
  // solves the transport every step on 150 bands and takes no back-off at the pinch; the engine
  // adapts its steps (up to 1 %), solves on 32 bands, again after each 1 % of growth. They agree
  // within a slice on where the void, the pinch and the seam are, and within 1 % of the top width
  // on the trapped gap (the engine's own error against finer reference steps: under 0.9 %). Where a
  // straight opening pinches, it is at the mouth (the flux falls with depth): the void starts one
  // slice down. (The closure time is not compared: as a neck of width r in a
  // slice of height dz narrows, its wall flux falls as r/dz, so the last instant of a pinch depends
  // on the slice height; the trapped gap, set while the neck is still open, does not.)
  it.each([
    ['a vertical trench, AR 5, s = 0.1: pinches at the mouth over a 73 nm gap', { elongated: true, depth: 500e-9, top: 100e-9, bottom: 100e-9 }, 0.1],
    ['a vertical hole, AR 5, s = 0.1: pinches at the mouth, the deep walls barely grown', { elongated: false, depth: 500e-9, top: 100e-9, bottom: 100e-9 }, 0.1],
    ['a tapered hole (100 → 10 nm over 300 nm), s = 0.03: still pinches', { elongated: false, depth: 300e-9, top: 100e-9, bottom: 10e-9 }, 0.03],
    ['a V-shaped trench (100 → 20 nm over 300 nm), s = 0.01: closes from the bottom with a seam', { elongated: true, depth: 300e-9, top: 100e-9, bottom: 20e-9 }, 0.01],
  ] as const)('%s', (_name, o, s) => {
    const ref = referenceMarch(o, s, 1e-9, 200);
    const r = marchFill({ opening: straightOpening(o.elongated, o.depth, o.top, o.bottom), method: 'sticking-limited', sticking: s });
    const slice = o.depth / 200;
    expect(r.converged).toBe(true);
    expect(Math.abs(r.trappedWidth - ref.trappedWidth) / o.top, 'trapped width').toBeLessThan(0.01);
    expect(Math.abs(r.voidHeight - ref.voidHeight) / slice, 'void height').toBeLessThan(1 + 1e-9);
    expect(Math.abs(r.closureDepth - ref.closureDepth) / slice, 'closure depth').toBeLessThan(1 + 1e-9);
    expect(Math.abs(r.seamLength - ref.seamLength) / slice, 'seam length').toBeLessThan(1 + 1e-9);
    expect(r.voidHeight > 0).toBe(ref.voidHeight > 0);
    if (r.voidHeight > 0) expect(r.closureDepth / slice).toBeCloseTo(1, 9);
    expect(r.voidWidth).toBe(r.voidHeight > 0 ? r.trappedWidth : 0);
  });

  it('keeps at most 40 frames of the cross-section beside the last, from the start to the end of the march, in time order', () => {
    const r = marchFill({ opening: straightOpening(true, 500e-9, 100e-9, 100e-9), method: 'sticking-limited', sticking: 0.1 });
    const shallow = marchFill({ opening: straightOpening(false, 300e-9, 100e-9, 30e-9), method: 'conformal' });
    for (const f of [r, shallow]) {
      expect(f.history.length).toBeGreaterThan(2);
      expect(f.history.length).toBeLessThanOrEqual(41);
      expect(f.history[0]!.time).toBe(0);
      expect(f.history.at(-1)!.time).toBeCloseTo((f.closureTime * 100e-9) / 2, 15);
      f.history.slice(1).forEach((h, i) => expect(h.time).toBeGreaterThan(f.history[i]!.time));
      expect(f.history.every((h) => h.widths.every((w) => w >= 0))).toBe(true);
    }
  });
});

describe('a fill after a PVD seed sees the seed’s local thickness (regression: its full nominal thickness at every depth)', () => {
  it('the seed’s overhang at the mouth makes a conformal fill of a vertical trench trap a gap', () => {
    // Vertical trench 100 nm wide, 1 µm deep, 20 nm PVD seed: on the wall at depth x (in widths)
    // the seed is 20 nm × ½(1 − x/√(1 + x²)): 9.75 nm at the mouth slice's centre (x = 0.025),
    // 0.054 nm at x = 9.575. The mouth (100 − 19.50 = 80.50 nm) pinches after 40.25 nm of growth,
    // the bottom has risen to 959.75 nm, the deepest open slice is centred at 957.5 nm
    // (100 − 0.108 = 99.89 nm): the gap trapped is 99.89 − 80.50 = 19.39 nm, the void 191 slices of
    // 5 nm (hand). Narrowing by the full 2 × 20 nm left a vertical 60 nm trench: a seam, no void.
    const q = quantities(trench('cd: 100 nm, depth: 1 um, sidewall_angle: 90 deg', 'deposition:\n  - { film: seed, method: pvd, thickness: 20 nm }\nfill: { method: conformal }\n'));
    expect(Math.abs(q['fill.trapped_width']!.value! / 19.39e-9 - 1)).toBeLessThan(0.02);
    expect(q['fill.void_height']!.value! / 1e-9).toBeCloseTo(955, 6);
  });
});

describe('what the fill quantities say, case by case', () => {
  const rule = (quantity: string) => makeRule({ quantity, comparison: 'at_most', limit: 0 });

  it('concerns openings only, and asks an opening without a fill block for its method', () => {
    const cup = structureOf('id: test-pillar\ntitle: Cup\nkind: cylinder\ngeometry: { cd: 40 nm, height: 1 um, wall: 5 nm, pitch: 60 nm, array: square, sidewall_angle: 90 deg }\n');
    expect(evaluateRule(rule('fill.void_height'), cup, new PlanCache())).toMatchObject({ status: 'not-applicable', reason: 'gap fill concerns openings (hole, trench, via)' });
    const hole = structureOf(trench('cd: 100 nm, depth: 1 um, sidewall_angle: 90 deg', ''));
    expect(evaluateRule(rule('fill.void_height'), hole, new PlanCache())).toMatchObject({ status: 'incomplete', missing: ['fill.method'] });
  });

  it('has nothing to fill below where the taper closes a trench: 60 nm at 87° closes 572 nm down, above a 600 nm depth', () => {
    // (CD/2)·tan 87° = 30 nm × 19.08 = 572 nm (hand).
    const q = quantities(trench('cd: 60 nm, depth: 600 nm, sidewall_angle: 87 deg', 'fill: { method: conformal }\n'));
    expect(q['fill.void_height']).toMatchObject({ value: null, reason: 'the opening closes before its bottom (its taper): there is nothing to fill below that' });
  });

  it('a conformal fill of a re-entrant trench (100 nm, 200 nm deep, 95°) pinches at the mouth over a void down to where the bottom has risen', () => {
    // Hand: the mouth closes after 50 nm of growth; the bottom has risen 50 nm to 150 nm; a slice at
    // depth z is then 2z·tan 5° wide: 26.2 nm at 150 nm (the march's slices give 26.1).
    const s = structureOf(trench('cd: 100 nm, depth: 200 nm, sidewall_angle: 95 deg', 'fill: { method: conformal }\n'));
    const r = variantOf('fill.void_height', s).compute({ cd: 100e-9, depth: 200e-9, angle: deg(95), seam: SEAM_WIDTH_DEFAULT }) as Noted & { figure: { void?: { from: number; to: number } } };
    const at = /^pinched off (\d+) nm below the top, trapping an opening up to ([\d.]+) nm wide$/.exec(r.note);
    expect(at, r.note).not.toBeNull();
    expect(Number(at![1])).toBeLessThanOrEqual(2);
    expect(Math.abs(Number(at![2]) - 2 * 150 * Math.tan(deg(5)))).toBeLessThan(0.5);
    expect(r.figure.void!.to / 1e-9).toBeCloseTo(150, 0);
    expect(r.figure.void!.to - r.figure.void!.from).toBeCloseTo(r.value, 15);
    expect(Number(at![1])).toBe(Math.round(r.figure.void!.from / 1e-9));
  });

  it('says how a void-free fill closes: with a seam (conformal, vertical), or from the bottom (bottom-up at 30×)', () => {
    const seam = quantities(trench('cd: 100 nm, depth: 1 um, sidewall_angle: 90 deg', 'fill: { method: conformal }\n'));
    // The bottom rises 50 nm while the walls close: a 950 nm seam above it (hand).
    expect(seam['fill.void_height']).toMatchObject({ value: 0, note: 'no void: the walls meet in a seam 950 nm long' });
    // 1 µm of bottom growth takes 33 nm per wall: the walls never meet (hand).
    const rising = structureOf(trench('cd: 100 nm, depth: 1 um, sidewall_angle: 90 deg', 'fill: { method: bottom-up, bottom_up_ratio: 30 }\n'));
    const r = variantOf('fill.void_height', rising).compute({ cd: 100e-9, depth: 1e-6, angle: deg(90), seam: SEAM_WIDTH_DEFAULT, ratio: 30 }) as Noted & { figure: object };
    expect(r.note).toBe('closes from the bottom up: no void');
    expect(r.figure).not.toHaveProperty('void');
  });

  it('the largest void-free aspect ratio of a conformal re-entrant fill: the bottom must come within a seam width’s pocket of the mouth, 0.5 + w_seam/(2·CD·tan 5°)', () => {
    // When the 100 nm mouth closes (50 nm of growth) the bottom has risen 50 nm; the pocket left at
    // depth z is 2z·tan 5°, a seam while under 1 nm: z < 5.72 nm. AR = (50 + 5.72)/100 (hand).
    const q = quantities(trench('cd: 100 nm, depth: 200 nm, sidewall_angle: 95 deg', 'fill: { method: conformal }\n'));
    const hand = 0.5 + SEAM_WIDTH_DEFAULT / 1e-9 / (2 * 100 * Math.tan(deg(5)));
    expect(Math.abs(q['fill.max_fillable_aspect_ratio']!.value! / hand - 1)).toBeLessThan(0.01);
  });

  it('the largest void-free aspect ratio where nothing voids: four times the depth, or a thousand CDs, or the taper’s closing depth, each said', () => {
    const ar = (geometry: string) => quantities(trench(geometry, 'fill: { method: conformal }\n'))['fill.max_fillable_aspect_ratio']!;
    expect(ar('cd: 100 nm, depth: 1 um, sidewall_angle: 90 deg')).toMatchObject({ value: 40, note: 'fills void-free beyond four times the depth' });
    const deep = ar('cd: 10 nm, depth: 3 um, sidewall_angle: 90 deg');
    expect(deep.value).toBeCloseTo(1000, 9);
    expect(deep.note).toBe('fills void-free far beyond the structure’s depth');
    expect(ar('cd: 100 nm, depth: 1 um, sidewall_angle: 89 deg').note).toBe('fills void-free down to where the taper closes (the recipe is not the limit)');
  });

  it('has no largest aspect ratio when the fill voids even at 0.25: bottom-up at a tenth of the wall rate in a re-entrant trench', () => {
    // At AR 0.25 the bottom rises 5 nm while the 100 nm mouth closes; the pocket below is up to
    // 2 × 20 nm × tan 5° = 3.5 nm wide, more than the 1 nm seam width (hand).
    const q = quantities(trench('cd: 100 nm, depth: 200 nm, sidewall_angle: 95 deg', 'fill: { method: bottom-up, bottom_up_ratio: 0.1 }\n'));
    expect(q['fill.max_fillable_aspect_ratio']).toMatchObject({ value: null, reason: 'this fill leaves a void (or the opening closes) even at an aspect ratio of 0.25' });
  });
});
