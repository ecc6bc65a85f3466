// History: every revision that changed the handbook, evaluated with the current engines, and the
// verdict transitions between them, each with its commit and the input changes behind it.
//
// A transition belongs to the commit that made it. Each commit is compared with its first parent;
// a merge is compared with all its parents and keeps only what differs from every one of them
// (what the merge itself decided), so a change made on a branch is listed once, at its own commit,
// and not again when the branch is merged. `firstParent` walks only the main line instead, where a
// merge stands for everything its branch brought in.
import { loadHandbook } from '../pipeline.ts';
import { formatDiagnostic } from '../diagnostics/messages.ts';
import { isWarning } from '../diagnostics/diagnostic.ts';

import type { HandbookSource } from '../model/source.ts';
import { HANDBOOK_INPUTS, stemOf } from '../model/source.ts';
import type { TreeEntry } from '../model/revision-source.ts';
import type { Status } from '../checker/evaluate.ts';
import type { HistoryCache, RevisionRecord } from './cache.ts';
import type { Commit, GitRepo } from './git.ts';
import { LEDGER_FILE, ledgerLineOf, parseLedger, type LedgerLine } from './ledger.ts';
import { canonicalJson, evaluateRows, rowKey, shortHash, type VerdictRow } from './rows.ts';
import { isExpired, waiveRow, waiverSpecsOf, type WaiverSpec } from './waive.ts';

/** One change of an input between two revisions, as a reader wants it: name, before, after, where. */
export interface InputChange {
  name: string;
  /** A change that is not one value for another (a rule added, a structure no longer selected). */
  note?: string;
  from?: string;
  to?: string;
  /** Where the new value is written (`structures/storage-node.yaml:10`). */
  at?: string;
}

export type TransitionKind = 'new' | 'removed' | 'pass-to-fail' | 'fail-to-pass' | 'status' | 'moved' | 'waived' | 'unwaived';

export interface Transition {
  kind: TransitionKind;
  rule: string;
  structure: string;
  /** The structure's id before a rename, when it was renamed in this commit. */
  renamedFrom?: string;
  from?: Status;
  to?: Status;
  valueFrom?: string;
  valueTo?: string;
  marginFrom?: number | null;
  marginTo?: number | null;
  severity: VerdictRow['severity'];
  commit: CommitInfo;
  causes: InputChange[];
}

export interface CommitInfo {
  oid: string;
  short: string;
  author: string;
  email: string;
  date: string;
  subject: string;
}

/** A commit whose committed ledger says something else than the current engines do. */
export interface LedgerDisagreement {
  commit: CommitInfo;
  rule: string;
  structure: string;
  committed: string;
  now: string;
  /** The inputs hash is the same: the engines changed the verdict, not the inputs. */
  engines: boolean;
}

export interface WaiverEvent {
  kind: 'added' | 'changed' | 'removed' | 'expired';
  waiver: string;
  rule: string;
  /** The commit that added, changed or removed it; for `expired`, the date after its last day. */
  commit?: CommitInfo;
  date: string;
  /** Who approved it and who owns it (as the waiver says), and its expiry. */
  approvedBy: string;
  owner: string;
  expires: string;
  /** For `expired`: the verdicts that fail again. */
  failsAgain?: string[];
}

export interface RevisionSummary {
  commit: CommitInfo;
  /** False when the handbook did not load at this revision (its verdicts are then unknown). */
  loaded: boolean;
  problems: number;
  firstProblem?: string;
  counts: Partial<Record<Status, number>>;
  /** Margin of each verdict at this revision, for margin-over-commits charts. */
  margins: Record<string, number | null>;
  verdicts: Record<string, Status>;
}

export interface HistoryReport {
  head: string;
  shallow: boolean;
  /** Revisions that changed the handbook, oldest first (the first is where the walk begins). */
  revisions: RevisionSummary[];
  transitions: Transition[];
  disagreements: LedgerDisagreement[];
  waivers: WaiverEvent[];
  stats: { commits: number; revisions: number; loaded: number; fromCache: number; evaluated: number };
}

export interface HistoryOptions {
  head?: string;
  /** Walk only the commits after this one (it is the starting point, not reported). */
  since?: string;
  firstParent?: boolean;
  /** Margin change (a fraction: 0.05 is five points) that lists a verdict as moved. */
  moved?: number;
  /** Keep only transitions of this rule or structure. */
  subject?: string;
  /** The date waivers are judged at for `expired` events (YYYY-MM-DD), default: none expire later than the newest commit. */
  today?: string;
  onProgress?: (done: number, total: number) => void;
}

function infoOf(c: Commit): CommitInfo {
  return { oid: c.oid, short: c.short, author: c.author, email: c.email, date: c.date, subject: c.subject };
}

/** The calendar day (UTC) of a git date: the date waivers are judged at for that commit. */
export function dayOf(isoDate: string): string {
  const t = Date.parse(isoDate);
  return Number.isNaN(t) ? isoDate.slice(0, 10) : new Date(t).toISOString().slice(0, 10);
}

/**
 * The hash of a revision's handbook: what loading reads (the files and folders it reads, by path,
 * mode and object) and the names of everything else at the root (which only warnings look at). A
 * commit that changes only what lies beside the handbook, or only the ledger, has the same key.
 */
export function treeKey(entries: readonly TreeEntry[]): string {
  const read = (e: TreeEntry) => e.path.includes('/') || (HANDBOOK_INPUTS as readonly string[]).includes(e.path) || e.path === 'waivers';
  return shortHash(canonicalJson(entries.filter((e) => e.path !== LEDGER_FILE).map((e) => (read(e) ? [e.path, e.mode, e.oid] : [e.path, e.kind]))), 24);
}

/** Evaluate a handbook source into a record (rows before waivers, its waivers). */
export function recordOf(source: HandbookSource, cache: HistoryCache): RevisionRecord {
  const loaded = loadHandbook(source);
  if (!loaded.ok) {
    const errors = loaded.diagnostics.filter((d) => !isWarning(d));
    const first = errors[0];
    // Worded without the revision: the record is cached by tree, and another commit may share it.
    return { ok: false, problems: errors.length, ...(first ? { firstProblem: formatDiagnostic({ ...first, revision: undefined }) } : {}), rows: [], waivers: [] };
  }
  const { rows } = evaluateRows(loaded.handbook, cache);
  return { ok: true, problems: 0, rows, waivers: waiverSpecsOf(loaded.handbook) };
}

function statusOfRow(r: VerdictRow | undefined): Status | undefined {
  return r ? r.verdict : undefined;
}

/** Input changes between two rows of a verdict: the rule's test, then each input read. */
export function inputChanges(a: VerdictRow | undefined, b: VerdictRow | undefined, renamedFrom?: string, other?: Present): InputChange[] {
  const out: InputChange[] = [];
  if (renamedFrom && b) out.push({ name: 'structure', from: renamedFrom, to: b.structure });
  if (!a || !b) {
    // Why a verdict appears or goes: its rule or structure came or went, or the rule's scope changed.
    const r = (b ?? a)!;
    const ruleThere = other?.rules.has(r.rule) ?? true;
    const structureThere = other?.structures.has(r.structure) ?? true;
    const came = b !== undefined;
    if (!ruleThere) out.push({ name: `rule ${r.rule}`, note: came ? 'added' : 'removed' });
    if (!structureThere) out.push({ name: `structure ${r.structure}`, note: came ? 'added' : 'removed' });
    if (ruleThere && structureThere) out.push({ name: `rule ${r.rule}`, note: came ? `now applies to ${r.structure}` : `no longer applies to ${r.structure}` });
    return out;
  }
  const test = (x: VerdictRow) => x.sides.map((s) => `${s.comparison} ${s.written}`).join(', ');
  if (test(a) !== test(b)) out.push({ name: `${b.rule} limit`, from: test(a), to: test(b) });
  if (a.quantity !== b.quantity || a.film !== b.film) out.push({ name: `${b.rule} quantity`, from: `${a.quantity}${a.film ? `[${a.film}]` : ''}`, to: `${b.quantity}${b.film ? `[${b.film}]` : ''}` });
  if (a.mode !== b.mode) out.push({ name: `${b.rule} evaluate_at`, from: a.mode, to: b.mode });
  if (a.severity !== b.severity) out.push({ name: `${b.rule} severity`, from: a.severity, to: b.severity });
  const before = new Map(a.read.map((i) => [i.name, i]));
  const after = new Map(b.read.map((i) => [i.name, i]));
  for (const name of [...new Set([...before.keys(), ...after.keys()])].sort()) {
    const x = before.get(name);
    const y = after.get(name);
    const shown = (i: typeof x) => (i ? (i.material ? `${i.written} (built-in ${i.material})` : i.written) : undefined);
    if (shown(x) === shown(y)) continue;
    out.push({ name, ...(x ? { from: shown(x) } : {}), ...(y ? { to: shown(y) } : {}), ...(y?.at ? { at: y.at } : {}) });
  }
  if (a.waiver?.id !== b.waiver?.id) out.push({ name: 'waiver', ...(a.waiver ? { from: a.waiver.id } : {}), ...(b.waiver ? { to: `${b.waiver.id} until ${b.waiver.expires}` } : {}) });
  return out;
}

function valueOf(r: VerdictRow | undefined): string | undefined {
  if (!r) return undefined;
  return ledgerLineOf(r).value;
}

/** Rules and structures that have verdicts in a revision. */
interface Present {
  rules: Set<string>;
  structures: Set<string>;
}

function presentIn(rows: ReadonlyMap<string, VerdictRow>): Present {
  const p: Present = { rules: new Set(), structures: new Set() };
  for (const r of rows.values()) {
    p.rules.add(r.rule);
    p.structures.add(r.structure);
  }
  return p;
}

/** The transitions between two revisions' rows (`renames`: old structure id → new one). */
export function compareRows(before: ReadonlyMap<string, VerdictRow>, after: ReadonlyMap<string, VerdictRow>, commit: CommitInfo, moved: number, renames: ReadonlyMap<string, string> = new Map()): Transition[] {
  const out: Transition[] = [];
  const was = presentIn(before);
  const now = presentIn(after);
  for (const [o, n] of renames) if (was.structures.has(o)) was.structures.add(n);
  const renamedTo = new Map([...renames].map(([o, n]) => [n, o]));
  const seen = new Set<string>();
  for (const [key, b] of after) {
    const oldId = renamedTo.get(b.structure);
    const aKey = oldId !== undefined && !before.has(key) ? rowKey({ rule: b.rule, structure: oldId }) : key;
    seen.add(aKey);
    const a = before.get(aKey);
    const kind = kindOf(a, b, moved);
    if (!kind) continue;
    out.push(transition(kind, a, b, commit, oldId !== undefined && aKey !== key ? oldId : undefined, was));
  }
  for (const [key, a] of before) if (!seen.has(key)) out.push(transition('removed', a, undefined, commit, undefined, now));
  return out;
}

function kindOf(a: VerdictRow | undefined, b: VerdictRow, moved: number): TransitionKind | null {
  if (!a) return 'new';
  const s = a.verdict;
  const t = b.verdict;
  if (s !== t) {
    if (s === 'pass' && t === 'fail') return 'pass-to-fail';
    if (s === 'fail' && t === 'pass') return 'fail-to-pass';
    if (t === 'waived') return 'waived';
    if (s === 'waived' && t === 'fail') return 'unwaived';
    return 'status';
  }
  // A severity change moves a failure into (or out of) what blocks a change: always listed.
  if (a.severity !== b.severity && (s === 'fail' || t === 'fail')) return 'status';
  if (a.margin !== null && b.margin !== null && b.margin !== a.margin && Math.abs(b.margin - a.margin) >= moved) return 'moved';
  return null;
}

function transition(kind: TransitionKind, a: VerdictRow | undefined, b: VerdictRow | undefined, commit: CommitInfo, renamedFrom?: string, other?: Present): Transition {
  const r = (b ?? a)!;
  return {
    kind,
    rule: r.rule,
    structure: r.structure,
    ...(renamedFrom ? { renamedFrom } : {}),
    ...(a ? { from: statusOfRow(a), valueFrom: valueOf(a), marginFrom: a.margin } : {}),
    ...(b ? { to: statusOfRow(b), valueTo: valueOf(b), marginTo: b.margin } : {}),
    severity: r.severity,
    commit,
    causes: inputChanges(a, b, renamedFrom, other),
  };
}

/** Structure ids whose files git sees renamed between two commits (or a commit and the working tree). */
export function structureFileRenames(repo: GitRepo, from: string, to?: string): Map<string, string> {
  const ids = new Map<string, string>();
  for (const [o, n] of repo.renames(from, to)) if (o.startsWith('structures/') && n.startsWith('structures/')) ids.set(stemOf(o), stemOf(n));
  return ids;
}

/** Rows of a record as the checker says them on `on`. */
export function rowsAt(rec: RevisionRecord, on: string): Map<string, VerdictRow> {
  return new Map(rec.rows.map((r) => {
    const w = waiveRow(r, rec.waivers, on);
    return [rowKey(w), w];
  }));
}

/** Structure ids renamed between two revisions (a structure's id is its file's name). */
function structureRenames(repo: GitRepo, from: string, to: string, before: RevisionRecord, after: RevisionRecord): Map<string, string> {
  const was = new Set(before.rows.map((r) => r.structure));
  const now = new Set(after.rows.map((r) => r.structure));
  const gone = [...was].filter((s) => !now.has(s));
  const came = [...now].filter((s) => !was.has(s));
  if (!gone.length || !came.length) return new Map();
  const ids = new Map<string, string>();
  for (const [o, n] of structureFileRenames(repo, from, to)) if (gone.includes(o) && came.includes(n)) ids.set(o, n);
  return ids;
}

function ledgerOf(repo: GitRepo, entries: readonly TreeEntry[]): Map<string, LedgerLine> | undefined {
  const e = entries.find((x) => x.path === LEDGER_FILE && x.kind === 'file');
  if (!e) return undefined;
  const bytes = repo.bytes(e.oid);
  if (!bytes) return undefined;
  const parsed = parseLedger(new TextDecoder().decode(bytes));
  return parsed.ok ? parsed.lines : undefined;
}

/** Walk the handbook's history. */
export function walkHistory(repo: GitRepo, cache: HistoryCache, opts: HistoryOptions = {}): HistoryReport {
  const head = repo.resolveCommit(opts.head ?? 'HEAD');
  const since = opts.since !== undefined ? repo.resolveCommit(opts.since) : undefined;
  const commits = repo.commits(head, since, opts.firstParent);
  const byOid = new Map(commits.map((c) => [c.oid, c]));
  const moved = opts.moved ?? 0.1;
  // The starting point of a --since walk is evaluated too, so its successors have a "before".
  const all = since ? [since, ...commits.map((c) => c.oid)] : commits.map((c) => c.oid);
  repo.prefetchTrees(all);
  const keys = new Map(all.map((c) => [c, treeKey(repo.snapshot(c))]));
  const parentsOf = (c: Commit) => (opts.firstParent ? c.parents.slice(0, 1) : c.parents).filter((p) => keys.has(p));
  // Revisions that changed the handbook: a root, or a tree that differs from a parent's.
  const changed = commits.filter((c) => {
    const ps = parentsOf(c);
    return ps.length === 0 ? !since || c.oid === since : ps.some((p) => keys.get(p) !== keys.get(c.oid));
  });
  const needed = new Set<string>(since ? [since] : []);
  for (const c of changed) {
    needed.add(c.oid);
    for (const p of parentsOf(c)) needed.add(p);
  }
  // Read the files of every revision not cached yet in one batch, then evaluate those.
  const uncached = [...needed].filter((c) => !cache.revision(keys.get(c)!));
  repo.prefetchBlobs(uncached.map((c) => repo.snapshot(c)), [LEDGER_FILE]);
  repo.prefetchBlobs([...needed].map((c) => repo.snapshot(c)).map((es) => es.filter((e) => e.path === LEDGER_FILE)), [LEDGER_FILE]);
  const records = new Map<string, RevisionRecord>();
  let loaded = 0;
  let fromCache = 0;
  const before = cache.computed;
  let done = 0;
  for (const c of needed) {
    const key = keys.get(c)!;
    let rec = cache.revision(key) ?? records.get(key);
    if (rec) fromCache++;
    else {
      rec = recordOf(repo.source(c, byOid.get(c)?.short), cache);
      cache.setRevision(key, rec);
      loaded++;
    }
    records.set(key, rec);
    opts.onProgress?.(++done, needed.size);
  }

  const loadedAncestor = (oid: string): { oid: string; rec: RevisionRecord } | undefined => {
    for (let at: string | undefined = oid; at !== undefined; ) {
      const rec = keys.has(at) ? records.get(keys.get(at)!) : undefined;
      if (rec?.ok) return { oid: at, rec };
      at = byOid.get(at)?.parents.filter((p) => keys.has(p))[0];
    }
    return undefined;
  };
  const transitions: Transition[] = [];
  const disagreements: LedgerDisagreement[] = [];
  const revisions: RevisionSummary[] = [];
  for (const c of changed) {
    const info = infoOf(c);
    const on = dayOf(c.date);
    const rec = records.get(keys.get(c.oid)!)!;
    const now = rowsAt(rec, on);
    revisions.push(summaryOf(info, rec, now));
    // A parent that did not load stands for the nearest ancestor that did.
    const ps = parentsOf(c)
      .map((p) => loadedAncestor(p))
      .filter((p): p is { oid: string; rec: RevisionRecord } => p !== undefined);
    if (rec.ok && ps.length) {
      // Each parent re-judged on this commit's date, so a waiver that expired meanwhile is not
      // blamed on this commit (expiries are events of their own, below).
      const per = ps.map((p) => compareRows(rowsAt(p.rec, on), now, info, moved, structureRenames(repo, p.oid, c.oid, p.rec, rec)));
      const mine = per.length === 1 ? per[0]! : per[0]!.filter((t) => per.every((list) => list.some((u) => sameChange(u, t))));
      transitions.push(...mine);
    } else if (rec.ok && !ps.length && !(since && c.oid === since) && !repo.shallowRoots.has(c.oid) && c.parents.every((p) => keys.has(p))) {
      // The first revision that loads (the handbook was added, or every earlier one failed): all new.
      transitions.push(...compareRows(new Map(), now, info, moved));
    }
    // What the committed ledger says against what the engines say now.
    const ledger = ledgerOf(repo, repo.snapshot(c.oid));
    if (ledger && rec.ok) {
      for (const r of now.values()) {
        const line = ledgerLineOf(r);
        const committed = ledger.get(rowKey(r));
        if (!committed) continue;
        if (committed.verdict !== line.verdict || committed.value !== line.value || committed.limit !== line.limit) {
          disagreements.push({ commit: info, rule: r.rule, structure: r.structure, committed: `${committed.verdict} ${committed.value}`, now: `${line.verdict} ${line.value}`, engines: committed.inputs === line.inputs });
        }
      }
    }
  }
  const waivers = waiverEvents(changed, keys, records, parentsOf, opts.today);
  const subject = opts.subject;
  const keep = (t: { rule: string; structure: string; renamedFrom?: string }) => !subject || t.rule === subject || t.structure === subject || t.renamedFrom === subject;
  return {
    head,
    shallow: repo.shallow,
    revisions,
    transitions: transitions.filter(keep),
    disagreements: disagreements.filter(keep),
    waivers: subject ? waivers.filter((w) => w.rule === subject || w.waiver === subject || (w.failsAgain ?? []).some((k) => k.split(' ')[1] === subject)) : waivers,
    stats: { commits: commits.length, revisions: needed.size, loaded, fromCache, evaluated: cache.computed - before },
  };
}

/** Same verdict change, whichever parent it was measured against. */
function sameChange(a: Transition, b: Transition): boolean {
  return a.rule === b.rule && a.structure === b.structure && a.to === b.to && a.valueTo === b.valueTo;
}

function summaryOf(commit: CommitInfo, rec: RevisionRecord, rows: Map<string, VerdictRow>): RevisionSummary {
  const counts: Partial<Record<Status, number>> = {};
  const margins: Record<string, number | null> = {};
  const verdicts: Record<string, Status> = {};
  for (const [k, r] of rows) {
    counts[r.verdict] = (counts[r.verdict] ?? 0) + 1;
    margins[k] = r.margin;
    verdicts[k] = r.verdict;
  }
  return { commit, loaded: rec.ok, problems: rec.problems, ...(rec.firstProblem ? { firstProblem: `${commit.short}:${rec.firstProblem}` } : {}), counts, margins, verdicts };
}

/** When each waiver was added, changed, removed (by which commit) and when it expired. */
function waiverEvents(changed: Commit[], keys: Map<string, string>, records: Map<string, RevisionRecord>, parentsOf: (c: Commit) => string[], today?: string): WaiverEvent[] {
  const events: WaiverEvent[] = [];
  const sig = (w: WaiverSpec) => canonicalJson([w.rule, w.structures, w.expires, w.owner, w.approvedBy, w.reason, w.stillWithin ?? null]);
  let last: RevisionRecord | undefined;
  let lastDate = '';
  for (const c of changed) {
    const rec = records.get(keys.get(c.oid)!)!;
    if (!rec.ok) continue;
    const parent = parentsOf(c).map((p) => records.get(keys.get(p)!)!).find((r) => r.ok);
    const was = new Map((parent?.waivers ?? []).map((w) => [w.id, w]));
    const now = new Map(rec.waivers.map((w) => [w.id, w]));
    const info = infoOf(c);
    const base = (w: WaiverSpec) => ({ waiver: w.id, rule: w.rule, approvedBy: w.approvedBy, owner: w.owner, expires: w.expires, commit: info, date: c.date });
    for (const [id, w] of now) {
      const old = was.get(id);
      if (!old) events.push({ kind: 'added', ...base(w) });
      else if (sig(old) !== sig(w)) events.push({ kind: 'changed', ...base(w) });
    }
    for (const [id, w] of was) if (!now.has(id)) events.push({ kind: 'removed', ...base(w) });
    last = rec;
    lastDate = dayOf(c.date);
  }
  // Expiry: a waiver of the newest revision whose last day has passed (today, or the newest commit).
  const until = today ?? lastDate;
  for (const w of last?.waivers ?? []) {
    if (!isExpired(w.expires, until)) continue;
    const failing = (last?.rows ?? []).filter((r) => r.status === 'fail' && r.rule === w.rule && w.structures.includes(r.structure)).map(rowKey);
    events.push({ kind: 'expired', waiver: w.id, rule: w.rule, approvedBy: w.approvedBy, owner: w.owner, expires: w.expires, date: nextDay(w.expires), failsAgain: failing });
  }
  return events.sort((a, b) => (a.date < b.date ? -1 : a.date > b.date ? 1 : 0));
}

function nextDay(day: string): string {
  const t = Date.parse(`${day}T00:00:00Z`);
  return Number.isNaN(t) ? day : new Date(t + 86_400_000).toISOString().slice(0, 10);
}

/** `geometry.height 1.9 µm → 2.1 µm at structures/storage-node.yaml:10` */
export function changeText(c: InputChange): string {
  if (c.note !== undefined) return `${c.name} ${c.note}`;
  const arrow = c.from !== undefined && c.to !== undefined ? `${c.from} → ${c.to}` : c.to !== undefined ? `added: ${c.to}` : `removed: ${c.from ?? ''}`;
  return `${c.name} ${arrow}${c.at ? ` at ${c.at}` : ''}`;
}

