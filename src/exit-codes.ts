// Exit codes of every command, in one place. Light on purpose: the CLI reads it before it loads
// the checker.
import type { CheckOutcome } from './pipeline.ts';

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
