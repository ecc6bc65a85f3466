// A handbook folder on disk as a HandbookSource. Reads regular files only, only inside the
// handbook's real path (a link may point elsewhere inside it, never out), and at most
// MAX_FILE_BYTES of each: a link to /etc/passwd, a FIFO or /dev/zero is a diagnostic, not a read.
import { closeSync, constants, fstatSync, lstatSync, openSync, readdirSync, readSync, realpathSync, statSync } from 'node:fs';
import { basename, dirname, isAbsolute, join, relative, sep } from 'node:path';
import process from 'node:process';
import { byCodePoint } from '../diagnostics/diagnostic.ts';
import { MAX_FILE_BYTES, escapeName, type EntryKind, type HandbookSource, type ReadOutcome, type SourceEntry } from './source.ts';

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

type Resolved = { kind: 'file' | 'folder'; real: string } | { kind: 'other'; what: string; problem: 'outside-handbook' | 'not-a-regular-file' } | { kind: 'missing' };

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
      return { kind: 'other', what: 'a link to nothing', problem: 'not-a-regular-file' };
    }
    if (!isInside(this.realRoot, real)) return { kind: 'other', what: linked ? 'a link to outside the handbook' : 'outside the handbook', problem: 'outside-handbook' };
    let st;
    try {
      st = statSync(real);
    } catch {
      return { kind: 'missing' }; // gone between the two looks (an editor saving by rename)
    }
    if (st.isFile()) return { kind: 'file', real };
    if (st.isDirectory()) return { kind: 'folder', real };
    return { kind: 'other', what: describeStat(st), problem: 'not-a-regular-file' };
  }

  kindOf(path: string): EntryKind | 'missing' {
    return this.resolve(path).kind;
  }

  identity(path: string): string | undefined {
    const r = this.resolve(path);
    return r.kind === 'folder' ? r.real : undefined;
  }

  list(path: string): SourceEntry[] {
    const r = this.resolve(path);
    if (r.kind !== 'folder') return [];
    let raw: Buffer[];
    try {
      raw = readdirSync(r.real, { encoding: 'buffer' });
    } catch {
      return [];
    }
    const names = raw.map((b) => escapeName(b));
    return names.sort((a, b) => byCodePoint(a.text, b.text)).flatMap(({ text: name, valid }): SourceEntry[] => {
      const child = path === '' ? name : `${path}/${name}`;
      if (!valid) return [{ path: child, kind: 'other', what: 'a name that is not UTF-8', problem: 'name-not-utf8' }];
      const c = this.resolve(child);
      if (c.kind === 'missing') return []; // gone while listing
      return [c.kind === 'other' ? { path: child, kind: 'other', what: c.what, problem: c.problem } : { path: child, kind: c.kind }];
    });
  }

  read(path: string): ReadOutcome {
    const r = this.resolve(path);
    if (r.kind === 'missing') return { ok: false, problem: { code: 'file-unreadable', found: 'no such file' } };
    if (r.kind === 'other') return { ok: false, problem: { code: r.problem, found: r.what } };
    if (r.kind === 'folder') return { ok: false, problem: { code: 'not-a-regular-file', found: 'a folder' } };
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

/**
 * One file named on the command line (`eval FILE`): that file and nothing else, under the same
 * limits. Its path in messages is as the user gave it, relative to the working folder, so a
 * terminal or editor can open `sub/slot.yaml:3:7`.
 */
export class SingleFileSource implements HandbookSource {
  readonly label = '';
  readonly root: string;
  /** The file's path in messages. */
  readonly file: string;
  private readonly inner: FolderSource;
  private readonly name: string;
  constructor(absPath: string, shownAs = relative(process.cwd(), absPath).split(sep).join('/')) {
    this.root = dirname(absPath);
    this.inner = new FolderSource(this.root);
    this.name = basename(absPath);
    this.file = shownAs;
  }
  kindOf(path: string): EntryKind | 'missing' {
    return path === this.file ? this.inner.kindOf(this.name) : 'missing';
  }
  list(): SourceEntry[] {
    return [];
  }
  read(path: string): ReadOutcome {
    return path === this.file ? this.inner.read(this.name) : { ok: false, problem: { code: 'file-unreadable', found: 'no such file' } };
  }
}
