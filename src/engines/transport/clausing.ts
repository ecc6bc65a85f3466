// Free-molecular transmission probability (Clausing factor) of a round tube and of a long slot.
//
// Assumptions: mean free path much longer than the feature, diffuse (cosine) re-emission from
// non-reacting walls, cosine inflow at the entrance. W is the fraction of molecules entering the
// top that leave through the bottom.
//
// Tube: the exact values of Cole as tabulated by Livesey (1998), "Flow of gases through tubes and
// orifices", in Lafferty (ed.), Foundations of Vacuum Science and Technology, Wiley, Table 2.5,
// interpolated through their ratio to Santeler's closed form (J. Vac. Sci. Technol. A 4, 338
// (1986), stated error below 0.7 %), which is smooth and close to 1: interpolation error below
// 0.2 % (leave-one-out against the table); beyond the table the ratio relaxes to 1 as 1/l, so the
// result tends to Knudsen's 8R/(3L). The table's long-tube values sit 0.03–0.07 % below converged
// solutions (Li et al., Vacuum 97, 60 (2013)).
//
// Slot: Clausing's integral equation (Clausing 1932, Ann. Phys. 12, 961) for a 2-D slot of width
// w, solved by the Nyström method on Gauss–Legendre panels; the kernel ½(1 + s²)^(−3/2) is
// smooth, so the solution converges fast. No primary slot table was reachable, so this solution
// is the reference and the test-particle Monte Carlo (./montecarlo.ts) checks it.

import { gaussLegendre } from '../numeric.ts';
import { SLOT_TABLE } from './slot-table.ts';

/** Cole's exact tube values (Livesey 1998, Table 2.5): L/R → W. */
export const COLE_TUBE: ReadonlyArray<readonly [number, number]> = [
  [0.1, 0.952399],
  [0.5, 0.801271],
  [1, 0.671984],
  [2, 0.514231],
  [3, 0.420055],
  [4, 0.356572],
  [5, 0.310525],
  [10, 0.190941],
  [20, 0.109304],
  [40, 0.059422],
  [50, 0.048448],
  [100, 0.025258],
  [1000, 0.002646],
];

/** Santeler (1986): W = 1/{1 + (3l/8)[1 + 1/(3(1 + l/7))]}, l = L/R. */
export function santelerTube(l: number): number {
  return 1 / (1 + ((3 * l) / 8) * (1 + 1 / (3 * (1 + l / 7))));
}

/** Monotone cubic (Fritsch–Carlson) interpolation through (x, y) points, x rising. */
export function monotoneCubic(xs: readonly number[], ys: readonly number[]): (x: number) => number {
  const n = xs.length;
  const d = xs.slice(1).map((x, i) => (ys[i + 1]! - ys[i]!) / (x - xs[i]!));
  const m: number[] = [d[0]!];
  // Zero slope at a local extremum and at both ends of a flat segment (a product of secants ≤ 0).
  for (let i = 1; i + 1 < n; i++) m.push(d[i - 1]! * d[i]! <= 0 ? 0 : (d[i - 1]! + d[i]!) / 2);
  m.push(d[n - 2]!);
  d.forEach((di, i) => {
    // A flat segment's slopes are zero already (above); the limiter has nothing to scale.
    // Stryker disable next-line ConditionalExpression: without the skip, 0/0 makes h NaN and the limiter is skipped all the same
    if (di === 0) return;
    const a = m[i]! / di;
    const b = m[i + 1]! / di;
    const h = a * a + b * b;
    // Stryker disable next-line EqualityOperator: at h = 9 the scale 3/√h is 1
    if (h > 9) {
      const t = 3 / Math.sqrt(h);
      m[i] = t * a * di;
      m[i + 1] = t * b * di;
    }
  });
  // At a knot every branch gives the knot's value (t = 0 or 1 in the Hermite form): the boundaries
  // below may fall either way.
  return (x: number) => {
    // Stryker disable next-line EqualityOperator: see above
    if (x <= xs[0]!) return ys[0]!;
    // Stryker disable next-line EqualityOperator: see above
    if (x >= xs[n - 1]!) return ys[n - 1]!;
    let i = 0;
    // Stryker disable next-line EqualityOperator: see above
    while (x > xs[i + 1]!) i++;
    const h = xs[i + 1]! - xs[i]!;
    const t = (x - xs[i]!) / h;
    const h00 = 2 * t ** 3 - 3 * t * t + 1;
    const h10 = t ** 3 - 2 * t * t + t;
    const h01 = -2 * t ** 3 + 3 * t * t;
    const h11 = t ** 3 - t * t;
    return h00 * ys[i]! + h10 * h * m[i]! + h01 * ys[i + 1]! + h11 * h * m[i + 1]!;
  };
}

const tubeRatio = monotoneCubic(
  COLE_TUBE.map(([l]) => Math.log(l)),
  COLE_TUBE.map(([l, w]) => w / santelerTube(l)),
);

const [TUBE_FIRST_L, TUBE_FIRST_W] = COLE_TUBE[0]!;
const TUBE_FIRST_RATIO = TUBE_FIRST_W / santelerTube(TUBE_FIRST_L);
const [TUBE_LAST_L, TUBE_LAST_W] = COLE_TUBE[COLE_TUBE.length - 1]!;
const TUBE_LAST_RATIO = TUBE_LAST_W / santelerTube(TUBE_LAST_L);

/** Transmission probability of a round tube of length L and radius R, as a function of l = L/R. */
export function tubeTransmission(l: number): number {
  // Stryker disable next-line EqualityOperator: at l = 0 the formulas below give 1 as well
  if (l <= 0) return 1;
  // Below the table the ratio goes linearly to 1 at l = 0, where Santeler's form is exact
  // (W → 1 − l/2): holding it at the first row's value would leave W short of 1 by 1.5e-4 at l → 0.
  // Stryker disable next-line EqualityOperator: both sides give Cole's first value there (continuity)
  if (l < TUBE_FIRST_L) return santelerTube(l) * (1 + ((TUBE_FIRST_RATIO - 1) * l) / TUBE_FIRST_L);
  // Stryker disable next-line EqualityOperator: both sides give Cole's last value there (continuity)
  if (l > TUBE_LAST_L) {
    // Beyond the table the ratio relaxes to 1 as 1/l, so the result tends to Knudsen's 8R/(3L).
    return santelerTube(l) * (1 - ((1 - TUBE_LAST_RATIO) * TUBE_LAST_L) / l);
  }
  return santelerTube(l) * tubeRatio(Math.log(l));
}

// ── Slot: Clausing's integral equation ───────────────────────────────────────────────────────

/**
 * Solve A·u = b in place by Gaussian elimination with partial pivoting (A row-major, n×n).
 * Loop bounds one past the end are equivalent here: a Float64Array ignores writes past its end
 * and reads undefined there, which makes the pivot comparison false and the stray row NaN, never
 * stored; a write one past a row lands on the next row's first column, eliminated already or
 * written again before it is read.
 */
export function solveDense(a: Float64Array, b: Float64Array, n: number): Float64Array {
  // Stryker disable next-line EqualityOperator: see above
  for (let k = 0; k < n; k++) {
    let p = k;
    // Stryker disable next-line EqualityOperator: see above (the comparison's own `>=` picks the later of two equal pivots, the same elimination)
    for (let i = k + 1; i < n; i++) if (Math.abs(a[i * n + k]!) > Math.abs(a[p * n + k]!)) p = i;
    // Stryker disable next-line ConditionalExpression: exchanging a row with itself changes nothing
    if (p !== k) {
      // Stryker disable next-line EqualityOperator: see above
      for (let j = 0; j < n; j++) {
        const t = a[k * n + j]!;
        a[k * n + j] = a[p * n + j]!;
        a[p * n + j] = t;
      }
      const t = b[k]!;
      b[k] = b[p]!;
      b[p] = t;
    }
    const pivot = a[k * n + k]!;
    // Stryker disable next-line EqualityOperator: see above
    for (let i = k + 1; i < n; i++) {
      const f = a[i * n + k]! / pivot;
      // Stryker disable next-line ConditionalExpression: skipping a zero multiple only saves work
      if (f === 0) continue;
      // Stryker disable next-line EqualityOperator: see above
      for (let j = k; j < n; j++) a[i * n + j] = a[i * n + j]! - f * a[k * n + j]!;
      b[i] = b[i]! - f * b[k]!;
    }
  }
  // Stryker disable next-line ArithmeticOperator: from n, the first pass reads and writes past the end (see above)
  for (let i = n - 1; i >= 0; i--) {
    let s = b[i]!;
    for (let j = i + 1; j < n; j++) s -= a[i * n + j]! * b[j]!;
    b[i] = s / a[i * n + i]!;
  }
  return b;
}

/**
 * Transmission of a long slot of width 1 and depth l (l = L/w), from Clausing's integral equation
 * n(x) = w₁(x) + ∫₀ˡ K(|x − x′|) n(x′) dx′, W = F(l) + ∫₀ˡ n(x) h(l − x) dx, with
 * F(x) = √(1 + x²) − x, w₁ = −F′ = 1 − x/√(1 + x²), h = w₁/2, K = −h′ = ½(1 + s²)^(−3/2).
 * `panelLength` sets the Nyström mesh (points per panel: 6).
 */
export function slotTransmissionNystrom(l: number, panelLength = 0.5): number {
  // Stryker disable next-line EqualityOperator: at l = 0 the formulas below give 1 as well
  if (l <= 0) return 1;
  const panels = Math.max(2, Math.ceil(l / panelLength));
  const gl = gaussLegendre(6);
  const xs: number[] = [];
  const ws: number[] = [];
  const h = l / panels;
  for (let p = 0; p < panels; p++) {
    for (let i = 0; i < gl.x.length; i++) {
      xs.push(p * h + ((gl.x[i]! + 1) * h) / 2);
      ws.push((gl.w[i]! * h) / 2);
    }
  }
  const n = xs.length;
  const K = (s: number) => 0.5 * (1 + s * s) ** -1.5;
  const w1 = (x: number) => 1 - x / Math.sqrt(1 + x * x);
  const a = new Float64Array(n * n);
  const b = new Float64Array(n);
  // Stryker disable next-line EqualityOperator: one past the end is ignored or rewritten (see solveDense)
  for (let i = 0; i < n; i++) {
    b[i] = w1(xs[i]!);
    // Stryker disable next-line EqualityOperator: see above
    for (let j = 0; j < n; j++) a[i * n + j] = (i === j ? 1 : 0) - ws[j]! * K(xs[i]! - xs[j]!);
  }
  const density = solveDense(a, b, n);
  let W = Math.sqrt(1 + l * l) - l;
  for (let j = 0; j < n; j++) W += ws[j]! * density[j]! * (w1(l - xs[j]!) / 2);
  return W;
}

// ── Slot: interpolation in the committed Nyström table ───────────────────────────────────────

const slotLog = monotoneCubic(
  SLOT_TABLE.map(([l]) => Math.log(l)),
  SLOT_TABLE.map(([, w]) => Math.log(w)),
);
const [SLOT_FIRST_L] = SLOT_TABLE[0]!;
const [SLOT_LAST_L, SLOT_LAST_W] = SLOT_TABLE[SLOT_TABLE.length - 1]!;
// Beyond the table the long-slot form W = (ln l + c)/l, with c matched at the table's end.
const SLOT_TAIL_C = SLOT_LAST_W * SLOT_LAST_L - Math.log(SLOT_LAST_L);

/** Transmission probability of a long slot of width w and depth L, as a function of l = L/w. */
export function slotTransmission(l: number): number {
  // Below the table the Nyström solve itself is cheap (two panels, twelve points); it also gives 1
  // for no depth.
  // Stryker disable next-line EqualityOperator: the table's first row is this solve, to its digits
  if (l < SLOT_FIRST_L) return slotTransmissionNystrom(l);
  // Stryker disable next-line EqualityOperator: the tail is matched to the table's last row there
  if (l > SLOT_LAST_L) return (Math.log(l) + SLOT_TAIL_C) / l;
  return Math.exp(slotLog(Math.log(l)));
}
