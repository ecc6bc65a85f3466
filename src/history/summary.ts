// What history and diff print: a terminal listing of transitions by commit, and the Markdown a
// reviewer pastes into a change request. Pure text from the records; no git, no file system.
import { formatMargin } from '../model/format.ts';
import { urls } from '../model/urls.ts';
import { changeText, type HistoryReport, type Transition, type WaiverEvent } from './history.ts';

export interface Links {
  /** Base URL of the published report (`https://handbook.example/fh-m12/`). */
  report?: string;
  /** Commit page pattern with `{commit}` in it. */
  commit?: string;
}

/** A page of the report under the configured base URL. */
export function pageUrl(links: Links, path: string): string | undefined {
  if (!links.report) return undefined;
  return `${links.report.replace(/\/+$/, '')}${path}`;
}

export function commitUrl(links: Links, oid: string): string | undefined {
  return links.commit ? links.commit.replaceAll('{commit}', oid) : undefined;
}

const KIND_WORDS: Record<Transition['kind'], string> = {
  new: 'new',
  removed: 'removed',
  'pass-to-fail': 'pass → fail',
  'fail-to-pass': 'fail → pass',
  status: 'changed',
  moved: 'moved',
  waived: 'waived',
  unwaived: 'no longer waived',
};

function statusChange(t: Transition): string {
  if (t.kind === 'new') return `${t.to}`;
  if (t.kind === 'removed') return `was ${t.from}`;
  if (t.from === t.to) return `${t.to}`;
  return `${t.from} → ${t.to}`;
}

function valueChange(t: Transition): string {
  const v = t.valueFrom !== undefined && t.valueTo !== undefined && t.valueFrom !== t.valueTo ? `${t.valueFrom} → ${t.valueTo}` : (t.valueTo ?? t.valueFrom ?? '');
  const m = t.marginFrom !== undefined && t.marginTo !== undefined && t.marginFrom !== t.marginTo ? `margin ${formatMargin(t.marginFrom ?? null)} → ${formatMargin(t.marginTo ?? null)}` : t.marginTo !== undefined || t.marginFrom !== undefined ? `margin ${formatMargin((t.marginTo ?? t.marginFrom) ?? null)}` : '';
  return [v, m].filter(Boolean).join(', ');
}

/** `plumbline history` on a terminal: commits oldest first, each with its transitions. */
export function historyText(h: HistoryReport, root: string): string {
  const out: string[] = [];
  out.push(`history of the handbook at ${root}: ${h.stats.commits} commit${h.stats.commits === 1 ? '' : 's'}, ${h.revisions.length} changed the handbook; ${h.transitions.length} verdict transition${h.transitions.length === 1 ? '' : 's'}`);
  if (h.shallow) out.push(shallowNote());
  const byCommit = new Map<string, Transition[]>();
  for (const t of h.transitions) {
    const list = byCommit.get(t.commit.oid) ?? [];
    list.push(t);
    byCommit.set(t.commit.oid, list);
  }
  for (const r of h.revisions) {
    const ts = byCommit.get(r.commit.oid) ?? [];
    const disagree = h.disagreements.filter((d) => d.commit.oid === r.commit.oid);
    const waivers = h.waivers.filter((w) => w.commit?.oid === r.commit.oid);
    if (!ts.length && r.loaded && !disagree.length && !waivers.length) continue;
    out.push('');
    out.push(`${r.commit.short} ${r.commit.date.slice(0, 10)} ${r.commit.author}: ${r.commit.subject}`);
    if (!r.loaded) out.push(`  the handbook does not load at this revision (${r.problems} problem${r.problems === 1 ? '' : 's'}${r.firstProblem ? `; first: ${r.firstProblem}` : ''}); its verdicts are unknown`);
    for (const t of ts) {
      out.push(`  ${KIND_WORDS[t.kind].padEnd(16)} ${t.rule} on ${t.structure}${t.renamedFrom ? ` (was ${t.renamedFrom})` : ''}: ${statusChange(t)}${valueChange(t) ? `, ${valueChange(t)}` : ''}${t.severity === 'advisory' ? ' [advisory]' : ''}`);
      for (const c of t.causes) out.push(`      ${changeText(c)}`);
    }
    for (const w of waivers) out.push(`  waiver ${w.kind.padEnd(9)} ${w.waiver} (${w.rule}), approved by ${w.approvedBy}, owner ${w.owner}, until ${w.expires}`);
    for (const d of disagree) out.push(`  ledger differs  ${d.rule} on ${d.structure}: committed "${d.committed}", the engines now say "${d.now}"${d.engines ? ' (same inputs: the engines changed the verdict, not the handbook)' : ' (the committed ledger was stale)'}`);
  }
  const expired = h.waivers.filter((w) => w.kind === 'expired');
  if (expired.length) out.push('');
  for (const w of expired) out.push(`${w.date} waiver ${w.waiver} (${w.rule}) expired after ${w.expires}${w.failsAgain?.length ? `: ${w.failsAgain.join(', ')} fail${w.failsAgain.length === 1 ? 's' : ''} again` : ''}`);
  return out.join('\n');
}

export function shallowNote(): string {
  return 'this clone is shallow: history starts at its oldest commit. Fetch the whole history with `git fetch --unshallow` (or clone without --depth).';
}

/** Markdown special characters escaped, so a written value shows as written. */
function md(s: string): string {
  return s.replace(/([\\`*_[\]<>|#])/g, '\\$1');
}

export interface DiffSummary {
  base: string;
  head: string;
  transitions: Transition[];
}

/** Transitions that introduce a blocking failure: a CI job gates on them. */
export function introducesBlocking(ts: readonly Transition[]): Transition[] {
  // A failure that was advisory and is now blocking counts too (the severity changed, not the verdict).
  return ts.filter((t) => t.to === 'fail' && t.severity === 'blocking' && (t.from !== 'fail' || t.causes.some((c) => c.name.endsWith(' severity'))));
}

function section(title: string, ts: Transition[], links: Links): string[] {
  if (!ts.length) return [];
  const out = ['', `#### ${title} (${ts.length})`, ''];
  for (const t of ts) {
    const name = `${t.rule} on ${t.structure}`;
    const url = pageUrl(links, t.kind === 'removed' ? urls.rule(t.rule) : urls.verdict(t.rule, t.structure));
    const label = url ? `[${md(name)}](${url})` : `**${md(name)}**`;
    out.push(`- ${label}: ${md(statusChange(t))}${valueChange(t) ? `, ${md(valueChange(t))}` : ''}${t.severity === 'advisory' ? ' (advisory)' : ''}${t.renamedFrom ? ` (structure renamed from ${md(t.renamedFrom)})` : ''}`);
    for (const c of t.causes) out.push(`  - ${md(changeText(c))}`);
  }
  return out;
}

/** The change-request summary: new failures first, then fixes, then moved margins, then the rest. */
export function diffMarkdown(d: DiffSummary, links: Links): string {
  const ts = d.transitions;
  const isNewFailure = (t: Transition) => t.to === 'fail' && t.from !== 'fail';
  const isFix = (t: Transition) => t.from === 'fail' && t.to !== 'fail' && t.to !== undefined;
  const newFailures = ts.filter(isNewFailure).sort((a, b) => Number(a.severity !== 'blocking') - Number(b.severity !== 'blocking'));
  const fixes = ts.filter(isFix);
  const moved = ts.filter((t) => t.kind === 'moved');
  const rest = ts.filter((t) => !isNewFailure(t) && !isFix(t) && t.kind !== 'moved');
  const blocking = introducesBlocking(ts).length;
  const out = [`### Verdicts this change moves (${md(d.base)} → ${md(d.head)})`, ''];
  if (!ts.length) out.push('No verdict changes: every rule gives the same verdict, and no margin moved past the threshold.');
  else {
    const parts = [
      `${blocking} new blocking failure${blocking === 1 ? '' : 's'}`,
      newFailures.length > blocking ? `${newFailures.length - blocking} new advisory failure${newFailures.length - blocking === 1 ? '' : 's'}` : '',
      `${fixes.length} fix${fixes.length === 1 ? '' : 'es'}`,
      `${moved.length} moved margin${moved.length === 1 ? '' : 's'}`,
      rest.length ? `${rest.length} other change${rest.length === 1 ? '' : 's'}` : '',
    ].filter(Boolean);
    out.push(`${blocking ? '**' : ''}${parts.join(', ')}${blocking ? '**' : ''}.`);
  }
  out.push(...section('New failures', newFailures, links), ...section('Fixes', fixes, links), ...section('Moved margins', moved, links), ...section('Other changes', rest, links));
  out.push('', '_Engineering estimates from published models, checked by plumbline; confirm them on silicon._', '');
  return out.join('\n');
}

export function waiverLine(w: WaiverEvent): string {
  return `${w.kind} ${w.waiver} (${w.rule}), approved by ${w.approvedBy}, owner ${w.owner}, until ${w.expires}`;
}
