// A handbook held in memory (path → file contents): for tests, and for anything that has the files
// but no file system (a browser, a revision already read). Folders are implied by the paths.
import { byCodePoint } from '../diagnostics/diagnostic.ts';
import { MAX_FILE_BYTES, type EntryKind, type HandbookSource, type ReadOutcome, type SourceEntry } from './source.ts';

export class MemorySource implements HandbookSource {
  readonly label: string;
  private readonly files = new Map<string, Uint8Array>();

  constructor(
    files: Record<string, string | Uint8Array>,
    readonly root = 'handbook',
    label = '',
  ) {
    this.label = label;
    for (const [path, content] of Object.entries(files)) this.files.set(path, typeof content === 'string' ? new TextEncoder().encode(content) : content);
  }

  kindOf(path: string): EntryKind | 'missing' {
    if (path === '') return 'folder';
    if (this.files.has(path)) return 'file';
    const prefix = `${path}/`;
    for (const p of this.files.keys()) if (p.startsWith(prefix)) return 'folder';
    return 'missing';
  }

  list(path: string): SourceEntry[] {
    const prefix = path === '' ? '' : `${path}/`;
    const names = new Set<string>();
    for (const p of this.files.keys()) if (p.startsWith(prefix)) names.add(p.slice(prefix.length).split('/')[0]!);
    return [...names].sort(byCodePoint).map((n) => {
      const child = `${prefix}${n}`;
      return { path: child, kind: this.kindOf(child) as EntryKind };
    });
  }

  read(path: string): ReadOutcome {
    const bytes = this.files.get(path);
    if (!bytes) return { ok: false, problem: { code: 'file-unreadable', found: 'no such file' } };
    if (bytes.length > MAX_FILE_BYTES) return { ok: false, problem: { code: 'file-too-large', found: `${bytes.length} bytes` } };
    return { ok: true, bytes };
  }
}
