// Molecular transmission of tubes and slots. Sources beside each check:
// - Cole's exact tube values as tabulated by Livesey (1998), Table 2.5 (quoted in
//   ../shared/design/physics-references.md as confirmed);
// - Santeler, J. Vac. Sci. Technol. A 4, 338 (1986): closed form, stated error below 0.7 %;
// - Knudsen's long-tube limit W → 8R/(3L);
// - an independent method: the seeded test-particle Monte Carlo, within its statistical error;
// - the slot table (our Nyström solution of Clausing's equation) against the Monte Carlo.
// - the numerical pieces (monotone interpolation, the dense solver, the Nyström solution, the
//   branches below and beyond the tables): hand calculations shown beside each check, Fritsch &
//   Carlson's monotonicity condition (SIAM J. Numer. Anal. 17, 238 (1980)) on their own test data
//   (as recalled from that paper: the values are only used as a monotone data set), the short-opening
//   limit W ≈ 1 − l/2 (half the molecules that strike a short wall go on; from memory), and the
//   Monte Carlo again for the Nyström solver itself.
// - for the Monte Carlo with reacting walls: Cole's value again, and the slot's line-of-sight view
//   factors (parallel strips, strip to wall) worked by hand.
import { describe, expect, it } from 'vitest';
import { COLE_TUBE, monotoneCubic, santelerTube, slotTransmission, slotTransmissionNystrom, solveDense, tubeTransmission } from '../../src/engines/transport/clausing.ts';
import { bottomReactionMonteCarlo, depositionMonteCarlo, transmissionMonteCarlo } from '../../src/engines/transport/montecarlo.ts';
import { frontTransmission, rateRatio } from '../../src/engines/etch/index.ts';
import { openingTransmission } from '../../src/engines/transport/index.ts';
import { evaluateStructure } from '../../src/checker/evaluate.ts';
import { shapeOf } from '../../src/checker/plan.ts';
import { QUANTITIES } from '../../src/engines/index.ts';
import { deg, expectRel, makeStructure, nm, setParam } from '../helpers.ts';

describe('round tube', () => {
  it('Santeler’s closed form stays within its stated 0.7 % of the table', () => {
    for (const [l, w] of COLE_TUBE) expect(Math.abs(santelerTube(l) / w - 1), `L/R = ${l}`).toBeLessThan(0.007);
  });

  it('interpolates between table points to better than 0.2 % (each interior point left out in turn)', () => {
    // The stated interpolation error: rebuild the ratio-to-Santeler interpolant without one point
    // and compare with the published value there.
    for (let skip = 1; skip < COLE_TUBE.length - 1; skip++) {
      const kept = COLE_TUBE.filter((_, i) => i !== skip);
      const ratio = monotoneCubic(kept.map(([l]) => Math.log(l)), kept.map(([l, w]) => w / santelerTube(l)));
      const [l, w] = COLE_TUBE[skip]!;
      expect(Math.abs((santelerTube(l) * ratio(Math.log(l))) / w - 1), `L/R = ${l}`).toBeLessThan(2e-3);
    }
  });

  it('tends to Knudsen’s 8R/(3L) for long tubes', () => {
    expect(tubeTransmission(1e5) / (8 / (3 * 1e5))).toBeCloseTo(1, 3);
  });

  it('agrees with a test-particle Monte Carlo within three standard deviations', () => {
    for (const l of [1, 5]) {
      const mc = transmissionMonteCarlo({ shape: 'tube', depth: l, topWidth: 2, bottomWidth: 2 }, 60_000, 11);
      expect(Math.abs(mc.value - tubeTransmission(l)), `L/R = ${l}`).toBeLessThan(3 * mc.sigma);
    }
  });
});

describe('long slot', () => {
  it('the committed table (a Nyström solution) agrees between its points with an independent ray count', () => {
    // The table comes from our own solve of Clausing's equation; the test-particle Monte Carlo
    // solves the same transport by sampling, so it checks the table, its interpolation (ten
    // points per decade) included, at lengths between the tabulated ones.
    for (const [l, seed] of [[0.3, 31], [2.2, 37], [7.3, 41], [30, 43]] as const) {
      const mc = transmissionMonteCarlo({ shape: 'slot', depth: l, topWidth: 1, bottomWidth: 1 }, 60_000, seed);
      expect(Math.abs(mc.value - slotTransmission(l)), `L/w = ${l}`).toBeLessThan(4 * mc.sigma);
    }
  });

  it('agrees with a test-particle Monte Carlo within three standard deviations', () => {
    for (const l of [1, 5]) {
      const mc = transmissionMonteCarlo({ shape: 'slot', depth: l, topWidth: 1, bottomWidth: 1 }, 60_000, 13);
      expect(Math.abs(mc.value - slotTransmission(l)), `L/w = ${l}`).toBeLessThan(3 * mc.sigma);
    }
  });

  it('is not the tube of hydraulic diameter 2w (the trap: tens of percent at L/w = 10, about 2× at 100)', () => {
    expect(slotTransmission(10) / tubeTransmission(10)).toBeGreaterThan(1.2);
    expect(slotTransmission(100) / tubeTransmission(100)).toBeGreaterThan(1.7);
  });

  it('approaches the long-slot form (w/L)·ln(L/w) from above', () => {
    // Long-slot asymptote W ≈ (w/L)·ln(L/w) (from memory); the exact solution keeps a positive
    // constant beyond the logarithm.
    for (const l of [50, 100, 300]) {
      const ratio = (slotTransmission(l) * l) / Math.log(l);
      expect(ratio).toBeGreaterThan(1);
      expect(ratio).toBeLessThan(1.06);
    }
  });
});

describe('tapered openings', () => {
  it.each([
    // shape, top CD, depth, sidewall angle (deg)
    ['tube', 100e-9, 1e-6, 89],
    ['tube', 80e-9, 2e-6, 89.6],
    ['slot', 40e-9, 400e-9, 89],
    ['slot', 24e-9, 230e-9, 88.5],
  ] as const)('the equal-conductance approximation stays within 5 percent of the Monte Carlo: %s, top %s m, depth %s m, %s deg', (shape, cd, depth, deg) => {
    const angle = (deg * Math.PI) / 180;
    const bottom = cd - (2 * depth) / Math.tan(angle);
    const mc = transmissionMonteCarlo({ shape, depth, topWidth: cd, bottomWidth: bottom }, 60_000, 17);
    const approx = openingTransmission(shape === 'slot', cd, angle, depth, 0) as number;
    expect(Math.abs(approx / mc.value - 1)).toBeLessThan(0.05 + (3 * mc.sigma) / mc.value);
  });

  it('the Monte Carlo sees a converging hole transmit less than a straight hole of its bottom size would suggest per area, but more than its narrowest section', () => {
    // Reciprocity bounds (W·A is a conductance): the 100 → 65 nm cone conducts more than a 65 nm tube
    // of the same length and less than a 100 nm one.
    const cone = transmissionMonteCarlo({ shape: 'tube', depth: 1e-6, topWidth: 100e-9, bottomWidth: 65e-9 }, 40_000, 19).value * 100 ** 2;
    expect(cone).toBeGreaterThan(tubeTransmission(1000 / 32.5) * 65 ** 2);
    expect(cone).toBeLessThan(tubeTransmission(1000 / 50) * 100 ** 2);
  });
});

describe('a reacting bottom (the Coburn–Winters balance, checked by Monte Carlo)', () => {
  it('vertical tube: the rate ratio K/(K + S − K·S) with Cole’s K', () => {
    // L/R = 4: K = 0.356572 (Cole); S = 0.1 → 0.356572/(0.356572 + 0.1 − 0.0356572) = 0.84827.
    const S = 0.1;
    const mc = bottomReactionMonteCarlo({ shape: 'tube', depth: 4, topWidth: 2, bottomWidth: 2 }, S, 60_000, 23);
    const expected = 0.356572 / (0.356572 + S - S * 0.356572);
    expect(Math.abs(mc.reacted / S - expected)).toBeLessThan((3 * mc.sigma) / S);
  });

  it('tapered hole: the balance is written per unit of the front’s own area (K_b = K·A_top/A_bottom)', () => {
    // Cone 1 → 0.6 over a depth of 3 (top radius 1): the reacted fraction per bottom area, over S.
    const S = 0.1;
    const [top, bottom, depth] = [2, 1.2, 3];
    const mc = bottomReactionMonteCarlo({ shape: 'tube', depth, topWidth: top, bottomWidth: bottom }, S, 80_000, 29);
    const measured = (mc.reacted * (top / bottom) ** 2) / S;
    const angle = Math.atan2(depth, (top - bottom) / 2);
    const model = rateRatio(frontTransmission(openingTransmission(false, top, angle, depth, 0) as number, top, bottom, false), S);
    expect(Math.abs(model / measured - 1)).toBeLessThan(0.05);
    // The top-referred K would be far off: that is the mistake the front-referred K avoids.
    expect(rateRatio(openingTransmission(false, top, angle, depth, 0) as number, S) / measured).toBeLessThan(0.8);
  });
});

describe('reacting walls (the Monte Carlo of film growth)', () => {
  it('with inert walls and an absorbing bottom it is Clausing’s transmission: Cole’s L/R = 4', () => {
    // Cole via Livesey (1998), Table 2.5: 0.356572. A vertical tube's bottom has the top's area, so
    // its coverage is the transmission too.
    const mc = depositionMonteCarlo({ shape: 'tube', depth: 4, topWidth: 2, bottomWidth: 2 }, 0, 60_000, { bottomSticking: 1, seed: 31 });
    const sigma = Math.sqrt((0.356572 * (1 - 0.356572)) / 60_000);
    expect(Math.abs(mc.reactedBottom - 0.356572)).toBeLessThan(3 * sigma);
    expect(mc.bottom).toBe(mc.reactedBottom);
  });

  it('with sticking 1 everything lands where it first arrives: the slot’s view factors, worked by hand', () => {
    // Slot of width 1 and depth 2: bottom √5 − 2 = 0.23607 (parallel strips); a wall bin from x₁ to
    // x₂ receives the strip-to-wall factor ½(1 − x/√(1 + x²)) averaged over it:
    // ½[1 − (√(1 + x₂²) − √(1 + x₁²))/(x₂ − x₁)].
    const mc = depositionMonteCarlo({ shape: 'slot', depth: 2, topWidth: 1, bottomWidth: 1 }, 1, 100_000, { bins: 4, seed: 37 });
    expect(Math.abs(mc.bottom - (Math.sqrt(5) - 2))).toBeLessThan(3 * mc.bottomSigma);
    mc.wall.forEach((w, i) => {
      const [x1, x2] = [i / 2, (i + 1) / 2];
      const exact = 0.5 * (1 - (Math.sqrt(1 + x2 * x2) - Math.sqrt(1 + x1 * x1)) / (x2 - x1));
      expect(Math.abs(w - exact), `bin ${i}`).toBeLessThan(3 * mc.wallSigma[i]!);
    });
  });

  it('accounts for every molecule: reacted on the walls, at the bottom, or escaped', () => {
    const mc = depositionMonteCarlo({ shape: 'tube', depth: 5, topWidth: 1, bottomWidth: 0.6 }, 0.05, 20_000, { bins: 5, seed: 39 });
    expect(mc.escaped + mc.reactedBottom + mc.reactedWall.reduce((a, b) => a + b, 0)).toBeCloseTo(1, 12);
  });
});

describe('the transmission quantity of a structure', () => {
  const transmission = QUANTITIES.get('transport.transmission')!;
  const hole = (depth: number, angle = Math.PI / 2) => makeStructure('hole', { cd: 80 * nm, depth, pitch: 160 * nm, sidewall_angle: angle }, { array: 'square' });
  it('counts a mask as more depth at the top CD: 600 nm under a 200 nm mask is Cole’s L/R = 20 (0.109304)', () => {
    const s = hole(600 * nm);
    for (const [k, v] of [['mask_thickness', 200 * nm], ['open_rate', 5e-9], ['reaction_probability', 0.2], ['time_budget', 600]] as const) setParam(s, `etch.${k}`, v);
    s.etch = { calibrationPoints: 0 };
    expectRel(evaluateStructure(s).quantities['transport.transmission']?.value, 0.109304, 5);
    const plain = transmission.variant(shapeOf(hole(600 * nm)));
    expect('inputs' in plain && plain.inputs).not.toHaveProperty('mask');
  });
  it('does not apply to a standing pillar', () => {
    const pillar = makeStructure('pillar', { cd: 40 * nm, height: 400 * nm, pitch: 100 * nm, sidewall_angle: Math.PI / 2 }, { array: 'square' });
    expect(transmission.variant(shapeOf(pillar))).toHaveProperty('notApplicable');
  });
  it('has no value past the depth where a taper closes (40 nm·tan 80° = 226.85 nm), and 1 at no depth', () => {
    expect(openingTransmission(false, 80 * nm, deg(80), 300 * nm, 0)).toMatchObject({ value: null });
    expect(openingTransmission(false, 80 * nm, deg(80), 0, 0)).toBe(1);
  });
  it('flags the equal-conductance replacement once a taper narrows below half the top CD, or widens', () => {
    // Bottom CD = CD − 2·D·cot θ: at 80° and D = CD it is 0.647 CD (holds), at D = 2 CD 0.295 CD (not).
    const check = transmission.validity![0]!;
    const holds = (a: Record<string, number>) => ('holds' in check ? check.holds(a) : false);
    expect(holds({ cd: 1, angle: deg(80), depth: 1 })).toBe(true);
    expect(holds({ cd: 1, angle: deg(80), depth: 2 })).toBe(false);
    expect(holds({ cd: 1, angle: Math.PI / 2, depth: 50 })).toBe(true);
    expect(holds({ cd: 1, angle: deg(91), depth: 1 })).toBe(false);
    // In SI, as a handbook gives it: 100 nm at 80°, 100 nm deep holds, 200 nm deep does not.
    expect(holds({ cd: 100e-9, angle: deg(80), depth: 100e-9 })).toBe(true);
    expect(holds({ cd: 100e-9, angle: deg(80), depth: 200e-9 })).toBe(false);
  });
});

describe('the numerical pieces of the transmission', () => {
  it('monotone cubic: a hand-worked Hermite segment, the knots themselves, and constants outside the data', () => {
    // (0,0), (1,1), (2,4): secants 1 and 3, slopes m = [1, 2, 3] (ends take the end secants, the middle
    // their mean; no limiting since (m/d)² sums stay below 9). At x = 0.5 (t = ½): h00 = h01 = ½,
    // h10 = ⅛, h11 = −⅛ → 0·½ + ⅛·1 + 1·½ − ⅛·2 = 0.375; at 1.5: ½ + ⅛·2 + 4·½ − ⅛·3 = 2.375.
    const f = monotoneCubic([0, 1, 2], [0, 1, 4]);
    expect(f(0.5)).toBeCloseTo(0.375, 14);
    expect(f(1.5)).toBeCloseTo(2.375, 14);
    expect(f(1)).toBe(1);
    expect(f(-3)).toBe(0);
    expect(f(7)).toBe(4);
    // A linear data set is reproduced exactly between its knots.
    const line = monotoneCubic([0, 1, 3, 4], [1, 3, 7, 9]);
    for (const x of [0.25, 2, 3.7]) expect(line(x)).toBeCloseTo(1 + 2 * x, 14);
  });

  it('monotone cubic: flat stretches stay flat and a local extremum gets a zero slope', () => {
    // Data with a plateau: 0, 1, 1, 2. Between the equal values the curve is exactly 1.
    const plateau = monotoneCubic([0, 1, 2, 3], [0, 1, 1, 2]);
    for (const x of [1.1, 1.5, 1.9]) expect(plateau(x)).toBe(1);
    // A peak at x = 1 (0, 1, 0): zero slope there and the end secants ±1 at the ends, so at t = ½
    // f = h10·1 + h01·1 = ⅛ + ½ = 0.625 on both sides.
    const peak = monotoneCubic([0, 1, 2], [0, 1, 0]);
    expect(peak(0.5)).toBeCloseTo(0.625, 14);
    expect(peak(1.5)).toBeCloseTo(0.625, 14);
    // An uneven peak (0, 1, 0.5): slopes [1, 0, −0.5]; at t = ½ the first segment gives ⅛·1 + ½·1 =
    // 0.625 and the second ½·1 + ½·0.5 − ⅛·(−0.5) = 0.8125 (hand). The mean of the secants, 0.25,
    // would give 0.59375.
    const uneven = monotoneCubic([0, 1, 2], [0, 1, 0.5]);
    expect(uneven(0.5)).toBeCloseTo(0.625, 14);
    expect(uneven(1.5)).toBeCloseTo(0.8125, 14);
    // A plateau that starts the data (1, 1, 2) and one that ends it (0, 1, 1) stay flat too.
    for (const x of [0.2, 0.5, 0.9]) expect(monotoneCubic([0, 1, 2], [1, 1, 2])(x)).toBe(1);
    for (const x of [1.2, 1.5, 1.9]) expect(monotoneCubic([0, 1, 2], [0, 1, 1])(x)).toBe(1);
  });

  it('monotone cubic: the Fritsch–Carlson limiter keeps monotone data monotone where plain averaged slopes overshoot', () => {
    // A step: 0, 0.1, 1, 1.1 at x = 0…3. Averaged slopes give m = [0.1, 0.5, 0.5, 0.1]; on the first
    // segment (m/d)² sums to 1 + 25 = 26 > 9, so both slopes are scaled by 3/√26: m₀ = 0.3/√26 =
    // 0.058835, m₁ = 1.5/√26 = 0.294174. At t = ½: h10·m₀ + h01·0.1 + h11·m₁ = ⅛·0.058835 + 0.05 −
    // ⅛·0.294174 = 0.020583 (hand).
    const step = monotoneCubic([0, 1, 2, 3], [0, 0.1, 1, 1.1]);
    expect(step(0.5)).toBeCloseTo(0.020583, 6);
    // Fritsch & Carlson's monotone test data: sampled densely, never decreases (plain averaged
    // slopes, tried by hand on this grid, decrease at over a thousand of these points and pass 1).
    const xs = [7.99, 8.09, 8.19, 8.7, 9.2, 10, 12, 15, 20];
    const ys = [0, 2.76429e-5, 4.37498e-2, 0.169183, 0.469428, 0.94374, 0.998636, 0.999919, 0.999994];
    const g = monotoneCubic(xs, ys);
    let last = -Infinity;
    for (let x = 7.99; x <= 20; x += 0.005) {
      const y = g(x);
      expect(y, `x = ${x.toFixed(3)}`).toBeGreaterThanOrEqual(last - 1e-15);
      expect(y).toBeLessThanOrEqual(1);
      last = y;
    }
  });

  it('the dense solver pivots: a system with a zero leading entry, solved by hand', () => {
    // [0 2 1; 1 1 1; 2 1 3]·x = [5 4 7] has x = [1 2 1]: 0 + 4 + 1 = 5, 1 + 2 + 1 = 4, 2 + 2 + 3 = 7.
    const x = solveDense(Float64Array.from([0, 2, 1, 1, 1, 1, 2, 1, 3]), Float64Array.from([5, 4, 7]), 3);
    expect([...x]).toEqual([expect.closeTo(1, 13), expect.closeTo(2, 13), expect.closeTo(1, 13)]);
    // Without row exchanges a tiny pivot ruins the answer: [1e-20 1; 1 1]·x = [1 2] → x ≈ [1, 1].
    const y = solveDense(Float64Array.from([1e-20, 1, 1, 1]), Float64Array.from([1, 2]), 2);
    expect([...y]).toEqual([expect.closeTo(1, 12), expect.closeTo(1, 12)]);
    // The largest pivot is neither the diagonal nor the last row: [1e-20 1 0; 1 1 1; 1e-20 0 1]·x =
    // [1 3 1] has x ≈ [1, 1, 1] (1e-20 terms dropped, by hand); a tiny pivot loses it.
    const z = solveDense(Float64Array.from([1e-20, 1, 0, 1, 1, 1, 1e-20, 0, 1]), Float64Array.from([1, 3, 1]), 3);
    expect([...z]).toEqual([expect.closeTo(1, 12), expect.closeTo(1, 12), expect.closeTo(1, 12)]);
    // And in the second column, after the first step: [1 0 5; 0 1e-20 1; 0 1 1]·x = [6 1 2] → x ≈ [1, 1, 1]
    // (the 5 sits where a pivot search in the wrong column would look).
    const w = solveDense(Float64Array.from([1, 0, 5, 0, 1e-20, 1, 0, 1, 1]), Float64Array.from([6, 1, 2]), 3);
    expect([...w]).toEqual([expect.closeTo(1, 12), expect.closeTo(1, 12), expect.closeTo(1, 12)]);
    // Four unknowns, the zeros where a search in the wrong column would look: [1 0 0 0; 0 1e-20 1 0;
    // 0 1 0 0; 0 1 1 1]·x = [1 1 1 3] → x₂ = 1, x₃ = 1 − 1e-20, x₄ = 1 (hand).
    const v = solveDense(Float64Array.from([1, 0, 0, 0, 0, 1e-20, 1, 0, 0, 1, 0, 0, 0, 1, 1, 1]), Float64Array.from([1, 1, 1, 3]), 4);
    expect([...v]).toEqual([1, 1, 1, 1].map((x) => expect.closeTo(x, 12)));
  });

  it('the Nyström solution of Clausing’s slot equation agrees with the test-particle Monte Carlo', () => {
    for (const [l, seed] of [[0.7, 51], [3, 53]] as const) {
      const mc = transmissionMonteCarlo({ shape: 'slot', depth: l, topWidth: 1, bottomWidth: 1 }, 60_000, seed);
      expect(Math.abs(mc.value - slotTransmissionNystrom(l)), `L/w = ${l}`).toBeLessThan(3 * mc.sigma);
      // Its mesh is converged: a coarser one changes the answer by less than 1e-6.
      expect(Math.abs(slotTransmissionNystrom(l, 1) - slotTransmissionNystrom(l))).toBeLessThan(1e-6);
    }
    expect(slotTransmissionNystrom(0)).toBe(1);
    // No depth, or less by rounding, transmits everything (the formulas themselves would exceed 1).
    for (const f of [tubeTransmission, slotTransmission, slotTransmissionNystrom]) expect(f(-1e-3), f.name).toBe(1);
  });

  it('short openings transmit about 1 − l/2, below the tables’ first rows; no length transmits everything', () => {
    // To first order half the molecules that strike a short wall go on down; the next term is of
    // order l²·ln(1/l) in a slot (the strip-to-wall view factor has a logarithm), l² in a tube.
    for (const l of [0.001, 0.01, 0.03]) {
      expect(Math.abs(slotTransmission(l) - (1 - l / 2)), `slot L/w = ${l}`).toBeLessThan(l * l * Math.log(1 / l));
      if (l >= 0.01) expect(Math.abs(tubeTransmission(l) - (1 - l / 2)), `tube L/R = ${l}`).toBeLessThan(l * l);
    }
    // The tube's extension below Cole's first row meets it there.
    expect(tubeTransmission(0.1 - 1e-9)).toBeCloseTo(0.952399, 6);
    expect(tubeTransmission(0)).toBe(1);
    expect(slotTransmission(0)).toBe(1);
  });

  it('long openings beyond the tables: the slot keeps (ln l + c)/l with c > 0, the tube relaxes onto Cole’s last row and Knudsen', () => {
    for (const l of [1000, 3000]) {
      const ratio = (slotTransmission(l) * l) / Math.log(l);
      expect(ratio, `L/w = ${l}`).toBeGreaterThan(1);
      expect(ratio, `L/w = ${l}`).toBeLessThan(1.03);
    }
    // Cole's L/R = 1000: 0.002646; just beyond it the extension starts from that value.
    expect(tubeTransmission(1000)).toBeCloseTo(0.002646, 6);
    expectRel(tubeTransmission(1000.001), 0.002646, 4);
    // At L/R = 3000 it lies just below Knudsen's 8R/(3L).
    expect(tubeTransmission(3000) / (8 / (3 * 3000))).toBeGreaterThan(0.99);
    expect(tubeTransmission(3000) / (8 / (3 * 3000))).toBeLessThan(1);
  });
});
