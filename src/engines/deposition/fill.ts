// Gap fill by marching the sidewall profile in time.
//
// The opening is a column of slices from the top (z = 0) to its bottom; each slice has a width
// (diameter of a hole, width of a trench) that the film narrows from both sides, and the bottom
// surface rises as the film grows on it. Each step the local growth rate comes from the fill
// method:
// - conformal: the same rate everywhere (an ideal ALD-like fill);
// - sticking-limited: proportional to the local precursor concentration, from the Knudsen
//   diffusion–reaction equation solved in the current, narrowing opening (finite volumes:
//   (d³n′)′ = 3s·d·n for a hole of diameter d, (w²n′)′ = (3s/4)·n for a trench of width w, with
//   n = 1 at the top and a reacting bottom) [derived; see ./models.ts];
// - bottom-up: sidewalls grow at the base rate, the bottom rises `ratio` times faster.
// The march stops when nothing open remains. A slice closes when its walls meet; every slice
// still open below the first slice that closes is cut off from the precursor: a void. Slices
// closed by their walls meeting (rather than by the rising bottom) form the seam.

import { solveTridiagonal } from '../numeric.ts';

export type FillMethod = 'conformal' | 'sticking-limited' | 'bottom-up';

export interface FillProblem {
  elongated: boolean;
  /** Top width and depth of the opening; the sidewall angle sets the straight taper. */
  cd: number;
  depth: number;
  /** Width at the bottom (from the geometry's taper). */
  bottom: number;
  method: FillMethod;
  sticking?: number;
  ratio?: number;
  /** Slices from top to bottom. */
  slices?: number;
}

export interface FillResult {
  /** False when the march hit its step limit before closing (the result is then not used). */
  converged: boolean;
  elongated: boolean;
  /** Height of the trapped void (0 when void-free). */
  voidHeight: number;
  /** Widest point of the void when it was trapped. */
  voidWidth: number;
  /** Depth below the top of the highest void, or of the point where the fill closed last. */
  closureDepth: number;
  /** Length along which the walls met (a seam, not a void). */
  seamLength: number;
  /** Time to close, in units of (half the top width / growth rate). */
  closureTime: number;
  /** Widths along the depth at a few moments, for the cross-section. */
  history: Array<{ time: number; widths: number[]; bottom: number }>;
}

/** Relative precursor concentration along the open part of the opening (sticking-limited growth). */
export function concentration(p: FillProblem, widths: number[], dz: number, openTo: number, bottomReacts: boolean): number[] {
  const n = openTo + 1; // nodes 0..openTo
  const s = p.sticking!;
  const coef = (w: number) => (p.elongated ? w * w : w ** 3);
  const sink = (w: number) => (p.elongated ? (3 * s) / 4 : 3 * s * w);
  const a = new Float64Array(n);
  const b = new Float64Array(n);
  const c = new Float64Array(n);
  const r = new Float64Array(n);
  b[0] = 1;
  r[0] = 1;
  for (let i = 1; i < n; i++) {
    const wUp = Math.max(0, (widths[i - 1]! + widths[i]!) / 2);
    const wDown = i + 1 < n ? Math.max(0, (widths[i]! + widths[i + 1]!) / 2) : 0;
    const cUp = coef(wUp) / (dz * dz);
    const cDown = i + 1 < n ? coef(wDown) / (dz * dz) : 0;
    a[i] = cUp;
    c[i] = cDown;
    b[i] = -cUp - cDown - sink(Math.max(0, widths[i]!));
    if (i === n - 1 && bottomReacts) {
      // Reacting bottom face, loss s·v̄/4 per area, in the same scaling as the wall sink:
      // trench (per unit length) w·s·v̄/4 ÷ (2v̄/3) = 3s·w/8; hole (π d²/4)·s·v̄/4 ÷ (π v̄/12) = 3s·d²/4.
      const w = Math.max(widths[i]!, 0);
      const face = p.elongated ? (3 * s * w) / 8 : (3 * s * w * w) / 4;
      b[i] = b[i]! - face / dz;
    }
  }
  const x = solveTridiagonal(a, b, c, r);
  return x.map((v) => Math.max(0, Math.min(1, v)));
}

/** Trapped openings narrower than this (1 nm: a few atomic layers) are counted as seams, not voids. */
export const VOID_MIN_WIDTH = 1e-9;

export function marchFill(p: FillProblem): FillResult {
  const N = p.slices ?? 200;
  const dz = p.depth / N;
  const centre = (i: number) => (i + 0.5) * dz;
  // Widths at slice centres, from the straight taper.
  let widths = Array.from({ length: N }, (_, i) => p.cd + ((p.bottom - p.cd) * centre(i)) / p.depth);
  let bottomDepth = p.depth; // depth of the rising bottom surface below the top
  const closedAt = new Array<number>(N).fill(NaN); // time each slice's walls met
  let voidFrom = -1;
  let voidTo = -1;
  let voidWidth = 0;
  let converged = true;
  let lastClosure = 0;
  let t = 0;
  const history: FillResult['history'] = [{ time: 0, widths: widths.slice(), bottom: bottomDepth }];
  for (let iter = 0; iter < 200_000; iter++) {
    // Slices above the bottom surface that are still open, in a column from the top.
    const aboveBottom = (i: number) => centre(i) < bottomDepth;
    let column = -1; // last slice of the open column that starts at the top
    while (column + 1 < N && aboveBottom(column + 1) && widths[column + 1]! > 0) column++;
    // Anything open below the column's end, still above the bottom, is cut off: a void.
    if (column + 1 < N && aboveBottom(column + 1)) {
      let deepest = -1;
      for (let i = column + 2; i < N && aboveBottom(i); i++) if (widths[i]! > 0) deepest = i;
      if (deepest >= 0) {
        let from = column + 1;
        while (from <= deepest && !(widths[from]! > 0)) from++;
        let widest = 0;
        for (let i = from; i <= deepest; i++) widest = Math.max(widest, widths[i]!);
        // A sliver narrower than VOID_MIN_WIDTH closes as a seam, not a void.
        if (widest >= VOID_MIN_WIDTH) {
          voidFrom = from;
          voidTo = deepest;
          voidWidth = widest;
          break;
        }
        // Keep closing the sliver as if its walls met: mark it closed and carry on.
        for (let i = from; i <= deepest; i++) {
          if (Number.isNaN(closedAt[i]!)) closedAt[i] = t;
          widths[i] = 0;
        }
        continue;
      }
    }
    if (column < 0) break; // nothing open remains above the bottom: filled
    const rate = p.method === 'sticking-limited' ? concentration(p, widths, dz, column, true) : new Array<number>(column + 1).fill(1);
    const bottomRate = p.method === 'bottom-up' ? (p.ratio ?? 1) : p.method === 'sticking-limited' ? (column === N - 1 || !aboveBottom(column + 1) ? rate[column]! : 0) : 1;
    let minW = Infinity;
    let maxRate = bottomRate;
    for (let i = 0; i <= column; i++) {
      minW = Math.min(minW, widths[i]!);
      maxRate = Math.max(maxRate, rate[i]!);
    }
    if (!(maxRate > 0)) break;
    // Small steps while the narrowest slice is wide, never less than a thousandth of the top CD.
    let dt = Math.max(1e-3 * p.cd, Math.min(0.25 * minW, 0.02 * p.cd)) / (2 * maxRate);
    // The rising bottom may cross at most half a slice per step.
    if (bottomRate > 0) dt = Math.min(dt, (0.5 * dz) / bottomRate);
    for (let i = 0; i <= column; i++) {
      widths[i] = widths[i]! - 2 * rate[i]! * dt;
      if (!(widths[i]! > 0) && Number.isNaN(closedAt[i]!)) {
        closedAt[i] = t + dt;
        lastClosure = centre(i);
      }
    }
    bottomDepth = Math.max(0, bottomDepth - bottomRate * dt);
    t += dt;
    if (iter % 25 === 0) {
      history.push({ time: t, widths: widths.map((w) => Math.max(0, w)), bottom: bottomDepth });
      // Keep at most 40 frames: drop every other one when it grows past that.
      if (history.length > 40) for (let k = history.length - 2; k > 0; k -= 2) history.splice(k, 1);
    }
    if (iter === 200_000 - 1) converged = false;
  }
  history.push({ time: t, widths: widths.map((w) => Math.max(0, w)), bottom: bottomDepth });
  const voidHeight = voidFrom >= 0 ? (voidTo - voidFrom + 1) * dz : 0;
  let seam = 0;
  for (let i = 0; i < N; i++) if (!Number.isNaN(closedAt[i]!) && (voidFrom < 0 || i < voidFrom)) seam += dz;
  return {
    converged,
    elongated: p.elongated,
    voidHeight,
    voidWidth,
    closureDepth: voidFrom >= 0 ? voidFrom * dz : lastClosure,
    seamLength: seam,
    closureTime: (2 * t) / p.cd,
    history,
  };
}
