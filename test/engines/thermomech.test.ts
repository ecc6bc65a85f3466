// Thermo-mechanics. Sources beside each check:
// - Smith, Phys. Rev. 94, 42 (1954): piezoresistance coefficients of silicon (published table);
// - the doping factor P(N, T): Richter, Pedersen & Thomsen's p-type fit (J. Appl. Phys. 104, 023715
//   (2008)) evaluated by hand, and held against Harley & Kenny's independent fit to the measured
//   p-type coefficients of Kerr, Tufte and Mason (J. Microelectromech. Syst. 9, 226 (2000) [memory
//   for volume and page]; credited so in Barlian et al., Proc. IEEE 97, 513 (2009), Fig. 12),
//   P = 0.2014·log10(1.53e22 cm⁻³/N, as transcribed in the PiezoD cantilever code);
// - the via stress against an independent finite-element solution of the axisymmetric
//   plane-strain elasticity equations with thermal strain (written in this test);
// - the materials table's silicon, loaded as a handbook reads it, against Hopcroft, Nix & Kenny's
//   published moduli (J. Microelectromech. Syst. 19, 229 (2010)) and against an anisotropic (001)
//   solution of the via edge stress (Stroh's formalism, ./anisotropic-silicon.ts);
// - silicon's biaxial moduli from its elastic constants (Hopcroft, Nix & Kenny 2010: 180.3 and
//   229.1 GPa for (001) and (111); the design references quote them rounded, 180.5 and 229);
// - Stoney's equation evaluated by hand (no textbook worked example was reachable);
// - the keep-out radius against the mobility map it is solved from.
import { loadHandbook } from '../../src/pipeline.ts';
import { beforeEach, describe, expect, it } from 'vitest';
import { evaluateRule, evaluateStructure, PlanCache } from '../../src/checker/evaluate.ts';
import { freeSlidingProtrusion, matrixStress, piezo, piezoFactor, SMITH, siliconBiaxialModulus, thermomechEngine, viaEdgeStress } from '../../src/engines/thermomech/index.ts';

import { MemorySource } from '../../src/model/memory-source.ts';
import { copperVia, expectRel, makeRule, makeStructure, um } from '../helpers.ts';
import { HOPCROFT_C, hillAverage, holeStiffness001, poissonOf, youngsAlong } from './anisotropic-silicon.ts';

describe('piezoresistance (Smith 1954, in 1e-11 /Pa)', () => {
  it('matches the published table', () => {
    expect([SMITH.n.p11, SMITH.n.p12, SMITH.n.p44].map((x) => Math.round(x * 1e12) / 10)).toEqual([-102.2, 53.4, -13.6]);
    expect([SMITH.p.p11, SMITH.p.p12, SMITH.p.p44].map((x) => Math.round(x * 1e12) / 10)).toEqual([6.6, -1.1, 138.1]);
  });
  it('rotates to <110>: π_L − π_T = π44 (Kanda 1982)', () => {
    const n = piezo('n110');
    expectRel(n.longitudinal - n.transverse, SMITH.n.p44, 12);
    expectRel(piezo('p110').longitudinal, (6.6e-11 - 1.1e-11 + 138.1e-11) / 2, 12);
    // n-type along <100>: π_L − π_T = π11 − π12 = −102.2 − 53.4 = −155.6 (Smith's table).
    expectRel(piezo('n100').longitudinal - piezo('n100').transverse, -155.6e-11, 12);
  });
});

describe('piezoresistance factor P(N, T)', () => {
  const cm3 = 1e6; // cm⁻³ → m⁻³

  it('follows Richter et al.’s p-type fit (worked by hand)', () => {
    // 300 K, 1e19 cm⁻³: (1e19/6e19)^0.43 = e^(−0.43·1.79176) = 0.46281; (1e19/7e20)^1.6 = e^(−1.6·4.24850)
    // = 0.0011167; P = 1/1.46393 = 0.68310.
    expect(piezoFactor('p110', 1e19 * cm3, 300)).toBeCloseTo(0.6831, 4);
    // 400 K, 1e18 cm⁻³: Θ = 4/3, Θ^−0.9 = 0.77192, Θ^−0.1 = 0.97164, (1/60)^0.43 = 0.17196,
    // Θ^−3 (1/700)^1.6 = 1.18e-5; P = 0.77192/1.16709 = 0.66138.
    expect(piezoFactor('p100', 1e18 * cm3, 400)).toBeCloseTo(0.6614, 4);
    // Heavy doping away from 300 K, where the third term counts. 400 K, 1e20 cm⁻³: Θ^−0.1·(1e20/6e19)^0.43
    // = 0.97164 · 1.24565 = 1.21032, Θ^−3·(1/7)^1.6 = 0.421875 · 0.044448 = 0.018751; P = 0.77189/2.22907
    // = 0.34628. 250 K, 3e20 cm⁻³: Θ = 5/6, Θ^−0.9 = 1.17832, Θ^−0.1 = 1.01840, 5^0.43 = 1.99783, so
    // 2.03458; Θ^−3 = 1.728, (3/7)^1.6 = 0.25778, so 0.44543; P = 1.17832/3.48001 = 0.33860.
    expect(piezoFactor('p110', 1e20 * cm3, 400)).toBeCloseTo(0.34628, 4);
    expect(piezoFactor('p110', 3e20 * cm3, 250)).toBeCloseTo(0.3386, 4);
  });

  it('agrees with Harley & Kenny’s fit to measured p-type coefficients at 300 K within 7 %', () => {
    // Harley & Kenny: P = 0.2014·log10(1.53e22/N): 0.8428 at 1e18, 0.6414 at 1e19, 0.5006 at 5e19,
    // 0.4400 at 1e20 cm⁻³ (hand). Two fits to different data: they differ by up to 6.5 % (at 1e19).
    for (const n of [1e18, 1e19, 5e19, 1e20]) {
      const measured = 0.2014 * Math.log10(1.53e22 / n);
      expect(Math.abs(piezoFactor('p110', n * cm3, 300) / measured - 1), `N = ${n}`).toBeLessThan(0.07);
    }
  });

  it('is 1 for light doping at 300 K (Smith’s coefficients) and scales n-type ⟨100⟩ as 300 K/T', () => {
    // Kanda normalises P to lightly doped silicon at 300 K; n-type π11 − π12 (valley repopulation) is
    // ∝ 1/kT when nondegenerate (Herring's many-valley model, common practice): 300/350 = 0.85714.
    // Richter's fit at 1e15 cm⁻³, 300 K: (1e15/6e19)^0.43 = e^(−0.43·11.0021) = 0.008821 → P = 0.99126.
    expect(piezoFactor('p110', 1e15 * cm3, 300)).toBeCloseTo(0.99126, 4);
    expect(piezoFactor('n100', 1e15 * cm3, 300)).toBe(1);
    expect(piezoFactor('n100', 1e15 * cm3, 350)).toBeCloseTo(0.85714, 5);
    // n-type π44 (the ⟨110⟩ difference) barely changes with N and T (Kanda & Matsuda 2007).
    expect(piezoFactor('n110', 1e17 * cm3, 350)).toBe(1);
  });
});

describe('stress around a via (cylinder in a matrix, plane strain)', () => {
  // The independent solution is a radial finite-element model (below), not the closed form.
  // Copper in silicon, isotropic: E 120/130 GPa, ν 0.34/0.28, α 16.7/2.6 ppm/K, ΔT = −300 K, a = 5 µm.
  const [E1, n1, a1, E2, n2, a2, dT, a] = [120e9, 0.34, 16.7e-6, 130e9, 0.28, 2.6e-6, -300, 5e-6];

  /**
   * Radial stress from an independent numerical solution: linear finite elements minimising the
   * strain energy ∫[½λ(ε_r + ε_θ)² + μ(ε_r² + ε_θ²) − (3λ + 2μ)αΔT(ε_r + ε_θ)]·r dr over a disc of
   * radius R = 100a (outer edge free, u(0) = 0), ε_r = u′, ε_θ = u/r, evaluated at element midpoints.
   */
  function radialStressFE(r: number): number {
    const R = 100 * a;
    const N = 8000;
    const h = R / N;
    const lame = (E: number, nu: number) => ({ l: (E * nu) / ((1 + nu) * (1 - 2 * nu)), m: E / (2 * (1 + nu)) });
    const matAt = (x: number) => (x < a ? { ...lame(E1, n1), alpha: a1 } : { ...lame(E2, n2), alpha: a2 });
    const diag = new Float64Array(N + 1);
    const off = new Float64Array(N);
    const f = new Float64Array(N + 1);
    for (let e = 0; e < N; e++) {
      const xm = (e + 0.5) * h;
      const { l, m, alpha } = matAt(xm);
      // ε_r = (u₂ − u₁)/h, ε_θ = (u₁ + u₂)/(2xm): B rows for (ε_r, ε_θ) on (u₁, u₂).
      const B = [
        [-1 / h, 1 / h],
        [1 / (2 * xm), 1 / (2 * xm)],
      ];
      const D = [
        [l + 2 * m, l],
        [l, l + 2 * m],
      ];
      const th = (3 * l + 2 * m) * alpha * dT;
      for (let p = 0; p < 2; p++) {
        for (let q = 0; q < 2; q++) {
          let k = 0;
          for (let i = 0; i < 2; i++) for (let j = 0; j < 2; j++) k += B[i]![p]! * D[i]![j]! * B[j]![q]!;
          k *= xm * h;
          if (p === q) diag[e + p] = diag[e + p]! + k;
          else if (p === 0) off[e] = off[e]! + k;
        }
        f[e + p] = f[e + p]! + th * (B[0]![p]! + B[1]![p]!) * xm * h;
      }
    }
    // u(0) = 0: drop the first equation.
    const n = N;
    const d = Array.from(diag.slice(1));
    const o = Array.from(off.slice(1));
    const rhs = Array.from(f.slice(1));
    for (let i = 1; i < n; i++) {
      const w = o[i - 1]! / d[i - 1]!;
      d[i] = d[i]! - w * o[i - 1]!;
      rhs[i] = rhs[i]! - w * rhs[i - 1]!;
    }
    const u = new Array<number>(n);
    u[n - 1] = rhs[n - 1]! / d[n - 1]!;
    for (let i = n - 2; i >= 0; i--) u[i] = (rhs[i]! - o[i]! * u[i + 1]!) / d[i]!;
    const node = (i: number) => (i === 0 ? 0 : u[i - 1]!);
    // σ_r at the midpoint of the matrix element that starts at r.
    const e = Math.round(r / h);
    const xm = (e + 0.5) * h;
    const { l, m, alpha } = matAt(xm);
    const er = (node(e + 1) - node(e)) / h;
    const et = (node(e) + node(e + 1)) / (2 * xm);
    return (l + 2 * m) * er + l * et - (3 * l + 2 * m) * alpha * dT;
  }

  it('equals the closed form at the edge and decays as (a/r)² (finite-element check)', () => {
    const s0 = viaEdgeStress(E1, n1, a1, E2, n2, a2, dT);
    // At the edge the closed form is evaluated half an element out, as the elements are.
    const h = (100 * a) / 8000;
    expect(Math.abs(radialStressFE(a) / ((s0 * a * a) / (a + h / 2) ** 2) - 1)).toBeLessThan(0.005);
    expect(Math.abs(radialStressFE(3 * a) / ((s0 * a * a) / (3 * a + h / 2) ** 2) - 1)).toBeLessThan(0.005);
    expect(s0).toBeGreaterThan(0); // cooling: copper pulls the silicon, radial tension
  });

  it('vanishes without a mismatch of (1 + ν)α and changes sign with the temperature change', () => {
    expect(viaEdgeStress(E1, 0.3, 5e-6, E2, 0.3, 5e-6, -300)).toBeCloseTo(0, 6);
    expectRel(viaEdgeStress(E1, n1, a1, E2, n2, a2, 300), -viaEdgeStress(E1, n1, a1, E2, n2, a2, -300), 12);
  });
});

/** A handbook with one copper via in plain table silicon, loaded as a user's handbook is. */
function tableVia(substrate: string) {
  const files = {
    'handbook.yaml': 'title: Via in table silicon\n',
    'rules/r.yaml': '- id: V-1\n  title: Via stress\n  applies_to: { kinds: [via] }\n  quantity: thermomech.via_stress\n  at_most: 1 GPa\n  rationale: Test rule.\n',
    'structures/via.yaml': [
      'id: via',
      'title: Copper via',
      'kind: via',
      'geometry: { cd: 10 um, depth: 100 um, pitch: 50 um, array: square }',
      'via: { conductor: { material: copper }, liner: { material: silicon-dioxide, thickness: 200 nm } }',
      'anneal: { temperature_change: -250 K }',
      `materials: { substrate: ${substrate} }`,
      '',
    ].join('\n'),
  };
  const r = loadHandbook(new MemorySource(files));
  if (!r.ok) throw new Error(JSON.stringify(r.diagnostics));
  return r.handbook.structures[0]!;
}

describe('the materials table’s silicon in the isotropic via model', () => {
  const s = tableVia('silicon');
  const value = (name: string) => s.params.get(name)!.value;

  it('hands the substrate Hopcroft’s ⟨100⟩ pair and the Voigt–Reuss–Hill isotropic stand-in', () => {
    // Published (Hopcroft, Nix & Kenny 2010): E⟨100⟩ 130, E⟨110⟩ 169, E⟨111⟩ 188 GPa; ν 0.28 for
    // ⟨100⟩/⟨010⟩, 0.064 for ⟨110⟩/⟨1-10⟩, 0.36 for ⟨110⟩/⟨001⟩ — here from the tensor computation
    // on their C11, C12, C44, to the published rounding.
    expect(youngsAlong([1, 0, 0]) / 1e9).toBeCloseTo(130, 0);
    expect(youngsAlong([1, 1, 0]) / 1e9).toBeCloseTo(169, 0);
    expect(youngsAlong([1, 1, 1]) / 1e9).toBeCloseTo(188, 0);
    expect(poissonOf([1, 0, 0], [0, 1, 0])).toBeCloseTo(0.28, 2);
    expect(Math.abs(poissonOf([1, 1, 0], [1, -1, 0]) - 0.064)).toBeLessThan(0.003); // 0.0622 unrounded
    expect(poissonOf([1, 1, 0], [0, 0, 1])).toBeCloseTo(0.36, 2);
    // The table: the [001] pair, and the Hill average as the isotropic stand-in (to its 4 digits).
    expectRel(value('materials.substrate.youngs_modulus'), youngsAlong([0, 0, 1]), 3);
    expectRel(value('materials.substrate.poisson_ratio'), poissonOf([0, 0, 1], [1, 0, 0]), 2);
    const hill = hillAverage();
    expectRel(value('materials.substrate.isotropic_youngs_modulus'), hill.e, 3);
    expectRel(value('materials.substrate.isotropic_poisson_ratio'), hill.nu, 2);
  });

  it('keeps an isotropic material’s own pair for isotropic models (no stand-in in the table)', () => {
    const glass = tableVia('silicon-dioxide');
    expect(glass.params.get('materials.substrate.isotropic_youngs_modulus')!.value).toBe(glass.params.get('materials.substrate.youngs_modulus')!.value);
    expect(glass.params.get('materials.substrate.isotropic_poisson_ratio')!.value).toBe(glass.params.get('materials.substrate.poisson_ratio')!.value);
  });

  it('puts the edge stress of a copper via within 0–6 % above the anisotropic (001) solution', () => {
    // Independent reference: the (001) plane of cubic silicon by Stroh's formalism. A circular
    // inclusion in that four-fold plane expands uniformly (Eshelby), so the matrix answers with a
    // uniform pressure p = κ·u/a; κ = 2μ for an isotropic plane (checked first). With ε_zz = 0 the
    // matrix's free in-plane strain is (1 + ν₃₁)αΔT, ν₃₁ = −S12/S11 = C12/(C11 + C12) = 0.27831.
    const lame = { c11: 60e9 + 2 * 40e9, c12: 60e9, c44: 40e9 };
    expectRel(holeStiffness001(lame).kappa, 80e9, 6);
    const { kappa, spread } = holeStiffness001();
    expect(spread).toBeLessThan(1e-9);
    expect(kappa / 1e9).toBeCloseTo(126.18, 1); // between 2(C11 − C12)/2 = 101.8 and 2C44 = 159.2 GPa
    const nu31 = HOPCROFT_C.c12 / (HOPCROFT_C.c11 + HOPCROFT_C.c12);
    const [e1, nu1, a1] = [value('via.conductor_youngs_modulus'), value('via.conductor_poisson_ratio'), value('via.conductor_thermal_expansion')];
    const k1 = e1 / ((1 + nu1) * (1 - 2 * nu1));
    const anisotropic = -((k1 * kappa) / (k1 + kappa)) * ((1 + nu1) * a1 - (1 + nu31) * value('materials.substrate.thermal_expansion')) * -250;
    // Copper 120 GPa/0.34/16.8 ppm/K: 419.7 MPa. The engine with the Hill stand-in: 438.3 MPa (+4.4 %);
    // with the table's former 169 GPa/0.064 (⟨110⟩ uniaxial) it was 502.6 MPa (+19.8 %), and the
    // (001) pair 130.1 GPa/0.278 gives 360.3 MPa (−14.2 %).
    expect(anisotropic / 1e6).toBeCloseTo(419.7, 0);
    const ratio = evaluateStructure(s).quantities['thermomech.via_stress']!.value! / anisotropic;
    expect(ratio).toBeGreaterThan(1);
    expect(ratio).toBeLessThan(1.06);
  });
});

describe('wafer bow (Stoney, biaxial)', () => {
  it('uses silicon biaxial moduli of 180.3 GPa (001) and 229.1 GPa (111)', () => {
    expect(siliconBiaxialModulus('001') / 1e9).toBeCloseTo(180.3, 0);
    expect(siliconBiaxialModulus('111') / 1e9).toBeCloseTo(229.1, 0);
  });
});

describe('keep-out radius and bow of a via structure', () => {
  const { s, set } = copperVia(50 * um, -300);
  set('keep_out.mobility_shift', 0.05);
  set('film.stress', 250e6);
  set('film.thickness', 0.8e-6);
  set('wafer.thickness', 775e-6);
  set('wafer.diameter', 0.3);
  set('wafer.bow_limit', 50e-6);
  // Before each test, not at load (DEVELOPERS.md, "Mutation testing").
  let q!: ReturnType<typeof evaluateStructure>['quantities'];
  beforeEach(() => {
    q = evaluateStructure(s).quantities;
  });

  it('puts the keep-out circle where the mobility map, rotated around the via, reaches the threshold', () => {
    // Map: σ_rr = σ₀(a/r)², σ_θθ = −σ_rr; for a channel along x at polar angle φ, σ_L = σ_xx =
    // σ_rr cos²φ + σ_θθ sin²φ, σ_T = σ_yy; Δμ/μ = −P(π_L σ_L + π_T σ_T). Scan φ at r = r_koz.
    const s0 = q['thermomech.via_stress']!.value!;
    for (const channel of ['n100', 'p110'] as const) {
      const { longitudinal, transverse } = piezo(channel);
      const factor = piezoFactor(channel, 1e21, 300);
      const r = q[`thermomech.keep_out_radius_${channel}`]!.value!;
      let worst = 0;
      for (let k = 0; k < 3600; k++) {
        const phi = (k / 3600) * 2 * Math.PI;
        const srr = s0 * (5e-6 / r) ** 2;
        const sxx = srr * Math.cos(phi) ** 2 - srr * Math.sin(phi) ** 2;
        const syy = srr * Math.sin(phi) ** 2 - srr * Math.cos(phi) ** 2;
        worst = Math.max(worst, factor * Math.abs(longitudinal * sxx + transverse * syy));
      }
      expectRel(worst, 0.05, 6);
    }
  });

  it('draws the map from the same stress tensor: grid values match the rotated tensor, and none beyond the circle exceeds the threshold', () => {
    const s0 = q['thermomech.via_stress']!.value!;
    const def = thermomechEngine.quantities.find((d) => d.name === 'thermomech.keep_out_radius_p110')!;
    const v = def.variant({ kind: 'via', via: true });
    if (!('compute' in v)) throw new Error('keep-out radius does not apply to a via');
    const out = v.compute({ s0, cd: 10e-6, limit: 0.05, doping: 1e21, temperature: 300 });
    const fig = typeof out === 'object' && 'figure' in out ? out.figure : undefined;
    if (fig?.type !== 'mobility-map') throw new Error('no mobility map');
    const { longitudinal, transverse } = piezo('p110');
    const factor = piezoFactor('p110', 1e21, 300);
    let inside = 0;
    for (let j = 0; j < fig.n; j++) {
      for (let i = 0; i < fig.n; i++) {
        const v = fig.values[j * fig.n + i];
        // Cell centres of an n × n grid over the square (the renderer draws cells of side 2·extent/n).
        const x = -fig.extent + ((i + 0.5) * 2 * fig.extent) / fig.n;
        const y = fig.extent - ((j + 0.5) * 2 * fig.extent) / fig.n;
        const r = Math.hypot(x, y);
        if (v === null || v === undefined) {
          expect(r).toBeLessThanOrEqual(5e-6 + 1e-12);
          continue;
        }
        const srr = s0 * (5e-6 / r) ** 2;
        const c = x / r;
        const sn = y / r;
        const sxx = srr * c * c - srr * sn * sn;
        const syy = srr * sn * sn - srr * c * c;
        expect(Math.abs(v - -factor * (longitudinal * sxx + transverse * syy))).toBeLessThan(1e-12);
        if (r > fig.keepOut) expect(Math.abs(v)).toBeLessThanOrEqual(0.05 + 1e-12);
        else if (Math.abs(v) > 0.05) inside++;
      }
    }
    expect(inside).toBeGreaterThan(0);
  });

  it('shrinks a p-channel keep-out zone with the channel doping by √P (Richter et al.)', () => {
    // Smith's coefficients hold for light doping only: at 1e19 cm⁻³ and 300 K, P = 0.68310 (worked
    // above), so r = a·√(0.68310·138.1e-11·|σ₀|/5 %), √(0.68310/0.99126) = 0.83013 of the light-doping
    // radius. Without the factor (the former model) the two radii were equal.
    const doped = copperVia(50 * um, -300);
    doped.set('keep_out.mobility_shift', 0.05);
    doped.set('keep_out.channel_doping', 1e25);
    const s0 = q['thermomech.via_stress']!.value!;
    const r = evaluateStructure(doped.s).quantities['thermomech.keep_out_radius_p110']!.value!;
    expectRel(r, 5e-6 * Math.sqrt((0.6831 * 138.1e-11 * Math.abs(s0)) / 0.05), 4);
    expectRel(r / q['thermomech.keep_out_radius_p110']!.value!, 0.83013, 4);
  });

  it('raises the conductor by the mismatch plus its Poisson push (hand: 211.5 nm × 1.36925 = 289.6 nm)', () => {
    // Free mismatch 14.1 ppm/K × 300 K × 50 µm = 211.5 nm; Poisson factor
    // 1 + (2·0.34/120)/(0.66/120 + 1.28/130) = 1 + 0.0056667/0.0153462 = 1.36925 (hand, GPa⁻¹ units).
    expect(q['thermomech.protrusion']?.value).toBeCloseTo(289.6e-9, 10);
  });

  it('matches rigid silicon and free expansion at the limits of the protrusion estimate', () => {
    // Rigid silicon (E₂ → ∞): factor (1 + ν₁)/(1 − ν₁); ν₁ = 0: no Poisson push, the free mismatch.
    expectRel(freeSlidingProtrusion(120e9, 0.34, 16.7e-6, 1e30, 0.28, 2.6e-6, 300, 50e-6), 211.5e-9 * (1.34 / 0.66), 9);
    expectRel(freeSlidingProtrusion(120e9, 0, 16.7e-6, 130e9, 0.28, 2.6e-6, 300, 50e-6), 211.5e-9, 9);
  });

  it('bows the wafer as Stoney’s equation says (hand: 124.7 µm for 250 MPa × 0.8 µm on 775 µm, 300 mm)', () => {
    // κ = 6·250e6·0.8e-6/(180.31e9·(775e-6)²) = 0.011081 /m; b = κ·(0.15 m)²/2 = 124.7 µm.
    const m = 165.7e9 + 63.9e9 - (2 * 63.9e9 * 63.9e9) / 165.7e9;
    const kappa = (6 * 250e6 * 0.8e-6) / (m * 775e-6 * 775e-6);
    expectRel(q['thermomech.wafer_bow']?.value, (kappa * 0.15 * 0.15) / 2, 12);
    expect(q['thermomech.wafer_bow']?.value).toBeCloseTo(124.7e-6, 7);
    expectRel(q['thermomech.bow_margin']?.value, 50e-6 / ((kappa * 0.15 * 0.15) / 2), 12);
  });
});

describe('the figures, formulas and scope of the via quantities', () => {
  const { s, set } = copperVia(50 * um, -300);
  set('keep_out.mobility_shift', 0.05);
  const variantOf = (name: string, shape: Parameters<(typeof thermomechEngine.quantities)[number]['variant']>[0] = { kind: 'via', via: true }) => {
    const v = thermomechEngine.quantities.find((d) => d.name === name)!.variant(shape);
    if (!('compute' in v)) throw new Error(`${name} does not apply`);
    return v;
  };
  const figureOf = (out: unknown) => (typeof out === 'object' && out !== null && 'figure' in out ? (out as { figure: { type: string } & Record<string, unknown> }).figure : undefined);

  it('falls off as (a/r)² outside the via, the hoop stress the negative of the radial (Lamé; Timoshenko & Goodier)', () => {
    expect(matrixStress(-80e6, 5e-6, 10e-6)).toEqual({ radial: -20e6, hoop: 20e6 });
    expect(matrixStress(-80e6, 5e-6, 5e-6)).toEqual({ radial: -80e6, hoop: 80e6 });
  });

  it('draws the stress profile from the via edge to ten radii: σ₀ at the edge, σ₀/100 at 10a', () => {
    const s0 = evaluateStructure(s).quantities['thermomech.via_stress']!.value!;
    const fig = figureOf(variantOf('thermomech.via_stress').compute({ e1: 120e9, nu1: 0.34, a1: 16.7e-6, e2: 130e9, nu2: 0.28, a2: 2.6e-6, dT: -300, cd: 10e-6, depth: 50e-6 }));
    expect(fig?.type).toBe('stress-profile');
    const points = fig!.points as Array<{ r: number; radial: number; hoop: number }>;
    expect(fig!.radius).toBe(5e-6);
    expect(points.length).toBe(61);
    expectRel(points[0]!.r, 5e-6, 12);
    expectRel(points[0]!.radial, s0, 12);
    expectRel(points[60]!.r, 50e-6, 12);
    expectRel(points[60]!.radial, s0 / 100, 12);
    expectRel(points[30]!.r, 27.5e-6, 12);
    for (const p of points) expectRel(p.hoop, -p.radial, 12);
  });

  it('maps a square 1.5 keep-out radii (at least three via radii) across, 41 × 41 cells, empty inside the via', () => {
    const args = (limit: number) => ({ s0: -100e6, cd: 10e-6, limit, doping: 1e21, temperature: 300 });
    const wide = variantOf('thermomech.keep_out_radius_p110').compute(args(0.05)) as { value: number; note: string; figure: Record<string, unknown> };
    expect(wide.figure.channel).toBe('p-channel ⟨110⟩');
    expect((wide.figure.values as unknown[]).length).toBe(41 * 41);
    expectRel(wide.figure.extent as number, 1.5 * Math.max(wide.value, 10e-6), 12);
    // A threshold the shift never reaches: the zone is the via itself and the map spans 1.5 × 2a.
    const none = variantOf('thermomech.keep_out_radius_p110').compute(args(0.9)) as { value: number; note: string; figure: Record<string, unknown> };
    expect(none.value).toBe(5e-6);
    expect(none.note).toBe('the shift stays under the threshold everywhere outside the via');
    expectRel(none.figure.extent as number, 15e-6, 12);
    expect(wide.note).toMatch(/along and across the channel/);
  });

  it('print each channel’s coefficient difference in its formula (Smith 1954): 155.6, 13.6, 7.7 and 138.1 × 10⁻¹¹ /Pa', () => {
    const expected = { n100: '155.6', n110: '13.6', p100: '7.7', p110: '138.1' };
    for (const [channel, diff] of Object.entries(expected)) {
      expect(variantOf(`thermomech.mobility_shift_${channel}`).formula).toContain(`${diff}\\times 10^{-11}`);
    }
    expect(variantOf('thermomech.mobility_shift_n100').formula).toContain('\\frac{300\\,\\mathrm{K}}{T}');
    expect(variantOf('thermomech.mobility_shift_p110').formula).toContain('\\Theta^{-3}');
  });

  it('name each channel in the titles: type, then direction', () => {
    const title = (name: string) => thermomechEngine.quantities.find((d) => d.name === name)!.title;
    expect(title('thermomech.mobility_shift_p110')).toBe('Mobility shift at the via edge, p-type channel along ⟨110⟩');
    expect(title('thermomech.keep_out_radius_n100')).toBe('Keep-out radius, n-type channel along ⟨100⟩');
  });

  it('print the wafer’s biaxial modulus in the bow formula: 180.3 GPa for (001), 229.1 GPa for (111)', () => {
    expect(variantOf('thermomech.wafer_bow', { kind: 'via', via: true }).formula).toContain('M_s(001) = 180.3');
    expect(variantOf('thermomech.wafer_bow', { kind: 'via', via: true, waferOrientation: '111' }).formula).toContain('M_s(111) = 229.1');
  });

  it('apply the via stress, shifts and keep-out zones to vias only', () => {
    const hole = makeStructure('hole', { cd: 1 * um, depth: 5 * um }, { array: 'square' });
    for (const name of ['thermomech.via_stress', 'thermomech.mobility_shift_n100', 'thermomech.keep_out_radius_p110', 'thermomech.protrusion']) {
      expect(evaluateRule(makeRule({ quantity: name, comparison: 'at_most', limit: 1 }), hole, new PlanCache()).status, name).toBe('not-applicable');
    }
  });
});

describe('validity of the bow, the threshold and the plane-strain via', () => {
  const warnings = (st: ReturnType<typeof copperVia>['s'], name: string) => evaluateStructure(st).quantities[name]?.outside_validity ?? [];

  it('holds plane strain from exactly three diameters deep', () => {
    expect(warnings(copperVia(30 * um, -100).s, 'thermomech.via_stress')).toEqual([]);
    expect(warnings(copperVia(29 * um, -100).s, 'thermomech.via_stress').join(' ')).toMatch(/plane strain/);
  });

  it('flags Stoney’s equation for a film over 1 % of the wafer thickness, not for a thin one', () => {
    const bow = (hf: number) => {
      const { s, set } = copperVia(50 * um, -300);
      set('film.stress', 250e6);
      set('film.thickness', hf);
      set('wafer.thickness', 775e-6);
      set('wafer.diameter', 0.3);
      set('wafer.bow_limit', 50e-6);
      return warnings(s, 'thermomech.wafer_bow').join(' ');
    };
    expect(bow(0.8e-6)).toBe('');
    expect(bow(10e-6)).toMatch(/1 % of the wafer thickness/);
  });

  it('flags a keep-out threshold above 20 % (outside linear piezoresistance) and a shift above 20 %', () => {
    const { s, set } = copperVia(50 * um, -300);
    set('keep_out.mobility_shift', 0.3);
    expect(warnings(s, 'thermomech.keep_out_radius_p110').join(' ')).toMatch(/threshold above 20 %/);
    // 138.1e-11 /Pa × 0.99 × |σ₀| of a few hundred MPa is above 20 % at the edge.
    expect(warnings(s, 'thermomech.mobility_shift_p110').join(' ')).toMatch(/20 % shift/);
    expect(warnings(s, 'thermomech.mobility_shift_n110')).toEqual([]);
  });

  it('leaves the bow margin unbounded above for a film without stress', () => {
    const { s, set } = copperVia(50 * um, -300);
    set('film.stress', 0);
    set('film.thickness', 0.8e-6);
    set('wafer.thickness', 775e-6);
    set('wafer.diameter', 0.3);
    set('wafer.bow_limit', 50e-6);
    expect(evaluateStructure(s).quantities['thermomech.bow_margin']).toMatchObject({ value: null, unbounded: 'above' });
  });
});

describe('validity flags on the verdict', () => {
  // Plane strain holds deep below the surface; a via under three diameters deep is flagged
  // (the classical solution's own assumption, Timoshenko & Goodier).
  const warningsFor = (depth: number) => {
    const { s } = copperVia(depth * um, -100);
    const v = evaluateRule(makeRule({ quantity: 'thermomech.via_stress', comparison: 'at_most', limit: 1e9 }), s, new PlanCache());
    return v.trace!.steps.flatMap((st) => st.warnings).join(' ');
  };
  it('flags a via shallower than three diameters and not a deep one', () => {
    expect(warningsFor(20)).toMatch(/plane strain/);
    expect(warningsFor(50)).toBe('');
  });

  const keepOutWarnings = (channel: string, doping: number, temperature: number) => {
    const { s, set } = copperVia(50 * um, -100);
    set('keep_out.mobility_shift', 0.05);
    set('keep_out.channel_doping', doping);
    set('keep_out.temperature', temperature);
    const v = evaluateRule(makeRule({ quantity: `thermomech.keep_out_radius_${channel}`, comparison: 'at_most', limit: 1e-3 }), s, new PlanCache());
    return v.trace!.steps.flatMap((st) => st.warnings).join(' ');
  };
  it('flags the piezoresistance factor outside its range: degenerate n-type, heavy p-type, far from room temperature', () => {
    // n-type ⟨100⟩ holds its nondegenerate 300 K/T up to about 1e17 cm⁻³; the p-type fit up to 1e20 cm⁻³;
    // both near room temperature. Inside: no flag.
    expect(keepOutWarnings('n100', 1e22, 300)).toBe('');
    expect(keepOutWarnings('n100', 1e24, 300)).toMatch(/degeneracy/);
    expect(keepOutWarnings('p110', 1e25, 350)).toBe('');
    expect(keepOutWarnings('p110', 3e26, 300)).toMatch(/1e20 cm⁻³/);
    expect(keepOutWarnings('p110', 1e21, 450)).toMatch(/room temperature/);
    // The other two channels: n-type π44 above 1e20 cm⁻³ (band tail), the p-type fit for ⟨100⟩ too.
    expect(keepOutWarnings('n110', 3e26, 300)).toMatch(/band tail/);
    expect(keepOutWarnings('n110', 1e25, 300)).toBe('');
    expect(keepOutWarnings('p100', 3e26, 300)).toMatch(/p-type fit/);
  });
});

