// `plumbline diff BASE [HEAD]`: the verdicts a change moves, between a revision and another one or
// the working tree. Both sides are judged on the same date, so a waiver that expires between them
// is not mistaken for a change.
import { FolderSource } from '../model/folder-source.ts';
import type { HistoryCache, RevisionRecord } from './cache.ts';
import type { GitRepo } from './git.ts';
import { compareRows, recordOf, rowsAt, structureFileRenames, type CommitInfo, type Transition } from './history.ts';

export interface DiffResult {
  base: { commit: string; short: string };
  head: { commit: string; short: string } | 'working tree';
  /** False when a side did not load (its first problem, worded, is given). */
  baseRecord: RevisionRecord;
  headRecord: RevisionRecord;
  transitions: Transition[];
}

export function diffRevisions(repo: GitRepo, cache: HistoryCache, root: string, base: string, head: string | undefined, on: string, moved: number): DiffResult {
  const baseOid = repo.resolveCommit(base);
  const headOid = head !== undefined ? repo.resolveCommit(head) : undefined;
  const short = (oid: string) => oid.slice(0, 7);
  const baseRecord = recordOf(repo.source(baseOid, short(baseOid)), cache);
  const headRecord = headOid ? recordOf(repo.source(headOid, short(headOid)), cache) : recordOf(new FolderSource(root), cache);
  const info: CommitInfo = headOid ? { oid: headOid, short: short(headOid), author: '', email: '', date: '', subject: '' } : { oid: '', short: 'working tree', author: '', email: '', date: '', subject: '' };
  // Structure files git sees renamed (against the working tree: tracked files only).
  const renames = structureFileRenames(repo, baseOid, headOid);
  const transitions = baseRecord.ok && headRecord.ok ? compareRows(rowsAt(baseRecord, on), rowsAt(headRecord, on), info, moved, renames) : [];
  return { base: { commit: baseOid, short: short(baseOid) }, head: headOid ? { commit: headOid, short: short(headOid) } : 'working tree', baseRecord, headRecord, transitions };
}
