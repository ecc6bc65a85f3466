// The handbook's repository, read through the `git` program itself (no re-implementation of git).
// Objects are read in batches through `git cat-file --batch`: one process per batch of trees or
// blobs, however many revisions the batch serves. Trees and blobs are immutable, so each is read
// once per run whatever number of revisions share it.
import { execFileSync } from 'node:child_process';
import { Refusal } from '../diagnostics/refusal.ts';
import process from 'node:process';
import { readFileSync, realpathSync } from 'node:fs';
import { join, relative, resolve, sep } from 'node:path';
import { HANDBOOK_INPUTS, MAX_FILE_BYTES, escapeName, extName, joinPath } from '../model/source.ts';
import { RevisionSource, type BlobStore, type TreeEntry } from '../model/revision-source.ts';

/** Why the repository could not be read: a refusal (worded in messages.ts, exit 2). */
function gitProblem(code: 'git-missing' | 'not-a-repository' | 'unknown-revision' | 'git-failed', reason: string): Refusal {
  return new Refusal(code, { reason });
}

export interface Commit {
  oid: string;
  short: string;
  parents: string[];
  author: string;
  email: string;
  /** Author date as git gives it (ISO 8601 with the author's offset). */
  date: string;
  subject: string;
}

/** The folders below the handbook root that loading walks (files at the root are listed only). */
const INPUT_FOLDERS = new Set<string>([...HANDBOOK_INPUTS.filter((n) => !n.endsWith('.yaml')), 'waivers']);

interface RawEntry {
  mode: string;
  name: string;
  valid: boolean;
  oid: string;
}

/** Read `<oid> <type> <size>\n<bytes>\n` records (or `<name> missing\n`) from cat-file --batch. */
function parseBatch(out: Buffer, withContent: boolean): Array<{ oid: string; type: string; size: number; data?: Buffer } | null> {
  const records: Array<{ oid: string; type: string; size: number; data?: Buffer } | null> = [];
  let at = 0;
  while (at < out.length) {
    const nl = out.indexOf(0x0a, at);
    if (nl < 0) break;
    const header = out.subarray(at, nl).toString('utf8');
    at = nl + 1;
    const parts = header.split(' ');
    if (parts.length !== 3 || !/^[0-9a-f]+$/.test(parts[0]!)) {
      records.push(null); // "<name> missing" or "ambiguous"
      continue;
    }
    const size = Number(parts[2]);
    const rec: { oid: string; type: string; size: number; data?: Buffer } = { oid: parts[0]!, type: parts[1]!, size };
    if (withContent) {
      rec.data = out.subarray(at, at + size);
      at += size + 1;
    }
    records.push(rec);
  }
  return records;
}

/** A tree object's entries: `<mode> <name>\0<raw object id>` repeated. */
function parseTree(data: Buffer, oidBytes: number): RawEntry[] {
  const entries: RawEntry[] = [];
  let at = 0;
  while (at < data.length) {
    const space = data.indexOf(0x20, at);
    const nul = data.indexOf(0x00, space);
    const mode = data.subarray(at, space).toString('ascii').padStart(6, '0');
    const { text, valid } = escapeName(new Uint8Array(data.buffer, data.byteOffset + space + 1, nul - space - 1));
    const oid = data.subarray(nul + 1, nul + 1 + oidBytes).toString('hex');
    entries.push({ mode, name: text, valid, oid });
    at = nul + 1 + oidBytes;
  }
  return entries;
}

function isYamlName(path: string): boolean {
  return /^\.ya?ml$/i.test(extName(path));
}

export class GitRepo implements BlobStore {
  /** The repository's top folder (real path). */
  readonly top: string;
  /** The handbook's folder inside the repository, '/'-separated, '' at the top. */
  readonly prefix: string;
  /** Git's own folder shared by all worktrees (caches live in a folder of ours inside it). */
  readonly commonDir: string;
  readonly shallow: boolean;
  /** Commits at the edge of a shallow clone: their parents are missing, so they are a starting point, not new. */
  readonly shallowRoots = new Set<string>();
  private readonly oidBytes: number;
  private readonly trees = new Map<string, RawEntry[]>();
  private readonly sizes = new Map<string, number>();
  private readonly contents = new Map<string, Uint8Array>();
  private readonly snapshots = new Map<string, TreeEntry[]>();
  private readonly roots = new Map<string, string | null>();
  /** git processes started (for the benchmark and the tests of batching). */
  spawned = 0;

  private constructor(top: string, prefix: string, commonDir: string, shallow: boolean, oidLength: number) {
    this.top = top;
    this.prefix = prefix;
    this.commonDir = commonDir;
    this.shallow = shallow;
    this.oidBytes = oidLength / 2;
  }

  /** The repository holding the handbook folder `root`. */
  static at(root: string): GitRepo {
    const run = (args: string[]) => runGit(resolve(root), args).toString('utf8').trim();
    let lines: string[];
    try {
      lines = run(['rev-parse', '--show-toplevel', '--git-common-dir', '--is-shallow-repository']).split('\n');
    } catch (err) {
      if (err instanceof Refusal && err.code === 'git-failed') throw gitProblem('not-a-repository', `${root} is not inside a git repository`);
      throw err;
    }
    const [top, common, shallow] = lines as [string, string, string];
    const realTop = realpathSync(top);
    const realRoot = realpathSync(root);
    const rel = relative(realTop, realRoot);
    if (rel.startsWith('..')) throw gitProblem('not-a-repository', `${root} is not inside the repository at ${top}`);
    const head = (() => {
      try {
        return run(['rev-parse', '--verify', '--quiet', 'HEAD']);
      } catch {
        return '';
      }
    })();
    const repo = new GitRepo(realTop, rel.split(sep).join('/'), resolve(realTop, common), shallow === 'true', head.length === 64 ? 64 : 40);
    if (repo.shallow) {
      try {
        for (const oid of readFileSync(join(repo.commonDir, 'shallow'), 'utf8').split('\n')) if (oid.trim()) repo.shallowRoots.add(oid.trim());
      } catch {
        // no list: every root is then taken as a root
      }
    }
    return repo;
  }

  /** Run git in the repository; stdout as bytes. */
  git(args: string[], input?: string): Buffer {
    this.spawned++;
    return runGit(this.top, args, input);
  }

  /** The full object id of a commit a user names (a branch, a tag, `HEAD~3`, a short id). */
  resolveCommit(rev: string): string {
    if (rev.startsWith('-')) throw gitProblem('unknown-revision', `"${rev}" is not a revision`);
    try {
      return this.git(['rev-parse', '--verify', '--quiet', '--end-of-options', `${rev}^{commit}`]).toString('utf8').trim();
    } catch {
      throw gitProblem('unknown-revision', `no commit "${rev}" in ${this.top}`);
    }
  }

  /** Commits reachable from `head` (and not from `since`), parents before children and otherwise by commit date. */
  commits(head: string, since?: string, firstParent = false): Commit[] {
    const range = since ? [`${since}..${head}`] : [head];
    const out = this.git(['log', '--date-order', '--reverse', ...(firstParent ? ['--first-parent'] : []), '-z', '--format=%H%x1f%P%x1f%h%x1f%an%x1f%ae%x1f%aI%x1f%s', '--end-of-options', ...range]).toString('utf8');
    return out
      .split('\0')
      .filter((r) => r.trim() !== '')
      .map((r) => {
        const [oid, parents, short, author, email, date, subject] = r.replace(/^\n/, '').split('\x1f') as [string, string, string, string, string, string, string];
        return { oid, parents: parents ? parents.split(' ') : [], short, author, email, date, subject };
      });
  }

  /** Read the trees of many commits at once (a batch per folder depth, not per commit). */
  prefetchTrees(commits: readonly string[]): void {
    const todo = commits.filter((c) => !this.roots.has(c));
    if (todo.length) {
      const names = todo.map((c) => (this.prefix ? `${c}:${this.prefix}` : `${c}^{tree}`));
      const recs = parseBatch(this.git(['cat-file', '--batch-check'], names.join('\n') + '\n'), false);
      todo.forEach((c, i) => {
        const r = recs[i];
        this.roots.set(c, r && r.type === 'tree' ? r.oid : null);
      });
    }
    // Breadth first: the root trees, then the input folders in them, then their subfolders.
    let level: Array<{ oid: string; depth: number }> = [];
    for (const c of commits) {
      const root = this.roots.get(c);
      if (root) level.push({ oid: root, depth: 0 });
    }
    while (level.length) {
      const need = [...new Set(level.filter((t) => !this.trees.has(t.oid)).map((t) => t.oid))];
      if (need.length) {
        const recs = parseBatch(this.git(['cat-file', '--batch'], need.join('\n') + '\n'), true);
        need.forEach((oid, i) => this.trees.set(oid, recs[i]?.data ? parseTree(recs[i]!.data!, this.oidBytes) : []));
      }
      const next: Array<{ oid: string; depth: number }> = [];
      const seen = new Set<string>();
      for (const t of level) {
        for (const e of this.trees.get(t.oid) ?? []) {
          if (e.mode !== '040000' || (t.depth === 0 && !INPUT_FOLDERS.has(e.name))) continue;
          if (t.depth >= 16 || seen.has(e.oid)) continue;
          seen.add(e.oid);
          next.push({ oid: e.oid, depth: t.depth + 1 });
        }
      }
      level = next;
    }
  }

  /** Every entry of the handbook at `commit` that loading may visit; [] when the folder is absent. */
  snapshot(commit: string): TreeEntry[] {
    const cached = this.snapshots.get(commit);
    if (cached) return cached;
    this.prefetchTrees([commit]);
    const root = this.roots.get(commit);
    const entries: TreeEntry[] = [];
    const walk = (treeOid: string, dir: string, depth: number) => {
      for (const e of this.trees.get(treeOid) ?? []) {
        const path = joinPath(dir, e.name);
        entries.push(entryOf(path, e));
        if (e.valid && e.mode === '040000' && (depth > 0 || INPUT_FOLDERS.has(e.name)) && this.trees.has(e.oid)) walk(e.oid, path, depth + 1);
      }
    };
    if (root) walk(root, '', 0);
    this.snapshots.set(commit, entries);
    return entries;
  }

  /** Read the contents loading will ask for (YAML files, and the ledger), a batch for all of them. */
  prefetchBlobs(snapshots: ReadonlyArray<readonly TreeEntry[]>, alsoNamed: readonly string[] = []): void {
    const want = new Set<string>();
    for (const entries of snapshots) for (const e of entries) if (e.kind === 'file' && !this.contents.has(e.oid) && (isYamlName(e.path) || alsoNamed.includes(e.path))) want.add(e.oid);
    const oids = [...want].filter((o) => !this.sizes.has(o));
    if (oids.length) {
      const recs = parseBatch(this.git(['cat-file', '--batch-check'], oids.join('\n') + '\n'), false);
      oids.forEach((o, i) => recs[i] && this.sizes.set(o, recs[i]!.size));
    }
    const small = [...want].filter((o) => (this.sizes.get(o) ?? Infinity) <= MAX_FILE_BYTES);
    if (small.length) {
      const recs = parseBatch(this.git(['cat-file', '--batch'], small.join('\n') + '\n'), true);
      small.forEach((o, i) => recs[i]?.data && this.contents.set(o, new Uint8Array(recs[i]!.data!)));
    }
  }

  size(oid: string): number | undefined {
    if (!this.sizes.has(oid)) this.prefetchBlobOids([oid]);
    return this.sizes.get(oid);
  }

  bytes(oid: string): Uint8Array | undefined {
    if (!this.contents.has(oid) && (this.size(oid) ?? Infinity) <= MAX_FILE_BYTES) this.prefetchBlobOids([oid], true);
    return this.contents.get(oid);
  }

  private prefetchBlobOids(oids: string[], content = false): void {
    const recs = parseBatch(this.git(['cat-file', content ? '--batch' : '--batch-check'], oids.join('\n') + '\n'), content);
    oids.forEach((o, i) => {
      const r = recs[i];
      if (!r) return;
      this.sizes.set(o, r.size);
      if (r.data) this.contents.set(o, new Uint8Array(r.data));
    });
  }

  /** The handbook as `commit` held it. */
  source(commit: string, short = commit.slice(0, 7)): RevisionSource {
    const entries = this.snapshot(commit);
    return new RevisionSource(short, `${short}:${this.prefix ? `${this.prefix}/` : ''}`, entries, this);
  }

  /** Renames inside the handbook between two commits, or a commit and the working tree (git's own detection), old path → new path. */
  renames(from: string, to?: string): Map<string, string> {
    const out = this.git(['diff', '--no-ext-diff', '--name-status', '-M', '-z', from, ...(to ? [to] : []), '--', this.prefix ? `${this.prefix}/` : '.']).toString('utf8').split('\0');
    const map = new Map<string, string>();
    for (let i = 0; i < out.length; ) {
      const status = out[i] ?? '';
      if (status.startsWith('R')) {
        map.set(this.relative(out[i + 1]!), this.relative(out[i + 2]!));
        i += 3;
      } else i += status ? 2 : 1;
    }
    return map;
  }

  private relative(repoPath: string): string {
    return this.prefix && repoPath.startsWith(`${this.prefix}/`) ? repoPath.slice(this.prefix.length + 1) : repoPath;
  }
}

function entryOf(path: string, e: RawEntry): TreeEntry {
  if (!e.valid) return { path, kind: 'other', oid: e.oid, mode: e.mode, what: 'a name that is not UTF-8', problem: 'name-not-utf8' };
  if (e.mode === '040000') return { path, kind: 'folder', oid: e.oid, mode: e.mode };
  if (e.mode === '100644' || e.mode === '100755') return { path, kind: 'file', oid: e.oid, mode: e.mode };
  if (e.mode === '120000') return { path, kind: 'other', oid: e.oid, mode: e.mode, what: 'a symbolic link (links are not followed in a revision)', problem: 'not-a-regular-file' };
  if (e.mode === '160000') return { path, kind: 'other', oid: e.oid, mode: e.mode, what: 'a submodule', problem: 'not-a-regular-file' };
  return { path, kind: 'other', oid: e.oid, mode: e.mode, what: `an entry of mode ${e.mode}`, problem: 'not-a-regular-file' };
}

/**
 * The environment git runs in: the user's, without the variables that point git at another
 * repository (a hook exports GIT_DIR and GIT_WORK_TREE; the handbook's own folder decides here),
 * in the C locale, with no pager and no prompts.
 */
function gitEnv(): NodeJS.ProcessEnv {
  const env: NodeJS.ProcessEnv = {};
  for (const [k, v] of Object.entries(process.env)) if (!/^GIT_(DIR|WORK_TREE|INDEX_FILE|OBJECT_DIRECTORY|ALTERNATE_OBJECT_DIRECTORIES|COMMON_DIR|NAMESPACE|CEILING_DIRECTORIES|DISCOVERY_ACROSS_FILESYSTEM)$/.test(k)) env[k] = v;
  return { ...env, LC_ALL: 'C', LANG: 'C', GIT_PAGER: 'cat', GIT_TERMINAL_PROMPT: '0', GIT_OPTIONAL_LOCKS: '0' };
}

/** git with a fixed environment (see gitEnv). */
function runGit(cwd: string, args: string[], input?: string): Buffer {
  try {
    return execFileSync('git', ['-c', 'core.quotepath=off', '-c', 'log.showSignature=false', ...args], {
      cwd,
      input,
      maxBuffer: 1 << 30,
      stdio: ['pipe', 'pipe', 'pipe'],
      env: gitEnv(),
    });
  } catch (err) {
    const e = err as NodeJS.ErrnoException & { stderr?: Buffer };
    if (e.code === 'ENOENT') throw gitProblem('git-missing', 'the git program was not found on PATH');
    throw gitProblem('git-failed', (e.stderr?.toString('utf8') ?? e.message).trim().split('\n')[0] ?? 'git failed');
  }
}
