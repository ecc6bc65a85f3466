// Gap fill by marching the sidewall profile in time.
//
// The opening is a column of slices from the top (z = 0) to its bottom; each slice has a width
// (diameter of a hole, width of a trench) that the film narrows from both sides, and the bottom
// surface rises as the film grows on it. Each step the local growth rate comes from the fill
// method:
// - conformal: the same rate everywhere (an ideal ALD-like fill);
// - sticking-limited: proportional to the flux arriving on the wall, from the reactive-wall
//   Clausing problem solved in the current, narrowing opening (./models.ts `arrival`), the bottom
//   reacting like the walls;
// - bottom-up: sidewalls grow at the base rate, the bottom rises `ratio` times faster.
// The march stops when nothing open remains. A slice closes when its walls meet; every slice
// still open below the first slice that closes is cut off from the precursor. The widest of those
// trapped gaps is the trapped width; a trapped gap at least `seamWidth` wide is a void, a narrower
// one closes as a seam. Slices closed by their walls meeting (rather than by the rising bottom)
// form the seam.

import { arrival, widthAt, wallCoverageAt, type Opening } from './models.ts';
import { BLOCKS } from '../../model/blocks.ts';

export type FillMethod = 'conformal' | 'sticking-limited' | 'bottom-up';

/** Trapped gaps narrower than this count as seams, not voids: the documented default of the fill block's seam_width (blocks.ts). */
export const SEAM_WIDTH_DEFAULT = BLOCKS.fill.inputs.seam_width.default.value;

export interface FillProblem {
  /** The opening to fill, as the earlier film steps left it. */
  opening: Opening;
  method: FillMethod;
  /** Sticking-limited: the growth species' sticking probability. */
  sticking?: number | undefined;
  /** Bottom-up: the bottom's growth rate over the walls'. */
  ratio?: number | undefined;
  /** Slices from top to bottom. */
  slices?: number;
  /** Trapped gaps at least this wide are voids; narrower ones close as seams. */
  seamWidth?: number;
}

export interface FillResult {
  /** False when the march hit its step limit before closing (the result is then not used). */
  converged: boolean;
  elongated: boolean;
  /** Height of the trapped void (0 when void-free). */
  voidHeight: number;
  /** Widest point of the void when it was trapped. */
  voidWidth: number;
  /** Widest gap cut off below a pinch-off, void or seam (0 when the fill closes from the bottom up). */
  trappedWidth: number;
  /** Depth below the top of the highest void, or of the point where the fill closed last. */
  closureDepth: number;
  /** Length along which the walls met (a seam, not a void). */
  seamLength: number;
  /**
   * Time to close, in units of (half the top width / growth rate). Exact for conformal and
   * bottom-up growth; for a sticking-limited pinch only to the slice height (a neck of width r in a
   * slice of height dz gets a wall flux falling as r/dz, so its last instant depends on dz), which
   * is why no quantity publishes it.
   */
  closureTime: number;
  /** Widths along the depth at a few moments, for the cross-section. */
  history: Array<{ time: number; widths: number[]; bottom: number }>;
}

/** Bands of the transport solve in the march: enough for the growth profile, cheap enough to redo often. */
export const MARCH_BANDS = 32;
/** Wall growth, as a fraction of the top width, after which the march solves the transport again. */
export const RESOLVE_GROWTH = 0.01;

/**
 * Growth rates of the open column (slices 0..column) under sticking-limited growth: the arriving
 * flux at each slice centre, and at the bottom when the column reaches the rising bottom surface
 * (an opening pinched shut below ends in a point instead).
 */
function stickingRates(p: FillProblem, widths: number[], dz: number, column: number, toBottom: number | null): { wall: number[]; bottom: number } {
  const centres = Array.from({ length: column + 1 }, (_, i) => (i + 0.5) * dz);
  // The open slices lie above the bottom surface, so their centres come before either end.
  const open: Opening = {
    elongated: p.opening.elongated,
    z: [0, ...centres, toBottom ?? (column + 1.5) * dz],
    width: [widths[0]!, ...widths.slice(0, column + 1), toBottom === null ? 0 : widths[column]!],
  };
  const a = arrival(open, p.sticking!, { maxBands: MARCH_BANDS });
  return { wall: centres.map((c) => wallCoverageAt(a, c)), bottom: toBottom === null ? 0 : a.bottom };
}

export function marchFill(p: FillProblem): FillResult {
  const N = p.slices ?? 200;
  const depth = p.opening.z[p.opening.z.length - 1]!;
  const dz = depth / N;
  const cd = p.opening.width[0]!;
  const seamWidth = p.seamWidth ?? SEAM_WIDTH_DEFAULT;
  const centre = (i: number) => (i + 0.5) * dz;
  const widths = Array.from({ length: N }, (_, i) => widthAt(p.opening, centre(i)));
  let bottomDepth = depth; // depth of the rising bottom surface below the top
  // Stryker disable next-line ArrayDeclaration: an empty array reads undefined, as falsy as false
  const walled = new Array<boolean>(N).fill(false); // slices whose walls met (the seam)
  let voidFrom = -1;
  // Stryker disable next-line UnaryOperator: read only once voidFrom is set, and set with it
  let voidTo = -1;
  let voidWidth = 0;
  let trappedWidth = 0;
  let converged = true;
  let lastClosure = 0;
  let t = 0;
  // Sticking-limited rates from the last transport solve, and the growth since then.
  let flux: { wall: number[]; bottom: number; reachesBottom: boolean } | null = null;
  let grown = 0;
  // Stryker disable next-line ArrayDeclaration: a pinch is found only after a step, which sets it
  let lastRate: number[] = []; // growth rates of the last step, by slice
  const history: FillResult['history'] = [{ time: 0, widths: widths.slice(), bottom: bottomDepth }];
  // Stryker disable next-line EqualityOperator,UpdateOperator: the march breaks out long before the cap (below); only the frame count reads iter
  for (let iter = 0; iter < 200_000; iter++) {
    // Slices above the bottom surface (never past the last: its centre lies above the opening's
    // bottom) that are still open, in a column from the top.
    const aboveBottom = (i: number) => centre(i) < bottomDepth;
    let column = -1; // last slice of the open column that starts at the top
    while (aboveBottom(column + 1) && widths[column + 1]! > 0) column++;
    // Anything open below the column's end, still above the bottom, is cut off (none when the
    // column reaches the bottom: the search below then finds nothing).
    let deepest = -1;
    for (let i = column + 2; aboveBottom(i); i++) if (widths[i]! > 0) deepest = i;
    // Stryker disable next-line EqualityOperator: deepest is −1 or at least column + 2 ≥ 1
    if (deepest >= 0) {
      // The step that closed slice column + 1 overshot: its walls met when its width crossed 0,
      // a fraction of the step earlier, when every slice was wider by its share of the overshoot.
      // The trapped gap is what was open below it at that instant.
      const pinch = column + 1;
      const back = (i: number) => ((lastRate[pinch] ?? 0) > 0 ? (-Math.min(0, widths[pinch]!) * (lastRate[i] ?? 0)) / lastRate[pinch]! : 0);
      const atPinch = (i: number) => widths[i]! + back(i);
      let from = pinch + 1;
      while (from < deepest && !(atPinch(from) > 0)) from++;
      let widest = 0;
      for (let i = from; i <= deepest; i++) widest = Math.max(widest, atPinch(i));
      trappedWidth = Math.max(trappedWidth, widest);
      // Stryker disable next-line EqualityOperator: a gap of exactly the seam width is not a case
      if (widest >= seamWidth) {
        voidFrom = from;
        voidTo = deepest;
        voidWidth = widest;
        break;
      }
      // A sliver narrower than the seam width closes as a seam: mark it closed and carry on.
      for (let i = from; i <= deepest; i++) {
        walled[i] = true;
        widths[i] = 0;
      }
      continue;
    }
    if (column < 0) break; // nothing open remains above the bottom: filled
    const reachesBottom = !aboveBottom(column + 1);
    if (p.method === 'sticking-limited' && (flux === null || grown >= RESOLVE_GROWTH * cd || reachesBottom !== flux.reachesBottom)) {
      // The arriving flux changes only as the profile does: solved again once the walls have grown
      // by RESOLVE_GROWTH of the top width since the last solve (or the column stops reaching the bottom).
      flux = { ...stickingRates(p, widths, dz, column, reachesBottom ? bottomDepth : null), reachesBottom };
      grown = 0;
    }
    const rate = flux ? flux.wall : new Array<number>(column + 1).fill(1);
    lastRate = rate;
    const bottomRate = p.method === 'bottom-up' ? (p.ratio ?? 1) : flux ? flux.bottom : 1;
    let minW = Infinity;
    let maxRate = bottomRate;
    for (let i = 0; i <= column; i++) {
      minW = Math.min(minW, widths[i]!);
      maxRate = Math.max(maxRate, rate[i]!);
    }
    // Unreachable today (the mouth slice sees at least half the opening, so it always grows): a
    // guard against a transport solve that returns no flux, which would otherwise step by 0/0.
    // Stryker disable next-line ConditionalExpression,EqualityOperator: see above
    if (!(maxRate > 0)) break;
    // Small steps while the narrowest slice is wide, never less than a thousandth of the top CD.
    let dt = Math.max(1e-3 * cd, Math.min(0.25 * minW, 0.02 * cd)) / (2 * maxRate);
    // The rising bottom may cross at most half a slice per step (a bottom that does not rise
    // bounds nothing: 0.5·dz/0 is infinite).
    dt = Math.min(dt, (0.5 * dz) / bottomRate);
    for (let i = 0; i <= column; i++) {
      widths[i] = widths[i]! - 2 * rate[i]! * dt;
      if (!(widths[i]! > 0) && !walled[i]) {
        walled[i] = true;
        lastClosure = centre(i);
      }
    }
    bottomDepth = Math.max(0, bottomDepth - bottomRate * dt);
    t += dt;
    grown += maxRate * dt;
    if (iter % 25 === 0) {
      history.push({ time: t, widths: widths.map((w) => Math.max(0, w)), bottom: bottomDepth });
      // Keep at most 40 frames: drop every other one when it grows past that.
      // Stryker disable next-line ArithmeticOperator,EqualityOperator: thinning starts at 41 frames, so k runs over odd indices and never meets 0; starting two past the end removes the same frames (splice past the end does nothing)
      if (history.length > 40) for (let k = history.length - 2; k > 0; k -= 2) history.splice(k, 1);
    }
    // Stryker disable next-line all: a safety net no test or handbook reaches: the march ends when the mouth closes or the bottom reaches it, in about 1000 × (fastest over mouth rate) steps of the walls or two steps a slice of the bottom
    if (iter === 200_000 - 1) converged = false;
  }
  history.push({ time: t, widths: widths.map((w) => Math.max(0, w)), bottom: bottomDepth });
  // voidFrom is −1 (no void) or at least 1 (below the slice that pinched).
  // Stryker disable next-line EqualityOperator: see above
  const voidHeight = voidFrom >= 0 ? (voidTo - voidFrom + 1) * dz : 0;
  let seam = 0;
  // Stryker disable next-line EqualityOperator: see above; slice voidFrom itself is open
  for (let i = 0; i < N; i++) if (walled[i] && (voidFrom < 0 || i < voidFrom)) seam += dz;
  return {
    converged,
    elongated: p.opening.elongated,
    voidHeight,
    voidWidth,
    trappedWidth,
    // Stryker disable next-line EqualityOperator: voidFrom is −1 or at least 1
    closureDepth: voidFrom >= 0 ? voidFrom * dz : lastClosure,
    seamLength: seam,
    closureTime: (2 * t) / cd,
    history,
  };
}
