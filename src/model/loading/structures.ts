// A structure file: geometry, materials by role, and the input blocks read into SI inputs and the
// shape facts that decide which formulas apply.
import { CALIBRATION_SPECS, CELL_DIELECTRIC_PARAMS, CELL_PARAMS, DEPOSITION_PARAMS, DRYING_PARAMS, ETCH_PARAMS, FILL_PARAMS, GEOMETRY_BY_KIND, GEOMETRY_PARAMS, ION_PARAMS, ISOLATION_PARAMS, MATERIAL_PROPERTIES, SUPPORT_SPEC, THERMOMECH_PARAMS, VIA_CONDUCTOR_MECH, VIA_PARAMS } from '../parameters.ts';
import { type Relation, checkRelation, describeCorner, structureRelations } from '../relations.ts';
import { stemOf } from '../source.ts';
import { type ArrayLayout, type CellShape, type DepositionShape, type DryingShape, type ElectrodeSurface, type EtchShape, type FillShape, KINDS, type Kind, type Material, type Param, type Structure, isElongated, isOpening } from '../types.ts';
import { FileReport, type Loaded, isMapping, suggest } from './file-report.ts';
import { materialParam, reportUnknownMaterial, writtenProperty } from './materials.ts';
import { getValidators, reportSchemaErrors } from './schema-errors.ts';
import { readValue } from './values.ts';

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

/** The `drying:` block: liquid (with its surface tension), contact angle and support heights. */
export function readDrying(
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
export function readEtch(report: FileReport, e: Record<string, unknown>, kind: Kind | undefined, params: Map<string, Param>): EtchShape | undefined {
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
export function readDeposition(report: FileReport, steps: unknown[], kind: Kind | undefined, params: Map<string, Param>): DepositionShape | undefined {
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
export function readCell(report: FileReport, c: Record<string, unknown>, kind: Kind | undefined, params: Map<string, Param>, materials: Map<string, Material>): CellShape | undefined {
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
export function readVia(report: FileReport, v: Record<string, unknown>, kind: Kind | undefined, params: Map<string, Param>, materials: Map<string, Material>): true | undefined {
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
