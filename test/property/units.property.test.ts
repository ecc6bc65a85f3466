// Properties of the unit parser: values written in any accepted unit convert by that unit's
// definition (SI prefixes; 1 min = 60 s; 1° = π/180 rad; 1 Ω·cm = 0.01 Ω·m), tolerances convert
// with their nominal, and what the report prints reads back as the value it shows. The factors are
// definitions of the units, not values taken from the code.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { isUnitProblem, parseValue } from '../../src/model/units.ts';
import { formatValue } from '../../src/model/format.ts';

const RUNS = Number(process.env.FC_RUNS ?? 500);

// unit as written, SI unit of the field, factor to SI (by definition)
const UNITS: Array<[string, string, number]> = [
  ['nm', 'm', 1e-9],
  ['um', 'm', 1e-6],
  ['µm', 'm', 1e-6],
  ['mm', 'm', 1e-3],
  ['fF', 'F', 1e-15],
  ['mV', 'V', 1e-3],
  ['GPa', 'Pa', 1e9],
  ['MPa', 'Pa', 1e6],
  ['mN/m', 'N/m', 1e-3],
  ['ppm/K', '1/K', 1e-6],
  ['min', 's', 60],
  ['ms', 's', 1e-3],
  ['nm/min', 'm/s', 1e-9 / 60],
  ['µΩ·cm', 'ohm*m', 1e-8],
  ['deg', 'rad', Math.PI / 180],
  ['fA', 'A', 1e-15],
];

/** A decimal as a handbook would write it: up to 6 significant digits, magnitude 1e-3 … 1e4. */
const written = fc.tuple(fc.integer({ min: 1, max: 999999 }), fc.integer({ min: -8, max: 0 }), fc.boolean()).map(([m, e, neg]) => (neg ? -1 : 1) * m * 10 ** e);

const rel = (a: number, b: number) => Math.abs(a - b) / Math.max(Math.abs(b), 1e-300);

describe('unit parser', () => {
  it('converts each unit by its definition, with and without a tolerance', () => {
    fc.assert(
      fc.property(fc.constantFrom(...UNITS), written, fc.integer({ min: 0, max: 9999 }), ([u, si, factor], x, t0) => {
        const t = t0 / 100;
        const plain = parseValue(`${x} ${u}`, si);
        if (isUnitProblem(plain)) throw new Error(`${x} ${u}: ${plain.code}`);
        expect(rel(plain.value, x * factor)).toBeLessThan(1e-12);
        const tol = parseValue(`${x} ${u} ± ${t} ${u}`, si);
        if (isUnitProblem(tol)) throw new Error(`${x} ${u} ± ${t}: ${tol.code}`);
        expect(Math.abs(tol.low! - (x - t) * factor)).toBeLessThanOrEqual(1e-12 * (Math.abs(x) + t) * factor);
        expect(Math.abs(tol.high! - (x + t) * factor)).toBeLessThanOrEqual(1e-12 * (Math.abs(x) + t) * factor);
      }),
      { numRuns: RUNS },
    );
  });

  it('reads back what the report prints, to the digits it prints', () => {
    // Display units of the report (src/report/format.ts) with the precision each shows: four
    // significant digits (five for angles in degrees), so half a unit in the last place relative.
    const shown: Array<[string, number]> = [['m', 5.01e-4], ['m^2', 5.01e-4], ['m^3', 5.01e-4], ['rad', 5.01e-5], ['F', 5.01e-4], ['V', 5.01e-4], ['Pa', 5.01e-4], ['N/m', 5.01e-4], ['s', 5.01e-4], ['m/s', 5.01e-4], ['1/K', 5.01e-4], ['ohm*m', 5.01e-4], ['K', 5.01e-4], ['Pa*s', 5.01e-4], ['kg/mol', 5.01e-4], ['1/m^2', 5.01e-4], ['1/m^3', 5.01e-4], ['V/m', 5.01e-4], ['A', 5.01e-4], ['1', 5.01e-4]];
    const magnitude = fc.double({ min: -18, max: 12, noNaN: true }).map((e) => 10 ** e);
    fc.assert(
      fc.property(fc.constantFrom(...shown), magnitude, fc.boolean(), ([unit, tol], a, neg) => {
        const v = unit === 'rad' ? (a % 3) + 1e-3 : neg && unit !== 'K' ? -a : a;
        const text = formatValue(v, unit);
        const back = parseValue(text, unit);
        if (isUnitProblem(back)) throw new Error(`${text} (${unit}) does not read back: ${back.code}`);
        // Half a unit of the last printed digit, relative to a leading digit of 1 at worst.
        expect(rel(back.value, v), `${v} ${unit} printed as ${text}`).toBeLessThan(tol);
      }),
      { numRuns: RUNS },
    );
  });

  it('never throws on arbitrary text', () => {
    fc.assert(
      fc.property(fc.string({ maxLength: 40 }), fc.constantFrom('m', 'rad', 'K', '1', 'ohm*m', '1/m^3'), fc.constantFrom('absolute' as const, 'difference' as const), (text, unit, meaning) => {
        parseValue(text, unit, meaning);
      }),
      { numRuns: RUNS * 2 },
    );
  });
});
