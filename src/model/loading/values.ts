// A value with its unit and tolerance, parsed at its field and checked against the input's range.
import { formatValue } from '../format.ts';
import type { ParamSpec } from '../parameters.ts';
import { isUnitProblem, parseValue } from '../units.ts';
import { FileReport, writtenText } from './file-report.ts';

export function rangeText(spec: ParamSpec): string {
  const show = (x: number) => formatValue(x, spec.unit);
  const lo = spec.min !== undefined ? `${spec.exclusiveMin ? 'above' : 'at least'} ${show(spec.min)}` : '';
  const hi = spec.max !== undefined ? `${spec.exclusiveMax ? 'below' : 'at most'} ${show(spec.max)}` : '';
  if (spec.min === 0 && spec.exclusiveMin && spec.max === undefined) return 'a finite positive value';
  return `a finite value${lo ? ` ${lo}` : ''}${lo && hi ? ' and' : ''}${hi ? ` ${hi}` : ''}`;
}

/** Parse a value with a unit at `pointer`, reporting a problem there. */
export function readValue(
  report: FileReport,
  pointer: string,
  raw: unknown,
  spec: ParamSpec,
): { value: number; low?: number; high?: number; written: string } | null {
  if (typeof raw !== 'string' && typeof raw !== 'number') return null; // the schema reported it
  if (report.mistyped.has(pointer)) return null;
  const parsed = parseValue(raw, spec.unit, spec.meaning ?? 'absolute');
  if (isUnitProblem(parsed)) {
    report.add(parsed.code, pointer, { expected: parsed.expected, found: writtenText(report.src, pointer, raw) });
    return null;
  }
  // Every end of the tolerance must lie in the input's domain, and be finite.
  const ends = [parsed.value, parsed.low, parsed.high].filter((x): x is number => x !== undefined);
  const slack = 1e-12 * Math.max(1, Math.abs(spec.max ?? 0)); // "180 deg" converts to π less rounding
  const outside = (x: number) =>
    !Number.isFinite(x) ||
    (spec.min !== undefined && (spec.exclusiveMin ? x <= spec.min : x < spec.min)) ||
    (spec.max !== undefined && (spec.exclusiveMax ? x >= spec.max - slack : x > spec.max));
  if (ends.some(outside)) {
    const end = outside(parsed.value) ? '' : ' (at an end of its tolerance)';
    report.add('bad-value', pointer, { expected: `${rangeText(spec)}${end}`, found: writtenText(report.src, pointer, raw) });
    return null;
  }
  return { ...parsed, written: String(raw) };
}
