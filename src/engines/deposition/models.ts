// Film deposition in deep openings: the published models the deposition engine is built on.
// Pure functions over SI numbers. (The `deposition` and `fill` blocks and their quantities are
// wired on top of these; see the project notes for what is still to come.)
//
// - Atomic layer deposition: Gordon, Hausmann, Kim & Shepard, Chem. Vap. Deposition 9, 73 (2003),
//   the minimum exposure to saturate a hole of aspect ratio a = L/d:
//   P·t = S·√(2π·m·k_B·T)·(1 + 19a/4 + 3a²/2); trenches use the equivalent aspect ratio L/(2w)
//   (Cremers, Puurunen & Dendooven, Appl. Phys. Rev. 6, 021302 (2019)).
// - Chemical vapour deposition: one-dimensional Knudsen diffusion with first-order wall reaction
//   in a hole [derived; same structure as Yanguas-Gil & Elam, Chem. Vap. Deposition 18, 46 (2012)]:
//   D_K = d·v̄/3, wall loss s·n·v̄/4 per area, so n″ = (3s/d²)·n, Thiele modulus φ = √(3s)·L/d, and
//   step coverage (bottom over top) 1/cosh φ with a non-reacting bottom or
//   1/[cosh φ + (√(3s)/4)·sinh φ] with a reacting one.
// - Physical vapour deposition: line-of-sight arrival from a cosine source filling the opening,
//   configuration (view) factors of coaxial discs and parallel strips (Howell, Mengüç & Siegel,
//   Thermal Radiation Heat Transfer, view-factor catalogue).

import { solveTridiagonal } from '../numeric.ts';

export const BOLTZMANN = 1.380649e-23; // J/K, exact (SI 2019)
export const AVOGADRO = 6.02214076e23; // 1/mol, exact (SI 2019)

/** Gordon et al. (2003): minimum ALD exposure P·t (Pa·s) to saturate an opening of aspect ratio a. */
export function aldRequiredExposure(siteDensity: number, molarMass: number, temperature: number, aspectRatio: number): number {
  const m = molarMass / AVOGADRO;
  return siteDensity * Math.sqrt(2 * Math.PI * m * BOLTZMANN * temperature) * (1 + (19 / 4) * aspectRatio + 1.5 * aspectRatio * aspectRatio);
}

/** The aspect ratio Gordon's formula takes: L/d for round openings, L/(2w) for long trenches. */
export function aldAspectRatio(elongated: boolean, depth: number, width: number): number {
  return elongated ? depth / (2 * width) : depth / width;
}

/** Thiele modulus of a hole (or a trench through its equivalent diameter 2w): φ = √(3s)·L/d. */
export function thieleModulus(sticking: number, depth: number, diameter: number): number {
  return Math.sqrt(3 * sticking) * (depth / diameter);
}

/** CVD step coverage, bottom over top, from the closed-form diffusion–reaction solution. */
export function cvdStepCoverage(sticking: number, depth: number, diameter: number, reactingBottom = true): number {
  const phi = thieleModulus(sticking, depth, diameter);
  if (phi > 700) return 0; // cosh overflows; the coverage is below 1e-300 anyway
  return reactingBottom ? 1 / (Math.cosh(phi) + (Math.sqrt(3 * sticking) / 4) * Math.sinh(phi)) : 1 / Math.cosh(phi);
}

/**
 * The same diffusion–reaction problem solved numerically on a grid (second-order finite
 * differences, Thomas algorithm): n″ = κ²n on [0, L] with n(0) = 1 and, at the bottom,
 * n′ = 0 (non-reacting) or D_K·n′ = −(s·v̄/4)·n, i.e. n′ = −(3s/(4d))·n (reacting). Returns the
 * concentration profile normalised to the top; growth is proportional to it.
 */
export function cvdProfile(sticking: number, depth: number, diameter: number, reactingBottom = true, points = 2001): number[] {
  const n = points;
  const h = depth / (n - 1);
  const k2 = (3 * sticking) / (diameter * diameter);
  const robin = reactingBottom ? (3 * sticking) / (4 * diameter) : 0;
  // Tridiagonal system: (n_{i−1} − 2n_i + n_{i+1})/h² − κ²n_i = 0.
  const a = new Float64Array(n);
  const b = new Float64Array(n);
  const c = new Float64Array(n);
  const r = new Float64Array(n);
  b[0] = 1;
  r[0] = 1;
  for (let i = 1; i < n - 1; i++) {
    a[i] = 1;
    b[i] = -2 - k2 * h * h;
    c[i] = 1;
  }
  // Bottom: ghost node from n′ = −robin·n: n_{N} = n_{N−2} − 2h·robin·n_{N−1}.
  a[n - 1] = 2;
  b[n - 1] = -2 - k2 * h * h - 2 * h * robin;
  return solveTridiagonal(a, b, c, r);
}

/** PVD: fraction of the flux entering a round hole of aspect ratio A that lands at the bottom centre (per area, relative to the top). */
export function pvdHoleBottomCentre(aspectRatio: number): number {
  return 1 / (1 + 4 * aspectRatio * aspectRatio);
}

/** PVD: average over the bottom of a round hole: coaxial equal discs at separation L, X = 2A: [(2 + X²) − X√(X² + 4)]/2. */
export function pvdHoleBottomAverage(aspectRatio: number): number {
  const x = 2 * aspectRatio;
  return (2 + x * x - x * Math.sqrt(x * x + 4)) / 2;
}

/** PVD: centre line of a long trench bottom: 1/√(1 + 4A²). */
export function pvdTrenchBottomCentre(aspectRatio: number): number {
  return 1 / Math.sqrt(1 + 4 * aspectRatio * aspectRatio);
}

/** PVD: average over a long trench bottom (parallel strips): √(1 + A²) − A. */
export function pvdTrenchBottomAverage(aspectRatio: number): number {
  return Math.sqrt(1 + aspectRatio * aspectRatio) - aspectRatio;
}
