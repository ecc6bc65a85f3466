// Anisotropic elasticity of cubic silicon, written for the tests as an independent reference to
// the materials table's silicon entries and to the isotropic models that read them.
//
// Method: the 6×6 stiffness matrix of a cubic crystal (Nye, Physical Properties of Crystals, ch. 8)
// is inverted numerically and the fourth-order compliance tensor is contracted with unit vectors,
// so every direction's modulus, Poisson ratio and plate modulus comes from one general tensor
// computation rather than from the cubic closed forms. The isotropic averages are Voigt's and
// Reuss's general formulas (Hill, Proc. Phys. Soc. A 65, 349 (1952)). The hole stiffness of the
// (001) plane comes from Stroh's sextic formalism of anisotropic plane elasticity (Ting, Anisotropic
// Elasticity (1996), ch. 5), reduced to the in-plane quartic of a cubic crystal.

/** Hopcroft, Nix & Kenny, J. Microelectromech. Syst. 19, 229 (2010): silicon, Pa. */
export const HOPCROFT_C = { c11: 165.7e9, c12: 63.9e9, c44: 79.6e9 };

type Vec3 = [number, number, number];

function invert(m: number[][]): number[][] {
  const n = m.length;
  const a = m.map((row, i) => [...row, ...Array.from({ length: n }, (_, j) => (i === j ? 1 : 0))]);
  for (let col = 0; col < n; col++) {
    let pivot = col;
    for (let r = col + 1; r < n; r++) if (Math.abs(a[r]![col]!) > Math.abs(a[pivot]![col]!)) pivot = r;
    [a[col], a[pivot]] = [a[pivot]!, a[col]!];
    const p = a[col]![col]!;
    for (let j = 0; j < 2 * n; j++) a[col]![j]! /= p;
    for (let r = 0; r < n; r++) {
      if (r === col) continue;
      const f = a[r]![col]!;
      for (let j = 0; j < 2 * n; j++) a[r]![j]! -= f * a[col]![j]!;
    }
  }
  return a.map((row) => row.slice(n));
}

const VOIGT = [
  [0, 5, 4],
  [5, 1, 3],
  [4, 3, 2],
];

/** Cubic stiffness matrix (Voigt notation) and its compliance matrix. */
export function cubic(c = HOPCROFT_C): { C: number[][]; S: number[][] } {
  const { c11, c12, c44 } = c;
  const C = [
    [c11, c12, c12, 0, 0, 0],
    [c12, c11, c12, 0, 0, 0],
    [c12, c12, c11, 0, 0, 0],
    [0, 0, 0, c44, 0, 0],
    [0, 0, 0, 0, c44, 0],
    [0, 0, 0, 0, 0, c44],
  ];
  return { C, S: invert(C) };
}

/** S_ijkl·a_i·a_j·b_k·b_l from the Voigt compliance matrix (engineering shear: factor ½ per shear index). */
function contract(S: number[][], a: Vec3, b: Vec3): number {
  let sum = 0;
  for (let i = 0; i < 3; i++)
    for (let j = 0; j < 3; j++)
      for (let k = 0; k < 3; k++)
        for (let l = 0; l < 3; l++) {
          const I = VOIGT[i]![j]!;
          const J = VOIGT[k]![l]!;
          const f = (I < 3 ? 1 : 0.5) * (J < 3 ? 1 : 0.5);
          sum += S[I]![J]! * f * a[i]! * a[j]! * b[k]! * b[l]!;
        }
  return sum;
}

const unit = (v: Vec3): Vec3 => {
  const n = Math.hypot(...v);
  return [v[0] / n, v[1] / n, v[2] / n];
};

/** Young's modulus along a crystal direction. */
export function youngsAlong(dir: Vec3, c = HOPCROFT_C): number {
  const d = unit(dir);
  return 1 / contract(cubic(c).S, d, d);
}

/** Poisson's ratio: lateral contraction along `lateral` under uniaxial load along `load`. */
export function poissonOf(load: Vec3, lateral: Vec3, c = HOPCROFT_C): number {
  const { S } = cubic(c);
  const l = unit(load);
  return -contract(S, l, unit(lateral)) / contract(S, l, l);
}

/**
 * Plane-strain (plate) modulus for stress along `normal` with the strain along `length` held at
 * zero and the third direction free: 1/(s_nn − s_nl²/s_ll).
 */
export function plateModulusAlong(normal: Vec3, length: Vec3, c = HOPCROFT_C): number {
  const { S } = cubic(c);
  const n = unit(normal);
  const l = unit(length);
  const snl = contract(S, n, l);
  return 1 / (contract(S, n, n) - (snl * snl) / contract(S, l, l));
}

/** Voigt–Reuss–Hill isotropic average (bulk K, shear G, and the E, ν they give). */
export function hillAverage(c = HOPCROFT_C): { k: number; gVoigt: number; gReuss: number; e: number; nu: number } {
  const { C, S } = cubic(c);
  const k = (C[0]![0]! + C[1]![1]! + C[2]![2]! + 2 * (C[0]![1]! + C[1]![2]! + C[2]![0]!)) / 9;
  const gVoigt = (C[0]![0]! + C[1]![1]! + C[2]![2]! - (C[0]![1]! + C[1]![2]! + C[2]![0]!) + 3 * (C[3]![3]! + C[4]![4]! + C[5]![5]!)) / 15;
  const gReuss = 15 / (4 * (S[0]![0]! + S[1]![1]! + S[2]![2]!) - 4 * (S[0]![1]! + S[1]![2]! + S[2]![0]!) + 3 * (S[3]![3]! + S[4]![4]! + S[5]![5]!));
  const g = (gVoigt + gReuss) / 2;
  return { k, gVoigt, gReuss, e: (9 * k * g) / (3 * k + g), nu: (3 * k - 2 * g) / (2 * (3 * k + g)) };
}

// ── Stroh's formalism for the (001) plane ─────────────────────────────────────────────────────

type Cx = [number, number];
const add = (a: Cx, b: Cx): Cx => [a[0] + b[0], a[1] + b[1]];
const sub = (a: Cx, b: Cx): Cx => [a[0] - b[0], a[1] - b[1]];
const mul = (a: Cx, b: Cx): Cx => [a[0] * b[0] - a[1] * b[1], a[0] * b[1] + a[1] * b[0]];
const div = (a: Cx, b: Cx): Cx => {
  const d = b[0] * b[0] + b[1] * b[1];
  return [(a[0] * b[0] + a[1] * b[1]) / d, (a[1] * b[0] - a[0] * b[1]) / d];
};
const re = (x: number): Cx => [x, 0];
function csqrt(z: Cx): Cx {
  const r = Math.hypot(z[0], z[1]);
  const x = Math.sqrt((r + z[0]) / 2);
  const y = Math.sign(z[1] || 1) * Math.sqrt((r - z[0]) / 2);
  return [x, y];
}

/**
 * Stiffness of a circular hole in an infinite plane-strain (001) cubic plane against a uniform
 * pressure p, κ = p·a/u_r, with the spread of u_r around the hole (zero: by Eshelby's uniform-field
 * property a circular inclusion in this four-fold plane expands uniformly). For an isotropic plane
 * κ = 2μ. Stroh: u = 2Re[A f], φ = 2Re[B f]; with the in-plane cubic matrices Q = diag(C11, C44),
 * R = [[0, C12], [C44, 0]], T = diag(C44, C11) the eigenvalues p solve
 * C11C44 p⁴ + (C11² + C44² − (C12 + C44)²) p² + C11C44 = 0 (the two with Im p > 0),
 * a = (p(C12 + C44), −(C11 + p²C44)), b = (Rᵀ + pT)a. On the hole (ζ = e^{iψ}) the exterior
 * field decaying as 1/ζ meets the traction of a uniform pressure when 2Bq = pa(i, −1), and
 * u(ψ) = pa·Re[A B⁻¹ (i, −1) e^{−iψ}].
 */
export function holeStiffness001(c = HOPCROFT_C): { kappa: number; spread: number } {
  const { c11, c12, c44 } = c;
  const A4 = c11 * c44;
  const B2 = c11 * c11 + c44 * c44 - (c12 + c44) ** 2;
  const disc = csqrt(re(B2 * B2 - 4 * A4 * A4));
  const roots: Cx[] = [];
  for (const s of [1, -1]) {
    const P = div(add(re(-B2), mul(re(s), disc)), re(2 * A4));
    let p = csqrt(P);
    if (p[1] < 0) p = [-p[0], -p[1]];
    roots.push(p);
  }
  // Repeated roots (the isotropic plane): perturb to keep A invertible; the result is continuous.
  if (Math.hypot(roots[0]![0] - roots[1]![0], roots[0]![1] - roots[1]![1]) < 1e-9) roots[1] = [roots[1]![0] + 1e-7, roots[1]![1]];
  const colA = roots.map((p): [Cx, Cx] => [mul(p, re(c12 + c44)), sub(re(-c11), mul(mul(p, p), re(c44)))]);
  const colB = roots.map((p, k): [Cx, Cx] => {
    const [a1, a2] = colA[k]!;
    return [add(mul(mul(p, re(c44)), a1), mul(re(c44), a2)), add(mul(re(c12), a1), mul(mul(p, re(c11)), a2))];
  });
  // B⁻¹ (2×2 complex), then W = A·B⁻¹.
  const [b11, b21] = colB[0]!;
  const [b12, b22] = colB[1]!;
  const det = sub(mul(b11, b22), mul(b12, b21));
  const inv = [
    [div(b22, det), div(mul(re(-1), b12), det)],
    [div(mul(re(-1), b21), det), div(b11, det)],
  ];
  const A = [
    [colA[0]![0], colA[1]![0]],
    [colA[0]![1], colA[1]![1]],
  ];
  const W = [0, 1].map((i) => [0, 1].map((j) => add(mul(A[i]![0]!, inv[0]![j]!), mul(A[i]![1]!, inv[1]![j]!))));
  const q: [Cx, Cx] = [
    [0, 1],
    [-1, 0],
  ];
  const ur: number[] = [];
  for (let k = 0; k < 24; k++) {
    const psi = (k / 24) * 2 * Math.PI;
    const e: Cx = [Math.cos(psi), -Math.sin(psi)];
    const u = [0, 1].map((i) => mul(add(mul(W[i]![0]!, q[0]), mul(W[i]![1]!, q[1])), e)[0]);
    ur.push(u[0]! * Math.cos(psi) + u[1]! * Math.sin(psi));
  }
  const mean = ur.reduce((s, x) => s + x, 0) / ur.length;
  const spread = Math.max(...ur.map((x) => Math.abs(x / mean - 1)));
  return { kappa: 1 / mean, spread };
}
