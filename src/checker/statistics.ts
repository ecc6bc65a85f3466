// Probability tools for evaluating a plan over distributions of its inputs: the normal quantile and
// distribution function, a seeded low-discrepancy sequence, a correlation's Cholesky factor and the
// binomial confidence interval a sequential stop reads. Pure functions over numbers.
export { cholesky } from '../model/linear.ts';

/**
 * Standard normal quantile Φ⁻¹(p), Wichura's algorithm AS 241 (PPND16), Applied Statistics 37(3),
 * 477–484 (1988): rational approximations in three ranges of p, relative error about 1e-16.
 */
export function normalQuantile(p: number): number {
  if (!(p > 0 && p < 1)) {
    if (p === 0) return -Infinity;
    if (p === 1) return Infinity;
    return NaN;
  }
  const q = p - 0.5;
  if (Math.abs(q) <= 0.425) {
    const r = 0.180625 - q * q;
    return (
      (q *
        (((((((2509.0809287301226727 * r + 33430.575583588128105) * r + 67265.770927008700853) * r + 45921.953931549871457) * r + 13731.693765509461125) * r +
          1971.5909503065514427) *
          r +
          133.14166789178437745) *
          r +
          3.387132872796366608)) /
      (((((((5226.495278852854561 * r + 28729.085735721942674) * r + 39307.89580009271061) * r + 21213.794301586595867) * r + 5394.1960214247511077) * r +
        687.1870074920579083) *
        r +
        42.313330701600911252) *
        r +
        1)
    );
  }
  let r = Math.sqrt(-Math.log(q < 0 ? p : 1 - p));
  let x: number;
  if (r <= 5) {
    r -= 1.6;
    x =
      (((((((7.7454501427834140764e-4 * r + 0.0227238449892691845833) * r + 0.24178072517745061177) * r + 1.27045825245236838258) * r + 3.64784832476320460504) * r +
        5.7694972214606914055) *
        r +
        4.6303378461565452959) *
        r +
        1.42343711074968357734) /
      (((((((1.05075007164441684324e-9 * r + 5.475938084995344946e-4) * r + 0.0151986665636164571966) * r + 0.14810397642748007459) * r + 0.68976733498510000455) * r +
        1.6763848301838038494) *
        r +
        2.05319162663775882187) *
        r +
        1);
  } else {
    r -= 5;
    x =
      (((((((2.01033439929228813265e-7 * r + 2.71155556874348757815e-5) * r + 0.0012426609473880784386) * r + 0.026532189526576123093) * r + 0.29656057182850489123) * r +
        1.7848265399172913358) *
        r +
        5.4637849111641143699) *
        r +
        6.6579046435011037772) /
      (((((((2.04426310338993978564e-15 * r + 1.4215117583164458887e-7) * r + 1.8463183175100546818e-5) * r + 7.868691311456132591e-4) * r + 0.0148753612908506148525) * r +
        0.13692988092273580531) *
        r +
        0.59983220655588793769) *
        r +
        1);
  }
  return q < 0 ? -x : x;
}

/**
 * Standard normal distribution function Φ(x) = erfc(−x/√2)/2, with erfc from the Chebyshev fit of
 * Press et al., Numerical Recipes (2nd ed., §6.2, `erfcc`): fractional error below 1.2e-7 everywhere.
 * Used only to carry a correlated normal onto a uniform input (a probability, never a limit).
 */
export function normalCdf(x: number): number {
  return 0.5 * erfc(-x / Math.SQRT2);
}

function erfc(x: number): number {
  const z = Math.abs(x);
  const t = 1 / (1 + 0.5 * z);
  const r =
    t *
    Math.exp(
      -z * z -
        1.26551223 +
        t * (1.00002368 + t * (0.37409196 + t * (0.09678418 + t * (-0.18628806 + t * (0.27886807 + t * (-1.13520398 + t * (1.48851587 + t * (-0.82215223 + t * 0.17087277)))))))),
    );
  return x >= 0 ? r : 2 - r;
}

/**
 * A seeded 32-bit generator (mulberry32), only to draw the sequence's random shift. The test-particle
 * Monte Carlo keeps its own copy on purpose: it is the independent method the tests hold the
 * engines to, and shares no code with what it checks.
 */
function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/**
 * A randomly shifted Kronecker (additive recurrence) sequence in d dimensions: point n is
 * frac(s + n·α) with α_j = φ_d^−(j+1), φ_d the positive root of x^(d+1) = x + 1 (the generalised
 * golden ratio; Weyl's equidistribution theorem, with the choice of α of M. Roberts, "The
 * unreasonable effectiveness of quasirandom sequences", 2018). The shift s is drawn from the seed
 * (a Cranley–Patterson rotation, Cranley & Patterson, SIAM J. Numer. Anal. 13, 904 (1976)), so each
 * seed gives an unbiased estimate and the same seed the same points.
 */
export class QuasiRandom {
  private readonly alpha: Float64Array;
  private readonly shift: Float64Array;
  constructor(readonly dimensions: number, seed: number) {
    let phi = 2;
    for (let i = 0; i < 60; i++) phi = Math.pow(1 + phi, 1 / (dimensions + 1));
    this.alpha = new Float64Array(dimensions);
    this.shift = new Float64Array(dimensions);
    const draw = mulberry32(seed);
    for (let j = 0; j < dimensions; j++) {
      this.alpha[j] = Math.pow(1 / phi, j + 1) % 1;
      this.shift[j] = draw();
    }
  }
  /** Point n (0-based) of the sequence, each coordinate strictly inside (0, 1). */
  point(n: number, out: Float64Array = new Float64Array(this.dimensions)): Float64Array {
    for (let j = 0; j < this.dimensions; j++) {
      const u = (this.shift[j]! + n * this.alpha[j]!) % 1;
      // Keep the quantile finite: a coordinate of exactly 0 moves half a step of 2^-53 inside.
      out[j] = u > 0 ? u : 2 ** -54;
    }
    return out;
  }
}

/**
 * Wilson's score interval for a binomial proportion (E. B. Wilson, J. Am. Stat. Assoc. 22, 209
 * (1927)): k successes in n trials, two-sided at confidence 1 − alpha.
 */
export function wilsonInterval(k: number, n: number, alpha: number): { low: number; high: number } {
  if (n === 0) return { low: 0, high: 1 };
  const z = normalQuantile(1 - alpha / 2);
  const p = k / n;
  const z2n = (z * z) / n;
  const centre = (p + z2n / 2) / (1 + z2n);
  const half = (z / (1 + z2n)) * Math.sqrt((p * (1 - p)) / n + z2n / (4 * n));
  // At k = 0 (or k = n) the bound is exactly 0 (or 1); rounding would leave 1e-17 there.
  return { low: k === 0 ? 0 : Math.max(0, centre - half), high: k === n ? 1 : Math.min(1, centre + half) };
}
