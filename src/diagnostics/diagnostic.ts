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
  | 'offset-unit'
  | 'id-too-long'
  | 'relation-at-tolerance'
  | 'no-handbook'
  // Waivers:
  | 'unknown-rule'
  | 'bad-date'
  | 'floor-stricter-than-rule'
  // Reading files (errors):
  | 'not-a-folder'
  | 'not-a-regular-file'
  | 'outside-handbook'
  | 'file-too-large'
  | 'not-utf8'
  | 'name-not-utf8'
  // Warnings: loading goes on, the problem is named.
  | 'not-loaded';

/** Codes that warn: the handbook still loads, and every command says what was left out. */
export const WARNING_CODES: ReadonlySet<DiagnosticCode> = new Set(['not-loaded']);

export function isWarning(d: Diagnostic): boolean {
  return WARNING_CODES.has(d.code);
}

export interface Diagnostic {
  code: DiagnosticCode;
  /** The git revision the file was read from (a short commit), absent for the working tree. */
  revision?: string;
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
  /** For a reference to another item (a material, a structure, a film step): which. A reference to
   * an item that was written but failed to load is a consequence of that failure and is dropped. */
  refersTo?: { kind: 'material' | 'structure' | 'film' | 'rule'; id: string };
  /** For `not-loaded`: why the entry was left out (worded in messages.ts). */
  reason?: NotLoadedReason;
}

export type NotLoadedReason = 'not-yaml' | 'hidden' | 'special' | 'revisited' | 'too-deep' | 'misnamed-file' | 'misnamed-folder';

/** Locale-independent string order, so output is byte-identical on every machine. */
export function byCodePoint(a: string, b: string): number {
  return a < b ? -1 : a > b ? 1 : 0;
}

/** Stable order: by file, then position, then code. */
export function sortDiagnostics(list: Diagnostic[]): Diagnostic[] {
  return [...list].sort((a, b) => byCodePoint(a.file, b.file) || a.line - b.line || a.column - b.column || byCodePoint(a.code, b.code));
}
