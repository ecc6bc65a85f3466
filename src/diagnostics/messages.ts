// The one catalogue of sentences about handbook problems. Tests assert codes and fields, so
// rewording here never breaks a test.
import { isWarning, type Diagnostic } from './diagnostic.ts';

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
  'offset-unit': () => `a temperature difference cannot be written in a unit with an offset`,
  'id-too-long': () => `id too long`,
  'relation-at-tolerance': () => `values can contradict each other within their tolerances`,
  'no-handbook': () => `no handbook found`,
  'not-a-folder': (d) => `not a folder: ${d.found ?? ''}`,
  'not-a-regular-file': (d) => `not read: ${d.found ?? 'not a regular file'}`,
  'outside-handbook': (d) => `not read: ${d.found ?? 'outside the handbook'}`,
  'file-too-large': (d) => `not read: the file is too large (${d.found ?? ''})`,
  'not-utf8': (d) => `not UTF-8 text (${d.found ?? ''}); save the file as UTF-8`,
  'not-loaded': (d) => `not loaded: ${d.found ?? ''}`,
};

/** Longest text quoted back from a handbook file: enough to recognise it, never the whole file. */
export const MAX_QUOTE = 80;

/** Shorten a quoted value to MAX_QUOTE characters, on one line. */
export function excerpt(s: string): string {
  const oneLine = s.replace(/\r?\n/g, '⏎');
  const chars = [...oneLine];
  return chars.length <= MAX_QUOTE ? oneLine : `${chars.slice(0, MAX_QUOTE - 1).join('')}… (${chars.length} characters)`;
}

/** Codes whose headline already quotes what was found. */
const SAYS_FOUND = new Set<Diagnostic['code']>(['yaml-syntax', 'file-unreadable', 'unknown-kind', 'duplicate-id', 'id-not-url-safe', 'unknown-quantity', 'unknown-material', 'not-a-folder', 'not-a-regular-file', 'outside-handbook', 'file-too-large', 'not-utf8', 'not-loaded']);

function quote(s: string | undefined): string {
  return s === undefined ? '' : `"${excerpt(s)}"`;
}
function lastSegment(path: string): string {
  const parts = path.split('.');
  return parts[parts.length - 1] ?? path;
}

/** One-line sentence for a diagnostic, without its position. */
export function describeDiagnostic(d: Diagnostic): string {
  const parts = [headline[d.code](d)];
  if (d.expected !== undefined) parts.push(`expected ${d.expected}`);
  if (d.found !== undefined && !SAYS_FOUND.has(d.code)) parts.push(`found ${excerpt(d.found)}`);
  if (d.other) parts.push(`also defined at ${d.other.file}:${d.other.line}:${d.other.column}`);
  if (d.suggestions && d.suggestions.length > 0) parts.push(`did you mean ${d.suggestions.map((s) => `"${s}"`).join(', ')}?`);
  return parts.join('; ');
}

/** `file:line:column field: sentence` — the form editors and terminals link. */
export function formatDiagnostic(d: Diagnostic): string {
  const field = d.field ? ` ${d.field}:` : '';
  return `${d.file}:${d.line}:${d.column}${isWarning(d) ? ' warning:' : ''}${field} ${describeDiagnostic(d)}`;
}

const plural = (n: number, word: string) => `${n} ${word}${n === 1 ? '' : 's'}`;

/** A handbook that did not load: every problem, then what happened. */
export function formatDiagnostics(list: Diagnostic[]): string {
  const errors = list.filter((d) => !isWarning(d)).length;
  const warnings = list.length - errors;
  return `${list.map(formatDiagnostic).join('\n')}\n${plural(errors, 'problem')}${warnings ? ` and ${plural(warnings, 'warning')}` : ''} in the handbook; nothing was written.`;
}

/** Warnings of a handbook that loaded (printed on stderr before a command's own output). */
export function formatWarnings(list: Diagnostic[]): string {
  return `${list.map(formatDiagnostic).join('\n')}\n${plural(list.length, 'warning')}: the handbook loaded without ${list.length === 1 ? 'it' : 'them'}.`;
}
