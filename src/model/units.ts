// Values with units, parsed once at load into SI numbers. mathjs supplies the unit tables and
// dimensional analysis; this module adds the handbook's tolerance syntax and the few units the
// trade uses that mathjs lacks (ppm, Torr, Langmuir).
import { createRequire } from 'node:module';
import type { Unit } from 'mathjs';

// mathjs's single-file build (the same version and unit tables), required rather than imported:
// its ESM build is some 1,300 files, each passed through tsx's loader hooks (seconds at every
// start-up); this is one file and loads in about a tenth of a second.
const { unit: mathUnit, createUnit } = createRequire(import.meta.url)('mathjs/lib/browser/math.js') as typeof import('mathjs');

let extraUnitsReady = false;
function ensureExtraUnits(): void {
  if (extraUnitsReady) return;
  extraUnitsReady = true;
  const define = (name: string, definition: string): void => {
    try {
      mathUnit(`1 ${name}`);
    } catch {
      createUnit(name, { definition });
    }
  };
  // 1 Torr = 101325/760 Pa exactly (definition of the torr); mathjs's own lower-case `torr` is a
  // rounded 133.322 Pa, so both spellings are (re)defined exactly.
  define('Torr', `${101325 / 760} Pa`);
  createUnit('torr', { definition: `${101325 / 760} Pa` }, { override: true });
  // Langmuir exposure, 1e-6 Torr*s.
  define('Langmuir', `${101325 / 760 * 1e-6} Pa*s`);
  define('ppm', '1e-6');
  define('percent', '0.01');
}

/** The value as written, split into nominal and tolerance, in SI. */
export interface ParsedValue {
  value: number;
  low?: number;
  high?: number;
}

export type UnitProblem =
  | { code: 'offset-unit'; expected: string }
  | { code: 'bad-value'; expected: string }
  | { code: 'malformed-quantity'; expected: string }
  | { code: 'malformed-tolerance'; expected: string }
  | { code: 'unknown-unit'; expected: string }
  | { code: 'wrong-dimension'; expected: string };

/** Round away binary noise from unit conversion (1.5000000000000002e-14 → 1.5e-14). */
export function clean(x: number): number {
  return x === 0 || !Number.isFinite(x) ? x : Number(x.toPrecision(15));
}

const dimensionCache = new Map<string, Unit>();
function referenceUnit(siUnit: string): Unit {
  let u = dimensionCache.get(siUnit);
  if (!u) {
    ensureExtraUnits();
    u = mathUnit(siUnit === '1' ? '1 ppm' : siUnit.startsWith('1/') ? `1 ppm/${siUnit.slice(2)}` : `1 ${siUnit}`);
    dimensionCache.set(siUnit, u);
  }
  return u;
}

/** Human description of what a field wants, e.g. `a length (such as "32 nm")`. */
export function describeDimension(siUnit: string): string {
  const names: Record<string, string> = {
    m: 'a length (such as "32 nm")',
    rad: 'an angle (such as "89.5 deg")',
    F: 'a capacitance (such as "15 fF")',
    V: 'a voltage (such as "1.1 V")',
    Pa: 'a pressure or modulus (such as "169 GPa")',
    'N/m': 'a surface tension (such as "72 mN/m")',
    K: 'a temperature (such as "300 K")',
    '1/K': 'an expansion coefficient (such as "2.6 ppm/K")',
    'ohm*m': 'a resistivity (such as "1.7e-8 ohm*m")',
    's': 'a time (such as "90 s")',
    'm/s': 'a rate (such as "300 nm/min")',
    A: 'a current (such as "1 fA")',
    '1': 'a plain number',
  };
  return names[siUnit] ?? `a value in units of ${siUnit}`;
}

/**
 * What a value means, for units with an offset (°C, °F): an absolute temperature converts with
 * the offset (25 degC = 298.15 K), a difference must not (a change of −250 K written as
 * "-250 degC" would become +23.15 K), so a difference in such a unit is refused.
 */
export type Meaning = 'absolute' | 'difference';

/** The unit is a lone unit with an offset from SI (degC, degF), so absolute and difference differ. */
function hasOffset(u: Unit): boolean {
  const parts = u.units;
  return parts.length === 1 && parts[0]!.power === 1 && parts[0]!.unit.offset !== 0;
}

const DIFFERENCE_EXPECTED = 'a temperature difference in K (such as "-250 K"): °C and °F are absolute scales with an offset, so write the change in K';

/**
 * The report's own spellings, so a value copied from a page reads back as the same value:
 * "89.7°", "0.24 µm²", "2e17 cm⁻³", "25 °C", "−3 nm" (a typographic minus).
 */
function fromDisplay(text: string): string {
  return text
    .replace(/^\s*[\u2212\u2013]/, '-')
    .replace(/\s*°([CF])/g, ' deg$1')
    .replace(/\s*°/g, ' deg')
    .replace(/⁻¹/g, '^-1')
    .replace(/⁻²/g, '^-2')
    .replace(/⁻³/g, '^-3')
    .replace(/²/g, '^2')
    .replace(/³/g, '^3');
}

function parseNumberWithUnit(text: string, siUnit: string): number | UnitProblem {
  const t = fromDisplay(text).trim();
  if (t === '') return { code: 'malformed-quantity', expected: describeDimension(siUnit) };
  if (siUnit === '1' && /^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/.test(t)) return Number(t);
  if (!/^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?\s*[A-Za-zµμΩ%/]/.test(t)) {
    return { code: 'malformed-quantity', expected: describeDimension(siUnit) };
  }
  ensureExtraUnits();
  // "3e18 /m^2" → "3e18 m^-2": mathjs has no leading-slash units.
  const inverted = t.replace(/^([-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)\s*\/\s*([A-Za-zµμ]+)(?:\^(\d+))?$/, (_m, n, u, p) => `${n} ${u}^-${p ?? 1}`);
  const normalized = inverted.replace(/[µμ]/g, 'u').replace(/Ω/g, 'ohm').replace(/%/g, 'percent').replace(/·/g, '*');
  let u: Unit;
  try {
    u = mathUnit(normalized);
  } catch {
    return { code: 'unknown-unit', expected: describeDimension(siUnit) };
  }
  const ref = referenceUnit(siUnit);
  if (!u.equalBase(ref)) return { code: 'wrong-dimension', expected: describeDimension(siUnit) };
  const si = u.toSI().toNumeric();
  return typeof si === 'number' ? clean(si) : clean(Number(si));
}

/** A tolerance is a difference: "400 degC ± 5 degC" is ±5 K, not ±278.15 K. */
function parseDifference(text: string, siUnit: string): number | UnitProblem {
  const v = parseNumberWithUnit(text, siUnit);
  if (typeof v !== 'number') return v;
  if (!offsetScale(text)) return v;
  const zero = mathUnit(`0 ${unitOf(text)}`).toSI().toNumeric();
  return clean(v - Number(zero));
}

// nominal, then ± / +/- tolerance, or an asymmetric +a/-b tolerance; the tolerance may be a
// percentage, carry its own unit, or borrow the nominal's.
const TOL = /^(.*?)\s*(?:±|\+\/-|\+-)\s*(.+)$/;
const ASYM = /^(.*?)\s+\+\s*([0-9.eE+-]+)\s*\/\s*-\s*([0-9.eE+-]+)\s*(%|[A-Za-zµμ][^\s]*)?\s*$/;

function unitOf(text: string): string {
  const m = /^[-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?\s*(.*)$/.exec(fromDisplay(text).trim());
  return m?.[1] ?? '';
}

function parseTolerancePart(part: string, nominalText: string, nominal: number, siUnit: string): number | UnitProblem {
  const p = part.trim();
  const pct = /^([0-9.]+(?:[eE][-+]?\d+)?)\s*%$/.exec(p);
  if (pct) {
    // A percentage of a temperature on an offset scale has no single meaning (1 % of 400 °C is
    // 4 K, of 673.15 K it is 6.7 K): ask for the tolerance in a unit.
    if (offsetScale(nominalText)) return { code: 'malformed-tolerance', expected: 'a tolerance in K or °C (a percentage of a °C or °F value is ambiguous)' };
    // Nor has a percentage of a percentage (50% ± 10% reads as 45–55 % or as 40–60 %).
    if (/%\s*$/.test(nominalText.trim())) return { code: 'malformed-tolerance', expected: 'a tolerance in percentage points, without the % sign (as in "50% ± 10", which means 40 % to 60 %): a percentage of a percentage is ambiguous' };
    return Math.abs(nominal) * Number(pct[1]) / 100;
  }
  if (/^[0-9.]+(?:[eE][-+]?\d+)?$/.test(p)) {
    const u = unitOf(nominalText);
    return parseDifference(u ? `${p} ${u}` : p, siUnit);
  }
  return parseDifference(p, siUnit);
}

function offsetScale(text: string): boolean {
  const u = unitOf(text);
  if (!u) return false;
  ensureExtraUnits();
  try {
    return hasOffset(mathUnit(`1 ${u.replace(/[µμ]/g, 'u')}`));
  } catch {
    return false;
  }
}

const TOL_EXPECTED = 'a tolerance such as "± 1.5 nm", "+/- 5%" or "+2/-1 nm"';
// "-1/+2 nm": the minus part first.
const REVERSED = /^(.*?)\s+-\s*([0-9.eE+-]+)\s*\/\s*\+\s*([0-9.eE+-]+)\s*(%|[A-Za-zµμ][^\s]*)?\s*$/;

/** Parse `32 nm`, `32 nm ± 1.5 nm`, `32 nm +/- 5%`, `32 nm +2/-1 nm` into SI. */
export function parseValue(text: string | number, siUnit: string, meaning: Meaning = 'absolute'): ParsedValue | UnitProblem {
  if (typeof text === 'number') {
    // YAML's .inf and .nan arrive as numbers: say so once, in the handbook's own spelling.
    if (!Number.isFinite(text)) return { code: 'bad-value', expected: 'a finite value' };
    if (siUnit === '1') return { value: text };
    return { code: 'malformed-quantity', expected: `${describeDimension(siUnit)}; a bare number has no unit` };
  }
  if (meaning === 'difference') {
    // The nominal of a difference may not carry an offset; its tolerance is a difference anyway.
    const nominalText = (ASYM.exec(text)?.[1] ?? TOL.exec(text)?.[1] ?? text).trim();
    if (offsetScale(nominalText)) return { code: 'offset-unit', expected: DIFFERENCE_EXPECTED };
  }
  const reversed = REVERSED.exec(text);
  if (reversed) {
    const unit = reversed[4] ?? '';
    return { code: 'malformed-tolerance', expected: `the plus part first, as in "+${reversed[3]}/-${reversed[2]}${unit === '%' ? '%' : unit ? ` ${unit}` : ''}"` };
  }
  const asym = ASYM.exec(text);
  if (asym) {
    const nominalText = asym[1] ?? '';
    const nominal = parseNumberWithUnit(nominalText, siUnit);
    if (typeof nominal !== 'number') return nominal;
    const suffix = asym[4] ?? '';
    const plus = parseTolerancePart(`${asym[2]}${suffix === '%' ? '%' : suffix ? ' ' + suffix : ''}`, nominalText, nominal, siUnit);
    const minus = parseTolerancePart(`${asym[3]}${suffix === '%' ? '%' : suffix ? ' ' + suffix : ''}`, nominalText, nominal, siUnit);
    for (const part of [plus, minus]) if (typeof part !== 'number' && (part.code === 'wrong-dimension' || part.code === 'malformed-tolerance')) return part;
    if (typeof plus !== 'number' || typeof minus !== 'number' || plus < 0 || minus < 0) {
      return { code: 'malformed-tolerance', expected: TOL_EXPECTED };
    }
    return { value: nominal, low: clean(nominal - minus), high: clean(nominal + plus) };
  }
  const tol = TOL.exec(text);
  if (tol) {
    const nominalText = tol[1] ?? '';
    const nominal = parseNumberWithUnit(nominalText, siUnit);
    if (typeof nominal !== 'number') return nominal;
    const t = parseTolerancePart(tol[2] ?? '', nominalText, nominal, siUnit);
    if (typeof t !== 'number') {
      return t.code === 'wrong-dimension' || t.code === 'malformed-tolerance' ? t : { code: 'malformed-tolerance', expected: TOL_EXPECTED };
    }
    if (!(t >= 0)) return { code: 'malformed-tolerance', expected: TOL_EXPECTED };
    return { value: nominal, low: clean(nominal - t), high: clean(nominal + t) };
  }
  if (/[±]|\+\/|\/-/.test(text)) return { code: 'malformed-tolerance', expected: TOL_EXPECTED };
  const v = parseNumberWithUnit(text, siUnit);
  return typeof v === 'number' ? { value: v } : v;
}

export function isUnitProblem(x: ParsedValue | UnitProblem | number): x is UnitProblem {
  return typeof x === 'object' && 'code' in x;
}
