// plumbline's one-way flow. Each phase is a pure function of the one before it; tests and the CLI
// can stop after any of them.
//
//   handbook folder (YAML)
//     │ loadHandbook        read, parse with positions, validate against the JSON Schemas,
//     │                     normalize units to SI, resolve materials   → Handbook | Diagnostic[]
//     ▼
//   Handbook
//     │ evaluateHandbook    every rule × structure: plan, evaluate (nominal or corners),
//     │                     compare with the limit, keep the derivation → Results
//     ▼
//   Results
//     │ assembleReport      pages, matrix, chart specs (no physics)    → ReportData
//     ▼
//   ReportData
//     │ renderSite          Eleventy into a temporary folder, then swapped in atomically
//     ▼
//   site/
import { loadHandbookWith, type LoadResult } from './model/load.ts';
import { FolderSource } from './model/folder-source.ts';
import { QUANTITIES } from './engines/index.ts';
import { evaluateHandbook, type EvaluateOptions, type Results } from './checker/evaluate.ts';
import type { Diagnostic } from './diagnostics/diagnostic.ts';
import type { Handbook } from './model/types.ts';
import type { HandbookSource } from './model/source.ts';

export { evaluateHandbook };
export type { LoadResult };

/** Load a handbook, checking its rules against the engines' quantities. */
export function loadHandbook(source: HandbookSource): LoadResult {
  return loadHandbookWith(source, QUANTITIES);
}

/** Load the handbook in a folder on disk. */
export function loadHandbookFolder(root: string): LoadResult {
  return loadHandbook(new FolderSource(root));
}

export type CheckOutcome =
  | { ok: false; diagnostics: Diagnostic[] }
  | { ok: true; handbook: Handbook; results: Results };

/**
 * Load and evaluate: everything `check` needs. The source says where the files come from; `on`
 * is the day waivers are judged at (YYYY-MM-DD, UTC): the caller reads the clock, not the checker.
 */
export function checkHandbook(source: HandbookSource, options: EvaluateOptions): CheckOutcome {
  const loaded: LoadResult = loadHandbook(source);
  if (!loaded.ok) return loaded;
  return { ok: true, handbook: loaded.handbook, results: evaluateHandbook(loaded.handbook, options) };
}

export { exitCodeFor } from './exit-codes.ts';
