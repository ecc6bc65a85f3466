// A rule file: one rule or a list, each with its quantity, limit and scope.
import { closest } from 'fastest-levenshtein';
import type { Kind, QuantityCatalogue, Rule, RuleSide, YieldRequirement } from '../types.ts';
import { type FileReport, type Loaded, isMapping, suggest } from './file-report.ts';
import { getValidators, reportSchemaErrors } from './schema-errors.ts';
import { readValue } from './values.ts';

export interface LocatedRule {
  rule: Rule;
  /** Pointer to the rule's id within its file. */
  idPointer: string;
}

export function rulesFromFile(loaded: Loaded, quantities: QuantityCatalogue): LocatedRule[] {
  const { src, report } = loaded;
  const v = getValidators().rule;
  if (!v(src.value)) {
    reportSchemaErrors(v.errors ?? [], report, (ptr) =>
      /applies_to$/.test(ptr) ? ['kinds', 'tags', 'structures'] : /sampling$/.test(ptr) ? ['confidence', 'max_samples', 'seed'] : ['id', 'title', 'applies_to', 'quantity', 'film', 'at_least', 'at_most', 'map', 'evaluate_at', 'required_yield', 'sampling', 'severity', 'rationale', 'references'],
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
    const q = quantities.get(quantityName);
    if (!q) {
      const names = [...quantities.keys()];
      const near = suggest(quantityName, names);
      report.add('unknown-quantity', `${base}/quantity`, { found: quantityName, suggestions: near.length ? near : [closest(quantityName, names)] });
    }
    const hasLeast = raw.at_least !== undefined;
    const hasMost = raw.at_most !== undefined;
    if (!hasLeast && !hasMost) {
      report.addAt('missing-field', base, `${base}/at_least`, { expected: 'a limit: at_least, at_most, or both (a window)' });
      return;
    }
    // Each side is read on its own, so a bad value on one does not hide a bad value on the other.
    const sides: RuleSide[] = [];
    let sidesOk = true;
    for (const comparison of ['at_least', 'at_most'] as const) {
      const limitRaw = raw[comparison];
      if (limitRaw === undefined || !q) continue;
      const r = readValue(report, `${base}/${comparison}`, limitRaw, { unit: q.unit, description: q.title });
      if (r && !Number.isFinite(r.value)) report.add('bad-value', `${base}/${comparison}`, { expected: 'a finite limit', found: `"${String(limitRaw)}"` });
      else if (r && r.low !== undefined) report.add('malformed-tolerance', `${base}/${comparison}`, { expected: 'a limit without tolerance', found: `"${String(limitRaw)}"` });
      else if (r) {
        sides.push({ comparison, limit: r.value, written: String(limitRaw) });
        continue;
      }
      sidesOk = false;
    }
    if (Array.isArray(raw.map) && raw.map.length === 2 && raw.map[0] === raw.map[1]) report.add('bad-value', `${base}/map/1`, { expected: 'two different inputs', found: `"${String(raw.map[1])}" twice` });
    if (sidesOk && sides.length === 2 && !(sides[0]!.limit < sides[1]!.limit)) {
      report.add('bad-value', `${base}/at_most`, { expected: `an upper limit above the lower one (at_least ${sides[0]!.written}): a window no value can meet passes nothing`, found: `"${sides[1]!.written}"` });
      sidesOk = false;
    }
    const evaluateAt = (raw.evaluate_at as Rule['evaluateAt']) ?? 'nominal';
    const yieldReq = readYield(report, base, raw, evaluateAt);
    if (!q || !sidesOk || yieldReq === null) return;
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
      sides,
      evaluateAt,
      ...(yieldReq ? { yield: yieldReq } : {}),
      ...(Array.isArray(raw.map) && raw.map.length === 2 && raw.map[0] !== raw.map[1] ? { map: [String(raw.map[0]), String(raw.map[1])] as [string, string] } : {}),
      severity: (raw.severity as Rule['severity']) ?? 'blocking',
      rationale: typeof raw.rationale === 'string' ? raw.rationale : '',
      references: (raw.references as string[] | undefined) ?? [],
      file: src.file,
      pos: report.pos(base),
    } });
  });
  return rules;
}

const DEFAULT_CONFIDENCE = 0.95;
const DEFAULT_MAX_SAMPLES = 16384;
const DEFAULT_SEED = 1;

/**
 * The yield requirement of a rule evaluated for yield; undefined for other modes, null when it is
 * missing or wrong (reported). `required_yield` and `sampling` belong to yield rules only.
 */
function readYield(report: FileReport, base: string, raw: Record<string, unknown>, evaluateAt: Rule['evaluateAt']): YieldRequirement | undefined | null {
  if (evaluateAt !== 'yield') {
    for (const key of ['required_yield', 'sampling']) {
      if (raw[key] !== undefined) report.add('unknown-field', `${base}/${key}`, { expected: `${key} only with evaluate_at: yield` }, 'key');
    }
    return undefined;
  }
  if (raw.required_yield === undefined) {
    report.addAt('missing-field', base, `${base}/required_yield`, { expected: 'the fraction that must pass, as 0.997 or "99.7 %"' });
    return null;
  }
  const required = readFraction(report, `${base}/required_yield`, raw.required_yield);
  const s = isMapping(raw.sampling) ? raw.sampling : {};
  const confidence = s.confidence === undefined ? DEFAULT_CONFIDENCE : readFraction(report, `${base}/sampling/confidence`, s.confidence);
  if (required === null || confidence === null) return null;
  return {
    required,
    written: String(raw.required_yield),
    confidence,
    maxSamples: typeof s.max_samples === 'number' ? s.max_samples : DEFAULT_MAX_SAMPLES,
    seed: typeof s.seed === 'number' ? s.seed : DEFAULT_SEED,
  };
}

/** A fraction strictly between 0 and 1, written as a number (0.997) or a percentage ("99.7 %"). */
function readFraction(report: FileReport, pointer: string, raw: unknown): number | null {
  const pct = typeof raw === 'string' ? /^\s*([0-9]*\.?[0-9]+(?:[eE][-+]?[0-9]+)?)\s*%\s*$/.exec(raw) : null;
  const value = typeof raw === 'number' ? raw : pct ? Number(pct[1]) / 100 : NaN;
  if (!(value > 0 && value < 1)) {
    report.add('bad-value', pointer, { expected: 'a fraction between 0 and 1, exclusive: a number (0.997) or a percentage ("99.7 %")', found: `"${String(raw)}"` });
    return null;
  }
  return value;
}

/** The ids a rule file writes, read from its raw value (for references to rules that failed to load). */
export function writtenRuleIds(raw: unknown): string[] {
  const list = Array.isArray(raw) ? raw : [raw];
  return list.flatMap((r) => (isMapping(r) && typeof r.id === 'string' ? [r.id] : []));
}
