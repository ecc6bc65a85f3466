// A waiver file: which failures are accepted, by whom, until when, and within what limit.
import { calendarDateOf, readCalendarDate } from '../calendar.ts';
import { formatValue } from '../format.ts';
import { WAIVER_FIELDS } from '../schema.ts';
import type { Kind, QuantityCatalogue, Rule, Selector, Waiver } from '../types.ts';
import { FileReport, type Loaded, isMapping, jsonType, suggest } from './file-report.ts';
import { DATE_EXPECTED, getValidators, reportSchemaErrors } from './schema-errors.ts';
import { readValue } from './values.ts';

export const MONTHS = ['January', 'February', 'March', 'April', 'May', 'June', 'July', 'August', 'September', 'October', 'November', 'December'];

/** One waiver as written, with what the schema already said about its fields. */
export interface WaiverEntry {
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
export function waiverEntries(loaded: Loaded): WaiverEntry[] {
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
export interface RulesRead {
  byId: Map<string, Rule>;
  ids: string[];
}

/**
 * A waiver with its references checked: its rule and structures exist, its date is a day of the
 * calendar, its still_within is the rule's comparison at or beyond the rule's limit. Every problem
 * of the entry is reported; the waiver comes back only when it has none.
 */
export function waiverFrom(entry: WaiverEntry, rules: RulesRead, structureIds: string[], quantities: QuantityCatalogue): Waiver | null {
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
      const side = rule.sides.find((x) => x.comparison === comparison);
      if (!side) {
        const own = rule.sides.map((x) => `${x.comparison} ${x.written}`).join(' and ');
        report.add('bad-value', pointer, { expected: `${rule.sides.map((x) => x.comparison).join(' or ')}, the comparison of ${rule.id} (it requires ${own})`, found: comparison }, 'key');
      } else if (!flagged(pointer)) {
        const q = quantities.get(rule.quantity)!;
        const r = readValue(report, pointer, written, { unit: q.unit, description: q.title });
        if (r && !Number.isFinite(r.value)) report.add('bad-value', pointer, { expected: 'a finite limit', found: `"${String(written)}"` });
        else if (r && r.low !== undefined) report.add('malformed-tolerance', pointer, { expected: 'a limit without tolerance', found: `"${String(written)}"` });
        else if (r) {
          // The same slack the checker gives a value at a limit: a floor written equal to the rule's
          // limit in another unit (1000 nm for 1 um) is not stricter by rounding.
          const slack = 1e-12 * Math.abs(side.limit);
          const stricter = comparison === 'at_least' ? r.value > side.limit + slack : r.value < side.limit - slack;
          if (stricter) {
            const limitText = `${comparison === 'at_least' ? '≥' : '≤'} ${formatValue(side.limit, q.unit)}`;
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
