// A structure file: geometry, materials by role, and the input blocks read into SI inputs and the
// shape facts that decide which formulas apply.
import { BLOCK_LIST, SHAPE_FACTS, keysOf, type BlockFacts, type InputBlock } from '../blocks.ts';
import { GEOMETRY_BY_KIND, GEOMETRY_PARAMS, MATERIAL_PROPERTIES, PROPERTY_ALIASES, rangeOf, type ParamSpec } from '../parameters.ts';
import { type Relation, checkRelation, describeCorner, structureRelations } from '../relations.ts';
import { stemOf } from '../source.ts';
import { type ArrayLayout, KINDS, type Kind, type Material, type Param, type Structure, isElongated } from '../types.ts';
import { FileReport, type Loaded, isMapping, suggest } from './file-report.ts';
import { materialParam, reportUnknownMaterial, writtenProperty } from './materials.ts';
import { getValidators, reportSchemaErrors } from './schema-errors.ts';
import { readValue } from './values.ts';
import { readVariation } from './variation.ts';

/** Every relation between inputs, at nominal and at every combination of tolerance ends. */
export function checkRelations(report: FileReport, params: ReadonlyMap<string, Param>, relations: Relation[]): void {
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

export function structureFromFile(loaded: Loaded, materials: Map<string, Material>): Structure | null {
  const { src, report } = loaded;
  const v = getValidators().structure;
  const raw = src.value as Record<string, unknown>;
  const schemaOk = v(raw);
  if (!schemaOk) {
    reportSchemaErrors(v.errors ?? [], report, allowedInStructure);
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
    if (r) params.set(`geometry.${name}`, { name: `geometry.${name}`, ...r, unit: spec.unit, ...rangeOf(spec), origin: { type: 'handbook', pos: report.pos(`/geometry/${name}`) } });
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
        if (r) params.set(`materials.${role}.${prop}`, { name: `materials.${role}.${prop}`, ...r, unit: spec.unit, ...rangeOf(spec), origin: { type: 'handbook', pos: report.pos(pointer) } });
      }
    }
    // A material without an isotropic stand-in (a crystal's) is isotropic: isotropic models read its own pair.
    for (const own of ['youngs_modulus', 'poisson_ratio']) {
      const p = params.get(`materials.${role}.${own}`);
      const stand = `materials.${role}.isotropic_${own}`;
      if (p && !params.has(stand)) params.set(stand, { ...p, name: stand });
    }
  }

  const facts = readBlocks(raw, { report, params, materials, kind: kindKnown ? kind : undefined });
  const correlations = readVariation(report, raw.variation, params);
  const processWindow = readProcessWindow(report, raw.process_window, params);

  checkRelations(report, params, structureRelations(facts.drying?.supportCount ?? 0));

  if (!schemaOk) return null;
  return {
    id,
    title: String(raw.title),
    kind,
    ...facts,
    ...(array ? { array } : {}),
    tags: (raw.tags as string[] | undefined) ?? [],
    ...(typeof raw.description === 'string' ? { description: raw.description } : {}),
    params,
    materialRoles,
    correlations,
    ...(processWindow ? { processWindow } : {}),
    file: src.file,
    pos: report.pos(''),
  };
}

/** The two inputs a structure's `process_window:` maps: both its own, and different. */
function readProcessWindow(report: FileReport, raw: unknown, params: ReadonlyMap<string, Param>): [string, string] | undefined {
  if (!isMapping(raw) || !Array.isArray(raw.inputs) || raw.inputs.length !== 2) return undefined; // absent, or reported by the schema
  const [a, b] = raw.inputs.map(String) as [string, string];
  let ok = true;
  [a, b].forEach((name, i) => {
    if (!params.has(name)) {
      report.add('bad-value', `/process_window/inputs/${i}`, { expected: 'an input of this structure', found: `"${name}"`, suggestions: suggest(name, [...params.keys()]) });
      ok = false;
    }
  });
  if (ok && a === b) {
    report.add('bad-value', '/process_window/inputs/1', { expected: 'two different inputs', found: `"${b}" twice` });
    ok = false;
  }
  return ok ? [a, b] : undefined;
}

/** Keys a structure file may write at a place, for the suggestions of an unknown-field problem. */
function allowedInStructure(pointer: string): string[] {
  if (pointer === '') return ['id', 'title', 'kind', 'tags', 'description', 'geometry', ...BLOCK_LIST.map((b) => b.key), 'materials', 'variation', 'process_window'];
  if (pointer === '/process_window') return ['inputs'];
  if (pointer === '/variation') return ['uniform', 'correlated'];
  if (/^\/variation\/correlated\/\d+$/.test(pointer)) return ['inputs', 'coefficient'];
  if (pointer === '/geometry') return [...Object.keys(GEOMETRY_PARAMS), 'array'];
  const [, key, part] = pointer.split('/');
  const block = BLOCK_LIST.find((b) => b.key === key);
  if (!block) return ['material', ...keysOf({ inputs: MATERIAL_PROPERTIES }, PROPERTY_ALIASES)];
  if (part === undefined || (block.form === 'list' && /^\d+$/.test(part))) return keysOf(block, PROPERTY_ALIASES);
  const p = block.parts?.[part];
  return p ? keysOf(p, PROPERTY_ALIASES) : [];
}

interface BlockContext {
  report: FileReport;
  params: Map<string, Param>;
  materials: Map<string, Material>;
  /** The structure's kind, when it is a known one. */
  kind: Kind | undefined;
}

const article = (word: string) => (/^[aeiou]/.test(word) ? 'an' : 'a');

/**
 * Every input block of a structure: its inputs read into `params` (material values first, then
 * what the file writes, then defaults), and the shape facts of the blocks that belong on this kind.
 */
function readBlocks(raw: Record<string, unknown>, ctx: BlockContext): BlockFacts {
  const read = new Map<string, Record<string, unknown>>();
  for (const block of BLOCK_LIST) {
    const b = raw[block.key];
    if (block.form === 'list' ? !Array.isArray(b) : !isMapping(b)) continue; // absent, or reported by the schema
    if (ctx.kind && !block.kinds.includes(ctx.kind)) {
      const what = `${article(block.key)} ${block.key} ${block.form === 'list' ? 'list' : 'block'}`;
      ctx.report.add('unknown-field', `/${block.key}`, { expected: `${what} only on ${block.where}, not on a ${ctx.kind}` }, 'key');
      continue;
    }
    const ok = block.form === 'list' ? readListBlock(block, b as unknown[], ctx) : readMappingBlock(block, b as Record<string, unknown>, ctx);
    if (ok) read.set(block.key, b as Record<string, unknown>);
  }
  const facts: Record<string, unknown> = {};
  for (const [name, fact] of Object.entries(SHAPE_FACTS)) {
    const b = read.get(fact.block);
    const value = b && (fact.read as (raw: Record<string, unknown>) => unknown)(b);
    if (value !== undefined) facts[name] = value;
  }
  return facts as BlockFacts;
}

/** Inputs of one mapping (a block or a part of it): `name(input)` is each one's path. */
function readInputs(ctx: BlockContext, base: string, m: Record<string, unknown>, inputs: Record<string, ParamSpec>, name: (input: string) => string): void {
  for (const [input, spec] of Object.entries(inputs)) {
    const w = writtenProperty(m, input, { report: ctx.report, base });
    const path = name(input);
    if (!w) {
      if (spec.default && !ctx.params.has(path)) ctx.params.set(path, { name: path, value: spec.default.value, unit: spec.unit, ...rangeOf(spec), written: spec.default.written, origin: { type: 'default', pos: ctx.report.pos(base) } });
      continue;
    }
    const pointer = `${base}/${w.key}`;
    const r = readValue(ctx.report, pointer, w.raw, spec);
    if (r) ctx.params.set(path, { name: path, ...r, unit: spec.unit, ...rangeOf(spec), origin: { type: 'handbook', pos: ctx.report.pos(pointer) } });
  }
}

/** The table values of a part's `material` that stand for inputs the part does not write. */
function readMaterial(ctx: BlockContext, base: string, m: Record<string, unknown>, properties: readonly string[], name: (input: string) => string): void {
  if (typeof m.material !== 'string') return; // reported by the schema
  const pointer = `${base}/material`;
  const material = ctx.materials.get(m.material);
  if (!material) return reportUnknownMaterial(ctx.report, pointer, m.material, ctx.materials);
  for (const prop of properties) {
    const mp = material.properties[prop];
    if (mp) ctx.params.set(name(prop), materialParam(name(prop), m.material, mp, ctx.report.pos(pointer)));
  }
}

function readMappingBlock(block: InputBlock, b: Record<string, unknown>, ctx: BlockContext): boolean {
  const base = `/${block.key}`;
  if (block.key === 'drying' && !readLiquid(b, ctx)) return false;
  for (const [partName, part] of Object.entries(block.parts ?? {})) {
    const pb = `${base}/${partName}`;
    const value = b[partName];
    if (part.form === 'mapping') {
      if (!isMapping(value)) continue;
      const name = (input: string) => `${block.key}.${partName}_${input}`;
      if (part.material) readMaterial(ctx, pb, value, part.material, name);
      readInputs(ctx, pb, value, part.inputs, name);
      continue;
    }
    if (!Array.isArray(value)) continue;
    value.forEach((entry, i) => {
      if (part.form === 'values') {
        const [item, spec] = Object.entries(part.inputs)[0]!;
        const pointer = `${pb}/${i}`;
        const r = readValue(ctx.report, pointer, entry, spec);
        if (r) ctx.params.set(`${block.key}.${item}_${i + 1}`, { name: `${block.key}.${item}_${i + 1}`, ...r, unit: spec.unit, ...rangeOf(spec), origin: { type: 'handbook', pos: ctx.report.pos(pointer) } });
      } else if (isMapping(entry)) readInputs(ctx, `${pb}/${i}`, entry, part.inputs, (input) => `${block.key}.${partName}_${i + 1}_${input}`);
    });
  }
  readInputs(ctx, base, b, block.inputs, (input) => `${block.key}.${input}`);
  return true;
}

/** A list block (deposition): each entry names itself, and its inputs are `<block>.<entry>.<name>`. */
function readListBlock(block: InputBlock, entries: unknown[], ctx: BlockContext): boolean {
  const seen = new Set<string>();
  const by = block.entryName!;
  entries.forEach((entry, i) => {
    // An entry without its name or another required word (a method) was reported by the schema.
    if (!isMapping(entry) || Object.keys(block.fields ?? {}).some((f) => (block.required ?? []).includes(f) && typeof entry[f] !== 'string')) return;
    const name = entry[by] as string;
    if (seen.has(name)) return ctx.report.add('duplicate-id', `/${block.key}/${i}/${by}`, { found: name });
    seen.add(name);
    readInputs(ctx, `/${block.key}/${i}`, entry, block.inputs, (input) => `${block.key}.${name}.${input}`);
  });
  return true;
}

/** The rinse liquid: its surface tension from the materials, or none (no liquid–vapour interface). */
function readLiquid(d: Record<string, unknown>, ctx: BlockContext): boolean {
  if (typeof d.liquid !== 'string') return false; // reported by the schema
  const { report, params, materials } = ctx;
  if (d.liquid === 'none') {
    if (d.surface_tension !== undefined) {
      report.add('bad-value', '/drying/surface_tension', { expected: 'no surface tension with liquid: none (drying without a liquid–vapour interface)', found: `"${String(d.surface_tension)}"` }, 'key');
      return false;
    }
    params.set('drying.surface_tension', { name: 'drying.surface_tension', value: 0, unit: 'N/m', written: 'none (no liquid–vapour interface)', origin: { type: 'handbook', pos: report.pos('/drying/liquid') } });
    return true;
  }
  const m = materials.get(d.liquid);
  const gamma = m?.properties.surface_tension;
  if (!m) reportUnknownMaterial(report, '/drying/liquid', d.liquid, new Map([...materials].filter(([, x]) => x.properties.surface_tension)));
  else if (!gamma && d.surface_tension === undefined) report.add('bad-value', '/drying/liquid', { expected: 'a liquid with a surface tension (such as water or isopropanol), or none', found: `"${d.liquid}"` });
  else if (gamma) params.set('drying.surface_tension', materialParam('drying.surface_tension', d.liquid, gamma, report.pos('/drying/liquid')));
  return true;
}
