// Beam mechanics for standing structures: sections and a finite-element solution of the whole
// standing body as one continuous beam — clamped at its base, held laterally by its support
// lattices, free (or held) at its top — with its section varying along the taper.
// Pure functions over SI numbers.
//
// Method: Euler–Bernoulli beam elements with cubic Hermite shape functions (two degrees of freedom
// per node: deflection and rotation), element stiffness (E·I/ℓ³)[12 6ℓ −12 6ℓ; 6ℓ 4ℓ² −6ℓ 2ℓ²; …],
// consistent nodal loads for a uniform line load, E·I taken at each element's mid-height. See any
// finite-element text, e.g. Cook, Malkus, Plesha & Witt, Concepts and Applications of Finite
// Element Analysis, 4th ed., ch. 2. The stiffness matrix is banded (half-bandwidth 3), so one
// solution costs O(n). The prismatic cases reproduce Roark's formulas (tests check them).

export type SectionShape = 'line' | 'solid-round' | 'hollow-round';

/** Cross-section of a standing body at one height. */
export interface Section {
  /** Width facing the neighbour (the line width, or the outer diameter). */
  width: number;
  /** Second moment of area about the bending axis: per unit length for a line (m³), else m⁴. */
  inertia: number;
  /** Distance from the neutral axis to the outer fibre. */
  fibre: number;
}

/** Section of a line (per unit length: W³/12), a solid round body (πD⁴/64) or a tube (π(D⁴ − Dᵢ⁴)/64). */
export function sectionAt(shape: SectionShape, width: number, wall = 0): Section {
  if (shape === 'line') return { width, inertia: width ** 3 / 12, fibre: width / 2 };
  if (shape === 'solid-round') return { width, inertia: (Math.PI * width ** 4) / 64, fibre: width / 2 };
  const inner = Math.max(0, width - 2 * wall);
  return { width, inertia: (Math.PI * (width ** 4 - inner ** 4)) / 64, fibre: width / 2 };
}

export type Hold = 'pinned' | 'clamped';

export interface BeamModel {
  /** Node heights above the base, rising from 0 to the top. */
  z: number[];
  /** E·I of each element (between nodes i and i+1). */
  ei: number[];
  /** Outer-fibre distance over I of each element, to turn moments into stresses. */
  stressPerMoment: number[];
  /** Nodes held laterally, and how (the base is always clamped). */
  held: Map<number, Hold>;
}

/** Build the element mesh: at least `elements` elements, with a node at every support height. */
export function meshBeam(opts: {
  height: number;
  supports: number[];
  hold: Hold;
  section: (z: number) => Section;
  modulus: number;
  elements?: number;
}): BeamModel {
  const { height: H, supports } = opts;
  const n = opts.elements ?? 96;
  const points = new Set<number>();
  for (let i = 0; i <= n; i++) points.add((H * i) / n);
  const inside = supports.filter((s) => s > 0 && s <= H);
  for (const s of inside) points.add(s);
  // Merge points closer than a millionth of the height (a support on a grid point).
  const z: number[] = [];
  // Stryker disable next-line EqualityOperator: points exactly a millionth of the height apart are not a case
  for (const p of [...points].sort((a, b) => a - b)) if (z.length === 0 || p - z[z.length - 1]! > H * 1e-6) z.push(p);
  z[z.length - 1] = H;
  const ei: number[] = [];
  const stressPerMoment: number[] = [];
  for (let i = 0; i + 1 < z.length; i++) {
    const s = opts.section((z[i]! + z[i + 1]!) / 2);
    ei.push(opts.modulus * s.inertia);
    stressPerMoment.push(s.fibre / s.inertia);
  }
  const held = new Map<number, Hold>([[0, 'clamped']]);
  for (const s of inside) {
    let best = 0;
    // Stryker disable next-line EqualityOperator: past the last node the distance is NaN (never nearer); no two nodes tie (the support is a node, or merged within 1e-6 H of one)
    for (let i = 1; i < z.length; i++) if (Math.abs(z[i]! - s) < Math.abs(z[best]! - s)) best = i;
    held.set(best, opts.hold);
  }
  return { z, ei, stressPerMoment, held };
}

/** A factorised stiffness matrix, ready for any number of load vectors. */
export interface BeamSolver {
  model: BeamModel;
  /**
   * Deflections and rotations for nodal forces f (2 per node: force, moment). `first` may name the
   * first entry of f that is not zero (a point load high on the body): the forward sweep starts there.
   */
  solve: (f: Float64Array, first?: number) => Float64Array;
}

const BAND = 3; // half-bandwidth of the assembled stiffness matrix

export function factorBeam(model: BeamModel): BeamSolver {
  const nDof = 2 * model.z.length;
  // Banded symmetric storage: k[i][d] = K(i, i + d), d = 0..BAND.
  const k = Array.from({ length: nDof }, () => new Float64Array(BAND + 1));
  for (let e = 0; e + 1 < model.z.length; e++) {
    const l = model.z[e + 1]! - model.z[e]!;
    const c = model.ei[e]! / l ** 3;
    // The upper triangle of the symmetric element matrix, row by row from the diagonal.
    const upper = [
      [12, 6 * l, -12, 6 * l],
      [4 * l * l, -6 * l, 2 * l * l],
      [12, -6 * l],
      [4 * l * l],
    ];
    upper.forEach((row, a) => row.forEach((value, d) => (k[2 * e + a]![d]! += c * value)));
  }
  // Held degrees of freedom: deflection at every held node, rotation too where clamped.
  const fixed = new Set<number>();
  for (const [node, hold] of model.held) {
    fixed.add(2 * node);
    if (hold === 'clamped') fixed.add(2 * node + 1);
  }
  for (const i of fixed) {
    for (let d = 0; d <= BAND; d++) k[i]![d] = 0;
    // Stryker disable next-line ConditionalExpression,EqualityOperator: band rows ignore writes past their end; row 0 (the clamped base) is zeroed whole anyway
    for (let d = 1; d <= BAND && i - d >= 0; d++) k[i - d]![d] = 0;
    k[i]![0] = 1;
  }
  // Banded Cholesky: K = Lᵀ·L stored in place (upper band).
  // Stryker disable next-line EqualityOperator: a row past the last has no band entries to visit
  for (let i = 0; i < nDof; i++) {
    // Stryker disable next-line ConditionalExpression,LogicalOperator,EqualityOperator,ArithmeticOperator: entries past the band or the matrix are never assembled (zero) and writes past a band row are ignored
    for (let d = 0; d <= BAND && i + d < nDof; d++) {
      let sum = k[i]![d]!;
      // Stryker disable next-line EqualityOperator: row 0 (the clamped base) has nothing off its diagonal
      for (let m = 1; m <= BAND - d && i - m >= 0; m++) sum -= k[i - m]![m]! * k[i - m]![m + d]!;
      if (d === 0) {
        // Stryker disable next-line EqualityOperator: a zero pivot (sum = 0) makes the next pivot NaN, which throws as well
        if (!(sum > 0)) throw new Error('beam stiffness matrix is not positive definite');
        k[i]![0] = Math.sqrt(sum);
      } else k[i]![d] = sum / k[i]![0]!;
    }
  }
  // The factor in one flat array (row i, band d at i·(BAND + 1) + d): the solve runs per liquid level.
  const W = BAND + 1;
  const kf = new Float64Array(nDof * W);
  for (let i = 0; i < nDof; i++) kf.set(k[i]!, i * W);
  const held = [...fixed];
  const solve = (f: Float64Array, first = 0): Float64Array => {
    const y = Float64Array.from(f);
    for (const i of held) y[i] = 0;
    // Entries before `first` are zero and stay zero in the forward sweep.
    for (let i = first; i < nDof; i++) {
      let sum = y[i]!;
      // Stryker disable next-line EqualityOperator: row 0 (the clamped base) has nothing off its diagonal
      for (let m = 1; m <= BAND && i - m >= 0; m++) sum -= kf[(i - m) * W + m]! * y[i - m]!;
      y[i] = sum / kf[i * W]!;
    }
    // Stryker disable next-line EqualityOperator: y[0], the clamped base's deflection, is 0 from the forward sweep and stays so
    for (let i = nDof - 1; i >= 0; i--) {
      let sum = y[i]!;
      for (let d = 1; d <= BAND && i + d < nDof; d++) sum -= kf[i * W + d]! * y[i + d]!;
      y[i] = sum / kf[i * W]!;
    }
    return y;
  };
  return { model, solve };
}

/**
 * Largest |deflection| along the beam, sampling the Hermite cubic of every element (its nodal
 * values are exact; between nodes the cubic follows the deflected shape closely).
 */
export function maxDeflection(model: BeamModel, u: Float64Array, samples = 8): { value: number; z: number } {
  let best = { value: 0, z: 0 };
  // Stryker disable next-line EqualityOperator,ArithmeticOperator: elements past the last read no nodes (NaN never beats the best)
  for (let e = 0; e + 1 < model.z.length; e++) {
    const l = model.z[e + 1]! - model.z[e]!;
    const [w1, t1, w2, t2] = [u[2 * e]!, u[2 * e + 1]!, u[2 * e + 2]!, u[2 * e + 3]!];
    for (let k = 0; k <= samples; k++) {
      const x = k / samples;
      const h1 = 1 - 3 * x * x + 2 * x ** 3;
      const h2 = l * (x - 2 * x * x + x ** 3);
      const h3 = 3 * x * x - 2 * x ** 3;
      const h4 = l * (x ** 3 - x * x);
      const w = Math.abs(h1 * w1 + h2 * t1 + h3 * w2 + h4 * t2);
      // Stryker disable next-line EqualityOperator: a tie is one node seen from its two elements
      if (w > best.value) best = { value: w, z: model.z[e]! + x * l };
    }
  }
  return best;
}

/** Consistent nodal loads of a line load q(z) (N/m, evaluated at element mid-height). */
export function uniformLoad(model: BeamModel, q: (z: number) => number): Float64Array {
  const f = new Float64Array(2 * model.z.length);
  for (let e = 0; e + 1 < model.z.length; e++) {
    const l = model.z[e + 1]! - model.z[e]!;
    const w = q((model.z[e]! + model.z[e + 1]!) / 2);
    f[2 * e] = f[2 * e]! + (w * l) / 2;
    f[2 * e + 1] = f[2 * e + 1]! + (w * l * l) / 12;
    f[2 * e + 2] = f[2 * e + 2]! + (w * l) / 2;
    f[2 * e + 3] = f[2 * e + 3]! - (w * l * l) / 12;
  }
  return f;
}

/**
 * Largest |bending stress| along the beam for a solution u: the bending moments at both ends of
 * every element from its end forces K_e·u_e − f_e (exact at the nodes, including the fixed-end
 * moments of a line load q on the element), times c/I of the element.
 */
export function peakStress(model: BeamModel, u: Float64Array, q?: (z: number) => number): number {
  // Written without temporaries: the collapse of a cup calls this once per liquid level.
  const z = model.z;
  let peak = 0;
  for (let e = 0; e + 1 < z.length; e++) {
    const l = z[e + 1]! - z[e]!;
    const c = model.ei[e]! / (l * l * l);
    const w1 = u[2 * e]!;
    const t1 = u[2 * e + 1]!;
    const w2 = u[2 * e + 2]!;
    const t2 = u[2 * e + 3]!;
    const fixedEnd = q ? (q((z[e]! + z[e + 1]!) / 2) * l * l) / 12 : 0;
    const m1 = c * (6 * l * w1 + 4 * l * l * t1 - 6 * l * w2 + 2 * l * l * t2) - fixedEnd;
    const m2 = c * (6 * l * w1 + 2 * l * l * t1 - 6 * l * w2 + 4 * l * l * t2) + fixedEnd;
    const s = Math.max(Math.abs(m1), Math.abs(m2)) * model.stressPerMoment[e]!;
    if (s > peak) peak = s;
  }
  return peak;
}
