// Isolation trenches: does the fill withstand the voltage between neighbours, and do the depletion
// regions of the two junctions stay apart along the path around the trench?
//
// Abrupt junction with the majority-carrier tails (Sze & Ng, Physics of Semiconductor Devices,
// 3rd ed., ch. 2): W = √(2ε_Si(N + N⁺)(V_bi + V_R − 2kT/q)/(q·N·N⁺)), of which the side doped N
// takes the share N⁺/(N + N⁺); V_bi = (k_BT/q)·ln(N·N⁺/n_i²). The −2kT/q is a kT/q for each
// majority-carrier tail. The junction's heavy side is fixed here and stated: N⁺ = 1e20 cm⁻³; the
// silicon facts (ε_Si, n_i, 300 K) are those of ./index.ts.
import { noValue, variant, type Engine, type QuantityDef, type Shape } from '../quantity.ts';
import { EPS_SI, N_I, Q, SILICON_FACTS, THERMAL_VOLTAGE } from './index.ts';

export const N_PLUS = 1e26; // m⁻³ (1e20 cm⁻³)

/** Built-in potential of an abrupt junction between a side doped N and one doped N⁺ (m⁻³). */
export function builtIn(doping: number, heavy = N_PLUS): number {
  return THERMAL_VOLTAGE * Math.log((doping * heavy) / (N_I * N_I));
}

/** Potential the depleted charge holds under reverse bias v: V_bi + v less 2kT/q for the two majority-carrier tails. */
export function depletedPotential(doping: number, v: number, heavy = N_PLUS): number {
  return builtIn(doping, heavy) + v - 2 * THERMAL_VOLTAGE;
}

/**
 * Depletion width on the side doped N of an abrupt junction with a side doped N⁺ under reverse
 * bias v: that side's share N⁺/(N + N⁺) of the whole width, √(2ε_Si·N⁺·φ/(q·N·(N + N⁺))) with
 * φ = V_bi + v − 2kT/q; for N⁺ ≫ N it is the one-sided √(2ε_Si·φ/(qN)).
 */
export function depletionWidth(doping: number, v: number, heavy = N_PLUS): number {
  return Math.sqrt((2 * EPS_SI * heavy * depletedPotential(doping, v, heavy)) / (Q * doping * (doping + heavy)));
}

function isolationOnly(shape: Shape): { notApplicable: string } | { incomplete: string[] } | null {
  if (shape.kind !== 'trench') return { notApplicable: 'isolation concerns trenches' };
  if (!shape.isolation) return { incomplete: ['isolation'] };
  return null;
}

const SYMBOLS: Record<string, string> = { cd: '\\mathrm{CD}', bottom: '\\mathrm{CD}_b', depth: 'D', v: 'V', n: 'N', ebd: 'E_{bd}', e: 'E', path: 'L_p' };

const fieldInFill: QuantityDef = {
  name: 'isolation.field_in_fill',
  title: 'Field across the trench fill',
  unit: 'V/m',
  symbol: 'E',
  description: 'Electric field across the fill between the two neighbours, whose active areas face each other across the top of the trench.',
  source: 'Uniform field between parallel faces, E = V/w',
  assumptions: ['Neighbours at the full voltage on either side of the trench; no field crowding at corners.'],
  better: 'lower',
  variant: (shape) =>
    isolationOnly(shape) ??
    variant({
      inputs: { cd: 'geometry.cd', v: 'isolation.voltage' },
      symbols: SYMBOLS,
      formula: 'E = \\frac{V}{\\mathrm{CD}}',
      compute: ({ cd, v }) => v / cd,
    }),
};

const breakdownMargin: QuantityDef = {
  name: 'isolation.breakdown_margin',
  title: 'Fill breakdown margin',
  unit: '1',
  symbol: 'E_{bd}/E',
  description: 'Breakdown field of the fill over the field across it.',
  source: 'E_bd/E',
  better: 'higher',
  sweep: { input: () => 'isolation.voltage', from: 0.25, to: 2 },
  variant: (shape) =>
    isolationOnly(shape) ??
    variant({
      inputs: { e: 'isolation.field_in_fill', ebd: 'isolation.breakdown_field' },
      symbols: SYMBOLS,
      formula: '\\frac{E_{bd}}{E}',
      compute: ({ e, ebd }) => ebd / e,
    }),
};

const leakagePath: QuantityDef = {
  name: 'isolation.leakage_path',
  title: 'Leakage path around the trench',
  unit: 'm',
  symbol: 'L_p',
  description: 'Shortest path through the silicon from one side of the trench to the other: down one wall, under the bottom, up the other.',
  source: 'Path length 2D + CD_b (geometry)',
  better: 'higher',
  variant: (shape) =>
    isolationOnly(shape) ??
    variant({
      inputs: { depth: 'geometry.depth', bottom: 'geometry.bottom_cd' },
      symbols: SYMBOLS,
      formula: 'L_p = 2D + \\mathrm{CD}_b',
      compute: ({ depth, bottom }) => 2 * depth + bottom,
    }),
};

const punchthroughMargin: QuantityDef = {
  name: 'isolation.punchthrough_margin',
  title: 'Punch-through margin',
  unit: '1',
  symbol: 'L_p/(W_V + W_0)',
  description: 'Leakage path over the room the two junctions’ depletion regions take along it (one at the full voltage, one unbiased): above 1 they stay apart.',
  source: 'Abrupt junction with the majority-carrier tails, W = √(2ε_Si(V_bi + V − 2kT/q)/(qN)) on the lightly doped side (Sze & Ng, Physics of Semiconductor Devices, 3rd ed., ch. 2)',
  assumptions: [
    'n⁺ junctions (1e20 cm⁻³) in a uniformly doped well, each depleting the well by its share N⁺/(N + N⁺) of the junction width; depletion measured along the path.',
    'The −2kT/q counts a kT/q for each majority-carrier tail, as Sze & Ng do. Against an n⁺ side this heavy a Poisson–Boltzmann solution gives 1.1–1.9 kT/q with majority carriers only and 2.0–5.6 kT/q with every carrier (the n⁺ electrons spill into the well) over 1e16–2e17 cm⁻³ and 0–20 V: the width here lies between the two, at most 1.3 % narrower and 5.6 % wider (both at 1e16 cm⁻³ unbiased).',
    SILICON_FACTS,
  ],
  better: 'higher',
  sweep: { input: () => 'isolation.voltage', from: 0.1, to: 2 },
  variant: (shape) =>
    isolationOnly(shape) ??
    variant({
      inputs: { path: 'isolation.leakage_path', n: 'isolation.doping', v: 'isolation.voltage' },
      symbols: SYMBOLS,
      formula: '\\frac{L_p}{W(V) + W(0)},\\;\\; W(V) = \\sqrt{\\frac{2\\varepsilon_{Si} N^+ (V_{bi} + V - 2k_BT/q)}{qN(N + N^+)}},\\;\\; V_{bi} = \\frac{k_BT}{q}\\ln\\frac{N N^+}{n_i^2}',
      compute: ({ path, n, v }) => {
        // Stryker disable next-line EqualityOperator: `< 0` differs only at a potential of exactly zero, one irrational doping
        if (depletedPotential(n, 0) <= 0) return noValue('the well doping is too low for the junction model');
        return path / (depletionWidth(n, v) + depletionWidth(n, 0));
      },
    }),
};

export const isolationEngine: Engine = {
  id: 'isolation',
  title: 'Isolation: trenches between cells',
  summary: 'Field across the trench fill and its breakdown margin; the leakage path around the trench and the punch-through margin of the junctions on either side.',
  quantities: [fieldInFill, breakdownMargin, leakagePath, punchthroughMargin],
};
