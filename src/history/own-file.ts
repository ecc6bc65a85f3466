// A file plumbline writes where the user says (a SARIF log): it replaces only a file it wrote
// (the caller recognises its own by the content), never a link or anything but a regular file,
// and writes a temporary file beside it first, then renames it into place.
import { closeSync, fsyncSync, lstatSync, openSync, readFileSync, renameSync, rmSync, writeSync } from 'node:fs';
import { basename, dirname, join } from 'node:path';
import process from 'node:process';
import { Refusal } from '../diagnostics/refusal.ts';

export function writeOwnFile(path: string, text: string, isOurs: (old: string) => boolean): 'written' | 'unchanged' {
  let st;
  try {
    st = lstatSync(path);
  } catch {
    st = null;
  }
  if (st) {
    if (!st.isFile()) throw new Refusal('file-not-ours', { path, reason: st.isSymbolicLink() ? 'a symbolic link' : 'not a regular file' });
    // Files plumbline writes are small; one that is large is not one of ours.
    const old = st.size <= 64 << 20 ? readFileSync(path, 'utf8') : '';
    if (!isOurs(old)) throw new Refusal('file-not-ours', { path, reason: 'not a file plumbline wrote' });
    if (old === text) return 'unchanged';
  }
  const tmp = join(dirname(path), `.${basename(path)}.${process.pid}.tmp`);
  let fd: number | undefined;
  let created = false;
  try {
    fd = openSync(tmp, 'wx', 0o644);
    created = true;
    writeSync(fd, text);
    fsyncSync(fd);
    closeSync(fd);
    fd = undefined;
    renameSync(tmp, path);
  } catch (err) {
    if (fd !== undefined) closeSync(fd);
    if (created) rmSync(tmp, { force: true });
    throw new Refusal('file-write-failed', { path, errno: (err as NodeJS.ErrnoException).code ?? 'error' });
  }
  return 'written';
}
