// The ledger on disk: the one file plumbline writes into a handbook folder. It is read as every
// handbook file is, and replaced only when it is a ledger plumbline wrote (its first line).
import { join } from 'node:path';
import { FolderSource } from '../model/folder-source.ts';
import { decodeUtf8 } from '../model/source.ts';
import { LEDGER_FILE, LEDGER_HEADER } from './ledger.ts';
import { writeOwnFile } from './own-file.ts';

/** The committed ledger's text, null when there is none. */
export function readLedger(root: string): { text: string } | null | { problem: string } {
  const source = new FolderSource(root);
  if (source.kindOf(LEDGER_FILE) === 'missing') return null;
  const r = source.read(LEDGER_FILE);
  if (!r.ok) return { problem: r.problem.found };
  const d = decodeUtf8(r.bytes);
  return d.ok ? { text: d.text } : { problem: `not UTF-8 at line ${d.line}` };
}

/** Write the ledger; 'unchanged' when the file already says exactly this. */
export function writeLedger(root: string, text: string): 'written' | 'unchanged' {
  return writeOwnFile(join(root, LEDGER_FILE), text, (old) => old.split(/\r?\n/)[0] === LEDGER_HEADER);
}
