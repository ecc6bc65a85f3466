// The bad-input corpus: one folder per bad handbook, each a small change to `_base/` (a valid
// handbook). A case folder holds `case.yaml` and, under `files/`, the files it adds or replaces:
//
//   about: what is wrong, in a sentence
//   remove: [structures/via.yaml]            # base files the case deletes (optional)
//   setup:                                   # entries git cannot hold, made by this harness (optional)
//     - { fifo: structures/pipe.yaml }
//     - { link: structures/p.yaml, to: /etc/passwd }     # `to` relative paths are inside the case copy
//     - { folder: structures/sub }
//     - { big: structures/huge.yaml, bytes: 2000000 }
//   loads: false                             # true when only warnings are expected
//   expect:                                  # every diagnostic, as [code, file, line, column, field]
//     - [unknown-field, structures/cup.yaml, 6, 3, geometry.hieght]
//
// The expected places were read off the case files by hand. Every diagnostic of the run must be
// listed (a follow-on error is a failure of the case too), and no message may quote more than a
// short excerpt of a file.
import { loadHandbookFolder } from '../../src/pipeline.ts';
import { cpSync, existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, symlinkSync, writeFileSync } from 'node:fs';
import { execFileSync } from 'node:child_process';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { load } from 'js-yaml';
import { describe, expect, it } from 'vitest';
import type { Diagnostic } from '../../src/diagnostics/diagnostic.ts';
import { formatDiagnostic } from '../../src/diagnostics/messages.ts';

const CORPUS = resolve(import.meta.dirname);
const BASE = join(CORPUS, '_base');

type Setup = { fifo: string } | { link: string; to: string } | { folder: string } | { big: string; bytes: number };
interface Case {
  about: string;
  remove?: string[];
  setup?: Setup[];
  loads?: boolean;
  expect: Array<[string, string, number, number, string]>;
}

const cases = readdirSync(CORPUS, { withFileTypes: true })
  .filter((e) => e.isDirectory() && !e.name.startsWith('_'))
  .map((e) => e.name)
  .sort();

/** The base handbook with the case applied, in a fresh folder. */
function materialise(name: string, c: Case): string {
  const dir = join(mkdtempSync(join(tmpdir(), 'plumbline-corpus-')), 'hb');
  cpSync(BASE, dir, { recursive: true });
  for (const r of c.remove ?? []) rmSync(join(dir, r), { recursive: true, force: true });
  const files = join(CORPUS, name, 'files');
  if (existsSync(files)) cpSync(files, dir, { recursive: true });
  for (const s of c.setup ?? []) {
    if ('fifo' in s) {
      mkdirSync(dirname(join(dir, s.fifo)), { recursive: true });
      execFileSync('mkfifo', [join(dir, s.fifo)]);
    } else if ('link' in s) {
      mkdirSync(dirname(join(dir, s.link)), { recursive: true });
      symlinkSync(s.to.startsWith('/') ? s.to : join(dir, s.to), join(dir, s.link));
    } else if ('folder' in s) mkdirSync(join(dir, s.folder), { recursive: true });
    else writeFileSync(join(dir, s.big), Buffer.alloc(s.bytes, 0x61));
  }
  return dir;
}

const where = (d: Diagnostic) => [d.code, d.file, d.line, d.column, d.field] as const;

describe('bad-input corpus', () => {
  it('holds at least 80 cases', () => {
    expect(cases.length).toBeGreaterThanOrEqual(80);
  });

  it.each(cases)('%s', (name) => {
    const c = load(readFileSync(join(CORPUS, name, 'case.yaml'), 'utf8')) as Case;
    const r = loadHandbookFolder(materialise(name, c));
    const found = r.ok ? r.handbook.warnings : r.diagnostics;
    expect(r.ok, c.about).toBe(c.loads ?? false);
    expect(found.map(where)).toEqual(c.expect);
    for (const d of found) {
      const line = formatDiagnostic(d);
      expect(line.length, line.slice(0, 200)).toBeLessThan(600);
      expect(line).not.toMatch(/\n|\bat .*\.ts:\d+/);
    }
  });
});
