// Small dense linear algebra shared by loading (is a set of correlations possible?) and sampling.

/**
 * The lower-triangular Cholesky factor L of a symmetric matrix (row-major, n × n) with L·Lᵀ = C, or
 * null when C is not positive definite (a set of correlations no joint distribution can have).
 */
export function cholesky(c: ArrayLike<number>, n: number): Float64Array | null {
  const l = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j <= i; j++) {
      let s = c[i * n + j]!;
      for (let k = 0; k < j; k++) s -= l[i * n + k]! * l[j * n + k]!;
      if (i === j) {
        if (!(s > 1e-12)) return null;
        l[i * n + i] = Math.sqrt(s);
      } else l[i * n + j] = s / l[j * n + j]!;
    }
  }
  return l;
}
