// A second, plainer march of a sticking-limited fill, for the tests to hold the engine's march to
// (an independent numerical solution of the same growth model): half as many slices, steps in
// which the fastest wall moves 0.2 % of the top width (the engine's move it up to 1 %), the
// reactive-wall transport solved again every step on the full band count, and no back-off at the
// pinch (the small step bounds that error instead). It shares
// with the engine only the transport solution (`arrival`, itself held to the Monte Carlo), which
// the first-step test checks on its own.
import { arrival, wallCoverageAt } from '../../src/engines/deposition/models.ts';

export interface ReferenceFill {
  /** Widest gap open below the first slice to close (0 if the fill closed from the bottom). */
  trappedWidth: number;
  /** Depth span of the open slices below that pinch. */
  voidHeight: number;
  /** Depth of the top of the void (or of the last slice to close). */
  closureDepth: number;
  /** Depth span of the slices closed by their walls meeting above any void. */
  seamLength: number;
}

export function referenceMarch(o: { elongated: boolean; depth: number; top: number; bottom: number }, sticking: number, seamWidth = 1e-9, slices = 100, step = 0.002): ReferenceFill {
  const dz = o.depth / slices;
  const centre = (i: number) => (i + 0.5) * dz;
  const width = Array.from({ length: slices }, (_, i) => o.top + ((o.bottom - o.top) * centre(i)) / o.depth);
  let floor = o.depth;
  let trappedWidth = 0;
  let lastClosed = 0;
  const walled = new Set<number>(); // slices whose walls met
  const seam = (above: number) => [...walled].filter((i) => i < above).length * dz;
  for (;;) {
    const open = (i: number) => i < slices && centre(i) < floor && width[i]! > 0;
    let end = -1;
    while (open(end + 1)) end++;
    // A gap still open below the first closed slice of the column is cut off.
    const below: number[] = [];
    for (let i = end + 2; i < slices && centre(i) < floor; i++) if (width[i]! > 0) below.push(i);
    if (below.length > 0) {
      const trapped = Math.max(...below.map((i) => width[i]!));
      trappedWidth = Math.max(trappedWidth, trapped);
      if (trapped >= seamWidth) {
        const top = below[0]!;
        return { trappedWidth, voidHeight: (below[below.length - 1]! - top + 1) * dz, closureDepth: top * dz, seamLength: seam(top) };
      }
      // A sliver: it closes as part of the seam.
      for (let i = below[0]!; i <= below[below.length - 1]!; i++) if (width[i]! > 0) (width[i] = 0), walled.add(i);
      continue;
    }
    if (end < 0) return { trappedWidth, voidHeight: 0, closureDepth: lastClosed, seamLength: seam(slices) };
    const toFloor = end === slices - 1 || centre(end + 1) >= floor;
    const zs = Array.from({ length: end + 1 }, (_, i) => centre(i));
    const a = arrival(
      {
        elongated: o.elongated,
        z: [0, ...zs, toFloor ? floor : centre(end) + dz],
        width: [width[0]!, ...width.slice(0, end + 1), toFloor ? width[end]! : 0],
      },
      sticking,
    );
    const rate = zs.map((z) => wallCoverageAt(a, z));
    const floorRate = toFloor ? a.bottom : 0;
    const dt = (step * o.top) / Math.max(floorRate, ...rate);
    rate.forEach((r, i) => {
      width[i] = width[i]! - 2 * r * dt;
      if (width[i]! <= 0) {
        lastClosed = centre(i);
        walled.add(i);
      }
    });
    floor -= floorRate * dt;
  }
}
