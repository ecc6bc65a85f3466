// The one catalogue of sentences about handbook problems. Tests assert codes and fields, so
// rewording here never breaks a test.
import type { Diagnostic } from './diagnostic.ts';

const headline: Record<Diagnostic['code'], (d: Diagnostic) => string> = {
  'yaml-syntax': (d) => `YAML syntax error: ${d.found ?? ''}`,
  'file-unreadable': (d) => `cannot read the file: ${d.found ?? ''}`,
  'unknown-field': (d) => `unknown field "${lastSegment(d.field)}"`,
  'missing-field': (d) => `missing required field "${lastSegment(d.field)}"`,
  'wrong-type': () => `wrong type`,
  'bad-value': () => `value not allowed`,
  'unknown-kind': (d) => `unknown structure kind ${quote(d.found)}`,
  'duplicate-id': (d) => `duplicate id ${quote(d.found)}`,
  'id-not-url-safe': (d) => `id ${quote(d.found)} cannot be used in a URL`,
  'wrong-dimension': () => `unit of the wrong dimension`,
  'malformed-quantity': () => `not a number with a unit`,
  'malformed-tolerance': () => `malformed tolerance`,
  'unknown-quantity': (d) => `no engine provides the quantity ${quote(d.found)}`,
  'unknown-material': (d) => `unknown material ${quote(d.found)}`,
  'unknown-unit': () => `unknown unit`,
  'no-handbook': () => `no handbook found`,
};

function quote(s: string | undefined): string {
  return s === undefined ? '' : `"${s}"`;
}
function lastSegment(path: string): string {
  const parts = path.split('.');
  return parts[parts.length - 1] ?? path;
}

/** One-line sentence for a diagnostic, without its position. */
export function describeDiagnostic(d: Diagnostic): string {
  const parts = [headline[d.code](d)];
  if (d.expected !== undefined) parts.push(`expected ${d.expected}`);
  if (d.found !== undefined && !['yaml-syntax', 'file-unreadable', 'unknown-kind', 'duplicate-id', 'id-not-url-safe', 'unknown-quantity', 'unknown-material'].includes(d.code)) {
    parts.push(`found ${d.found}`);
  }
  if (d.other) parts.push(`also defined at ${d.other.file}:${d.other.line}:${d.other.column}`);
  if (d.suggestions && d.suggestions.length > 0) parts.push(`did you mean ${d.suggestions.map((s) => `"${s}"`).join(', ')}?`);
  return parts.join('; ');
}

/** `file:line:column field: sentence` — the form editors and terminals link. */
export function formatDiagnostic(d: Diagnostic): string {
  const field = d.field ? ` ${d.field}:` : '';
  return `${d.file}:${d.line}:${d.column}${field} ${describeDiagnostic(d)}`;
}

export function formatDiagnostics(list: Diagnostic[]): string {
  const n = list.length;
  return `${list.map(formatDiagnostic).join('\n')}\n${n} problem${n === 1 ? '' : 's'} in the handbook; nothing was written.`;
}
