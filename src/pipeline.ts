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
import { loadHandbook, type LoadResult } from './model/load.ts';
import { evaluateHandbook, type Results } from './checker/evaluate.ts';
import type { Diagnostic } from './diagnostics/diagnostic.ts';
import type { Handbook } from './model/types.ts';
import type { HandbookSource } from './model/source.ts';

export { loadHandbook, evaluateHandbook };

export type CheckOutcome =
  | { ok: false; diagnostics: Diagnostic[] }
  | { ok: true; handbook: Handbook; results: Results };

/** Load and evaluate: everything `check` needs. The source says where the files come from. */
export function checkHandbook(source: HandbookSource): CheckOutcome {
  const loaded: LoadResult = loadHandbook(source);
  if (!loaded.ok) return loaded;
  return { ok: true, handbook: loaded.handbook, results: evaluateHandbook(loaded.handbook) };
}

/**
 * Exit codes: 0 clean, 1 a blocking rule fails, 2 the handbook cannot be loaded or the command was
 * refused (an output folder plumbline does not own, a busy port), 3 our own bug.
 */
export function exitCodeFor(outcome: CheckOutcome | { bug: true } | { refused: true }): 0 | 1 | 2 | 3 {
  if ('bug' in outcome) return 3;
  if ('refused' in outcome) return 2;
  if (!outcome.ok) return 2;
  return outcome.results.blockingFailures > 0 ? 1 : 0;
}
