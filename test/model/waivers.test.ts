// Loading waivers: what a valid waiver becomes (fields, date, still_within in SI, position), how
// waivers/ is read, and calendar dates. Bad waivers are cases of the corpus (test/corpus/waiver-*);
// here diagnostics are asserted by code, field and place only, never by sentence.
import { loadHandbook } from '../../src/pipeline.ts';
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join, relative, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { calendarDateOf, daysInMonth, isCalendarDate, readCalendarDate, utcDateOf } from '../../src/model/calendar.ts';

import { MemorySource } from '../../src/model/memory-source.ts';
import { HANDBOOK_INPUTS } from '../../src/model/source.ts';
import { SCHEMAS } from '../../src/model/schema.ts';
import type { Handbook } from '../../src/model/types.ts';

const BASE = resolve(import.meta.dirname, '../corpus/_base');

/** The corpus base handbook (a valid one) as files in memory. */
function baseFiles(dir = BASE): Record<string, string> {
  const out: Record<string, string> = {};
  for (const name of readdirSync(dir)) {
    const p = join(dir, name);
    if (statSync(p).isDirectory()) Object.assign(out, baseFiles(p));
    else out[relative(BASE, p)] = readFileSync(p, 'utf8');
  }
  return out;
}

function load(extra: Record<string, string>) {
  return loadHandbook(new MemorySource({ ...baseFiles(), ...extra }));
}

function loaded(extra: Record<string, string>): Handbook {
  const r = load(extra);
  if (!r.ok) throw new Error(JSON.stringify(r.diagnostics));
  return r.handbook;
}

const where = (d: { code: string; file: string; line: number; column: number; field: string }) => [d.code, d.file, d.line, d.column, d.field];

const CUP = `id: W-CUP-1
rule: CUP-SPACE-1
structures: [cup]
reason: The bench lot is accepted at its *measured* gap.
owner: Avery Bench
approved_by: Rowan Bench
expires: 2027-06-30
still_within:
  at_least: 12 nm
`;

describe('a valid waiver', () => {
  it('loads with its fields, its date as written and its still_within in SI', () => {
    const h = loaded({ 'waivers/cup.yaml': CUP });
    expect(h.waivers).toHaveLength(1);
    const w = h.waivers[0]!;
    expect(w).toMatchObject({
      id: 'W-CUP-1',
      rule: 'CUP-SPACE-1',
      appliesTo: { structures: ['cup'] },
      selectedBy: 'structures',
      reason: 'The bench lot is accepted at its *measured* gap.',
      owner: 'Avery Bench',
      approvedBy: 'Rowan Bench',
      expires: '2027-06-30',
      file: 'waivers/cup.yaml',
      pos: { file: 'waivers/cup.yaml', line: 1, column: 1 },
    });
    // 12 nm = 1.2e-8 m (SI), in the rule's comparison.
    expect(w.stillWithin?.comparison).toBe('at_least');
    expect(w.stillWithin?.limit).toBeCloseTo(12e-9, 20);
    expect(w.stillWithin?.written).toBe('12 nm');
  });

  it('reads a quoted date as the unquoted one', () => {
    const quoted = loaded({ 'waivers/cup.yaml': CUP.replace('expires: 2027-06-30', 'expires: "2027-06-30"') });
    expect(quoted.waivers[0]!.expires).toBe('2027-06-30');
  });

  it('accepts 29 February of a leap year (2028: divisible by 4, not a century)', () => {
    expect(loaded({ 'waivers/cup.yaml': CUP.replace('2027-06-30', '2028-02-29') }).waivers[0]!.expires).toBe('2028-02-29');
  });

  it('accepts a still_within equal to the rule’s limit written in another unit', () => {
    // CUP-SPACE-1 is at_least 14 nm; 0.014 um is the same limit (at the rule's limit is allowed).
    const w = loaded({ 'waivers/cup.yaml': CUP.replace('at_least: 12 nm', 'at_least: 0.014 um') }).waivers[0]!;
    expect(w.stillWithin?.limit).toBeCloseTo(14e-9, 20);
  });

  it('accepts a ceiling looser than an at_most rule: VIA-R-1 is at most 50 mΩ, the waiver at most 60 mΩ', () => {
    const w = loaded({ 'waivers/via.yaml': CUP.replace('CUP-SPACE-1', 'VIA-R-1').replace('[cup]', '[via]').replace('at_least: 12 nm', 'at_most: 60 mohm') }).waivers[0]!;
    expect(w.stillWithin).toEqual({ comparison: 'at_most', limit: 0.06, written: '60 mohm' });
  });

  it('selects by applies_to as a rule does', () => {
    const w = loaded({ 'waivers/cup.yaml': CUP.replace('structures: [cup]', 'applies_to: { kinds: [cylinder], tags: [array] }') }).waivers[0]!;
    expect(w.appliesTo).toEqual({ kinds: ['cylinder'], tags: ['array'] });
    expect(w.selectedBy).toBe('applies_to');
  });

  it('has no still_within when none is written', () => {
    expect(loaded({ 'waivers/cup.yaml': CUP.replace(/still_within:\n.*\n/, '') }).waivers[0]!.stillWithin).toBeUndefined();
  });
});

describe('the waivers/ folder', () => {
  it('is optional: the corpus base has none and loads with no waivers', () => {
    expect(loaded({}).waivers).toEqual([]);
  });

  it('is read as rules/ is: subfolders, .yaml and .yml in any case, lists, sorted by id', () => {
    const second = CUP.replace('W-CUP-1', 'W-A-2');
    const list = `- ${CUP.replace('W-CUP-1', 'W-B-3').trimEnd().split('\n').join('\n  ')}\n- ${CUP.replace('W-CUP-1', 'W-B-4').trimEnd().split('\n').join('\n  ')}\n`;
    const h = loaded({ 'waivers/cup.yaml': CUP, 'waivers/old/second.YML': second, 'waivers/list.yaml': list });
    expect(h.waivers.map((w) => [w.id, w.file, w.pos.line, w.pos.column])).toEqual([
      ['W-A-2', 'waivers/old/second.YML', 1, 1],
      // A list item's mapping starts after "- ": column 3; the second item on line 10.
      ['W-B-3', 'waivers/list.yaml', 1, 3],
      ['W-B-4', 'waivers/list.yaml', 10, 3],
      ['W-CUP-1', 'waivers/cup.yaml', 1, 1],
    ]);
  });

  it('is one of the handbook’s inputs (watched by serve, never an output folder)', () => {
    expect(HANDBOOK_INPUTS).toContain('waivers');
  });

  it('has a published JSON Schema', () => {
    expect(Object.keys(SCHEMAS)).toContain('waiver.schema.json');
  });
});

describe('problems the corpus does not show', () => {
  it('suggests the rule id in upper case for one written in lower case', () => {
    const r = load({ 'waivers/cup.yaml': CUP.replace('rule: CUP-SPACE-1', 'rule: cup-space-1') });
    expect(r.ok).toBe(false);
    if (r.ok) return;
    // line 2 "rule: " is six characters: the value at column 7.
    expect(r.diagnostics.map(where)).toEqual([['unknown-rule', 'waivers/cup.yaml', 2, 7, 'rule']]);
    expect(r.diagnostics[0]!.suggestions).toEqual(['CUP-SPACE-1']);
  });

  it('names the days of the month an impossible date leaves', () => {
    const r = load({ 'waivers/cup.yaml': CUP.replace('2027-06-30', '2026-02-30') });
    if (r.ok) throw new Error('loaded');
    expect(r.diagnostics.map(where)).toEqual([['bad-date', 'waivers/cup.yaml', 7, 10, 'expires']]);
    // February 2026 has 28 days (2026 is not divisible by 4).
    expect(r.diagnostics[0]!.expected).toContain('28');
  });
});

describe('calendar dates (Gregorian calendar: leap years are divisible by 4, except centuries not divisible by 400)', () => {
  it('knows the length of each month', () => {
    // 30 days hath September, April, June and November; February 28, or 29 in a leap year.
    expect([1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12].map((m) => daysInMonth(2027, m))).toEqual([31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31]);
    expect(daysInMonth(2028, 2)).toBe(29);
    expect(daysInMonth(2000, 2)).toBe(29); // a century divisible by 400
    expect(daysInMonth(2100, 2)).toBe(28); // a century not divisible by 400
  });

  it('accepts days that exist and refuses the others', () => {
    expect(['2027-06-30', '2028-02-29', '2000-02-29', '2027-12-31', '2027-01-01'].map(isCalendarDate)).toEqual([true, true, true, true, true]);
    expect(['2026-02-30', '2027-02-29', '2100-02-29', '2027-04-31', '2027-13-01', '2027-00-10', '2027-06-00'].map(isCalendarDate)).toEqual([false, false, false, false, false, false, false]);
    expect(['2027-6-30', '27-06-30', '2027-06-30T00:00:00Z', ' 2027-06-30', '2027/06/30'].map((t) => readCalendarDate(t))).toEqual(Array(5).fill({ problem: 'format' }));
  });

  it('takes the UTC day of a Date (as a YAML 1.1 timestamp arrives), refusing one with a time of day', () => {
    expect(calendarDateOf(new Date(Date.UTC(2027, 5, 30)))).toBe('2027-06-30');
    expect(calendarDateOf(new Date(Date.UTC(2027, 5, 30, 12)))).toBeNull();
    expect(calendarDateOf(new Date(Number.NaN))).toBeNull();
  });

  it('reads today as the UTC day of a clock reading, not the local one', () => {
    // 23:59:59 UTC on 2 December 2026 is 3 December east of Greenwich; the UTC day is the 2nd.
    expect(utcDateOf(new Date('2026-12-02T23:59:59Z'))).toBe('2026-12-02');
    expect(utcDateOf(new Date('2026-12-03T00:00:00Z'))).toBe('2026-12-03');
  });
});
