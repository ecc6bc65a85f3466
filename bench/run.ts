// Benchmarks: speed targets live here, never in timed tests. Run with `npm run bench`.
// Each case prints its time against its target; the run exits 1 if a target is missed.
import { loadHandbookFolder } from '../src/pipeline.ts';
import { mkdtempSync, mkdirSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { performance } from 'node:perf_hooks';
import { evaluateHandbook } from '../src/checker/evaluate.ts';

import { buildSite } from '../src/report/site.ts';
import { execFileSync } from 'node:child_process';
import { GitRepo } from '../src/history/git.ts';
import { HistoryCache } from '../src/history/cache.ts';
import { walkHistory } from '../src/history/history.ts';

const KINDS = [
  { kind: 'hole', extent: 'depth', extra: 'array: hexagonal' },
  { kind: 'trench', extent: 'depth', extra: 'length: 10 um' },
  { kind: 'cylinder', extent: 'height', extra: 'array: hexagonal\n  wall: 6 nm ± 0.5 nm' },
  { kind: 'line', extent: 'height', extra: 'length: 2 um' },
];
const QUANTITIES = ['geometry.aspect_ratio', 'geometry.bottom_cd', 'geometry.space', 'geometry.bottom_to_top_ratio', 'geometry.open_area_fraction'];

/** A synthetic handbook folder: `structures` files and `rules` rules, every rule worst-case. */
function writeHandbook(structures: number, rules: number): string {
  const root = mkdtempSync(join(tmpdir(), 'plumbline-bench-'));
  mkdirSync(join(root, 'structures'));
  mkdirSync(join(root, 'rules'));
  writeFileSync(join(root, 'handbook.yaml'), 'title: Benchmark handbook\n');
  for (let i = 0; i < structures; i++) {
    const k = KINDS[i % KINDS.length]!;
    const cd = 30 + (i % 17);
    writeFileSync(
      join(root, 'structures', `s-${i}.yaml`),
      `id: s-${i}\ntitle: Structure ${i}\nkind: ${k.kind}\ngeometry:\n  cd: ${cd} nm ± 1.5 nm\n  ${k.extent}: ${0.5 + (i % 9) * 0.2} um ± 20 nm\n  pitch: ${cd * 2} nm\n  sidewall_angle: ${k.kind === 'cylinder' ? 90.1 : 89.5} deg ± 0.1 deg\n  ${k.extra}\n`,
    );
  }
  const list: string[] = [];
  for (let j = 0; j < rules; j++) {
    list.push(`- id: R-${j}\n  title: Rule ${j}\n  applies_to: {}\n  quantity: ${QUANTITIES[j % QUANTITIES.length]}\n  at_least: ${j % QUANTITIES.length === 1 || j % QUANTITIES.length === 2 ? '5 nm' : '0.1'}\n  evaluate_at: worst-case\n`);
  }
  writeFileSync(join(root, 'rules', 'rules.yaml'), list.join(''));
  return root;
}

interface Case {
  name: string;
  targetMs: number;
  run: () => Promise<void> | void;
}

async function time(c: Case): Promise<boolean> {
  const t0 = performance.now();
  await c.run();
  const ms = performance.now() - t0;
  const ok = ms <= c.targetMs;
  console.log(`${ok ? 'ok  ' : 'MISS'} ${c.name}: ${ms.toFixed(0)} ms (target ≤ ${c.targetMs} ms)`);
  return ok;
}

/** Storage-node-like cylinders with lattices, one worst-case collapse rule each (5 toleranced inputs). */
function writeCollapseHandbook(structures: number): string {
  const root = mkdtempSync(join(tmpdir(), 'plumbline-bench-collapse-'));
  mkdirSync(join(root, 'structures'));
  mkdirSync(join(root, 'rules'));
  writeFileSync(join(root, 'handbook.yaml'), 'title: Collapse benchmark\n');
  for (let i = 0; i < structures; i++) {
    writeFileSync(
      join(root, 'structures', `c-${i}.yaml`),
      `id: c-${i}\ntitle: Cylinder ${i}\nkind: cylinder\ngeometry:\n  cd: ${30 + (i % 7)} nm ± 1.5 nm\n  height: ${1.5 + (i % 5) * 0.1} um ± 40 nm\n  pitch: 52 nm\n  array: hexagonal\n  sidewall_angle: 90.1 deg ± 0.05 deg\n  wall: 6 nm ± 0.5 nm\nmaterials:\n  body: titanium-nitride\ndrying:\n  liquid: water\n  contact_angle: 10 deg\n  supports: [0.7 um, 1.3 um]\n`,
    );
  }
  writeFileSync(join(root, 'rules', 'r.yaml'), 'id: C-STAND-1\ntitle: Stands\napplies_to: {}\nquantity: mechanics.collapse_margin\nat_least: 1\nevaluate_at: worst-case\n');
  return root;
}

/** Holes with an etch recipe and tolerances; three worst-case etch rules each. */
function writeEtchHandbook(structures: number): string {
  const root = mkdtempSync(join(tmpdir(), 'plumbline-bench-etch-'));
  mkdirSync(join(root, 'structures'));
  mkdirSync(join(root, 'rules'));
  writeFileSync(join(root, 'handbook.yaml'), 'title: Etch benchmark\n');
  for (let i = 0; i < structures; i++) {
    writeFileSync(
      join(root, 'structures', `h-${i}.yaml`),
      `id: h-${i}\ntitle: Hole ${i}\nkind: hole\ngeometry:\n  cd: ${60 + (i % 9) * 10} nm ± 3 nm\n  depth: ${1 + (i % 5) * 0.5} um ± 50 nm\n  pitch: 200 nm\n  array: hexagonal\n  sidewall_angle: 89.8 deg ± 0.05 deg\netch:\n  open_rate: 300 nm/min\n  reaction_probability: 0.05\n  time_budget: 20 min\n  mask_thickness: 500 nm\n  reference_cd: 400 nm\n`,
    );
  }
  const rules = [
    ['E-TIME', 'etch.time_margin', 'at_least: 1'],
    ['E-DEPTH', 'etch.depth_in_budget', 'at_least: 1 um'],
    ['E-LAG', 'etch.lag', 'at_most: 0.5'],
  ];
  writeFileSync(join(root, 'rules', 'r.yaml'), rules.map(([id, q, lim]) => `- id: ${id}\n  title: ${id}\n  applies_to: {}\n  quantity: ${q}\n  ${lim}\n  evaluate_at: worst-case\n`).join(''));
  return root;
}

const big = writeHandbook(1000, 100);
const etch = loadHandbookFolder(writeEtchHandbook(200));
if (!etch.ok) throw new Error(JSON.stringify(etch.diagnostics.slice(0, 3)));
const collapse = loadHandbookFolder(writeCollapseHandbook(200));
if (!collapse.ok) throw new Error(JSON.stringify(collapse.diagnostics.slice(0, 3)));
const loaded = loadHandbookFolder(big);
if (!loaded.ok) throw new Error(JSON.stringify(loaded.diagnostics.slice(0, 3)));
const mid = process.env.BENCH_SITE === "0" ? "" : writeHandbook(200, 100);

/**
 * A repository of `commits` commits over a handbook of 20 trenches and 5 rules, each commit moving
 * one trench's depth (written with `git fast-import`, git's own bulk writer, in well under a second).
 */
function writeHistoryRepo(commits: number): string {
  const root = mkdtempSync(join(tmpdir(), 'plumbline-bench-history-'));
  execFileSync('git', ['init', '-q', '-b', 'main', root]);
  const rules = ['geometry.aspect_ratio at_most 12', 'geometry.space at_least 20 nm', 'geometry.bottom_cd at_least 5 nm', 'geometry.open_area_fraction at_least 0.2', 'geometry.bottom_to_top_ratio at_least 0.5']
    .map((r, i) => {
      const [q, cmp, ...lim] = r.split(' ');
      return `- id: B-${i}\n  title: Rule ${i}\n  applies_to: {}\n  quantity: ${q}\n  ${cmp}: ${lim.join(' ')}\n  evaluate_at: worst-case\n`;
    })
    .join('');
  const file = (path: string, text: string) => `M 100644 inline ${path}\ndata ${Buffer.byteLength(text)}\n${text}\n`;
  const trench = (i: number, depth: number) => `id: t-${i}\ntitle: Trench ${i}\nkind: trench\ngeometry:\n  cd: ${25 + (i % 5)} nm ± 1 nm\n  depth: ${depth} nm ± 5 nm\n  pitch: 60 nm\n  sidewall_angle: 89.6 deg ± 0.1 deg\n  length: 10 um\n`;
  let stream = '';
  for (let c = 0; c < commits; c++) {
    const when = 1767261600 + c * 3600;
    const msg = `commit ${c}`;
    stream += `commit refs/heads/main\ncommitter Bench Writer <bench@example.test> ${when} +0000\ndata ${msg.length}\n${msg}\n`;
    if (c === 0) {
      stream += file('handbook.yaml', 'title: History benchmark\n') + file('rules/rules.yaml', rules);
      for (let i = 0; i < 20; i++) stream += file(`structures/t-${i}.yaml`, trench(i, 200));
    } else stream += file(`structures/t-${c % 20}.yaml`, trench(c % 20, 200 + ((c * 7) % 150)));
    stream += '\n';
  }
  execFileSync('git', ['fast-import', '--quiet'], { cwd: root, input: stream });
  execFileSync('git', ['checkout', '-q', 'main'], { cwd: root });
  return root;
}

const historyRepo = writeHistoryRepo(500);
const historyCache = new HistoryCache();

/** Waivers are judged on a fixed day, so every run times the same work. */
const ON = { on: '2026-12-02' };

const demoLoad = loadHandbookFolder(new URL('..', import.meta.url).pathname);
if (!demoLoad.ok) throw new Error('the demo handbook does not load');
const demo = demoLoad;

const cases: Case[] = [
  { name: 'load and validate 1,000 structure files and 100 rules', targetMs: 3000, run: () => void loadHandbookFolder(big) },
  {
    name: 'evaluate 100,000 verdicts with tolerance corners',
    targetMs: 1000,
    run: () => {
      const r = evaluateHandbook(loaded.handbook, ON);
      if (r.verdicts.length !== 100_000) throw new Error('wrong verdict count');
    },
  },
  {
    name: 'evaluate 600 etch verdicts (time, depth in budget, lag; 8 corners each)',
    targetMs: 3000,
    run: () => void evaluateHandbook(etch.handbook, ON),
  },
  {
    name: 'evaluate 200 collapse verdicts (finite-element body, 16 corners each)',
    targetMs: 5000,
    run: () => void evaluateHandbook(collapse.handbook, ON),
  },
  {
    // The demo's yield rules: each samples its structure until the interval decides (FIN-STAND-Y
    // runs the fin's collapse beam a few thousand times).
    name: "evaluate the demo handbook's yield rules (sequential sampling to a decision)",
    targetMs: 3000,
    run: () => {
      const h = { ...demo.handbook, rules: demo.handbook.rules.filter((r) => r.evaluateAt === 'yield') };
      if (h.rules.length === 0) throw new Error('the demo has no yield rule');
      evaluateHandbook(h, ON);
    },
  },
  {
    // What the report and explain ask for: probabilities of failure, sensitivities, passing values, sweeps.
    name: 'evaluate the demo handbook with every detail',
    targetMs: 15_000,
    run: () => void evaluateHandbook(demo.handbook, { ...ON, detail: true }),
  },
  {
    name: 'history over 500 commits, cold (every revision loaded, new pairs evaluated)',
    targetMs: 30_000,
    run: () => {
      const h = walkHistory(GitRepo.at(historyRepo), historyCache, { today: '2026-12-02' });
      if (h.revisions.length !== 500) throw new Error(`expected 500 revisions, got ${h.revisions.length}`);
    },
  },
  {
    name: 'history over 500 commits, warm (nothing loaded or evaluated again)',
    targetMs: 2000,
    run: () => {
      const h = walkHistory(GitRepo.at(historyRepo), historyCache, { today: '2026-12-02' });
      if (h.stats.loaded !== 0 || h.stats.evaluated !== 0) throw new Error('the warm run evaluated again');
    },
  },
  ...(mid === '' ? [] : [{
    name: 'build the site for 200 structures × 100 rules (matrix of 20,000 cells)',
    targetMs: 120_000,
    run: async () => {
      const h = loadHandbookFolder(mid);
      if (!h.ok) throw new Error('bench handbook invalid');
      await buildSite(h.handbook, evaluateHandbook(h.handbook, ON), join(mid, 'site'));
    },
  }]),
];

let allOk = true;
for (const c of cases) allOk = (await time(c)) && allOk;
process.exitCode = allOk ? 0 : 1;
