// `plumbline init`: start a handbook repository of one's own. Writes a minimal handbook that loads
// and passes (one invented trench, two rules on it), a .gitignore for the report folder and the
// scratch files a build keeps beside it, and a host-neutral CI script.
//
// Never overwrites or deletes: everything that would be written, and every handbook input, is
// looked for first, and anything found refuses the whole command with nothing written. Files are
// then created with the `wx` flag, so one that appears meanwhile (a race) is not clobbered either.
import { lstatSync, mkdirSync, statSync, writeFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { Refusal } from '../diagnostics/refusal.ts';
import { HANDBOOK_INPUTS } from '../model/source.ts';

export interface ScaffoldOptions {
  /** The handbook's title (handbook.yaml `title`); a placeholder when absent or blank. */
  title?: string;
}

export type ScaffoldResult =
  | { ok: true; written: string[] }
  /** `written`: files created before a write failed, left in place (empty when refused up front). */
  | { ok: false; refusal: Refusal; written: string[] };

/** One file of the scaffold: path relative to the handbook folder, '/'-separated. */
export interface ScaffoldFile {
  path: string;
  text: string;
  mode: number;
}

export const DEFAULT_TITLE = 'Example Fab design rules';

/** The report folder `build` writes by default, and what src/report/publish.ts keeps beside it. */
const REPORT = 'site';

const handbookYaml = (title: string) => `# A plumbline design-rule handbook. Every field of every file is described in the format
# reference, docs/format.md of the plumbline package (node_modules/plumbline/docs/format.md).
title: ${JSON.stringify(title)}
organisation: Example Fab (replace with your organisation)
summary: |
  Design rules of the tall and deep structures of our process, checked by plumbline: one
  structure per file in \`structures/\`, the rules in \`rules/\`. The example trench and its two
  rules are invented; replace them with your own.

  **Cautions.** Every result is an engineering estimate from published, simplified models: confirm
  every limit on silicon before a decision relies on it. Process work (etching, deposition, wet
  cleans, handling of the liquids and gases) follows your site's safety rules and local codes.
`;

// Numbers invented, chosen so both example rules pass with a clear margin (worked in
// test/cli/init.test.ts). The sidewall stays below 90° over its tolerance, so the trench is widest
// at its top.
const trenchYaml = `# An invented example structure: replace it with your own. One structure per file; the file
# name is its id. Values are numbers with units, optionally with a tolerance (± or +a/-b).
id: example-trench
title: Example isolation trench (invented numbers)
kind: trench
tags: [example]
geometry:
  cd: 60 nm ± 3 nm               # top width
  depth: 300 nm ± 15 nm
  pitch: 200 nm                  # centre to centre of neighbouring trenches
  sidewall_angle: 89 deg ± 0.5 deg   # measured in the solid; 90 deg is vertical
  length: 10 um
materials:
  body: silicon
`;

const rulesYaml = `# Invented example rules on the example trench: replace them with your own. An id is permanent
# (it is the address of the rule's page in the report).
- id: EX-AR-1
  title: Example trenches are at most 8 times as deep as they are wide
  applies_to: { kinds: [trench], tags: [example] }
  quantity: geometry.aspect_ratio
  at_most: 8
  evaluate_at: worst-case
  severity: blocking
  rationale: Invented limit for the example; the fill of deeper, narrower trenches is not qualified.

- id: EX-SPACE-1
  title: Neighbouring example trenches leave at least 100 nm of solid between them
  applies_to: { kinds: [trench], tags: [example] }
  quantity: geometry.space
  at_least: 100 nm
  evaluate_at: worst-case
  severity: blocking
  rationale: Invented limit for the example; the active line between two trenches needs room.
`;

// The names match src/report/publish.ts: `.<out>-lock` (and its private `.<out>-lock.<token>`,
// linked into place), `.<out>-building-<token>` and `.<out>-previous-<token>` beside the output.
const gitignore = `# The report plumbline build writes (default --out site), and what a build keeps beside it while it
# runs: its lock and the folders it renders into and swaps out. Another --out needs the same lines.
/${REPORT}/
/.${REPORT}-lock
/.${REPORT}-lock.*
/.${REPORT}-building-*
/.${REPORT}-previous-*

# Written by ci/plumbline-check.sh.
/plumbline.sarif
/plumbline-diff.md

node_modules/
`;

const ciScript = `#!/bin/sh
# plumbline checks of this handbook, for any CI service or a shell: plain POSIX sh.
# Run it after \`npm ci\` has installed plumbline (a devDependency of this repository). It runs from
# the handbook folder, wherever it is called from.
#
# BASE: a git revision to compare with (the branch a change is to be merged into, such as
# BASE=origin/main). When set, the verdicts that change are written as Markdown to
# plumbline-diff.md; unset, that step is skipped.
#
# Exit codes, of each plumbline command and of this script:
#   0  clean
#   1  a blocking rule fails / the ledger is stale or missing / the change introduces a blocking failure
#   2  the handbook cannot be loaded, or the command was refused (it changed nothing)
#   3  plumbline itself failed: report it with the message it printed
# Every step runs even when an earlier one fails, so one run shows everything; the script exits
# with the highest code of its steps.
set -u
cd "$(dirname "$0")/.." || exit 2

# npx would fetch a package of that name from the registry when none is installed: stop first.
# (Looked for here and above, where npx looks too: a monorepo installs at its root.)
d=$(pwd)
while [ ! -e "$d/node_modules/.bin/plumbline" ]; do
  if [ "$d" = / ]; then
    echo "plumbline is not installed for $(pwd): run npm ci (or npm install) first" >&2
    exit 2
  fi
  d=$(dirname "$d")
done

status=0
# note STEP CODE: print a step's exit code and keep the highest.
note() {
  echo "plumbline-check: $1 exited $2" >&2
  if [ "$2" -gt "$status" ]; then status=$2; fi
}

# Every rule on every structure. 0: no blocking rule fails; 1: one does; 2: cannot load.
npx plumbline check
note check $?

# The committed verdict ledger (verdicts.ledger) against the handbook as it is. 0: it matches;
# 1: it is stale or missing (write it with \`npx plumbline check --ledger\` and commit it with the
# change); 2: the handbook cannot be loaded.
npx plumbline check --ledger --verify
note ledger $?

# What the change does to the verdicts, against BASE. 0: no new blocking failure; 1: the change
# introduces one; 2: either revision cannot be loaded, or BASE is not a revision.
if [ -n "\${BASE:-}" ]; then
  npx plumbline diff "$BASE" > plumbline-diff.md
  note diff $?
fi

# The verdicts as SARIF, for code-review tools that show findings beside the lines; the same exit
# codes as check. Keep plumbline.sarif as an artefact of the run.
npx plumbline check --sarif plumbline.sarif
note sarif $?

exit "$status"
`;

/** The files of a new handbook, in the order they are written. */
export function scaffoldFiles(options: ScaffoldOptions = {}): ScaffoldFile[] {
  const title = options.title?.trim() ? options.title.trim() : DEFAULT_TITLE;
  return [
    { path: 'handbook.yaml', text: handbookYaml(title), mode: 0o644 },
    { path: 'structures/example-trench.yaml', text: trenchYaml, mode: 0o644 },
    { path: 'rules/example.yaml', text: rulesYaml, mode: 0o644 },
    { path: '.gitignore', text: gitignore, mode: 0o644 },
    { path: 'ci/plumbline-check.sh', text: ciScript, mode: 0o755 },
  ];
}

type Found = 'missing' | 'folder' | 'other';

function lookAt(p: string): Found {
  try {
    // A link counts as what it is, not what it points to: `wx` refuses a link, even a dangling one.
    return lstatSync(p).isDirectory() ? 'folder' : 'other';
  } catch (err) {
    return (err as NodeJS.ErrnoException).code === 'ENOENT' ? 'missing' : 'other';
  }
}

/** The entries of `dir` that stop init: handbook inputs, files it would write, non-folders where it needs folders. */
function takenIn(dir: string, files: ScaffoldFile[]): string[] {
  const taken = new Set<string>();
  for (const input of HANDBOOK_INPUTS) if (lookAt(join(dir, input)) !== 'missing') taken.add(input);
  for (const f of files) {
    const folder = dirname(f.path);
    if (folder !== '.' && lookAt(join(dir, folder)) === 'other') taken.add(folder);
    else if (lookAt(join(dir, f.path)) !== 'missing') taken.add(f.path);
  }
  return [...taken].sort();
}

/** Why `dir` cannot hold a new handbook at all (it is a file, or lies under one), if so. */
function notAFolder(dir: string): string | undefined {
  try {
    return statSync(dir).isDirectory() ? undefined : 'is not a folder';
  } catch (err) {
    const code = (err as NodeJS.ErrnoException).code;
    if (code === 'ENOENT') return undefined;
    if (code === 'ENOTDIR') return 'lies under a file, not a folder';
    return `cannot be read (${code ?? 'error'})`;
  }
}

function failed(err: unknown, path: string, written: string[]): ScaffoldResult {
  const e = err as NodeJS.ErrnoException;
  return { ok: false, written, refusal: new Refusal('scaffold-write-failed', { reason: e.message, errno: e.code ?? 'error', path, files: [...written] }) };
}

/**
 * Write a minimal, valid handbook into `dir` (created if absent). Refuses, writing nothing, when
 * `dir` already holds a handbook input or any file it would write. Returns the files written,
 * relative to `dir`.
 */
export function scaffoldHandbook(dir: string, options: ScaffoldOptions = {}): ScaffoldResult {
  const root = resolve(dir);
  const files = scaffoldFiles(options);
  const why = notAFolder(root);
  if (why) return { ok: false, written: [], refusal: new Refusal('scaffold-target-taken', { path: root, reason: why }) };
  const taken = takenIn(root, files);
  if (taken.length) return { ok: false, written: [], refusal: new Refusal('scaffold-target-taken', { path: root, files: taken.slice(0, 5), fileCount: taken.length }) };

  // The folder and its missing ancestors, one level at a time (a recursive mkdir loops on some
  // pseudo file systems; see ensureFolder in src/report/publish.ts).
  const missing: string[] = [];
  for (let p = root; lookAt(p) === 'missing' && dirname(p) !== p; p = dirname(p)) missing.push(p);
  for (const p of missing.reverse()) {
    try {
      mkdirSync(p);
    } catch (err) {
      if ((err as NodeJS.ErrnoException).code !== 'EEXIST') return failed(err, p, []);
    }
  }

  const written: string[] = [];
  for (const f of files) {
    const target = join(root, f.path);
    const folder = dirname(target);
    try {
      if (folder !== root && lookAt(folder) === 'missing') mkdirSync(folder);
      writeFileSync(target, f.text, { flag: 'wx', mode: f.mode });
    } catch (err) {
      // Something appeared since the look above: it is kept, and nothing else is written.
      if ((err as NodeJS.ErrnoException).code === 'EEXIST' && written.length === 0) {
        return { ok: false, written, refusal: new Refusal('scaffold-target-taken', { path: root, files: [f.path], fileCount: 1 }) };
      }
      return failed(err, target, written);
    }
    written.push(f.path);
  }
  return { ok: true, written };
}

/** What `init` tells the user after writing. */
export function describeScaffold(dir: string, written: string[]): string {
  return [
    `started a handbook in ${resolve(dir)}:`,
    ...written.map((f) => `  ${f}`),
    'next, in that folder: install plumbline as a devDependency (npm i -D <the plumbline package or tarball>),',
    'run npx plumbline check, write the verdict ledger with npx plumbline check --ledger and commit it;',
    'ci/plumbline-check.sh runs the checks a CI job needs.',
  ].join('\n');
}
