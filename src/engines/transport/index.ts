// Molecular transport into openings: the probability that a molecule entering the top of a hole,
// via or trench reaches its bottom (free-molecular flow, diffuse walls). See ./clausing.ts for the
// tube table and the slot integral equation, ./montecarlo.ts for the test-particle check.
import { isElongated, isOpening } from '../../model/types.ts';
import { bottomCd } from '../geometry/index.ts';
import { noValue, variant, type Engine, type NoValue, type QuantityDef, type Shape } from '../quantity.ts';
import { slotTransmission, tubeTransmission } from './clausing.ts';

export const TRANSPORT_SOURCE =
  'Clausing, Ann. Phys. 12, 961 (1932); tube: Cole’s exact values as tabulated by Livesey (1998) in Lafferty (ed.), Foundations of Vacuum Science and Technology, Table 2.5, interpolated through Santeler, J. Vac. Sci. Technol. A 4, 338 (1986); slot: Clausing’s integral equation solved numerically (Nyström)';

/** Depth-to-size ratio used by the transmission of this shape: L/R for round openings, L/w for slots. */
export function transportRatio(elongated: boolean, length: number, width: number): number {
  return elongated ? length / width : length / (width / 2);
}

/**
 * Transmission of an opening cut to depth h (plus a mask of thickness m at the top CD above it),
 * referred to its top entrance. A straight taper is replaced by the vertical opening of the same
 * long-tube (Knudsen) conductance: conductance per unit length goes as d³ in a tube and w² in a
 * slot, so d_eq = (L / ∫dz/d³)^⅓ and w_eq = (L / ∫dz/w²)^½ over the whole path; the vertical-wall
 * solution at that size is then rescaled from its entrance to the top one (W·A is the conductance,
 * by reciprocity). No value once the taper has closed the opening.
 */
export function openingTransmission(elongated: boolean, cd: number, angle: number, h: number, mask: number): number | NoValue {
  const bottom = bottomCd(cd, h, angle, true);
  // Stryker disable next-line EqualityOperator: a taper closing to exactly zero width at this depth is not a case
  if (bottom <= 0) return noValue('the tapered opening closes before it reaches this depth');
  const length = h + mask;
  if (length <= 0) return 1;
  const p = elongated ? 2 : 3;
  // ∫ dz/d^p over the mask (constant cd) and the taper (linear cd → bottom).
  // Stryker disable next-line EqualityOperator: a taper of exactly 1e-12 CD gives the vertical value either way
  const taper = Math.abs(cd - bottom) < 1e-12 * cd ? h / cd ** p : (h / (cd - bottom)) * ((bottom ** (1 - p) - cd ** (1 - p)) / (p - 1));
  const resistance = mask / cd ** p + taper;
  const eq = (length / resistance) ** (1 / p);
  const ratio = transportRatio(elongated, length, eq);
  const w = elongated ? slotTransmission(ratio) : tubeTransmission(ratio);
  // An opening that widens downward could come out above 1: nothing transmits more than all.
  return Math.min(1, w * (eq / cd) ** (elongated ? 1 : 2));
}

const transmission: QuantityDef = {
  name: 'transport.transmission',
  title: 'Transmission probability to the bottom',
  unit: '1',
  symbol: 'W',
  description: 'Probability that a molecule entering the top of the opening (above its mask, if any) reaches the bottom, in free-molecular flow with diffuse walls (the Clausing factor).',
  source: TRANSPORT_SOURCE,
  assumptions: [
    'Mean free path much longer than the CD (free-molecular flow); diffuse re-emission from walls that do not react; cosine inflow.',
    'A tapered opening is replaced by the vertical one of equal long-tube conductance (d_eq³ = L/∫dz/d³ for holes, w_eq² = L/∫dz/w² for trenches), its transmission referred to the top entrance; the test-particle Monte Carlo bounds the error in the tests.',
    'Holes and vias use the round-tube solution with L/R = depth/(CD/2); trenches the long-slot solution with L/w = depth/CD.',
  ],
  validity: [
    {
      // Stryker disable next-line EqualityOperator: the edges of the range (1e-9 rad past vertical, exactly half the CD) are not cases
      holds: ({ cd, angle, depth }) => angle! <= Math.PI / 2 + 1e-9 && bottomCd(cd!, depth!, angle!, true) >= 0.5 * cd!,
      why: 'the equal-conductance approximation holds for openings that narrow to no less than half their top CD (within a few percent of the Monte Carlo); beyond that, or for openings that widen downward, it overestimates the transmission.',
    },
  ],
  better: 'higher',
  sweep: { input: () => 'geometry.depth', from: 0.1, to: 2 },
  variant: (shape: Shape) => {
    if (!isOpening(shape.kind)) return { notApplicable: 'transport into an opening: holes, vias and trenches' };
    const elongated = isElongated(shape.kind);
    const inputs: Record<string, string> = { depth: 'geometry.depth', cd: 'geometry.cd', angle: 'geometry.sidewall_angle' };
    if (shape.etch) inputs.mask = 'etch.mask_thickness';
    return variant({
      label: elongated ? 'long slot' : 'round tube',
      inputs,
      symbols: { depth: 'D', cd: '\\mathrm{CD}', angle: '\\theta', mask: 't_m' },
      formula: elongated
        ? 'W = W_{slot}\\!\\left(\\frac{D + t_m}{w_{eq}}\\right)\\frac{w_{eq}}{\\mathrm{CD}},\\;\\; w_{eq}^2 = \\frac{D + t_m}{\\int dz/w(z)^2}'
        : 'W = W_{tube}\\!\\left(\\frac{D + t_m}{d_{eq}/2}\\right)\\left(\\frac{d_{eq}}{\\mathrm{CD}}\\right)^2,\\;\\; d_{eq}^3 = \\frac{D + t_m}{\\int dz/d(z)^3}',
      compute: (a: Record<string, number>) => openingTransmission(elongated, a.cd!, a.angle!, a.depth!, a.mask ?? 0),
    });
  },
};

export const transportEngine: Engine = {
  id: 'transport',
  title: 'Transport: molecular flow into openings',
  summary: 'Clausing transmission probability of round holes and long trenches, checked by a test-particle Monte Carlo.',
  quantities: [transmission],
};
