// `plumbline init`: the scaffold loads and passes with the real loader and checker, never replaces
// or deletes anything, ignores exactly what a build leaves, ships a CI script that runs its steps
// in order, and the package a team installs carries the runtime and nothing else.
import { loadHandbookFolder } from '../../src/pipeline.ts';
import { execFileSync, spawnSync } from 'node:child_process';
import { chmodSync, copyFileSync, existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, statSync, symlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { describe, expect, it, onTestFinished } from 'vitest';
import { evaluateHandbook } from '../../src/checker/evaluate.ts';
import { describeScaffold, scaffoldFiles, scaffoldHandbook } from '../../src/cli/init.ts';
import { Refusal } from '../../src/diagnostics/refusal.ts';

import { lockPathOf, publish } from '../../src/report/publish.ts';
import { expectRel, worstCornerOf } from '../helpers.ts';

const ROOT = resolve(import.meta.dirname, '../..');
const FILES = ['handbook.yaml', 'structures/example-trench.yaml', 'rules/example.yaml', '.gitignore', 'ci/plumbline-check.sh'];

const tempDir = (tag: string) => mkdtempSync(join(tmpdir(), `plumbline-init-${tag}-`));

/** Every entry under `dir`, relative, with its bytes (files) and mtime. */
function snapshot(dir: string): Map<string, { bytes?: string; mtimeMs: number }> {
  const out = new Map<string, { bytes?: string; mtimeMs: number }>();
  const walk = (d: string, rel: string) => {
    for (const name of readdirSync(d).sort()) {
      const p = join(d, name);
      const r = rel ? `${rel}/${name}` : name;
      const st = statSync(p);
      if (st.isDirectory()) {
        out.set(`${r}/`, { mtimeMs: st.mtimeMs });
        walk(p, r);
      } else out.set(r, { bytes: readFileSync(p, 'latin1'), mtimeMs: st.mtimeMs });
    }
  };
  walk(dir, '');
  return out;
}

function refusalOf(r: ReturnType<typeof scaffoldHandbook>): Refusal {
  if (r.ok) throw new Error('expected a refusal');
  expect(r.refusal).toBeInstanceOf(Refusal);
  return r.refusal;
}

describe('scaffoldHandbook', () => {
  it('writes a handbook that loads without a diagnostic and passes both rules with the margins worked by hand', () => {
    const dir = join(tempDir('ok'), 'new', 'handbook'); // two levels that do not exist yet
    const r = scaffoldHandbook(dir, { title: 'Example Fab — trench module rules' });
    expect(r).toEqual({ ok: true, written: FILES });
    for (const f of FILES) expect(describeScaffold(dir, FILES)).toContain(`  ${f}\n`);

    const loaded = loadHandbookFolder(dir);
    if (!loaded.ok) throw new Error(`did not load: ${JSON.stringify(loaded.diagnostics)}`);
    expect(loaded.handbook.warnings).toEqual([]);
    expect(loaded.handbook.meta.title).toBe('Example Fab — trench module rules');
    expect(loaded.handbook.structures.map((s) => s.id)).toEqual(['example-trench']);

    // A fixed day: the checker judges waivers on it (the scaffold has none; the result must not depend on the clock).
    const results = evaluateHandbook(loaded.handbook, { on: '2030-01-01' });
    expect(results.verdicts.map((v) => [v.rule, v.structure, v.status])).toEqual([
      ['EX-AR-1', 'example-trench', 'pass'],
      ['EX-SPACE-1', 'example-trench', 'pass'],
    ]);
    expect(results.blockingFailures).toBe(0);
    const [ar, space] = results.verdicts;

    // EX-AR-1, worst case of AR = depth / cd (highest): deepest over narrowest,
    // (300 + 15) nm / (60 − 3) nm = 315/57 = 5.526316; margin (8 − 5.526316)/8 = 0.309211.
    expectRel(ar!.value, 315 / 57);
    expectRel(ar!.margin, (8 - 315 / 57) / 8);
    expect(worstCornerOf(ar!)?.map((c) => [c.name, c.side])).toEqual([
      ['geometry.depth', 'high'],
      ['geometry.cd', 'low'],
    ]);

    // EX-SPACE-1, worst case of s = p − max(CD, CD_b) (lowest). The sidewall stays below 90°
    // (88.5°–89.5°), so the trench narrows downward and its top CD is the widest:
    // s = 200 nm − (60 + 3) nm = 137 nm; margin (137 − 100)/100 = 0.37.
    // (Narrowest bottom: 57 − 2·315·cot 88.5° = 57 − 16.5 = 40.5 nm > 0, so it never closes.)
    expectRel(space!.value, 137e-9);
    expectRel(space!.margin, 0.37);
  });

  it('uses a placeholder title when none (or a blank one) is given, and quotes any title safely', () => {
    for (const [title, expected] of [[undefined, 'Example Fab design rules'], ['  ', 'Example Fab design rules'], ['Rules: "deep" # trench\nmodule', 'Rules: "deep" # trench\nmodule']] as const) {
      const dir = join(tempDir('title'), 'hb');
      expect(scaffoldHandbook(dir, title === undefined ? {} : { title }).ok).toBe(true);
      const loaded = loadHandbookFolder(dir);
      if (!loaded.ok) throw new Error(JSON.stringify(loaded.diagnostics));
      expect(loaded.handbook.meta.title).toBe(expected);
    }
  });

  it('says in the summary that results are estimates to confirm on silicon and that site safety rules apply', () => {
    const dir = join(tempDir('caution'), 'hb');
    scaffoldHandbook(dir, {});
    const loaded = loadHandbookFolder(dir);
    if (!loaded.ok) throw new Error(JSON.stringify(loaded.diagnostics));
    const summary = (loaded.handbook.meta.summary ?? '').replace(/\s+/g, ' ');
    expect(summary).toMatch(/engineering estimate/);
    expect(summary).toMatch(/confirm every limit on silicon/);
    expect(summary).toMatch(/site's safety rules/);
    expect(loaded.handbook.meta.organisation).toMatch(/Example Fab/);
  });

  it('a second scaffold into the same folder refuses and leaves every file byte-identical, mtimes too', () => {
    const dir = join(tempDir('again'), 'hb');
    expect(scaffoldHandbook(dir, {}).ok).toBe(true);
    // Make the files differ from what init would write, so a silent rewrite could not hide.
    writeFileSync(join(dir, 'rules/example.yaml'), '# edited by the team\n', { flag: 'a' });
    const before = snapshot(dir);
    const dirMtime = statSync(dir).mtimeMs;

    const r = scaffoldHandbook(dir, { title: 'Another title' });
    const refusal = refusalOf(r);
    expect(refusal.code).toBe('scaffold-target-taken');
    expect(refusal.facts.fileCount).toBe(7); // the 5 files plus the structures and rules folders
    expect(refusal.facts.files).toEqual(['.gitignore', 'ci/plumbline-check.sh', 'handbook.yaml', 'rules', 'rules/example.yaml']);
    expect(r.ok ? [] : r.written).toEqual([]);
    expect(snapshot(dir)).toEqual(before);
    expect(statSync(dir).mtimeMs).toBe(dirMtime);
  });

  it('refuses a folder that holds a handbook input, or any one file it would write, and writes nothing', () => {
    const cases: Array<[string, (dir: string) => void]> = [
      ['structures', (d) => mkdirSync(join(d, 'structures'))],
      ['rules', (d) => mkdirSync(join(d, 'rules'))],
      ['handbook.yaml', (d) => writeFileSync(join(d, 'handbook.yaml'), 'title: Theirs\n')],
      ['materials.yaml', (d) => writeFileSync(join(d, 'materials.yaml'), '[]\n')],
      ['.gitignore', (d) => writeFileSync(join(d, '.gitignore'), 'build/\n')],
      ['ci/plumbline-check.sh', (d) => {
        mkdirSync(join(d, 'ci'));
        writeFileSync(join(d, 'ci/plumbline-check.sh'), 'echo theirs\n');
      }],
      ['ci', (d) => writeFileSync(join(d, 'ci'), 'a file where init needs a folder\n')],
    ];
    for (const [name, prepare] of cases) {
      const dir = tempDir('taken');
      prepare(dir);
      const before = snapshot(dir);
      const refusal = refusalOf(scaffoldHandbook(dir, {}));
      expect([name, refusal.code, refusal.facts.files]).toEqual([name, 'scaffold-target-taken', [name]]);
      expect(refusal.message).toContain(name);
      expect(snapshot(dir)).toEqual(before);
    }
  });

  it('writes beside files it does not own (a README, a .git, a package.json) without touching them', () => {
    const dir = tempDir('beside');
    mkdirSync(join(dir, '.git'));
    writeFileSync(join(dir, 'README.md'), '# Our rules\n');
    writeFileSync(join(dir, 'package.json'), '{}\n');
    mkdirSync(join(dir, 'ci'));
    writeFileSync(join(dir, 'ci', 'other.sh'), 'true\n');
    const before = snapshot(dir);
    expect(scaffoldHandbook(dir, {})).toEqual({ ok: true, written: FILES });
    const after = snapshot(dir);
    for (const [p, v] of before) if (!p.endsWith('/')) expect(after.get(p)).toEqual(v);
  });

  it('refuses a path that is a file, and one under a file', () => {
    const file = join(tempDir('file'), 'notes.txt');
    writeFileSync(file, 'x');
    for (const dir of [file, join(file, 'hb')]) {
      const refusal = refusalOf(scaffoldHandbook(dir, {}));
      expect(refusal.code).toBe('scaffold-target-taken');
      expect(refusal.facts.reason).toBeDefined();
    }
    expect(readFileSync(file, 'utf8')).toBe('x');
  });

  it('reports a folder it cannot create as a write failure, not a crash', () => {
    // /sys refuses new folders even to root (EPERM), unlike permission bits.
    const refusal = refusalOf(scaffoldHandbook('/sys/kernel/plumbline-init-test/hb', {}));
    expect(refusal.code).toBe('scaffold-write-failed');
    expect(refusal.facts.errno).toMatch(/^E/);
  });

  it('makes the CI script executable', () => {
    const dir = join(tempDir('mode'), 'hb');
    scaffoldHandbook(dir, {});
    expect(statSync(join(dir, 'ci/plumbline-check.sh')).mode & 0o111).not.toBe(0);
  });
});

describe('the scaffold .gitignore', () => {
  it('ignores the report folder and every name a real publish leaves beside it, as git reads it', async () => {
    const dir = join(tempDir('git'), 'hb');
    scaffoldHandbook(dir, {});
    execFileSync('git', ['init', '-q', dir]);
    const ignored = (names: string[]) => {
      const r = spawnSync('git', ['-C', dir, 'check-ignore', '--', ...names], { encoding: 'utf8' });
      return r.stdout.split('\n').filter(Boolean).sort();
    };
    const siblings = () => readdirSync(dir).filter((n) => n.startsWith('.site')).sort();

    // Real publishes (src/report/publish.ts) with a trivial render: the names are the module's own.
    const out = join(dir, 'site');
    const seen: string[][] = [];
    const render = async (into: string) => {
      writeFileSync(join(into, 'index.html'), '<p>report</p>\n');
      seen.push(siblings());
    };
    await publish(out, dir, render);
    await publish(out, dir, render, { betweenRenames: () => void seen.push(siblings()) });
    const names = [...new Set(seen.flat())].sort();
    expect(names.some((n) => /^\.site-building-/.test(n))).toBe(true);
    expect(names.some((n) => /^\.site-previous-/.test(n))).toBe(true);
    expect(names).toContain('.site-lock');
    expect(lockPathOf(out)).toBe(join(dir, '.site-lock'));

    // Recreate what was seen (the build folders as folders) and ask git, plus the lock's private
    // file, which lives only between its creation and its link into place.
    for (const n of names) {
      if (n === '.site-lock') continue;
      mkdirSync(join(dir, n), { recursive: true });
      writeFileSync(join(dir, n, 'index.html'), '');
    }
    writeFileSync(join(dir, '.site-lock'), '{}');
    writeFileSync(join(dir, '.site-lock.0123456789abcdef'), '{}');
    const wanted = [...names, '.site-lock.0123456789abcdef', 'site/index.html'].sort();
    expect(ignored(wanted)).toEqual(wanted);
    // And nothing of the handbook itself.
    expect(ignored(FILES)).toEqual([]);
  });
});

describe('the scaffold CI script', () => {
  /** Run the script with a stand-in npx that logs its arguments and exits with the code a test names. */
  function runScript(env: Record<string, string>): { code: number | null; calls: string[]; stderr: string; dir: string } {
    const dir = join(tempDir('ci'), 'hb');
    scaffoldHandbook(dir, {});
    const bin = join(dir, '..', 'fakebin');
    mkdirSync(bin);
    const log = join(dir, '..', 'calls.log');
    // Exit code per step from CODE_<step>, the step being the words after `plumbline`.
    writeFileSync(
      join(bin, 'npx'),
      `#!/bin/sh\necho "$*" >> "${log}"\nkey=$(echo "$2 $3 $4" | tr -c 'a-z0-9\\n' '_' | sed 's/_*$//')\neval "code=\\\${CODE_$key:-0}"\n[ "$2" = diff ] && echo "| rule | before | after |"\nexit "$code"\n`,
    );
    chmodSync(join(bin, 'npx'), 0o755);
    mkdirSync(join(dir, 'node_modules/.bin'), { recursive: true });
    writeFileSync(join(dir, 'node_modules/.bin/plumbline'), '');
    // Called from another folder: the script goes to its handbook itself.
    const r = spawnSync('sh', [join(dir, 'ci/plumbline-check.sh')], { cwd: tmpdir(), encoding: 'utf8', env: { PATH: `${bin}:${process.env.PATH}`, ...env } });
    return { code: r.status, calls: existsSync(log) ? readFileSync(log, 'utf8').split('\n').filter(Boolean) : [], stderr: r.stderr, dir };
  }

  it('is plain POSIX sh', () => {
    const dir = join(tempDir('sh'), 'hb');
    scaffoldHandbook(dir, {});
    const text = readFileSync(join(dir, 'ci/plumbline-check.sh'), 'utf8');
    expect(text.startsWith('#!/bin/sh\n')).toBe(true);
    expect(spawnSync('sh', ['-n', join(dir, 'ci/plumbline-check.sh')]).status).toBe(0);
    // No bash-isms and no CI service's configuration.
    expect(text).not.toMatch(/\[\[|pipefail|PIPESTATUS|\bfunction\b|GITHUB_|GITLAB|JENKINS|CIRCLE/);
  });

  it('runs check, ledger verify, diff (only with BASE) and SARIF, in that order, and exits with the highest code', () => {
    const noBase = runScript({});
    expect(noBase.calls).toEqual(['plumbline check', 'plumbline check --ledger --verify', 'plumbline check --sarif plumbline.sarif']);
    expect(noBase.code).toBe(0);

    const withBase = runScript({ BASE: 'origin/main', CODE_check___ledger___verify: '1' });
    expect(withBase.calls).toEqual(['plumbline check', 'plumbline check --ledger --verify', 'plumbline diff origin/main', 'plumbline check --sarif plumbline.sarif']);
    expect(withBase.code).toBe(1);
    expect(readFileSync(join(withBase.dir, 'plumbline-diff.md'), 'utf8')).toBe('| rule | before | after |\n');

    const cannotLoad = runScript({ CODE_check: '2', CODE_check___sarif_plumbline_sarif: '1' });
    expect(cannotLoad.calls).toHaveLength(3); // every step still runs
    expect(cannotLoad.code).toBe(2);
  });

  it('stops with exit 2 before npx when plumbline is not installed (npx would fetch a namesake from the registry)', () => {
    const dir = join(tempDir('noinstall'), 'hb');
    scaffoldHandbook(dir, {});
    const r = spawnSync('sh', [join(dir, 'ci/plumbline-check.sh')], { encoding: 'utf8', env: { PATH: '/nonexistent:/usr/bin:/bin' } });
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/npm ci/);
  });
});

/** The files `npm pack` puts in the tarball (npm pack --dry-run: about a second). */
let packed: string[] | undefined;
function packedFiles(): string[] {
  const json = execFileSync('npm', ['pack', '--dry-run', '--json', '--ignore-scripts'], { cwd: ROOT, encoding: 'utf8', stdio: ['ignore', 'pipe', 'ignore'] });
  return (packed ??= (JSON.parse(json) as Array<{ files: Array<{ path: string }> }>)[0]!.files.map((f) => f.path));
}

describe('the package a team installs', () => {
  it('ships the CLI, its sources, templates, Eleventy config and docs, and no tests, fixtures, bench or demo handbook', () => {
    const files = packedFiles();
    for (const f of ['bin/plumbline.js', 'src/cli/main.ts', 'src/cli/init.ts', 'src/report/site.ts', 'eleventy.config.js', 'templates/_layouts/base.njk', 'docs/format.md', 'README.md', 'package.json']) expect(files).toContain(f);
    // Every template the report renders (src/report/site.ts reads templates/ beside src/).
    const templates = (function list(d: string, rel: string): string[] {
      return readdirSync(d, { withFileTypes: true }).flatMap((e) => (e.isDirectory() ? list(join(d, e.name), `${rel}${e.name}/`) : [`${rel}${e.name}`]));
    })(join(ROOT, 'templates'), 'templates/');
    for (const t of templates) expect(files).toContain(t);
    const outside = files.filter((f) => !/^(bin|src|templates|docs)\//.test(f) && !['eleventy.config.js', 'README.md', 'package.json', 'LICENSE'].includes(f));
    expect(outside).toEqual([]);
    expect(files.filter((f) => /^(test|bench|scripts|structures|rules|\.ci|site|node_modules)\//.test(f) || f === 'handbook.yaml' || f === 'materials.yaml')).toEqual([]);
  });

  it('declares every package the runtime imports as a dependency, not a devDependency', () => {
    const pkg = JSON.parse(readFileSync(join(ROOT, 'package.json'), 'utf8')) as { dependencies: Record<string, string> };
    const sources = (function list(d: string): string[] {
      return readdirSync(d, { withFileTypes: true }).flatMap((e) => (e.isDirectory() ? list(join(d, e.name)) : /\.(ts|js)$/.test(e.name) ? [join(d, e.name)] : []));
    })(join(ROOT, 'src'));
    const imported = new Set<string>();
    for (const file of [...sources, join(ROOT, 'bin/plumbline.js'), join(ROOT, 'eleventy.config.js')]) {
      // Drop `import type` lines: erased at run time.
      const text = readFileSync(file, 'utf8').replace(/^import type .*$/gm, '');
      for (const m of text.matchAll(/(?:from|import\(|import|resolve\()\s*'([^'.][^']*)'/g)) {
        const spec = m[1]!;
        if (spec.startsWith('node:')) continue;
        imported.add(spec.startsWith('@') ? spec.split('/').slice(0, 2).join('/') : spec.split('/')[0]!);
      }
    }
    expect(imported.size).toBeGreaterThan(5);
    for (const name of imported) expect([name, name in pkg.dependencies]).toEqual([name, true]);
  });

  // Regression: installed, the package lives under node_modules/, which Eleventy ignores by default
  // (and the team's .gitignore lists): `build` wrote a report of 0 pages and exited 0. Slow (one
  // real build of the scaffold, a few seconds): the tarball's files laid out as npm installs them,
  // their dependencies linked from this checkout.
  it('builds a whole report when installed under a project\'s node_modules (it wrote 0 pages)', () => {
    const project = join(tempDir('installed'), 'team-rules');
    expect(scaffoldHandbook(project, {}).ok).toBe(true);
    const pkg = join(project, 'node_modules', 'plumbline');
    for (const f of packedFiles()) {
      mkdirSync(dirname(join(pkg, f)), { recursive: true });
      copyFileSync(join(ROOT, f), join(pkg, f));
    }
    symlinkSync(join(ROOT, 'node_modules'), join(pkg, 'node_modules'));
    const r = spawnSync(process.execPath, [join(pkg, 'bin/plumbline.js'), 'build'], { cwd: project, encoding: 'utf8' });
    expect([r.status, r.stderr]).toEqual([0, '']);
    expect(r.stdout).not.toMatch(/wrote 0 pages/);
    for (const page of ['index.html', 'matrix/index.html', 'rules/EX-AR-1/index.html', 'structures/example-trench/index.html']) expect([page, existsSync(join(project, 'site', page))]).toEqual([page, true]);
  });

  // Opt-in, slow (a real install, ~20–60 s, needs the registry or a warm npm cache):
  //   PLUMBLINE_PACK_INSTALL=1 npx vitest run test/cli/init.test.ts
  it.runIf(process.env.PLUMBLINE_PACK_INSTALL === '1')('installs from the tarball and checks a scaffolded handbook (slow, opt-in)', () => {
    const work = tempDir('pack');
    onTestFinished(() => rmSync(work, { recursive: true, force: true })); // a whole install: ~100 MB
    const npm = (args: string[], cwd: string) => execFileSync('npm', args, { cwd, encoding: 'utf8', stdio: ['ignore', 'pipe', 'pipe'] });
    const tarball = join(work, JSON.parse(npm(['pack', '--json', '--ignore-scripts', '--pack-destination', work], ROOT))[0].filename as string);
    const project = join(work, 'team-rules');
    expect(scaffoldHandbook(project, { title: 'Example Fab trench rules' }).ok).toBe(true);
    npm(['init', '-y'], project);
    npm(['i', '-D', '--no-audit', '--no-fund', '--prefer-offline', tarball], project);
    const help = spawnSync('npx', ['--no-install', 'plumbline', '--help'], { cwd: project, encoding: 'utf8' });
    expect([help.status, help.stdout]).toEqual([0, expect.stringContaining('Usage: plumbline')]);
    const check = spawnSync('npx', ['--no-install', 'plumbline', 'check'], { cwd: project, encoding: 'utf8' });
    expect([check.status, check.stderr]).toEqual([0, '']);
    expect(check.stdout).toMatch(/2 pass, 0 fail/);
    const build = spawnSync('npx', ['--no-install', 'plumbline', 'build'], { cwd: project, encoding: 'utf8' });
    expect([build.status, build.stdout]).toEqual([0, expect.not.stringContaining('wrote 0 pages')]);
    expect(existsSync(join(project, 'site', 'rules', 'EX-AR-1', 'index.html'))).toBe(true);
  }, 180_000);
});

// Keep the list of files in one place: the test's FILES is what scaffoldFiles says.
it('FILES above is the scaffold', () => expect(scaffoldFiles().map((f) => f.path)).toEqual(FILES));
