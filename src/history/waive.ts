// Waivers as history keeps them: each with the structures it selects resolved, so a revision's
// rows can be waived again at any date without loading the revision.
import { appliesTo, lapseOf } from '../checker/evaluate.ts';
import { byCodePoint } from '../diagnostics/diagnostic.ts';
import type { Handbook, Waiver } from '../model/types.ts';
import type { VerdictRow } from './rows.ts';

export interface WaiverSpec {
  id: string;
  rule: string;
  /** Structure ids the waiver selects in its revision. */
  structures: string[];
  expires: string;
  owner: string;
  approvedBy: string;
  reason: string;
  /** The limit a waived value must still meet, SI, in the rule's direction. */
  stillWithin?: Waiver['stillWithin'];
  file: string;
  line: number;
}

/** `on` is after the last day a waiver holds. */
export function isExpired(expires: string, on: string): boolean {
  return lapseOf({ expires }, { value: 0 }, on) === 'expired';
}

/** A row as the checker would say it on `on`: a failure a waiver holds for becomes `waived`. Of
 * several waivers the first by id that holds is used, as the checker does. */
export function waiveRow(row: VerdictRow, specs: readonly WaiverSpec[], on: string): VerdictRow {
  if (row.status !== 'fail') return row;
  let lapsed: VerdictRow['waiver'] | undefined;
  for (const w of specs) {
    if (w.rule !== row.rule || !w.structures.includes(row.structure)) continue;
    const lapse = lapseOf(w, row, on);
    if (lapse === undefined) return { ...row, verdict: 'waived', waiver: { id: w.id, expires: w.expires } };
    lapsed ??= { id: w.id, expires: w.expires, lapsed: lapse };
  }
  return lapsed ? { ...row, verdict: 'fail', waiver: lapsed } : row;
}

/** The waivers of a loaded handbook, sorted by id, with their selections resolved against its structures. */
export function waiverSpecsOf(h: Handbook): WaiverSpec[] {
  return [...h.waivers]
    .sort((a, b) => byCodePoint(a.id, b.id))
    .map((w) => ({
      id: w.id,
      rule: w.rule,
      structures: h.structures.filter((s) => appliesTo(w, s)).map((s) => s.id),
      expires: w.expires,
      owner: w.owner,
      approvedBy: w.approvedBy,
      reason: w.reason,
      ...(w.stillWithin ? { stillWithin: w.stillWithin } : {}),
      file: w.pos.file,
      line: w.pos.line,
    }));
}
