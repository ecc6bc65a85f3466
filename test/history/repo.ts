// A git repository built inside a test: files written, commits made with fixed authors and dates
// (so commit ids and dates are the same on every run), branches and merges.
import { execFileSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, renameSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';

export interface Author {
  name: string;
  email: string;
}

export class TestRepo {
  readonly dir: string;
  constructor(sub = '') {
    const top = mkdtempSync(join(tmpdir(), 'plumbline-repo-'));
    this.dir = sub ? join(top, sub) : top;
    mkdirSync(this.dir, { recursive: true });
    this.git('init', '-q', '-b', 'main', top);
  }
  git(...args: string[]): string {
    return execFileSync('git', args, {
      cwd: this.dir,
      encoding: 'utf8',
      env: { PATH: process.env.PATH ?? '/usr/bin:/bin', HOME: this.dir, GIT_CONFIG_NOSYSTEM: '1', LC_ALL: 'C', TZ: 'UTC' },
    }).trim();
  }
  write(files: Record<string, string>): this {
    for (const [path, text] of Object.entries(files)) {
      const p = join(this.dir, path);
      mkdirSync(dirname(p), { recursive: true });
      writeFileSync(p, text);
    }
    return this;
  }
  remove(...paths: string[]): this {
    for (const p of paths) rmSync(join(this.dir, p), { recursive: true, force: true });
    return this;
  }
  move(from: string, to: string): this {
    renameSync(join(this.dir, from), join(this.dir, to));
    return this;
  }
  /** Stage every change in the repository and commit as `who` at `date` (ISO, with offset). */
  commit(subject: string, who: Author, date: string): string {
    this.git('add', '-A');
    execFileSync('git', ['commit', '-q', '--allow-empty', '-m', subject], {
      cwd: this.dir,
      env: { PATH: process.env.PATH ?? '/usr/bin:/bin', HOME: this.dir, GIT_CONFIG_NOSYSTEM: '1', GIT_AUTHOR_NAME: who.name, GIT_AUTHOR_EMAIL: who.email, GIT_AUTHOR_DATE: date, GIT_COMMITTER_NAME: who.name, GIT_COMMITTER_EMAIL: who.email, GIT_COMMITTER_DATE: date },
    });
    return this.git('rev-parse', 'HEAD');
  }
  merge(branch: string, subject: string, who: Author, date: string): string {
    execFileSync('git', ['merge', '-q', '--no-ff', '-m', subject, branch], {
      cwd: this.dir,
      env: { PATH: process.env.PATH ?? '/usr/bin:/bin', HOME: this.dir, GIT_CONFIG_NOSYSTEM: '1', GIT_AUTHOR_NAME: who.name, GIT_AUTHOR_EMAIL: who.email, GIT_AUTHOR_DATE: date, GIT_COMMITTER_NAME: who.name, GIT_COMMITTER_EMAIL: who.email, GIT_COMMITTER_DATE: date },
    });
    return this.git('rev-parse', 'HEAD');
  }
}

/** A trench with the geometry an aspect-ratio rule reads; the aspect ratio is depth / cd. */
export function trench(id: string, cd: string, depth: string): string {
  return `id: ${id}\ntitle: Test trench ${id}\nkind: trench\ngeometry:\n  cd: ${cd}\n  depth: ${depth}\n  pitch: 60 nm\n  sidewall_angle: 90 deg\n`;
}

export function arRule(limit: string): string {
  return `- id: TR-AR-1\n  title: Trenches stay within the qualified aspect ratio\n  applies_to: { kinds: [trench] }\n  quantity: geometry.aspect_ratio\n  at_most: ${limit}\n`;
}

export const HANDBOOK = 'title: History test handbook (invented)\n';
