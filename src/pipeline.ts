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

export { loadHandbook, evaluateHandbook };

export type CheckOutcome =
  | { ok: false; diagnostics: Diagnostic[] }
  | { ok: true; handbook: Handbook; results: Results };

/** Load and evaluate: everything `check` needs. */
export function checkHandbook(root: string): CheckOutcome {
  const loaded: LoadResult = loadHandbook(root);
  if (!loaded.ok) return loaded;
  return { ok: true, handbook: loaded.handbook, results: evaluateHandbook(loaded.handbook) };
}

/** Exit codes: 0 clean, 1 a blocking rule fails, 2 the handbook cannot be loaded, 3 our own bug. */
export function exitCodeFor(outcome: CheckOutcome | { bug: true }): 0 | 1 | 2 | 3 {
  if ('bug' in outcome) return 3;
  if (!outcome.ok) return 2;
  return outcome.results.blockingFailures > 0 ? 1 : 0;
}
