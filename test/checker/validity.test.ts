// Validity flags and worst corners outside a rule's own trace: `eval` (evaluateStructure) must
// carry the flags a verdict page shows, and a worst corner names only inputs that decide it.
// The via is the plane-strain copper via of the thermo-mechanical tests (Cu 120 GPa, ν 0.34,
// 16.7 ppm/K in an isotropic silicon pair 130 GPa, ν 0.28, 2.6 ppm/K; values typical, [memory]).
import { beforeEach, describe, expect, it } from 'vitest';
import { evaluateRule, evaluateStructure, PlanCache } from '../../src/checker/evaluate.ts';
import { QUANTITIES } from '../../src/engines/index.ts';
import { copperVia, makeRule, type P, um, worstCornerOf } from '../helpers.ts';

function via(dT: P, depth: P = 50 * um) {
  const { s, set } = copperVia(depth, dT);
  set('keep_out.mobility_shift', 0.05);
  return s;
}

/** The sentences an engine declares for a quantity's validity checks (never written out here). */
function declaredWhys(quantity: string): string[] {
  return (QUANTITIES.get(quantity)!.validity ?? []).map((c) => c.why);
}

describe('validity flags in eval', () => {
  const name = 'thermomech.mobility_shift_n100';
  // σ₀ of the plane-strain inclusion for ΔT = −300 K is about 0.3 GPa (tested in the engine's
  // suite); at the via edge an n-channel along ⟨100⟩ then shifts by |π₁₁ − π₁₂|·σ₀ ≈ 1.556e-9·3e8
  // ≈ 47 % (Smith 1954 coefficients), well past the 20 % the linear model is trusted to; at
  // ΔT = −10 K it shifts by about 1.6 %.
  // Before each test, not at load (DEVELOPERS.md, "Mutation testing").
  let large!: NonNullable<ReturnType<typeof evaluateStructure>['quantities'][string]>;
  let small!: typeof large;
  beforeEach(() => {
    large = evaluateStructure(via(-300)).quantities[name]!;
    small = evaluateStructure(via(-10)).quantities[name]!;
  });
  it('flags a mobility shift beyond the linear range even when no rule reads it', () => {
    expect(large.value!).toBeGreaterThan(0.2);
    expect(small.value!).toBeLessThan(0.2);
    const extra = (large.outside_validity ?? []).filter((w) => !(small.outside_validity ?? []).includes(w));
    expect(extra).toHaveLength(1);
    expect(declaredWhys(name)).toContain(extra[0]);
  });
  it('lists every flag once, in the words the engine declares', () => {
    for (const w of large.outside_validity ?? []) expect(declaredWhys(name)).toContain(w);
    expect(new Set(large.outside_validity).size).toBe(large.outside_validity?.length);
  });
});

describe('worst corner', () => {
  it('lists only the toleranced inputs the value depends on', () => {
    // The plane-strain keep-out radius does not depend on the via depth, so a toleranced depth must
    // not appear in its worst corner; the anneal's temperature change decides it (a larger |ΔT|
    // gives a larger radius, and the limit is at_most).
    const s = via([-300, -320, -280], [50 * um, 45 * um, 55 * um]);
    const rule = makeRule({ quantity: 'thermomech.keep_out_radius_n100', comparison: 'at_most', limit: 1e-3, evaluateAt: 'worst-case' });
    const v = evaluateRule(rule, s, new PlanCache());
    expect(worstCornerOf(v)?.map((c) => c.name)).toEqual(['anneal.temperature_change']);
    expect(worstCornerOf(v)?.[0]?.side).toBe('low'); // −320 K, the larger cooling
    const depth = v.trace!.inputs.find((i) => i.name === 'geometry.depth');
    if (depth) expect(depth.side).toBe('nominal');
  });
});
