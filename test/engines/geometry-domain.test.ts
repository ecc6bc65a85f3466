// Edge cases of the geometry engine's domain: shapes that close, overlap or cannot exist give "no
// value" with a reason, never a plausible-looking number. Expected values are worked by hand.
import { describe, expect, it } from 'vitest';
import { evaluateStructure } from '../../src/checker/evaluate.ts';
import type { Structure } from '../../src/model/types.ts';
import { deg, expectRel, makeStructure, nm, um } from '../helpers.ts';

const value = (s: Structure, name: string) => evaluateStructure(s).quantities[name];

describe('space when an opening closes before its bottom', () => {
  it('is still pitch − top CD', () => {
    // 100 nm hole at 89°, 3 µm deep: closure depth (100/2)·tan 89° = 2864 nm < 3 µm, so there is
    // no bottom; the widest place is the top, and the solid between holes is 200 − 100 = 100 nm.
    const s = makeStructure('hole', { cd: 100 * nm, depth: 3 * um, pitch: 200 * nm, sidewall_angle: deg(89) }, { array: 'square' });
    expect(value(s, 'geometry.bottom_cd')?.value).toBeNull();
    expectRel(value(s, 'geometry.space')?.value, 100 * nm, 12);
  });
});

describe('overlapping round neighbours', () => {
  it('have no open-area fraction between d = p and the point where the naive ratio reaches 1', () => {
    // Square cell: π d²/(4p²) stays below 1 up to d = 2p/√π ≈ 1.128p, but circles with d > p
    // already overlap, so the ratio would count shared area twice. d = 1.05 p is in that range.
    const s = makeStructure('hole', { cd: 105 * nm, depth: 400 * nm, pitch: 100 * nm }, { array: 'square' });
    const r = value(s, 'geometry.open_area_fraction');
    expect(r?.value).toBeNull();
    expect(r?.reason).toMatch(/overlap/);
  });
});

describe('hollow cylinders that cannot exist', () => {
  it('give no volume when the wall is as thick as half the CD', () => {
    const s = makeStructure('cylinder', { cd: 20 * nm, height: 1 * um, wall: 10 * nm, sidewall_angle: deg(90) }, { array: 'square' });
    expect(value(s, 'geometry.volume')?.value).toBeNull();
    expect(value(s, 'geometry.sidewall_area')?.value).toBeNull();
  });

  it('give no volume when the wall is thicker than the cylinder is tall', () => {
    const s = makeStructure('cylinder', { cd: 100 * nm, height: 20 * nm, wall: 30 * nm, sidewall_angle: deg(90) }, { array: 'square' });
    expect(value(s, 'geometry.volume')?.value).toBeNull();
  });

  it('treat a cavity that narrows to nothing above its floor as a cone to its apex', () => {
    // Re-entrant cup: CD 40 nm at the top, 10 nm at the base (H = 1 µm), wall 10 nm.
    // Cavity: top 40 − 20 = 20 nm; at the floor (z = 10 nm) the outer diameter is
    // 10 + 30·10/1000 = 10.3 nm, so the cavity would be 10.3 − 20 = −9.7 nm: it ends in a point.
    // Depth to the apex: 990 · 20/(20 + 9.7) = 666.67 nm (linear narrowing).
    // Body volume = outer frustum π·1000/12·(40² + 40·10 + 10²) − cone π·20²·666.67/12.
    const apex = (990 * 20) / (20 + 9.7);
    const outer = ((Math.PI * 1000) / 12) * (1600 + 400 + 100);
    const cone = (Math.PI * 400 * apex) / 12;
    const bottomAngle = Math.atan2(1000, 15); // base 15 nm narrower on each side: re-entrant
    const s = makeStructure('cylinder', { cd: 40 * nm, height: 1 * um, wall: 10 * nm, sidewall_angle: Math.PI - bottomAngle }, { array: 'square' });
    expectRel(value(s, 'geometry.bottom_cd')?.value, 10 * nm, 9);
    expectRel(value(s, 'geometry.volume')?.value, (outer - cone) * 1e-27, 9);
  });
});
