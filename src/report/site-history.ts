// What a build reads from git for the report: the revision it is built from, and the handbook's
// history (through the same walk and cache as `plumbline history`). Outside a git repository, or
// in one without commits, the report simply has no history.
import process from 'node:process';
import { Refusal } from '../diagnostics/refusal.ts';
import { HistoryCache } from '../history/cache.ts';
import { GitRepo } from '../history/git.ts';
import { walkHistory } from '../history/history.ts';
import { commitUrl, shallowNote, type Links } from '../history/summary.ts';
import { HANDBOOK_INPUTS } from '../model/source.ts';
import { historyPages, type BuiltFrom, type HistoryPages } from './history-pages.ts';
import { urls } from '../model/urls.ts';

export function siteHistory(root: string, links: Links, tool: string, today: string): HistoryPages | undefined {
  let repo: GitRepo;
  let head: string;
  try {
    repo = GitRepo.at(root);
    head = repo.resolveCommit('HEAD');
  } catch (err) {
    if (err instanceof Refusal) return undefined; // not a repository, or no commit yet
    throw err;
  }
  const cache = new HistoryCache(process.env.PLUMBLINE_CACHE === 'off' ? undefined : HistoryCache.folderFor(repo.commonDir));
  const h = walkHistory(repo, cache, { today });
  cache.save();
  const [date] = repo.git(['show', '-s', '--format=%cI', head]).toString('utf8').split('\n');
  // Uncommitted changes to what loading reads: the report then shows more than the commit.
  const paths = [...HANDBOOK_INPUTS, 'waivers'].map((p) => (repo.prefix ? `${repo.prefix}/${p}` : p));
  const dirty = repo.git(['status', '--porcelain', '--untracked-files=all', '--', ...paths.map((p) => `:(top)${p}`)]).toString('utf8').trim() !== '';
  const url = commitUrl(links, head);
  const builtFrom: BuiltFrom = { commit: head, short: head.slice(0, 7), date: date ?? '', dirty, tool, ...(url ? { url } : {}) };
  return historyPages(h, links, urls, builtFrom, h.shallow ? shallowNote() : undefined);
}
