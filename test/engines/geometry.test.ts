// Geometry engine, exercised the way the checker uses it: a Structure (built here in SI) → plans →
// values. Every expected number is a closed form worked by hand in the comment beside it, a
// published constant, or an independent numerical method written in this file (slice integration,
// grid sampling); none is read back from the engine.
import { describe, expect, it } from 'vitest';
import { evaluateStructure } from '../../src/checker/evaluate.ts';
import { buildPlan } from '../../src/checker/plan.ts';
import { cotangent, frustumVolume } from '../../src/engines/geometry/index.ts';
import type { Structure } from '../../src/model/types.ts';
import { deg, expectRel, makeStructure, nm, um } from '../helpers.ts';

/** Nominal value of one quantity; fails the test when the engine could not compute it. */
function q(s: Structure, name: string): number {
  const r = evaluateStructure(s).quantities[name];
  if (!r) throw new Error(`${name} not computed for ${s.kind}: ${JSON.stringify(evaluateStructure(s).incomplete)}`);
  if (r.value === null) throw new Error(`${name} has no value: ${r.reason}`);
  return r.value;
}

/** Midpoint-rule integral of f over [a, b] with n slices (independent of the engine's closed forms). */
function integrate(f: (z: number) => number, a: number, b: number, n = 10_000): number {
  const h = (b - a) / n;
  let sum = 0;
  for (let i = 0; i < n; i++) sum += f(a + (i + 0.5) * h);
  return sum * h;
}

/** Diameter at height z above the base of a straight wall from d0 (base) to d1 (top) over h. */
const linear = (d0: number, d1: number, h: number) => (z: number) => d0 + ((d1 - d0) * z) / h;

describe('aspect ratio', () => {
  it('is 66.7 for a 30 nm × 2 µm storage-node cylinder', () => {
    // 2000 nm / 30 nm = 66.67 (hand). Common practice: stacked DRAM storage-node cylinders are
    // roughly 30 nm across and 2 µm tall, aspect ratio in the sixties.
    const s = makeStructure('cylinder', { cd: 30 * nm, height: 2 * um, pitch: 45 * nm, sidewall_angle: deg(90), wall: 5 * nm }, { array: 'hexagonal' });
    expectRel(q(s, 'geometry.aspect_ratio'), 2000 / 30, 12);
  });

  it('falls in the 5–10 range of fins for a typical fin', () => {
    // 50 nm tall / 8 nm wide = 6.25 (hand); common practice: fins have aspect ratios of 5 to 10.
    const s = makeStructure('line', { cd: 8 * nm, height: 50 * nm, pitch: 30 * nm, sidewall_angle: deg(89), length: 1 * um });
    const ar = q(s, 'geometry.aspect_ratio');
    expectRel(ar, 50 / 8, 12);
    expect(ar).toBeGreaterThanOrEqual(5);
    expect(ar).toBeLessThanOrEqual(10);
  });

  it('uses depth, not height, for an opening', () => {
    // 1200 nm deep / 100 nm = 12 (hand).
    const s = makeStructure('hole', { cd: 100 * nm, depth: 1200 * nm });
    expectRel(q(s, 'geometry.aspect_ratio'), 12, 12);
  });
});

describe('taper: bottom CD and closure depth', () => {
  // A 100 nm hole, 1 µm deep, sidewall 89°: cot 89° = tan 1° = 0.017455065 (tables).
  const hole = () => makeStructure('hole', { cd: 100 * nm, depth: 1 * um, pitch: 200 * nm, sidewall_angle: deg(89) }, { array: 'square' });

  it('narrows an opening: CD_b = CD − 2D·cot θ', () => {
    // 100 nm − 2 · 1000 nm · 0.017455065 = 65.09 nm (hand).
    expectRel(q(hole(), 'geometry.bottom_cd'), 100 * nm - 2 * 1000 * nm * Math.tan(deg(1)), 9);
    expectRel(q(hole(), 'geometry.bottom_cd'), 65.0899 * nm, 5);
  });

  it('gives the bottom-to-top ratio of the same hole', () => {
    // 65.0899 / 100 = 0.650899 (hand, from the bottom CD above).
    expectRel(q(hole(), 'geometry.bottom_to_top_ratio'), 0.650899, 5);
  });

  it('widens a standing structure toward its base for θ < 90°', () => {
    // Pillar 50 nm, 500 nm tall, 88°: cot 88° = tan 2° = 0.034920769; 50 + 2·500·0.034920769 = 84.92 nm (hand).
    const s = makeStructure('pillar', { cd: 50 * nm, height: 500 * nm, pitch: 150 * nm, sidewall_angle: deg(88) }, { array: 'square' });
    const b = q(s, 'geometry.bottom_cd');
    expectRel(b, 84.9208 * nm, 5);
    expect(b).toBeGreaterThan(50 * nm);
  });

  it('keeps the CD of a vertical wall exactly: cot 90° = 0, so CD_b = CD and the ratio is 1', () => {
    // Closed form: cot 90° = 0 exactly, so CD_b = 100 nm − 2·1000 nm·0 = 100 nm. A floating-point
    // cos(π/2)/sin(π/2) = 6.1e-17 would leave 2·1 µm·6.1e-17 = 1.2e-22 m (≈ 9 ulp of 100 nm) off.
    const s = makeStructure('hole', { cd: 100 * nm, depth: 1 * um, pitch: 200 * nm, sidewall_angle: deg(90) }, { array: 'square' });
    expect(q(s, 'geometry.bottom_cd')).toBe(100 * nm);
    expect(q(s, 'geometry.bottom_to_top_ratio')).toBe(1);
  });

  it('has no bottom CD for an opening exactly as deep as its closure depth', () => {
    // D = D_c gives CD_b = CD − 2D·cot θ = 0 (closed form): the walls meet at the bottom, which is a
    // point, not an opening. CD is set to 2D·cot 89° so the difference is exactly zero.
    const s = makeStructure('hole', { cd: 2 * (1 * um) * cotangent(deg(89)), depth: 1 * um, sidewall_angle: deg(89) });
    const r = evaluateStructure(s).quantities['geometry.bottom_cd'];
    expect(r?.value).toBeNull();
    expect(r?.reason).toMatch(/closes/);
  });

  it('closes a tapered opening at D_c = (CD/2)·tan θ', () => {
    // 50 nm · tan 89° = 50 nm · 57.289962 = 2864.50 nm (hand; tan 89° from tables).
    expectRel(q(hole(), 'geometry.closure_depth'), 50 * nm * 57.289962, 7);
  });

  it('has no bottom CD for an opening deeper than its closure depth, and no unbounded flag', () => {
    // Same 100 nm, 89° hole, 3 µm deep: 3000 nm > 2864.5 nm closure depth (above), so it never reaches its bottom.
    const s = makeStructure('hole', { cd: 100 * nm, depth: 3 * um, sidewall_angle: deg(89) });
    const r = evaluateStructure(s).quantities['geometry.bottom_cd'];
    expect(r?.value).toBeNull();
    expect(r?.reason).toBeTruthy();
    expect(r?.unbounded).toBeUndefined();
  });

  it('reports no closure for a vertical or re-entrant opening: null, unbounded above', () => {
    // tan 90° is infinite: a vertical wall never closes (the brief: null with a reason, never a fake
    // large number); at 91° the opening widens downward (tan 91° < 0) and never closes either.
    for (const angle of [90, 91]) {
      const s = makeStructure('hole', { cd: 100 * nm, depth: 1 * um, sidewall_angle: deg(angle) });
      const r = evaluateStructure(s).quantities['geometry.closure_depth'];
      expect(r, `${angle}°`).toBeDefined();
      expect(r!.value, `${angle}°`).toBeNull();
      expect(r!.unbounded, `${angle}°`).toBe('above');
      expect(r!.reason, `${angle}°`).toBeTruthy();
    }
  });

  it('closes a wall one nanoradian from vertical far below: D_c = (CD/2)/tan ε ≈ CD/(2ε)', () => {
    // θ = π/2 − ε with ε = π/2 − θ taken exactly in floating point (1.0000000827e-9 here);
    // tan(π/2 − ε) = 1/tan ε = (1/ε)(1 − ε²/3 …), so D_c = 50 nm/ε ≈ 50.0 m (closed form). The
    // rounding of π/2 itself (6e-17) moves this by 6e-8 relative, inside the 1e-6 checked.
    const angle = Math.PI / 2 - 1e-9;
    const eps = Math.PI / 2 - angle;
    const s = makeStructure('hole', { cd: 100 * nm, depth: 1 * um, sidewall_angle: angle });
    expectRel(q(s, 'geometry.closure_depth'), (50 * nm) / eps, 6);
  });

  it('does not apply closure depth to standing kinds', () => {
    for (const kind of ['pillar', 'cylinder', 'line'] as const) {
      const s = makeStructure(kind, { cd: 30 * nm, height: 1 * um, pitch: 60 * nm, sidewall_angle: deg(88), wall: 5 * nm, length: 1 * um }, { array: 'square' });
      const plan = buildPlan(s, 'geometry.closure_depth');
      expect(plan.status, kind).toBe('not-applicable');
      expect(plan.status === 'not-applicable' ? plan.reason : '', kind).toBeTruthy();
      expect(evaluateStructure(s).quantities['geometry.closure_depth'], kind).toBeUndefined();
    }
  });
});

describe('space to the neighbour', () => {
  it('is pitch − CD for a narrowing opening (the top is widest)', () => {
    // 200 nm − 100 nm = 100 nm (hand; bottom 65 nm < top).
    const s = makeStructure('hole', { cd: 100 * nm, depth: 1 * um, pitch: 200 * nm, sidewall_angle: deg(89) });
    expectRel(q(s, 'geometry.space'), 100 * nm, 9);
  });

  it('is pitch − bottom CD for a standing structure that widens at its base', () => {
    // 150 nm − 84.9208 nm = 65.0792 nm (hand; bottom CD of the 88° pillar above).
    const s = makeStructure('pillar', { cd: 50 * nm, height: 500 * nm, pitch: 150 * nm, sidewall_angle: deg(88) });
    expectRel(q(s, 'geometry.space'), 65.0792 * nm, 5);
  });

  it('is pitch − top CD for a re-entrant standing cylinder (narrower at its base)', () => {
    // θ = 90.2°: base narrower than the 34 nm top, so the gap is 52 − 34 = 18 nm (hand).
    const s = makeStructure('cylinder', { cd: 34 * nm, height: 1.9 * um, pitch: 52 * nm, sidewall_angle: deg(90.2), wall: 7 * nm });
    expectRel(q(s, 'geometry.space'), 18 * nm, 9);
  });
});

describe('open-area fraction', () => {
  it('is π d²/(4p²) for a square array of holes', () => {
    // π·40²/(4·100²) = 0.125664 (hand).
    const s = makeStructure('hole', { cd: 40 * nm, depth: 400 * nm, pitch: 100 * nm }, { array: 'square' });
    expectRel(q(s, 'geometry.open_area_fraction'), (Math.PI * 40 * 40) / (4 * 100 * 100), 9);
  });

  it('is π d²/(2√3 p²) for a hexagonal array of holes', () => {
    // π·40²/(2√3·100²) = 0.145104 (hand).
    const s = makeStructure('hole', { cd: 40 * nm, depth: 400 * nm, pitch: 100 * nm }, { array: 'hexagonal' });
    expectRel(q(s, 'geometry.open_area_fraction'), (Math.PI * 40 * 40) / (2 * Math.sqrt(3) * 100 * 100), 9);
  });

  it('agrees with a grid-sampled estimate of the hexagonal array', () => {
    // Independent method: sample a rectangular repeat cell p × √3p of the hexagonal lattice (lattice
    // points at its four corners and its centre) on a fine grid and count points inside a hole.
    const p = 100;
    const r = 20;
    const w = p;
    const h = Math.sqrt(3) * p;
    const centres = [[0, 0], [w, 0], [0, h], [w, h], [w / 2, h / 2]] as const;
    const n = 1000;
    const m = Math.round(n * Math.sqrt(3));
    let inside = 0;
    for (let i = 0; i < n; i++) {
      const x = ((i + 0.5) * w) / n;
      for (let j = 0; j < m; j++) {
        const y = ((j + 0.5) * h) / m;
        if (centres.some(([cx, cy]) => (x - cx) ** 2 + (y - cy) ** 2 <= r * r)) inside++;
      }
    }
    const sampled = inside / (n * m);
    const s = makeStructure('hole', { cd: 40 * nm, depth: 400 * nm, pitch: 100 * nm }, { array: 'hexagonal' });
    expect(Math.abs(q(s, 'geometry.open_area_fraction') - sampled) / sampled).toBeLessThan(2e-3);
  });

  it('reaches the known circle-packing densities when holes touch (d = p)', () => {
    // Hexagonal close packing of circles covers π/(2√3) = 0.906900 of the plane; square packing
    // π/4 = 0.785398 (Lagrange/Thue; published values).
    const hex = makeStructure('hole', { cd: 100 * nm, depth: 400 * nm, pitch: 100 * nm }, { array: 'hexagonal' });
    const sq = makeStructure('hole', { cd: 100 * nm, depth: 400 * nm, pitch: 100 * nm }, { array: 'square' });
    expectRel(q(hex, 'geometry.open_area_fraction'), 0.9068996821, 9);
    expectRel(q(sq, 'geometry.open_area_fraction'), 0.7853981634, 9);
  });

  it('is the complement for standing pillars', () => {
    // 1 − π·40²/(4·100²) = 0.874336 (hand).
    const s = makeStructure('pillar', { cd: 40 * nm, height: 400 * nm, pitch: 100 * nm }, { array: 'square' });
    expectRel(q(s, 'geometry.open_area_fraction'), 1 - (Math.PI * 40 * 40) / (4 * 100 * 100), 9);
  });

  it('is w/p for trenches and 1 − w/p for lines', () => {
    // 24/64 = 0.375 and 1 − 9/36 = 0.75 (hand).
    const t = makeStructure('trench', { cd: 24 * nm, depth: 230 * nm, pitch: 64 * nm });
    const l = makeStructure('line', { cd: 9 * nm, height: 60 * nm, pitch: 36 * nm });
    expectRel(q(t, 'geometry.open_area_fraction'), 0.375, 12);
    expectRel(q(l, 'geometry.open_area_fraction'), 0.75, 12);
  });

  it('counts the inside of a hollow cylinder as open', () => {
    // Ring area π/4·(30² − 20²) = 392.699 nm²; hexagonal cell (√3/2)·45² = 1753.70 nm²;
    // 1 − 392.699/1753.70 = 0.776074 (hand).
    const s = makeStructure('cylinder', { cd: 30 * nm, height: 2 * um, pitch: 45 * nm, wall: 5 * nm }, { array: 'hexagonal' });
    expectRel(q(s, 'geometry.open_area_fraction'), 1 - ((Math.PI / 4) * (900 - 400)) / ((Math.sqrt(3) / 2) * 45 * 45), 9);
    expectRel(q(s, 'geometry.open_area_fraction'), 0.776074, 5);
  });

  it('is incomplete for a round kind with no array, naming geometry.array', () => {
    const s = makeStructure('hole', { cd: 40 * nm, depth: 400 * nm, pitch: 100 * nm });
    const plan = buildPlan(s, 'geometry.open_area_fraction');
    expect(plan.status).toBe('incomplete');
    expect(plan.status === 'incomplete' ? plan.missing : []).toEqual(['geometry.array']);
    expect(evaluateStructure(s).incomplete['geometry.open_area_fraction']).toEqual(['geometry.array']);
  });
});

describe('volumes and areas against numerical integration', () => {
  // Hole: top 100 nm, 1 µm deep, 89°; bottom 65.0899 nm (see above). Diameter at height z above the bottom:
  const D = 1000 * nm;
  const top = 100 * nm;
  const bottom = top - 2 * D * Math.tan(deg(1));
  const hole = () => makeStructure('hole', { cd: top, depth: D, pitch: 200 * nm, sidewall_angle: deg(89) }, { array: 'square' });

  it('frustum volume matches 10,000-slice midpoint integration of π d(z)²/4', () => {
    const d = linear(bottom, top, D);
    const slices = integrate((z) => (Math.PI / 4) * d(z) ** 2, 0, D);
    expectRel(q(hole(), 'geometry.volume'), slices, 7);
  });

  it('reduces to the cone πd²h/12 when the bottom diameter is zero', () => {
    // Cone: V = (1/3)·π(d/2)²·h = πd²h/12 (mensuration); d = 100 nm, h = 1 µm → 2.61799e-21 m³.
    expectRel(frustumVolume(100 * nm, 0, 1 * um), (Math.PI * (100 * nm) ** 2 * (1 * um)) / 12, 12);
    expectRel(frustumVolume(100 * nm, 0, 1 * um), 2.617994e-21, 6);
  });

  it('sidewall area matches numerical integration of 2πr ds', () => {
    // ds = sqrt(1 + r'(z)²) dz along the wall; r' is constant for a straight wall.
    const d = linear(bottom, top, D);
    const drdz = (top - bottom) / 2 / D;
    const slices = integrate((z) => 2 * Math.PI * (d(z) / 2) * Math.sqrt(1 + drdz ** 2), 0, D);
    expectRel(q(hole(), 'geometry.sidewall_area'), slices, 7);
  });

  it('trench volume is length × depth × mean width', () => {
    // Trench 24 nm, 230 nm deep, 88.5°, 12 µm long: bottom 24 − 2·230·tan 1.5° = 24 − 12.0455 = 11.9545 nm;
    // V = 12 µm · 230 nm · (24 + 11.9545)/2 nm = 4.96172e-20 m³ (hand).
    const s = makeStructure('trench', { cd: 24 * nm, depth: 230 * nm, pitch: 64 * nm, sidewall_angle: deg(88.5), length: 12 * um });
    expectRel(q(s, 'geometry.volume'), 12e-6 * 230e-9 * ((24 + 11.95448) / 2) * 1e-9, 5);
    // Independent: slice the trench cross-section w(z) and multiply by its length.
    const w = linear(24 * nm - 2 * 230 * nm * Math.tan(deg(1.5)), 24 * nm, 230 * nm);
    expectRel(q(s, 'geometry.volume'), 12 * um * integrate(w, 0, 230 * nm), 7);
  });

  it('trench sidewall area is both faces over its length', () => {
    // 2 · L · slant, slant = sqrt(230² + 6.02277²) nm = 230.0788 nm (hand) → 2·12 µm·230.0788 nm = 5.52189e-12 m².
    const s = makeStructure('trench', { cd: 24 * nm, depth: 230 * nm, pitch: 64 * nm, sidewall_angle: deg(88.5), length: 12 * um });
    expectRel(q(s, 'geometry.sidewall_area'), 2 * 12e-6 * 230.0788e-9, 5);
  });

  it('vertical hollow cylinder: outer cylinder minus a cavity one wall short of the base', () => {
    // Documented assumption: a cup whose cavity reaches down to a bottom plate as thick as its wall.
    // π/4·(30²·2000 − 20²·1995) nm³ = π/4·1,002,000 nm³ = 7.86969e-22 m³ (hand).
    const s = makeStructure('cylinder', { cd: 30 * nm, height: 2 * um, pitch: 45 * nm, sidewall_angle: deg(90), wall: 5 * nm }, { array: 'hexagonal' });
    expectRel(q(s, 'geometry.volume'), (Math.PI / 4) * (900 * 2000 - 400 * 1995) * 1e-27, 9);
    expectRel(q(s, 'geometry.volume'), 7.86969e-22, 5);
    // A volume is reported in m³ (SI: a length cubed).
    expect(evaluateStructure(s).quantities['geometry.volume']?.unit).toBe('m^3');
  });

  it('vertical hollow cylinder sidewall area is the outer plus the inner face', () => {
    // π·30·2000 + π·20·1995 nm² = π·99,900 nm² = 3.13845e-13 m² (hand).
    const s = makeStructure('cylinder', { cd: 30 * nm, height: 2 * um, pitch: 45 * nm, sidewall_angle: deg(90), wall: 5 * nm }, { array: 'hexagonal' });
    expectRel(q(s, 'geometry.sidewall_area'), Math.PI * 99_900 * 1e-18, 9);
    // An area is reported in m² (SI: a length squared).
    expect(evaluateStructure(s).quantities['geometry.sidewall_area']?.unit).toBe('m^2');
  });

  // A strongly tapered cup, so any inconsistency in the cavity shape shows: top 100 nm, 1 µm tall,
  // 88° (widening to the base), wall 20 nm measured across, as the engine's top inner diameter CD − 2t_w does.
  const H = 1000 * nm;
  const t = 20 * nm;
  const cupTop = 100 * nm;
  const cupBase = cupTop + 2 * H * Math.tan(deg(2)); // 169.8415 nm
  const cup = () => makeStructure('cylinder', { cd: cupTop, height: H, pitch: 300 * nm, sidewall_angle: deg(88), wall: t }, { array: 'hexagonal' });
  const outer = linear(cupBase, cupTop, H);
  // Wall of constant thickness t everywhere: inner diameter = outer − 2t, from the floor (z = t) to the top.
  const inner = (z: number) => outer(z) - 2 * t;

  it('tapered hollow cylinder volume matches slicing a cup of constant wall thickness', () => {
    const solid = integrate((z) => (Math.PI / 4) * (outer(z) ** 2 - (z > t ? inner(z) ** 2 : 0)), 0, H, 20_000);
    expectRel(q(cup(), 'geometry.volume'), solid, 5);
  });

  it('tapered hollow cylinder sidewall area matches 2πr ds over the outer and inner faces', () => {
    const slope = Math.sqrt(1 + ((cupTop - cupBase) / 2 / H) ** 2);
    const outerFace = integrate((z) => Math.PI * outer(z) * slope, 0, H);
    const innerFace = integrate((z) => Math.PI * inner(z) * slope, t, H);
    expectRel(q(cup(), 'geometry.sidewall_area'), outerFace + innerFace, 5);
  });
});

describe('missing inputs', () => {
  it('marks taper quantities incomplete without a sidewall angle, naming geometry.sidewall_angle', () => {
    const s = makeStructure('hole', { cd: 22 * nm, depth: 180 * nm, pitch: 64 * nm }, { array: 'square' });
    for (const name of ['geometry.bottom_cd', 'geometry.space', 'geometry.volume', 'geometry.closure_depth']) {
      const plan = buildPlan(s, name);
      expect(plan.status, name).toBe('incomplete');
      expect(plan.status === 'incomplete' ? plan.missing : [], name).toEqual(['geometry.sidewall_angle']);
    }
    // Quantities that do not need the angle are still computed: 180/22 = 8.1818 (hand).
    expectRel(q(s, 'geometry.aspect_ratio'), 180 / 22, 12);
  });

  it('lists every missing input of a hollow cylinder volume', () => {
    const s = makeStructure('cylinder', { cd: 30 * nm, pitch: 45 * nm }, { array: 'hexagonal' });
    const plan = buildPlan(s, 'geometry.volume');
    expect(plan.status === 'incomplete' ? plan.missing : []).toEqual(['geometry.height', 'geometry.sidewall_angle', 'geometry.wall']);
  });
});
