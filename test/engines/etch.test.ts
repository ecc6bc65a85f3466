// Aspect-ratio-dependent etching. Sources beside each check:
// - Coburn & Winters, Appl. Phys. Lett. 55, 2730 (1989): ER/ER₀ = K/(K + S − K·S) and its limits
//   (S = 1 gives K; S → 0 gives no lag);
// - Cole's tube values (Livesey 1998, Table 2.5) for K at tabulated L/R;
// - a closed-form integral: with K(h) = 1/(1 + a·h) the time to depth is (D + S·a·D²/2)/ER₀;
// - calibration recovering the S that generated its points, and reporting a poor fit honestly.
import { describe, expect, it } from 'vitest';
import { evaluateRule, evaluateStructure, PlanCache } from '../../src/checker/evaluate.ts';
import { depthAfter, fitReactionProbability, ionTransmission, rateRatio, synergyRatio, timeToDepth } from '../../src/engines/etch/index.ts';
import type { Param, Structure } from '../../src/model/types.ts';
import { seededRandom } from '../../src/engines/transport/montecarlo.ts';
import { deg, expectRel, makeRule, makeStructure, nm, um } from '../helpers.ts';

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
  const pos = { file: 'test', line: 1, column: 1 };
  for (const [k, v] of Object.entries({ mask_thickness: 0, ...etch })) {
    s.params.set(`etch.${k}`, { name: `etch.${k}`, value: v, unit: '1', written: String(v), origin: { type: 'handbook', pos } } satisfies Param);
  }
  s.etch = { calibrationPoints: 0 };
  return s;
}
const value = (s: Structure, q: string) => evaluateStructure(s).quantities[q];

describe('calibration the model cannot follow (regression: the fit was pinned at 1e-6 silently)', () => {
  const calibrated = (rates: [number, number]) => {
    const s = etchedHole({ cd: 100 * nm, depth: 2000 * nm, sidewall_angle: Math.PI / 2 }, { open_rate: 5e-9, time_budget: 600 });
    const pos = { file: 'test', line: 1, column: 1 };
    [[5, rates[0]], [20, rates[1]]].forEach(([ar, rate], i) => {
      for (const [k, v] of [['aspect_ratio', ar], ['rate', rate]] as const) s.params.set(`etch.calibration_${i + 1}_${k}`, { name: `etch.calibration_${i + 1}_${k}`, value: v!, unit: '1', written: String(v), origin: { type: 'handbook', pos } } satisfies Param);
    });
    s.etch = { calibrationPoints: 2 };
    return value(s, 'etch.fitted_reaction_probability')!;
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
