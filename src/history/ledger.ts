// The verdict ledger: a text file a team commits beside its YAML, one verdict per line, so that
// `git log -p verdicts.ledger` and `git blame verdicts.ledger` read as the history of every
// verdict. The text is canonical: sorted, tab-separated, numbers formatted without locale, no dates
// or times, so two runs anywhere give the same bytes. Format described in docs/history.md.
import { byCodePoint } from '../diagnostics/diagnostic.ts';
import { formatMargin, formatValue } from '../model/format.ts';
import { rowKey, type VerdictRow } from './rows.ts';

export const LEDGER_FILE = 'verdicts.ledger';

/** The first line of every ledger: how a ledger plumbline wrote is recognised before it is replaced. */
export const LEDGER_HEADER = '# plumbline verdict ledger, format 1: written by `plumbline check --ledger`; edit the handbook, not this file.';
const LEDGER_COLUMNS = '# rule\tstructure\tverdict\tvalue\tlimit\tmargin\tmode\tseverity\tinputs\tnote';

/** One line of the ledger, as text fields. */
export interface LedgerLine {
  rule: string;
  structure: string;
  verdict: string;
  value: string;
  limit: string;
  margin: string;
  mode: string;
  severity: string;
  inputs: string;
  note: string;
}

const FIELDS: Array<keyof LedgerLine> = ['rule', 'structure', 'verdict', 'value', 'limit', 'margin', 'mode', 'severity', 'inputs', 'note'];

function valueText(r: VerdictRow): string {
  if (r.status === 'incomplete') return '-';
  if (r.value !== null) return formatValue(r.value, r.unit);
  if (r.unbounded) return r.unbounded === 'above' ? '+∞' : '−∞';
  return 'no value';
}

function noteText(r: VerdictRow): string {
  if (r.waiver && r.verdict === 'waived') return `waiver ${r.waiver.id} until ${r.waiver.expires}`;
  if (r.waiver?.lapsed === 'expired') return `waiver ${r.waiver.id} expired after ${r.waiver.expires}`;
  if (r.waiver?.lapsed === 'beyond-floor') return `waiver ${r.waiver.id} does not cover this value`;
  if (r.status === 'incomplete') return `needs ${(r.missing ?? []).join(', ')}`;
  if (r.status === 'not-applicable') return oneLine(r.reason ?? '');
  return '-';
}

function oneLine(s: string): string {
  return s.replace(/[\t\r\n]+/g, ' ').trim() || '-';
}

export function ledgerLineOf(r: VerdictRow): LedgerLine {
  return {
    rule: r.rule,
    structure: r.structure,
    verdict: r.verdict,
    value: valueText(r),
    limit: r.sides.map((x) => `${x.comparison === 'at_least' ? '≥' : '≤'} ${formatValue(x.limit, r.unit)}`).join(' and '),
    margin: r.margin === null ? '-' : formatMargin(r.margin),
    mode: r.mode,
    severity: r.severity,
    inputs: r.inputs,
    note: noteText(r),
  };
}

function lineText(l: LedgerLine): string {
  return FIELDS.map((f) => l[f]).join('\t');
}

/** The whole ledger of a revision's rows (rules that select no structure have no line). */
export function ledgerText(rows: readonly VerdictRow[]): string {
  const lines = rows.map(ledgerLineOf).sort((a, b) => byCodePoint(a.rule, b.rule) || byCodePoint(a.structure, b.structure));
  return [LEDGER_HEADER, LEDGER_COLUMNS, ...lines.map(lineText)].join('\n') + '\n';
}

export type ParsedLedger = { ok: true; lines: Map<string, LedgerLine> } | { ok: false; why: string };

/** Read a ledger back (a committed one, to compare with what the engines say now). */
export function parseLedger(text: string): ParsedLedger {
  // A checkout that turned LF into CRLF (core.autocrlf) still holds the same ledger.
  const all = text.replace(/\r\n/g, '\n').split('\n');
  if (all[0] !== LEDGER_HEADER) return { ok: false, why: 'its first line is not the header of a ledger of this format' };
  const lines = new Map<string, LedgerLine>();
  for (const [i, raw] of all.entries()) {
    if (raw === '' || raw.startsWith('#')) continue;
    const parts = raw.split('\t');
    if (parts.length !== FIELDS.length) return { ok: false, why: `line ${i + 1} has ${parts.length} fields, not ${FIELDS.length}` };
    const line = Object.fromEntries(FIELDS.map((f, k) => [f, parts[k]!])) as unknown as LedgerLine;
    lines.set(rowKey(line), line);
  }
  return { ok: true, lines };
}

export interface LedgerDifference {
  key: string;
  /** The committed line (absent: a verdict the ledger lacks). */
  was?: string;
  /** The line the handbook gives now (absent: a verdict that is gone). */
  now?: string;
}

/** Which lines of `committed` differ from `current`, by rule and structure, in ledger order. */
export function ledgerDifferences(committed: string, current: string): { differences: LedgerDifference[]; header: boolean } {
  const index = (text: string) => {
    const m = new Map<string, string>();
    for (const l of text.split('\n')) if (l && !l.startsWith('#')) m.set(l.split('\t').slice(0, 2).join(' '), l);
    return m;
  };
  const a = index(committed.replace(/\r\n/g, '\n'));
  const b = index(current);
  const keys = [...new Set([...a.keys(), ...b.keys()])].sort(byCodePoint);
  const differences: LedgerDifference[] = [];
  for (const key of keys) {
    const was = a.get(key);
    const now = b.get(key);
    if (was !== now) differences.push({ key, ...(was !== undefined ? { was } : {}), ...(now !== undefined ? { now } : {}) });
  }
  const headOf = (t: string) => t.split('\n').filter((l) => l.startsWith('#')).join('\n');
  return { differences, header: headOf(committed.replace(/\r\n/g, '\n')) !== headOf(current) };
}
