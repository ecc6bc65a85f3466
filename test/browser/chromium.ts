// Which chromium the browser tests drive, in a fixed order, and never one downloaded at run time:
//   1. PLUMBLINE_CHROMIUM, when set (an error if it names no file: the user asked for that one);
//   2. a system chromium (Debian's /usr/bin/chromium, which CI installs);
//   3. the chromium shipped inside the @sparticuz/chromium package (a devDependency), unpacked
//      from the package's own files, so a fresh machine with only Node runs the suite too.
import { existsSync } from 'node:fs';

export const SYSTEM_CHROMIUMS = ['/usr/bin/chromium', '/usr/bin/chromium-browser', '/usr/lib/chromium/chromium', '/snap/bin/chromium'];

/** Flags for a headless run on a closed network, as root (CI and this machine). */
export const CHROMIUM_FLAGS = ['--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--no-first-run'];

export type ChromiumChoice =
  | { from: 'PLUMBLINE_CHROMIUM' | 'system'; path: string }
  | { from: 'package' }
  | { from: 'none'; problem: string };

/** The choice, without side effects: `exists` is injected so the order can be tested. */
export function chooseChromium(env: Record<string, string | undefined>, exists: (p: string) => boolean): ChromiumChoice {
  const asked = env.PLUMBLINE_CHROMIUM;
  if (asked !== undefined && asked !== '') {
    return exists(asked) ? { from: 'PLUMBLINE_CHROMIUM', path: asked } : { from: 'none', problem: `PLUMBLINE_CHROMIUM names ${asked}, which does not exist` };
  }
  const system = SYSTEM_CHROMIUMS.find(exists);
  if (system) return { from: 'system', path: system };
  return { from: 'package' };
}

/** The executable to launch; unpacks the packaged chromium when no other is found. */
export async function findChromium(env: Record<string, string | undefined> = process.env): Promise<{ path: string; from: string }> {
  const choice = chooseChromium(env, existsSync);
  if (choice.from === 'none') throw new Error(choice.problem);
  if (choice.from !== 'package') return choice;
  let packaged: { executablePath: (input?: string) => Promise<string> };
  try {
    packaged = (await import('@sparticuz/chromium')).default;
  } catch {
    throw new Error('no chromium found: set PLUMBLINE_CHROMIUM, install Debian\'s chromium, or run npm install (the packaged chromium is a devDependency)');
  }
  // No argument: the binary comes from the package's own bin/ folder, never from the network.
  return { path: await packaged.executablePath(), from: 'package' };
}
