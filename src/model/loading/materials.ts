// Materials: the built-in table, the handbook's materials.yaml, and the one way a material's
// property becomes a structure's input (with its tolerance and its source).
import type { Diagnostic } from '../../diagnostics/diagnostic.ts';
import { BUILT_IN_MATERIALS } from '../materials-table.ts';
import { MATERIAL_PROPERTIES, PROPERTY_ALIASES, rangeOf } from '../parameters.ts';
import type { HandbookSource } from '../source.ts';
import type { Material, MaterialProperty, Param, SourcePos } from '../types.ts';
import { isUnitProblem, parseValue } from '../units.ts';
import { FileReport, type IdPlace, checkDuplicates, isMapping, readAndParse, suggest } from './file-report.ts';
import { getValidators, reportSchemaErrors } from './schema-errors.ts';
import { readValue } from './values.ts';


/** A material property as written in a block, under its own name or its alias, with the key used. */
export function writtenProperty(block: Record<string, unknown>, prop: string, conflict?: { report: FileReport; base: string }): { key: string; raw: unknown } | undefined {
  const alias = PROPERTY_ALIASES[prop];
  if (alias !== undefined && block[prop] !== undefined && block[alias] !== undefined && conflict) {
    // Both names at once: neither is silently preferred.
    conflict.report.add('bad-value', `${conflict.base}/${alias}`, { expected: `one of ${prop} and ${alias} (the same property under two names), not both`, found: 'both' }, 'key');
    return undefined;
  }
  if (block[prop] !== undefined) return { key: prop, raw: block[prop] };
  return alias !== undefined && block[alias] !== undefined ? { key: alias, raw: block[alias] } : undefined;
}

/** The handbook's materials: the built-in table, then `materials.yaml`. */
export interface MaterialsLoaded {
  materials: Map<string, Material>;
  /** Ids written in materials.yaml, loaded or not: a use of one that failed is a consequence of
   * that failure, not a problem of its own, and is not reported again. */
  written: Set<string>;
  /** materials.yaml could not be parsed at all, so no use of an unknown id can be judged. */
  unreadable: boolean;
}

export function builtInMaterials(): Map<string, Material> {
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

export function loadMaterials(source: HandbookSource, out: Diagnostic[]): MaterialsLoaded {
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
export function materialParam(name: string, materialId: string, mp: MaterialProperty, pos: SourcePos): Param {
  const spec = MATERIAL_PROPERTIES[name.slice(name.lastIndexOf('.') + 1)];
  return {
    name,
    value: mp.value,
    ...(spec ? rangeOf(spec) : {}),
    ...(mp.low !== undefined && mp.high !== undefined ? { low: mp.low, high: mp.high } : {}),
    unit: mp.unit,
    written: mp.written,
    origin: { type: 'material-table', material: materialId, source: mp.source, pos },
  };
}

/** An id that names no material; a consequence (and dropped) when materials.yaml failed on that id. */
export function reportUnknownMaterial(report: FileReport, pointer: string, id: string, materials: ReadonlyMap<string, Material>): void {
  report.add('unknown-material', pointer, { found: id, suggestions: suggest(id, [...materials.keys()]), refersTo: { kind: 'material', id } });
}
