// A handbook folder on disk as a HandbookSource. Reads regular files only, only inside the
// handbook's real path (a link may point elsewhere inside it, never out), and at most
// MAX_FILE_BYTES of each: a link to /etc/passwd, a FIFO or /dev/zero is a diagnostic, not a read.
import { closeSync, constants, fstatSync, lstatSync, openSync, readdirSync, readSync, realpathSync, statSync } from 'node:fs';
import { isAbsolute, join, relative, sep } from 'node:path';
import { byCodePoint } from '../diagnostics/diagnostic.ts';
import { loadHandbook, type LoadResult } from './load.ts';
import { MAX_FILE_BYTES, type EntryKind, type HandbookSource, type ReadOutcome, type SourceEntry } from './source.ts';

/** `child` is `parent` or lies inside it (both real, absolute paths). */
export function isInside(parent: string, child: string): boolean {
  const rel = relative(parent, child);
  return rel === '' || (!rel.startsWith(`..${sep}`) && rel !== '..' && !isAbsolute(rel));
}

function describeStat(st: { isFIFO(): boolean; isSocket(): boolean; isCharacterDevice(): boolean; isBlockDevice(): boolean }): string {
  if (st.isFIFO()) return 'a FIFO (named pipe)';
  if (st.isSocket()) return 'a socket';
  if (st.isCharacterDevice() || st.isBlockDevice()) return 'a device';
  return 'neither a file nor a folder';
}

type Resolved = { kind: EntryKind; real?: string; what?: string } | { kind: 'missing' };

export class FolderSource implements HandbookSource {
  readonly label = '';
  private readonly realRoot: string | null;

  constructor(readonly root: string) {
    let real: string | null = null;
    try {
      real = realpathSync(root);
    } catch {
      real = null;
    }
    this.realRoot = real;
  }

  /** Follow links, then check the target is inside the handbook and say what it is. */
  private resolve(path: string): Resolved {
    if (this.realRoot === null) return { kind: 'missing' };
    const abs = join(this.realRoot, ...path.split('/').filter(Boolean));
    let linked = false;
    try {
      linked = lstatSync(abs).isSymbolicLink();
    } catch {
      return { kind: 'missing' };
    }
    let real: string;
    try {
      real = realpathSync(abs);
    } catch {
      return { kind: 'other', what: 'a link to nothing' };
    }
    if (!isInside(this.realRoot, real)) return { kind: 'other', what: linked ? 'a link to outside the handbook' : 'outside the handbook' };
    const st = statSync(real);
    if (st.isFile()) return { kind: 'file', real };
    if (st.isDirectory()) return { kind: 'folder', real };
    return { kind: 'other', what: describeStat(st) };
  }

  kindOf(path: string): EntryKind | 'missing' {
    return this.resolve(path).kind;
  }

  list(path: string): SourceEntry[] {
    const r = this.resolve(path);
    if (r.kind !== 'folder' || !('real' in r) || !r.real) return [];
    let names: string[];
    try {
      names = readdirSync(r.real);
    } catch {
      return [];
    }
    return names.sort(byCodePoint).map((name) => {
      const child = path === '' ? name : `${path}/${name}`;
      const c = this.resolve(child);
      return { path: child, kind: c.kind === 'missing' ? 'other' : c.kind, ...('what' in c && c.what ? { what: c.what } : c.kind === 'missing' ? { what: 'gone while listing' } : {}) };
    });
  }

  read(path: string): ReadOutcome {
    const r = this.resolve(path);
    if (r.kind === 'missing') return { ok: false, problem: { code: 'file-unreadable', found: 'no such file' } };
    if (r.kind === 'other') {
      const code = r.what?.includes('outside') ? 'outside-handbook' : 'not-a-regular-file';
      return { ok: false, problem: { code, found: r.what ?? 'not a regular file' } };
    }
    if (r.kind === 'folder' || !r.real) return { ok: false, problem: { code: 'not-a-regular-file', found: 'a folder' } };
    // O_NONBLOCK: should a FIFO be swapped in after the check above, opening it must not hang;
    // fstat on the open descriptor then decides what was actually opened.
    let fd: number;
    try {
      fd = openSync(r.real, constants.O_RDONLY | (constants.O_NONBLOCK ?? 0));
    } catch (err) {
      return { ok: false, problem: { code: 'file-unreadable', found: (err as NodeJS.ErrnoException).code ?? 'cannot open' } };
    }
    try {
      const st = fstatSync(fd);
      if (!st.isFile()) return { ok: false, problem: { code: 'not-a-regular-file', found: describeStat(st) } };
      if (st.size > MAX_FILE_BYTES) return { ok: false, problem: { code: 'file-too-large', found: `${st.size} bytes` } };
      // Read at most one byte past the limit, so a file that grows while being read is caught too.
      const buf = Buffer.alloc(Math.min(st.size, MAX_FILE_BYTES) + 1);
      let n = 0;
      for (;;) {
        const got = readSync(fd, buf, n, buf.length - n, null);
        if (got === 0) break;
        n += got;
        if (n === buf.length) break;
      }
      if (n > MAX_FILE_BYTES) return { ok: false, problem: { code: 'file-too-large', found: `more than ${MAX_FILE_BYTES} bytes` } };
      return { ok: true, bytes: new Uint8Array(buf.buffer, buf.byteOffset, n) };
    } catch (err) {
      return { ok: false, problem: { code: 'file-unreadable', found: (err as NodeJS.ErrnoException).code ?? 'read failed' } };
    } finally {
      closeSync(fd);
    }
  }
}

/** One file named on the command line (`eval FILE`): that file and nothing else, under the same limits. */
export class SingleFileSource implements HandbookSource {
  readonly label = '';
  private readonly inner: FolderSource;
  readonly file: string;
  constructor(absPath: string) {
    const dir = join(absPath, '..');
    this.inner = new FolderSource(dir);
    this.root = dir;
    this.file = relative(dir, absPath);
  }
  readonly root: string;
  kindOf(path: string): EntryKind | 'missing' {
    return path === this.file ? this.inner.kindOf(path) : 'missing';
  }
  list(): SourceEntry[] {
    return [];
  }
  read(path: string): ReadOutcome {
    return path === this.file ? this.inner.read(path) : { ok: false, problem: { code: 'file-unreadable', found: 'no such file' } };
  }
}

/** Load the handbook in a folder on disk. */
export function loadHandbookFolder(root: string): LoadResult {
  return loadHandbook(new FolderSource(root));
}
