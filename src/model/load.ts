// Load a handbook folder: read → parse (YAML with positions) → validate (JSON Schema) → normalize
// (units to SI, materials resolved, cross-references checked). Every problem becomes a diagnostic
// and loading carries on, so one run reports them all.
import { type Diagnostic, byCodePoint, isWarning, sortDiagnostics } from '../diagnostics/diagnostic.ts';
import { discover, misnamedTopLevel } from './loading/discover.ts';
import { FileReport, type IdPlace, checkDuplicates, isMapping, readAndParse, suggest } from './loading/file-report.ts';
import { type MaterialsLoaded, loadMaterials } from './loading/materials.ts';
import { rulesFromFile, writtenRuleIds } from './loading/rules.ts';
import { getValidators, reportSchemaErrors } from './loading/schema-errors.ts';
import { structureFromFile } from './loading/structures.ts';
import { type RulesRead, waiverEntries, waiverFrom } from './loading/waivers.ts';
import { type HandbookSource, baseName, stemOf } from './source.ts';
import type { Handbook, HandbookMeta, QuantityCatalogue, Rule, Structure, Waiver } from './types.ts';
import { pointerToField } from './yaml-source.ts';

/** A handbook (with the warnings of its loading in `handbook.warnings`), or every problem found. */
export type LoadResult = { ok: true; handbook: Handbook } | { ok: false; diagnostics: Diagnostic[] };

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
export function loadHandbookWith(source: HandbookSource, quantities: QuantityCatalogue): LoadResult {
  const result = loadFrom(source, quantities);
  // Files of a revision are named with it (`abc1234:structures/x.yaml:3:7`): the same path in the
  // working tree may say something else.
  if (source.label) {
    const list = result.ok ? result.handbook.warnings : result.diagnostics;
    for (const d of list) d.revision = source.label;
  }
  return result;
}

function loadFrom(source: HandbookSource, quantities: QuantityCatalogue): LoadResult {
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
    const fromFile = rulesFromFile(loaded, quantities);
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
      const def = quantities.get(rule.quantity);
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
      const w = waiverFrom(entry, rulesRead, ids, quantities);
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
