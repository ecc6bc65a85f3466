// A command that stops rather than do something unsafe: a stable code and the facts, worded in
// messages.ts. The CLI prints the sentence and exits 2; nothing was changed.
import { describeRefusal } from './messages.ts';

export type RefusalCode =
  | 'output-is-handbook'
  | 'output-holds-handbook'
  | 'output-inside-inputs'
  | 'output-is-link'
  | 'output-is-file'
  | 'output-not-ours'
  | 'output-has-foreign-files'
  | 'output-changed'
  | 'output-is-mount'
  | 'output-name-reserved'
  | 'lock-held'
  | 'lock-foreign'
  | 'lock-unavailable'
  | 'port-in-use'
  | 'port-forbidden'
  | 'port-unavailable'
  | 'write-failed'
  | 'file-not-ours'
  | 'file-write-failed'
  | 'baseline-unloadable'
  | 'not-a-repository'
  | 'unknown-revision'
  | 'git-missing'
  | 'git-failed'
  | 'scaffold-target-taken'
  | 'scaffold-write-failed';

export interface RefusalFacts {
  /** The folder or file concerned. */
  path?: string;
  /** The handbook folder. */
  root?: string;
  /** The handbook input the path lies in. */
  input?: string;
  /** Files found that plumbline did not write (a few of them). */
  files?: string[];
  /** How many such files there are in all. */
  fileCount?: number;
  /** A lock's file and its holder, worded. */
  lock?: string;
  holder?: string;
  port?: number;
  /** The system's error code and its meaning (ENOSPC: the disk is full). */
  errno?: string;
  reason?: string;
}

export class Refusal extends Error {
  constructor(
    readonly code: RefusalCode,
    readonly facts: RefusalFacts = {},
  ) {
    super(describeRefusal(code, facts));
    this.name = 'Refusal';
  }
}
