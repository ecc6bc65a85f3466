// Problems found in a handbook are data: a stable code, a place, a field path and the facts.
// Wording lives in ./messages.ts so the CLI and the site say the same thing and tests assert
// codes and fields rather than sentences.

export type DiagnosticCode =
  | 'yaml-syntax'
  | 'file-unreadable'
  | 'unknown-field'
  | 'missing-field'
  | 'wrong-type'
  | 'bad-value'
  | 'unknown-kind'
  | 'duplicate-id'
  | 'id-not-url-safe'
  | 'wrong-dimension'
  | 'malformed-quantity'
  | 'malformed-tolerance'
  | 'unknown-quantity'
  | 'unknown-material'
  | 'unknown-unit'
  | 'no-handbook';

export interface Diagnostic {
  code: DiagnosticCode;
  file: string;
  line: number;
  column: number;
  /** Field path within the file, as a dotted path (`geometry.cd`, `[2].quantity`). */
  field: string;
  /** What the format wants there. */
  expected?: string;
  /** What the file has there. */
  found?: string;
  /** Close alternatives (quantity names, material ids, kinds). */
  suggestions?: string[];
  /** For duplicate ids: the other place. */
  other?: { file: string; line: number; column: number };
}

/** Locale-independent string order, so output is byte-identical on every machine. */
export function byCodePoint(a: string, b: string): number {
  return a < b ? -1 : a > b ? 1 : 0;
}

/** Stable order: by file, then position, then code. */
export function sortDiagnostics(list: Diagnostic[]): Diagnostic[] {
  return [...list].sort((a, b) => byCodePoint(a.file, b.file) || a.line - b.line || a.column - b.column || byCodePoint(a.code, b.code));
}
