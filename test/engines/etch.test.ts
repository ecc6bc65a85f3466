// Aspect-ratio-dependent etching. Sources beside each check:
// - Coburn & Winters, Appl. Phys. Lett. 55, 2730 (1989): ER/ER₀ = K/(K + S − K·S) and its limits
//   (S = 1 gives K; S → 0 gives no lag);
// - Cole's tube values (Livesey 1998, Table 2.5) for K at tabulated L/R;
// - a closed-form integral: with K(h) = 1/(1 + a·h) the time to depth is (D + S·a·D²/2)/ER₀;
// - calibration recovering the S that generated its points, and reporting a poor fit honestly.
import { describe, expect, it } from 'vitest';
import { evaluateRule, evaluateStructure, PlanCache } from '../../src/checker/evaluate.ts';
import { depthAfter, etchEngine, fitReactionProbability, frontTransmission, ionTransmission, rateRatio, synergyRatio, timeToDepth } from '../../src/engines/etch/index.ts';
import { QUANTITIES } from '../../src/engines/index.ts';
import { tubeTransmission } from '../../src/engines/transport/clausing.ts';
import { shapeOf } from '../../src/checker/plan.ts';
import type { Structure } from '../../src/model/types.ts';
import { seededRandom, transmissionMonteCarlo } from '../../src/engines/transport/montecarlo.ts';
import { deg, expectRel, makeRule, makeStructure, nm, setParam, um } from '../helpers.ts';

describe('Coburn–Winters rate ratio', () => {
  it('is the transmission itself when every molecule reacts (S = 1)', () => {
    for (const k of [0.9, 0.3, 0.02]) expectRel(rateRatio(k, 1), k, 12);
  });
  it('shows little lag for a small reaction probability', () => {
    // S = 0.001 at K = 0.190941 (L/R = 10), by hand: 0.190941/(0.190941 + 0.000809059)
    // = 0.190941/0.191750059 = 0.9957807.
    expectRel(rateRatio(0.190941, 0.001), 0.9957807, 6);
  });
});

describe('ion–neutral synergy (Langmuir-type coverage, Gottscho et al. 1992 review)', () => {
  it('reduces to Coburn–Winters when ions are plentiful (neutral-limited, ρ → 0)', () => {
    for (const [k, s] of [[0.2, 0.1], [0.05, 0.5]]) expectRel(synergyRatio(k!, s!, 1e-9, 1), rateRatio(k!, s!), 6);
  });
  it('shows no neutral lag when neutrals are plentiful (ion-limited, ρ → ∞): only ion shadowing remains', () => {
    expectRel(synergyRatio(0.05, 0.5, 1e9, 1), 1, 6);
    expectRel(synergyRatio(0.05, 0.5, 1e9, 0.6), 0.6, 6);
  });
  it('solves the coupled coverage and flux balance (checked by plain fixed-point iteration)', () => {
    // K = 0.5, s₀ = 0.5, ρ = 1, g = 1: iterate x ← K/(K + s₀(1 − θ)(1 − K)), θ = ρx/(ρx + g).
    let x = 1;
    for (let i = 0; i < 200; i++) x = 0.5 / (0.5 + 0.5 * (1 - x / (x + 1)) * 0.5);
    const ratio = x / (x + 1) / 0.5;
    expectRel(synergyRatio(0.5, 0.5, 1, 1), ratio, 9);
    expect(ratio).toBeCloseTo(0.877, 3); // by hand: x ≈ 0.781, θ ≈ 0.4385
  });
  it('passes ions through a round opening as an independent ray count does', () => {
    // Rays enter a disk of diameter 1 at Rayleigh-distributed polar angles (σ = 3°) and random
    // azimuths; those landing within the bottom disk after a depth h pass (seeded count).
    const sigma = (3 * Math.PI) / 180;
    const rnd = seededRandom(12345);
    for (const h of [2, 10]) {
      let pass = 0;
      const n = 100_000;
      for (let i = 0; i < n; i++) {
        const r = 0.5 * Math.sqrt(rnd());
        const phi = 2 * Math.PI * rnd();
        const alpha = sigma * Math.sqrt(-2 * Math.log(1 - rnd()));
        const psi = 2 * Math.PI * rnd();
        const x = r * Math.cos(phi) + h * Math.tan(alpha) * Math.cos(psi);
        const y = r * Math.sin(phi) + h * Math.tan(alpha) * Math.sin(psi);
        if (x * x + y * y <= 0.25) pass++;
      }
      const p = pass / n;
      expect(Math.abs(ionTransmission(1, h, sigma) - p), `h = ${h}`).toBeLessThan(3 * Math.sqrt((p * (1 - p)) / n) + 1e-3);
    }
  });
  it('passes ions through a long slot as an independent ray count does (only the cross-trench shift counts)', () => {
    // Rays enter a slot of width 1 at a uniform position across it, at Rayleigh-distributed polar
    // angles and uniform azimuths; those still inside the slot's width after a depth h pass.
    const rnd = seededRandom(2718);
    for (const [h, deg] of [[10, 2], [10, 5], [3, 8]] as const) {
      const sigma = (deg * Math.PI) / 180;
      let pass = 0;
      const n = 100_000;
      for (let i = 0; i < n; i++) {
        const x0 = rnd();
        const alpha = sigma * Math.sqrt(-2 * Math.log(1 - rnd()));
        const x = x0 + h * Math.tan(alpha) * Math.cos(2 * Math.PI * rnd());
        if (x >= 0 && x <= 1) pass++;
      }
      const p = pass / n;
      expect(Math.abs(ionTransmission(1, h, sigma, true) - p), `h = ${h}, σ = ${deg}°`).toBeLessThan(3 * Math.sqrt((p * (1 - p)) / n) + 1e-3);
    }
  });
  it('matches an independent azimuthal quadrature for a slot at w/h = 1/10', () => {
    // Values from the independent review's quadrature over polar angle and azimuth (σ = 2°: 0.722,
    // σ = 5°: 0.412); the full polar shift h·tanα, the round-hole rule, would give 0.564 and 0.181.
    expect(ionTransmission(1, 10, (2 * Math.PI) / 180, true)).toBeCloseTo(0.722, 3);
    expect(ionTransmission(1, 10, (5 * Math.PI) / 180, true)).toBeCloseTo(0.412, 3);
  });
});

describe('depth integration', () => {
  const a = 1 / (100 * nm); // K = 1/(1 + h/100 nm)
  const K = (h: number) => 1 / (1 + a * h);
  const er0 = 5e-9; // 300 nm/min
  const S = 0.2;
  it('matches the closed form t = (D + S·a·D²/2)/ER₀ for K = 1/(1 + a·h)', () => {
    for (const D of [50 * nm, 1 * um, 3 * um]) expectRel(timeToDepth(D, er0, (h) => rateRatio(K(h), S)), (D + (S * a * D * D) / 2) / er0, 10);
  });
  it('inverts it: D(t) = (√(1 + 2·S·a·ER₀·t) − 1)/(S·a)', () => {
    const t = 600;
    expectRel(depthAfter(t, er0, (h) => rateRatio(K(h), S), 1e-3), (Math.sqrt(1 + 2 * S * a * er0 * t) - 1) / (S * a), 9);
  });
});

describe('calibration', () => {
  // Points generated with S = 0.05 on round holes at AR 2.5, 5, 10, 20 (L/R = 5, 10, 20, 40), where
  // Cole's table gives K exactly: 0.310525, 0.190941, 0.109304, 0.059422.
  const er0 = 5e-9;
  const K = { 2.5: 0.310525, 5: 0.190941, 10: 0.109304, 20: 0.059422 } as const;
  const points = Object.entries(K).map(([ar, k]) => ({ ar: Number(ar), rate: er0 * (k / (k + 0.05 - k * 0.05)) }));
  it('recovers the reaction probability that generated the points', () => {
    const fit = fitReactionProbability(false, er0, points);
    expectRel(fit.s, 0.05, 4);
    expect(fit.residual).toBeLessThan(1e-4);
  });
  it('reports a poor fit when the rates do not fall with aspect ratio as the model says', () => {
    const flat = points.map((p, i) => ({ ar: p.ar, rate: er0 * (i % 2 === 0 ? 0.95 : 0.3) }));
    expect(fitReactionProbability(false, er0, flat).residual).toBeGreaterThan(0.2);
  });
});

/** A hole with an etch block, in SI. */
function etchedHole(geometry: Record<string, number>, etch: Record<string, number>, kind: 'hole' | 'trench' = 'hole'): Structure {
  const s = makeStructure(kind, geometry, kind === 'hole' ? { array: 'square' } : {});
  for (const [k, v] of Object.entries({ mask_thickness: 0, ...etch })) setParam(s, `etch.${k}`, v);
  s.etch = { calibrationPoints: 0 };
  return s;
}

/** Write measured (aspect ratio, rate) points into a structure's etch block. */
function calibrate(s: Structure, points: Array<[number, number]>, ion?: { spread: boolean }): Structure {
  points.forEach(([ar, rate], i) => {
    setParam(s, `etch.calibration_${i + 1}_aspect_ratio`, ar);
    setParam(s, `etch.calibration_${i + 1}_rate`, rate);
  });
  s.etch = { calibrationPoints: points.length, ...(ion ? { ion } : {}) };
  return s;
}
const value = (s: Structure, q: string) => evaluateStructure(s).quantities[q];

describe('calibration the model cannot follow (regression: the fit was pinned at 1e-6 silently)', () => {
  const calibrated = (rates: [number, number]) => {
    const s = etchedHole({ cd: 100 * nm, depth: 2000 * nm, sidewall_angle: Math.PI / 2 }, { open_rate: 5e-9, time_budget: 600 });
    return value(calibrate(s, [[5, rates[0]], [20, rates[1]]]), 'etch.fitted_reaction_probability')!;
  };
  it('has no fitted probability when a point is faster than the open field (6.67e-9 and 8.33e-9 m/s over 5e-9)', () => {
    expect(calibrated([400e-9 / 60, 500e-9 / 60]).value).toBeNull();
    expect(calibrated([400e-9 / 60, 500e-9 / 60]).reason).toMatch(/above the open-field rate/);
  });
  it('has none when the points fall less than any probability gives (both at the open rate: only S = 0 fits)', () => {
    expect(calibrated([5e-9, 5e-9]).value).toBeNull();
    expect(calibrated([5e-9, 5e-9]).reason).toMatch(/low edge/);
  });
  it('fits points that fall as the model says', () => {
    // Cole's K at L/R = 10 and 40 (AR 5 and 20): 0.190941 and 0.059422, S = 0.05.
    const rate = (k: number) => 5e-9 * (k / (k + 0.05 - k * 0.05));
    expectRel(calibrated([rate(0.190941), rate(0.059422)]).value, 0.05, 3);
  });
});

describe('etch quantities of a structure', () => {
  it('vertical walls, no mask: the rate ratio is exactly Coburn–Winters with Cole’s transmission', () => {
    // 80 nm hole, 800 nm deep: L/R = 20, K = 0.109304 (Cole); S = 0.2 → 0.109304/(0.109304 + 0.2 − 0.0218608).
    const s = etchedHole({ cd: 80 * nm, depth: 800 * nm, sidewall_angle: Math.PI / 2 }, { open_rate: 5e-9, reaction_probability: 0.2, time_budget: 600 });
    expectRel(value(s, 'transport.transmission')?.value, 0.109304, 6);
    expectRel(value(s, 'etch.bottom_rate_ratio')?.value, 0.109304 / (0.109304 + 0.2 - 0.2 * 0.109304), 6);
  });

  it('never reaches a depth below where its taper closes: no time, no margin, a failing verdict', () => {
    // 80 nm at 89°: closes at 40 nm·tan 89° = 2.29 µm < 3 µm.
    const s = etchedHole({ cd: 80 * nm, depth: 3 * um, sidewall_angle: deg(89) }, { open_rate: 5e-9, reaction_probability: 0.2, time_budget: 600 });
    expect(value(s, 'etch.time_to_depth')).toMatchObject({ value: null, unbounded: 'above' });
    expect(value(s, 'etch.time_margin')?.value).toBeNull();
    const v = evaluateRule(makeRule({ quantity: 'etch.time_margin', comparison: 'at_least', limit: 1 }), s, new PlanCache());
    expect(v.status).toBe('fail');
    expect(value(s, 'etch.depth_in_budget')?.value).toBeLessThan(2.2915 * um);
  });

  it('has no lag without a wider reference (a narrower one is refused, not a negative lag)', () => {
    const s = etchedHole({ cd: 80 * nm, depth: 800 * nm, sidewall_angle: Math.PI / 2 }, { open_rate: 5e-9, reaction_probability: 0.2, time_budget: 600, reference_cd: 60 * nm });
    expect(value(s, 'etch.lag')?.value).toBeNull();
  });

  it('lags a wider feature more the more its molecules react (S = 0.5 against 0.05)', () => {
    const lag = (S: number) =>
      value(etchedHole({ cd: 80 * nm, depth: 800 * nm, sidewall_angle: Math.PI / 2 }, { open_rate: 5e-9, reaction_probability: S, time_budget: 600, reference_cd: 800 * nm }), 'etch.lag')!.value!;
    expect(lag(0.5)).toBeGreaterThan(lag(0.05));
    expect(lag(0.05)).toBeGreaterThan(0);
  });

  it('inverts time to depth even when the budget is far longer than the etch needs', () => {
    const K = (h: number) => 1 / (1 + h / (100 * nm));
    const r = (h: number) => rateRatio(K(h), 0.2);
    const t = 1e12;
    const d = depthAfter(t, 5e-9, r, 5e-9 * t);
    expectRel(timeToDepth(d, 5e-9, r), t, 8);
  });

  it('stops between AR 10 and 20 when every molecule reacts and the stop is a tenth of the open rate', () => {
    // S = 1: the ratio is K; K = 0.1 lies between Cole's L/R = 20 (0.109) and 40 (0.059), i.e. AR 10–20.
    const s = etchedHole({ cd: 80 * nm, depth: 800 * nm, sidewall_angle: Math.PI / 2 }, { open_rate: 5e-9, reaction_probability: 1, time_budget: 600, stop_fraction: 0.1 });
    const ar = value(s, 'etch.stop_aspect_ratio')!.value!;
    expect(ar).toBeGreaterThan(10);
    expect(ar).toBeLessThan(20);
  });

  it('reaches the open-field depth in the budget when nothing reacts at the walls’ expense (S → 0)', () => {
    const s = etchedHole({ cd: 80 * nm, depth: 800 * nm, sidewall_angle: Math.PI / 2 }, { open_rate: 5e-9, reaction_probability: 1e-6, time_budget: 60 });
    expectRel(value(s, 'etch.depth_in_budget')?.value, 300 * nm, 3);
  });
});

// ── Checks added with mutation testing: each against an outside number ────────────────────────

/** ∫ₐᵇ f by composite Simpson on n (even) intervals: an independent quadrature. */
function simpson(f: (x: number) => number, a: number, b: number, n = 4000): number {
  const h = (b - a) / n;
  let sum = f(a) + f(b);
  for (let i = 1; i < n; i++) sum += (i % 2 ? 4 : 2) * f(a + i * h);
  return (sum * h) / 3;
}
const rayleigh = (sigma: number) => (alpha: number) => (alpha / (sigma * sigma)) * Math.exp(-(alpha * alpha) / (2 * sigma * sigma));
/** Mean of tan α over a Rayleigh spread of width σ (Simpson over 0…12σ). */
const meanTan = (sigma: number) => simpson((x) => rayleigh(sigma)(x) * Math.tan(x), 0, 12 * sigma);

describe('ion transmission against a direct quadrature over polar angle and azimuth', () => {
  // The slot passes an ion when its cross-trench shift d·|cos ψ| (d = h·tanα/w) is under 1:
  // average max(0, 1 − d|cos ψ|) over ψ ∈ [0, π/2] and α ∈ [0, min(12σ, π/2)] by 2-D Simpson,
  // without the azimuthal closed form the engine uses.
  const slotQuadrature = (hOverW: number, sigma: number) =>
    simpson(
      (alpha) => rayleigh(sigma)(alpha) * simpson((psi) => Math.max(0, 1 - hOverW * Math.tan(alpha) * Math.abs(Math.cos(psi))), 0, Math.PI / 2, 800) / (Math.PI / 2),
      0,
      Math.min(12 * sigma, Math.PI / 2 - 1e-9),
      1600,
    );
  // The round hole passes the overlap of the aperture and its image shifted by s = h·tanα: the
  // circle–circle intersection area 2r²·acos(s/2r) − (s/2)·√(4r² − s²) over πr² (r = w/2).
  const holeQuadrature = (w: number, h: number, sigma: number) => {
    const r = w / 2;
    const overlap = (s: number) => (s >= 2 * r ? 0 : (2 * r * r * Math.acos(s / (2 * r)) - (s / 2) * Math.sqrt(4 * r * r - s * s)) / (Math.PI * r * r));
    return simpson((alpha) => rayleigh(sigma)(alpha) * overlap(h * Math.tan(alpha)), 0, Math.min(12 * sigma, Math.PI / 2 - 1e-9), 8000);
  };

  it.each([
    [10, 2],
    [10, 5],
    [1, 2],
    [3, 8],
    [0.5, 20],
  ])('slot of depth %s widths, σ = %s°', (hOverW, sigmaDeg) => {
    expectRel(ionTransmission(1, hOverW, deg(sigmaDeg), true), slotQuadrature(hOverW, deg(sigmaDeg)), 5);
  });
  it.each([
    [2, 3],
    [10, 3],
    [1, 10],
  ])('round hole of depth %s diameters, σ = %s°', (hOverW, sigmaDeg) => {
    expectRel(ionTransmission(1, hOverW, deg(sigmaDeg)), holeQuadrature(1, hOverW, deg(sigmaDeg)), 5);
  });
  it('depends only on depth over width (a 50 nm slot 500 nm deep is the 1-by-10 slot)', () => {
    expectRel(ionTransmission(50 * nm, 500 * nm, deg(5), true), slotQuadrature(10, deg(5)), 5);
    expectRel(ionTransmission(50 * nm, 100 * nm, deg(3)), holeQuadrature(1, 2, deg(3)), 5);
  });
  it('passes every ion through no depth at all', () => {
    expect(ionTransmission(1, 0, deg(5))).toBe(1);
  });
});

describe('synergy edge cases (Gottscho et al. 1992 coverage model)', () => {
  it('etches nothing when neither neutrals nor ions reach the front (K = 0, g = 0)', () => {
    expect(synergyRatio(0, 0.5, 1, 0)).toBe(0);
  });
  it('solves the coupled balance with shadowed ions (g = 0.6), checked by fixed-point iteration', () => {
    // K = 0.3, s₀ = 0.4, ρ = 2, g = 0.6: x ← K/(K + s₀(1 − θ)(1 − K)), θ = ρx/(ρx + g).
    let x = 1;
    for (let i = 0; i < 500; i++) x = 0.3 / (0.3 + 0.4 * (1 - (2 * x) / (2 * x + 0.6)) * 0.7);
    const theta = (2 * x) / (2 * x + 0.6);
    expectRel(synergyRatio(0.3, 0.4, 2, 0.6), (0.6 * theta) / (2 / 3), 9);
  });
  it('solves it where neutrals are scarce (ρ = 0.2, g = 0.6), checked by fixed-point iteration', () => {
    let x = 1;
    for (let i = 0; i < 500; i++) x = 0.3 / (0.3 + 0.4 * (1 - (0.2 * x) / (0.2 * x + 0.6)) * 0.7);
    const theta = (0.2 * x) / (0.2 * x + 0.6);
    expectRel(synergyRatio(0.3, 0.4, 0.2, 0.6), (0.6 * theta) / (0.2 / 1.2), 9);
  });
  it('keeps ten digits when neutrals swamp the ions (ρ = 1e14: the ratio is the ion share g)', () => {
    // θ → 1 and θ₀ → 1: ER/ER₀ → g; a root formed as a difference of near-equal numbers loses it.
    expectRel(synergyRatio(0.05, 0.5, 1e14, 0.6), 0.6, 10);
  });
});

describe('the front sees the transmission per unit of its own area (reciprocity)', () => {
  it('scales K by the area ratio: (100/50)² for a round front, 100/50 for a slot, capped at 1', () => {
    expectRel(frontTransmission(0.1, 100, 50, false), 0.4, 12);
    expectRel(frontTransmission(0.1, 100, 50, true), 0.2, 12);
    expect(frontTransmission(0.5, 100, 50, false)).toBe(1);
  });
  it('has no front, and nothing arriving at it, once the opening has closed', () => {
    expect(frontTransmission(0.1, 100, 0, false)).toBe(0);
  });
});

describe('depth after a time, in the interval where it lands', () => {
  // K = 1/(1 + a·h) gives t(D) = (D + S·a·D²/2)/ER₀ in closed form (see above).
  const a = 1 / (100 * nm);
  const r = (h: number) => rateRatio(1 / (1 + a * h), 0.2);
  const t = 600;
  const exact = (Math.sqrt(1 + 2 * 0.2 * a * 5e-9 * t) - 1) / (0.2 * a); // 1.3028 µm
  it('finds it in a late interval of the table (root at 0.93 of the searched depth)', () => {
    expectRel(depthAfter(t, 5e-9, r, 1.4 * um), exact, 10);
  });
  it('stops at the searched depth when the time would carry it further', () => {
    expect(depthAfter(t, 5e-9, r, 1 * um)).toBe(1 * um);
    // …even when the depth it would reach lies less than one table interval beyond (1.3028 µm).
    expect(depthAfter(t, 5e-9, r, 1.3 * um)).toBe(1.3 * um);
  });
});

/** An etched opening with its ion block: ρ and, if given, the angular spread. */
function withIons(s: Structure, rho: number, spread?: number): Structure {
  setParam(s, 'etch.ion_neutral_to_ion_ratio', rho);
  if (spread !== undefined) setParam(s, 'etch.ion_angular_spread', spread);
  s.etch = { calibrationPoints: 0, ion: { spread: spread !== undefined } };
  return s;
}

describe('ion-limited etching of a trench (ρ → ∞: the rate is the ion share)', () => {
  // For a slot whose ions all shift less than its width (d ≤ 1 wherever the spread has weight),
  // the azimuthal average 1 − 2d/π is linear in d, so g(h) = 1 − c·(h + t_m) exactly, with
  // c = (2/π)·E[tan α]/w. Then ER/ER₀ = g and t(D) = ln[(1 − c·t_m)/(1 − c·(D + t_m))]/(c·ER₀).
  const sigma = deg(0.5);
  const w = 100 * nm;
  const c = ((2 / Math.PI) * meanTan(sigma)) / w;
  const recipe = { open_rate: 5e-9, reaction_probability: 0.3, time_budget: 600 };
  const trench = (depth: number, mask: number, angle = Math.PI / 2) =>
    withIons(etchedHole({ cd: w, depth, sidewall_angle: angle, pitch: 200 * nm, length: 10 * um }, { ...recipe, mask_thickness: mask }, 'trench'), 1e12, sigma);

  it('loses rate as the ion shadow grows with depth and mask: 1 − c·(D + t_m)', () => {
    expectRel(value(trench(600 * nm, 200 * nm), 'etch.bottom_rate_ratio')?.value, 1 - c * 800 * nm, 7);
  });
  it('takes the closed-form time to depth', () => {
    const D = 600 * nm;
    const m = 200 * nm;
    expectRel(value(trench(D, m), 'etch.time_to_depth')?.value, Math.log((1 - c * m) / (1 - c * (D + m))) / (c * 5e-9), 7);
  });
  it('shadows the ions over the narrower bottom of a tapered trench', () => {
    // At 89.5° the bottom is w − 2D·cot 89.5° (read from the geometry engine); g = 1 − (2/π)E[tan α](D + t_m)/w_b.
    const s = trench(600 * nm, 200 * nm, deg(89.5));
    const bottom = value(s, 'geometry.bottom_cd')!.value!;
    expectRel(bottom, w - 2 * 600 * nm / Math.tan(deg(89.5)), 9);
    expectRel(value(s, 'etch.bottom_rate_ratio')?.value, 1 - ((2 / Math.PI) * meanTan(sigma) * 800 * nm) / bottom, 7);
  });
  it('stops where 1 − (2/π)·AR·E[tan α] falls to the stop fraction', () => {
    const s = trench(600 * nm, 0);
    setParam(s, 'etch.stop_fraction', 0.9);
    expectRel(value(s, 'etch.stop_aspect_ratio')?.value, (0.1 * Math.PI) / (2 * meanTan(sigma)), 7);
  });
  it('without an angular spread the ions all arrive: the rate is the open-field rate at any depth', () => {
    const s = withIons(etchedHole({ cd: w, depth: 600 * nm, sidewall_angle: Math.PI / 2, pitch: 200 * nm, length: 10 * um }, recipe, 'trench'), 1e12);
    expectRel(value(s, 'etch.bottom_rate_ratio')?.value, 1, 9);
    expectRel(value(s, 'etch.time_to_depth')?.value, 600 * nm / 5e-9, 7);
  });
});

describe('etch quantities against an independent integration of dh/dt = ER₀·R(K(h))', () => {
  // Vertical 80 nm hole, no mask, S = 0.2, ER₀ = 5 nm/s: K(h) from the tube table (itself held to
  // Cole's values in transport.test.ts), integrated forward in time by classical Runge–Kutta, and
  // the time by Simpson's rule — neither is the engine's Gauss–Legendre table inverted by Newton.
  const er0 = 5e-9;
  const S = 0.2;
  const rate = (cd: number) => (h: number) => er0 * rateRatio(tubeTransmission((2 * h) / cd), S);
  const rk4 = (f: (h: number) => number, time: number, steps = 20_000) => {
    let h = 0;
    const dt = time / steps;
    for (let i = 0; i < steps; i++) {
      const k1 = f(h);
      const k2 = f(h + (dt * k1) / 2);
      const k3 = f(h + (dt * k2) / 2);
      const k4 = f(h + dt * k3);
      h += (dt * (k1 + 2 * k2 + 2 * k3 + k4)) / 6;
    }
    return h;
  };
  const hole = (extra: Record<string, number> = {}) =>
    etchedHole({ cd: 80 * nm, depth: 800 * nm, sidewall_angle: Math.PI / 2, pitch: 160 * nm }, { open_rate: er0, reaction_probability: S, time_budget: 300, ...extra });

  it('time to depth', () => {
    expectRel(value(hole(), 'etch.time_to_depth')?.value, simpson((h) => 1 / rate(80 * nm)(h), 0, 800 * nm), 7);
  });
  it('time margin: the budget over that time', () => {
    expectRel(value(hole(), 'etch.time_margin')?.value, 300 / simpson((h) => 1 / rate(80 * nm)(h), 0, 800 * nm), 7);
  });
  it('depth in the budget', () => {
    expectRel(value(hole(), 'etch.depth_in_budget')?.value, rk4(rate(80 * nm), 300), 7);
  });
  it('lag behind a 400 nm reference etched for the same time', () => {
    const own = rk4(rate(80 * nm), 300);
    const ref = rk4(rate(400 * nm), 300);
    expectRel(value(hole({ reference_cd: 400 * nm }), 'etch.lag')?.value, 1 - own / ref, 6);
  });
  it('refuses a reference as narrow as the opening itself', () => {
    expect(value(hole({ reference_cd: 80 * nm }), 'etch.lag')?.value).toBeNull();
  });
});

describe('tapered openings', () => {
  // 80 nm hole at 80°: it closes at CD/(2·cot 80°) = 40 nm·tan 80° = 226.85 nm.
  const tapered = (depth: number, extra: Record<string, number> = {}) =>
    etchedHole({ cd: 80 * nm, depth, sidewall_angle: deg(80), pitch: 160 * nm }, { open_rate: 5e-9, reaction_probability: 0.2, time_budget: 600, ...extra });
  it('reaches 220 nm but never 230 nm (closure at 40 nm·tan 80° = 226.85 nm)', () => {
    expect(value(tapered(220 * nm), 'etch.time_to_depth')?.value).toBeGreaterThan(0);
    expect(value(tapered(230 * nm), 'etch.time_to_depth')).toMatchObject({ value: null, unbounded: 'above' });
  });
  it('stops where it closes and says so; short of closure it says nothing', () => {
    const closes = 40 * nm * Math.tan(deg(80));
    const long = value(tapered(200 * nm), 'etch.depth_in_budget')!;
    expect(long.value! / closes).toBeCloseTo(1, 5);
    expect(long.note).toMatch(/closes/);
    const short = value(tapered(200 * nm, { time_budget: 5 }), 'etch.depth_in_budget')!;
    expect(short.value).toBeLessThan(closes / 2);
    expect(short.note).toBeUndefined();
  });
  it('rescales the top-referred K to the narrowing front: R(K·(CD/CD_b)², S) at the depth', () => {
    // 150 nm deep: CD_b = 80 − 2·150·cot 80° = 27.10 nm, read from the geometry engine; K from transport.
    const s = tapered(150 * nm);
    const bottom = value(s, 'geometry.bottom_cd')!.value!;
    expectRel(bottom, 80 * nm - (300 * nm) / Math.tan(deg(80)), 9);
    const kb = Math.min(1, value(s, 'transport.transmission')!.value! * (80 * nm / bottom) ** 2);
    expectRel(value(s, 'etch.bottom_rate_ratio')?.value, kb / (kb + 0.2 - 0.2 * kb), 9);
  });
  it('re-entrant walls (91°) never close: the etch gets there', () => {
    expect(value(etchedHole({ cd: 80 * nm, depth: 800 * nm, sidewall_angle: deg(91), pitch: 160 * nm }, { open_rate: 5e-9, reaction_probability: 0.2, time_budget: 600 }), 'etch.time_to_depth')?.value).toBeGreaterThan(0);
  });
});

describe('where the etch stops', () => {
  const stop = (S: number, f: number, kind: 'hole' | 'trench' = 'hole') =>
    value(etchedHole({ cd: 80 * nm, depth: 800 * nm, sidewall_angle: Math.PI / 2, pitch: 160 * nm, ...(kind === 'trench' ? { length: 10 * um } : {}) }, { open_rate: 5e-9, reaction_probability: S, time_budget: 600, stop_fraction: f }, kind), 'etch.stop_aspect_ratio')!;
  it('at aspect ratio 10 when every molecule reacts and the stop is Cole’s K at L/R = 20 (0.109304)', () => {
    expectRel(stop(1, 0.109304).value, 10, 5);
  });
  it('in a trench, where a ray count finds the slot transmitting the stop fraction', () => {
    // S = 1: the ratio is the slot's K; a test-particle count at the returned aspect ratio gives 0.3.
    const ar = stop(1, 0.3, 'trench').value!;
    const mc = transmissionMonteCarlo({ shape: 'slot', depth: ar, topWidth: 1, bottomWidth: 1 }, 60_000, 7);
    expect(Math.abs(mc.value - 0.3)).toBeLessThan(4 * mc.sigma);
  });
  it('with ions but no spread, where the coverage balance at Cole’s K for L/R = 20 gives the stop fraction', () => {
    // ρ = 1, s₀ = 0.5, g = 1, K = 0.109304: the fixed point x ← K/(K + s₀(1 − θ)(1 − K)) gives the
    // rate ratio f = θ/θ₀ at aspect ratio 10; the stop for that f is aspect ratio 10.
    let x = 1;
    for (let i = 0; i < 2000; i++) x = 0.109304 / (0.109304 + 0.5 * (1 - x / (x + 1)) * (1 - 0.109304));
    const f = x / (x + 1) / 0.5;
    const s = etchedHole({ cd: 80 * nm, depth: 800 * nm, sidewall_angle: Math.PI / 2, pitch: 160 * nm }, { open_rate: 5e-9, reaction_probability: 0.5, time_budget: 600, stop_fraction: f });
    expectRel(value(withIons(s, 1), 'etch.stop_aspect_ratio')?.value, 10, 5);
  });
  it('never, when the rate cannot fall that low within aspect ratio 1e7 (S = 1e-9, half the rate)', () => {
    expect(stop(1e-9, 0.5)).toMatchObject({ value: null, unbounded: 'above' });
  });
});

describe('calibration, more closely', () => {
  const er0 = 5e-9;
  const K = { 2.5: 0.310525, 5: 0.190941, 10: 0.109304, 20: 0.059422 } as const; // Cole, L/R = 5…40
  const points = Object.entries(K).map(([ar, k]) => ({ ar: Number(ar), rate: er0 * (k / (k + 0.05 - k * 0.05)) }));
  it('recovers the generating S to seven digits (the golden section runs to convergence)', () => {
    expectRel(fitReactionProbability(false, er0, points).s, 0.05, 7);
  });
  it('reports the RMS of the relative residuals, worked from Cole’s K at the fitted S', () => {
    const skewed = points.map((p, i) => ({ ar: p.ar, rate: p.rate * (i % 2 ? 1.1 : 0.9) }));
    const fit = fitReactionProbability(false, er0, skewed);
    const rms = Math.sqrt(
      Object.values(K).reduce((sum, k, i) => sum + ((er0 * (k / (k + fit.s - k * fit.s)) - skewed[i]!.rate) / skewed[i]!.rate) ** 2, 0) / 4,
    );
    expectRel(fit.residual, rms, 9);
  });

  /** A trench etched to aspect ratio `ar` under a 50 nm mask with ions: its forward bottom rate. */
  const forward = (ar: number, S: number) => {
    const s = withIons(etchedHole({ cd: 100 * nm, depth: ar * 100 * nm, sidewall_angle: Math.PI / 2, pitch: 200 * nm, length: 10 * um }, { open_rate: er0, reaction_probability: S, time_budget: 600, mask_thickness: 50 * nm }, 'trench'), 0.5, deg(2));
    return er0 * value(s, 'etch.bottom_rate_ratio')!.value!;
  };
  it('fits a masked, ion-assisted trench to the S its forward rates were computed with', () => {
    // The forward quantity (K of the opening cut under its mask, ion shadowing and coverage) and the
    // fit (the calibration's own path) must agree: S = 0.08 back from rates at AR 3, 6, 12.
    const pts = [3, 6, 12].map((ar) => ({ ar, rate: forward(ar, 0.08) }));
    const fit = fitReactionProbability(true, er0, pts, { cd: 100 * nm, thickness: 50 * nm }, { rho: 0.5, spread: deg(2) });
    expectRel(fit.s, 0.08, 6);
    expect(fit.residual).toBeLessThan(1e-6);
  });
  it('fits a round hole with ions but no spread the same way', () => {
    const rateOf = (ar: number) =>
      er0 * value(withIons(etchedHole({ cd: 100 * nm, depth: ar * 100 * nm, sidewall_angle: Math.PI / 2, pitch: 200 * nm }, { open_rate: er0, reaction_probability: 0.2, time_budget: 600 }), 0.5), 'etch.bottom_rate_ratio')!.value!;
    const fit = fitReactionProbability(false, er0, [3, 6, 12].map((ar) => ({ ar, rate: rateOf(ar) })), undefined, { rho: 0.5 });
    expectRel(fit.s, 0.2, 6);
  });
  it('fits the calibration written on an ion-assisted trench (the structure’s own fitted quantity)', () => {
    const s = withIons(etchedHole({ cd: 100 * nm, depth: 1 * um, sidewall_angle: Math.PI / 2, pitch: 200 * nm, length: 10 * um }, { open_rate: er0, time_budget: 600, mask_thickness: 50 * nm }, 'trench'), 0.5, deg(2));
    calibrate(s, [3, 6, 12].map((ar) => [ar, forward(ar, 0.08)] as [number, number]), { spread: true });
    expectRel(value(s, 'etch.fitted_reaction_probability')?.value, 0.08, 6);
  });
});

describe('etch declarations on a structure', () => {
  it('do not apply to a standing pillar', () => {
    const pillar = makeStructure('pillar', { cd: 40 * nm, height: 400 * nm, pitch: 100 * nm, sidewall_angle: Math.PI / 2 }, { array: 'square' });
    for (const q of etchEngine.quantities) expect(q.variant(shapeOf(pillar)), q.name).toHaveProperty('notApplicable');
  });
  it('ask for the etch block’s open-field rate on an opening without one', () => {
    const hole = makeStructure('hole', { cd: 80 * nm, depth: 800 * nm, pitch: 160 * nm, sidewall_angle: Math.PI / 2 }, { array: 'square' });
    expect(evaluateStructure(hole).incomplete['etch.time_to_depth']).toContain('etch.open_rate');
  });
  it('have no fitted probability for a recipe without calibration points', () => {
    const s = etchedHole({ cd: 80 * nm, depth: 800 * nm, sidewall_angle: Math.PI / 2 }, { open_rate: 5e-9, reaction_probability: 0.2, time_budget: 600 });
    expect(QUANTITIES.get('etch.fitted_reaction_probability')!.variant(shapeOf(s))).toHaveProperty('notApplicable');
    expect(QUANTITIES.get('etch.fit_residual')!.variant(shapeOf(s))).toHaveProperty('notApplicable');
  });
  it('refuse a calibration with any point faster than the open field', () => {
    const s = calibrate(etchedHole({ cd: 100 * nm, depth: 2000 * nm, sidewall_angle: Math.PI / 2 }, { open_rate: 5e-9, time_budget: 600 }), [[5, 4e-9], [20, 6e-9]]);
    expect(value(s, 'etch.fitted_reaction_probability')?.reason).toMatch(/above the open-field rate/);
  });
  it('chart the measured points over the rate curve as rate over open-field rate against aspect ratio', () => {
    const sweep = QUANTITIES.get('etch.bottom_rate_ratio')!.sweep!;
    const p = { 'geometry.cd': 100 * nm, 'etch.open_rate': 5e-9, 'etch.calibration_1_aspect_ratio': 5, 'etch.calibration_1_rate': 4e-9, 'etch.calibration_2_aspect_ratio': 20, 'etch.calibration_2_rate': 2e-9 };
    expect(sweep.overlay!.points(p)).toEqual([{ x: 5, y: 0.8 }, { x: 20, y: 0.4 }]);
    expectRel(sweep.axis!.map(1 * um, p), 10, 12);
  });
  it('fit the calibration residual on a calibrated structure: zero for points the model generated', () => {
    const rate = (k: number) => 5e-9 * (k / (k + 0.05 - k * 0.05));
    const s = calibrate(etchedHole({ cd: 100 * nm, depth: 2000 * nm, sidewall_angle: Math.PI / 2 }, { open_rate: 5e-9, time_budget: 600 }), [[5, rate(0.190941)], [20, rate(0.059422)]]);
    expect(value(s, 'etch.fit_residual')?.value).toBeLessThan(1e-5);
  });
});
