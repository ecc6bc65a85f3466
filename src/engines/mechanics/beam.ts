// Beam mechanics for standing structures: sections, end conditions and deflections.
// Pure functions over SI numbers.
//
// Prismatic spans use the classical coefficients of Roark's Formulas for Stress and Strain
// (Young & Budynas, 7th ed., Table 8.1). A tapered free-standing span is integrated along its
// height by the unit-load method, δ = ∫ M(x)·m(x) / (E·I(x)) dx, so a body that widens toward its
// base is stiffer there, as it is.

/** How the two ends of a span are held. Root first: the lower end. */
export type EndConditions = 'clamped-free' | 'clamped-pinned' | 'pinned-pinned' | 'clamped-clamped';

/** Where the load acts: spread uniformly along the span, or as a single force. */
export type LoadCase = 'uniform' | 'point';

/**
 * Coefficients for a prismatic span of length L with uniform load w (N/m) or point load F (N):
 * δ_max = cδ · w·L⁴/(E·I) or cδ · F·L³/(E·I), M_max = cM · w·L² or cM · F·L.
 * Uniform load — Roark Table 8.1 cases 2a (cantilever), 2e (both ends simply supported),
 * 2c (fixed, simply supported: δ_max = wL⁴/(184.6EI) at 0.4215L from the pinned end, M_max = wL²/8
 * at the fixed end) and 2d (both ends fixed).
 * Point load — at the free end of a cantilever (case 1a); at mid-span otherwise (cases 1e, 1c
 * with δ_max = FL³/(48√5·EI) at 0.447L from the pinned end and M_max = 3FL/16, and 1d).
 */
export const SPAN_COEFFICIENTS: Record<EndConditions, Record<LoadCase, { deflection: number; moment: number }>> = {
  'clamped-free': { uniform: { deflection: 1 / 8, moment: 1 / 2 }, point: { deflection: 1 / 3, moment: 1 } },
  'pinned-pinned': { uniform: { deflection: 5 / 384, moment: 1 / 8 }, point: { deflection: 1 / 48, moment: 1 / 4 } },
  // (39 + 55√33)/65536 = 0.0054161 = 1/184.6, which Roark rounds to 1/185.
  'clamped-pinned': { uniform: { deflection: (39 + 55 * Math.sqrt(33)) / 65536, moment: 1 / 8 }, point: { deflection: 1 / (48 * Math.sqrt(5)), moment: 3 / 16 } },
  'clamped-clamped': { uniform: { deflection: 1 / 384, moment: 1 / 12 }, point: { deflection: 1 / 192, moment: 1 / 8 } },
};

/** Cross-section of a standing body at one height: the width that takes the load, I and the outer fibre. */
export interface Section {
  /** Width facing the neighbour (the line width, or the outer diameter). */
  width: number;
  /** Second moment of area about the bending axis: per unit length for a line (m³), else m⁴. */
  inertia: number;
  /** Distance from the neutral axis to the outer fibre. */
  fibre: number;
}

export type SectionShape = 'line' | 'solid-round' | 'hollow-round';

/** Section of a line (per unit length: W³/12), a solid round body (πD⁴/64) or a tube (π(D⁴ − Dᵢ⁴)/64). */
export function sectionAt(shape: SectionShape, width: number, wall = 0): Section {
  if (shape === 'line') return { width, inertia: width ** 3 / 12, fibre: width / 2 };
  if (shape === 'solid-round') return { width, inertia: (Math.PI * width ** 4) / 64, fibre: width / 2 };
  const inner = Math.max(0, width - 2 * wall);
  return { width, inertia: (Math.PI * (width ** 4 - inner ** 4)) / 64, fibre: width / 2 };
}

/** Gauss–Legendre nodes and weights on [-1, 1], 24 points: exact for polynomials to degree 47. */
const GL_NODES: number[] = [];
const GL_WEIGHTS: number[] = [];
(() => {
  const n = 24;
  for (let i = 1; i <= n; i++) {
    // Newton iteration on P_n from the Chebyshev-like first guess.
    let x = Math.cos((Math.PI * (i - 0.25)) / (n + 0.5));
    let dp = 0;
    for (let iter = 0; iter < 100; iter++) {
      let p0 = 1;
      let p1 = x;
      for (let k = 2; k <= n; k++) {
        const p2 = ((2 * k - 1) * x * p1 - (k - 1) * p0) / k;
        p0 = p1;
        p1 = p2;
      }
      dp = (n * (x * p1 - p0)) / (x * x - 1);
      const dx = p1 / dp;
      x -= dx;
      if (Math.abs(dx) < 1e-16) break;
    }
    GL_NODES.push(x);
    GL_WEIGHTS.push(2 / ((1 - x * x) * dp * dp));
  }
})();

/** ∫_a^b f, by Gauss–Legendre on `panels` equal panels. */
export function integrate(f: (x: number) => number, a: number, b: number, panels = 8): number {
  const h = (b - a) / panels;
  let sum = 0;
  for (let p = 0; p < panels; p++) {
    const mid = a + (p + 0.5) * h;
    for (let i = 0; i < GL_NODES.length; i++) sum += GL_WEIGHTS[i]! * f(mid + (GL_NODES[i]! * h) / 2);
  }
  return (sum * h) / 2;
}

/**
 * Tip deflection and root moment of a cantilever whose width varies linearly from `tipWidth` at
 * the free end to `rootWidth` at the clamped end, under a uniform pressure `pressure` on the face
 * it presents (uniform case) or a force `force` at the tip (point case).
 * Unit-load method with x measured from the tip: m(x) = x; for a line the load per unit length of
 * line is the pressure itself; for a round body it is pressure × local width.
 */
export function taperedCantilever(opts: {
  shape: SectionShape;
  length: number;
  tipWidth: number;
  rootWidth: number;
  wall?: number;
  modulus: number;
  load: { case: 'uniform'; pressure: number } | { case: 'point'; force: number };
}): { deflection: number; rootMoment: number; rootSection: Section } {
  const { shape, length: L, tipWidth: a, rootWidth: b, modulus: E, load } = opts;
  const slope = (b - a) / L;
  const widthAt = (x: number) => a + slope * x;
  // Bending moment at distance x from the tip.
  const moment = (x: number): number => {
    if (load.case === 'point') return load.force * x;
    if (shape === 'line') return (load.pressure * x * x) / 2;
    // ∫0^x p·(a + s·ξ)(x − ξ) dξ = p·(a·x²/2 + s·x³/6)
    return load.pressure * ((a * x * x) / 2 + (slope * x ** 3) / 6);
  };
  const deflection = integrate((x) => (moment(x) * x) / (E * sectionAt(shape, widthAt(x), opts.wall).inertia), 0, L);
  return { deflection, rootMoment: moment(L), rootSection: sectionAt(shape, b, opts.wall) };
}
