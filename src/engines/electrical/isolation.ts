// Isolation trenches: does the fill withstand the voltage between neighbours, and do the depletion
// regions of the two junctions stay apart along the path around the trench?
//
// One-sided abrupt junction (Sze & Ng, Physics of Semiconductor Devices, 3rd ed., ch. 2):
// W = √(2ε_Si(V_bi + V_R)/(qN)), V_bi = (k_BT/q)·ln(N·N⁺/n_i²). The junction's heavy side N⁺ and the
// intrinsic density are fixed here and stated: N⁺ = 1e20 cm⁻³, n_i(300 K) = 9.65e9 cm⁻³ [memory],
// ε_Si = 11.7·ε₀ (Sze & Ng list 11.9).
import { noValue, variant, type Engine, type QuantityDef, type Shape } from '../quantity.ts';
import { EPSILON_0 } from './index.ts';

export const Q = 1.602176634e-19; // C, exact (SI 2019)
export const KB = 1.380649e-23; // J/K, exact (SI 2019)
export const EPS_SI = 11.7 * EPSILON_0;
export const N_PLUS = 1e26; // m⁻³ (1e20 cm⁻³)
export const N_I = 9.65e15; // m⁻³ (9.65e9 cm⁻³ at 300 K)
const T = 300;

/** Built-in potential of an n⁺/p (or p⁺/n) junction on a side doped N (m⁻³). */
export function builtIn(doping: number): number {
  return ((KB * T) / Q) * Math.log((doping * N_PLUS) / (N_I * N_I));
}

/** Depletion width of a one-sided abrupt junction under reverse bias v. */
export function depletionWidth(doping: number, v: number): number {
  return Math.sqrt((2 * EPS_SI * (builtIn(doping) + v)) / (Q * doping));
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
  source: 'One-sided abrupt junction, W = √(2ε_Si(V_bi + V)/(qN)) (Sze & Ng, Physics of Semiconductor Devices, 3rd ed., ch. 2)',
  assumptions: ['n⁺ junctions (1e20 cm⁻³) in a uniformly doped well; depletion measured along the path; 300 K; ε_Si = 11.7·ε₀.'],
  better: 'higher',
  sweep: { input: () => 'isolation.voltage', from: 0.1, to: 2 },
  variant: (shape) =>
    isolationOnly(shape) ??
    variant({
      inputs: { path: 'isolation.leakage_path', n: 'isolation.doping', v: 'isolation.voltage' },
      symbols: SYMBOLS,
      formula: '\\frac{L_p}{W(V) + W(0)},\\;\\; W(V) = \\sqrt{\\frac{2\\varepsilon_{Si}(V_{bi} + V)}{qN}},\\;\\; V_{bi} = \\frac{k_BT}{q}\\ln\\frac{N N^+}{n_i^2}',
      compute: ({ path, n, v }) => {
        if (builtIn(n) <= 0) return noValue('the well doping is too low for the junction model');
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
