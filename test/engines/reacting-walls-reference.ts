// An independent method for the arrival of a reacting species: Nyström solutions of the continuous
// integral equation for a vertical slot and a vertical tube, with the closed-form kernels of the
// view-factor catalogue, against which the deposition engine's band algebra (exchange areas between
// sections, Richardson-extrapolated) is held. Bottom absorbing, walls re-emitting 1 − s of what
// arrives, the opening a diffuse source of unit flux.
//
//   G(x) = F(x) + (1 − s)·∫₀ˡ K(x − x′)·G(x′) dx′,  G_bottom = F_bottom + (1 − s)·∫₀ˡ G(x)·B(l − x) dx
//
// Slot of width 1 (depth in widths; Clausing's equation, Cole's long-slot kernel): a wall point
// sees the opening with F = ½(1 − x/√(1 + x²)) and a strip of the opposite wall with
// K = ½(1 + Δ²)^(−3/2); the bottom strip sees both walls, B = 2·F (per unit bottom width).
// Tube of diameter 1 (depth in diameters; Howell, Mengüç & Siegel, catalogue: ring element to ring
// element and ring element to the end disc of a cylinder): with ξ the distance in diameters,
// K(ξ) = 1 − (ξ³ + 3ξ/2)/(ξ² + 1)^(3/2), F(ξ) = (2ξ² + 1)/(2√(ξ² + 1)) − ξ (= ∫_ξ^∞ K), and by
// reciprocity B = 4·F (wall area π·dx over bottom area π/4).
// The tube's kernel has a cusp at Δ = 0: the solve subtracts G(x) there (singularity
// subtraction) and integrates K analytically, ∫₀ˡ K(x − x′) dx′ = 1 − F(x) − F(l − x).

import { gaussLegendre } from '../../src/engines/numeric.ts';
import { solveDense } from '../../src/engines/transport/clausing.ts';

export interface ReactingWallSolution {
  /** Coverage averaged over the bottom (what arrives there per unit area, over the flux into the opening). */
  bottom: number;
  /** Wall coverage averaged over [z1, z2] (depths in the unit of the shape: widths or diameters). */
  wallAverage(z1: number, z2: number): number;
}

interface Kernels {
  top: (x: number) => number;
  kernel: (d: number) => number;
  /** ∫₀ˡ K(x − x′) dx′ when the kernel needs its cusp subtracted; null for a smooth kernel. */
  kernelIntegral: ((x: number, l: number) => number) | null;
  bottomOf: (l: number) => number;
  wallToBottom: number;
}

const SLOT: Kernels = {
  top: (x) => 0.5 * (1 - x / Math.sqrt(1 + x * x)),
  kernel: (d) => 0.5 * (1 + d * d) ** -1.5,
  kernelIntegral: null,
  // Parallel strips of width 1 a distance l apart (crossed strings): √(1 + l²) − l.
  bottomOf: (l) => Math.sqrt(1 + l * l) - l,
  wallToBottom: 2,
};

const ringToDisc = (x: number) => (2 * x * x + 1) / (2 * Math.sqrt(x * x + 1)) - x;
const TUBE: Kernels = {
  top: ringToDisc,
  kernel: (d) => {
    const x = Math.abs(d);
    return 1 - (x ** 3 + 1.5 * x) / (x * x + 1) ** 1.5;
  },
  kernelIntegral: (x, l) => 1 - ringToDisc(x) - ringToDisc(l - x),
  // Equal coaxial discs of radius ½ a distance l apart: [X − √(X² − 4)]/2, X = 2 + 4l².
  bottomOf: (l) => {
    const X = 2 + 4 * l * l;
    return (X - Math.sqrt(X * X - 4)) / 2;
  },
  wallToBottom: 4,
};

function solve(k: Kernels, l: number, s: number, panelLength: number): ReactingWallSolution {
  const panels = Math.max(2, Math.ceil(l / panelLength));
  const gl = gaussLegendre(8);
  const xs: number[] = [];
  const ws: number[] = [];
  const h = l / panels;
  for (let p = 0; p < panels; p++) {
    gl.x.forEach((x, i) => {
      xs.push(p * h + ((x + 1) * h) / 2);
      ws.push((gl.w[i]! * h) / 2);
    });
  }
  const n = xs.length;
  const q = 1 - s;
  const a = new Float64Array(n * n);
  const b = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    b[i] = k.top(xs[i]!);
    let diagonal = 1;
    for (let j = 0; j < n; j++) {
      const v = q * ws[j]! * k.kernel(xs[i]! - xs[j]!);
      if (k.kernelIntegral && j === i) continue;
      a[i * n + j] = a[i * n + j]! - v;
      if (k.kernelIntegral) diagonal += v;
    }
    if (k.kernelIntegral) diagonal -= q * k.kernelIntegral(xs[i]!, l);
    a[i * n + i] = a[i * n + i]! + diagonal;
  }
  const g = solveDense(a, b, n);
  // Nyström's own interpolant between the nodes (off the nodes the cusp costs little).
  const G = (x: number) => xs.reduce((v, xj, j) => v + q * ws[j]! * k.kernel(x - xj) * g[j]!, k.top(x));
  const bottom = xs.reduce((v, x, j) => v + q * k.wallToBottom * ws[j]! * g[j]! * k.top(l - x), k.bottomOf(l));
  const fine = gaussLegendre(16);
  return {
    bottom,
    wallAverage: (z1, z2) => fine.x.reduce((v, x, i) => v + (fine.w[i]! / 2) * G(z1 + ((x + 1) * (z2 - z1)) / 2), 0),
  };
}

/** Vertical slot of width 1 and depth l, walls of sticking s, absorbing bottom (8-point panels of `panelLength`). */
export function reactingSlot(l: number, s: number, panelLength = 0.25): ReactingWallSolution {
  return solve(SLOT, l, s, panelLength);
}

/** Vertical tube of diameter 1 and depth l, walls of sticking s, absorbing bottom. */
export function reactingTube(l: number, s: number, panelLength = 0.25): ReactingWallSolution {
  return solve(TUBE, l, s, panelLength);
}
