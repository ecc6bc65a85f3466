// A rule file: one rule or a list, each with its quantity, limit and scope.
import { closest } from 'fastest-levenshtein';
import type { Kind, QuantityCatalogue, Rule } from '../types.ts';
import { type Loaded, isMapping, suggest } from './file-report.ts';
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
    const q = quantities.get(quantityName);
    if (!q) {
      const names = [...quantities.keys()];
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

/** The ids a rule file writes, read from its raw value (for references to rules that failed to load). */
export function writtenRuleIds(raw: unknown): string[] {
  const list = Array.isArray(raw) ? raw : [raw];
  return list.flatMap((r) => (isMapping(r) && typeof r.id === 'string' ? [r.id] : []));
}
