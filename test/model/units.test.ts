// parseValue: handbook text with units and tolerances → SI numbers, or a coded problem.
// Every expected number below is a unit definition (SI prefixes, degree, torr) or a hand
// computation written beside it; none is read back from the code.
import { describe, expect, it } from 'vitest';
import { isUnitProblem, parseValue, type ParsedValue, type UnitProblem } from '../../src/model/units.ts';
import { expectRel } from '../helpers.ts';

function ok(text: string | number, unit: string): ParsedValue {
  const r = parseValue(text, unit);
  if (isUnitProblem(r)) throw new Error(`expected a value for ${JSON.stringify(text)}, got ${r.code}`);
  return r;
}
function problem(text: string | number, unit: string): UnitProblem['code'] {
  const r = parseValue(text, unit);
  if (!isUnitProblem(r)) throw new Error(`expected a problem for ${JSON.stringify(text)}, got ${JSON.stringify(r)}`);
  return r.code;
}

describe('parseValue: nominal values in SI', () => {
  it('converts micrometres, with "um" and both micro signs equal', () => {
    // SI prefix micro = 1e-6: 1.8 µm = 1.8e-6 m.
    expectRel(ok('1.8 um', 'm').value, 1.8e-6, 12);
    // U+00B5 MICRO SIGN and U+03BC GREEK SMALL LETTER MU are both written for "micro" in practice.
    expect(ok('1.8 \u00b5m', 'm').value).toBe(ok('1.8 um', 'm').value);
    expect(ok('1.8 \u03bcm', 'm').value).toBe(ok('1.8 um', 'm').value);
  });

  it('converts degrees to radians', () => {
    // 1° = π/180 rad (definition): 89.7° = 89.7·π/180 = 1.565560339 rad.
    expectRel(ok('89.7 deg', 'rad').value, (89.7 * Math.PI) / 180, 12);
  });

  it('converts femtofarads, millinewtons per metre and pascal-seconds', () => {
    // SI prefix femto = 1e-15: 15 fF = 1.5e-14 F (a DRAM cell capacitance of this order is common practice).
    expectRel(ok('15 fF', 'F').value, 15e-15, 12);
    // milli = 1e-3: 72 mN/m = 0.072 N/m (water near room temperature, common practice).
    expectRel(ok('72 mN/m', 'N/m').value, 0.072, 12);
    // Pa·s is already SI.
    expectRel(ok('2 Pa*s', 'Pa*s').value, 2, 12);
  });

  it('converts an etch rate in nm/min to m/s', () => {
    // 300 nm/min = 300e-9 m / 60 s = 5e-9 m/s (hand).
    expectRel(ok('300 nm/min', 'm/s').value, 300e-9 / 60, 12);
  });

  it('defines the torr exactly as 101325/760 Pa', () => {
    // Definition of the torr: 760 Torr = 1 standard atmosphere = 101325 Pa, so 1 Torr = 133.3223684 Pa.
    expectRel(ok('1 Torr', 'Pa').value, 101325 / 760, 12);
  });

  it('gives the lower-case spelling "torr" the same exact definition', () => {
    // Same unit, same definition (101325/760 Pa); "torr" is how many tool recipes write it.
    expectRel(ok('1 torr', 'Pa').value, 101325 / 760, 12);
  });

  it('converts an expansion coefficient in ppm/K', () => {
    // ppm = 1e-6: 16.5 ppm/K = 1.65e-5 /K (copper near room temperature, from memory).
    expectRel(ok('16.5 ppm/K', '1/K').value, 16.5e-6, 12);
  });

  it('takes a bare number for a dimensionless input', () => {
    expect(ok(0.3, '1').value).toBe(0.3);
    expect(ok('0.3', '1').value).toBe(0.3);
  });
});

describe('parseValue: tolerances', () => {
  it('reads a tolerance on a percentage in points, and refuses a percentage of a percentage', () => {
    // "50% ± 10": the tolerance borrows the nominal's unit, 10 % = 0.1 absolute: 0.4 … 0.6.
    const r = ok('50% ± 10', '1');
    expect([r.value, r.low, r.high]).toEqual([0.5, 0.4, 0.6]);
    // "50% ± 10%" could be 45–55 % (relative) or 40–60 % (points): refused, as for °C.
    expect(problem('50% ± 10%', '1')).toBe('malformed-tolerance');
    expect(problem('50% +5/-2%', '1')).toBe('malformed-tolerance');
  });

  it('reads a symmetric ± tolerance with its own unit', () => {
    // 32 nm ± 1.5 nm → [30.5 nm, 33.5 nm] (hand).
    const v = ok('32 nm ± 1.5 nm', 'm');
    expectRel(v.value, 32e-9, 12);
    expectRel(v.low, 30.5e-9, 12);
    expectRel(v.high, 33.5e-9, 12);
  });

  it('reads a percentage tolerance written +/-', () => {
    // 5 % of 32 nm is 1.6 nm → [30.4 nm, 33.6 nm] (hand).
    const v = ok('32 nm +/- 5%', 'm');
    expectRel(v.value, 32e-9, 12);
    expectRel(v.low, 30.4e-9, 12);
    expectRel(v.high, 33.6e-9, 12);
  });

  it('reads an asymmetric +a/-b tolerance', () => {
    // 32 nm +2/-1 nm → [31 nm, 34 nm] (hand): the plus part raises the high end only.
    const v = ok('32 nm +2/-1 nm', 'm');
    expectRel(v.value, 32e-9, 12);
    expectRel(v.low, 31e-9, 12);
    expectRel(v.high, 34e-9, 12);
  });

  it('reads a tolerance in a different unit of the same dimension', () => {
    // 1.8 µm ± 40 nm → [1.76 µm, 1.84 µm] (hand).
    const v = ok('1.8 um ± 40 nm', 'm');
    expectRel(v.low, 1.76e-6, 12);
    expectRel(v.high, 1.84e-6, 12);
  });

  it('lets a bare tolerance borrow the nominal unit', () => {
    // 32 nm ± 5 means ± 5 nm → [27 nm, 37 nm] (hand).
    const v = ok('32 nm ± 5', 'm');
    expectRel(v.low, 27e-9, 12);
    expectRel(v.high, 37e-9, 12);
  });
});

describe('parseValue: problems come back as codes', () => {
  it('rejects a capacitance where a length belongs', () => {
    expect(problem('3 fF', 'm')).toBe('wrong-dimension');
  });

  it('rejects a tolerance that is not a number', () => {
    expect(problem('32 nm ± x', 'm')).toBe('malformed-tolerance');
  });

  it('rejects a negative tolerance', () => {
    expect(problem('32 nm ± -1 nm', 'm')).toBe('malformed-tolerance');
  });

  it('rejects a unit nobody defines', () => {
    expect(problem('32 furlongs', 'm')).toBe('unknown-unit');
  });

  it('rejects text that is not a number', () => {
    expect(problem('abc', 'm')).toBe('malformed-quantity');
  });

  it('rejects a bare number for a length, as a YAML number or as text', () => {
    expect(problem(32, 'm')).toBe('malformed-quantity');
    expect(problem('32', 'm')).toBe('malformed-quantity');
  });
});
