// Capillary-collapse engine. Checks, by source:
// - Roark's Formulas for Stress and Strain (Young & Budynas, 7th ed., Table 8.1): the span
//   coefficients, re-derived here by an independent shooting solution of E·I·w'' = M(x) integrated
//   numerically with the end conditions imposed (no table values are read back from the code);
// - the tapered free span against a cumulative double integration of the curvature M/(E·I) on a
//   fine grid (a different numerical method from the engine's unit-load Gauss–Legendre);
// - the line model in its prismatic limit against the closed forms of Tanaka, Morigami & Atoda,
//   Jpn. J. Appl. Phys. 32, 6059 (1993): ΔP = 2γcosθ/s, σ = (6γcosθ/s)(H/W)², and the cantilever
//   deflection 3γcosθ·H⁴/(E·s·W³) (Namatsu et al., Appl. Phys. Lett. 66, 2655 (1995), from memory);
// - the critical height H⁴ = E·W³·s²/(24γcosθ), derived in the engine's header (spring model) and
//   re-derived here by finding where δ(s − 2δ) = δ₁·s loses its root, numerically;
// - limits: no surface tension, a 90° contact angle, a support at the top;
// - the contact-angle dependence of both loads: Tanaka's line pressure ∝ cosθ, and the meniscus
//   force between vertical cylinders ∝ cos²θ (Kralchevsky & Nagayama, Langmuir 10, 23 (1994):
//   F = 2πγQ₁Q₂/L with capillary charges Q = r·sinψ_c, ψ_c = 90° − θ at a vertical wall), by hand;
// - the materials table's silicon, loaded as a handbook reads it, against the anisotropic moduli of
//   Hopcroft, Nix & Kenny's constants (J. Microelectromech. Syst. 19, 229 (2010)) computed by a
//   tensor method (./anisotropic-silicon.ts): E along [001] for a round body, the plane-strain
//   (plate) modulus for a line (Timoshenko & Woinowsky-Krieger, Theory of Plates and Shells, ch. 1).
// No published worked example of Tanaka's formula was reachable; the stress check evaluates the
// published closed form by hand instead. Lines in the closed-form checks have ν = 0, where the
// plate modulus is E itself.
import { loadHandbook } from '../../src/pipeline.ts';
import { describe, expect, it } from 'vitest';
import { evaluateRule, evaluateStructure, PlanCache } from '../../src/checker/evaluate.ts';
import { factorBeam, maxDeflection, meshBeam, peakStress, sectionAt, uniformLoad } from '../../src/engines/mechanics/beam.ts';

import { MemorySource } from '../../src/model/memory-source.ts';
import type { Param, Structure } from '../../src/model/types.ts';
import { deg, expectRel, makeRule, makeStructure, nm, um, variantOf } from '../helpers.ts';
import { plateModulusAlong, youngsAlong } from './anisotropic-silicon.ts';

// ── An independent beam solver ────────────────────────────────────────────────────────────────

type End = 'clamped' | 'pinned' | 'free';

/**
 * Deflection field of a prismatic beam of length L (E·I = 1) by shooting: w'' = M(x) with
 * M(x) = M0 + V0·x − (load moment), integrated twice with the trapezoid rule on n steps. The four
 * start values (w0, w0', M0, V0) are fixed by the end conditions; the problem is linear, so the two
 * unknowns follow from a 2×2 solve of basis solutions.
 */
function solveBeam(left: End, right: End, load: Load, L = 1, n = 20_000): number[] {
  const h = L / n;
  const run = (w0: number, t0: number, M0: number, V0: number, withLoad: boolean) => {
    const w = new Float64Array(n + 1);
    const t = new Float64Array(n + 1);
    const M = (x: number) => M0 + V0 * x - (withLoad ? load.moment(x) : 0);
    w[0] = w0;
    t[0] = t0;
    for (let i = 0; i < n; i++) {
      const x0 = i * h;
      const x1 = x0 + h;
      t[i + 1] = t[i]! + ((M(x0) + M(x1)) * h) / 2;
      // w' = t integrated with the exact quadratic of t over the step (Simpson on the midpoint).
      const tm = t[i]! + ((M(x0) + M(x0 + h / 2)) * h) / 4;
      w[i + 1] = w[i]! + ((t[i]! + 4 * tm + t[i + 1]!) * h) / 6;
    }
    const end = { w: w[n]!, t: t[n]!, M: M(L), V: V0 - (withLoad ? load.shear(L) : 0) };
    return { w, end };
  };
  // Unknown start values, by the left end: clamped → M0, V0; pinned → t0, V0; free → w0, t0 (M0 = V0 = 0).
  const unknowns: Array<'w0' | 't0' | 'M0' | 'V0'> = left === 'clamped' ? ['M0', 'V0'] : left === 'pinned' ? ['t0', 'V0'] : ['w0', 't0'];
  const residual = (r: { end: { w: number; t: number; M: number; V: number } }) => {
    if (right === 'clamped') return [r.end.w, r.end.t];
    if (right === 'pinned') return [r.end.w, r.end.M];
    return [r.end.M, r.end.V];
  };
  const start = (u: number[], withLoad: boolean) => {
    const s = { w0: 0, t0: 0, M0: 0, V0: 0 };
    unknowns.forEach((k, i) => (s[k] = u[i]!));
    return run(s.w0, s.t0, s.M0, s.V0, withLoad);
  };
  const r0 = residual(start([0, 0], true));
  const a = residual(start([1, 0], false));
  const b = residual(start([0, 1], false));
  const det = a[0]! * b[1]! - a[1]! * b[0]!;
  const u0 = (-r0[0]! * b[1]! + r0[1]! * b[0]!) / det;
  const u1 = (-a[0]! * r0[1]! + a[1]! * r0[0]!) / det;
  return Array.from(start([u0, u1], true).w);
}

const maxAbs = (xs: number[]) => xs.reduce((m, x) => Math.max(m, Math.abs(x)), 0);

/** Moment about x and resultant of the load on [0, x]: uniform w = 1, or a unit force at a. */
interface Load {
  moment: (x: number) => number;
  shear: (x: number) => number;
}
const uniform: Load = { moment: (x) => (x * x) / 2, shear: (x) => x };
const pointAt = (a: number): Load => ({ moment: (x) => Math.max(0, x - a), shear: (x) => (x >= a ? 1 : 0) });

// Roark's Formulas for Stress and Strain (Young & Budynas, 7th ed.), Table 8.1: maximum
// deflection coefficients for a prismatic span of length L, E·I = 1 (uniform load w = 1: cases
// 2a, 2e, 2c, 2d; unit point load at the free end of a cantilever, at mid-span otherwise: 1a, 1e,
// 1c, 1d). Published values; 2c is (39 + 55√33)/65536, which the table rounds to 1/185.
const ROARK = {
  uniform: { 'clamped-free': 1 / 8, 'pinned-pinned': 5 / 384, 'clamped-pinned': (39 + 55 * Math.sqrt(33)) / 65536, 'clamped-clamped': 1 / 384 },
  point: { 'clamped-free': 1 / 3, 'pinned-pinned': 1 / 48, 'clamped-pinned': 1 / (48 * Math.sqrt(5)), 'clamped-clamped': 1 / 192 },
} as const;

describe("the shooting solution reproduces Roark's Table 8.1", () => {
  const ends: Record<keyof typeof ROARK.uniform, [End, End]> = {
    'clamped-free': ['clamped', 'free'],
    'pinned-pinned': ['pinned', 'pinned'],
    'clamped-pinned': ['clamped', 'pinned'],
    'clamped-clamped': ['clamped', 'clamped'],
  };
  it.each(Object.keys(ends) as Array<keyof typeof ends>)('%s', (name) => {
    const [left, right] = ends[name];
    expectRel(maxAbs(solveBeam(left, right, uniform)), ROARK.uniform[name], 4);
    expectRel(maxAbs(solveBeam(left, right, name === 'clamped-free' ? pointAt(1) : pointAt(0.5))), ROARK.point[name], 4);
  });
  it('puts the propped cantilever maximum at 0.5785 L from the clamped end (Roark: 0.4215 L from the pin)', () => {
    const w = solveBeam('clamped', 'pinned', uniform);
    const i = w.reduce((best, x, k) => (Math.abs(x) > Math.abs(w[best]!) ? k : best), 0);
    expect(i / (w.length - 1)).toBeCloseTo((15 - Math.sqrt(33)) / 16, 3);
  });
});

// ── The finite-element body against those solutions ──────────────────────────────────────────

const unitSection = () => ({ width: 1, inertia: 1, fibre: 1 });

/** FE model of a prismatic body of height 1 with E·I = 1, supports at the given heights. */
function feBody(supports: number[], hold: 'pinned' | 'clamped', section: (z: number) => { width: number; inertia: number; fibre: number } = unitSection, height = 1, modulus = 1) {
  const model = meshBeam({ height, supports, hold, modulus, section });
  return { model, solver: factorBeam(model) };
}

const deflections = (model: { z: number[] }, u: Float64Array) => model.z.map((_, i) => u[2 * i]!);

describe('finite-element body', () => {
  it.each([
    ['a free cantilever (clamped–free)', [] as number[], 'pinned' as const, ['clamped', 'free'] as [End, End]],
    ['a span held at its top by a pinned lattice (clamped–pinned)', [1], 'pinned' as const, ['clamped', 'pinned'] as [End, End]],
    ['a span held at its top by a clamped lattice (clamped–clamped)', [1], 'clamped' as const, ['clamped', 'clamped'] as [End, End]],
  ])('matches the shooting solution under a uniform load: %s', (_name, supports, hold, [left, right]) => {
    const { model, solver } = feBody(supports, hold);
    const u = solver.solve(uniformLoad(model, () => 1));
    // The body reports its largest nodal deflection: within about 2e-4 of the continuous maximum.
    expectRel(maxAbs(deflections(model, u)), maxAbs(solveBeam(left, right, uniform)), 3);
  });

  it('gives F·L³/(3EI) for a force at the free top', () => {
    const { model, solver } = feBody([], 'pinned');
    const f = new Float64Array(2 * model.z.length);
    f[2 * (model.z.length - 1)] = 1;
    expectRel(solver.solve(f)[2 * (model.z.length - 1)], 1 / 3, 9);
  });

  it('finds the worst load position of a propped span beyond mid-span (shooting solution, scanned)', () => {
    // Force scanned along a clamped–pinned span: the worst deflection under the load is larger
    // than Roark's mid-span case 1/(48√5); both solvers must agree on it.
    const { model, solver } = feBody([1], 'pinned');
    let fe = 0;
    for (let i = 1; i < model.z.length - 1; i++) {
      const f = new Float64Array(2 * model.z.length);
      f[2 * i] = 1;
      fe = Math.max(fe, Math.abs(solver.solve(f)[2 * i]!));
    }
    let shoot = 0;
    for (let a = 0.3; a <= 0.8; a += 0.005) {
      const w = solveBeam('clamped', 'pinned', pointAt(a), 1, 4000);
      shoot = Math.max(shoot, Math.abs(w[Math.round(a * 4000)]!));
    }
    expectRel(fe, shoot, 3);
    expect(fe).toBeGreaterThan(ROARK.point['clamped-pinned']);
  });

  it('solves a continuous body: clamped base, a pinned lattice at 0.6 L, free top (superposition of cantilever cases)', () => {
    // Roark Table 8.1, cantilever: uniform load w gives y(x) = w·x²(6L² − 4Lx + x²)/(24EI); a force R
    // at a gives y(x) = R·x²(3a − x)/(6EI) for x ≤ a and R·a²(3x − a)/(6EI) beyond. The lattice
    // holds y(a) = 0, which fixes R; the tip then deflects y_w(L) − y_R(L). (E·I = 1, w = 1, L = 1.)
    const a = 0.6;
    const yw = (x: number) => (x * x * (6 - 4 * x + x * x)) / 24;
    const R = yw(a) / ((a * a * (3 * a - a)) / 6);
    const tip = yw(1) - (R * a * a * (3 - a)) / 6;
    const { model, solver } = feBody([a], 'pinned');
    const u = solver.solve(uniformLoad(model, () => 1));
    expectRel(u[2 * (model.z.length - 1)], tip, 8);
  });

  it('follows a taper: a line widening toward its root against a double integration of M/(E·I(x))', () => {
    // Line 10 nm at the top, 16 nm at the base, 100 nm tall, E = 169 GPa, ΔP = 5 MPa.
    const L = 100 * nm;
    const E = 169e9;
    const p = 5e6;
    const widthFromTip = (x: number) => 10 * nm + (6 * nm * x) / L;
    const n = 200_000;
    const h = L / n;
    let slope = 0;
    let defl = 0;
    const curvature = (x: number) => ((p * x * x) / 2) / (E * (widthFromTip(x) ** 3 / 12));
    for (let i = n; i > 0; i--) {
      const x1 = i * h;
      const x0 = x1 - h;
      const newSlope = slope + ((curvature(x1) + curvature(x0)) * h) / 2;
      defl += ((slope + newSlope) * h) / 2;
      slope = newSlope;
    }
    const { model, solver } = feBody([], 'pinned', (z) => sectionAt('line', widthFromTip(L - z)), L, E);
    const u = solver.solve(uniformLoad(model, () => p));
    // Mid-element E·I on 96 elements: second-order accurate, within a few parts in 10⁵.
    expectRel(u[2 * (model.z.length - 1)], defl, 4);
  });
});

describe('finite-element body: loads, moments, stresses and the mesh', () => {
  const tip = (model: { z: number[] }) => 2 * (model.z.length - 1);

  it('turns a moment at the free top into rotation M·L/EI and deflection M·L²/(2EI) (Roark Table 8.1, case 3a)', () => {
    const { model, solver } = feBody([], 'pinned');
    const f = new Float64Array(2 * model.z.length);
    f[tip(model) + 1] = 1;
    const u = solver.solve(f);
    expectRel(u[tip(model) + 1], 1, 9);
    expectRel(u[tip(model)], 1 / 2, 9);
  });

  it('carries a load growing linearly to the free top: tip deflection 11wL⁴/(120EI), root moment wL²/3 (Roark Table 8.1, case 2a; from memory, checked by superposition with the uniform 1/8)', () => {
    // Load w·z/L, zero at the clamped base. Its complement (zero at the top) gives wL⁴/(30EI) and
    // wL²/6: the two add to the uniform case, 15/120 and 1/2.
    const { model, solver } = feBody([], 'pinned');
    const load = (z: number) => z;
    const u = solver.solve(uniformLoad(model, load));
    // The load is taken at each element's mid-height: second order, about 1e-4 on 96 elements.
    expectRel(u[tip(model)], 11 / 120, 3);
    // The unit section has c/I = 1: the peak stress is the root moment.
    expectRel(peakStress(model, u, load), 1 / 3, 3);
    const down = (z: number) => 1 - z;
    const v = solver.solve(uniformLoad(model, down));
    expectRel(v[tip(model)], 1 / 30, 3);
    expectRel(peakStress(model, v, down), 1 / 6, 3);
  });

  it.each([
    ['a cantilever: wL²/2 at the root (Roark Table 8.1, case 2a)', [] as number[], 'pinned' as const, 1 / 2],
    ['a propped span: wL²/8 at the clamped end (case 2c)', [1], 'pinned' as const, 1 / 8],
    ['a span clamped at both ends: wL²/12 at the ends (case 2d)', [1], 'clamped' as const, 1 / 12],
  ])('gives the largest moment under a uniform load of %s', (_name, supports, hold, moment) => {
    const { model, solver } = feBody(supports, hold);
    const u = solver.solve(uniformLoad(model, () => 1));
    // Element end moments from K_e·u_e − f_e are exact at the nodes for a uniform load (to round-off
    // of the 96-element solve, a few parts in 10⁹).
    expectRel(peakStress(model, u, () => 1), moment, 7);
  });

  it('takes the load of each element at its mid-height: a load over the lower half of a cantilever (Roark Table 8.1, case 2a with the load ending at a)', () => {
    // Load w = 1 on 0 ≤ z < a = L/2 (a node): the root moment is w·a²/2 = 0.125; the tip deflects
    // w·a⁴/8 + (L − a)·w·a³/6 = w·a³(4L − a)/24 = 0.018229 (superposing the loaded part's end
    // deflection and rotation). Piecewise uniform per element, so the nodal values are exact.
    const { model, solver } = feBody([], 'pinned');
    const half = (z: number) => (z < 0.5 ? 1 : 0);
    const u = solver.solve(uniformLoad(model, half));
    expectRel(u[tip(model)], (0.125 * 3.5) / 24, 7);
    expectRel(peakStress(model, u, half), 0.125, 7);
  });

  it('finds the peak moment at an element’s upper end: a span clamped at both ends, loaded over its top quarter', () => {
    // Fixed-end moments of a point force P at x on a clamped span: P·x(L − x)²/L² at the base and
    // P·x²(L − x)/L² at the top (any structural analysis text); integrated over 0.75 ≤ x ≤ 1 (w = 1,
    // L = 1): 0.0042318 at the base, 1/12 − (0.75³/3 − 0.75⁴/4) = 0.0218099 at the top (the peak).
    const { model, solver } = feBody([1], 'clamped');
    const top = (z: number) => (z > 0.75 ? 1 : 0);
    const u = solver.solve(uniformLoad(model, top));
    expectRel(peakStress(model, u, top), 1 / 12 - (0.75 ** 3 / 3 - 0.75 ** 4 / 4), 7);
  });

  it.each([
    // σ = M·c/I with c the outer fibre (half the width) — any strength-of-materials text; M = wL²/2.
    ['a line: σ = 6M/W² per unit length', sectionAt('line', 20 * nm), (M: number) => (6 * M) / (20 * nm) ** 2],
    ['a solid round body: σ = 32M/(πD³)', sectionAt('solid-round', 30 * nm), (M: number) => (32 * M) / (Math.PI * (30 * nm) ** 3)],
    [
      'a tube of 30 nm with a 5 nm wall: σ = 32M·D/(π(D⁴ − Dᵢ⁴))',
      sectionAt('hollow-round', 30 * nm, 5 * nm),
      (M: number) => (32 * M * 30 * nm) / (Math.PI * ((30 * nm) ** 4 - (20 * nm) ** 4)),
    ],
  ])('turns the root moment into the outer-fibre stress of %s', (_name, section, sigma) => {
    const L = 200 * nm;
    const E = 169e9;
    const w = 1e-3; // N/m (a round body) or Pa (a line, per unit length)
    const { model, solver } = feBody([], 'pinned', () => section, L, E);
    const u = solver.solve(uniformLoad(model, () => w));
    expectRel(peakStress(model, u, () => w), sigma((w * L * L) / 2), 7);
  });

  it('finds the largest deflection and where it is: at the top of a cantilever, 0.5785 L up a propped span (Roark Table 8.1, cases 2a, 2c)', () => {
    const free = feBody([], 'pinned');
    const a = maxDeflection(free.model, free.solver.solve(uniformLoad(free.model, () => 1)));
    expectRel(a.value, 1 / 8, 9);
    expectRel(a.z, 1, 12);
    const propped = feBody([1], 'pinned');
    const b = maxDeflection(propped.model, propped.solver.solve(uniformLoad(propped.model, () => 1)));
    expectRel(b.value, ROARK.uniform['clamped-pinned'], 5);
    // Sampled at eight points per element of 1/96: within 1/768 of (15 − √33)/16.
    expect(Math.abs(b.z - (15 - Math.sqrt(33)) / 16)).toBeLessThan(1 / 768);
  });

  it('meshes at least the asked-for elements, one E·I and c/I per element', () => {
    const { model } = feBody([], 'pinned');
    expect(model.z.length).toBe(97);
    expect(model.z[0]).toBe(0);
    expect(model.z[96]).toBe(1);
    expect(model.ei.length).toBe(96);
    expect(model.stressPerMoment.length).toBe(96);
  });

  it('puts a node at a support between grid points, and merges one within a millionth of the height of a grid point', () => {
    const between = feBody([0.123], 'pinned').model;
    expect(between.z.length).toBe(98);
    const [base, support] = [...between.held.keys()];
    expect([base, between.z[support!]]).toEqual([0, 0.123]);
    const near = feBody([0.5 + 1e-9], 'pinned').model;
    expect(near.z.length).toBe(97);
    expect([...near.held.keys()]).toEqual([0, 48]);
  });

  it('ignores supports outside the body (at or below its base, above its top): the base stays clamped', () => {
    const { model, solver } = feBody([0, -0.2, 1.5], 'pinned');
    expect([...model.held.entries()]).toEqual([[0, 'clamped']]);
    expectRel(solver.solve(uniformLoad(model, () => 1))[tip(model)], 1 / 8, 9);
  });

  it('refuses a body without stiffness (E·I = 0): its stiffness matrix is singular', () => {
    const model = meshBeam({ height: 1, supports: [], hold: 'pinned', modulus: 0, section: unitSection });
    expect(() => factorBeam(model)).toThrow(/not positive definite/);
  });
});

// ── The line model in its prismatic limit ─────────────────────────────────────────────────────

/** A vertical line with a drying block: W, H, pitch in nm; E in Pa; γ in N/m. */
function line(W: number, H: number, pitch: number, E: number, gamma: number, contactDeg = 0, supports: number[] = []): Structure {
  const s = makeStructure('line', { cd: W * nm, height: H * nm, pitch: pitch * nm, sidewall_angle: Math.PI / 2 });
  addDrying(s, E, gamma, contactDeg, supports);
  return s;
}

function addDrying(s: Structure, E: number, gamma: number, contactDeg: number, supports: number[], strength = 1e9, poisson = 0): void {
  const pos = { file: 'test', line: 1, column: 1 };
  const set = (name: string, value: number, unit: string) =>
    s.params.set(name, { name, value, unit, written: String(value), origin: { type: 'handbook', pos } } satisfies Param);
  set('materials.body.youngs_modulus', E, 'Pa');
  set('materials.body.poisson_ratio', poisson, '1');
  set('materials.body.fracture_strength', strength, 'Pa');
  set('drying.surface_tension', gamma, 'N/m');
  set('drying.contact_angle', deg(contactDeg), 'rad');
  supports.forEach((z, i) => set(`drying.support_${i + 1}`, z, 'm'));
  s.drying = { liquid: 'test-liquid', supportCount: supports.length, supportHold: 'pinned' };
}

const q = (s: Structure, name: string) => evaluateStructure(s).quantities[name];

describe('line in water, vertical walls, no supports', () => {
  // W = 20 nm, H = 200 nm, pitch 60 nm (s = 40 nm), silicon E = 169 GPa, water γ = 0.072 N/m, θ = 0.
  const s = line(20, 200, 60, 169e9, 0.072);
  const [W, H, S, E, g] = [20 * nm, 200 * nm, 40 * nm, 169e9, 0.072];

  it('carries the Laplace pressure 2γcosθ/s = 3.6 MPa', () => {
    expectRel(q(s, 'mechanics.capillary_pressure')?.value, (2 * g) / S, 12);
    expectRel(q(s, 'mechanics.capillary_pressure')?.value, 3.6e6, 12);
  });

  it('has the root stress (6γcosθ/s)(H/W)² of Tanaka et al. = 1.08 GPa', () => {
    // 6·0.072/40e-9 · 10² = 1.08e9 Pa (hand).
    expectRel(q(s, 'mechanics.base_stress')?.value, ((6 * g) / S) * (H / W) ** 2, 7);
    expectRel(q(s, 'mechanics.base_stress')?.value, 1.08e9, 7);
  });

  it('deflects 3γcosθ·H⁴/(E·s·W³) at its tip', () => {
    expectRel(q(s, 'mechanics.tip_deflection')?.value, (3 * g * H ** 4) / (E * S * W ** 3), 7);
  });

  it('collapses above H_c = (E·W³·s²/(24γcosθ))^¼', () => {
    const Hc = ((E * W ** 3 * S ** 2) / (24 * g)) ** 0.25;
    expectRel(q(s, 'mechanics.critical_height')?.value, Hc, 7);
    expectRel(q(s, 'mechanics.collapse_margin')?.value, Hc / H, 7);
  });

  it('puts the instability where δ(s − 2δ) = δ₁·s stops having a root (found numerically)', () => {
    // Scan heights: the largest H whose load δ₁(H) = 3γH⁴/(E s W³) still allows an equilibrium.
    const hasEquilibrium = (h: number) => {
      const d1 = (3 * g * h ** 4) / (E * S * W ** 3);
      for (let d = 0; d <= S / 2; d += S / 20_000) if (d * (S - 2 * d) >= d1 * S) return true;
      return false;
    };
    let lo = 10 * nm;
    let hi = 2000 * nm;
    for (let i = 0; i < 60; i++) {
      const mid = (lo + hi) / 2;
      if (hasEquilibrium(mid)) lo = mid;
      else hi = mid;
    }
    expectRel(q(s, 'mechanics.critical_height')?.value, lo, 4);
  });

  it('names the whole height as the governing span', () => {
    const f = q(s, 'mechanics.free_length');
    expectRel(f?.value, H, 12);
    expect(f?.note).toMatch(/whole height/);
  });
});

describe('supports', () => {
  it('hold a line as one continuous body: a pinned lattice at 150 nm of 200 nm', () => {
    // Closed form by superposition of Roark's cantilever cases (E·I per unit length, w = ΔP):
    // y_w(x) = w·x²(6H² − 4Hx + x²)/(24EI); the lattice reaction R at a = 150 nm fixes y(a) = 0 with
    // y_R(x) = R·x²(3a − x)/(6EI) (x ≤ a), R·a²(3x − a)/(6EI) (x ≥ a). The largest |y| over the height
    // (scanned finely) sets δ₁, and the margin is ((s/8)/δ₁)^¼; the mesh samples it at its nodes.
    const [W, H, S, E, g, a] = [20 * nm, 200 * nm, 40 * nm, 169e9, 0.072, 150 * nm];
    const w = (2 * g) / S;
    const EI = (E * W ** 3) / 12;
    const yw = (x: number) => (w * x * x * (6 * H * H - 4 * H * x + x * x)) / (24 * EI);
    const yR = (x: number, R: number) => (x <= a ? (R * x * x * (3 * a - x)) / (6 * EI) : (R * a * a * (3 * x - a)) / (6 * EI));
    const R = yw(a) / yR(a, 1);
    let d1 = 0;
    let at = 0;
    for (let i = 0; i <= 100_000; i++) {
      const x = (H * i) / 100_000;
      const y = Math.abs(yw(x) - yR(x, R));
      if (y > d1) [d1, at] = [y, x];
    }
    // The 150 nm span below the lattice bulges more than the 50 nm free top: it governs.
    expect(at).toBeLessThan(a);
    expectRel(q(s150(), 'mechanics.tip_deflection')?.value, d1, 4);
    expectRel(q(s150(), 'mechanics.collapse_margin')?.value, (S / 8 / d1) ** 0.25, 4);
    expect(q(s150(), 'mechanics.free_length')?.note).toMatch(/from the base \(clamped\) to the support at 150 nm \(pinned\)/);
    expectRel(q(s150(), 'mechanics.free_length')?.value, 150 * nm, 9);
  });

  it('at the very top leave no free top: the body is held at both ends', () => {
    // Clamped–pinned over the whole height: Roark's δ_max = (39 + 55√33)/65536 · wH⁴/(EI).
    const s = line(20, 200, 60, 169e9, 0.072, 0, [200 * nm]);
    expect(q(s, 'mechanics.free_length')?.note).toMatch(/from the base \(clamped\) to the support at 200 nm \(pinned\)/);
    const Hc = ((169e9 * (20 * nm) ** 3 * (40 * nm) ** 2) / (24 * 0.072)) ** 0.25;
    const c = (39 + 55 * Math.sqrt(33)) / 65536;
    // Nodal sampling of the deflection on the mesh: agreement to about 1e-4.
    expectRel(q(s, 'mechanics.collapse_margin')?.value, (Hc * (1 / (8 * c)) ** 0.25) / (200 * nm), 4);
  });
});

const s150 = () => line(20, 200, 60, 169e9, 0.072, 0, [150 * nm]);

describe('a clamped lattice', () => {
  it('at the very top holds the body clamped at both ends: Roark’s δ_max = wH⁴/(384EI) (Table 8.1, case 2d)', () => {
    const s = line(20, 200, 60, 169e9, 0.072, 0, [200 * nm]);
    s.drying!.supportHold = 'clamped';
    const [W, H, S, E, g] = [20 * nm, 200 * nm, 40 * nm, 169e9, 0.072];
    const d1 = (((2 * g) / S) * H ** 4) / (384 * ((E * W ** 3) / 12));
    // Nodal sampling: the mid-span node is the maximum exactly (96 elements).
    expectRel(q(s, 'mechanics.tip_deflection')?.value, d1, 6);
    expect(q(s, 'mechanics.free_length')?.note).toMatch(/to the support at 200 nm \(clamped\)/);
  });
});

describe('supports: which span governs, and how the page names it', () => {
  it('two low lattices leave the 160 nm top free: it governs, from the upper lattice to the free top', () => {
    // Supports given out of order (40 nm, then 20 nm): the body is the same.
    const s = line(20, 200, 60, 169e9, 0.072, 0, [40 * nm, 20 * nm]);
    const f = q(s, 'mechanics.free_length');
    expect(f?.note).toBe('the span from the support at 40 nm (pinned) to the free top');
    expectRel(f?.value, 160 * nm, 9);
    const sorted = line(20, 200, 60, 169e9, 0.072, 0, [20 * nm, 40 * nm]);
    expect(q(s, 'mechanics.tip_deflection')?.value).toBe(q(sorted, 'mechanics.tip_deflection')?.value);
  });

  it('a lattice at mid-height and one at the top: the upper span, away from the clamped base, bends most', () => {
    // Two equal spans, clamped at the base, pinned at 100 and 200 nm: the span next to the clamp is
    // the stiffer one (a clamp restrains more than the continuity over a pin).
    const f = q(line(20, 200, 60, 169e9, 0.072, 0, [100 * nm, 200 * nm]), 'mechanics.free_length');
    expect(f?.note).toBe('the span from the support at 100 nm (pinned) to the support at 200 nm (pinned)');
    expectRel(f?.value, 100 * nm, 9);
  });

  it('label the variant by kind, supports and their hold, and show the load as ΔP on a line, F on a round body', () => {
    const one = line(20, 200, 60, 169e9, 0.072, 0, [100 * nm]);
    one.drying!.supportHold = 'clamped';
    expect(variantOf('mechanics.collapse_margin', one).label).toBe('line, 1 support (clamped)');
    expect(variantOf('mechanics.collapse_margin', one).symbols?.load).toBe('\\Delta P');
    expect(variantOf('mechanics.collapse_margin', one).symbols?.support_1).toBe('z_{1}');
    expect(variantOf('mechanics.collapse_margin', line(20, 200, 60, 169e9, 0.072, 0, [50 * nm, 100 * nm])).label).toBe('line, 2 supports (pinned)');
    const pillar = makeStructure('pillar', { cd: 30 * nm, height: 300 * nm, pitch: 90 * nm, sidewall_angle: Math.PI / 2 }, { array: 'square' });
    addDrying(pillar, 169e9, 0.072, 0, []);
    expect(variantOf('mechanics.collapse_margin', pillar).label).toBe('pillar, no supports');
    expect(variantOf('mechanics.collapse_margin', pillar).symbols?.load).toBe('F');
  });
});

describe('which capillary load applies', () => {
  const pillar = () => {
    const s = makeStructure('pillar', { cd: 30 * nm, height: 300 * nm, pitch: 90 * nm, sidewall_angle: Math.PI / 2 }, { array: 'square' });
    addDrying(s, 169e9, 0.072, 0, []);
    return s;
  };
  const status = (st: Structure, name: string) => evaluateRule(makeRule({ quantity: name, comparison: 'at_most', limit: 1 }), st, new PlanCache()).status;

  it('a line carries the Laplace pressure, not the meniscus force between round neighbours', () => {
    const s = line(20, 200, 60, 169e9, 0.072);
    expect(q(s, 'mechanics.capillary_pressure')?.value).toBeGreaterThan(0);
    expect(status(s, 'mechanics.meniscus_force')).toBe('not-applicable');
  });

  it('a pillar carries the meniscus force, not the Laplace pressure', () => {
    expect(q(pillar(), 'mechanics.meniscus_force')?.value).toBeGreaterThan(0);
    expect(status(pillar(), 'mechanics.capillary_pressure')).toBe('not-applicable');
  });

  it('an opening carries neither (a trench is long, but not standing); a standing body without a drying block lacks the liquid', () => {
    const hole = makeStructure('hole', { cd: 20 * nm, depth: 200 * nm, pitch: 60 * nm }, { array: 'square' });
    const trench = makeStructure('trench', { cd: 20 * nm, depth: 200 * nm, pitch: 60 * nm });
    for (const opening of [hole, trench]) {
      expect(status(opening, 'mechanics.capillary_pressure')).toBe('not-applicable');
      expect(status(opening, 'mechanics.meniscus_force')).toBe('not-applicable');
    }
    const dry = makeStructure('pillar', { cd: 30 * nm, height: 300 * nm, pitch: 90 * nm, sidewall_angle: Math.PI / 2 }, { array: 'square' });
    const bare = makeStructure('line', { cd: 20 * nm, height: 200 * nm, pitch: 60 * nm, sidewall_angle: Math.PI / 2 });
    expect(evaluateStructure(dry).incomplete['mechanics.meniscus_force']).toEqual(['drying.liquid']);
    expect(evaluateStructure(bare).incomplete['mechanics.capillary_pressure']).toEqual(['drying.liquid']);
  });
});



describe('limits', () => {
  it('no surface tension (drying without a liquid–vapour interface): no load, margin unbounded above', () => {
    const s = line(20, 200, 60, 169e9, 0);
    expect(q(s, 'mechanics.capillary_pressure')?.value).toBe(0);
    const m = q(s, 'mechanics.collapse_margin');
    expect(m?.value).toBeNull();
    expect(m?.unbounded).toBe('above');
    const v = evaluateRule(makeRule({ quantity: 'mechanics.collapse_margin', comparison: 'at_least', limit: 1.5 }), s, new PlanCache());
    expect(v.status).toBe('pass');
    expect(v.margin).toBeNull();
  });

  it('a 90° contact angle pulls nothing either', () => {
    const s = line(20, 200, 60, 169e9, 0.072, 90);
    expect(q(s, 'mechanics.capillary_pressure')?.value).toBe(0);
    expect(q(s, 'mechanics.collapse_margin')).toMatchObject({ value: null, unbounded: 'above' });
  });

  it('is incomplete without a drying block, and not applicable to openings', () => {
    const s = makeStructure('line', { cd: 20 * nm, height: 200 * nm, pitch: 60 * nm, sidewall_angle: Math.PI / 2 });
    expect(evaluateStructure(s).incomplete['mechanics.collapse_margin']).toEqual(['drying.liquid']);
    const hole = makeStructure('hole', { cd: 20 * nm, depth: 200 * nm, pitch: 60 * nm }, { array: 'square' });
    const v = evaluateRule(makeRule({ quantity: 'mechanics.collapse_margin', comparison: 'at_least', limit: 1 }), hole, new PlanCache());
    expect(v.status).toBe('not-applicable');
  });
});

describe('round bodies', () => {
  it('a body that narrows to nothing above its base has no collapse values', () => {
    // 40 nm top, 400 nm tall at 93°: base 40 − 2·400·tan 3° = 40 − 41.9 nm < 0.
    const s = makeStructure('pillar', { cd: 40 * nm, height: 400 * nm, pitch: 100 * nm, sidewall_angle: deg(93) }, { array: 'square' });
    addDrying(s, 169e9, 0.072, 0, []);
    for (const name of ['mechanics.collapse_margin', 'mechanics.base_stress', 'mechanics.stress_margin']) {
      expect(q(s, name)?.value, name).toBeNull();
      expect(q(s, name)?.unbounded, name).toBeUndefined();
    }
  });

  it('a pillar held at its top: the worst liquid level bends the clamped–pinned span most (shooting solution, scanned)', () => {
    // Prismatic, so the meniscus force F = 2πγ(CD/2)²/p is the same at every level; the largest
    // deflection under a point force scanned along a clamped–pinned span is F·H³/(E·I) times the
    // unit solution's largest w(a) at the force.
    const [cd, H, p, E, g] = [40 * nm, 400 * nm, 160 * nm, 169e9, 0.072];
    const s = makeStructure('pillar', { cd, height: H, pitch: p, sidewall_angle: Math.PI / 2 }, { array: 'square' });
    addDrying(s, E, g, 0, [H]);
    let shoot = 0;
    for (let a = 0.3; a <= 0.8; a += 0.005) {
      const w = solveBeam('clamped', 'pinned', pointAt(a), 1, 4000);
      shoot = Math.max(shoot, Math.abs(w[Math.round(a * 4000)]!));
    }
    const F = (2 * Math.PI * g * (cd / 2) ** 2) / p;
    expectRel(q(s, 'mechanics.tip_deflection')?.value, ((F * H ** 3) / (E * ((Math.PI * cd ** 4) / 64))) * shoot, 3);
  });

  it('an unsupported 30 nm × 2 µm titanium-nitride cylinder with a 15 nm gap collapses in water', () => {
    // Common practice: storage-node cylinders about 30 nm across and 2 µm tall cannot stand
    // unsupported. Pitch 45 nm leaves a 15 nm gap; wall 5 nm; E = 400 GPa; water 0.072 N/m.
    const s = makeStructure('cylinder', { cd: 30 * nm, height: 2 * um, pitch: 45 * nm, wall: 5 * nm, sidewall_angle: Math.PI / 2 }, { array: 'hexagonal' });
    addDrying(s, 400e9, 0.072, 0, []);
    // Immersion force 2π·0.072·(15 nm)²/45 nm = 2.2619e-9 N (hand); tip deflection F·L³/(3EI) with
    // I = π(30⁴ − 20⁴)/64 nm⁴ = 31,906.8 nm⁴: 472.6 nm, far beyond the 5 nm at which equilibrium is lost.
    const F = (2 * Math.PI * 0.072 * (15 * nm) ** 2) / (45 * nm);
    const I = (Math.PI * ((30 * nm) ** 4 - (20 * nm) ** 4)) / 64;
    expectRel(q(s, 'mechanics.meniscus_force')?.value, F, 12);
    expectRel(q(s, 'mechanics.tip_deflection')?.value, (F * (2 * um) ** 3) / (3 * 400e9 * I), 7);
    // Loss of equilibrium: δ* = min(s/2, p/4) = 7.5 nm, δ_crit = δ*(p − 2δ*)/p = 5 nm; L_c = L·(5 nm/δ₁)^⅓.
    const Lc = 2 * um * ((5 * nm) / ((F * (2 * um) ** 3) / (3 * 400e9 * I))) ** (1 / 3);
    expectRel(q(s, 'mechanics.critical_height')?.value, Lc, 7);
    expect(q(s, 'mechanics.collapse_margin')?.value).toBeLessThan(0.5);
  });
});

describe('validity flags', () => {
  const verdictFor = (cd: number, pitch: number) => {
    const s = makeStructure('pillar', { cd: cd * nm, height: 400 * nm, pitch: pitch * nm, sidewall_angle: Math.PI / 2 }, { array: 'square' });
    addDrying(s, 169e9, 0.072, 0, []);
    return evaluateRule(makeRule({ quantity: 'mechanics.collapse_margin', comparison: 'at_least', limit: 1 }), s, new PlanCache());
  };
  const warnings = (v: ReturnType<typeof verdictFor>) => v.trace!.steps.flatMap((st) => st.warnings);

  it('flag the immersion force in a dense array (CD/p above 0.5, where the linearised meniscus fails)', () => {
    // 40 nm on a 60 nm pitch: CD/p = 0.67 — Cooray, Cicuta & Vella (2012) on steep menisci.
    expect(warnings(verdictFor(40, 60)).join(' ')).toMatch(/order-of-magnitude estimate/);
  });

  it('hold the linearised meniscus up to CD/p = 0.5 exactly (40 nm on an 80 nm pitch)', () => {
    expect(warnings(verdictFor(40, 80))).toEqual([]);
    expect(warnings(verdictFor(41, 80)).join(' ')).toMatch(/order-of-magnitude estimate/);
  });

  it('stay quiet for a sparse array', () => {
    // 40 nm on a 200 nm pitch: CD/p = 0.2; 400 nm tall is ten widths.
    expect(warnings(verdictFor(40, 200))).toEqual([]);
  });
});

describe('validity flags and formulas of every collapse quantity', () => {
  const flags = (st: Structure, name: string) => (q(st, name)?.outside_validity ?? []).join(' ');
  const pillar = (cd: number, height: number) => {
    const st = makeStructure('pillar', { cd: cd * nm, height: height * nm, pitch: 4 * cd * nm, sidewall_angle: Math.PI / 2 }, { array: 'square' });
    addDrying(st, 169e9, 0.072, 0, []);
    return st;
  };

  it('flag the Laplace pressure across a gap of a few molecules (1.5 nm), not across 40 nm', () => {
    expect(flags(line(20, 200, 21.5, 169e9, 0.072), 'mechanics.capillary_pressure')).toMatch(/few molecules wide/);
    expect(flags(line(20, 200, 60, 169e9, 0.072), 'mechanics.capillary_pressure')).toBe('');
  });

  it('flag beam theory for a body no taller than twice its width, not for one ten widths tall', () => {
    expect(flags(pillar(100, 200), 'mechanics.tip_deflection')).toMatch(/several times taller than it is wide/);
    expect(flags(pillar(40, 400), 'mechanics.tip_deflection')).toBe('');
  });

  it('flag the margin of a span bent beyond a tenth of its length (a 10 nm line 2 µm tall bends 0.5 mm on paper), not of a stiff one', () => {
    // 3γH⁴/(E·s·W³) = 3 · 0.072 · (2 µm)⁴ / (169 GPa · 40 nm · (10 nm)³) = 0.51 mm (hand).
    expect(flags(line(10, 2000, 50, 169e9, 0.072), 'mechanics.collapse_margin')).toMatch(/exceeds a tenth of the span/);
    expect(flags(line(20, 200, 60, 169e9, 0.072), 'mechanics.collapse_margin')).toBe('');
  });

  it('leave the strength margin unbounded above when nothing bends the body', () => {
    expect(q(line(20, 200, 60, 169e9, 0), 'mechanics.stress_margin')).toMatchObject({ value: null, unbounded: 'above' });
  });

  it('show a line’s formulas (plate modulus, s/8, the half-width fibre) and a round body’s (the meniscus force F, δ_crit, the half-diameter fibre)', () => {
    const formula = (st: Structure, name: string) => variantOf(name, st).formula;
    const l = line(20, 200, 60, 169e9, 0.072);
    const r = pillar(40, 400);
    const markers: Record<string, [RegExp, RegExp]> = {
      'mechanics.free_length': [/z_\{above\}/, /z_\{above\}/],
      'mechanics.tip_deflection': [/E' = \\frac\{E\}\{1-\\nu\^2\}/, /F\\,\\delta\(z - z_F\)/],
      'mechanics.critical_height': [/L_c\^4 = \\frac\{E'\\,W\^3 s\^2\}/, /\\delta\^\* = \\min/],
      'mechanics.collapse_margin': [/s\/8/, /\\delta_\{crit\}/],
      'mechanics.base_stress': [/W\(z\)\/2/, /D\(z\)\/2/],
      'mechanics.stress_margin': [/\\sigma_f/, /\\sigma_f/],
    };
    for (const [name, [forLine, forRound]] of Object.entries(markers)) {
      expect(formula(l, name), name).toMatch(forLine);
      expect(formula(r, name), name).toMatch(forRound);
    }
    for (const name of ['mechanics.tip_deflection', 'mechanics.critical_height', 'mechanics.collapse_margin', 'mechanics.base_stress']) {
      expect(formula(l, name), name).not.toBe(formula(r, name));
    }
    // The critical length's derivation shows the span and the deflection that set it.
    expect(variantOf('mechanics.critical_height', l).inputs).toMatchObject({ length: 'mechanics.free_length', deflection: 'mechanics.tip_deflection' });
  });
});

describe('contact-angle dependence of the capillary loads', () => {
  it('a line’s Laplace pressure follows cosθ (Tanaka et al.): 1.8 MPa in water at 60° for a 40 nm gap', () => {
    // 2·0.072·cos 60°/40 nm = 0.072/40e-9 = 1.8e6 Pa (hand), half the 3.6 MPa at 0°.
    expectRel(q(line(20, 200, 60, 169e9, 0.072, 60), 'mechanics.capillary_pressure')?.value, 1.8e6, 9);
  });

  it('the meniscus force between round neighbours follows cos²θ (Kralchevsky & Nagayama): a quarter at 60°', () => {
    // 40 nm pillars on a 100 nm pitch in water: F(0°) = 2π·0.072·(20 nm)²/100 nm = 1.80956e-9 N;
    // at 60° both capillary charges r·cos θ halve, so F = 4.5239e-10 N — not the half a cosθ law gives.
    const force = (contactDeg: number) => {
      const s = makeStructure('pillar', { cd: 40 * nm, height: 400 * nm, pitch: 100 * nm, sidewall_angle: Math.PI / 2 }, { array: 'square' });
      addDrying(s, 169e9, 0.072, contactDeg, []);
      return q(s, 'mechanics.meniscus_force')?.value;
    };
    expectRel(force(0), 1.80956e-9, 5);
    expectRel(force(60), 4.5239e-10, 4);
    // A non-wetting liquid (120°): Q₁Q₂ = r²cos²θ > 0, the same attraction as at 60°.
    expectRel(force(120), 4.5239e-10, 4);
  });
});

/** A handbook with one structure drying from water in plain table silicon, loaded as a user's is. */
function tableSilicon(kind: 'line' | 'pillar') {
  const geometry = kind === 'line' ? '{ cd: 20 nm, height: 200 nm, pitch: 60 nm, sidewall_angle: 90 deg, length: 2 um }' : '{ cd: 40 nm, height: 400 nm, pitch: 200 nm, sidewall_angle: 90 deg, array: square }';
  const files = {
    'handbook.yaml': 'title: Table silicon\n',
    'rules/r.yaml': '- id: S-1\n  title: Stands\n  applies_to: {}\n  quantity: mechanics.collapse_margin\n  at_least: 1\n  rationale: Test rule.\n',
    'structures/s.yaml': `id: s\ntitle: Silicon ${kind}\nkind: ${kind}\ngeometry: ${geometry}\nmaterials: { body: silicon }\ndrying: { liquid: water, contact_angle: 0 deg }\n`,
  };
  const r = loadHandbook(new MemorySource(files));
  if (!r.ok) throw new Error(JSON.stringify(r.diagnostics));
  return r.handbook.structures[0]!;
}

describe('silicon from the materials table bends with the modulus along the wafer normal', () => {
  const gamma = 0.07197; // IAPWS R1-76 at 25 °C, the table's water

  it('holds the table to Hopcroft’s ⟨100⟩ values: E 130 GPa, ν 0.28', () => {
    const s = tableSilicon('pillar');
    expect(s.params.get('materials.body.youngs_modulus')!.value / 1e9).toBeCloseTo(130, 0);
    expect(s.params.get('materials.body.poisson_ratio')!.value).toBeCloseTo(0.28, 2);
    expectRel(s.params.get('materials.body.youngs_modulus')!.value, youngsAlong([0, 0, 1]), 3);
  });

  it('a pillar: its tip deflects F·H³/(3·E[001]·I) under the meniscus force at its top', () => {
    // E[001] from the compliance tensor: 130.13 GPa; the former table's 169 GPa (⟨110⟩) made the
    // deflection 0.770 of this.
    const s = tableSilicon('pillar');
    const F = (2 * Math.PI * gamma * (20 * nm) ** 2) / (200 * nm);
    const I = (Math.PI * (40 * nm) ** 4) / 64;
    expectRel(q(s, 'mechanics.tip_deflection')?.value, (F * (400 * nm) ** 3) / (3 * youngsAlong([0, 0, 1]) * I), 3);
  });

  it('a long line: 3γH⁴/(E′·s·W³) with the anisotropic plate modulus, exact along ⟨100⟩ and 2.5 % safe along ⟨110⟩', () => {
    // Plane strain along the line's length, stress along [001]: E′ = 1/(s_zz − s_zl²/s_ll) from the
    // compliance tensor, 141.06 GPa for a ⟨100⟩ line and 144.70 GPa for a ⟨110⟩ line. The former
    // table (169 GPa, no plate modulus) gave 0.835 of the ⟨100⟩ deflection.
    const s = tableSilicon('line');
    const deflection = q(s, 'mechanics.tip_deflection')!.value!;
    const closed = (e: number) => (3 * gamma * (200 * nm) ** 4) / (e * 40 * nm * (20 * nm) ** 3);
    expectRel(deflection, closed(plateModulusAlong([0, 0, 1], [1, 0, 0])), 3);
    const along110 = deflection / closed(plateModulusAlong([0, 0, 1], [1, 1, 0]));
    expect(along110).toBeGreaterThan(1);
    expect(along110).toBeLessThan(1.03);
  });
});
