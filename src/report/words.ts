// Sentences about verdicts, shared by the terminal and the site.
import type { Status, Verdict } from '../checker/evaluate.ts';
import type { ParamOrigin, Rule } from '../model/types.ts';
import { formatValue } from './format.ts';

export const CAUTION =
  'Caution: these results are engineering estimates from published models; confirm them on silicon before relying on them. ' +
  "Process work follows your site's safety rules and local codes.";

export const STATUS_WORDS: Record<Status, string> = {
  pass: 'pass',
  fail: 'fail',
  waived: 'waived',
  incomplete: 'incomplete',
  'not-applicable': 'not applicable',
};

export function limitPhrase(rule: Pick<Rule, 'comparison' | 'limit'>, unit: string): string {
  return `${rule.comparison === 'at_least' ? '≥' : '≤'} ${formatValue(rule.limit, unit)}`;
}

export function valuePhrase(v: Pick<Verdict, 'value' | 'unit' | 'reason' | 'unbounded'>): string {
  if (v.value !== null) return formatValue(v.value, v.unit);
  if (v.unbounded) return `unbounded ${v.unbounded === 'above' ? '(+∞)' : '(−∞)'}: ${v.reason ?? ''}`;
  return `no value: ${v.reason ?? ''}`;
}

export function originPhrase(o: ParamOrigin): string {
  if (o.type === 'handbook') return `written at ${o.pos.file}:${o.pos.line}:${o.pos.column}`;
  return `material table, ${o.material}: ${o.source}`;
}

export function cornerPhrase(name: string, side: 'low' | 'high', value: number, unit: string): string {
  return `${name} at its ${side} end, ${formatValue(value, unit)}`;
}
