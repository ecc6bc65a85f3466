// The history cache: outcomes by inputs hash, and whole revisions by the hash of their handbook
// tree, kept per fingerprint of the code that computes verdicts (a new engine, a new loader: a new
// cache). It lives in a folder of ours inside the repository's git folder, so it needs no
// .gitignore and goes when the clone goes; it holds nothing that cannot be recomputed, and a cache
// file that does not parse is ignored (and rewritten), never trusted.
import { createHash } from 'node:crypto';
import { mkdirSync, readdirSync, readFileSync, renameSync, writeFileSync } from 'node:fs';
import { dirname, join, relative } from 'node:path';
import { fileURLToPath } from 'node:url';
import process from 'node:process';
import { canonicalJson, shortHash, type Outcome, type OutcomeCache, type VerdictRow } from './rows.ts';
import type { WaiverSpec } from './waive.ts';

/** What a revision gave: its rows before waivers, its waivers, or that it did not load. */
export interface RevisionRecord {
  ok: boolean;
  /** Errors that kept the revision from loading (0 when it loaded). */
  problems: number;
  /** The first of them, worded, for the history listing. */
  firstProblem?: string;
  rows: VerdictRow[];
  waivers: WaiverSpec[];
}

let fingerprintMemo: string | undefined;

/**
 * A hash of the source of everything that decides a verdict (loader, checker, engines), so that a
 * cache written by other code is never read. Computed from the files themselves, not a version
 * number that a change could forget to bump.
 */
export function codeFingerprint(): string {
  if (fingerprintMemo) return fingerprintMemo;
  const src = join(dirname(fileURLToPath(import.meta.url)), '..');
  const h = createHash('sha256');
  const walk = (dir: string) => {
    for (const name of readdirSync(dir, { withFileTypes: true }).sort((a, b) => (a.name < b.name ? -1 : a.name > b.name ? 1 : 0))) {
      const p = join(dir, name.name);
      if (name.isDirectory()) walk(p);
      else if (name.name.endsWith('.ts')) h.update(relative(src, p)).update('\0').update(readFileSync(p)).update('\0');
    }
  };
  for (const part of ['model', 'checker', 'engines', 'history/rows.ts']) {
    const p = join(src, part);
    if (part.endsWith('.ts')) h.update(part).update('\0').update(readFileSync(p));
    else walk(p);
  }
  fingerprintMemo = h.digest('hex').slice(0, 16);
  return fingerprintMemo;
}

/** A revision as stored: its rows by reference (most rows repeat from one revision to the next). */
type StoredRevision = Omit<RevisionRecord, 'rows'> & { rows: string[] };

export class HistoryCache implements OutcomeCache {
  private outcomes = new Map<string, Outcome>();
  private revisions = new Map<string, StoredRevision>();
  private rows = new Map<string, VerdictRow>();
  private dirty = false;
  /** Outcomes computed in this run (not found in the cache). */
  computed = 0;

  /** `dir`: where to keep it; undefined keeps it in memory only. */
  constructor(private readonly dir?: string) {
    if (!dir) return;
    const read = <T>(name: string): Array<[string, T]> => {
      try {
        const data = JSON.parse(readFileSync(join(dir, name), 'utf8')) as unknown;
        return Array.isArray(data) ? (data as Array<[string, T]>) : [];
      } catch {
        return [];
      }
    };
    this.outcomes = new Map(read<Outcome>('outcomes.json'));
    this.revisions = new Map(read<StoredRevision>('revisions.json'));
    this.rows = new Map(read<VerdictRow>('rows.json'));
    // A revision whose rows did not all survive (a cache file from a killed run) is not trusted.
    for (const [k, r] of this.revisions) if (!Array.isArray(r.rows) || r.rows.some((id) => !this.rows.has(id))) this.revisions.delete(k);
  }

  /** The cache folder for a repository's git folder and the current code. */
  static folderFor(commonDir: string): string {
    return join(commonDir, 'plumbline-cache', codeFingerprint());
  }

  get(key: string): Outcome | undefined {
    return this.outcomes.get(key);
  }
  set(key: string, outcome: Outcome): void {
    this.outcomes.set(key, outcome);
    this.computed++;
    this.dirty = true;
  }
  revision(key: string): RevisionRecord | undefined {
    const r = this.revisions.get(key);
    return r && { ...r, rows: r.rows.map((id) => this.rows.get(id)!) };
  }
  setRevision(key: string, record: RevisionRecord): void {
    const ids = record.rows.map((row) => {
      const id = shortHash(canonicalJson(row), 20);
      this.rows.set(id, row);
      return id;
    });
    this.revisions.set(key, { ...record, rows: ids });
    this.dirty = true;
  }

  /** Write what changed, each file atomically (a killed run leaves the old cache or the new one). */
  save(): void {
    if (!this.dir || !this.dirty) return;
    try {
      mkdirSync(this.dir, { recursive: true });
      // Rows before the revisions that name them: a run killed between the two leaves rows unused, never missing.
      for (const [name, map] of [
        ['outcomes.json', this.outcomes],
        ['rows.json', this.rows],
        ['revisions.json', this.revisions],
      ] as const) {
        const tmp = join(this.dir, `.${name}.${process.pid}.tmp`);
        writeFileSync(tmp, JSON.stringify([...map]), { flag: 'w' });
        renameSync(tmp, join(this.dir, name));
      }
      this.dirty = false;
    } catch {
      // A cache that cannot be written (a read-only clone) costs time, never a wrong answer.
    }
  }
}
