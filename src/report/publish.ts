// Publishing a report folder without ever destroying what plumbline does not own.
//
//   guardOutput   the output folder may be replaced only if it is absent, empty, or a report we
//                 wrote: its marker file lists every file plumbline put there, and the folder holds
//                 nothing else (a gh-pages checkout's .git, a CNAME added by hand: refused, not
//                 deleted). Never the handbook, a folder holding it, its inputs, or a link.
//   lock          one build per output folder at a time: `.<name>-lock` beside it names its holder
//                 (pid, host, start, command) and is touched while the build runs; a holder that
//                 died on this host, or whose lock has not been touched for LOCK_STALE_MS on any
//                 host, is taken over; a live one is waited for.
//   recover       leftovers of a build that was killed (`.<name>-building-*`, `.<name>-previous-*`,
//                 each marked) are put back or removed, so the published folder is whole again.
//   swap          render into `.<name>-building-<token>`, mark it complete (with its file list),
//                 check the output once more, then two renames. Between them (microseconds) the
//                 folder is absent; a kill there is repaired by `recover` on the next run, which puts
//                 the complete new build in place. What was moved aside is deleted only if it is
//                 still ours; if anything else appeared there meanwhile, it is put back.
import { closeSync, existsSync, linkSync, lstatSync, mkdirSync, openSync, readdirSync, readFileSync, readlinkSync, realpathSync, renameSync, rmSync, rmdirSync, statSync, utimesSync, writeFileSync, writeSync } from 'node:fs';
import { hostname } from 'node:os';
import { basename, dirname, join, resolve } from 'node:path';
import { randomBytes } from 'node:crypto';
import { Refusal } from '../diagnostics/refusal.ts';
import { isInside } from '../model/folder-source.ts';
import { HANDBOOK_INPUTS, escapeName } from '../model/source.ts';

export { Refusal };

/** The file that marks a folder as a report plumbline wrote, and lists what it wrote there. */
export const MARKER = '.plumbline-report';
const FORMAT = 1;

interface MarkerData {
  generator: 'plumbline';
  format: number;
  state?: 'building';
  /** The build writing the folder, while it is being written. */
  build?: string;
  /** Every file of the report, relative, '/'-separated, sorted (the marker itself excluded). */
  files?: string[];
}

type Marked = { state: 'complete'; files: Set<string> } | { state: 'building'; build?: string } | { state: 'none' };

function readMarker(dir: string): Marked {
  const p = join(dir, MARKER);
  try {
    if (!lstatSync(p).isFile()) return { state: 'none' };
    const m = JSON.parse(readFileSync(p, 'utf8')) as MarkerData;
    if (m.generator !== 'plumbline' || m.format !== FORMAT) return { state: 'none' };
    if (m.state === 'building') return { state: 'building', ...(m.build ? { build: m.build } : {}) };
    return Array.isArray(m.files) ? { state: 'complete', files: new Set(m.files) } : { state: 'none' };
  } catch {
    return { state: 'none' };
  }
}

/** Every entry under `dir`, relative and '/'-separated: files, and folders that hold no file. */
function entriesOf(dir: string): string[] {
  const out: string[] = [];
  const walk = (d: string, rel: string) => {
    const raw = readdirSync(d, { encoding: 'buffer' });
    if (raw.length === 0 && rel) out.push(`${rel}/`);
    for (const bytes of raw) {
      const { text: name, valid } = escapeName(bytes);
      // A name that is not UTF-8 was never written by plumbline: listed (escaped), never opened.
      if (!valid) {
        out.push(rel ? `${rel}/${name}` : name);
        continue;
      }
      const p = join(d, name);
      const r = rel ? `${rel}/${name}` : name;
      const st = lstatSync(p);
      if (st.isDirectory()) walk(p, r);
      else out.push(r);
    }
  };
  walk(dir, '');
  return out.filter((e) => e !== MARKER).sort();
}

/** What a folder holds beyond the report its marker lists (nothing, for a folder that is ours). */
function foreignEntries(dir: string, m: Extract<Marked, { state: 'complete' }>): string[] {
  return entriesOf(dir).filter((e) => !m.files.has(e));
}

/** A folder plumbline may replace or delete: empty, or a complete report holding only its listed files. */
function holdsOnlyOurs(dir: string, m: Marked = readMarker(dir)): boolean {
  return m.state === 'complete' ? foreignEntries(dir, m).length === 0 : readdirSync(dir).length === 0;
}

// The names this module gives beside an output folder `<base>`: its lock and its builds' folders.
const lockName = (base: string) => `.${base}-lock`;
const buildName = (base: string, kind: 'building' | 'previous', token: string) => `.${base}-${kind}-${token}`;
const SIBLING = /^\.(.+)-(?:(building|previous)-[0-9a-f]+-[0-9a-f]+|lock)$/;

/** What a name beside an output folder is, if it is one this module gives: whose, and which. */
function siblingName(name: string): { base: string; kind: 'building' | 'previous' | 'lock' } | null {
  const m = SIBLING.exec(name);
  return m ? { base: m[1]!, kind: (m[2] as 'building' | 'previous' | undefined) ?? 'lock' } : null;
}

/** Real path of a path that may not exist yet: the nearest existing ancestor, resolved, plus the rest. */
export function realish(p: string): string {
  const rest: string[] = [];
  let cur = resolve(p);
  for (;;) {
    try {
      return join(realpathSync.native(cur), ...rest.reverse());
    } catch {
      const parent = dirname(cur);
      if (parent === cur) return resolve(p);
      rest.push(basename(cur));
      cur = parent;
    }
  }
}

/**
 * May `out` be replaced by a report of the handbook at `root`? Throws a Refusal naming the reason.
 * Called before anything is written, again after waiting for the lock, and again before the swap.
 */
export function guardOutput(out: string, root: string): void {
  const absOut = resolve(out);
  const realOut = realish(absOut);
  const realRoot = realish(root);
  if (realOut === realRoot) throw new Refusal('output-is-handbook', { path: absOut });
  if (isInside(realOut, realRoot)) throw new Refusal('output-holds-handbook', { path: absOut, root });
  for (const input of [...HANDBOOK_INPUTS, '.git']) {
    // Through its real path too: `structures` may be a link to a folder elsewhere in the handbook.
    const at = join(realRoot, input);
    if (isInside(at, realOut) || isInside(realish(at), realOut)) throw new Refusal('output-inside-inputs', { path: absOut, input });
  }
  // A name of the kind this module gives a sibling's leftovers or lock would be removed as one.
  if (siblingName(basename(absOut))) throw new Refusal('output-name-reserved', { path: absOut });
  // Every existing ancestor must be a folder (`--out notes.txt/site` cannot be made).
  for (let up = dirname(absOut); ; up = dirname(up)) {
    try {
      if (!statSync(up).isDirectory()) throw new Refusal('output-is-file', { path: up });
      break;
    } catch (err) {
      if (err instanceof Refusal) throw err;
      if ((err as NodeJS.ErrnoException).code === 'ENOTDIR') throw new Refusal('output-is-file', { path: up });
      if (dirname(up) === up) break;
    }
  }
  let st;
  try {
    st = lstatSync(absOut);
  } catch {
    return; // absent: it will be created
  }
  if (st.isSymbolicLink()) throw new Refusal('output-is-link', { path: absOut });
  if (!st.isDirectory()) throw new Refusal('output-is-file', { path: absOut });
  // A mount point (a container volume) cannot be renamed away: say so before rendering.
  if (st.dev !== statSync(dirname(absOut)).dev) throw new Refusal('output-is-mount', { path: absOut, errno: 'a mount point' });
  const m = readMarker(absOut);
  if (m.state === 'complete') {
    const foreign = foreignEntries(absOut, m);
    if (foreign.length) throw new Refusal('output-has-foreign-files', { path: absOut, files: foreign.slice(0, 5), fileCount: foreign.length });
    return;
  }
  if (readdirSync(absOut).length === 0) return;
  throw new Refusal('output-not-ours', { path: absOut });
}

// ── the lock ──────────────────────────────────────────────────────────────────────────────────

export interface Holder {
  pid: number;
  host: string;
  started: string;
  command: string;
  token: string;
  /** The holder process's start, as the system counts it (Linux: clock ticks since boot), and the
   * boot it belongs to: a live process that merely reuses a dead holder's pid has another. */
  processStart?: string;
  boot?: string;
  /** The holder's pid namespace: a pid means something only inside its own (containers). */
  pidNamespace?: string;
}

function pidNamespace(): string | undefined {
  try {
    return readlinkSync('/proc/self/ns/pid');
  } catch {
    return undefined;
  }
}

/** Start of a process and the current boot, where the system tells them (Linux's /proc). */
function processStartOf(pid: number): string | undefined {
  try {
    const stat = readFileSync(`/proc/${pid}/stat`, 'utf8');
    return stat.slice(stat.lastIndexOf(')') + 2).split(' ')[19];
  } catch {
    return undefined;
  }
}

function bootId(): string | undefined {
  try {
    return readFileSync('/proc/sys/kernel/random/boot_id', 'utf8').trim();
  } catch {
    return undefined;
  }
}

/** A lock not touched for this long is stale on any host (the holder touches it every few seconds). */
export const LOCK_STALE_MS = 10 * 60_000;
const HEARTBEAT_MS = 5_000;
/** Locks this process holds (several builds of one process, such as serve's, may wait on each other). */
const heldHere = new Set<string>();

function alive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (err) {
    return (err as NodeJS.ErrnoException).code === 'EPERM';
  }
}

function readHolder(path: string): Holder | null {
  try {
    const h = JSON.parse(readFileSync(path, 'utf8')) as Holder;
    return typeof h.pid === 'number' && typeof h.host === 'string' && typeof h.token === 'string' ? h : null;
  } catch {
    return null;
  }
}

export function describeHolder(h: Holder): string {
  return `pid ${h.pid} on ${h.host}, started ${h.started} (${h.command})`;
}

/** Is the lock's holder gone? Only then may the lock be taken over. */
function isStale(path: string, h: Holder, me: Holder): boolean {
  let age = 0;
  try {
    age = Date.now() - statSync(path).mtimeMs;
  } catch {
    return false; // gone already: the next attempt creates it
  }
  if (age > LOCK_STALE_MS) return true; // not touched for ten minutes: no build is running it
  if (h.host !== me.host) return false; // another machine's build, touched recently
  if (h.boot && me.boot && h.boot !== me.boot) return true; // written before the machine restarted
  // A holder in another pid namespace (another container on this host) cannot be judged by its
  // pid, which names some other process here: only the heartbeat above says it is gone.
  if (h.pidNamespace !== me.pidNamespace) return false;
  // Our own pid but not a lock this process holds: left by an earlier life of this pid (a restarted
  // container runs every build as pid 1).
  if (h.pid === process.pid) return !heldHere.has(h.token);
  if (!alive(h.pid)) return true;
  // Alive, but another process than the one that wrote the lock (its pid was reused).
  const start = processStartOf(h.pid);
  return h.processStart !== undefined && start !== undefined && start !== h.processStart;
}

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

export interface LockOptions {
  /** How long to wait for a live holder before refusing. */
  waitMs?: number;
  /** Told once when the lock is held by another build. */
  onWait?: (holder: Holder) => void;
  command?: string;
  /** Test seam: runs between the two renames of the swap (where a kill leaves the folder absent). */
  betweenRenames?: () => void;
  /** Test seam: runs after rendering, before the swap's final checks. */
  afterRender?: () => void;
}

/** The lock file of an output folder: beside it, named from its real path. */
export function lockPathOf(out: string): string {
  const real = realish(out);
  return join(dirname(real), lockName(basename(real)));
}

/** Take the lock of an output folder; resolves to a release function. */
export async function lockOutput(out: string, opts: LockOptions = {}): Promise<() => void> {
  const path = lockPathOf(out);
  const start = processStartOf(process.pid);
  const boot = bootId();
  const ns = pidNamespace();
  const me: Holder = { pid: process.pid, host: hostname(), started: new Date().toISOString(), command: opts.command ?? 'plumbline build', token: randomBytes(8).toString('hex'), ...(start ? { processStart: start } : {}), ...(boot ? { boot } : {}), ...(ns ? { pidNamespace: ns } : {}) };
  const deadline = Date.now() + (opts.waitMs ?? 15 * 60_000);
  let told = false;
  for (;;) {
    // Written whole to a private file, then linked into place: the lock is never seen empty, and
    // link() fails if a lock exists, so two builds cannot both create it.
    const mine = `${path}.${me.token}`;
    try {
      const fd = openSync(mine, 'wx');
      writeSync(fd, `${JSON.stringify(me)}\n`);
      closeSync(fd);
    } catch (err) {
      throw new Refusal('lock-unavailable', { lock: path, reason: (err as Error).message });
    }
    try {
      linkSync(mine, path);
      rmSync(mine, { force: true });
      heldHere.add(me.token);
      const beat = setInterval(() => {
        try {
          const now = new Date();
          if (readHolder(path)?.token === me.token) utimesSync(path, now, now);
        } catch {
          // the folder went away; the build will fail on its own
        }
      }, HEARTBEAT_MS);
      beat.unref();
      return () => {
        clearInterval(beat);
        heldHere.delete(me.token);
        // Release only our own lock (a build that took it over from us, believing us gone, keeps it).
        if (readHolder(path)?.token === me.token) rmSync(path, { force: true });
      };
    } catch (err) {
      rmSync(mine, { force: true });
      if ((err as NodeJS.ErrnoException).code !== 'EEXIST') throw new Refusal('lock-unavailable', { lock: path, reason: (err as Error).message });
    }
    // Only a lock plumbline wrote is ever moved: a folder or a file of another kind by that name is
    // someone else's, and the build stops rather than touch it.
    let st;
    try {
      st = lstatSync(path);
    } catch {
      continue; // released meanwhile
    }
    const holder = st.isFile() ? readHolder(path) : null;
    if (!holder) throw new Refusal('lock-foreign', { lock: path });
    if (isStale(path, holder, me)) {
      takeOverStale(path, holder);
      continue;
    }
    if (Date.now() > deadline) throw new Refusal('lock-held', { lock: path, holder: describeHolder(holder) });
    if (!told) opts.onWait?.(holder);
    told = true;
    await sleep(150);
  }
}

/**
 * Remove a stale lock without removing a live one that replaced it meanwhile: move it aside under
 * a unique name; if what was moved is not the lock judged stale (another token, or other bytes),
 * link it back. Only three builds racing for one stale lock can still interleave badly here.
 */
function takeOverStale(path: string, stale: Holder): void {
  const aside = `${path}.stale-${process.pid}-${randomBytes(4).toString('hex')}`;
  try {
    renameSync(path, aside);
  } catch {
    return; // someone else moved it first
  }
  if (readHolder(aside)?.token !== stale.token) {
    try {
      linkSync(aside, path);
    } catch {
      // a new lock exists already; the moved one's holder will find its token gone on release
    }
  }
  rmSync(aside, { force: true });
}

// ── recovery and swap ─────────────────────────────────────────────────────────────────────────

export interface PublishNotes {
  /** What recovery and clean-up did, for the user (a restored folder, removed leftovers). */
  recovered: string[];
}

type Leftover = { path: string; kind: 'building' | 'previous'; marked: Marked; empty: boolean };

/** Leftovers of earlier builds of `out` (its parent holds them), with their state. */
function leftovers(out: string): Leftover[] {
  const parent = dirname(out);
  const name = basename(out);
  let entries: string[];
  try {
    entries = readdirSync(parent);
  } catch {
    return [];
  }
  return entries.flatMap((e) => {
    const sib = siblingName(e);
    if (!sib || sib.base !== name || sib.kind === 'lock') return [];
    const path = join(parent, e);
    try {
      if (!lstatSync(path).isDirectory()) return [];
      return [{ path, kind: sib.kind, marked: readMarker(path), empty: readdirSync(path).length === 0 }];
    } catch {
      return [];
    }
  });
}

/**
 * Delete a report folder, its marker last: a kill part-way leaves a folder still marked as ours
 * (with fewer files, which is still only ours), so the next build can finish the job.
 */
function removeReport(dir: string): void {
  for (const name of readdirSync(dir)) if (name !== MARKER) rmSync(join(dir, name), { recursive: true, force: true });
  rmSync(join(dir, MARKER), { force: true });
  rmdirSync(dir);
}

/** A leftover is ours to delete: marked as a build in progress, or a complete report holding only its files. */
function isOurs(f: Leftover): boolean {
  return f.marked.state === 'building' || (f.marked.state === 'complete' && holdsOnlyOurs(f.path, f.marked));
}

/** Put back a folder that an interrupted swap left missing, and clear what earlier builds left. */
export function recoverOutput(out: string): string[] {
  const target = realish(out);
  const notes: string[] = [];
  const found = leftovers(target);
  if (!existsSync(target)) {
    // The newest complete build wins (the swap had reached its renames); else the previous report.
    const byAge = (a: Leftover, b: Leftover) => lstatSync(b.path).mtimeMs - lstatSync(a.path).mtimeMs;
    const complete = (k: Leftover['kind']) => found.filter((f) => f.kind === k && f.marked.state === 'complete' && isOurs(f)).sort(byAge)[0];
    const pick = complete('building') ?? complete('previous');
    if (pick) {
      renameSync(pick.path, target);
      notes.push(`restored ${target} from ${basename(pick.path)}, left by a build that was interrupted`);
    }
  }
  for (const f of leftovers(target)) {
    if (isOurs(f)) {
      removeReport(f.path);
      notes.push(`removed ${basename(f.path)}, left by an earlier build`);
    } else if (f.empty) {
      rmdirSync(f.path);
    } else {
      notes.push(`left ${f.path} alone: it has a build folder's name but is not a report plumbline wrote`);
    }
  }
  return notes;
}

/** A system error while writing a report, worded; undefined for anything else (our bug). */
const WRITE_PROBLEMS: Record<string, string> = {
  ENOSPC: 'the disk is full',
  EDQUOT: 'the disk quota is exhausted',
  EACCES: 'permission denied',
  EPERM: 'permission denied',
  EROFS: 'the file system is read-only',
  ENAMETOOLONG: 'a path is too long for the file system',
  EMFILE: 'too many open files',
  EIO: 'an input/output error',
};

export function writeFailure(err: unknown): Refusal | undefined {
  if (err instanceof Refusal) return err;
  // Eleventy wraps the system error; follow the chain of causes to it.
  for (let e = err as (NodeJS.ErrnoException & { originalError?: unknown }) | undefined, depth = 0; e && depth < 8; e = (e.cause ?? e.originalError) as typeof e, depth++) {
    const reason = typeof e.code === 'string' ? WRITE_PROBLEMS[e.code] : undefined;
    if (reason) return new Refusal('write-failed', { reason, errno: e.code, ...(e.path ? { path: e.path } : {}) });
  }
  return undefined;
}

/**
 * Render a report into `out`: guarded, locked, recovered, rendered aside and swapped in. `render`
 * writes into the folder it is given. Resolves to what recovery and clean-up did.
 */
/**
 * Create `dir` and its missing ancestors one level at a time. (Node's recursive mkdir loops forever
 * on some pseudo file systems such as /proc; one level at a time, a failure is an answer.)
 */
export function ensureFolder(dir: string): void {
  const missing: string[] = [];
  for (let p = resolve(dir); !existsSync(p); p = dirname(p)) {
    missing.push(p);
    if (dirname(p) === p) break;
  }
  for (const p of missing.reverse()) {
    try {
      mkdirSync(p);
    } catch (err) {
      const code = (err as NodeJS.ErrnoException).code;
      if (code === 'EEXIST') continue;
      throw writeFailure(err) ?? new Refusal('write-failed', { reason: 'the folder cannot be created there', errno: code ?? 'error', path: p });
    }
  }
}

export async function publish(out: string, root: string, render: (dir: string) => Promise<void>, opts: LockOptions = {}): Promise<PublishNotes> {
  guardOutput(out, root);
  ensureFolder(dirname(resolve(out)));
  const release = await lockOutput(out, opts);
  try {
    const target = realish(out);
    const recovered = recoverOutput(target);
    guardOutput(target, root); // the folder may have changed while we waited
    const token = `${process.pid.toString(16)}-${randomBytes(4).toString('hex')}`;
    const building = join(dirname(target), buildName(basename(target), 'building', token));
    const previous = join(dirname(target), buildName(basename(target), 'previous', token));
    mkdirSync(building);
    writeFileSync(join(building, MARKER), `${JSON.stringify({ generator: 'plumbline', format: FORMAT, state: 'building', build: token } satisfies MarkerData)}\n`);
    try {
      await render(building);
      // The folder must still be the one this build made: were the lock wrongly taken over and the
      // folder removed as a leftover, the render would have re-created part of it.
      const still = readMarker(building);
      if (still.state !== 'building' || still.build !== token) throw new Refusal('output-changed', { path: target });
      const tmpMarker = join(building, `${MARKER}.tmp`);
      writeFileSync(tmpMarker, `${JSON.stringify({ generator: 'plumbline', format: FORMAT, files: entriesOf(building).filter((e) => e !== `${MARKER}.tmp`) } satisfies MarkerData)}\n`);
      renameSync(tmpMarker, join(building, MARKER));
      opts.afterRender?.();
      guardOutput(target, root); // and again: the render may have taken minutes
    } catch (err) {
      removeReport(building);
      throw err;
    }
    const had = existsSync(target);
    if (had) {
      try {
        renameSync(target, previous);
      } catch (err) {
        removeReport(building);
        const code = (err as NodeJS.ErrnoException).code;
        // A mount point (a container volume) cannot be renamed: the report goes into a folder inside it.
        if (code === 'EBUSY' || code === 'EXDEV') throw new Refusal('output-is-mount', { path: target, errno: code });
        throw err;
      }
      // Between the last check and the rename something may have been put there: keep it.
      if (!holdsOnlyOurs(previous)) {
        renameSync(previous, target);
        removeReport(building);
        throw new Refusal('output-changed', { path: target });
      }
    }
    opts.betweenRenames?.();
    renameSync(building, target);
    if (had) {
      try {
        removeReport(previous);
      } catch (err) {
        // The new report is in place; the old one is removed by the next build.
        recovered.push(`could not remove ${basename(previous)} (${(err as NodeJS.ErrnoException).code ?? 'error'}); the next build removes it`);
      }
    }
    return { recovered };
  } finally {
    release();
  }
}
