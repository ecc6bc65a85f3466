// The `plumbline` command: a thin shell over the pipeline. Each command renders records the core
// returns as text or JSON; exit codes come from exitCodeFor().
import { resolve } from 'node:path';
import process from 'node:process';
import { Command, InvalidArgumentError, Option } from 'commander';
import { evaluateRule, evaluateStructure, PlanCache } from '../checker/evaluate.ts';
import type { Diagnostic } from '../diagnostics/diagnostic.ts';
import { formatDiagnostics, formatWarnings } from '../diagnostics/messages.ts';
import { FolderSource, SingleFileSource } from '../model/folder-source.ts';
import { loadHandbook, loadStructure } from '../model/load.ts';
import type { Structure } from '../model/types.ts';
import { checkHandbook, exitCodeFor } from '../pipeline.ts';
import { Refusal } from '../diagnostics/refusal.ts';
import { renderCheckSummary, renderExplain, renderStructureQuantities } from './text.ts';

interface Io {
  out: (s: string) => void;
  err: (s: string) => void;
}

function rootOf(cmd: Command): string {
  return resolve(String(cmd.optsWithGlobals().root ?? '.'));
}

/** Ports: a whole number 0–65535 (0 asks the system for a free one). */
export function parsePort(text: string): number {
  if (!/^\d{1,5}$/.test(text.trim()) || Number(text) > 65535) throw new InvalidArgumentError('expected a port number from 0 to 65535 (0 picks a free one)');
  return Number(text);
}

function printWarnings(io: Io, warnings: Diagnostic[]): void {
  if (warnings.length) io.err(formatWarnings(warnings));
}

/** Builds the program; `run` is exported for tests, which pass their own io. */
export function buildProgram(io: Io, setExit: (code: number) => void): Command {
  const program = new Command('plumbline')
    .description('Check a design-rule handbook of high-aspect-ratio structures and publish it as a report.')
    .addOption(new Option('--root <dir>', 'handbook folder (with structures/ and rules/)').default('.'))
    .configureOutput({ writeOut: (s) => io.out(s.replace(/\n$/, '')), writeErr: (s) => io.err(s.replace(/\n$/, '')) })
    .exitOverride()
    .showHelpAfterError();

  program
    .command('check')
    .description('evaluate every rule on every structure; exit 0 when no blocking rule fails, 1 when one does, 2 when the handbook cannot be loaded')
    .option('--json', 'print the verdicts as JSON (SI values)')
    .action((opts: { json?: boolean }, cmd: Command) => {
      const outcome = checkHandbook(new FolderSource(rootOf(cmd)));
      if (!outcome.ok) io.err(formatDiagnostics(outcome.diagnostics));
      else {
        const { handbook, results } = outcome;
        printWarnings(io, handbook.warnings);
        if (opts.json) io.out(JSON.stringify({ handbook: handbook.meta.title, counts: results.counts, blocking_failures: results.blockingFailures, warnings: handbook.warnings, verdicts: results.verdicts }, null, 2));
        else io.out(renderCheckSummary(handbook, results));
      }
      setExit(exitCodeFor(outcome));
    });

  program
    .command('eval')
    .description('every quantity the engines can compute for one structure (a file, or an id in the handbook)')
    .argument('<structure>', 'path to a structure YAML file, or a structure id')
    .option('--json', 'print { id, kind, quantities } with SI values')
    .action((target: string, opts: { json?: boolean }, cmd: Command) => {
      const root = rootOf(cmd);
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
    .action((ruleId: string, structureId: string, _opts: unknown, cmd: Command) => {
      const loaded = loadHandbook(new FolderSource(rootOf(cmd)));
      if (!loaded.ok) {
        io.err(formatDiagnostics(loaded.diagnostics));
        return setExit(2);
      }
      printWarnings(io, loaded.handbook.warnings);
      const rule = loaded.handbook.rules.find((r) => r.id === ruleId);
      const s = loaded.handbook.structures.find((x) => x.id === structureId);
      if (!rule || !s) {
        io.err(!rule ? `no rule "${ruleId}"` : `no structure "${structureId}"`);
        return setExit(2);
      }
      io.out(renderExplain(rule, s, evaluateRule(rule, s, new PlanCache())));
      setExit(0);
    });

  program
    .command('build')
    .description('publish the report as a static site (written aside and swapped in; an invalid handbook leaves the old report untouched)')
    .option('--out <dir>', 'output folder: absent, empty, or a report plumbline wrote', 'site')
    .action(async (opts: { out: string }, cmd: Command) => {
      const root = rootOf(cmd);
      const outcome = checkHandbook(new FolderSource(root));
      if (!outcome.ok) {
        io.err(formatDiagnostics(outcome.diagnostics, 'nothing was written'));
        return setExit(2);
      }
      printWarnings(io, outcome.handbook.warnings);
      const { buildSite } = await import('../report/site.ts');
      const { writeFailure } = await import('../report/publish.ts');
      const out = resolve(root, opts.out);
      try {
        const stats = await buildSite(outcome.handbook, outcome.results, out, { command: 'plumbline build', onWait: (h) => io.err(`waiting for another build of ${out} (pid ${h.pid}, started ${h.started}) to finish`) });
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
        serving = await serveSite(rootOf(cmd), resolve(rootOf(cmd), opts.out), opts.port, io);
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
