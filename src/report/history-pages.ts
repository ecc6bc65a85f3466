// The report's history: what every page says about the revision it was built from, the timeline of
// verdict changes on rule, structure and verdict pages, the margin of a verdict over the commits,
// and the audit page (every transition and waiver event, by month). Page data only: the walk
// itself is src/history/history.ts, the layout is in templates/.
import type { HistoryReport, Transition, WaiverEvent } from '../history/history.ts';
import { changeText } from '../history/history.ts';
import { commitUrl, type Links } from '../history/summary.ts';
import { rowKey } from '../history/rows.ts';
import { formatMargin } from '../model/format.ts';

/** The revision a report was built from. */
export interface BuiltFrom {
  commit: string;
  short: string;
  /** Commit date as git records it. */
  date: string;
  /** The working tree differed from the commit in the handbook's files. */
  dirty: boolean;
  tool: string;
  url?: string;
}

export interface TimelineEntry {
  day: string;
  commit: string;
  commitUrl?: string;
  author: string;
  subject: string;
  rule: string;
  structure: string;
  verdictUrl: string;
  kind: string;
  /** `pass → fail`, `fail`, ... */
  change: string;
  /** `8 → 10.4, margin +20 % → −4 %` */
  detail: string;
  causes: string[];
}

export interface MarginPoint {
  /** Position along the revisions (for the chart's axis). */
  index: number;
  commit: string;
  day: string;
  margin: number | null;
  status: string;
}

export interface AuditEntry {
  day: string;
  what: 'verdict' | 'waiver';
  text: string;
  commit?: string;
  commitUrl?: string;
  author?: string;
  url: string;
}

export interface HistoryPages {
  builtFrom?: BuiltFrom;
  /** Said on every history section when the history is partial (a shallow clone). */
  note?: string;
  revisions: number;
  byVerdict: Record<string, TimelineEntry[]>;
  byRule: Record<string, TimelineEntry[]>;
  byStructure: Record<string, TimelineEntry[]>;
  margins: Record<string, MarginPoint[]>;
  /** Newest month first; entries newest first. */
  months: Array<{ month: string; verdicts: number; waivers: number; entries: AuditEntry[] }>;
}

const KIND: Record<Transition['kind'], string> = {
  new: 'new verdict',
  removed: 'removed',
  'pass-to-fail': 'started failing',
  'fail-to-pass': 'fixed',
  status: 'changed',
  moved: 'margin moved',
  waived: 'waived',
  unwaived: 'no longer waived',
};

function day(date: string): string {
  return date.slice(0, 10);
}

function entryOf(t: Transition, links: Links, verdictUrl: (rule: string, structure: string) => string): TimelineEntry {
  const values = t.valueFrom !== undefined && t.valueTo !== undefined && t.valueFrom !== t.valueTo ? `${t.valueFrom} → ${t.valueTo}` : (t.valueTo ?? t.valueFrom ?? '');
  const margins = t.marginFrom !== undefined && t.marginTo !== undefined && t.marginFrom !== t.marginTo ? `margin ${formatMargin(t.marginFrom ?? null)} → ${formatMargin(t.marginTo ?? null)}` : '';
  const url = commitUrl(links, t.commit.oid);
  return {
    day: day(t.commit.date),
    commit: t.commit.short,
    ...(url ? { commitUrl: url } : {}),
    author: t.commit.author,
    subject: t.commit.subject,
    rule: t.rule,
    structure: t.structure,
    verdictUrl: verdictUrl(t.rule, t.structure),
    kind: KIND[t.kind],
    change: t.from && t.to && t.from !== t.to ? `${t.from} → ${t.to}` : (t.to ?? `was ${t.from}`),
    detail: [values, margins].filter(Boolean).join(', '),
    causes: t.causes.map(changeText),
  };
}

function waiverText(w: WaiverEvent): string {
  if (w.kind === 'expired') return `waiver ${w.waiver} (${w.rule}) expired after ${w.expires}${w.failsAgain?.length ? `; failing again: ${w.failsAgain.map((k) => k.split(' ')[1]).join(', ')}` : ''}`;
  return `waiver ${w.waiver} (${w.rule}) ${w.kind}: approved by ${w.approvedBy}, owner ${w.owner}, until ${w.expires}`;
}

/** Page data from a history walk. `urls` are the report's own addresses. */
export function historyPages(h: HistoryReport, links: Links, urls: { verdict: (r: string, s: string) => string; rule: (r: string) => string; waiver: (id: string) => string }, builtFrom?: BuiltFrom, note?: string): HistoryPages {
  const byVerdict: Record<string, TimelineEntry[]> = {};
  const byRule: Record<string, TimelineEntry[]> = {};
  const byStructure: Record<string, TimelineEntry[]> = {};
  const push = (m: Record<string, TimelineEntry[]>, k: string, e: TimelineEntry) => (m[k] ??= []).push(e);
  const entries = h.transitions.map((t) => entryOf(t, links, urls.verdict));
  h.transitions.forEach((t, i) => {
    const e = entries[i]!;
    push(byVerdict, rowKey(t), e);
    push(byRule, t.rule, e);
    push(byStructure, t.structure, e);
    if (t.renamedFrom) push(byStructure, t.renamedFrom, e);
  });
  // Newest first on every page: an auditor reads from today backwards.
  for (const m of [byVerdict, byRule, byStructure]) for (const k of Object.keys(m)) m[k]!.reverse();

  const margins: Record<string, MarginPoint[]> = {};
  h.revisions.forEach((r, index) => {
    for (const [k, status] of Object.entries(r.verdicts)) (margins[k] ??= []).push({ index, commit: r.commit.short, day: day(r.commit.date), margin: r.margins[k] ?? null, status });
  });

  const audit: AuditEntry[] = [
    ...h.transitions.map((t, i): AuditEntry => {
      const e = entries[i]!;
      return { day: e.day, what: 'verdict', text: `${t.rule} on ${t.structure}: ${e.kind} (${e.change}${e.detail ? `; ${e.detail}` : ''})${e.causes.length ? ` — ${e.causes.join('; ')}` : ''}`, commit: e.commit, ...(e.commitUrl ? { commitUrl: e.commitUrl } : {}), author: e.author, url: e.verdictUrl };
    }),
    ...h.waivers.map((w): AuditEntry => {
      const url = w.commit ? commitUrl(links, w.commit.oid) : undefined;
      return { day: day(w.date), what: 'waiver', text: waiverText(w), ...(w.commit ? { commit: w.commit.short, author: w.commit.author } : {}), ...(url ? { commitUrl: url } : {}), url: urls.waiver(w.waiver) };
    }),
  ];
  // Stable: by day, newest first; within a day, in walk order.
  const order = audit.map((e, i) => ({ e, i })).sort((a, b) => (a.e.day < b.e.day ? 1 : a.e.day > b.e.day ? -1 : a.i - b.i));
  const months: HistoryPages['months'] = [];
  for (const { e } of order) {
    const month = e.day.slice(0, 7);
    if (months[months.length - 1]?.month !== month) months.push({ month, verdicts: 0, waivers: 0, entries: [] });
    const m = months[months.length - 1]!;
    m.entries.push(e);
    if (e.what === 'verdict') m.verdicts++;
    else m.waivers++;
  }
  return { ...(builtFrom ? { builtFrom } : {}), ...(note ? { note } : {}), revisions: h.revisions.length, byVerdict, byRule, byStructure, margins, months };
}
