// Storage-cell electrical checks. Sources beside each check:
// - coaxial capacitor 2π·ε₀·k·h/ln(r₂/r₁) and parallel plate ε₀·k·A/t (Gauss's law, any
//   electromagnetics text, e.g. Griffiths ch. 2); ε₀ = 8.8541878128e-12 F/m (CODATA 2018);
//   SiO₂ k = 3.9 (Robertson 2004, Table 1);
// - charge sharing ΔV = (V_cell − V_pre)·C_s/(C_s + C_BL), and the trade's rule of thumb (common
//   practice): at 1 V with a 100 fF bit line, a readable ~150 mV takes about 15–18 fF;
// - the inverse solution (required height) reproducing the forward one.
import { describe, expect, it } from 'vitest';
import { evaluateStructure } from '../../src/checker/evaluate.ts';
import { bitlineSignal, EPSILON_0, MU_0, parallelPlateCapacitances, surfaceCapacitances, wireInductance } from '../../src/engines/electrical/index.ts';
import { builtIn, depletionWidth, EPS_SI, Q } from '../../src/engines/electrical/isolation.ts';
import type { Param, Structure } from '../../src/model/types.ts';
import { expectRel, makeStructure, nm, um } from '../helpers.ts';

describe('capacitance of a cylinder electrode', () => {
  it('uses ε₀ = 8.8541878128e-12 F/m (CODATA 2018)', () => {
    expect(EPSILON_0).toBe(8.8541878128e-12);
  });

  it('outer wall: 2π·ε₀·k·H/ln((r + t)/r), hand-evaluated', () => {
    // r = 18 nm, t = 5 nm, k = 3.9 (SiO₂), H = 1 µm: 2π·8.8541878128e-12·3.9·1e-6/ln(23/18) = 0.8852 fF.
    const c = surfaceCapacitances({ cd: 36 * nm, wall: 5 * nm, height: 1 * um, thickness: 5 * nm, k: 3.9 });
    expectRel(c.outer, (2 * Math.PI * 8.8541878128e-12 * 3.9 * 1e-6) / Math.log(23 / 18), 12);
    expect(c.outer).toBeCloseTo(0.8852e-15, 18);
  });

  it('tends to the parallel plate when the dielectric is thin against the radius', () => {
    // ln(1 + t/r) → t/r: the coaxial and plate forms agree to about t/(2r).
    const g = { cd: 2e-3, wall: 1e-4, height: 1e-6, thickness: 1e-9, k: 3.9 };
    expectRel(surfaceCapacitances(g).outer / parallelPlateCapacitances(g).outer, 1, 5);
  });

  it('differs from the parallel plate by tens of percent for a 5 nm film on an 18 nm radius', () => {
    const g = { cd: 36 * nm, wall: 5 * nm, height: 1 * um, thickness: 5 * nm, k: 25 };
    // Outer: ln(23/18) = 0.2451 against t/r = 0.2778 → the plate on the electrode's area is 12 % low.
    expect(parallelPlateCapacitances(g).outer / surfaceCapacitances(g).outer).toBeCloseTo(0.2451 / 0.2778, 3);
  });
});

describe('charge sharing with the bit line', () => {
  it('rule of thumb (common practice): 1 V swing, 100 fF bit line, 150 mV takes 15–18 fF', () => {
    // Full 1 V between cell and precharge level: ΔV = C_s/(C_s + 100 fF) = 0.15 → C_s = 17.6 fF;
    // the quick estimate ΔV ≈ V·C_s/C_BL gives 15 fF. With half-supply precharge the swing is 0.5 V
    // and the same 150 mV would take 42.9 fF.
    const cs = (0.15 * 100e-15) / (1 - 0.15);
    expectRel(cs, 17.647e-15, 4);
    expectRel(bitlineSignal(cs, 100e-15, 1, 1), 0, 12); // precharge at the supply: a stored 1 gives nothing
    expectRel(bitlineSignal(cs, 100e-15, 2, 0.5), 0.15, 9); // 2 V at half precharge is a 1 V swing
    expect(cs).toBeGreaterThan(15e-15);
    expect(cs).toBeLessThan(18e-15);
  });
});

/** A storage node with a cell block, in SI. */
function cellNode(height: number): Structure {
  const s = makeStructure('cylinder', { cd: 36 * nm, wall: 5 * nm, height, pitch: 56 * nm, sidewall_angle: Math.PI / 2 }, { array: 'hexagonal' });
  const pos = { file: 'test', line: 1, column: 1 };
  const set = (name: string, value: number) => s.params.set(name, { name, value, unit: '1', written: String(value), origin: { type: 'handbook', pos } } satisfies Param);
  set('cell.dielectric_thickness', 5 * nm);
  set('cell.dielectric_dielectric_constant', 40);
  set('cell.bitline_capacitance', 80e-15);
  set('cell.array_voltage', 1.2);
  set('cell.precharge', 0.5);
  set('cell.required_signal', 0.1);
  set('cell.leakage_current', 1e-15);
  set('cell.refresh_interval', 0.064);
  s.cell = { surfaces: ['inner', 'outer'] };
  return s;
}

describe('a dielectric that leaves no room for the plate electrode (regression: it passed)', () => {
  // 36 nm CD at a 56 nm pitch: a 20 nm gap between neighbours; inner radius 18 − 5 = 13 nm.
  const cs = (thickness: number, surfaces: Array<'inner' | 'outer' | 'bottom'>) => {
    const s = cellNode(1.5 * um);
    s.params.set('cell.dielectric_thickness', { ...s.params.get('cell.dielectric_thickness')!, value: thickness });
    s.cell = { surfaces };
    return evaluateStructure(s).quantities['electrical.storage_capacitance']!;
  };

  it('outside: films of neighbours meeting across the gap (2 × 10 nm = 20 nm) give no capacitance', () => {
    expect(cs(10 * nm, ['outer']).value).toBeNull();
    expect(cs(10 * nm, ['outer']).reason).toMatch(/neighbouring cylinders meet/);
    expect(cs(9 * nm, ['outer']).value).toBeGreaterThan(0);
  });

  it('inside: a dielectric as thick as the inner radius (13 nm) fills the cup; the outer wall alone does not care', () => {
    expect(cs(13 * nm, ['inner']).reason).toMatch(/fills the cup/);
    expect(cs(13 * nm, ['bottom']).value).toBeNull();
    // Outer only, 13 nm: but 2 × 13 = 26 nm > 20 nm, so the neighbours' films meet instead.
    expect(cs(13 * nm, ['outer']).reason).toMatch(/neighbouring cylinders meet/);
  });
});

describe('the cell of a structure (format example: 36 nm, 5 nm wall, 1.5 µm, ZrO₂ k = 40, 5 nm)', () => {
  const q = evaluateStructure(cellNode(1.5 * um)).quantities;
  it('adds the coaxial inner and outer walls', () => {
    const outer = (2 * Math.PI * EPSILON_0 * 40 * 1.5e-6) / Math.log(23 / 18);
    const inner = (2 * Math.PI * EPSILON_0 * 40 * (1.5e-6 - 5e-9)) / Math.log(13 / 8);
    expectRel(q['electrical.storage_capacitance']?.value, outer + inner, 12);
  });
  it('gives the signal of the weaker state: 0.6 V·C_s/(C_s + 80 fF), less the leaked 64 aC', () => {
    const cs = q['electrical.storage_capacitance']!.value!;
    expectRel(q['electrical.sense_signal']?.value, (0.6 * cs) / (cs + 80e-15), 12);
    expectRel(q['electrical.retention_signal']?.value, (0.6 * cs - 1e-15 * 0.064) / (cs + 80e-15), 12);
  });
  it('solves the height that just meets the requirement: the forward model at that height gives it back', () => {
    const h = q['electrical.required_height']!.value!;
    const back = evaluateStructure(cellNode(h)).quantities;
    expectRel(back['electrical.retention_signal']?.value, 0.1, 9);
    expectRel(back['electrical.storage_capacitance']?.value, q['electrical.required_capacitance']!.value!, 9);
  });
});

// ── Fins, vias, isolation ─────────────────────────────────────────────────────────────────────

describe('fin effective width (common practice: tri-gate W_eff = 2H + W)', () => {
  it('a 9 nm fin 62 nm tall on a 36 nm pitch gives 133 nm per fin, 3.69 per unit footprint', () => {
    const s = makeStructure('line', { cd: 9 * nm, height: 62 * nm, pitch: 36 * nm });
    const q = evaluateStructure(s).quantities;
    expectRel(q['electrical.effective_width']?.value, 133 * nm, 12);
    expectRel(q['electrical.effective_width_per_footprint']?.value, 133 / 36, 12);
  });
});

describe('via parasitics', () => {
  it('the wire inductance tends to Rosa’s (μ₀l/2π)[ln(2l/r) − 3/4] for a long thin conductor', () => {
    // Rosa, Bull. Bur. Stand. 4, 301 (1908); l/r = 1e4: the exact and long-wire forms agree to ~r/l.
    const [l, r] = [1e-3, 1e-7];
    expectRel(wireInductance(l, r), ((MU_0 * l) / (2 * Math.PI)) * (Math.log((2 * l) / r) - 0.75), 4);
  });

  it('resistance, liner capacitance and inductance of a copper via (hand values)', () => {
    // 6 µm hole, 60 µm deep, vertical; 300 nm oxide liner (k = 3.9); copper 1.72e-8 Ω·m:
    // R = ρL/(π·2.7²µm²) = 45.05 mΩ; C = 2π·ε₀·3.9·60 µm/ln(3/2.7) = 1.30178e-14/0.105361 = 123.56 fF.
    const s = makeStructure('via', { cd: 6 * um, depth: 60 * um, sidewall_angle: Math.PI / 2 }, { array: 'square' });
    const pos = { file: 'test', line: 1, column: 1 };
    const set = (name: string, value: number) => s.params.set(name, { name, value, unit: '1', written: String(value), origin: { type: 'handbook', pos } } satisfies Param);
    set('via.conductor_resistivity', 1.72e-8);
    set('via.liner_thickness', 300 * nm);
    set('via.liner_dielectric_constant', 3.9);
    s.via = true;
    const q = evaluateStructure(s).quantities;
    expectRel(q['electrical.via_resistance']?.value, (1.72e-8 * 60e-6) / (Math.PI * (2.7e-6) ** 2), 12);
    expect(q['electrical.via_resistance']?.value).toBeCloseTo(0.04505, 4);
    expectRel(q['electrical.via_capacitance']?.value, (2 * Math.PI * EPSILON_0 * 3.9 * 60e-6) / Math.log(3 / 2.7), 12);
    expect(q['electrical.via_capacitance']?.value).toBeCloseTo(123.56e-15, 17);
    expectRel(q['electrical.via_rc']?.value, q['electrical.via_resistance']!.value! * q['electrical.via_capacitance']!.value!, 12);
  });
});

describe('a liner that fills the via toward its bottom (regression: capacitance and inductance passed)', () => {
  // 8 µm hole, 110 µm deep at 89°: bottom CD 8 − 2·110·tan 1° = 8 − 3.8401 = 4.1599 µm, radius 2.080 µm.
  const via = (liner: number) => {
    const s = makeStructure('via', { cd: 8 * um, depth: 110 * um, sidewall_angle: (89 * Math.PI) / 180 }, { array: 'square' });
    const pos = { file: 'test', line: 1, column: 1 };
    const set = (name: string, value: number) => s.params.set(name, { name, value, unit: '1', written: String(value), origin: { type: 'handbook', pos } } satisfies Param);
    set('via.conductor_resistivity', 1.72e-8);
    set('via.liner_thickness', liner);
    set('via.liner_dielectric_constant', 3.9);
    s.via = true;
    return evaluateStructure(s).quantities;
  };

  it('has no resistance, capacitance, inductance or RC with a 2.1 µm liner, and all four with 2.0 µm', () => {
    const names = ['electrical.via_resistance', 'electrical.via_capacitance', 'electrical.via_inductance', 'electrical.via_rc'];
    for (const n of names) expect(via(2.1 * um)[n]?.value, n).toBeNull();
    expect(via(2.1 * um)['electrical.via_capacitance']?.reason).toMatch(/fills the via toward its bottom/);
    for (const n of names) expect(via(2.0 * um)[n]?.value, n).toBeGreaterThan(0);
  });
});

describe('a cup that narrows toward its floor (regression: the vertical-wall capacitance counted a plate there)', () => {
  // 36 nm CD, 5 nm wall, 1.5 µm tall at 90.3°: base CD 36 − 2·1500·tan 0.3° = 36 − 15.708 = 20.292 nm;
  // at the floor (one wall up) 20.292 + 15.708·5/1500 = 20.344 nm outside, 10.344 nm inside: radius 5.172 nm.
  const cup = (thickness: number) => {
    const s = cellNode(1.5 * um);
    s.params.set('geometry.sidewall_angle', { ...s.params.get('geometry.sidewall_angle')!, value: (90.3 * Math.PI) / 180 });
    s.params.set('cell.dielectric_thickness', { ...s.params.get('cell.dielectric_thickness')!, value: thickness });
    return evaluateStructure(s).quantities['electrical.storage_capacitance']!;
  };
  it('a 5.1 nm dielectric fits the 5.17 nm floor radius; 5.2 nm does not, though the top radius is 13 nm', () => {
    expect(cup(5.1 * nm).value).toBeGreaterThan(0);
    expect(cup(5.2 * nm).value).toBeNull();
    expect(cup(5.2 * nm).reason).toMatch(/narrowest/);
  });
});

describe('isolation (one-sided abrupt junction, Sze & Ng ch. 2)', () => {
  it('built-in potential and zero-bias depletion width on 1e16 cm⁻³ (hand: 0.954 V, 0.351 µm)', () => {
    // V_bi = 0.025852·ln(1e16·1e20/(9.65e9)²) = 0.025852·36.913 = 0.9543 V;
    // W = √(2·11.7ε₀·V_bi/(q·1e22 m⁻³)) = √(1.2340e-13) = 0.3513 µm.
    expect(builtIn(1e22)).toBeCloseTo(0.9543, 3);
    expectRel(depletionWidth(1e22, 0), Math.sqrt((2 * 11.7 * 8.8541878128e-12 * builtIn(1e22)) / (1.602176634e-19 * 1e22)), 12);
    expect(depletionWidth(1e22, 0)).toBeCloseTo(0.3513e-6, 9);
    expect(EPS_SI / EPSILON_0).toBe(11.7);
    expect(Q).toBe(1.602176634e-19);
  });

  it('widens as the square root of the voltage: 20 V on 2e17 cm⁻³ (hand: 0.369 µm)', () => {
    // √(2·11.7ε₀·(V_bi + 20)/(q·2e23)), V_bi = 0.025852·ln(2e17·1e20/(9.65e9)²) = 1.0317 V → 0.3688 µm.
    expect(depletionWidth(2e23, 20)).toBeCloseTo(0.3688e-6, 9);
  });
});
