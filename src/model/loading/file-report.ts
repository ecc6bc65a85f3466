// One file's problems as diagnostics placed at their fields, reading and parsing a file, and the
// small helpers every reader shares (values quoted back as written, suggestions for misspellings).
import { distance } from 'fastest-levenshtein';
import { type Diagnostic, type DiagnosticCode, byCodePoint, isWarning } from '../../diagnostics/diagnostic.ts';
import { excerpt } from '../../diagnostics/messages.ts';
import { type HandbookSource, decodeUtf8 } from '../source.ts';
import type { SourcePos } from '../types.ts';
import { type YamlSource, isYamlFailure, parseYamlSource, pointerToField, positionOf } from '../yaml-source.ts';

/** Collects diagnostics for one file, placing each at the field it concerns. */
export class FileReport {
  /** Problems already reported, by code and field: one field's problem is said once, however many
   * readers meet it (a via conductor's material is looked up for four properties). */
  private readonly said = new Set<string>();
  /** Fields whose value the schema found of the wrong type: nothing further is said about them. */
  readonly mistyped = new Set<string>();
  private errors = 0;
  constructor(
    readonly src: YamlSource,
    private readonly out: Diagnostic[],
  ) {}
  add(code: DiagnosticCode, pointer: string, extra: Partial<Diagnostic> = {}, at: 'key' | 'value' = 'value'): void {
    const key = `${code}\u0000${pointer}`;
    if (this.said.has(key)) return;
    this.said.add(key);
    this.push(code, positionOf(this.src, pointer, at), pointer, extra);
  }
  /** Any error reported through this report. */
  get failed(): boolean {
    return this.errors > 0;
  }
  /** Errors reported so far (to tell whether one item of a list had any). */
  get errorCount(): number {
    return this.errors;
  }
  /** A diagnostic about `fieldPointer`, placed at `placePointer` (for fields not written). */
  addAt(code: DiagnosticCode, placePointer: string, fieldPointer: string, extra: Partial<Diagnostic> = {}): void {
    this.push(code, positionOf(this.src, placePointer, 'value'), fieldPointer, extra);
  }
  private push(code: DiagnosticCode, at: { line: number; column: number }, fieldPointer: string, extra: Partial<Diagnostic>): void {
    const d: Diagnostic = { code, file: this.src.file, line: at.line, column: at.column, field: pointerToField(fieldPointer), ...extra };
    if (!isWarning(d)) this.errors++;
    this.out.push(d);
  }
  pos(pointer: string): SourcePos {
    return { file: this.src.file, ...positionOf(this.src, pointer) };
  }
}

export function isMapping(v: unknown): v is Record<string, unknown> {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}

export function jsonType(v: unknown): string {
  if (v === null) return 'null';
  if (Array.isArray(v)) return 'a list';
  if (typeof v === 'object') return 'a mapping';
  if (typeof v === 'string') return `the text "${excerpt(v)}"`;
  return `${typeof v} ${String(v)}`;
}

export function valueAt(root: unknown, pointer: string): unknown {
  let v: unknown = root;
  for (const seg of pointer.split('/').slice(1)) {
    if (v === null || typeof v !== 'object') return undefined;
    v = (v as Record<string, unknown>)[seg.replace(/~1/g, '/').replace(/~0/g, '~')];
  }
  return v;
}

export function suggest(word: string, options: readonly string[], max = 3): string[] {
  const limit = Math.max(2, Math.floor(word.length / 3));
  return options
    .map((o) => ({ o, d: distance(word, o) }))
    .filter((x) => x.d <= limit || (word.length >= 4 && x.o.includes(word)) || (word.includes('.') && x.o.endsWith(word.split('.').pop() ?? '\0')))
    .sort((a, b) => a.d - b.d || byCodePoint(a.o, b.o))
    .slice(0, max)
    .map((x) => x.o);
}

export interface Loaded {
  src: YamlSource;
  report: FileReport;
}

/** Read (regular files inside the handbook only), decode (strict UTF-8) and parse with positions. */
export function readAndParse(source: HandbookSource, path: string, out: Diagnostic[]): Loaded | null {
  const at = { file: path, line: 1, column: 1, field: '' };
  const read = source.read(path);
  if (!read.ok) {
    out.push({ ...at, code: read.problem.code, found: read.problem.found });
    return null;
  }
  const decoded = decodeUtf8(read.bytes);
  if (!decoded.ok) {
    out.push({ ...at, code: 'not-utf8', line: decoded.line, column: decoded.column, found: decoded.found });
    return null;
  }
  const parsed = parseYamlSource(path, decoded.text);
  if (isYamlFailure(parsed)) {
    out.push({ ...at, code: 'yaml-syntax', line: parsed.line, column: parsed.column, found: parsed.reason });
    return null;
  }
  return { src: parsed, report: new FileReport(parsed, out) };
}

/** A value quoted back as written: `"32 nm"`, or `.inf` as the file spells it rather than "Infinity". */
export function writtenText(src: YamlSource, pointer: string, raw: unknown, show: (v: unknown) => string = (v) => `"${String(v)}"`): string {
  if (typeof raw === 'number' && !Number.isFinite(raw)) return sourceSpelling(src, pointer) ?? String(raw);
  return show(raw);
}

/** The characters of a scalar as written in the file (for values whose parsed form reads differently). */
export function sourceSpelling(src: YamlSource, pointer: string): string | undefined {
  const at = src.places.get(pointer);
  if (!at) return undefined;
  const m = /^[^\s,\]}#]+/.exec(src.text.slice(at.valueOffset, at.valueOffset + 40));
  return m?.[0];
}

export interface IdPlace {
  id: string;
  at: SourcePos;
  field: string;
}

export function checkDuplicates(items: IdPlace[], out: Diagnostic[]): void {
  const first = new Map<string, SourcePos>();
  for (const { id, at, field } of items) {
    const prior = first.get(id);
    if (prior) {
      out.push({ code: 'duplicate-id', file: at.file, line: at.line, column: at.column, field, found: id, other: { file: prior.file, line: prior.line, column: prior.column } });
    } else first.set(id, at);
  }
}
