// Where a handbook's files come from. The loader reads only through this interface, so it knows
// nothing of the file system (the same loader runs over a folder, a git revision or files held in
// memory). Paths are relative to the handbook, '/'-separated, and never leave it.
import { lineStartsOf, offsetToLineColumn } from './yaml-source.ts';

/** The handbook's own files and folders at its root: what loading reads and serve watches, and
 * what no report may be written into. */
export const HANDBOOK_INPUTS = ['handbook.yaml', 'materials.yaml', 'structures', 'rules', 'waivers'] as const;

/** What a path holds. `other` is anything that is not a regular file or a folder (a FIFO, a
 * device, a socket, a link that leads out of the handbook or nowhere). */
export type EntryKind = 'file' | 'folder' | 'other';

export interface SourceEntry {
  /** Path relative to the handbook root, '/'-separated. */
  path: string;
  kind: EntryKind;
  /** Why an entry is `other` (for messages): "a FIFO", "a link to outside the handbook", ... */
  what?: string;
  /** For `other`: which problem reading it would meet. */
  problem?: 'outside-handbook' | 'not-a-regular-file' | 'name-not-utf8';
}

export type ReadProblem =
  | { code: 'not-a-regular-file'; found: string }
  | { code: 'outside-handbook'; found: string }
  | { code: 'file-too-large'; found: string }
  | { code: 'file-unreadable'; found: string };

export type ReadOutcome = { ok: true; bytes: Uint8Array } | { ok: false; problem: ReadProblem };

export interface HandbookSource {
  /** Shown with positions when the files are not the working tree (a revision); '' otherwise. */
  readonly label: string;
  /** The root as the user named it (for messages). */
  readonly root: string;
  /** What is at a path, or `missing`. */
  kindOf(path: string): EntryKind | 'missing';
  /** The entries of a folder, sorted by name (code-point order). */
  list(path: string): SourceEntry[];
  /** What a folder is, whatever path leads to it (its real path on disk), so a walk through
   * links visits each folder once. Sources without links need not say. */
  identity?(path: string): string | undefined;
  /** The bytes of a regular file inside the handbook, at most MAX_FILE_BYTES of them. */
  read(path: string): ReadOutcome;
}

/** Largest handbook file read (a structure or rule file is a few kilobytes; a thousand rules in one
 * file are a few hundred). Anything larger is refused rather than read into memory. */
export const MAX_FILE_BYTES = 1 << 20;

/** `a/b` + `c` → `a/b/c`; '' is the root. */
export function joinPath(dir: string, name: string): string {
  return dir === '' ? name : `${dir}/${name}`;
}

export function baseName(path: string): string {
  return path.slice(path.lastIndexOf('/') + 1);
}

/** A file's name without its extension: a structure's id (`structures/a/cup.yaml` → `cup`). */
export function stemOf(path: string): string {
  const name = baseName(path);
  return name.slice(0, name.length - extName(name).length);
}

/** `.yaml` of `x.yaml`, '' without a dot (a leading dot does not start an extension). */
export function extName(path: string): string {
  const b = baseName(path);
  const i = b.lastIndexOf('.');
  return i > 0 ? b.slice(i) : '';
}

export type Decoded = { ok: true; text: string } | { ok: false; line: number; column: number; found: string };

/**
 * Bytes → text: strict UTF-8, one leading byte-order mark dropped (so columns on line 1 count from
 * the first character written). A byte that is not UTF-8 (Latin-1 "µ" as 0xB5, say) is reported at
 * its line and column rather than turned silently into U+FFFD.
 */
export function decodeUtf8(bytes: Uint8Array): Decoded {
  const start = bytes.length >= 3 && bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf ? 3 : 0;
  const body = bytes.subarray(start);
  try {
    return { ok: true, text: new TextDecoder('utf-8', { fatal: true, ignoreBOM: true }).decode(body) };
  } catch {
    const bad = firstInvalidUtf8(body);
    // Placed as every other position is: YAML's line breaks, UTF-16 columns.
    const before = new TextDecoder('utf-8').decode(body.subarray(0, bad));
    const { line, column } = offsetToLineColumn(lineStartsOf(before), before.length);
    return { ok: false, line, column, found: `byte 0x${(body[bad] ?? 0).toString(16).toUpperCase().padStart(2, '0')}` };
  }
}

/** Offset of the first byte that does not start or continue a well-formed UTF-8 sequence. */
function firstInvalidUtf8(b: Uint8Array): number {
  let i = 0;
  while (i < b.length) {
    const c = b[i]!;
    // Continuation bytes after the lead byte, and the smallest code point that needs that many.
    const [n, min] = c < 0x80 ? [0, 0] : c >= 0xc2 && c <= 0xdf ? [1, 0x80] : c >= 0xe0 && c <= 0xef ? [2, 0x800] : c >= 0xf0 && c <= 0xf4 ? [3, 0x10000] : [-1, 0];
    if (n < 0) return i;
    let cp = n === 0 ? c : c & (0x3f >> n);
    for (let k = 1; k <= n; k++) {
      const d = b[i + k];
      if (d === undefined || (d & 0xc0) !== 0x80) return i;
      cp = (cp << 6) | (d & 0x3f);
    }
    if (n > 0 && (cp < min || cp > 0x10ffff || (cp >= 0xd800 && cp <= 0xdfff))) return i;
    i += n + 1;
  }
  return b.length;
}

/**
 * A file name's bytes as text: UTF-8 where it is, each other byte as \\xNN. Names that are not
 * UTF-8 (Latin-1 "règles" as 0xE8) cannot be addressed as text, so they are named, not read.
 */
export function escapeName(bytes: Uint8Array): { text: string; valid: boolean } {
  let text = '';
  let rest = bytes;
  let valid = true;
  for (;;) {
    const bad = firstInvalidUtf8(rest);
    text += new TextDecoder('utf-8').decode(rest.subarray(0, bad));
    if (bad >= rest.length) return { text, valid };
    valid = false;
    text += `\\x${rest[bad]!.toString(16).toUpperCase().padStart(2, '0')}`;
    rest = rest.subarray(bad + 1);
  }
}
