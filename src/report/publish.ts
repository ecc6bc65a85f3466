// Publishing a report folder without ever destroying what plumbline does not own.
//
//   guardOutput   the output folder may be replaced only if it is absent, empty, or a report we
//                 wrote (it holds our marker file), and never if it is, holds or lies inside the
//                 handbook's inputs; links are refused.
//   lock          one build per output folder at a time: `.<name>-lock` beside it names its holder
//                 (pid, host, start, command); a holder that died is taken over, a live one waited for.
//   recover       leftovers of a build that was killed (`.<name>-building-*`, `.<name>-previous-*`,
//                 each marked) are put back or removed, so the published folder is whole again.
//   swap          render into `.<name>-building-<token>`, mark it complete, then two renames. Between
//                 them (microseconds) the folder is absent; a kill there is repaired by `recover` on
//                 the next run, which puts the complete new build in place.
import { closeSync, existsSync, linkSync, lstatSync, mkdirSync, openSync, readdirSync, readFileSync, realpathSync, renameSync, rmSync, rmdirSync, writeFileSync, writeSync } from 'node:fs';
import { hostname } from 'node:os';
import { basename, dirname, join, resolve } from 'node:path';
import { randomBytes } from 'node:crypto';
import { isInside } from '../model/folder-source.ts';

/** The file that marks a folder as a report plumbline wrote (published with the report). */
export const MARKER = '.plumbline-report';
const MARKER_TEXT = `${JSON.stringify({ generator: 'plumbline', format: 1 })}\n`;
const BUILDING_TEXT = `${JSON.stringify({ generator: 'plumbline', format: 1, state: 'building' })}\n`;

/** A refusal: the command stops, says why, and exits 2; nothing was changed. */
export class Refusal extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'Refusal';
  }
}

type MarkerState = 'complete' | 'building' | 'none';

function markerState(dir: string): MarkerState {
  const p = join(dir, MARKER);
  try {
    if (!lstatSync(p).isFile()) return 'none';
    const text = readFileSync(p, 'utf8');
    if (text === MARKER_TEXT) return 'complete';
    if (text === BUILDING_TEXT) return 'building';
    return 'none';
  } catch {
    return 'none';
  }
}

/** Real path of a path that may not exist yet: the nearest existing ancestor, resolved, plus the rest. */
function realish(p: string): string {
  const rest: string[] = [];
  let cur = resolve(p);
  for (;;) {
    try {
      return join(realpathSync(cur), ...rest.reverse());
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
 * Called before anything is written.
 */
export function guardOutput(out: string, root: string): void {
  const absOut = resolve(out);
  const realOut = realish(absOut);
  const realRoot = realish(root);
  if (realOut === realRoot) throw new Refusal(`the output folder ${absOut} is the handbook folder itself; building there would replace the handbook. Choose another --out (the default is site/ inside the handbook).`);
  if (isInside(realOut, realRoot)) throw new Refusal(`the output folder ${absOut} contains the handbook (${root}); building there would replace it. Choose a folder beside or inside the handbook, such as site/.`);
  for (const input of ['structures', 'rules', 'handbook.yaml', 'materials.yaml', '.git']) {
    if (isInside(join(realRoot, input), realOut)) throw new Refusal(`the output folder ${absOut} lies inside the handbook's ${input}; the report would be mixed with the handbook's files. Choose another --out, such as site/.`);
  }
  let st;
  try {
    st = lstatSync(absOut);
  } catch {
    return; // absent: it will be created
  }
  if (st.isSymbolicLink()) throw new Refusal(`the output folder ${absOut} is a symbolic link; plumbline replaces only real folders it wrote. Give the folder the link points to, or remove the link.`);
  if (!st.isDirectory()) throw new Refusal(`the output path ${absOut} is a file, not a report folder; plumbline will not replace it.`);
  if (markerState(absOut) === 'complete') return;
  if (readdirSync(absOut).length === 0) return;
  throw new Refusal(`the folder ${absOut} exists and is not a report plumbline wrote (it has no ${MARKER} file); plumbline will not replace it. Choose an empty or new --out, or remove the folder yourself if it is an old report.`);
}

// ── the lock ──────────────────────────────────────────────────────────────────────────────────

export interface Holder {
  pid: number;
  host: string;
  started: string;
  command: string;
  token: string;
}

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
    return typeof h.pid === 'number' && typeof h.host === 'string' ? h : null;
  } catch {
    return null;
  }
}

export function describeHolder(h: Holder): string {
  return `pid ${h.pid} on ${h.host}, started ${h.started} (${h.command})`;
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
}

/** Take the lock of an output folder; resolves to a release function. */
export async function lockOutput(out: string, opts: LockOptions = {}): Promise<() => void> {
  const path = join(dirname(resolve(out)), `.${basename(out)}-lock`);
  const me: Holder = { pid: process.pid, host: hostname(), started: new Date().toISOString(), command: opts.command ?? 'plumbline build', token: randomBytes(6).toString('hex') };
  const deadline = Date.now() + (opts.waitMs ?? 15 * 60_000);
  let told = false;
  for (;;) {
    try {
      const fd = openSync(path, 'wx');
      writeSync(fd, `${JSON.stringify(me)}\n`);
      closeSync(fd);
      return () => {
        // Release only our own lock (a holder that took it over from us, believing us dead, keeps it).
        if (readHolder(path)?.token === me.token) rmSync(path, { force: true });
      };
    } catch (err) {
      if ((err as NodeJS.ErrnoException).code !== 'EEXIST') throw new Refusal(`cannot create the lock ${path}: ${(err as Error).message}`);
    }
    const holder = readHolder(path);
    if (holder && holder.host === me.host && !alive(holder.pid)) {
      takeOverStale(path, holder);
      continue;
    }
    if (!holder) {
      // Being written this instant, or not ours: wait a moment, then treat an unreadable lock as stale.
      await sleep(100);
      const again = readHolder(path);
      if (!again && existsSync(path) && Date.now() - lstatSync(path).mtimeMs > 5_000) takeOverStale(path, null);
      continue;
    }
    if (Date.now() > deadline) {
      throw new Refusal(`another build holds ${path}: ${describeHolder(holder)}. If no such build is running, delete that file and try again.`);
    }
    if (!told) opts.onWait?.(holder);
    told = true;
    await sleep(150);
  }
}

/**
 * Remove a dead holder's lock without removing a live one that replaced it meanwhile: move the
 * lock aside under a unique name, and if what was moved is not the dead holder's, link it back.
 */
function takeOverStale(path: string, dead: Holder | null): void {
  const aside = `${path}.stale-${process.pid}-${randomBytes(4).toString('hex')}`;
  try {
    renameSync(path, aside);
  } catch {
    return; // someone else moved it first
  }
  const moved = readHolder(aside);
  if (dead && moved && moved.token !== dead.token) {
    try {
      linkSync(aside, path);
    } catch {
      // A third build took the lock in between; both now believe they hold it only if the two
      // renames and the link interleave exactly, which the per-build token then reveals on release.
    }
  }
  rmSync(aside, { force: true });
}

// ── recovery and swap ─────────────────────────────────────────────────────────────────────────

export interface PublishNotes {
  /** What recovery did, for the user (a restored folder, removed leftovers). */
  recovered: string[];
}

/** Leftovers of earlier builds of `out` (its parent holds them), with their state. */
function leftovers(out: string): Array<{ path: string; kind: 'building' | 'previous'; state: MarkerState; empty: boolean }> {
  const parent = dirname(out);
  const name = basename(out);
  let entries: string[];
  try {
    entries = readdirSync(parent);
  } catch {
    return [];
  }
  return entries.flatMap((e) => {
    const m = new RegExp(`^\\.${name.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}-(building|previous)-[0-9a-z-]+$`).exec(e);
    if (!m) return [];
    const path = join(parent, e);
    try {
      if (!lstatSync(path).isDirectory()) return [];
    } catch {
      return [];
    }
    return [{ path, kind: m[1] as 'building' | 'previous', state: markerState(path), empty: readdirSync(path).length === 0 }];
  });
}

/** Put back a folder that an interrupted swap left missing, and clear what earlier builds left. */
export function recoverOutput(out: string): string[] {
  const notes: string[] = [];
  const found = leftovers(out);
  if (!existsSync(out)) {
    // The newest complete build wins (the swap had reached its renames); else the previous report.
    const byAge = (a: { path: string }, b: { path: string }) => lstatSync(b.path).mtimeMs - lstatSync(a.path).mtimeMs;
    const pick = found.filter((f) => f.kind === 'building' && f.state === 'complete').sort(byAge)[0] ?? found.filter((f) => f.kind === 'previous' && f.state === 'complete').sort(byAge)[0];
    if (pick) {
      renameSync(pick.path, out);
      notes.push(`restored ${out} from ${basename(pick.path)}, left by a build that was interrupted`);
    }
  }
  for (const f of leftovers(out)) {
    if (f.state !== 'none') {
      rmSync(f.path, { recursive: true, force: true });
      notes.push(`removed ${basename(f.path)}, left by an earlier build`);
    } else if (f.empty) {
      rmdirSync(f.path);
    } else {
      notes.push(`left ${f.path} alone: it has a build folder's name but no ${MARKER} file`);
    }
  }
  return notes;
}

/**
 * Render a report into `out`: guarded, locked, recovered, rendered aside and swapped in. `render`
 * writes into the folder it is given. Resolves to what recovery did.
 */
export async function publish(out: string, root: string, render: (dir: string) => Promise<void>, opts: LockOptions = {}): Promise<PublishNotes> {
  const target = resolve(out);
  guardOutput(target, root);
  mkdirSync(dirname(target), { recursive: true });
  const release = await lockOutput(target, opts);
  try {
    const recovered = recoverOutput(target);
    guardOutput(target, root); // the folder may have changed while we waited
    const token = `${process.pid}-${randomBytes(4).toString('hex')}`;
    const building = join(dirname(target), `.${basename(target)}-building-${token}`);
    const previous = join(dirname(target), `.${basename(target)}-previous-${token}`);
    mkdirSync(building);
    writeFileSync(join(building, MARKER), BUILDING_TEXT);
    try {
      await render(building);
    } catch (err) {
      rmSync(building, { recursive: true, force: true });
      throw err;
    }
    const tmpMarker = join(building, `${MARKER}.tmp`);
    writeFileSync(tmpMarker, MARKER_TEXT);
    renameSync(tmpMarker, join(building, MARKER));
    const had = existsSync(target);
    if (had) renameSync(target, previous);
    opts.betweenRenames?.();
    renameSync(building, target);
    if (had) rmSync(previous, { recursive: true, force: true });
    return { recovered };
  } finally {
    release();
  }
}
