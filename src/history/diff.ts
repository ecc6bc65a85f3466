// `plumbline diff BASE [HEAD]`: the verdicts a change moves, between a revision and another one or
// the working tree. Both sides are judged on the same date, so a waiver that expires between them
// is not mistaken for a change.
import { FolderSource } from '../model/folder-source.ts';
import type { HistoryCache, RevisionRecord } from './cache.ts';
import type { GitRepo } from './git.ts';
import { compareRows, recordOf, type CommitInfo, type Transition } from './history.ts';
import { rowKey, type VerdictRow } from './rows.ts';
import { waiveRow } from './waive.ts';
import { baseName, extName } from '../model/source.ts';

export interface DiffResult {
  base: { commit: string; short: string };
  head: { commit: string; short: string } | 'working tree';
  /** False when a side did not load (its first problem, worded, is given). */
  baseRecord: RevisionRecord;
  headRecord: RevisionRecord;
  transitions: Transition[];
}

function rowsAt(rec: RevisionRecord, on: string): Map<string, VerdictRow> {
  return new Map(rec.rows.map((r) => [rowKey(r), waiveRow(r, rec.waivers, on)]));
}

const stem = (p: string) => baseName(p).slice(0, baseName(p).length - extName(p).length);

export function diffRevisions(repo: GitRepo, cache: HistoryCache, root: string, base: string, head: string | undefined, on: string, moved: number): DiffResult {
  const baseOid = repo.resolveCommit(base);
  const headOid = head !== undefined ? repo.resolveCommit(head) : undefined;
  const short = (oid: string) => oid.slice(0, 7);
  const baseRecord = recordOf(repo.source(baseOid, short(baseOid)), cache);
  const headRecord = headOid ? recordOf(repo.source(headOid, short(headOid)), cache) : recordOf(new FolderSource(root), cache);
  const info: CommitInfo = headOid ? { oid: headOid, short: short(headOid), author: '', email: '', date: '', subject: '' } : { oid: '', short: 'working tree', author: '', email: '', date: '', subject: '' };
  // Structure files git sees renamed (against the working tree: tracked files only).
  const renames = new Map<string, string>();
  for (const [o, n] of repo.renames(baseOid, headOid)) if (o.startsWith('structures/') && n.startsWith('structures/')) renames.set(stem(o), stem(n));
  const transitions = baseRecord.ok && headRecord.ok ? compareRows(rowsAt(baseRecord, on), rowsAt(headRecord, on), info, moved, renames) : [];
  return { base: { commit: baseOid, short: short(baseOid) }, head: headOid ? { commit: headOid, short: short(headOid) } : 'working tree', baseRecord, headRecord, transitions };
}
