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

describe('neighbours that touch', () => {
  it('leave no space between vertical holes one CD apart', () => {
    // s = p − CD = 100 − 100 = 0 nm (hand): the holes touch, so there is no wall between them.
    const s = makeStructure('hole', { cd: 100 * nm, depth: 1 * um, pitch: 100 * nm, sidewall_angle: deg(90) }, { array: 'square' });
    expect(value(s, 'geometry.space')?.value).toBeNull();
    expect(value(s, 'geometry.space')?.reason).toMatch(/touch/);
  });
});

describe('a re-entrant body that narrows to nothing', () => {
  it('has no base CD', () => {
    // Pillar 20 nm at the top, 1 µm tall, θ = 91°: CD_b = 20 + 2·1000·cot 91° = 20 − 2000·0.017455065
    // = −14.9 nm (hand; cot 91° = −tan 1° from tables): it narrows to a point above its base.
    const s = makeStructure('pillar', { cd: 20 * nm, height: 1 * um, sidewall_angle: deg(91) }, { array: 'square' });
    expect(value(s, 'geometry.bottom_cd')?.value).toBeNull();
    expect(value(s, 'geometry.bottom_cd')?.reason).toMatch(/narrows to nothing/);
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
  it('give no volume, area or open fraction when the wall is as thick as half the CD', () => {
    // Cavity diameter CD − 2t_w = 20 − 2·10 = 0 nm: there is no cavity. The reason must say so,
    // not be the checker's fallback for a formula that went non-finite (0/0 at the cavity's apex).
    const s = makeStructure('cylinder', { cd: 20 * nm, height: 1 * um, wall: 10 * nm, pitch: 40 * nm, sidewall_angle: deg(90) }, { array: 'square' });
    for (const name of ['geometry.volume', 'geometry.sidewall_area', 'geometry.open_area_fraction']) {
      expect(value(s, name)?.value, name).toBeNull();
      expect(value(s, name)?.reason, name).toMatch(/half the CD/);
    }
  });

  it('give no volume when the wall is as thick as, or thicker than, the cylinder is tall', () => {
    // Cavity depth H − t_w = 20 − 30 < 0 and 20 − 20 = 0: no cavity (the loader refuses both, as the
    // corpus case wall-as-thick-as-height shows).
    for (const height of [20 * nm, 30 * nm]) {
      const s = makeStructure('cylinder', { cd: 100 * nm, height, wall: 30 * nm, sidewall_angle: deg(90) }, { array: 'square' });
      expect(value(s, 'geometry.volume')?.value, `H = ${height}`).toBeNull();
      expect(value(s, 'geometry.volume')?.reason, `H = ${height}`).toMatch(/as thick as/);
    }
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
