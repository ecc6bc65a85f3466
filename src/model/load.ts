// Load a handbook folder: read → parse (YAML with positions) → validate (JSON Schema) → normalize
// (units to SI, materials resolved, cross-references checked). Every problem becomes a diagnostic
// and loading carries on, so one run reports them all.
import { Ajv, type ErrorObject, type ValidateFunction } from 'ajv';
import { closest, distance } from 'fastest-levenshtein';
import type { Diagnostic, DiagnosticCode, NotLoadedReason } from '../diagnostics/diagnostic.ts';
import { byCodePoint, isWarning, sortDiagnostics } from '../diagnostics/diagnostic.ts';
import { QUANTITIES } from '../engines/index.ts';
import { BUILT_IN_MATERIALS } from './materials-table.ts';
import { CALIBRATION_SPECS, CELL_DIELECTRIC_PARAMS, CELL_PARAMS, DEPOSITION_PARAMS, ISOLATION_PARAMS, THERMOMECH_PARAMS, VIA_CONDUCTOR_MECH, VIA_PARAMS, DRYING_PARAMS, ETCH_PARAMS, FILL_PARAMS, ION_PARAMS, GEOMETRY_BY_KIND, GEOMETRY_PARAMS, MATERIAL_PROPERTIES, SUPPORT_SPEC, type ParamSpec } from './parameters.ts';
import { WAIVER_FIELDS, handbookSchema, materialsSchema, ruleSchema, structureSchema, waiverSchema } from './schema.ts';
import { calendarDateOf, readCalendarDate } from './calendar.ts';
import { excerpt } from '../diagnostics/messages.ts';
import {
  KINDS,
  isElongated,
  isOpening,
  type CellShape,
  type DepositionShape,
  type DryingShape,
  type ElectrodeSurface,
  type FillShape,
  type EtchShape,
  type ArrayLayout,
  type Handbook,
  type HandbookMeta,
  type Kind,
  type Material,
  type MaterialProperty,
  type Param,
  type Rule,
  type Selector,
  type SourcePos,
  type Structure,
  type Waiver,
} from './types.ts';
import { formatValue } from '../report/format.ts';
import { isUnitProblem, parseValue } from './units.ts';
import { checkRelation, describeCorner, structureRelations, type Relation } from './relations.ts';
import { isYamlFailure, parseYamlSource, pointerToField, positionOf, type YamlSource } from './yaml-source.ts';
import { HANDBOOK_INPUTS, baseName, decodeUtf8, extName, stemOf, type HandbookSource } from './source.ts';

/** A handbook (with the warnings of its loading in `handbook.warnings`), or every problem found. */
export type LoadResult = { ok: true; handbook: Handbook } | { ok: false; diagnostics: Diagnostic[] };

let validators: { structure: ValidateFunction; rule: ValidateFunction; waiver: ValidateFunction; materials: ValidateFunction; handbook: ValidateFunction } | undefined;
function getValidators(): NonNullable<typeof validators> {
  if (!validators) {
    const ajv = new Ajv({ allErrors: true, strict: true, allowUnionTypes: true });
    validators = {
      structure: ajv.compile(structureSchema()),
      rule: ajv.compile(ruleSchema()),
      waiver: ajv.compile(waiverSchema()),
      materials: ajv.compile(materialsSchema()),
      handbook: ajv.compile(handbookSchema()),
    };
  }
  return validators;
}

/** Collects diagnostics for one file, placing each at the field it concerns. */
class FileReport {
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

function isMapping(v: unknown): v is Record<string, unknown> {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}

/** Shorter names a block may use for a material property (`expansion` for `thermal_expansion`). */
const PROPERTY_ALIASES: Record<string, string> = { thermal_expansion: 'expansion' };

/** A material property as written in a block, under its own name or its alias, with the key used. */
function writtenProperty(block: Record<string, unknown>, prop: string, conflict?: { report: FileReport; base: string }): { key: string; raw: unknown } | undefined {
  const alias = PROPERTY_ALIASES[prop];
  if (alias !== undefined && block[prop] !== undefined && block[alias] !== undefined && conflict) {
    // Both names at once: neither is silently preferred.
    conflict.report.add('bad-value', `${conflict.base}/${alias}`, { expected: `one of ${prop} and ${alias} (the same property under two names), not both`, found: 'both' }, 'key');
    return undefined;
  }
  if (block[prop] !== undefined) return { key: prop, raw: block[prop] };
  return alias !== undefined && block[alias] !== undefined ? { key: alias, raw: block[alias] } : undefined;
}

function jsonType(v: unknown): string {
  if (v === null) return 'null';
  if (Array.isArray(v)) return 'a list';
  if (typeof v === 'object') return 'a mapping';
  if (typeof v === 'string') return `the text "${excerpt(v)}"`;
  return `${typeof v} ${String(v)}`;
}

function valueAt(root: unknown, pointer: string): unknown {
  let v: unknown = root;
  for (const seg of pointer.split('/').slice(1)) {
    if (v === null || typeof v !== 'object') return undefined;
    v = (v as Record<string, unknown>)[seg.replace(/~1/g, '/').replace(/~0/g, '~')];
  }
  return v;
}

function suggest(word: string, options: readonly string[], max = 3): string[] {
  const limit = Math.max(2, Math.floor(word.length / 3));
  return options
    .map((o) => ({ o, d: distance(word, o) }))
    .filter((x) => x.d <= limit || (word.length >= 4 && x.o.includes(word)) || (word.includes('.') && x.o.endsWith(word.split('.').pop() ?? '\0')))
    .sort((a, b) => a.d - b.d || byCodePoint(a.o, b.o))
    .slice(0, max)
    .map((x) => x.o);
}

/** Translate ajv's errors into diagnostics: unknown and missing fields, types, enums, ids. */
function reportSchemaErrors(errors: ErrorObject[], report: FileReport, allowedAt: (pointer: string) => string[]): void {
  const seen = new Set<string>();
  // A value of the wrong type is one problem: its enum, pattern or length are not judged as well
  // (`orientation: 001` is the number 1, not also an orientation outside the list), nor its unit.
  for (const e of errors) if (e.keyword === 'type') report.mistyped.add(e.instancePath);
  for (const e of errors) {
    const value = valueAt(report.src.value, e.instancePath);
    let key = `${e.keyword}:${e.instancePath}`;
    if (e.keyword !== 'type' && report.mistyped.has(e.instancePath)) continue;
    switch (e.keyword) {
      case 'additionalProperties': {
        const name = (e.params as { additionalProperty: string }).additionalProperty;
        const pointer = `${e.instancePath}/${name}`;
        key += name;
        if (seen.has(key)) continue;
        const allowed = allowedAt(e.instancePath);
        report.add('unknown-field', pointer, { expected: `one of ${allowed.join(', ')}`, suggestions: suggest(name, allowed) }, 'key');
        break;
      }
      case 'required': {
        const name = (e.params as { missingProperty: string }).missingProperty;
        key += name;
        if (seen.has(key)) continue;
        // Placed at the mapping that lacks it, named by the path it should have.
        report.addAt('missing-field', e.instancePath, `${e.instancePath}/${name}`);
        break;
      }
      case 'type':
        // .inf and .nan are numbers the schema calls no number: where a number belongs, the problem
        // is that the value is not finite (said the same way readValue says it, so said once).
        if (typeof value === 'number' && !Number.isFinite(value) && allowsNumber(e)) {
          report.add('bad-value', e.instancePath, { expected: 'a finite value', found: sourceSpelling(report.src, e.instancePath) ?? String(value) });
          break;
        }
        report.add('wrong-type', e.instancePath, { expected: describeType((e.params as { type: string | string[] }).type), found: writtenText(report.src, e.instancePath, value, jsonType) });
        break;
      case 'maxLength':
        if (/\/id$|\/tags\/\d+$|\/film$/.test(e.instancePath)) {
          report.add('id-too-long', e.instancePath, { expected: `at most ${(e.params as { limit: number }).limit} characters (ids are addresses and file names)`, found: `${String(value).length} characters` });
        } else report.add('bad-value', e.instancePath, { expected: `at most ${(e.params as { limit: number }).limit} characters`, found: `${String(value).length} characters` });
        break;
      case 'minLength':
        report.add('bad-value', e.instancePath, { expected: 'a text that is not empty', found: jsonType(value) });
        break;
      case 'minItems': {
        const n = (e.params as { limit: number }).limit;
        report.add('bad-value', e.instancePath, { expected: `a list of at least ${n} ${n === 1 ? 'entry' : 'entries'} (or leave the field out)`, found: Array.isArray(value) && value.length === 0 ? 'an empty list' : jsonType(value) });
        break;
      }
      case 'uniqueItems':
        report.add('bad-value', e.instancePath, { expected: 'a list without repeated entries', found: jsonType(value) });
        break;
      case 'enum': {
        const allowed = (e.params as { allowedValues: unknown[] }).allowedValues.map(String);
        const isKind = e.instancePath === '/kind' || /\/kinds\/\d+$/.test(e.instancePath);
        report.add(isKind ? 'unknown-kind' : 'bad-value', e.instancePath, {
          expected: `one of ${allowed.join(', ')}`,
          found: String(value),
          suggestions: typeof value === 'string' ? suggest(value, allowed) : [],
        });
        break;
      }
      case 'pattern':
        if ((e as { propertyName?: string }).propertyName !== undefined) continue; // reported with propertyNames
        if (/\/id$/.test(e.instancePath)) {
          report.add('id-not-url-safe', e.instancePath, {
            expected: e.instancePath.includes('rule') || /^\/(\d+\/)?id$/.test(e.instancePath) ? describePattern(e.schemaPath) : 'lower-case letters, digits and single dashes',
            found: String(value),
          });
        } else if (/\/expires$/.test(e.instancePath)) {
          report.add('bad-date', e.instancePath, { expected: DATE_EXPECTED, found: jsonType(value) });
        } else {
          report.add('bad-value', e.instancePath, { expected: describePattern(e.schemaPath), found: jsonType(value) });
        }
        break;
      case 'propertyNames': {
        const name = (e.params as { propertyName: string }).propertyName;
        key += name;
        if (seen.has(key)) continue;
        report.add('bad-value', `${e.instancePath}/${name}`, { expected: 'a role name in lower case (letters, digits, underscores), such as body or fill', found: `"${name}"` }, 'key');
        break;
      }
      case 'if':
        continue;
      default:
        report.add('bad-value', e.instancePath, { expected: e.message ?? e.keyword, found: jsonType(value) });
    }
    seen.add(key);
  }
}

function allowsNumber(e: ErrorObject): boolean {
  const t = (e.params as { type: string | string[] }).type;
  return (Array.isArray(t) ? t : [t]).includes('number');
}

function describeType(t: string | string[]): string {
  const names: Record<string, string> = { string: 'text', number: 'a number', object: 'a mapping', array: 'a list', integer: 'a whole number', boolean: 'true or false' };
  const list = Array.isArray(t) ? t : [t];
  return list.map((x) => names[x] ?? x).join(' or ');
}

function describePattern(schemaPath: string): string {
  if (schemaPath.includes('quantity')) return 'a quantity name such as geometry.aspect_ratio';
  return 'an id of letters, digits and single dashes (lower-case for structures, upper-case for rules and waivers)';
}

const DATE_EXPECTED = 'a calendar date written YYYY-MM-DD, such as 2027-06-30';
const MONTHS = ['January', 'February', 'March', 'April', 'May', 'June', 'July', 'August', 'September', 'October', 'November', 'December'];

interface Loaded {
  src: YamlSource;
  report: FileReport;
}

/** Read (regular files inside the handbook only), decode (strict UTF-8) and parse with positions. */
function readAndParse(source: HandbookSource, path: string, out: Diagnostic[]): Loaded | null {
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

const isYamlName = (path: string) => ['.yaml', '.yml'].includes(extName(path).toLowerCase());
const isHidden = (path: string) => baseName(path).startsWith('.');
/** Deep enough for any sensible grouping; deeper is a link loop. */
const MAX_FOLDER_DEPTH = 8;

/**
 * The YAML files of `structures/` or `rules/`, subfolders included. Everything else in them is named
 * in a warning, so nothing is left out silently; a YAML name that is not a regular file inside the
 * handbook is kept, and reading it reports why.
 */
function discover(source: HandbookSource, dir: string, out: Diagnostic[]): string[] {
  const kind = source.kindOf(dir);
  if (kind === 'missing') return [];
  if (kind !== 'folder') {
    out.push({ code: 'not-a-folder', file: dir, line: 1, column: 1, field: '', found: `${dir} must be a folder of YAML files` });
    return [];
  }
  const files: string[] = [];
  const leftOut = (path: string, reason: NotLoadedReason, found: string): void => void out.push({ code: 'not-loaded', file: path, line: 1, column: 1, field: '', reason, found });
  // Folders already walked, by identity: a link back to one (a loop, or a second way in) is not
  // walked again, or every file below it would load twice.
  const seen = new Set<string>();
  const walk = (folder: string, depth: number): void => {
    const id = source.identity?.(folder);
    if (id !== undefined) {
      if (seen.has(id)) return leftOut(folder, 'revisited', '');
      seen.add(id);
    }
    for (const e of source.list(folder)) {
      if (e.problem === 'name-not-utf8') {
        // Not addressable as text, so not readable: an error whatever it is, so nothing in it is lost unseen.
        out.push({ code: 'name-not-utf8', file: e.path, line: 1, column: 1, field: '' });
        continue;
      }
      if (isHidden(e.path)) {
        // Hidden entries are not read. Editor and system litter (.DS_Store, .x.yaml.swp) passes
        // without a word; a hidden YAML file (.draft.yaml, an editor's .#x.yaml lock) is named.
        if (isYamlName(e.path)) leftOut(e.path, 'hidden', '');
        continue;
      }
      if (e.kind === 'folder') {
        if (depth < MAX_FOLDER_DEPTH) walk(e.path, depth + 1);
        else leftOut(e.path, 'too-deep', String(MAX_FOLDER_DEPTH));
      } else if (isYamlName(e.path)) files.push(e.path);
      else if (e.kind === 'file') leftOut(e.path, 'not-yaml', `${dir}/`);
      else leftOut(e.path, 'special', e.what ?? '');
    }
  };
  walk(dir, 1);
  return files.sort(byCodePoint);
}

/** Top-level entries that look meant for us under another spelling (`materials.yml`, `Rules/`). */
function misnamedTopLevel(source: HandbookSource, out: Diagnostic[]): void {
  const files: string[] = HANDBOOK_INPUTS.filter((n) => n.endsWith('.yaml'));
  const folders: string[] = HANDBOOK_INPUTS.filter((n) => !n.endsWith('.yaml'));
  for (const e of source.list('')) {
    const name = baseName(e.path);
    const lower = name.toLowerCase();
    if (files.includes(name) || folders.includes(name)) continue;
    const file = files.find((w) => lower === w || lower === w.replace(/\.yaml$/, '.yml'));
    const folder = folders.find((w) => lower === w || lower === w.replace(/s$/, ''));
    if (file) out.push({ code: 'not-loaded', file: e.path, line: 1, column: 1, field: '', reason: 'misnamed-file', found: file });
    else if (folder && e.kind === 'folder') out.push({ code: 'not-loaded', file: e.path, line: 1, column: 1, field: '', reason: 'misnamed-folder', found: `${folder}/` });
  }
}

/** A value quoted back as written: `"32 nm"`, or `.inf` as the file spells it rather than "Infinity". */
function writtenText(src: YamlSource, pointer: string, raw: unknown, show: (v: unknown) => string = (v) => `"${String(v)}"`): string {
  if (typeof raw === 'number' && !Number.isFinite(raw)) return sourceSpelling(src, pointer) ?? String(raw);
  return show(raw);
}

/** The characters of a scalar as written in the file (for values whose parsed form reads differently). */
function sourceSpelling(src: YamlSource, pointer: string): string | undefined {
  const at = src.places.get(pointer);
  if (!at) return undefined;
  const m = /^[^\s,\]}#]+/.exec(src.text.slice(at.valueOffset, at.valueOffset + 40));
  return m?.[0];
}

function rangeText(spec: ParamSpec): string {
  const show = (x: number) => formatValue(x, spec.unit);
  const lo = spec.min !== undefined ? `${spec.exclusiveMin ? 'above' : 'at least'} ${show(spec.min)}` : '';
  const hi = spec.max !== undefined ? `${spec.exclusiveMax ? 'below' : 'at most'} ${show(spec.max)}` : '';
  if (spec.min === 0 && spec.exclusiveMin && spec.max === undefined) return 'a finite positive value';
  return `a finite value${lo ? ` ${lo}` : ''}${lo && hi ? ' and' : ''}${hi ? ` ${hi}` : ''}`;
}

/** Parse a value with a unit at `pointer`, reporting a problem there. */
function readValue(
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

/** The handbook's materials: the built-in table, then `materials.yaml`. */
interface MaterialsLoaded {
  materials: Map<string, Material>;
  /** Ids written in materials.yaml, loaded or not: a use of one that failed is a consequence of
   * that failure, not a problem of its own, and is not reported again. */
  written: Set<string>;
  /** materials.yaml could not be parsed at all, so no use of an unknown id can be judged. */
  unreadable: boolean;
}

function builtInMaterials(): Map<string, Material> {
  const materials = new Map<string, Material>();
  for (const m of BUILT_IN_MATERIALS) {
    const properties: Record<string, MaterialProperty> = {};
    for (const [name, tv] of Object.entries(m.properties)) {
      const spec = MATERIAL_PROPERTIES[name];
      if (!spec) throw new Error(`built-in material ${m.id} has unknown property ${name}`);
      const p = parseValue(tv.value, spec.unit);
      if (isUnitProblem(p)) throw new Error(`built-in material ${m.id}.${name}: ${p.code}`);
      properties[name] = { value: p.value, ...(p.low !== undefined && p.high !== undefined ? { low: p.low, high: p.high } : {}), unit: spec.unit, written: tv.value, source: tv.source };
    }
    materials.set(m.id, { id: m.id, title: m.title, properties, origin: 'built-in' });
  }
  return materials;
}

function loadMaterials(source: HandbookSource, out: Diagnostic[]): MaterialsLoaded {
  const materials = builtInMaterials();
  const written = new Set<string>();
  const path = 'materials.yaml';
  if (source.kindOf(path) === 'missing') return { materials, written, unreadable: false };
  const loaded = readAndParse(source, path, out);
  if (!loaded) return { materials, written, unreadable: true };
  const { src, report } = loaded;
  const v = getValidators().materials;
  const valid = v(src.value);
  const errors = v.errors ?? [];
  if (!valid) reportSchemaErrors(errors, report, () => ['id', 'title', 'based_on', 'source', ...Object.keys(MATERIAL_PROPERTIES), 'expansion']);
  // Not a list at all: any id a structure names might have been meant here.
  if (!Array.isArray(src.value)) return { materials, written, unreadable: true };
  const entries = src.value as unknown[];
  for (const e of entries) if (isMapping(e) && typeof e.id === 'string') written.add(e.id);
  const ids: IdPlace[] = [];
  const invalid = new Set(errors.map((e) => e.instancePath.split('/')[1]));
  entries.forEach((entry, i) => {
    // Each entry on its own: one bad entry does not take the others with it.
    if (!isMapping(entry) || invalid.has(String(i))) return;
    const id = String(entry.id);
    ids.push({ id, at: report.pos(`/${i}/id`), field: `[${i}].id` });
    if (materials.get(id)?.file === src.file) return; // a repeat: reported below; the first one stands
    const base = entry.based_on !== undefined ? materials.get(String(entry.based_on)) : undefined;
    if (entry.based_on !== undefined && !base) {
      report.add('unknown-material', `/${i}/based_on`, { found: String(entry.based_on), suggestions: suggest(String(entry.based_on), [...materials.keys()]) });
    }
    const properties: Record<string, MaterialProperty> = { ...(base?.properties ?? {}) };
    const source = typeof entry.source === 'string' ? entry.source : `handbook materials file (${src.file})`;
    for (const [name, spec] of Object.entries(MATERIAL_PROPERTIES)) {
      const w = writtenProperty(entry, name, { report, base: `/${i}` });
      if (!w) continue;
      const r = readValue(report, `/${i}/${w.key}`, w.raw, spec);
      if (r) properties[name] = { ...r, unit: spec.unit, source };
    }
    materials.set(id, { id, title: String(entry.title), properties, origin: 'handbook', file: src.file });
  });
  checkDuplicates(ids, out);
  return { materials, written, unreadable: false };
}

/**
 * A material's property as an input of a structure: value and tolerance together, wherever the
 * material is used (a role, a liquid, a dielectric, a via conductor or liner). The one place a
 * material property becomes a Param, so no use can drop the tolerance.
 */
function materialParam(name: string, materialId: string, mp: MaterialProperty, pos: SourcePos): Param {
  return {
    name,
    value: mp.value,
    ...(mp.low !== undefined && mp.high !== undefined ? { low: mp.low, high: mp.high } : {}),
    unit: mp.unit,
    written: mp.written,
    origin: { type: 'material-table', material: materialId, source: mp.source, pos },
  };
}

/** An id that names no material; a consequence (and dropped) when materials.yaml failed on that id. */
function reportUnknownMaterial(report: FileReport, pointer: string, id: string, materials: ReadonlyMap<string, Material>): void {
  report.add('unknown-material', pointer, { found: id, suggestions: suggest(id, [...materials.keys()]), refersTo: { kind: 'material', id } });
}

/** Every relation between inputs, at nominal and at every combination of tolerance ends. */
function checkRelations(report: FileReport, params: ReadonlyMap<string, Param>, relations: Relation[]): void {
  const reported = new Set<string>();
  for (const r of relations) {
    if (reported.has(r.pointer)) continue; // one problem per field is enough to fix it
    const c = checkRelation(r, params);
    if (c.ok) continue;
    reported.add(r.pointer);
    const first = params.get(r.reads[0]!)!;
    if (c.at === 'nominal') report.add('bad-value', r.pointer, { expected: r.expected, found: `"${first.written}"` });
    else {
      const corner = describeCorner(c.corner, (n) => params.get(n)?.unit ?? '1');
      report.add('relation-at-tolerance', r.pointer, { expected: `${r.expected} at every end of the tolerances; it fails with ${corner}`, found: `"${first.written}"` });
    }
  }
}

function structureFromFile(loaded: Loaded, materials: Map<string, Material>): Structure | null {
  const { src, report } = loaded;
  const v = getValidators().structure;
  const raw = src.value as Record<string, unknown>;
  const schemaOk = v(raw);
  if (!schemaOk) {
    reportSchemaErrors(v.errors ?? [], report, (ptr) =>
      ptr === ''
        ? ['id', 'title', 'kind', 'tags', 'description', 'geometry', 'etch', 'deposition', 'fill', 'drying', 'cell', 'via', 'isolation', 'anneal', 'keep_out', 'film', 'wafer', 'materials']
        : ptr === '/geometry'
          ? [...Object.keys(GEOMETRY_PARAMS), 'array']
          : ptr === '/drying'
            ? ['liquid', ...Object.keys(DRYING_PARAMS), 'supports', 'supports_hold']
            : ptr === '/etch'
              ? [...Object.keys(ETCH_PARAMS), 'ion', 'calibration']
              : ptr === '/etch/ion'
                ? Object.keys(ION_PARAMS)
              : /^\/etch\/calibration\/\d+$/.test(ptr)
                ? Object.keys(CALIBRATION_SPECS)
                : /^\/deposition\/\d+$/.test(ptr)
                  ? ['film', 'method', ...Object.keys(DEPOSITION_PARAMS)]
                  : ptr === '/fill'
                    ? ['method', ...Object.keys(FILL_PARAMS)]
                    : ptr === '/cell'
                      ? ['dielectric', 'electrode_surfaces', ...Object.keys(CELL_PARAMS)]
                      : ptr === '/cell/dielectric'
                        ? ['material', ...Object.keys(CELL_DIELECTRIC_PARAMS)]
                        : ptr === '/via'
                          ? ['conductor', 'liner']
                          : ptr === '/via/conductor'
                            ? ['material', 'resistivity', 'youngs_modulus', 'poisson_ratio', 'thermal_expansion', 'expansion']
                            : ptr === '/via/liner'
                              ? ['material', 'thickness', 'dielectric_constant']
                              : ptr === '/isolation'
                                ? Object.keys(ISOLATION_PARAMS)
                                : ptr === '/wafer'
                                  ? [...Object.keys(THERMOMECH_PARAMS.wafer!), 'orientation']
                                  : THERMOMECH_PARAMS[ptr.slice(1)]
                                    ? Object.keys(THERMOMECH_PARAMS[ptr.slice(1)]!)
            : ['material', ...Object.keys(MATERIAL_PROPERTIES)],
    );
    // Keep checking values, units and materials so one run reports every problem in the file;
    // only a file that is not a mapping at all stops here.
    if (!isMapping(raw)) return null;
  }
  const id = String(raw.id);
  const kindKnown = (KINDS as readonly unknown[]).includes(raw.kind);
  const kind = raw.kind as Kind;
  const stem = stemOf(src.file);
  if (typeof raw.id === 'string' && stem !== id) report.add('bad-value', '/id', { expected: `the file name "${stem}" (a structure's id is its file name)`, found: `"${id}"` });

  const params = new Map<string, Param>();
  const geometry = isMapping(raw.geometry) ? raw.geometry : {};
  const allowed = kindKnown ? (GEOMETRY_BY_KIND[kind] ?? []) : Object.keys(GEOMETRY_PARAMS);
  for (const [name, spec] of Object.entries(GEOMETRY_PARAMS)) {
    if (geometry[name] === undefined) continue;
    if (!allowed.includes(name)) {
      report.add('unknown-field', `/geometry/${name}`, { expected: `for a ${kind}: ${allowed.join(', ')}, array`, suggestions: suggest(name, allowed) }, 'key');
      continue;
    }
    const r = readValue(report, `/geometry/${name}`, geometry[name], spec);
    if (r) params.set(`geometry.${name}`, { name: `geometry.${name}`, ...r, unit: spec.unit, origin: { type: 'handbook', pos: report.pos(`/geometry/${name}`) } });
  }
  let array = typeof geometry.array === 'string' ? (geometry.array as ArrayLayout) : undefined;
  if (!kindKnown) {
    // The kind was reported; nothing kind-specific can be checked.
  } else if (isElongated(kind)) {
    if (array !== undefined && array !== 'lines') report.add('bad-value', '/geometry/array', { expected: `lines (a ${kind} array is a set of parallel lines)`, found: array });
    array = 'lines';
  } else if (array === 'lines') {
    report.add('bad-value', '/geometry/array', { expected: `hexagonal or square for a ${kind}`, found: array });
  }

  const materialRoles: Record<string, string> = {};
  const mats = isMapping(raw.materials) ? raw.materials : {};
  for (const [role, use] of Object.entries(mats)) {
    const isInline = isMapping(use);
    if (isInline ? typeof use.material !== 'string' : typeof use !== 'string') continue; // reported by the schema
    const materialId = isInline ? String(use.material) : String(use);
    const pointer = isInline ? `/materials/${role}/material` : `/materials/${role}`;
    const material = materials.get(materialId);
    if (!material) {
      reportUnknownMaterial(report, pointer, materialId, materials);
      continue;
    }
    materialRoles[role] = materialId;
    for (const [prop, mp] of Object.entries(material.properties)) {
      params.set(`materials.${role}.${prop}`, materialParam(`materials.${role}.${prop}`, materialId, mp, report.pos(pointer)));
    }
    if (isInline) {
      for (const [prop, spec] of Object.entries(MATERIAL_PROPERTIES)) {
        const w = writtenProperty(use as Record<string, unknown>, prop, { report, base: `/materials/${role}` });
        if (!w) continue;
        const pointer = `/materials/${role}/${w.key}`;
        const r = readValue(report, pointer, w.raw, spec);
        if (r) params.set(`materials.${role}.${prop}`, { name: `materials.${role}.${prop}`, ...r, unit: spec.unit, origin: { type: 'handbook', pos: report.pos(pointer) } });
      }
    }
    // A material without an isotropic stand-in (a crystal's) is isotropic: isotropic models read its own pair.
    for (const own of ['youngs_modulus', 'poisson_ratio']) {
      const p = params.get(`materials.${role}.${own}`);
      const stand = `materials.${role}.isotropic_${own}`;
      if (p && !params.has(stand)) params.set(stand, { ...p, name: stand });
    }
  }

  const cell = isMapping(raw.cell) ? readCell(report, raw.cell, kindKnown ? kind : undefined, params, materials) : undefined;
  const via = isMapping(raw.via) ? readVia(report, raw.via, kindKnown ? kind : undefined, params, materials) : undefined;
  let isolation: true | undefined;
  if (isMapping(raw.isolation)) {
    if (kindKnown && kind !== 'trench') report.add('unknown-field', '/isolation', { expected: `an isolation block only on a trench, not on a ${kind}` }, 'key');
    else {
      for (const [name, spec] of Object.entries(ISOLATION_PARAMS)) {
        if (raw.isolation[name] === undefined) continue;
        const r = readValue(report, `/isolation/${name}`, raw.isolation[name], spec);
        if (r) params.set(`isolation.${name}`, { name: `isolation.${name}`, ...r, unit: spec.unit, origin: { type: 'handbook', pos: report.pos(`/isolation/${name}`) } });
      }
      isolation = true;
    }
  }
  for (const [block, specs] of Object.entries(THERMOMECH_PARAMS)) {
    const b = raw[block];
    if (!isMapping(b)) continue;
    for (const [name, spec] of Object.entries(specs)) {
      if (b[name] === undefined) continue;
      const r = readValue(report, `/${block}/${name}`, b[name], spec);
      if (r) params.set(`${block}.${name}`, { name: `${block}.${name}`, ...r, unit: spec.unit, origin: { type: 'handbook', pos: report.pos(`/${block}/${name}`) } });
    }
  }
  const waferOrientation = isMapping(raw.wafer) && (raw.wafer.orientation === '001' || raw.wafer.orientation === '111') ? raw.wafer.orientation : undefined;
  const drying = isMapping(raw.drying) ? readDrying(report, raw.drying, kindKnown ? kind : undefined, params, materials) : undefined;
  const etch = isMapping(raw.etch) ? readEtch(report, raw.etch, kindKnown ? kind : undefined, params) : undefined;
  const deposition = Array.isArray(raw.deposition) ? readDeposition(report, raw.deposition, kindKnown ? kind : undefined, params) : undefined;
  let fill: FillShape | undefined;
  if (isMapping(raw.fill) && typeof raw.fill.method === 'string') {
    if (kindKnown && !isOpening(kind)) report.add('unknown-field', '/fill', { expected: `a fill block only on openings (hole, trench, via), not on a ${kind}` }, 'key');
    else {
      for (const [name, spec] of Object.entries(FILL_PARAMS)) {
        if (raw.fill[name] === undefined) continue;
        const r = readValue(report, `/fill/${name}`, raw.fill[name], spec);
        if (r) params.set(`fill.${name}`, { name: `fill.${name}`, ...r, unit: spec.unit, origin: { type: 'handbook', pos: report.pos(`/fill/${name}`) } });
      }
      fill = { method: raw.fill.method as FillShape['method'] };
    }
  }

  checkRelations(report, params, structureRelations(drying?.supportCount ?? 0));

  if (!schemaOk) return null;
  return {
    id,
    title: String(raw.title),
    kind,
    ...(drying ? { drying } : {}),
    ...(etch ? { etch } : {}),
    ...(deposition ? { deposition } : {}),
    ...(fill ? { fill } : {}),
    ...(cell ? { cell } : {}),
    ...(via ? { via } : {}),
    ...(isolation ? { isolation } : {}),
    ...(waferOrientation ? { waferOrientation } : {}),
    ...(array ? { array } : {}),
    tags: (raw.tags as string[] | undefined) ?? [],
    ...(typeof raw.description === 'string' ? { description: raw.description } : {}),
    params,
    materialRoles,
    file: src.file,
    pos: report.pos(''),
  };
}

interface LocatedRule {
  rule: Rule;
  /** Pointer to the rule's id within its file. */
  idPointer: string;
}

/** The `drying:` block: liquid (with its surface tension), contact angle and support heights. */
function readDrying(
  report: FileReport,
  d: Record<string, unknown>,
  kind: Kind | undefined,
  params: Map<string, Param>,
  materials: Map<string, Material>,
): DryingShape | undefined {
  if (kind && isOpening(kind)) {
    report.add('unknown-field', '/drying', { expected: `a drying block only on standing kinds (pillar, cylinder, line), not on a ${kind}` }, 'key');
    return undefined;
  }
  if (typeof d.liquid !== 'string') return undefined; // reported by the schema
  const liquid = d.liquid;
  const handbook = (pointer: string) => ({ type: 'handbook' as const, pos: report.pos(pointer) });
  if (liquid === 'none') {
    if (d.surface_tension !== undefined) {
      report.add('bad-value', '/drying/surface_tension', { expected: 'no surface tension with liquid: none (drying without a liquid–vapour interface)', found: `"${String(d.surface_tension)}"` }, 'key');
      return undefined;
    }
    params.set('drying.surface_tension', { name: 'drying.surface_tension', value: 0, unit: 'N/m', written: 'none (no liquid–vapour interface)', origin: handbook('/drying/liquid') });
  } else {
    const m = materials.get(liquid);
    const gamma = m?.properties.surface_tension;
    if (!m) reportUnknownMaterial(report, '/drying/liquid', liquid, new Map([...materials].filter(([, x]) => x.properties.surface_tension)));
    else if (!gamma && d.surface_tension === undefined) report.add('bad-value', '/drying/liquid', { expected: 'a liquid with a surface tension (such as water or isopropanol), or none', found: `"${liquid}"` });
    else if (gamma) {
      params.set('drying.surface_tension', materialParam('drying.surface_tension', liquid, gamma, report.pos('/drying/liquid')));
    }
  }
  for (const [name, spec] of Object.entries(DRYING_PARAMS)) {
    if (d[name] === undefined) continue;
    const r = readValue(report, `/drying/${name}`, d[name], spec);
    if (r) params.set(`drying.${name}`, { name: `drying.${name}`, ...r, unit: spec.unit, origin: handbook(`/drying/${name}`) });
  }
  const supports = Array.isArray(d.supports) ? d.supports : [];
  supports.forEach((raw, i) => {
    const pointer = `/drying/supports/${i}`;
    const r = readValue(report, pointer, raw, SUPPORT_SPEC);
    if (!r) return;
    params.set(`drying.support_${i + 1}`, { name: `drying.support_${i + 1}`, ...r, unit: 'm', origin: handbook(pointer) });
  });
  return { liquid, supportCount: supports.length, supportHold: d.supports_hold === 'clamped' ? 'clamped' : 'pinned' };
}

/** The `etch:` block: recipe numbers and optional calibration points. */
function readEtch(report: FileReport, e: Record<string, unknown>, kind: Kind | undefined, params: Map<string, Param>): EtchShape | undefined {
  if (kind && !isOpening(kind)) {
    report.add('unknown-field', '/etch', { expected: `an etch block only on openings (hole, trench, via), not on a ${kind}` }, 'key');
    return undefined;
  }
  const handbook = (pointer: string) => ({ type: 'handbook' as const, pos: report.pos(pointer) });
  for (const [name, spec] of Object.entries(ETCH_PARAMS)) {
    if (e[name] === undefined) continue;
    const r = readValue(report, `/etch/${name}`, e[name], spec);
    if (r) params.set(`etch.${name}`, { name: `etch.${name}`, ...r, unit: spec.unit, origin: handbook(`/etch/${name}`) });
  }
  if (e.mask_thickness === undefined) {
    // The format makes the mask optional: none in the conductance path unless written.
    params.set('etch.mask_thickness', { name: 'etch.mask_thickness', value: 0, unit: 'm', written: '0 (no mask written)', origin: handbook('/etch') });
  }
  const points = Array.isArray(e.calibration) ? e.calibration : [];
  points.forEach((point, i) => {
    if (!isMapping(point)) return;
    for (const [name, spec] of Object.entries(CALIBRATION_SPECS)) {
      if (point[name] === undefined) continue;
      const pointer = `/etch/calibration/${i}/${name}`;
      const r = readValue(report, pointer, point[name], spec);
      if (r) params.set(`etch.calibration_${i + 1}_${name}`, { name: `etch.calibration_${i + 1}_${name}`, ...r, unit: spec.unit, origin: handbook(pointer) });
    }
  });
  let ion: EtchShape['ion'];
  if (isMapping(e.ion)) {
    for (const [name, spec] of Object.entries(ION_PARAMS)) {
      if (e.ion[name] === undefined) continue;
      const pointer = `/etch/ion/${name}`;
      const r = readValue(report, pointer, e.ion[name], spec);
      if (r) params.set(`etch.ion_${name}`, { name: `etch.ion_${name}`, ...r, unit: spec.unit, origin: handbook(pointer) });
    }
    ion = { spread: e.ion.angular_spread !== undefined };
  }
  return { calibrationPoints: points.length, ...(ion ? { ion } : {}) };
}

/** The `deposition:` list: film steps with their method and recipe numbers. */
function readDeposition(report: FileReport, steps: unknown[], kind: Kind | undefined, params: Map<string, Param>): DepositionShape | undefined {
  if (kind && !isOpening(kind) && kind !== 'cylinder') {
    report.add('unknown-field', '/deposition', { expected: `a deposition list only on openings and hollow cylinders, not on a ${kind}` }, 'key');
    return undefined;
  }
  const films: DepositionShape['films'] = [];
  const seen = new Set<string>();
  steps.forEach((step, i) => {
    if (!isMapping(step) || typeof step.film !== 'string' || typeof step.method !== 'string') return; // reported by the schema
    if (seen.has(step.film)) {
      report.add('duplicate-id', `/deposition/${i}/film`, { found: step.film });
      return;
    }
    seen.add(step.film);
    for (const [name, spec] of Object.entries(DEPOSITION_PARAMS)) {
      if (step[name] === undefined) continue;
      const pointer = `/deposition/${i}/${name}`;
      const r = readValue(report, pointer, step[name], spec);
      if (r) params.set(`deposition.${step.film}.${name}`, { name: `deposition.${step.film}.${name}`, ...r, unit: spec.unit, origin: { type: 'handbook', pos: report.pos(pointer) } });
    }
    films.push({ film: step.film, method: step.method as DepositionShape['films'][number]['method'] });
  });
  return { films };
}

/** The `cell:` block: dielectric (a material, with inline overrides), electrode surfaces, circuit numbers. */
function readCell(report: FileReport, c: Record<string, unknown>, kind: Kind | undefined, params: Map<string, Param>, materials: Map<string, Material>): CellShape | undefined {
  if (kind && kind !== 'cylinder') {
    report.add('unknown-field', '/cell', { expected: `a cell block only on a hollow cylinder (the storage electrode), not on a ${kind}` }, 'key');
    return undefined;
  }
  const handbook = (pointer: string) => ({ type: 'handbook' as const, pos: report.pos(pointer) });
  for (const [name, spec] of Object.entries(CELL_PARAMS)) {
    if (c[name] === undefined) continue;
    const r = readValue(report, `/cell/${name}`, c[name], spec);
    if (r) params.set(`cell.${name}`, { name: `cell.${name}`, ...r, unit: spec.unit, origin: handbook(`/cell/${name}`) });
  }
  if (isMapping(c.dielectric)) {
    const d = c.dielectric;
    if (typeof d.material === 'string') {
      const m = materials.get(d.material);
      if (!m) reportUnknownMaterial(report, '/cell/dielectric/material', d.material, materials);
      else if (m.properties.dielectric_constant) {
        params.set('cell.dielectric_dielectric_constant', materialParam('cell.dielectric_dielectric_constant', d.material, m.properties.dielectric_constant, report.pos('/cell/dielectric/material')));
      }
    }
    for (const [name, spec] of Object.entries(CELL_DIELECTRIC_PARAMS)) {
      if (d[name] === undefined) continue;
      const pointer = `/cell/dielectric/${name}`;
      const r = readValue(report, pointer, d[name], spec);
      if (r) params.set(`cell.dielectric_${name}`, { name: `cell.dielectric_${name}`, ...r, unit: spec.unit, origin: handbook(pointer) });
    }
  }
  const surfaces = Array.isArray(c.electrode_surfaces) ? (c.electrode_surfaces.filter((x) => typeof x === 'string') as ElectrodeSurface[]) : [];
  return { surfaces };
}

/** The `via:` block: conductor and liner materials, with inline overrides. */
function readVia(report: FileReport, v: Record<string, unknown>, kind: Kind | undefined, params: Map<string, Param>, materials: Map<string, Material>): true | undefined {
  if (kind && kind !== 'via') {
    report.add('unknown-field', '/via', { expected: `a via block only on a via, not on a ${kind}` }, 'key');
    return undefined;
  }
  const fromMaterial = (pointer: string, id: unknown, prop: string, name: string) => {
    if (typeof id !== 'string') return;
    const m = materials.get(id);
    if (!m) return reportUnknownMaterial(report, pointer, id, materials);
    const p = m.properties[prop];
    if (p) params.set(name, materialParam(name, id, p, report.pos(pointer)));
  };
  const inline = (pointer: string, raw: unknown, name: string) => {
    if (raw === undefined) return;
    const spec = VIA_PARAMS[name.slice('via.'.length)]!;
    const r = readValue(report, pointer, raw, spec);
    if (r) params.set(name, { name, ...r, unit: spec.unit, origin: { type: 'handbook', pos: report.pos(pointer) } });
  };
  if (isMapping(v.conductor)) {
    fromMaterial('/via/conductor/material', v.conductor.material, 'resistivity', 'via.conductor_resistivity');
    inline('/via/conductor/resistivity', v.conductor.resistivity, 'via.conductor_resistivity');
    for (const prop of Object.keys(VIA_CONDUCTOR_MECH)) {
      fromMaterial('/via/conductor/material', v.conductor.material, prop, `via.conductor_${prop}`);
      const w = writtenProperty(v.conductor, prop, { report, base: '/via/conductor' });
      if (!w) continue;
      const spec = VIA_CONDUCTOR_MECH[prop]!;
      const pointer = `/via/conductor/${w.key}`;
      const r = readValue(report, pointer, w.raw, spec);
      if (r) params.set(`via.conductor_${prop}`, { name: `via.conductor_${prop}`, ...r, unit: spec.unit, origin: { type: 'handbook', pos: report.pos(pointer) } });
    }
  }
  if (isMapping(v.liner)) {
    fromMaterial('/via/liner/material', v.liner.material, 'dielectric_constant', 'via.liner_dielectric_constant');
    inline('/via/liner/thickness', v.liner.thickness, 'via.liner_thickness');
    inline('/via/liner/dielectric_constant', v.liner.dielectric_constant, 'via.liner_dielectric_constant');
  }
  return true;
}

function rulesFromFile(loaded: Loaded): LocatedRule[] {
  const { src, report } = loaded;
  const v = getValidators().rule;
  if (!v(src.value)) {
    reportSchemaErrors(v.errors ?? [], report, (ptr) =>
      /applies_to$/.test(ptr) ? ['kinds', 'tags', 'structures'] : ['id', 'title', 'applies_to', 'quantity', 'film', 'at_least', 'at_most', 'evaluate_at', 'severity', 'rationale', 'references'],
    );
  }
  // Each rule of a list is checked further on its own, so one bad rule does not hide the others.
  const isList = Array.isArray(src.value);
  const list = isList ? (src.value as unknown[]) : [src.value];
  const valid = (x: unknown, i: number): x is Record<string, unknown> =>
    !(v.errors ?? []).some((e) => (isList ? e.instancePath === `/${i}` || e.instancePath.startsWith(`/${i}/`) : true)) && isMapping(x);
  const rules: LocatedRule[] = [];
  list.forEach((raw, i) => {
    if (!valid(raw, i)) return;
    const base = isList ? `/${i}` : '';
    const quantityName = String(raw.quantity);
    const q = QUANTITIES.get(quantityName);
    if (!q) {
      const names = [...QUANTITIES.keys()];
      const near = suggest(quantityName, names);
      report.add('unknown-quantity', `${base}/quantity`, { found: quantityName, suggestions: near.length ? near : [closest(quantityName, names)] });
    }
    const hasLeast = raw.at_least !== undefined;
    const hasMost = raw.at_most !== undefined;
    if (hasLeast === hasMost) {
      if (hasLeast) report.add('bad-value', `${base}/at_most`, { expected: 'either at_least or at_most, not both', found: 'both' }, 'key');
      else report.addAt('missing-field', base, `${base}/at_least`, { expected: 'a limit: at_least or at_most' });
      return;
    }
    const comparison = hasLeast ? 'at_least' : 'at_most';
    const limitRaw = raw[comparison];
    let limit: number | null = null;
    if (q) {
      const r = readValue(report, `${base}/${comparison}`, limitRaw, { unit: q.unit, description: q.title });
      if (r && !Number.isFinite(r.value)) report.add('bad-value', `${base}/${comparison}`, { expected: 'a finite limit', found: `"${String(limitRaw)}"` });
      else if (r) {
        if (r.low !== undefined) report.add('malformed-tolerance', `${base}/${comparison}`, { expected: 'a limit without tolerance', found: `"${String(limitRaw)}"` });
        else limit = r.value;
      }
    }
    if (!q || limit === null) return;
    const at = (raw.applies_to ?? {}) as Record<string, unknown>;
    rules.push({ idPointer: `${base}/id`, rule: {
      id: String(raw.id),
      title: String(raw.title),
      appliesTo: {
        ...(at.kinds ? { kinds: at.kinds as Kind[] } : {}),
        ...(at.tags ? { tags: at.tags as string[] } : {}),
        ...(at.structures ? { structures: at.structures as string[] } : {}),
      },
      quantity: quantityName,
      ...(typeof raw.film === 'string' ? { film: raw.film } : {}),
      comparison,
      limit,
      limitWritten: String(limitRaw),
      evaluateAt: (raw.evaluate_at as Rule['evaluateAt']) ?? 'nominal',
      severity: (raw.severity as Rule['severity']) ?? 'blocking',
      rationale: typeof raw.rationale === 'string' ? raw.rationale : '',
      references: (raw.references as string[] | undefined) ?? [],
      file: src.file,
      pos: report.pos(base),
    } });
  });
  return rules;
}

/** One waiver as written, with what the schema already said about its fields. */
interface WaiverEntry {
  raw: Record<string, unknown>;
  /** Pointer of the waiver in its file ('' for a file of one waiver, `/2` for the third of a list). */
  base: string;
  report: FileReport;
  /** The schema reported a problem at this pointer or inside it: it is not judged again. */
  flagged: (pointer: string) => boolean;
}

/**
 * The waivers of one file (one waiver, or a list), checked against the schema. Their references
 * (the rule, the structures) and the values that need the rule (still_within) are checked once
 * every rule and structure is read, by `waiverFrom`.
 */
function waiverEntries(loaded: Loaded): WaiverEntry[] {
  const { src, report } = loaded;
  const isList = Array.isArray(src.value);
  const list = isList ? (src.value as unknown[]) : [src.value];
  // A YAML 1.1 reader gives an unquoted date as a Date (the handbook's reader, js-yaml 5's core
  // schema, keeps it as text): the date it stands for is checked as if written so, and a Date with a
  // time of day is checked as the ISO text it is (and refused: a waiver ends on a day).
  for (const item of list) {
    if (isMapping(item) && item.expires instanceof Date) item.expires = calendarDateOf(item.expires) ?? item.expires.toISOString();
  }
  const v = getValidators().waiver;
  if (!v(src.value)) {
    reportSchemaErrors(v.errors ?? [], report, (ptr) => (/applies_to$/.test(ptr) ? ['kinds', 'tags', 'structures'] : /still_within$/.test(ptr) ? ['at_least', 'at_most'] : [...WAIVER_FIELDS]));
  }
  const errors = (v.errors ?? []).map((e) => e.instancePath);
  const flagged = (pointer: string) => errors.some((e) => e === pointer || e.startsWith(`${pointer}/`));
  return list.flatMap((raw, i) => (isMapping(raw) ? [{ raw, base: isList ? `/${i}` : '', report, flagged }] : []));
}

/** The rules of the handbook by id, and what is known about rules that failed to load. */
interface RulesRead {
  byId: Map<string, Rule>;
  ids: string[];
}

/**
 * A waiver with its references checked: its rule and structures exist, its date is a day of the
 * calendar, its still_within is the rule's comparison at or beyond the rule's limit. Every problem
 * of the entry is reported; the waiver comes back only when it has none.
 */
function waiverFrom(entry: WaiverEntry, rules: RulesRead, structureIds: string[]): Waiver | null {
  const { raw, base, report, flagged } = entry;
  const at = (field: string) => `${base}/${field}`;
  const errorsBefore = report.errorCount;
  // Anything the schema said about this waiver (for a file of one waiver, about the file).
  const schemaFound = flagged(base);

  // The rule it waives.
  let rule: Rule | undefined;
  if (typeof raw.rule === 'string' && !flagged(at('rule'))) {
    rule = rules.byId.get(raw.rule);
    if (!rule) {
      const sameLetters = rules.ids.filter((id) => id.toLowerCase() === String(raw.rule).toLowerCase());
      const near = sameLetters.length ? sameLetters : suggest(raw.rule, rules.ids);
      report.add('unknown-rule', at('rule'), { found: raw.rule, suggestions: near, refersTo: { kind: 'rule', id: raw.rule } });
    }
  }

  // Which structures: a list of ids, or a selector; exactly one of the two.
  const hasList = raw.structures !== undefined;
  const hasSelector = raw.applies_to !== undefined;
  if (hasList && hasSelector) report.add('bad-value', at('applies_to'), { expected: 'either structures (a list of ids) or applies_to (a selector), not both', found: 'both' }, 'key');
  else if (!hasList && !hasSelector) report.addAt('missing-field', base, at('structures'), { expected: 'the structures it waives the rule for: structures (a list of ids) or applies_to (a selector, as a rule has)' });
  const named = (list: unknown, pointer: string) => {
    if (!Array.isArray(list) || flagged(pointer)) return;
    list.forEach((sid, i) => {
      if (typeof sid === 'string' && !structureIds.includes(sid)) {
        report.add('bad-value', `${pointer}/${i}`, { expected: 'the id of a structure in this handbook', found: `"${sid}"`, suggestions: suggest(sid, structureIds), refersTo: { kind: 'structure', id: sid } });
      }
    });
  };
  named(raw.structures, at('structures'));
  if (isMapping(raw.applies_to)) named(raw.applies_to.structures, `${at('applies_to')}/structures`);

  // Names and reason: text that says something (the schema refuses an empty one).
  for (const field of ['reason', 'owner', 'approved_by'] as const) {
    const value = raw[field];
    if (typeof value === 'string' && value.trim() === '' && !flagged(at(field))) report.add('bad-value', at(field), { expected: field === 'reason' ? 'a reason in words' : 'a name', found: jsonType(value) });
  }

  // The last day it holds: a day the calendar has (the schema checked the YYYY-MM-DD form).
  let expires: string | undefined;
  if (typeof raw.expires === 'string' && !flagged(at('expires'))) {
    const d = readCalendarDate(raw.expires);
    if ('date' in d) expires = d.date;
    else {
      const expected =
        d.problem === 'format' ? DATE_EXPECTED : d.days === undefined ? 'a month from 01 to 12' : `a day of the month from 01 to ${d.days} (${MONTHS[d.month - 1]} ${d.year} has ${d.days} days)`;
      report.add('bad-date', at('expires'), { expected, found: `"${raw.expires}"` });
    }
  }

  // still_within: the rule's comparison, a value of the rule's quantity, no stricter than its limit.
  let stillWithin: Waiver['stillWithin'];
  const sw = raw.still_within;
  if (isMapping(sw)) {
    const swAt = at('still_within');
    const hasLeast = sw.at_least !== undefined;
    const hasMost = sw.at_most !== undefined;
    if (hasLeast && hasMost) report.add('bad-value', `${swAt}/at_most`, { expected: 'either at_least or at_most, not both', found: 'both' }, 'key');
    else if (!hasLeast && !hasMost) report.addAt('missing-field', swAt, `${swAt}/at_least`, { expected: "a limit: at_least or at_most, as the rule's" });
    else if (rule) {
      const comparison = hasLeast ? 'at_least' : 'at_most';
      const pointer = `${swAt}/${comparison}`;
      const written = sw[comparison];
      if (comparison !== rule.comparison) {
        report.add('bad-value', pointer, { expected: `${rule.comparison}, the comparison of ${rule.id} (it requires ${rule.comparison} ${rule.limitWritten})`, found: comparison }, 'key');
      } else if (!flagged(pointer)) {
        const q = QUANTITIES.get(rule.quantity)!;
        const r = readValue(report, pointer, written, { unit: q.unit, description: q.title });
        if (r && !Number.isFinite(r.value)) report.add('bad-value', pointer, { expected: 'a finite limit', found: `"${String(written)}"` });
        else if (r && r.low !== undefined) report.add('malformed-tolerance', pointer, { expected: 'a limit without tolerance', found: `"${String(written)}"` });
        else if (r) {
          // The same slack the checker gives a value at a limit: a floor written equal to the rule's
          // limit in another unit (1000 nm for 1 um) is not stricter by rounding.
          const slack = 1e-12 * Math.abs(rule.limit);
          const stricter = comparison === 'at_least' ? r.value > rule.limit + slack : r.value < rule.limit - slack;
          if (stricter) {
            const limitText = `${comparison === 'at_least' ? '≥' : '≤'} ${formatValue(rule.limit, q.unit)}`;
            report.add('floor-stricter-than-rule', pointer, { expected: `a limit ${comparison === 'at_least' ? 'at or below' : 'at or above'} the limit of ${rule.id} (${limitText})`, found: `"${String(written)}"` });
          } else stillWithin = { comparison, limit: r.value, written: String(written) };
        }
      }
    }
  }

  if (schemaFound || report.errorCount > errorsBefore || !rule || expires === undefined) return null;
  const selector: Selector = hasList
    ? { structures: raw.structures as string[] }
    : (() => {
        const a = raw.applies_to as Record<string, unknown>;
        return {
          ...(a.kinds ? { kinds: a.kinds as Kind[] } : {}),
          ...(a.tags ? { tags: a.tags as string[] } : {}),
          ...(a.structures ? { structures: a.structures as string[] } : {}),
        };
      })();
  return {
    id: String(raw.id),
    rule: rule.id,
    appliesTo: selector,
    selectedBy: hasList ? 'structures' : 'applies_to',
    reason: String(raw.reason),
    owner: String(raw.owner),
    approvedBy: String(raw.approved_by),
    expires,
    ...(stillWithin ? { stillWithin } : {}),
    file: report.src.file,
    pos: report.pos(base),
  };
}

/** The ids a rule file writes, read from its raw value (for references to rules that failed to load). */
function writtenRuleIds(raw: unknown): string[] {
  const list = Array.isArray(raw) ? raw : [raw];
  return list.flatMap((r) => (isMapping(r) && typeof r.id === 'string' ? [r.id] : []));
}

function loadMeta(source: HandbookSource, out: Diagnostic[]): HandbookMeta {
  const path = 'handbook.yaml';
  const fallback = { title: baseName(source.root.replace(/[\\/]+$/, '')) || 'handbook' };
  if (source.kindOf(path) === 'missing') return fallback;
  const loaded = readAndParse(source, path, out);
  if (!loaded) return fallback;
  const v = getValidators().handbook;
  if (!v(loaded.src.value)) {
    reportSchemaErrors(v.errors ?? [], loaded.report, (p) => (p.startsWith('/links') ? ['report', 'commit'] : ['title', 'organisation', 'summary', 'links']));
    return fallback;
  }
  return loaded.src.value as HandbookMeta;
}

interface IdPlace {
  id: string;
  at: SourcePos;
  field: string;
}

function checkDuplicates(items: IdPlace[], out: Diagnostic[]): void {
  const first = new Map<string, SourcePos>();
  for (const { id, at, field } of items) {
    const prior = first.get(id);
    if (prior) {
      out.push({ code: 'duplicate-id', file: at.file, line: at.line, column: at.column, field, found: id, other: { file: prior.file, line: prior.line, column: prior.column } });
    } else first.set(id, at);
  }
}

/** Items that were written but did not load; references to them are consequences, not causes. */
interface Broken {
  structures: Set<string>;
  materials: Set<string>;
  films: Set<string>;
  rules: Set<string>;
  /** A file that could not be parsed at all may have defined anything of this kind. */
  anyStructure: boolean;
  anyMaterial: boolean;
  anyRule: boolean;
}

/** What is broken once the materials are read: when materials.yaml has problems, its ids that did
 * not load are broken for their users. */
function brokenAfterMaterials(m: MaterialsLoaded, out: Diagnostic[]): Broken {
  const failed = out.some((d) => d.file === 'materials.yaml' && !isWarning(d));
  return { structures: new Set(), materials: new Set(failed ? m.written : []), films: new Set(), rules: new Set(), anyStructure: false, anyMaterial: m.unreadable, anyRule: false };
}

function isConsequence(d: Diagnostic, broken: Broken): boolean {
  const r = d.refersTo;
  if (!r) return false;
  if (r.kind === 'material') return broken.anyMaterial || broken.materials.has(r.id);
  if (r.kind === 'structure') return broken.anyStructure || broken.structures.has(r.id);
  if (r.kind === 'rule') return broken.anyRule || broken.rules.has(r.id);
  return broken.anyStructure || broken.films.has(r.id);
}

/** Diagnostics in a stable order, references to broken items dropped: the causes remain. */
function finish(out: Diagnostic[], broken: Broken): Diagnostic[] {
  return sortDiagnostics(out.filter((d) => !isConsequence(d, broken)));
}

/** What a structure file says it defines, read from its raw value even when it fails to load. */
function writtenDefinitions(raw: unknown, path: string): { id: string; stem: string; films: string[] } {
  const stem = stemOf(path);
  if (!isMapping(raw)) return { id: stem, stem, films: [] };
  const films = Array.isArray(raw.deposition) ? raw.deposition.flatMap((s) => (isMapping(s) && typeof s.film === 'string' ? [s.film] : [])) : [];
  return { id: typeof raw.id === 'string' ? raw.id : stem, stem, films };
}

/**
 * Load and validate a handbook from its source. Never throws for a bad handbook: every problem of
 * the run comes back as a diagnostic, warnings (files left out) with them.
 */
export function loadHandbook(source: HandbookSource): LoadResult {
  const result = loadFrom(source);
  // Files of a revision are named with it (`abc1234:structures/x.yaml:3:7`): the same path in the
  // working tree may say something else.
  if (source.label) {
    const list = result.ok ? result.handbook.warnings : result.diagnostics;
    for (const d of list) d.revision = source.label;
  }
  return result;
}

function loadFrom(source: HandbookSource): LoadResult {
  const out: Diagnostic[] = [];
  const structureFiles = discover(source, 'structures', out);
  const ruleFiles = discover(source, 'rules', out);
  const waiverFiles = discover(source, 'waivers', out);
  // No handbook at all: nothing of ours here. (A handbook.yaml alone is a handbook still empty, or
  // one whose own problems are worth reporting.)
  if (structureFiles.length === 0 && ruleFiles.length === 0 && !out.some((d) => !isWarning(d)) && source.kindOf('handbook.yaml') === 'missing') {
    return { ok: false, diagnostics: [{ code: 'no-handbook', file: source.root, line: 1, column: 1, field: '', expected: 'a folder with structures/ and rules/ holding YAML files' }, ...out] };
  }
  misnamedTopLevel(source, out);
  const meta = loadMeta(source, out);
  const read = loadMaterials(source, out);
  const { materials } = read;
  const broken = brokenAfterMaterials(read, out);
  // A structures/ (rules/) that is not a folder may have defined any structure (rule) a rule (waiver) names.
  broken.anyStructure = out.some((d) => d.code === 'not-a-folder' && d.file === 'structures');
  broken.anyRule = out.some((d) => d.code === 'not-a-folder' && d.file === 'rules');
  const structures: Structure[] = [];
  const structureIds: IdPlace[] = [];
  const allFilms = new Set<string>();
  for (const path of structureFiles) {
    const loaded = readAndParse(source, path, out);
    if (!loaded) {
      broken.anyStructure = true;
      continue;
    }
    const written = writtenDefinitions(loaded.src.value, path);
    written.films.forEach((f) => allFilms.add(f));
    const s = structureFromFile(loaded, materials);
    if (s) {
      structures.push(s);
      structureIds.push({ id: s.id, at: loaded.report.pos('/id'), field: 'id' });
    }
    if (!s || loaded.report.failed) {
      // A structure file with a problem: a rule may name it by the id written or by the file's
      // name (which the id must equal); either reference is a consequence of that problem.
      broken.structures.add(written.id);
      broken.structures.add(written.stem);
      written.films.forEach((f) => broken.films.add(f));
    }
  }
  const rules: Rule[] = [];
  const ruleIds: IdPlace[] = [];
  const ruleSources: Array<{ rule: Rule; report: FileReport; pointer: string }> = [];
  for (const path of ruleFiles) {
    const loaded = readAndParse(source, path, out);
    if (!loaded) {
      broken.anyRule = true;
      continue;
    }
    const fromFile = rulesFromFile(loaded);
    for (const { rule, idPointer } of fromFile) {
      rules.push(rule);
      ruleIds.push({ id: rule.id, at: loaded.report.pos(idPointer), field: pointerToField(idPointer) });
      ruleSources.push({ rule, report: loaded.report, pointer: idPointer.slice(0, -'/id'.length) });
    }
    // A rule written here that did not load: a waiver naming it is a consequence of its problem.
    const loadedIds = new Set(fromFile.map((r) => r.rule.id));
    for (const id of writtenRuleIds(loaded.src.value)) if (!loadedIds.has(id)) broken.rules.add(id);
  }
  checkDuplicates(structureIds, out);
  checkDuplicates(ruleIds, out);
  // Rules that name structures or film steps must name real ones.
  const ids = structures.map((s) => s.id);
  const filmNames = [...allFilms].sort(byCodePoint);
  for (const { rule, report, pointer } of ruleSources) {
    if (rule.film !== undefined) {
      const def = QUANTITIES.get(rule.quantity);
      if (!def?.steps) report.add('bad-value', `${pointer}/film`, { expected: `no film: ${rule.quantity} is not a quantity of one film step`, found: `"${rule.film}"` }, 'key');
      else if (!filmNames.includes(rule.film)) {
        report.add('bad-value', `${pointer}/film`, { expected: `the film name of a deposition step in this handbook${filmNames.length ? ` (${filmNames.join(', ')})` : ''}`, found: `"${rule.film}"`, suggestions: suggest(rule.film, filmNames), refersTo: { kind: 'film', id: rule.film } });
      }
    }
    (rule.appliesTo.structures ?? []).forEach((sid, i) => {
      if (!ids.includes(sid)) {
        report.add('bad-value', `${pointer}/applies_to/structures/${i}`, { expected: 'the id of a structure in this handbook', found: `"${sid}"`, suggestions: suggest(sid, ids), refersTo: { kind: 'structure', id: sid } });
      }
    });
  }
  // Waivers name rules and structures, so they are read last.
  const waivers: Waiver[] = [];
  const waiverIds: IdPlace[] = [];
  const rulesRead: RulesRead = { byId: new Map(rules.map((r) => [r.id, r])), ids: rules.map((r) => r.id).sort(byCodePoint) };
  for (const path of waiverFiles) {
    const loaded = readAndParse(source, path, out);
    if (!loaded) continue;
    for (const entry of waiverEntries(loaded)) {
      const idPointer = `${entry.base}/id`;
      if (typeof entry.raw.id === 'string' && !entry.flagged(idPointer)) waiverIds.push({ id: entry.raw.id, at: loaded.report.pos(idPointer), field: pointerToField(idPointer) });
      const w = waiverFrom(entry, rulesRead, ids);
      if (w) waivers.push(w);
    }
  }
  checkDuplicates(waiverIds, out);
  const diagnostics = finish(out, broken);
  if (diagnostics.some((d) => !isWarning(d))) return { ok: false, diagnostics };
  structures.sort((a, b) => byCodePoint(a.id, b.id));
  rules.sort((a, b) => byCodePoint(a.id, b.id));
  waivers.sort((a, b) => byCodePoint(a.id, b.id));
  return { ok: true, handbook: { root: source.root, meta, structures, rules, waivers, materials, warnings: diagnostics } };
}

/** Load one structure file on its own (for `eval FILE`), with the materials of `materialsFrom`. */
export function loadStructure(source: HandbookSource, path: string, materialsFrom: HandbookSource): { ok: true; structure: Structure; warnings: Diagnostic[] } | { ok: false; diagnostics: Diagnostic[] } {
  const out: Diagnostic[] = [];
  const read = loadMaterials(materialsFrom, out);
  const broken = brokenAfterMaterials(read, out);
  const loaded = readAndParse(source, path, out);
  const s = loaded ? structureFromFile(loaded, read.materials) : null;
  const diagnostics = finish(out, broken);
  if (diagnostics.some((d) => !isWarning(d)) || !s) return { ok: false, diagnostics };
  return { ok: true, structure: s, warnings: diagnostics };
}
