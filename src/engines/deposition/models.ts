// Film deposition in deep openings: the published models the deposition and fill engines are built
// on. Pure functions over SI numbers.
//
// - Where a reacting species arrives (CVD with sticking probability s; PVD as s = 1): the reactive-
//   wall form of Clausing's integral equation (Clausing, Ann. Phys. 12, 961 (1932)). The flux G
//   arriving per area on every surface of the opening, relative to the flux on the open top surface,
//   obeys A_e·G_e = T_e + Σ_f (1 − s)·A_f·F_fe·G_f: what arrives straight from the opening above (T)
//   plus what the other surfaces re-emit diffusely after not reacting. With the same sticking
//   everywhere G is the film thickness over the thickness on the top: the coverage profile, and
//   its value on the bottom is the step coverage. The walls are cut into bands and the bottom into
//   rings; the exchange areas A·F between them are exact, from the view factor of two coaxial discs
//   (Howell, Mengüç & Siegel, Thermal Radiation Heat Transfer, view-factor catalogue) or, for a long
//   trench, of two parallel strips (Hottel's crossed strings), by view-factor algebra — which holds
//   because a straight opening is convex, so every surface sees every other unobstructed. The
//   solution on the bands is piecewise constant, so the error falls as the band height squared; two
//   solutions (bands of half and a quarter of the local width) are extrapolated (Richardson).
//   With s = 0 on the walls and an absorbing bottom this is Clausing's transmission problem: it
//   reproduces Cole's tube table (Livesey 1998, Table 2.5) and the slot's Nyström solution.
// - Atomic layer deposition: Gordon, Hausmann, Kim & Shepard, Chem. Vap. Deposition 9, 73 (2003):
//   P·t = S·√(2π·m·k_B·T)·(1 + 19a/4 + 3a²/2) for a hole of aspect ratio a = L/d, trenches through
//   the equivalent aspect ratio L/(2w) of Cremers, Puurunen & Dendooven, Appl. Phys. Rev. 6, 021302
//   (2019). Gordon's formula comes from a saturation front that advances as fast as the flux
//   through the resistance of the saturated part above it allows (Dushman's 1/W = 1 + 3L/(8R)).
//   Along a taper we carry out the same derivation with the local cross-section [derived; no
//   published tapered form was found]: with R(z) = ½(1/A₀ + 1/A(z)) + ∫₀ᶻ 3P/(16A²)dz′ — the
//   orifice resistance shared between the two ends, each at its own area, plus the Knudsen
//   resistance of a channel of area A and perimeter P (hydraulic diameter 4A/P), in units of
//   4/v̄ — Γ₀·t/S = ∫₀ᴸ P·R dz + A_b·R(L). For vertical walls this is exactly Gordon's polynomial
//   (hole) and Cremers' trench mapping; the equivalent aspect ratio of any profile is the a at
//   which Gordon's polynomial takes this value.

import { gaussLegendre } from '../numeric.ts';

export const BOLTZMANN = 1.380649e-23; // J/K, exact (SI 2019)
export const AVOGADRO = 6.02214076e23; // 1/mol, exact (SI 2019)

// ── Openings ──────────────────────────────────────────────────────────────────────────────────

/** An opening as its width at increasing depths from the top (piecewise linear between them). */
export interface Opening {
  /** A long trench (widths are widths) rather than a round hole (widths are diameters). */
  elongated: boolean;
  /** Depths below the top, rising from 0; the last is the bottom. */
  z: number[];
  width: number[];
}

/** A straight (possibly tapered) opening. */
export function straightOpening(elongated: boolean, depth: number, top: number, bottom: number): Opening {
  return { elongated, z: [0, depth], width: [top, bottom] };
}

export function depthOf(o: Opening): number {
  return o.z[o.z.length - 1]!;
}

/** Width at depth z, linear between the profile's points. */
export function widthAt(o: Opening, z: number): number {
  return interpolate(o.z, o.width, z);
}

/** Linear interpolation in a rising table, held at its ends. */
function interpolate(xs: readonly number[], ys: readonly number[], x: number): number {
  // At a knot every branch gives the knot's value: the boundaries may fall either way.
  // Stryker disable next-line EqualityOperator: see above
  if (x <= xs[0]!) return ys[0]!;
  const n = xs.length;
  // Stryker disable next-line EqualityOperator: see above
  if (x >= xs[n - 1]!) return ys[n - 1]!;
  let lo = 0;
  // Stryker disable next-line ArithmeticOperator: from n + 1 the search reads past the end (undefined ≤ x is false) and narrows to the same interval
  let hi = n - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    // Stryker disable next-line EqualityOperator: see above
    if (xs[mid]! <= x) lo = mid;
    else hi = mid;
  }
  const t = (x - xs[lo]!) / (xs[hi]! - xs[lo]!);
  return ys[lo]! + t * (ys[hi]! - ys[lo]!);
}

/** Area of a cross-section of width w: a disc, or a strip per unit length of trench. */
function sectionArea(elongated: boolean, w: number): number {
  return elongated ? w : (Math.PI * w * w) / 4;
}

/** Perimeter of a cross-section (both walls per unit length of trench), without the wall's slope. */
function sectionPerimeter(elongated: boolean, w: number): number {
  return elongated ? 2 : Math.PI * w;
}

// ── Arrival of a reacting species: the reactive-wall Clausing problem ──────────────────────────

/** Arriving flux per area relative to the open top surface (the coverage), on the walls and the bottom. */
export interface Arrival {
  /** Depths of the band boundaries, from 0 to the bottom. */
  z: number[];
  /** Coverage of each wall band (between z[i] and z[i + 1]). */
  wall: number[];
  /** Coverage averaged over the bottom (0 for an opening that ends in a point). */
  bottom: number;
}

/**
 * Exchange area A_a·F_ab between two centred, parallel cross-sections of half-widths a and b a
 * distance h apart: coaxial discs, F₁₂ = ½[X − √(X² − 4(b/a)²)], X = 1 + (h² + b²)/a², written
 * without the cancellation (Howell, Mengüç & Siegel, catalogue); parallel strips by crossed strings,
 * w₁F₁₂ = √(h² + (a + b)²) − √(h² + (a − b)²), rationalised likewise.
 */
function exchangeArea(elongated: boolean, a: number, b: number, h: number): number {
  if (elongated) return (4 * a * b) / (Math.sqrt(h * h + (a + b) ** 2) + Math.sqrt(h * h + (a - b) ** 2));
  const y = a * a + b * b + h * h;
  return (2 * Math.PI * a * a * b * b) / (y + Math.sqrt(Math.max(0, y * y - 4 * a * a * b * b)));
}

const BOTTOM_RINGS = 4;

/**
 * Solve the reactive-wall problem on given band boundaries (z, radius r at each): the coverage of
 * each band and of each bottom ring. View-factor algebra: what band i sends to band j is what
 * crosses section j minus what crosses section j + 1, and by reciprocity from the exchange areas
 * X(p, q) between sections; X(p, p) is the whole section (everything leaving it upward crosses it).
 */
function solveBands(elongated: boolean, z: number[], r: number[], sticking: number, bottomSticking: number): { wall: number[]; area: number[]; bottom: number } {
  const N = z.length - 1;
  const area = (half: number) => sectionArea(elongated, 2 * half);
  const xs = new Float64Array((N + 1) * (N + 1));
  // Stryker disable next-line EqualityOperator: X(N, N) is never read (the bottom band's self term uses the section's area)
  for (let p = 0; p <= N; p++) {
    for (let q = p; q <= N; q++) {
      // A section exchanges its whole area with itself: exchangeArea(a, a, 0) is that area exactly
      // in closed form, and the branch spares the rounding of its square root.
      // Stryker disable next-line ConditionalExpression: see above
      const v = p === q ? area(r[p]!) : exchangeArea(elongated, r[p]!, r[q]!, z[q]! - z[p]!);
      xs[p * (N + 1) + q] = v;
      xs[q * (N + 1) + p] = v;
    }
  }
  const X = (p: number, q: number) => xs[p * (N + 1) + q]!;
  // Bottom rings of equal area (strips of equal width in a trench), radii rho[0..R].
  // Stryker disable next-line EqualityOperator: a bottom of exactly 1e-9 of the mouth, either way
  const rings = r[N]! > 1e-9 * r[0]! ? BOTTOM_RINGS : 0;
  const rho = Array.from({ length: rings + 1 }, (_, m) => (elongated ? (r[N]! * m) / rings : r[N]! * Math.sqrt(m / rings)));
  // Exchange area of the bottom disc of radius rho[m] with section q (the whole disc when q = N).
  // (exchangeArea(ρ, r, 0) with ρ ≤ r is the smaller disc's area as well: the same identity.)
  // Stryker disable next-line ConditionalExpression: see above
  const Xd = (m: number, q: number) => (q === N ? area(rho[m]!) : exchangeArea(elongated, rho[m]!, r[q]!, z[N]! - z[q]!));
  const n = N + rings;
  const A = new Float64Array(n);
  const T = new Float64Array(n);
  const S = new Float64Array(n * n); // symmetric exchange areas A_e·F_ef
  const put = (e: number, f: number, v: number) => {
    // Rounding can leave a tiny negative difference between far elements: nothing is exchanged.
    S[e * n + f] = Math.max(0, v);
    S[f * n + e] = Math.max(0, v);
  };
  for (let i = 0; i < N; i++) {
    const slant = Math.hypot(z[i + 1]! - z[i]!, r[i + 1]! - r[i]!);
    A[i] = elongated ? 2 * slant : Math.PI * (r[i]! + r[i + 1]!) * slant;
    T[i] = X(0, i) - X(0, i + 1);
    // A band sees itself (the opposite wall of a trench, the rest of a ring): what leaves it
    // through neither of its end sections.
    put(i, i, A[i]! - (area(r[i]!) - X(i, i + 1)) - (area(r[i + 1]!) - X(i + 1, i)));
    for (let j = i + 1; j < N; j++) put(i, j, X(j, i + 1) - X(j, i) - (X(j + 1, i + 1) - X(j + 1, i)));
  }
  for (let m = 0; m < rings; m++) {
    const e = N + m;
    A[e] = area(rho[m + 1]!) - area(rho[m]!);
    T[e] = Xd(m + 1, 0) - Xd(m, 0);
    for (let j = 0; j < N; j++) put(e, j, Xd(m + 1, j + 1) - Xd(m, j + 1) - (Xd(m + 1, j) - Xd(m, j)));
  }
  // A_e·G_e = T_e + Σ_f S_ef·(1 − s_f)·G_f. In y = (1 − s)·G over the surfaces that re-emit, the
  // system (A_e/(1 − s_e))·y_e − Σ_f S_ef·y_f = T_e is symmetric and diagonally dominant (some of
  // what leaves escapes through the top): Cholesky. A surface that absorbs everything (s = 1)
  // re-emits nothing; its arrival follows from the others'.
  const keep = (e: number) => 1 - (e >= N ? bottomSticking : sticking);
  // Left in the system, an absorbing surface would get an infinite diagonal and solve to y = 0
  // exactly (IEEE arithmetic); the filter keeps the algebra finite.
  // Stryker disable next-line ConditionalExpression,EqualityOperator,MethodExpression: see above
  const emit = Array.from({ length: n }, (_, e) => e).filter((e) => keep(e) > 0);
  const ne = emit.length;
  const K = new Float64Array(ne * ne);
  const y = new Float64Array(ne);
  emit.forEach((e, i) => {
    y[i] = T[e]!;
    for (let j = 0; j <= i; j++) K[i * ne + j] = (i === j ? A[e]! / keep(e) : 0) - S[e * n + emit[j]!]!;
  });
  solveCholesky(K, y, ne);
  // Every surface's arrival from its balance A_e·G_e = T_e + Σ_f S_ef·y_f (for one that re-emits,
  // the same as y_e/(1 − s_e)).
  const G = Array.from(A, (a, e) => emit.reduce((v, f, i) => v + S[e * n + f]! * y[i]!, T[e]!) / a);
  let bottom = 0;
  for (let q = 0; q < rings; q++) bottom += A[N + q]! * G[N + q]!;
  return { wall: G.slice(0, N), area: Array.from(A.subarray(0, N)), bottom: rings ? bottom / area(r[N]!) : 0 };
}

/**
 * Solve K·x = b for a symmetric positive-definite K given by its lower triangle (row-major);
 * overwrites K and b. Loop bounds one past the end are equivalent: a typed array reads undefined
 * there (NaN in what follows) and drops writes past its end.
 */
function solveCholesky(K: Float64Array, b: Float64Array, n: number): void {
  // Stryker disable next-line EqualityOperator: see above
  for (let j = 0; j < n; j++) {
    let d = K[j * n + j]!;
    for (let k = 0; k < j; k++) d -= K[j * n + k]! ** 2;
    const l = Math.sqrt(d);
    K[j * n + j] = l;
    // Stryker disable next-line EqualityOperator: see above
    for (let i = j + 1; i < n; i++) {
      let v = K[i * n + j]!;
      for (let k = 0; k < j; k++) v -= K[i * n + k]! * K[j * n + k]!;
      K[i * n + j] = v / l;
    }
  }
  // Stryker disable next-line EqualityOperator: see above
  for (let i = 0; i < n; i++) {
    let v = b[i]!;
    for (let k = 0; k < i; k++) v -= K[i * n + k]! * b[k]!;
    b[i] = v / K[i * n + i]!;
  }
  // Stryker disable next-line ArithmeticOperator: see above
  for (let i = n - 1; i >= 0; i--) {
    let v = b[i]!;
    for (let k = i + 1; k < n; k++) v -= K[k * n + i]! * b[k]!;
    b[i] = v / K[i * n + i]!;
  }
}

/**
 * Band boundaries for the coarse solution: bands half the local width tall and at least 16 over
 * the depth (so a shallow opening still has a profile), graded from a sixteenth of the width at
 * the mouth, where the coverage falls fastest. Beyond `maxBands` every band is lengthened
 * in the same proportion to its local width (the error grows, the cost stays bounded); no band is
 * shorter than a quarter of depth/maxBands, which bounds the count where the opening ends in a point.
 */
function bandBoundaries(o: Opening, maxBands: number): number[] {
  const depth = depthOf(o);
  const cut = (scale: number) => {
    const z = [0];
    for (;;) {
      const at = z[z.length - 1]!;
      const w = scale * widthAt(o, at);
      const step = Math.max(depth / (4 * maxBands), Math.min(depth / 16, 0.5 * w, Math.max(w / 16, at / 2)));
      // Merge a last sliver into the band before it.
      // Stryker disable next-line EqualityOperator: a sliver of exactly 0.3 of a step, either way
      if (at + 1.3 * step >= depth) break;
      z.push(at + step);
    }
    z.push(depth);
    return z;
  };
  let scale = 1;
  let z = cut(scale);
  // The count is not quite proportional to the scale (the grading, the floor), so a pass may land a
  // few bands over; four passes bound the cost (an opening that ends in a point, where the floor
  // sets the count, can stay a band or three over: 151 for a cone of aspect ratio 100 at 150).
  for (let pass = 0; pass < 4; pass++) {
    // Stryker disable next-line EqualityOperator: at the cap exactly, a pass rescales by 1
    if (z.length - 1 <= maxBands) break;
    z = cut((scale *= (z.length - 1) / maxBands));
  }
  return z;
}

/**
 * Coverage of the walls and the bottom of an opening by a species of sticking probability s (on
 * the walls; `bottomSticking` on the bottom, s unless given). s = 1 is line-of-sight arrival (PVD).
 */
export function arrival(o: Opening, sticking: number, { bottomSticking = sticking, maxBands = 150 }: { bottomSticking?: number; maxBands?: number } = {}): Arrival {
  const z = bandBoundaries(o, maxBands);
  const fine = z.flatMap((v, i) => (i === 0 ? [v] : [(z[i - 1]! + v) / 2, v]));
  const radii = (zs: number[]) => zs.map((v) => widthAt(o, v) / 2);
  const coarse = solveBands(o.elongated, z, radii(z), sticking, bottomSticking);
  const half = solveBands(o.elongated, fine, radii(fine), sticking, bottomSticking);
  // Richardson: the error goes as the band height squared, so (4·G_{h/2} − G_h)/3. Where the two
  // disagree by more than a factor of two (a very steep decay) the finer one is kept.
  const extrapolate = (h: number, h2: number) => (h2 > 0.5 * h && h2 < 2 * h ? Math.max(0, (4 * h2 - h) / 3) : h2);
  const wall = coarse.wall.map((g, i) => {
    const [a1, a2] = [half.area[2 * i]!, half.area[2 * i + 1]!];
    return extrapolate(g, (a1 * half.wall[2 * i]! + a2 * half.wall[2 * i + 1]!) / (a1 + a2));
  });
  return { z, wall, bottom: extrapolate(coarse.bottom, half.bottom) };
}

/** Wall coverage at depth z, linear between band centres. */
export function wallCoverageAt(a: Arrival, z: number): number {
  const centres = a.wall.map((_, i) => (a.z[i]! + a.z[i + 1]!) / 2);
  return interpolate(centres, a.wall, z);
}

// ── Atomic layer deposition ───────────────────────────────────────────────────────────────────

/** Gordon et al. (2003) on a flat surface: the Hertz–Knudsen dose S·√(2π·m·k_B·T) that delivers S molecules per area. */
export function aldFlatExposure(siteDensity: number, molarMass: number, temperature: number): number {
  return siteDensity * Math.sqrt(2 * Math.PI * (molarMass / AVOGADRO) * BOLTZMANN * temperature);
}

/**
 * The aspect ratio at which Gordon's factor 1 + 19a/4 + 3a²/2 takes the value f (the equivalent
 * aspect ratio of an opening that needs f flat doses): a = [−19/4 + √((19/4)² + 6(f − 1))]/3.
 */
export function aspectRatioOfFactor(f: number): number {
  // An opening needs at least one flat dose; the clamp is for rounding below it.
  return Math.max(0, (-19 / 4 + Math.sqrt((19 / 4) ** 2 + 6 * (f - 1))) / 3);
}

/**
 * Exposure to saturate the opening down to `depth` (its bottom unless given or deeper), over the flat
 * dose: Γ₀t/S = ∫₀ᶻ P·R dz + A(z)·R(z), R(z) = ½(1/A₀ + 1/A(z)) + ∫₀ᶻ 3P/(16A²) dz (see the head of
 * this file). On a straight piece the Knudsen integral is exact: ∫dz/w² = Δz/(w₁w₂),
 * ∫dz/w³ = Δz(w₁ + w₂)/(2w₁²w₂²); the outer one takes 8-point Gauss–Legendre per piece. The sites
 * on a sloping wall count its slant area.
 */
export function aldExposureFactor(o: Opening, depth = depthOf(o)): number {
  const to = Math.min(depth, depthOf(o)); // no deeper than the bottom
  const { x, w } = gaussLegendre(8);
  const e = o.elongated;
  // Knudsen resistance of a straight piece from width w1, over a height dz, to width w2.
  const knudsen = (w1: number, w2: number, dz: number) => (e ? (3 / 8) * (dz / (w1 * w2)) : (3 / Math.PI) * ((dz * (w1 + w2)) / (2 * w1 * w1 * w2 * w2)));
  const entrance = 1 / (2 * sectionArea(e, o.width[0]!));
  const R = (inner: number, width: number) => entrance + 1 / (2 * sectionArea(e, width)) + inner;
  let above = 0; // Knudsen resistance down to the start of the current piece
  let total = 0;
  // Pieces from the top while they start above `to` (the depths rise, so each has dz > 0; the last
  // piece starts above the bottom, and `to` is at most the bottom).
  for (let i = 0; o.z[i]! < to; i++) {
    const [z1, w1] = [o.z[i]!, o.width[i]!];
    const z2 = Math.min(o.z[i + 1]!, to);
    const w2 = widthAt(o, z2);
    const dz = z2 - z1;
    const slope = Math.hypot(1, (w2 - w1) / (2 * dz));
    for (let k = 0; k < x.length; k++) {
      const zk = z1 + ((x[k]! + 1) * dz) / 2;
      const wk = w1 + ((w2 - w1) * (zk - z1)) / dz;
      total += ((w[k]! * dz) / 2) * sectionPerimeter(e, wk) * slope * R(above + knudsen(w1, wk, zk - z1), wk);
    }
    above += knudsen(w1, w2, dz);
  }
  const end = widthAt(o, to);
  return total + sectionArea(e, end) * R(above, end);
}

/**
 * Deepest depth an exposure of `factor` flat doses saturates: the z at which the opening cut off
 * there would just be saturated (so it reaches the bottom exactly when the exposure suffices).
 */
export function aldSaturatedDepth(o: Opening, factor: number): number {
  const depth = depthOf(o);
  // Stryker disable next-line EqualityOperator: an exposure exactly the opening's need, either way
  if (aldExposureFactor(o) <= factor) return depth;
  // Bisection to 1e-9 of the depth (30 halvings). Below one flat dose it ends at 0: the factor of
  // an opening cut off at the mouth is 1.
  let [lo, hi] = [0, depth];
  // Stryker disable next-line EqualityOperator: a bracket of exactly 1e-9 of the depth, either way
  while (hi - lo > 1e-9 * depth) {
    const mid = (lo + hi) / 2;
    // Stryker disable next-line EqualityOperator: an exposure exactly the need at mid, either way
    if (aldExposureFactor(o, mid) <= factor) lo = mid;
    else hi = mid;
  }
  return lo;
}
