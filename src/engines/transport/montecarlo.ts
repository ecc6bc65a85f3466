// Test-particle Monte Carlo of free-molecular flow into an opening of any straight profile: a
// round hole (a cone frustum, including a vertical tube) or a long slot (a trench, vertical or
// tapered). Molecules enter the top with a cosine distribution, fly straight, and at each wall hit
// react with a sticking probability or leave in a new cosine-distributed direction (diffuse
// re-emission) until they react, cross the bottom (transmitted) or leave through the top. The
// bottom is either an exit or a surface that reacts like a wall. Seeded, so a run is repeatable.
//
// The method is the classical one of Davis, J. Appl. Phys. 31, 1169 (1960); it needs no closed
// form or integral equation, which is why it checks them and covers tapered profiles they do not.

export interface OpeningProfile {
  shape: 'tube' | 'slot';
  depth: number;
  /** Diameter (tube) or width (slot) at the top. */
  topWidth: number;
  /** Diameter or width at the bottom (equal to the top for vertical walls). */
  bottomWidth: number;
}

export interface TransmissionEstimate {
  value: number;
  /** One standard deviation of the estimate (binomial). */
  sigma: number;
  particles: number;
}

/**
 * With a reacting bottom (probability S per arrival, diffuse re-emission otherwise): the fraction
 * of entering molecules that react at the bottom, and its standard deviation.
 */
export interface ReactionEstimate {
  reacted: number;
  sigma: number;
  particles: number;
}

/** mulberry32: a small, well-mixed 32-bit generator (public domain). */
export function seededRandom(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

type Vec = [number, number, number];

/** A cosine-distributed unit vector about the unit normal n. */
function cosineAbout(n: Vec, rnd: () => number): Vec {
  const u1 = rnd();
  const u2 = rnd();
  const sinT = Math.sqrt(u1);
  const cosT = Math.sqrt(1 - u1);
  const phi = 2 * Math.PI * u2;
  // Orthonormal basis (t1, t2, n).
  const a: Vec = Math.abs(n[0]) < 0.9 ? [1, 0, 0] : [0, 1, 0];
  const t1: Vec = [n[1] * a[2] - n[2] * a[1], n[2] * a[0] - n[0] * a[2], n[0] * a[1] - n[1] * a[0]];
  const l1 = Math.hypot(...t1);
  t1[0] /= l1;
  t1[1] /= l1;
  t1[2] /= l1;
  const t2: Vec = [n[1] * t1[2] - n[2] * t1[1], n[2] * t1[0] - n[0] * t1[2], n[0] * t1[1] - n[1] * t1[0]];
  const c1 = sinT * Math.cos(phi);
  const c2 = sinT * Math.sin(phi);
  return [c1 * t1[0] + c2 * t2[0] + cosT * n[0], c1 * t1[1] + c2 * t2[1] + cosT * n[1], c1 * t1[2] + c2 * t2[2] + cosT * n[2]];
}

const EPS = 1e-12;

/** Distance along the ray to the wall, and the inward normal there; z grows downward. */
function hitWall(p: Vec, d: Vec, prof: OpeningProfile, r1: number, k: number): { t: number; n: Vec } | null {
  if (prof.shape === 'tube') {
    // x² + y² = (r1 + k·z)²
    const A = d[0] * d[0] + d[1] * d[1] - k * k * d[2] * d[2];
    const rz = r1 + k * p[2];
    const B = 2 * (p[0] * d[0] + p[1] * d[1] - k * rz * d[2]);
    const C = p[0] * p[0] + p[1] * p[1] - rz * rz;
    let best = Infinity;
    if (Math.abs(A) < 1e-300) {
      if (Math.abs(B) > 0) best = -C / B;
    } else {
      const disc = B * B - 4 * A * C;
      if (disc >= 0) {
        const s = Math.sqrt(disc);
        for (const t of [(-B - s) / (2 * A), (-B + s) / (2 * A)]) {
          if (t > EPS && t < best && r1 + k * (p[2] + t * d[2]) > 0) best = t;
        }
      }
    }
    if (!Number.isFinite(best) || best <= EPS) return null;
    const x = p[0] + best * d[0];
    const y = p[1] + best * d[1];
    const r = Math.hypot(x, y);
    const out: Vec = [x / r, y / r, -k];
    const l = Math.hypot(...out);
    return { t: best, n: [-out[0] / l, -out[1] / l, -out[2] / l] };
  }
  // Slot: walls x = ±(r1 + k·z).
  let best: { t: number; n: Vec } | null = null;
  for (const side of [1, -1]) {
    const denom = d[0] - side * k * d[2];
    if (Math.abs(denom) < 1e-300) continue;
    const t = (side * (r1 + k * p[2]) - p[0]) / denom;
    if (t > EPS && (!best || t < best.t)) {
      const l = Math.hypot(1, k);
      best = { t, n: [-side / l, 0, k / l] };
    }
  }
  return best;
}

/** Estimate the transmission probability with `particles` test particles. */
export function transmissionMonteCarlo(prof: OpeningProfile, particles: number, seed = 1): TransmissionEstimate {
  const r = walk(prof, particles, seed, { wall: 0, bottom: 1 }).bottomReacted / particles;
  return { value: r, sigma: Math.sqrt((r * (1 - r)) / particles), particles };
}

/** Fraction of entering molecules that react at a bottom of reaction probability S. */
export function bottomReactionMonteCarlo(prof: OpeningProfile, reaction: number, particles: number, seed = 1): ReactionEstimate {
  const r = walk(prof, particles, seed, { wall: 0, bottom: reaction }).bottomReacted / particles;
  return { reacted: r, sigma: Math.sqrt((r * (1 - r)) / particles), particles };
}

/**
 * Film growth with reacting walls: where the molecules entering the opening arrive and react. The
 * coverage of a surface is its arriving flux per area over the flux on the open top surface; with
 * the same sticking probability everywhere it is the film thickness there over that on the top.
 */
export interface DepositionEstimate {
  particles: number;
  /** Depth bins of equal height from the top; coverage of the wall in each (arrivals per area). */
  wall: number[];
  /** One standard deviation of each wall coverage (from the spread of the particles' tallies). */
  wallSigma: number[];
  /**
   * How many particles arrived in each wall bin at all. The standard deviations rest on the spread
   * of the particles' tallies; deep in an opening a few particles that bounce there many times can
   * make the whole tally, and the spread is then no guide: trust a bin that dozens of particles reached.
   */
  wallVisitors: number[];
  /** Coverage averaged over the bottom, its standard deviation, and how many particles reached it. */
  bottom: number;
  bottomSigma: number;
  bottomVisitors: number;
  /** Fractions of the entering molecules that react in each wall bin, at the bottom, and that leave through the top. */
  reactedWall: number[];
  reactedBottom: number;
  escaped: number;
}

/**
 * Test particles with sticking probability `sticking` at every wall hit and at the bottom (or
 * `bottomSticking` there), tallying arrivals and reactions by depth bin. Arrivals, not only
 * reactions, estimate the coverage: the same mean, far less noise when the sticking is small.
 */
export function depositionMonteCarlo(
  prof: OpeningProfile,
  sticking: number,
  particles: number,
  { bins = 20, seed = 1, bottomSticking = sticking }: { bins?: number; seed?: number; bottomSticking?: number } = {},
): DepositionEstimate {
  const tally = walk(prof, particles, seed, { wall: sticking, bottom: bottomSticking, bins });
  const top = crossSection(prof.shape, prof.topWidth);
  // Arrivals per area over arrivals per area on an open surface (the entering count over A_top).
  const coverage = (sum: number, area: number) => sum / particles / (area / top);
  const sigma = (sum: number, squares: number, area: number) => Math.sqrt(Math.max(0, squares / particles - (sum / particles) ** 2) / particles) / (area / top);
  const bandArea = (i: number) => wallArea(prof, (i * prof.depth) / bins, ((i + 1) * prof.depth) / bins);
  const bottomArea = crossSection(prof.shape, prof.bottomWidth);
  const wall = Array.from({ length: bins }, (_, i) => coverage(tally.arrivals[i]!, bandArea(i)));
  return {
    particles,
    wall,
    wallSigma: Array.from({ length: bins }, (_, i) => sigma(tally.arrivals[i]!, tally.squares[i]!, bandArea(i))),
    wallVisitors: Array.from(tally.visitors.subarray(0, bins)),
    bottom: coverage(tally.arrivals[bins]!, bottomArea),
    bottomSigma: sigma(tally.arrivals[bins]!, tally.squares[bins]!, bottomArea),
    bottomVisitors: tally.visitors[bins]!,
    reactedWall: Array.from(tally.reacted.subarray(0, bins), (n) => n / particles),
    reactedBottom: tally.bottomReacted / particles,
    escaped: tally.escaped / particles,
  };
}

/** Area of a cross-section of width (diameter) w: a disc, or per unit length a strip. */
function crossSection(shape: OpeningProfile['shape'], w: number): number {
  return shape === 'tube' ? (Math.PI * w * w) / 4 : w;
}

/** Wall area between depths z1 and z2 (frustum band; both walls of a slot per unit length). */
function wallArea(prof: OpeningProfile, z1: number, z2: number): number {
  const r = (z: number) => (prof.topWidth + ((prof.bottomWidth - prof.topWidth) * z) / prof.depth) / 2;
  const slant = Math.hypot(z2 - z1, r(z2) - r(z1));
  return prof.shape === 'tube' ? Math.PI * (r(z1) + r(z2)) * slant : 2 * slant;
}

interface Tally {
  /** Arrivals per wall bin, then the bottom (index `bins`), summed over particles; their squares per particle; particles that arrived there. */
  arrivals: Float64Array;
  squares: Float64Array;
  visitors: Float64Array;
  reacted: Float64Array;
  bottomReacted: number;
  escaped: number;
}

/**
 * Follow `particles` molecules. A wall hit reacts with probability `wall`, the bottom with
 * `bottom` (1: the bottom is an exit, every molecule reaching it counts as through). No random
 * number is drawn for a certain outcome, so the non-reacting runs keep their random sequence.
 */
function walk(prof: OpeningProfile, particles: number, seed: number, stick: { wall: number; bottom: number; bins?: number }): Tally {
  const rnd = seededRandom(seed);
  const r1 = prof.topWidth / 2;
  const k = (prof.bottomWidth - prof.topWidth) / (2 * prof.depth);
  const bins = Math.max(1, stick.bins ?? 1);
  const tally: Tally = { arrivals: new Float64Array(bins + 1), squares: new Float64Array(bins + 1), visitors: new Float64Array(bins + 1), reacted: new Float64Array(bins + 1), bottomReacted: 0, escaped: 0 };
  const mine = new Float64Array(bins + 1); // this particle's arrivals
  const reacts = (p: number) => p >= 1 || (p > 0 && rnd() < p);
  for (let i = 0; i < particles; i++) {
    mine.fill(0);
    // Uniform entry over the opening.
    let p: Vec;
    if (prof.shape === 'tube') {
      const rr = r1 * Math.sqrt(rnd());
      const ph = 2 * Math.PI * rnd();
      p = [rr * Math.cos(ph), rr * Math.sin(ph), 0];
    } else p = [(rnd() - 0.5) * 2 * r1, 0, 0];
    let d = cosineAbout([0, 0, 1], rnd);
    for (let bounce = 0; bounce < 1_000_000; bounce++) {
      const wall = hitWall(p, d, prof, r1, k);
      const tBottom = d[2] > 0 ? (prof.depth - p[2]) / d[2] : Infinity;
      const tTop = d[2] < 0 ? -p[2] / d[2] : Infinity;
      const tWall = wall ? wall.t : Infinity;
      if (tBottom <= tWall && tBottom <= tTop) {
        mine[bins]!++;
        if (reacts(stick.bottom)) {
          tally.bottomReacted++;
          break;
        }
        // Not reacted: leave the bottom in a cosine direction, back up into the opening.
        p = [p[0] + tBottom * d[0], p[1] + tBottom * d[1], prof.depth];
        d = cosineAbout([0, 0, -1], rnd);
        continue;
      }
      if (tTop <= tWall) {
        tally.escaped++;
        break;
      }
      p = [p[0] + tWall * d[0], p[1] + tWall * d[1], p[2] + tWall * d[2]];
      const bin = Math.min(bins - 1, Math.max(0, Math.floor((p[2] / prof.depth) * bins)));
      mine[bin]!++;
      if (reacts(stick.wall)) {
        tally.reacted[bin]!++;
        break;
      }
      d = cosineAbout(wall!.n, rnd);
    }
    for (let b = 0; b <= bins; b++) {
      tally.arrivals[b]! += mine[b]!;
      tally.squares[b]! += mine[b]! * mine[b]!;
      if (mine[b]! > 0) tally.visitors[b]!++;
    }
  }
  return tally;
}
