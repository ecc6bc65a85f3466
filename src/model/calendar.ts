// Calendar dates (`YYYY-MM-DD`, proleptic Gregorian, read as UTC days): a waiver's `expires` and
// the date a check is run on. Dates stay text in this form everywhere, so comparing two of them is
// comparing strings. No clock here: the date a check runs on is handed in by the caller.

/** The written form of a date: four-digit year, two-digit month and day. */
export const CALENDAR_DATE_PATTERN = '^[0-9]{4}-[0-9]{2}-[0-9]{2}$';

/** Days in a month of the Gregorian calendar: leap years are divisible by 4, except centuries not divisible by 400. */
export function daysInMonth(year: number, month: number): number {
  if (month === 2) return (year % 4 === 0 && year % 100 !== 0) || year % 400 === 0 ? 29 : 28;
  return [4, 6, 9, 11].includes(month) ? 30 : 31;
}

export type CalendarDateProblem =
  /** Not written YYYY-MM-DD (a time, another order, one-digit months). */
  | { problem: 'format' }
  /** Written so, but no such day: month 13, 2026-02-30. */
  | { problem: 'no-such-day'; year: number; month: number; days?: number };

/** `2027-06-30` as written and checked, or why it is not a calendar date. */
export function readCalendarDate(text: string): { date: string } | CalendarDateProblem {
  if (!new RegExp(CALENDAR_DATE_PATTERN).test(text)) return { problem: 'format' };
  const [year, month, day] = text.split('-').map(Number) as [number, number, number];
  if (month < 1 || month > 12) return { problem: 'no-such-day', year, month };
  const days = daysInMonth(year, month);
  if (day < 1 || day > days) return { problem: 'no-such-day', year, month, days };
  return { date: text };
}

/** Whether a text is a calendar date that exists (for callers that validate a date they are given). */
export function isCalendarDate(text: string): boolean {
  return 'date' in readCalendarDate(text);
}

/**
 * The UTC calendar day of a JavaScript Date, or null when it is not midnight UTC (a time of day was
 * written). YAML 1.1 timestamps arrive as such Dates from loaders that read them; the handbook's own
 * loader (js-yaml 5's core schema) keeps `2027-06-30` as text, so this is the path for a value built
 * elsewhere, and for the clock of a command.
 */
export function calendarDateOf(d: Date, requireMidnight = true): string | null {
  if (Number.isNaN(d.getTime())) return null;
  if (requireMidnight && (d.getUTCHours() || d.getUTCMinutes() || d.getUTCSeconds() || d.getUTCMilliseconds())) return null;
  const pad = (n: number, w: number) => String(n).padStart(w, '0');
  const year = d.getUTCFullYear();
  if (year < 0 || year > 9999) return null;
  return `${pad(year, 4)}-${pad(d.getUTCMonth() + 1, 2)}-${pad(d.getUTCDate(), 2)}`;
}

/** Today's UTC date from a clock reading (for commands; the checker itself never reads a clock). */
export function utcDateOf(now: Date): string {
  const d = calendarDateOf(now, false);
  if (d === null) throw new Error(`the clock reads ${String(now)}, which has no calendar date`);
  return d;
}
