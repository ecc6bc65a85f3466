// Isolation engine: the abrupt junction's depletion width and the punch-through margin. Sources
// beside each check:
// - Sze & Ng, Physics of Semiconductor Devices, 3rd ed., ch. 2: W = √(2ε_s(V_bi − V − 2kT/q)/(qN)),
//   the −2kT/q a kT/q for each majority-carrier tail; worked by hand below;
// - an independent numerical method: the 1-D Poisson–Boltzmann equation across the junction,
//   solved by finite differences and Newton's method (no depletion approximation, no first
//   integral), with both carriers or with Sze's majority carriers only;
// - constants: q, k_B exact (SI 2019), ε₀ CODATA 2018; ε_Si = 11.9 and n_i = 9.65e9 cm⁻³ (Sze & Ng,
//   3rd ed., Appendix G [memory]).
import { describe, expect, it } from 'vitest';
import { evaluateStructure } from '../../src/checker/evaluate.ts';
import { EPS_SI, EPSILON_0 } from '../../src/engines/electrical/index.ts';
import { builtIn, depletionWidth } from '../../src/engines/electrical/isolation.ts';
import { QUANTITIES } from '../../src/engines/index.ts';
import { shapeOf } from '../../src/checker/plan.ts';
import { solveTridiagonal } from '../../src/engines/numeric.ts';
import type { Param } from '../../src/model/types.ts';
import { expectRel, makeStructure, nm } from '../helpers.ts';

const Q = 1.602176634e-19;
const VT = (1.380649e-23 * 300) / Q; // 0.025852 V
const NI = 9.65e15;
const EPS = 11.9 * 8.8541878128e-12;

/**
 * Hole-depleted width on the p side of an abrupt n⁺/p junction (donors nd, acceptors na, m⁻³) at
 * reverse bias vr, from the 1-D Poisson–Boltzmann equation u″ = −(p − n + N_D − N_A)/N_A in units of
 * k_BT/q and of the p side's Debye length, with flat quasi-Fermi levels (no current) and neutral
 * bulk at both ends. Finite differences on a grid graded from the junction, Newton's method with
 * steps clipped to one kT/q. `majority` keeps only holes on the p side and electrons on the n side,
 * the charge of Sze's derivation; `both` keeps every carrier. The width is the hole deficit
 * ∫(1 − p/N_A)dx over the p side: where an abrupt edge would hold the same depleted charge.
 */
function poissonBoltzmannWidth(nd: number, na: number, vr: number, carriers: 'majority' | 'both'): number {
  const debye = Math.sqrt((EPS * VT) / (Q * na));
  const v = vr / VT;
  const un = Math.log(nd / NI) + v;
  const up = -Math.log(na / NI);
  // Depletion-approximation widths (in Debye lengths of the p side) size the grid.
  const wp = Math.sqrt((2 * (un - up) * nd) / (nd + na));
  const heavy = Math.sqrt(na / nd); // the n side's Debye length, in the same unit
  const graded = (extent: number, hmin: number, hmax: number) => {
    const xs = [0];
    for (let h = hmin; xs.at(-1)! < extent; h = Math.min(hmax, h * 1.04)) xs.push(xs.at(-1)! + h);
    return xs;
  };
  const right = graded(wp + 40, 0.01 * heavy, 0.02);
  const left = graded((wp * na) / nd + 40 * heavy, 0.01 * heavy, 0.02 * heavy);
  const x = [...left.slice(1).reverse().map((t) => -t), ...right];
  const n = x.length;
  // Share of each node's control volume on the p side (the junction node is split).
  const pSide = x.map((xi, i) => (xi !== 0 ? Number(xi > 0) : (x[i + 1]! - xi) / (x[i + 1]! - x[i - 1]!)));
  const u = x.map((xi) => (xi <= 0 ? un : xi >= wp ? up : un + ((up - un) * xi) / wp));
  const ni = NI / na;
  const donors = nd / na;
  const both = carriers === 'both';
  for (let it = 0; it < 500; it++) {
    const a = new Float64Array(n);
    const b = new Float64Array(n);
    const c = new Float64Array(n);
    const r = new Float64Array(n);
    b[0] = 1;
    b[n - 1] = 1;
    for (let i = 1; i < n - 1; i++) {
      const hl = x[i]! - x[i - 1]!;
      const hr = x[i + 1]! - x[i]!;
      const s = 2 / (hl + hr);
      const f = pSide[i]!;
      const holes = ni * Math.exp(-u[i]!);
      const electrons = ni * Math.exp(u[i]! - v);
      const rho = f * (holes - 1 - (both ? electrons : 0)) + (1 - f) * (donors - electrons + (both ? holes : 0));
      const dRho = -f * (holes + (both ? electrons : 0)) - (1 - f) * (electrons + (both ? holes : 0));
      a[i] = s / hl;
      c[i] = s / hr;
      b[i] = -s * (1 / hl + 1 / hr) + dRho;
      r[i] = -(s * ((u[i + 1]! - u[i]!) / hr - (u[i]! - u[i - 1]!) / hl) + rho);
    }
    const step = solveTridiagonal(a, b, c, r);
    let largest = 0;
    for (let i = 0; i < n; i++) {
      const d = Math.max(-1, Math.min(1, step[i]!));
      u[i] = u[i]! + d;
      largest = Math.max(largest, Math.abs(d));
    }
    if (largest < 1e-11) break;
  }
  let w = 0;
  for (let i = 0; i < n - 1; i++) if (x[i]! >= 0) w += ((x[i + 1]! - x[i]!) * (2 - ni * Math.exp(-u[i]!) - ni * Math.exp(-u[i + 1]!))) / 2;
  return w * debye;
}

describe('silicon permittivity: one stated choice', () => {
  it('is 11.9·ε₀, the value Sze & Ng list for silicon at 300 K', () => {
    expect(EPS_SI / EPSILON_0).toBeCloseTo(11.9, 12);
  });
});

describe('depletion width of an abrupt junction (Sze & Ng ch. 2, with the −2kT/q of the majority-carrier tails)', () => {
  it('1e16 cm⁻³ against an n⁺ side of 1e20 cm⁻³, unbiased: 344.5 nm (hand)', () => {
    // V_bi = 0.025852 V · ln(1e22 · 1e26 / (9.65e15)²) = 0.025852 · ln(1.07385e16) = 0.025852 · 36.91262 = 0.954265 V;
    // V_bi − 2kT/q = 0.954265 − 0.051704 = 0.902561 V;
    // W = √(2 · 11.9 · 8.8541878e-12 · 0.902561 / (1.602177e-19 · 1e22) · 1e26/(1e26 + 1e22))
    //   = √(1.901964e-10 / 1602.177 / 1.0001) = √(1.186994e-13) = 344.53 nm.
    // (Without the −2kT/q, at 11.7·ε₀, the width was 351.29 nm: 2 % wide.)
    expect(builtIn(1e22)).toBeCloseTo(0.954265, 5);
    expectRel(depletionWidth(1e22, 0), 344.528e-9, 4);
  });

  it('2e17 cm⁻³ at 20 V: 371.07 nm (hand)', () => {
    // V_bi = 0.025852 · ln(2e23 · 1e26 / (9.65e15)²) = 0.025852 · 39.90828 = 1.031711 V;
    // W = √(2 · 11.9ε₀ · (1.031711 + 20 − 0.051704) / (q · 2e23) · 1e26/(1e26 + 2e23))
    //   = √(2.1072967e-10 · 20.980007 / 32043.53 / 1.002) = 371.07 nm.
    expectRel(depletionWidth(2e23, 20), 371.075e-9, 4);
  });

  it('a symmetric junction (1e16 cm⁻³ on both sides): the Poisson–Boltzmann width, −2kT/q included', () => {
    // Equal doping makes both majority-carrier tails full (each side drops well over kT/q), where
    // Sze's −2kT/q holds exactly. Without it the width would be 217.02 nm at 0 V and 422.64 nm at
    // 2 V (3.8 % and 1.0 % wide); the solver gives 209.04 nm and 418.60 nm.
    for (const vr of [0, 2]) {
      const reference = poissonBoltzmannWidth(1e22, 1e22, vr, 'both');
      expectRel(depletionWidth(1e22, vr, 1e22), reference, 3);
    }
  });

  it('against an n⁺ side of 1e20 cm⁻³: between the Poisson–Boltzmann widths with majority carriers only and with both', () => {
    // The heavy side's tail drops less than kT/q, so Sze's charge (majority carriers only) gives a
    // wider layer (−1.1 to −1.3 kT/q here); the n⁺ electrons spilling into the p side, counted
    // with both carriers, a narrower one. Sze's −2kT/q lies between them; without it (at 11.7·ε₀)
    // the widths were 351.29 nm and 81.68 nm, above both.
    // Solver: 1e16 → 349.03 nm (majority), 326.22 nm (both); 2e17 → 80.89 nm, 79.06 nm.
    for (const na of [1e22, 2e23]) {
      const w = depletionWidth(na, 0);
      expect(w).toBeLessThan(poissonBoltzmannWidth(1e26, na, 0, 'majority'));
      expect(w).toBeGreaterThan(poissonBoltzmannWidth(1e26, na, 0, 'both'));
    }
  });
});

describe('punch-through margin of an isolation trench', () => {
  const trench = (depth: number, cd: number) => {
    const s = makeStructure('trench', { cd, depth, pitch: 64 * nm, sidewall_angle: Math.PI / 2 }, { tags: ['isolation'] });
    const pos = { file: 'test', line: 1, column: 1 };
    const set = (name: string, value: number) => s.params.set(name, { name, value, unit: '1', written: String(value), origin: { type: 'handbook', pos } } satisfies Param);
    set('isolation.voltage', 20);
    set('isolation.doping', 2e23);
    set('isolation.breakdown_field', 1e9);
    s.isolation = true;
    return evaluateStructure(s).quantities['isolation.punchthrough_margin']!;
  };

  it('a trench about 217 nm deep and 20–30 nm wide isolates cells programmed at about 20 V (common practice)', () => {
    // Well doping 2e17 cm⁻³ (the demo handbook's, an assumption). Path 2·217 + 25 = 459 nm over
    // W(20 V) + W(0) = 371.07 + 80.20 = 451.28 nm (hand, above): 1.017 — just isolating.
    const m = trench(217 * nm, 25 * nm).value!;
    expect(m).toBeGreaterThan(0.95);
    expect(m).toBeLessThan(1.05);
    expectRel(m, 459 / 451.275, 4);
  });
});

describe('where the isolation quantities apply', () => {
  const names = ['isolation.field_in_fill', 'isolation.breakdown_margin', 'isolation.leakage_path', 'isolation.punchthrough_margin'];
  it('only to trenches, and a trench without an isolation block is incomplete for want of it', () => {
    const hole = makeStructure('hole', { cd: 25 * nm, depth: 217 * nm, pitch: 64 * nm, sidewall_angle: Math.PI / 2 }, { array: 'square' });
    const trench = makeStructure('trench', { cd: 25 * nm, depth: 217 * nm, pitch: 64 * nm, sidewall_angle: Math.PI / 2 });
    for (const name of names) {
      const q = QUANTITIES.get(name)!;
      expect(q.variant(shapeOf(hole)), name).toHaveProperty('notApplicable');
      expect(q.variant(shapeOf(trench)), name).toEqual({ incomplete: ['isolation'] });
      trench.isolation = true;
      expect(q.variant(shapeOf(trench)), name).toHaveProperty('compute');
      delete trench.isolation;
    }
  });

  it('has no punch-through value in a well too lightly doped for the junction model', () => {
    // V_bi = (kT/q)·ln(N·N⁺/n_i²) ≤ 2kT/q once N ≤ e²·n_i²/N⁺ = 7.389 · 9.312e31 / 1e26 = 6.9e6 m⁻³
    // (hand): at 1e6 m⁻³ ln(1.074) = 0.071 < 2; at 1e8 m⁻³ ln(107.4) = 4.68 > 2.
    const q = QUANTITIES.get('isolation.punchthrough_margin')!;
    const trench = makeStructure('trench', { cd: 25 * nm, depth: 217 * nm, pitch: 64 * nm, sidewall_angle: Math.PI / 2 });
    trench.isolation = true;
    const v = q.variant(shapeOf(trench));
    if (!('compute' in v)) throw new Error('expected a formula');
    expect(v.compute({ path: 459 * nm, n: 1e6, v: 0 })).toMatchObject({ value: null });
    expect(v.compute({ path: 459 * nm, n: 1e8, v: 0 })).toBeTypeOf('number');
  });
});
