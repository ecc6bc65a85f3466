// The commands that read the handbook's git history or write beside it: the ledger
// (`check --ledger [--verify]`), `history` and `diff`. Loaded only by the commands that use them.
import process from 'node:process';
import type { Handbook } from '../model/types.ts';
import type { Results, Verdict } from '../checker/evaluate.ts';
import { formatDiagnostics } from '../diagnostics/messages.ts';
import { Refusal } from '../diagnostics/refusal.ts';
import { checkHandbook } from '../pipeline.ts';
import { TOOL_VERSION } from './version.ts';
import { LEDGER_FILE, ledgerDifferences, ledgerText } from '../history/ledger.ts';
import { readLedger, writeLedger } from '../history/ledger-file.ts';
import { evaluateRows } from '../history/rows.ts';
import { waiveRow, waiverSpecsOf } from '../history/waive.ts';
import { GitRepo } from '../history/git.ts';
import { HistoryCache } from '../history/cache.ts';
import { walkHistory } from '../history/history.ts';
import { diffRevisions } from '../history/diff.ts';
import { diffMarkdown, historyText, introducesBlocking, shallowNote, type Links } from '../history/summary.ts';

export interface Io {
  out: (s: string) => void;
  err: (s: string) => void;
}

/** The handbook's ledger text as the engines say it on `on`. */
export function currentLedger(h: Handbook, on: string): string {
  const specs = waiverSpecsOf(h);
  return ledgerText(evaluateRows(h, undefined, (r) => waiveRow(r, specs, on)).rows);
}

/** `check --ledger`: write it (0), or with `verify` compare it with the committed one (0 same, 1 stale). */
export function runLedger(root: string, h: Handbook, on: string, verify: boolean, io: Io): number {
  const text = currentLedger(h, on);
  if (!verify) {
    const what = writeLedger(root, text);
    io.out(what === 'unchanged' ? `${LEDGER_FILE} is up to date` : `wrote ${LEDGER_FILE} (${text.split('\n').length - 3} verdicts)`);
    return 0;
  }
  const committed = readLedger(root);
  if (committed === null) {
    io.err(`${LEDGER_FILE}: there is no ledger to verify; write it with \`plumbline check --ledger\` and commit it`);
    return 1;
  }
  if ('problem' in committed) {
    io.err(`${LEDGER_FILE}: cannot be read (${committed.problem})`);
    return 1;
  }
  const { differences, header } = ledgerDifferences(committed.text, text);
  if (!differences.length && !header) {
    io.out(`${LEDGER_FILE} is up to date`);
    return 0;
  }
  const lines = [`${LEDGER_FILE} is stale: ${differences.length} verdict line${differences.length === 1 ? '' : 's'} differ${differences.length === 1 ? 's' : ''}${header ? ' (and its header)' : ''}; run \`plumbline check --ledger\` and commit the result`];
  for (const d of differences) {
    if (d.was !== undefined) lines.push(`- ${d.was}`);
    if (d.now !== undefined) lines.push(`+ ${d.now}`);
  }
  io.err(lines.join('\n'));
  return 1;
}

function cacheFor(repo: GitRepo): HistoryCache {
  return new HistoryCache(process.env.PLUMBLINE_CACHE === 'off' ? undefined : HistoryCache.folderFor(repo.commonDir));
}

export interface HistoryFlags {
  since?: string;
  json?: boolean;
  firstParent?: boolean;
  moved: number;
  on: string;
}

/** A progress bar on stderr, only when it is a terminal (never in --json, never in a log). */
async function progressBar(enabled: boolean): Promise<{ update: (done: number, total: number) => void; stop: () => void }> {
  if (!enabled || !process.stderr.isTTY || !process.stdout.isTTY) return { update: () => {}, stop: () => {} };
  const { SingleBar, Presets } = (await import('cli-progress')).default;
  const bar = new SingleBar({ format: 'evaluating revisions {bar} {value}/{total}', stream: process.stderr, clearOnComplete: true, hideCursor: true }, Presets.shades_classic);
  let started = false;
  return {
    update: (done, total) => {
      if (!started) {
        bar.start(total, 0);
        started = true;
      }
      bar.update(done);
    },
    stop: () => started && bar.stop(),
  };
}

export async function runHistory(root: string, subject: string | undefined, flags: HistoryFlags, io: Io): Promise<number> {
  const repo = GitRepo.at(root);
  const cache = cacheFor(repo);
  const bar = await progressBar(!flags.json);
  let report;
  try {
    report = walkHistory(repo, cache, { since: flags.since, firstParent: flags.firstParent, moved: flags.moved, subject, today: flags.on, onProgress: bar.update });
  } finally {
    bar.stop();
  }
  cache.save();
  if (flags.json) io.out(JSON.stringify({ ...report, ...(report.shallow ? { note: shallowNote() } : {}) }, null, 2));
  else io.out(historyText(report, root));
  return 0;
}

export interface DiffFlags {
  json?: boolean;
  moved: number;
  on: string;
}

export function runDiff(root: string, base: string, head: string | undefined, links: Links, flags: DiffFlags, io: Io): number {
  const repo = GitRepo.at(root);
  const cache = cacheFor(repo);
  const d = diffRevisions(repo, cache, root, base, head, flags.on, flags.moved);
  cache.save();
  const headName = d.head === 'working tree' ? 'working tree' : d.head.short;
  for (const [side, rec] of [
    [d.base.short, d.baseRecord],
    [headName, d.headRecord],
  ] as const) {
    if (!rec.ok) io.err(`the handbook does not load at ${side} (${rec.problems} problem${rec.problems === 1 ? '' : 's'}${rec.firstProblem ? `; first: ${rec.firstProblem}` : ''}); nothing was compared`);
  }
  if (!d.baseRecord.ok || !d.headRecord.ok) return 2;
  const blocking = introducesBlocking(d.transitions);
  if (flags.json) io.out(JSON.stringify({ base: d.base, head: d.head, introduces_blocking_failure: blocking.length > 0, transitions: d.transitions }, null, 2));
  else io.out(diffMarkdown({ base: d.base.short, head: headName, transitions: d.transitions }, links));
  return blocking.length ? 1 : 0;
}


/** `check --sarif FILE [--baseline REV]`: the SARIF 2.1.0 log, written atomically. */
export async function runSarif(root: string, h: Handbook, results: Results, file: string, baseline: string | undefined, on: string, io: Io): Promise<void> {
  const { toSarif } = await import('../report/sarif.ts');
  const { writeOwnFile } = await import('../history/own-file.ts');
  let uriBase = '';
  let revision: { commit: string } | undefined;
  let baselineVerdicts: Verdict[] | undefined;
  let repo: GitRepo | undefined;
  try {
    repo = GitRepo.at(root);
  } catch (err) {
    if (baseline !== undefined) throw err; // a baseline needs the repository; a plain log does not
  }
  if (repo) {
    uriBase = repo.prefix ? `${repo.prefix}/` : '';
    try {
      revision = { commit: repo.resolveCommit('HEAD') };
    } catch {
      revision = undefined; // no commit yet
    }
  }
  if (baseline !== undefined && repo) {
    const oid = repo.resolveCommit(baseline);
    const base = checkHandbook(repo.source(oid), { on });
    if (!base.ok) {
      io.err(formatDiagnostics(base.diagnostics, 'nothing was written'));
      throw new Refusal('baseline-unloadable', { reason: `the handbook does not load at ${oid.slice(0, 7)}` });
    }
    baselineVerdicts = base.results.verdicts;
  }
  const log = toSarif({ handbook: h, results, toolVersion: TOOL_VERSION, uriBase, ...(h.meta.links?.report ? { siteUrl: h.meta.links.report } : {}), ...(revision ? { revision } : {}), ...(baselineVerdicts ? { baseline: baselineVerdicts } : {}) });
  writeOwnFile(file, `${JSON.stringify(log, null, 2)}\n`, (old) => {
    try {
      const o = JSON.parse(old) as { runs?: Array<{ tool?: { driver?: { name?: string } } }> };
      return o.runs?.[0]?.tool?.driver?.name === 'plumbline';
    } catch {
      return false;
    }
  });
  io.err(`wrote the SARIF log ${file} (${log.runs[0]!.results.length} results)`);
}
