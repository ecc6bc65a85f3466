// Deposition models. Sources beside each check:
// - ALD: Gordon, Hausmann, Kim & Shepard, Chem. Vap. Deposition 9, 73 (2003); its flat-surface limit
//   is the Hertz–Knudsen impingement flux Γ = P/√(2π·m·k_B·T) (kinetic theory). No worked numeric
//   example of the paper was reachable; the hand values below evaluate the published formula.
// - CVD: the closed-form diffusion–reaction solution against a finite-difference solution of the
//   same equation (an independent numerical method).
// - PVD: coaxial-disc and parallel-strip view factors against a first-flight ray count.
import { loadHandbookFolder } from '../../src/pipeline.ts';
import { cpSync, mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { evaluateRule, evaluateStructure, PlanCache } from '../../src/checker/evaluate.ts';

import { concentration, marchFill } from '../../src/engines/deposition/fill.ts';
import {
  aldAspectRatio,
  aldRequiredExposure,
  AVOGADRO,
  BOLTZMANN,
  cvdProfile,
  cvdStepCoverage,
  pvdHoleBottomAverage,
  pvdHoleBottomCentre,
  pvdTrenchBottomAverage,
  pvdTrenchBottomCentre,
} from '../../src/engines/deposition/models.ts';
import { seededRandom } from '../../src/engines/transport/montecarlo.ts';
import { expectRel, makeRule } from '../helpers.ts';

describe('ALD minimum exposure (Gordon et al. 2003)', () => {
  // A precursor of 200 g/mol at 573.15 K, 3e18 sites/m².
  const [S, M, T] = [3e18, 0.2, 573.15];
  const m = M / AVOGADRO;

  it('reduces on a flat surface to the Hertz–Knudsen dose S·√(2πmk_BT)', () => {
    // Γ = P/√(2πmkT); delivering S molecules per m² takes P·t = S·√(2πmkT).
    // By hand: m = 3.3211e-25 kg; 2π·m·k·T = 1.6512e-44; √ = 1.2850e-22 kg·m/s; × 3e18 = 3.855e-4 Pa·s.
    expectRel(aldRequiredExposure(S, M, T, 0), S * Math.sqrt(2 * Math.PI * m * BOLTZMANN * T), 12);
    expect(aldRequiredExposure(S, M, T, 0)).toBeCloseTo(3.855e-4, 6);
  });

  it('grows as (1 + 19a/4 + 3a²/2): 3,988.5 times the flat dose at a = 50', () => {
    // 1 + 237.5 + 3750 = 3988.5 (hand).
    expectRel(aldRequiredExposure(S, M, T, 50) / aldRequiredExposure(S, M, T, 0), 3988.5, 12);
  });

  it('takes L/(2w) for trenches: a trench needs far less than a hole of the same depth and width', () => {
    expect(aldAspectRatio(true, 2e-6, 40e-9)).toBe(25);
    expect(aldAspectRatio(false, 2e-6, 40e-9)).toBe(50);
  });
});

describe('CVD step coverage (Knudsen diffusion with wall reaction)', () => {
  it.each([
    [0.001, 20, false],
    [0.01, 20, true],
    [0.05, 10, true],
    [0.1, 5, false],
  ])('closed form equals the finite-difference profile: s = %s, L/d = %s, reacting bottom %s', (s, ar, reacting) => {
    const profile = cvdProfile(s, ar, 1, reacting);
    expectRel(cvdStepCoverage(s, ar, 1, reacting), profile[profile.length - 1]!, 5);
  });

  it('is conformal when nothing sticks and poor when much does', () => {
    expect(cvdStepCoverage(1e-9, 50, 1)).toBeGreaterThan(0.999);
    // φ = √0.3·10 = 5.477: 1/cosh φ ≈ 2/e^φ = 0.0084 (hand, non-reacting bottom).
    expect(cvdStepCoverage(0.1, 10, 1, false)).toBeCloseTo(1 / Math.cosh(Math.sqrt(0.3) * 10), 12);
    expect(cvdStepCoverage(0.1, 10, 1, false)).toBeLessThan(0.01);
  });
});

describe('PVD line-of-sight coverage', () => {
  /** First-flight rays from a cosine source spread over the top opening: fraction landing on the bottom. */
  function rayCount(shape: 'disc' | 'strip', aspect: number, n = 200_000): number {
    const rnd = seededRandom(7);
    let hit = 0;
    for (let i = 0; i < n; i++) {
      const u = rnd();
      const sinT = Math.sqrt(u);
      const tanT = sinT / Math.sqrt(1 - u);
      const psi = 2 * Math.PI * rnd();
      if (shape === 'disc') {
        const r = 0.5 * Math.sqrt(rnd());
        const phi = 2 * Math.PI * rnd();
        const x = r * Math.cos(phi) + aspect * tanT * Math.cos(psi);
        const y = r * Math.sin(phi) + aspect * tanT * Math.sin(psi);
        if (x * x + y * y <= 0.25) hit++;
      } else {
        const x = rnd() - 0.5 + aspect * tanT * Math.cos(psi);
        if (Math.abs(x) <= 0.5) hit++;
      }
    }
    return hit / n;
  }

  it('a round hole bottom receives the coaxial-disc view factor on average', () => {
    for (const a of [0.5, 2]) {
      const p = rayCount('disc', a);
      expect(Math.abs(pvdHoleBottomAverage(a) - p)).toBeLessThan(3 * Math.sqrt((p * (1 - p)) / 200_000));
    }
  });

  it('a trench bottom receives the parallel-strip view factor on average', () => {
    for (const a of [0.5, 2]) {
      const p = rayCount('strip', a);
      expect(Math.abs(pvdTrenchBottomAverage(a) - p)).toBeLessThan(3 * Math.sqrt((p * (1 - p)) / 200_000));
    }
  });

  it('the bottom centre sees the whole opening: R²/(R² + L²) and its strip analogue', () => {
    // A = 1: disc 1/(1 + 4) = 0.2; strip 1/√5 = 0.4472 (hand); centres see more than the average.
    expectRel(pvdHoleBottomCentre(1), 0.2, 12);
    expectRel(pvdTrenchBottomCentre(1), 1 / Math.sqrt(5), 12);
    expect(pvdHoleBottomCentre(1)).toBeGreaterThan(pvdHoleBottomAverage(1));
  });
});

// ── Film steps on structures ──────────────────────────────────────────────────────────────────

const ROOT = resolve(import.meta.dirname, '../..');

function loadStructure(yaml: string) {
  const dir = mkdtempSync(join(tmpdir(), 'plumbline-dep-'));
  cpSync(join(ROOT, 'test/fixtures/ok_minimal'), dir, { recursive: true });
  writeFileSync(join(dir, 'structures', 'test-pillar.yaml'), yaml);
  return loadHandbookFolder(dir);
}

const HOLE = `id: test-pillar
title: Hole with two films
kind: hole
geometry: { cd: 60 nm, depth: 2.4 um, sidewall_angle: 90 deg }
deposition:
  - film: dielectric
    method: ald
    thickness: 5 nm
    exposure: 1 Pa*s
    molar_mass: 200 g/mol
    temperature: 300 degC
    site_density: 3e18 /m^2
  - film: electrode
    method: cvd
    thickness: 8 nm
    sticking_probability: 0.005
`;

describe('film steps of a structure', () => {
  const r = loadStructure(HOLE);
  if (!r.ok) throw new Error(JSON.stringify(r.diagnostics));
  const s = r.handbook.structures[0]!;
  const q = evaluateStructure(s).quantities;

  it('gives the ALD margin of the format example: 1 Pa·s against Gordon’s 0.9989 Pa·s at a = 40', () => {
    // Flat dose 3.855e-4 Pa·s (above) × (1 + 190 + 2400) = 0.99886 Pa·s (hand).
    const flat = 3e18 * Math.sqrt(2 * Math.PI * (0.2 / AVOGADRO) * BOLTZMANN * 573.15);
    expectRel(q['deposition.ald_required_exposure']?.value, flat * 2591, 9);
    expectRel(q['deposition.ald_exposure_margin']?.value, 1 / (flat * 2591), 9);
  });

  it('lists a quantity every step has once per step, by film name', () => {
    expect(Object.keys(q).filter((k) => k.startsWith('deposition.step_coverage')).sort()).toEqual(['deposition.step_coverage[dielectric]', 'deposition.step_coverage[electrode]']);
    // CVD electrode after the 5 nm dielectric narrows the hole to 60 − 10 = 50 nm:
    // φ = √0.015 · 2400/50 = 5.879; 1/(cosh φ + (√0.015/4)·sinh φ) (hand formula).
    const phi = Math.sqrt(0.015) * (2400 / 50);
    expectRel(q['deposition.step_coverage[electrode]']?.value, 1 / (Math.cosh(phi) + (Math.sqrt(0.015) / 4) * Math.sinh(phi)), 9);
  });

  it('lets a rule pick a step with film, and never guesses among several (incomplete, not a pass)', () => {
    const pick = evaluateRule(makeRule({ quantity: 'deposition.step_coverage', comparison: 'at_least', limit: 0.5, film: 'dielectric' }), s, new PlanCache());
    expect(pick.status).toBe('pass');
    const guess = evaluateRule(makeRule({ quantity: 'deposition.step_coverage', comparison: 'at_least', limit: 0.5 }), s, new PlanCache());
    expect(guess.status).toBe('incomplete');
    expect(guess.missing?.join(' ')).toMatch(/film \(one of dielectric, electrode\)/);
    const missing = evaluateRule(makeRule({ quantity: 'deposition.step_coverage', comparison: 'at_least', limit: 0.5, film: 'barrier' }), s, new PlanCache());
    expect(missing.status).toBe('incomplete');
  });

  it('refuses at load a film name no structure has, and a film on a quantity without film steps', () => {
    const dir = mkdtempSync(join(tmpdir(), 'plumbline-film-'));
    cpSync(join(ROOT, 'test/fixtures/ok_minimal'), dir, { recursive: true });
    writeFileSync(join(dir, 'structures', 'test-pillar.yaml'), HOLE);
    writeFileSync(
      join(dir, 'rules', 'rules.yaml'),
      '- id: F-1\n  title: t\n  applies_to: {}\n  quantity: deposition.step_coverage\n  film: dielectrc\n  at_least: 0.5\n- id: F-2\n  title: t\n  applies_to: {}\n  quantity: geometry.aspect_ratio\n  film: dielectric\n  at_most: 50\n',
    );
    const r = loadHandbookFolder(dir);
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.diagnostics).toEqual([
      expect.objectContaining({ code: 'bad-value', field: '[0].film', line: 5, suggestions: ['dielectric'] }),
      expect.objectContaining({ code: 'bad-value', field: '[1].film', line: 11 }),
    ]);
  });

  it('coats the inside of a hollow cylinder: depth H − t_w, width CD − 2t_w', () => {
    const cyl = loadStructure(
      'id: test-pillar\ntitle: Cup\nkind: cylinder\ngeometry: { cd: 40 nm, height: 1 um, wall: 5 nm, pitch: 60 nm, array: square, sidewall_angle: 90 deg }\ndeposition:\n  - { film: dielectric, method: pvd, thickness: 2 nm }\n',
    );
    if (!cyl.ok) throw new Error(JSON.stringify(cyl.diagnostics));
    // A = 995/30; X = 2A; coaxial discs [(2 + X²) − X√(X² + 4)]/2 (hand formula).
    const X = (2 * 995) / 30;
    expectRel(evaluateStructure(cyl.handbook.structures[0]!).quantities['deposition.step_coverage']?.value, (2 + X * X - X * Math.sqrt(X * X + 4)) / 2, 9);
  });

  it('reports a repeated film name and a film list on a pillar at the field', () => {
    const dup = loadStructure(HOLE.replace('film: electrode', 'film: dielectric'));
    expect(dup.ok).toBe(false);
    if (!dup.ok) expect(dup.diagnostics).toEqual([expect.objectContaining({ code: 'duplicate-id', field: 'deposition[1].film', line: 13 })]);
    const pillar = loadStructure('id: test-pillar\ntitle: P\nkind: pillar\ngeometry: { cd: 40 nm, height: 1 um }\ndeposition:\n  - { film: x, method: pvd }\n');
    expect(pillar.ok).toBe(false);
    if (!pillar.ok) expect(pillar.diagnostics).toEqual([expect.objectContaining({ code: 'unknown-field', field: 'deposition', line: 5, column: 1 })]);
  });
});

describe('a film that closes the opening it coats (regression: a 30 nm film in a 22 nm hole had coverage 1)', () => {
  const hole = (films: string) => `id: test-pillar\ntitle: Narrow hole\nkind: hole\ngeometry: { cd: 22 nm, depth: 180 nm, sidewall_angle: 90 deg }\ndeposition:\n${films}`;
  const ald = (t: string) => `  - { film: liner, method: ald, thickness: ${t}, exposure: 40 Pa*s, molar_mass: 330 g/mol, temperature: 280 degC, site_density: 2.5e18 /m^2 }\n`;
  const quantities = (yaml: string) => {
    const r = loadStructure(yaml);
    if (!r.ok) throw new Error(JSON.stringify(r.diagnostics));
    return evaluateStructure(r.handbook.structures[0]!).quantities;
  };

  it('has no coverage, exposure or margin when twice the film is not less than the width', () => {
    // 2 × 15 nm = 30 nm ≥ 22 nm, and 2 × 11 nm = 22 nm closes it exactly.
    for (const t of ['15 nm', '11 nm']) {
      const q = quantities(hole(ald(t)));
      for (const name of ['deposition.step_coverage', 'deposition.ald_required_exposure', 'deposition.ald_exposure_margin']) {
        expect(q[name]?.value, `${name} at ${t}`).toBeNull();
        expect(q[name]?.reason).toMatch(/closes the opening at its mouth/);
      }
    }
    // 2 × 10 nm = 20 nm < 22 nm: a lined opening, with a value.
    expect(quantities(hole(ald('10 nm')))['deposition.step_coverage']?.value).toBe(1);
  });

  it('counts the earlier films: a 9 nm barrier in the 12 nm a 5 nm liner leaves has no value', () => {
    const cvd = (film: string, t: string) => `  - { film: ${film}, method: cvd, thickness: ${t}, sticking_probability: 0.001 }\n`;
    // 22 − 2 × 5 = 12 nm left; 2 × 9 = 18 nm ≥ 12; 2 × 5 = 10 < 12 leaves room.
    expect(quantities(hole(cvd('liner', '5 nm') + cvd('barrier', '9 nm')))['deposition.step_coverage[barrier]']?.value).toBeNull();
    expect(quantities(hole(cvd('liner', '5 nm') + cvd('barrier', '5 nm')))['deposition.step_coverage[barrier]']?.value).toBeGreaterThan(0);
  });
});

// ── Gap fill: geometric truths and the transport inside the march ─────────────────────────────

describe('gap fill marched in time', () => {
  it('a conformal film in a vertical trench closes with a seam the full depth and no void, at half the width over the rate', () => {
    // Walls 1 apart grow at rate 1 each: they meet at t = w/(2·rate) everywhere at once (closure
    // time 1 in these units); the bottom has risen w/2 = 0.5 by then, so the seam is 10 − 0.5.
    const r = marchFill({ elongated: true, cd: 1, depth: 10, bottom: 1, method: 'conformal' });
    expect(r.voidHeight).toBe(0);
    expect(r.seamLength).toBeCloseTo(9.5, 1);
    expect(r.closureTime).toBeCloseTo(1, 2);
  });

  it('a conformal film in a re-entrant opening leaves a void', () => {
    const r = marchFill({ elongated: true, cd: 1, depth: 10, bottom: 1.4, method: 'conformal' });
    expect(r.voidHeight).toBeGreaterThan(5);
  });

  it('bottom-up growth fast enough to reach the top first leaves neither void nor seam', () => {
    // The bottom must rise 10 before the walls meet at t = 0.5: a ratio above 20.
    const r = marchFill({ elongated: true, cd: 1, depth: 10, bottom: 1, method: 'bottom-up', ratio: 30 });
    expect(r.voidHeight).toBe(0);
    expect(r.seamLength).toBe(0);
  });

  it('a conformal film in a narrowing opening closes from the bottom up without a void', () => {
    const r = marchFill({ elongated: false, cd: 1, depth: 10, bottom: 0.6, method: 'conformal' });
    expect(r.voidHeight).toBe(0);
  });

  it('its sticking-limited transport matches the closed-form step coverage in a uniform trench', () => {
    // Trench of width 1, depth 10, s = 0.01 (equivalent diameter 2w): bottom concentration equals
    // 1/(cosh φ + (√(3s)/4)·sinh φ), φ = √(3s)·L/(2w) (Knudsen diffusion–reaction, reacting bottom).
    const N = 2000;
    const widths = new Array<number>(N).fill(1);
    const n = concentration({ elongated: true, cd: 1, depth: 10, bottom: 1, method: 'sticking-limited', sticking: 0.01 }, widths, 10 / N, N - 1, true);
    expectRel(n[N - 1]!, cvdStepCoverage(0.01, 10, 2), 3);
  });

  it('and in a uniform hole', () => {
    const N = 2000;
    const widths = new Array<number>(N).fill(1);
    const n = concentration({ elongated: false, cd: 1, depth: 10, bottom: 1, method: 'sticking-limited', sticking: 0.01 }, widths, 10 / N, N - 1, true);
    expectRel(n[N - 1]!, cvdStepCoverage(0.01, 10, 1), 3);
  });
});
