// The `plumbline` command: a thin shell over the pipeline. Each command renders records the core
// returns as text or JSON; exit codes come from exitCodeFor().
import { resolve } from 'node:path';
import process from 'node:process';
import { Command, InvalidArgumentError, Option } from 'commander';
import type { Diagnostic } from '../diagnostics/diagnostic.ts';
import { formatDiagnostics, formatWarnings } from '../diagnostics/messages.ts';
import type { Handbook, Structure } from '../model/types.ts';
import { Refusal } from '../diagnostics/refusal.ts';
import { exitCodeFor } from '../exit-codes.ts';
import { TOOL_VERSION } from './version.ts';
import { isCalendarDate, utcDateOf } from '../model/calendar.ts';

/**
 * The loader, the checker and the engines (mathjs among them): loaded by the commands that use
 * them, so `--version`, `--help` and `init` start without them.
 */
async function core() {
  const [evaluate, load, folder, pipeline, text] = await Promise.all([import('../checker/evaluate.ts'), import('../model/load.ts'), import('../model/folder-source.ts'), import('../pipeline.ts'), import('./text.ts')]);
  return { ...evaluate, ...load, ...folder, ...pipeline, ...text };
}

interface Io {
  out: (s: string) => void;
  err: (s: string) => void;
}

function rootOf(cmd: Command): string {
  return resolve(String(cmd.optsWithGlobals().root ?? '.'));
}

/** A calendar day, YYYY-MM-DD, that exists (2026-02-30 does not). */
export function parseDay(text: string): string {
  if (!isCalendarDate(text.trim())) throw new InvalidArgumentError('expected a date YYYY-MM-DD that exists, such as 2026-12-02');
  return text.trim();
}

/** Percentage points: a number ≥ 0. */
export function parsePoints(text: string): number {
  const n = Number(text);
  if (text.trim() === '' || !Number.isFinite(n) || n < 0) throw new InvalidArgumentError('expected percentage points, a number of at least 0 (5 means five points of margin)');
  return n;
}

/** Today in UTC: the day waivers are judged on unless --on names another. */
function todayUtc(): string {
  return utcDateOf(new Date());
}

/** Ports: a whole number 0–65535 (0 asks the system for a free one). */
function collect(value: string, previous: string[]): string[] {
  return [...previous, value];
}

export function parseSteps(text: string): number {
  const n = Number(text);
  if (!Number.isInteger(n) || n < 2 || n > 101) throw new InvalidArgumentError('a whole number of points from 2 to 101');
  return n;
}

export function parsePort(text: string): number {
  if (!/^\d{1,5}$/.test(text.trim()) || Number(text) > 65535) throw new InvalidArgumentError('expected a port number from 0 to 65535 (0 picks a free one)');
  return Number(text);
}

function printWarnings(io: Io, warnings: Diagnostic[]): void {
  if (warnings.length) io.err(formatWarnings(warnings));
}

/** Builds the program; `run` is exported for tests, which pass their own io. */
export function buildProgram(io: Io, setExit: (code: number) => void): Command {
  /** The handbook at the command's root; when it does not load, its diagnostics are printed, the exit is 2, and null. */
  const handbookOf = async (cmd: Command): Promise<Handbook | null> => {
    const { loadHandbook, FolderSource } = await core();
    const loaded = loadHandbook(new FolderSource(rootOf(cmd)));
    if (!loaded.ok) {
      io.err(formatDiagnostics(loaded.diagnostics));
      setExit(2);
      return null;
    }
    printWarnings(io, loaded.handbook.warnings);
    return loaded.handbook;
  };
  const program = new Command('plumbline')
    .description('Check a design-rule handbook of high-aspect-ratio structures and publish it as a report.')
    .addOption(new Option('--root <dir>', 'handbook folder (with structures/ and rules/)').default('.'))
    .version(TOOL_VERSION, '--version', 'print the version of plumbline')
    .configureOutput({ writeOut: (s) => io.out(s.replace(/\n$/, '')), writeErr: (s) => io.err(s.replace(/\n$/, '')) })
    .exitOverride()
    .showHelpAfterError();

  program
    .command('check')
    .description('evaluate every rule on every structure; exit 0 when no blocking rule fails, 1 when one does, 2 when the handbook cannot be loaded')
    .option('--json', 'print the verdicts as JSON (SI values)')
    .option('--ledger', `write the verdict ledger (${'verdicts.ledger'}) beside the handbook's YAML, to commit with it`)
    .option('--verify', 'with --ledger: write nothing; exit 1 and print the lines that differ when the committed ledger is stale')
    .option('--sarif <file>', 'also write the failing, waived and incomplete verdicts as a SARIF 2.1.0 log')
    .option('--baseline <rev>', 'with --sarif: mark each result new, unchanged, updated or absent against this revision')
    .option('--on <date>', 'judge waivers on this day (YYYY-MM-DD, UTC); default today', parseDay)
    .option('--detail', "also work out each verdict's sensitivities, passing values and probability of failure (slower; --json carries them)")
    .action(async (opts: { json?: boolean; ledger?: boolean; verify?: boolean; sarif?: string; baseline?: string; on?: string; detail?: boolean }, cmd: Command) => {
      if (opts.verify && !opts.ledger) throw new InvalidArgumentError('--verify checks the ledger: give it with --ledger');
      if (opts.baseline !== undefined && opts.sarif === undefined) throw new InvalidArgumentError('--baseline marks the results of a SARIF log: give it with --sarif FILE');
      const root = rootOf(cmd);
      const on = opts.on ?? todayUtc();
      const { checkHandbook, FolderSource, renderCheckSummary } = await core();
      const outcome = checkHandbook(new FolderSource(root), { on, detail: opts.detail === true });
      if (!outcome.ok) {
        io.err(formatDiagnostics(outcome.diagnostics));
        return setExit(exitCodeFor(outcome));
      }
      const { handbook, results } = outcome;
      printWarnings(io, handbook.warnings);
      if (opts.sarif !== undefined) {
        const { runSarif } = await import('./git-commands.ts');
        await runSarif(root, handbook, results, resolve(opts.sarif), opts.baseline, on, io);
      }
      if (opts.ledger) {
        const { runLedger } = await import('./git-commands.ts');
        // --verify answers one question (is the committed ledger current?); writing it reports as check does.
        const code = runLedger(root, handbook, on, opts.verify === true, io);
        return setExit(opts.verify ? code : exitCodeFor(outcome));
      }
      if (opts.json) io.out(JSON.stringify({ handbook: handbook.meta.title, on: results.on, counts: results.counts, blocking_failures: results.blockingFailures, warnings: handbook.warnings, waivers: results.waivers, verdicts: results.verdicts, ...(results.windows ? { windows: results.windows } : {}) }, null, 2));
      else io.out(renderCheckSummary(handbook, results));
      setExit(exitCodeFor(outcome));
    });

  program
    .command('history')
    .description("every verdict transition in the handbook's git history, with its commit and the input changes behind it")
    .argument('[subject]', 'only the transitions of this rule or structure id')
    .option('--since <rev>', 'only commits after this one')
    .option('--first-parent', 'walk only the main line (a merge stands for its whole branch)')
    .option('--moved <points>', 'list a verdict whose margin moved by at least this many percentage points', parsePoints, 10)
    .option('--on <date>', 'judge waiver expiry on this day (YYYY-MM-DD, UTC); default today', parseDay)
    .option('--json', 'print the revisions, transitions, ledger disagreements and waiver events as JSON')
    .action(async (subject: string | undefined, opts: { since?: string; firstParent?: boolean; moved: number; on?: string; json?: boolean }, cmd: Command) => {
      const { runHistory } = await import('./git-commands.ts');
      setExit(await runHistory(rootOf(cmd), subject, { since: opts.since, firstParent: opts.firstParent, moved: opts.moved / 100, on: opts.on ?? todayUtc(), json: opts.json }, io));
    });

  program
    .command('diff')
    .description('the verdicts a change moves, as Markdown for a change request; exit 1 when it introduces a blocking failure')
    .argument('<base>', 'the revision the change starts from (a branch, tag or commit)')
    .argument('[head]', 'the revision of the change; default: the working tree')
    .option('--moved <points>', 'list a verdict whose margin moved by at least this many percentage points', parsePoints, 1)
    .option('--on <date>', 'judge waivers on this day (YYYY-MM-DD, UTC); default today', parseDay)
    .option('--json', 'print the transitions as JSON')
    .action(async (base: string, head: string | undefined, opts: { moved: number; on?: string; json?: boolean }, cmd: Command) => {
      const root = rootOf(cmd);
      const { runDiff } = await import('./git-commands.ts');
      // Links come from the handbook the change leads to (the working tree, or HEAD's own when given).
      const { loadHandbook, FolderSource } = await core();
      const meta = loadHandbook(new FolderSource(root));
      const links = meta.ok ? (meta.handbook.meta.links ?? {}) : {};
      setExit(runDiff(root, base, head, links, { moved: opts.moved / 100, on: opts.on ?? todayUtc(), json: opts.json }, io));
    });

  program
    .command('eval')
    .description('every quantity the engines can compute for one structure (a file, or an id in the handbook)')
    .argument('<structure>', 'path to a structure YAML file, or a structure id')
    .option('--json', 'print { id, kind, quantities } with SI values')
    .action(async (target: string, opts: { json?: boolean }, cmd: Command) => {
      const root = rootOf(cmd);
      const { SingleFileSource, FolderSource, loadStructure, loadHandbook, evaluateStructure, renderStructureQuantities } = await core();
      let structure: Structure | undefined;
      if (/\.ya?ml$/i.test(target)) {
        // A file named on the command line: that one regular file, under the loader's size limit.
        const file = new SingleFileSource(resolve(target));
        const r = loadStructure(file, file.file, new FolderSource(root));
        if (!r.ok) {
          io.err(formatDiagnostics(r.diagnostics));
          return setExit(2);
        }
        printWarnings(io, r.warnings);
        structure = r.structure;
      } else {
        const loaded = loadHandbook(new FolderSource(root));
        if (!loaded.ok) {
          io.err(formatDiagnostics(loaded.diagnostics));
          return setExit(2);
        }
        printWarnings(io, loaded.handbook.warnings);
        structure = loaded.handbook.structures.find((s) => s.id === target);
        if (!structure) {
          io.err(`no structure "${target}" in ${root} (and no such .yaml file)`);
          return setExit(2);
        }
      }
      const { quantities, incomplete } = evaluateStructure(structure);
      if (opts.json) io.out(JSON.stringify({ id: structure.id, kind: structure.kind, quantities, incomplete }, null, 2));
      else io.out(renderStructureQuantities(structure, quantities, incomplete));
      setExit(0);
    });

  program
    .command('explain')
    .description('the derivation of one verdict: inputs, formulas, intermediate values, worst corner, sources')
    .argument('<rule>', 'rule id')
    .argument('<structure>', 'structure id')
    .option('--on <date>', 'judge waivers on this day (YYYY-MM-DD, UTC); default today', parseDay)
    .action(async (ruleId: string, structureId: string, opts: { on?: string }, cmd: Command) => {
      const { renderExplain, evaluateRule, applyWaivers, PlanCache } = await core();
      const handbook = await handbookOf(cmd);
      if (!handbook) return;
      const rule = handbook.rules.find((r) => r.id === ruleId);
      const s = handbook.structures.find((x) => x.id === structureId);
      if (!rule || !s) {
        io.err(!rule ? `no rule "${ruleId}"` : `no structure "${structureId}"`);
        return setExit(2);
      }
      const [verdict] = applyWaivers([evaluateRule(rule, s, new PlanCache({ detail: true }))], handbook, opts.on ?? todayUtc()).verdicts;
      io.out(renderExplain(rule, s, verdict!));
      setExit(0);
    });

  program
    .command('sweep')
    .description("every rule that applies to one structure, across a range of one or two of its inputs (waivers are not applied)")
    .argument('<structure>', 'structure id')
    .option('--vary <input=from..to>', 'an input and its range, in any unit of its dimension (height=1.2um..2.4um); give it once or twice', collect, [])
    .option('--steps <n>', 'points along each range, ends included (default 9 for one input, 5 for two)', parseSteps)
    .option('--json', 'print the grid with SI values')
    .action(async (structureId: string, opts: { vary: string[]; steps?: number; json?: boolean }, cmd: Command) => {
      if (opts.vary.length < 1 || opts.vary.length > 2) throw new InvalidArgumentError('give --vary once or twice (input=from..to)');
      const { renderSweep } = await core();
      const { sweepStructure } = await import('../checker/sweep.ts');
      const { parseValue, isUnitProblem } = await import('../model/units.ts');
      const handbook = await handbookOf(cmd);
      if (!handbook) return;
      const s = handbook.structures.find((x) => x.id === structureId);
      if (!s) {
        io.err(`no structure "${structureId}"`);
        return setExit(2);
      }
      const steps = opts.steps ?? (opts.vary.length === 1 ? 9 : 5);
      const problems: string[] = [];
      const axes = opts.vary.flatMap((text) => {
        const m = /^([a-z0-9_.-]+)=(.+?)\.\.(.+)$/.exec(text.trim());
        if (!m) {
          problems.push(`--vary ${text}: expected input=from..to, as height=1.2um..2.4um`);
          return [];
        }
        const name = m[1]!.includes('.') ? m[1]! : `geometry.${m[1]}`;
        const p = s.params.get(name);
        if (!p) {
          problems.push(`--vary ${text}: ${s.id} has no input ${name} (it has ${[...s.params.keys()].sort().join(', ')})`);
          return [];
        }
        const ends = [m[2]!, m[3]!].map((t) => parseValue(t.trim(), p.unit));
        const bad = ends.find(isUnitProblem);
        if (bad && isUnitProblem(bad)) {
          problems.push(`--vary ${text}: ${bad.expected}`);
          return [];
        }
        const [from, to] = ends.map((e) => (e as { value: number; low?: number }));
        if (from!.low !== undefined || to!.low !== undefined) {
          problems.push(`--vary ${text}: the ends of a range carry no tolerance`);
          return [];
        }
        return [{ input: name, unit: p.unit, from: from!.value, to: to!.value, steps }];
      });
      if (problems.length) {
        io.err(problems.join('\n'));
        return setExit(2);
      }
      const result = sweepStructure(handbook, s, axes);
      io.out(opts.json ? JSON.stringify(result, null, 2) : renderSweep(result));
      setExit(0);
    });

  program
    .command('build')
    .description('publish the report as a static site (written aside and swapped in; an invalid handbook leaves the old report untouched)')
    .option('--out <dir>', 'output folder: absent, empty, or a report plumbline wrote', 'site')
    .option('--on <date>', 'judge waivers on this day (YYYY-MM-DD, UTC); default today', parseDay)
    .option('--no-history', "leave the handbook's git history out of the report (timelines, audit page)")
    .action(async (opts: { out: string; on?: string; history: boolean }, cmd: Command) => {
      const root = rootOf(cmd);
      const { checkHandbook, FolderSource } = await core();
      const outcome = checkHandbook(new FolderSource(root), { on: opts.on ?? todayUtc(), detail: true });
      if (!outcome.ok) {
        io.err(formatDiagnostics(outcome.diagnostics, 'nothing was written'));
        return setExit(2);
      }
      printWarnings(io, outcome.handbook.warnings);
      const { buildSite } = await import('../report/site.ts');
      const on = opts.on ?? todayUtc();
      const history = opts.history ? (await import('../report/site-history.ts')).siteHistory(root, outcome.handbook.meta.links ?? {}, TOOL_VERSION, on) : undefined;
      const { writeFailure } = await import('../report/publish.ts');
      const out = resolve(root, opts.out);
      try {
        const stats = await buildSite(outcome.handbook, outcome.results, out, { command: 'plumbline build', extras: { tool: TOOL_VERSION, ...(history ? { history } : {}) }, onWait: (h) => io.err(`waiting for another build of ${out} (pid ${h.pid}, started ${h.started}) to finish`) });
        stats.recovered.forEach((n) => io.err(n));
        io.out(`wrote ${stats.pages} pages to ${out}\nopen ${resolve(out, 'index.html')}`);
        setExit(0);
      } catch (err) {
        throw writeFailure(err) ?? err;
      }
    });

  program
    .command('serve')
    .description('build, serve the report on 127.0.0.1 and rebuild when handbook files change')
    .option('--out <dir>', 'output folder: absent, empty, or a report plumbline wrote', 'site')
    .option('--port <n>', 'port (0 picks a free one)', parsePort, 8084)
    .action(async (opts: { out: string; port: number }, cmd: Command) => {
      const { serveSite } = await import('../report/serve.ts');
      const { writeFailure } = await import('../report/publish.ts');
      let serving;
      try {
        const root = rootOf(cmd);
        const { FolderSource, checkHandbook } = await core();
        serving = await serveSite(root, resolve(root, opts.out), opts.port, io, () => checkHandbook(new FolderSource(root), { on: todayUtc(), detail: true }));
      } catch (err) {
        throw writeFailure(err) ?? err;
      }
      await new Promise<void>((done) => {
        const stop = () => void serving.close().then(done);
        process.once('SIGINT', stop);
        process.once('SIGTERM', stop);
      });
      setExit(0);
    });

  program
    .command('init')
    .description('start a handbook: a minimal valid handbook, a .gitignore for the report and a CI script, in DIR (default: the current folder); never overwrites anything')
    .argument('[dir]', 'folder to start the handbook in', '.')
    .option('--title <text>', "the handbook's title")
    .action(async (dir: string, opts: { title?: string }) => {
      const { scaffoldHandbook, describeScaffold } = await import('./init.ts');
      const target = resolve(dir);
      const r = scaffoldHandbook(target, opts.title !== undefined ? { title: opts.title } : {});
      if (!r.ok) throw r.refusal;
      io.out(describeScaffold(target, r.written));
      setExit(0);
    });

  return program;
}

export async function run(argv: string[], io: Io): Promise<number> {
  let code = 0;
  const program = buildProgram(io, (c) => (code = c));
  try {
    await program.parseAsync(argv, { from: 'user' });
  } catch (err) {
    const e = err as { code?: string; exitCode?: number };
    if (typeof e.code === 'string' && e.code.startsWith('commander.')) {
      return e.code === 'commander.helpDisplayed' || e.code === 'commander.version' || e.code === 'commander.help' ? 0 : 2;
    }
    if (err instanceof Refusal) {
      io.err(`plumbline: ${err.message}`);
      return exitCodeFor({ refused: true });
    }
    io.err(`plumbline: internal error (please report it): ${(err as Error).stack ?? String(err)}`);
    return exitCodeFor({ bug: true });
  }
  return code;
}
