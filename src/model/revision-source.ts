// A handbook as one git revision held it: the second HandbookSource beside the folder on disk.
// The tree (paths, modes, object ids) is read up front; file contents come from a blob store that
// the git layer fills (src/history/git.ts runs the `git` program; nothing here touches a process
// or the file system). The loader cannot tell this source from a folder, except that positions in
// its diagnostics carry the revision (`label`).
import { byCodePoint } from '../diagnostics/diagnostic.ts';
import { MAX_FILE_BYTES, type EntryKind, type HandbookSource, type ReadOutcome, type SourceEntry } from './source.ts';

/** One entry of a revision's tree, by its path relative to the handbook root. */
export interface TreeEntry {
  path: string;
  kind: EntryKind;
  /** Object id (blob for files, tree for folders). */
  oid: string;
  /** Git's file mode (100644, 100755, 040000, 120000 for a link, 160000 for a submodule). */
  mode: string;
  what?: string;
  problem?: SourceEntry['problem'];
}

/** The contents of blobs by object id; `size` is known before the bytes are. */
export interface BlobStore {
  size(oid: string): number | undefined;
  bytes(oid: string): Uint8Array | undefined;
}

export class RevisionSource implements HandbookSource {
  private readonly byPath = new Map<string, TreeEntry>();
  private readonly children = new Map<string, TreeEntry[]>();

  /**
   * @param label the revision as shown with positions (a short commit id)
   * @param root  how messages name the handbook (`abc1234:handbook/`)
   * @param entries every entry of the handbook's tree that loading may visit
   */
  constructor(
    readonly label: string,
    readonly root: string,
    entries: readonly TreeEntry[],
    private readonly blobs: BlobStore,
  ) {
    this.children.set('', []);
    for (const e of entries) {
      this.byPath.set(e.path, e);
      const parent = e.path.includes('/') ? e.path.slice(0, e.path.lastIndexOf('/')) : '';
      let list = this.children.get(parent);
      if (!list) this.children.set(parent, (list = []));
      list.push(e);
    }
    for (const list of this.children.values()) list.sort((a, b) => byCodePoint(a.path, b.path));
  }

  kindOf(path: string): EntryKind | 'missing' {
    if (path === '') return 'folder';
    return this.byPath.get(path)?.kind ?? 'missing';
  }

  list(path: string): SourceEntry[] {
    if (path !== '' && this.byPath.get(path)?.kind !== 'folder') return [];
    return (this.children.get(path) ?? []).map((e) => (e.kind === 'other' ? { path: e.path, kind: e.kind, what: e.what, problem: e.problem } : { path: e.path, kind: e.kind }));
  }

  read(path: string): ReadOutcome {
    const e = this.byPath.get(path);
    if (!e) return { ok: false, problem: { code: 'file-unreadable', found: 'no such file in this revision' } };
    if (e.kind === 'folder') return { ok: false, problem: { code: 'not-a-regular-file', found: 'a folder' } };
    if (e.kind === 'other') return { ok: false, problem: e.problem === 'outside-handbook' ? { code: 'outside-handbook', found: e.what ?? '' } : { code: 'not-a-regular-file', found: e.what ?? 'not a regular file' } };
    const size = this.blobs.size(e.oid);
    if (size !== undefined && size > MAX_FILE_BYTES) return { ok: false, problem: { code: 'file-too-large', found: `${size} bytes` } };
    const bytes = this.blobs.bytes(e.oid);
    if (!bytes) return { ok: false, problem: { code: 'file-unreadable', found: `object ${e.oid.slice(0, 12)} is missing from the repository` } };
    return { ok: true, bytes };
  }
}
