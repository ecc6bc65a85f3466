// Sentences about verdicts, shared by the terminal and the site.
import type { Status, Verdict, WaiverRef, WaiverUse } from '../checker/evaluate.ts';
import type { Comparison, EvaluateAt, ParamOrigin } from '../model/types.ts';
import { formatMargin, formatValue, sig } from '../model/format.ts';
import { margin } from '../checker/evaluate.ts';
import type { FailureEstimate, ModeResult } from '../checker/modes.ts';
import type { Lever } from '../checker/excursions.ts';

export const CAUTION =
  'Caution: these results are engineering estimates from published models; confirm them on silicon before relying on them. ' +
  "Process work follows your site's safety rules and local codes.";

export const STATUS_WORDS: Record<Status, string> = {
  pass: 'pass',
  fail: 'fail',
  waived: 'waived',
  incomplete: 'incomplete',
  'not-applicable': 'not applicable',
};

/** One limit: "≥ 14 nm". */
export function limitPhrase(side: { comparison: Comparison; limit: number }, unit: string): string {
  return `${side.comparison === 'at_least' ? '≥' : '≤'} ${formatValue(side.limit, unit)}`;
}

/** Every limit of a rule: "≥ 14 nm", or for a window "≥ 12 nm and ≤ 18 nm". */
export function limitsPhrase(sides: ReadonlyArray<{ comparison: Comparison; limit: number }>, unit: string): string {
  return sides.map((s) => limitPhrase(s, unit)).join(' and ');
}

/** The limits a verdict was judged against (a window's two, or the rule's one). */
export function verdictLimitsPhrase(v: Pick<Verdict, 'comparison' | 'limit' | 'sides' | 'unit'>): string {
  return limitsPhrase(v.sides ?? [v], v.unit);
}

/** A value in a few words: the number, "unbounded (+∞)" or "no value", without the reason. */
export function valueWord(v: Pick<Verdict, 'value' | 'unit' | 'unbounded'>): string {
  if (v.value !== null) return formatValue(v.value, v.unit);
  return v.unbounded ? `unbounded ${v.unbounded === 'above' ? '(+∞)' : '(−∞)'}` : 'no value';
}

export function valuePhrase(v: Pick<Verdict, 'value' | 'unit' | 'reason' | 'unbounded'>): string {
  return v.value !== null ? valueWord(v) : `${valueWord(v)}: ${v.reason ?? ''}`;
}

export function originPhrase(o: ParamOrigin): string {
  if (o.type === 'handbook') return `written at ${o.pos.file}:${o.pos.line}:${o.pos.column}`;
  if (o.type === 'default') return `not written: the default of the block at ${o.pos.file}:${o.pos.line}:${o.pos.column}`;
  return `material table, ${o.material}: ${o.source}`;
}

export function cornerPhrase(name: string, side: 'low' | 'high', value: number, unit: string): string {
  return `${name} at its ${side} end, ${formatValue(value, unit)}`;
}

/** How each evaluation mode is worded wherever a sentence needs it (one entry per mode). */
export const MODE_WORDS: Record<EvaluateAt, { where: string; others: string; ruleNote: string; chartNote: string }> = {
  nominal: { where: 'at nominal', others: 'the other inputs at nominal', ruleNote: '', chartNote: '' },
  'worst-case': {
    where: 'at the worst tolerance corner',
    others: 'the other inputs at the deciding corner',
    ruleNote: ' (the worst corner of every toleranced input)',
    chartNote: ' at the worst corner, ○ the nominal value',
  },
  yield: {
    where: 'at nominal',
    others: 'the other inputs at nominal',
    ruleNote: " (the fraction of the inputs' distribution that passes, against the required yield)",
    chartNote: ' at nominal (the sampled yield decides the verdict)',
  },
};

/**
 * A probability as a percentage, with the digits that tell 99.7 % from 99.73 %: a fraction near 1
 * keeps two significant digits of its complement, one below ½ two significant digits of itself.
 */
export function percent(p: number): string {
  if (p >= 1) return '100 %';
  if (p <= 0) return '0 %';
  if (p < 0.5) return `${sig(p * 100, 2)} %`;
  const digits = Math.min(8, Math.max(1, Math.ceil(-Math.log10(1 - p)) - 1));
  return `${(p * 100).toFixed(digits).replace(/\.?0+$/, '')} %`;
}

export function failurePhrase(f: FailureEstimate): string {
  return `probability of failure ${percent(f.probability)} (${percent(f.confidence)} interval ${percent(f.low)} – ${percent(f.high)}, ${f.samples} samples)`;
}

/** What a yield evaluation found, in one sentence, and how it was decided. */
export function yieldPhrases(m: Extract<ModeResult, { kind: 'yield' }>): { found: string; decided: string } {
  const found =
    m.samples <= 1 && m.low === m.high
      ? `yield ${percent(m.estimate)}: no input this quantity reads carries a tolerance, so nothing varies (required ${m.requiredWritten})`
      : `yield ${percent(m.estimate)} (${percent(m.confidence)} interval ${percent(m.low)} – ${percent(m.high)}; ${m.samples} samples, ${m.failures} failing), required ${m.requiredWritten}`;
  const decided = m.decided
    ? m.samples <= 1
      ? 'decided without sampling'
      : `the interval decides after ${m.samples} samples`
    : `the interval did not decide within the maximum of ${m.maxSamples} samples: the estimate decides`;
  return { found, decided };
}

/** A window's two sides at their own worst corners: "≥ 9 nm: 9.853 nm (+9.48 %); ≤ 14 nm: 13.4 nm (+4.26 %)". */
export function bySidePhrase(bySide: Array<{ comparison: Comparison; limit: number; value: number | null }>, unit: string): string {
  return bySide
    .map((s) => `${limitPhrase(s, unit)}: ${formatValue(s.value, unit)}${s.value === null ? '' : ` (${formatMargin(margin(s.value, s.limit, s.comparison))})`}`)
    .join('; ');
}

/** The lines a mode adds to a verdict's explanation (the terminal's `explain`). */
export function modeLines(v: Pick<Verdict, 'mode' | 'nominal' | 'unit'>, unitOfInput: (name: string) => string): string[] {
  const m = v.mode;
  if (!m) return [];
  switch (m.kind) {
    case 'nominal':
      return [];
    case 'worst-case': {
      const out = [`nominal ${formatValue(v.nominal ?? null, v.unit)}; worst of ${m.corners} corner${m.corners === 1 ? '' : 's'}`];
      if (m.worstCorner.length) out.push(`worst corner: ${m.worstCorner.map((c) => `${c.name} ${c.side} (${formatValue(c.value, unitOfInput(c.name))})`).join(', ')}`);
      if (m.bySide) out.push(`each limit at its own worst corner: ${bySidePhrase(m.bySide, v.unit)}`);
      if (m.failure) out.push(`${failurePhrase(m.failure)}, each tolerance a ±3σ band unless the structure says otherwise`);
      if (m.failureNotSampled) out.push(`probability of failure not sampled: ${m.failureNotSampled}`);
      return out;
    }
    case 'yield': {
      const y = yieldPhrases(m);
      return [y.found, y.decided];
    }
  }
}

/**
 * The values of an input that would pass, in words: "passes for geometry.height ≤ 1.97 µm (now
 * 2.1 µm)"; several intervals joined by "or"; "no value … passes" when none does. Empty when the
 * input was not searched.
 */
export function passingPhrase(l: Lever): string {
  if (!l.passes || !l.searched) return '';
  const [lo, hi] = l.searched;
  const f = (x: number) => formatValue(x, l.unit);
  const now = ` (now ${f(l.value)})`;
  if (l.passes.length === 0) return `no ${l.name} in ${f(lo)} … ${f(hi)} passes${now}`;
  const parts = l.passes.map(([a, b]) => {
    if (a === lo && b === hi) return `every ${l.name} in ${f(lo)} … ${f(hi)}`;
    if (a === lo) return `${l.name} ≤ ${f(b)}`;
    if (b === hi) return `${l.name} ≥ ${f(a)}`;
    return `${f(a)} ≤ ${l.name} ≤ ${f(b)}`;
  });
  return `passes for ${parts.join(' or ')}${now}`;
}

/** An elasticity in words: "elasticity −2.03" (the value moves 2.03 % down per % up of the input). */
export function elasticityPhrase(e: number | null): string {
  return e === null ? 'no elasticity (a zero value or input)' : `elasticity ${e >= 0 ? '+' : '−'}${sig(Math.abs(e), 3)}`;
}

/** The lines of `explain` that rank the inputs and say what would pass. */
export function leverLines(v: Pick<Verdict, 'levers' | 'leversNotComputed' | 'unit' | 'limit' | 'comparison'>): string[] {
  if (v.leversNotComputed) return ['', `Sensitivities and passing values not worked out: ${v.leversNotComputed}.`];
  if (!v.levers?.length) return [];
  const out = ['', 'What moves the value (each input across its tolerance, the others at nominal), and what would pass:'];
  for (const l of v.levers) {
    const ends = l.ends ? `${formatValue(l.ends.low, l.unit)} … ${formatValue(l.ends.high, l.unit)} gives ${formatValue(l.ends.valueAtLow, v.unit)} … ${formatValue(l.ends.valueAtHigh, v.unit)}; ` : '';
    const pass = passingPhrase(l);
    out.push(`  ${l.name}: ${ends}${elasticityPhrase(l.elasticity)}${pass ? `; ${pass}` : ''}`);
  }
  return out;
}

/** A waiver on the evaluation date, in one word. */
export const WAIVER_STATE_WORDS: Record<WaiverUse['state'] | 'not-judged', string> = {
  active: 'active',
  expired: 'expired',
  unused: 'unused',
  'not-judged': 'not judged',
};

/** `≥ 0.98`: the limit a waived value must still meet. */
export function floorPhrase(floor: { comparison: Comparison; limit: number }, unit: string): string {
  return limitPhrase(floor, unit);
}

/** The waiver behind a waived verdict: `waived by W-X through 2027-06-30`. */
export function waivedPhrase(w: Pick<WaiverRef, 'id' | 'expires'>): string {
  return `waived by ${w.id} through ${w.expires}`;
}

/** Who answers for a waiver: `owner …, approved by …`. */
export function waiverPeoplePhrase(w: Pick<WaiverRef, 'owner' | 'approvedBy'>): string {
  return `owner ${w.owner}, approved by ${w.approvedBy}`;
}

/** Why a waiver no longer excuses a failure it selects. */
export function lapsePhrase(w: WaiverRef, unit: string): string {
  if (w.lapsed === 'expired') return `waiver ${w.id} expired: its last day was ${w.expires}`;
  return `waiver ${w.id} does not cover it: the value is beyond the limit the waiver requires (${w.stillWithin ? floorPhrase(w.stillWithin, unit) : '—'})`;
}

/** One failure that counts again because its waiver lapsed. */
export function failsAgainPhrase(use: Pick<WaiverUse, 'id' | 'expires'>, rule: string, structure: string, lapse: 'expired' | 'beyond-floor', floor?: string): string {
  return lapse === 'expired'
    ? `waiver ${use.id} expired: its last day was ${use.expires}; ${rule} on ${structure} fails again`
    : `waiver ${use.id}: ${rule} on ${structure} is beyond the limit the waiver requires (${floor ?? '—'}); it fails`;
}

/** A waiver that selects no failing verdict. */
export function unusedPhrase(use: Pick<WaiverUse, 'id' | 'rule'>): string {
  return `waiver ${use.id} (${use.rule}) waives nothing: no verdict it selects fails (left over after a fix? remove it)`;
}

/** A waiver past its date that no failure needs any more (another waiver or a fix took its place). */
export function expiredUnneededPhrase(use: Pick<WaiverUse, 'id' | 'expires'>): string {
  return `waiver ${use.id} expired: its last day was ${use.expires}; no failure counts again because of it (remove it)`;
}
