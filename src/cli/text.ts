// Plain-text renderings for the terminal: the check summary, a structure's quantities, and the
// derivation of one verdict. Words about verdicts come from report/words.ts, shared with the site.
import type { Results, Status, Verdict } from '../checker/evaluate.ts';
import type { StructureSweep } from '../checker/sweep.ts';
import type { StructureQuantity } from '../checker/evaluate.ts';
import { byCodePoint } from '../diagnostics/diagnostic.ts';
import { QUANTITIES } from '../engines/index.ts';
import type { Handbook, Rule, Structure } from '../model/types.ts';
import { formatMargin, formatValue } from '../model/format.ts';
import { CAUTION, STATUS_WORDS, leverLines, modeLines, expiredUnneededPhrase, failsAgainPhrase, floorPhrase, lapsePhrase, limitsPhrase, originPhrase, unusedPhrase, valuePhrase, valueWord, waivedPhrase, waiverPeoplePhrase } from '../report/words.ts';

function plural(n: number, word: string): string {
  return `${n} ${word}${n === 1 ? '' : 's'}`;
}

function table(rows: string[][]): string {
  const widths: number[] = [];
  for (const r of rows) r.forEach((c, i) => (widths[i] = Math.max(widths[i] ?? 0, [...c].length)));
  return rows.map((r) => r.map((c, i) => (i === r.length - 1 ? c : c + ' '.repeat((widths[i] ?? 0) - [...c].length))).join('  ')).join('\n');
}

const ORDER: Record<string, number> = { fail: 0, waived: 1, incomplete: 2, pass: 3, 'not-applicable': 4 };

export function renderCheckSummary(h: Handbook, results: Results): string {
  const shown = results.verdicts
    .filter((v) => v.status !== 'not-applicable')
    .sort(
      (a, b) =>
        (a.status === 'fail' && a.severity === 'blocking' ? -1 : 0) - (b.status === 'fail' && b.severity === 'blocking' ? -1 : 0) ||
        (ORDER[a.status] ?? 9) - (ORDER[b.status] ?? 9) ||
        byCodePoint(a.rule, b.rule) ||
        byCodePoint(a.structure, b.structure),
    );
  const rows = [['verdict', 'rule', 'structure', 'value', 'limit', 'margin']];
  for (const v of shown) {
    const rule = h.rules.find((r) => r.id === v.rule)!;
    const word = v.status === 'fail' ? (v.severity === 'blocking' ? 'FAIL' : 'fail (advisory)') : STATUS_WORDS[v.status];
    // A value's reason can be a paragraph: the table says there is none, the reasons follow it.
    const value = v.status === 'incomplete' ? `missing ${v.missing?.join(', ')}` : v.value === null && !v.unbounded ? 'no value (below)' : valueWord(v);
    rows.push([word, v.rule, v.structure, value, limitsPhrase(rule.sides, v.unit), formatMargin(v.margin)]);
  }
  const reasons = shown.filter((v) => v.status !== 'incomplete' && v.value === null && !v.unbounded).map((v) => `  ${v.rule} on ${v.structure}: ${v.reason ?? 'no value'}`);
  const c = results.counts;
  const judged = h.waivers.length === 0 ? '' : results.on ? `, ${plural(h.waivers.length, 'waiver')} (judged on ${results.on})` : `, ${plural(h.waivers.length, 'waiver')}`;
  const lines = [
    `${h.meta.title}: ${plural(h.structures.length, 'structure')}, ${plural(h.rules.length, 'rule')}${judged}`,
    '',
    table(rows),
    ...(reasons.length ? ['', 'Without a value:', ...reasons] : []),
    ...renderWaivers(h, results),
    '',
    `${c.pass} pass, ${c.fail} fail (${results.blockingFailures} blocking), ${c.waived} waived, ${c.incomplete} incomplete, ${c['not-applicable']} not applicable`,
    CAUTION,
  ];
  return lines.join('\n');
}

/** What the waivers did: the failures they excuse, those that count again, and waivers that excuse nothing. */
function renderWaivers(h: Handbook, results: Results): string[] {
  if (h.waivers.length === 0) return [];
  if (results.on === undefined) return ['', `${plural(h.waivers.length, 'waiver')} not applied: no evaluation date was given, so every failure counts.`];
  const out: string[] = [];
  const waived = results.verdicts.filter((v) => v.status === 'waived' && v.waiver);
  if (waived.length) {
    out.push('', 'Waived (not counted as failures):');
    for (const v of waived) {
      const w = v.waiver!;
      const floor = w.stillWithin ? `; the value must stay ${floorPhrase(w.stillWithin, v.unit)}` : '';
      out.push(`  ${v.rule} on ${v.structure}: ${waivedPhrase(w)}; ${waiverPeoplePhrase(w)}${floor} (${w.file}:${w.line})`);
    }
  }
  const lapsedLines: string[] = [];
  const unusedLines: string[] = [];
  for (const use of results.waivers) {
    for (const l of use.lapsed) {
      const v = results.verdicts.find((x) => x.rule === use.rule && x.structure === l.structure);
      const floor = v?.waiver?.stillWithin ? floorPhrase(v.waiver.stillWithin, v.unit) : undefined;
      lapsedLines.push(`  ${failsAgainPhrase(use, use.rule, l.structure, l.lapsed, floor)}`);
    }
    if (use.expired && use.lapsed.length === 0) unusedLines.push(`  ${expiredUnneededPhrase(use)}`);
    else if (use.unused) unusedLines.push(`  ${unusedPhrase(use)}`);
  }
  if (lapsedLines.length) out.push('', 'Waivers that no longer hold (these failures count):', ...lapsedLines);
  if (unusedLines.length) out.push('', 'Waivers that excuse nothing:', ...unusedLines);
  return out;
}

export function renderStructureQuantities(s: Structure, quantities: Record<string, StructureQuantity>, incomplete: Record<string, string[]>): string {
  const rows = [['quantity', 'value', 'what it is']];
  for (const [name, q] of Object.entries(quantities)) {
    rows.push([name, q.value === null ? `none: ${q.reason}` : formatValue(q.value, q.unit), QUANTITIES.get(name.replace(/\[.*\]$/, ''))?.title ?? '']);
  }
  const lines = [`${s.id} (${s.kind}): ${s.title}`, '', table(rows)];
  const flagged = Object.entries(quantities).filter(([, q]) => q.outside_validity?.length);
  if (flagged.length) lines.push('', 'Outside the model’s validity range (values are computed but not to be trusted):', ...flagged.flatMap(([n, q]) => q.outside_validity!.map((w) => `  ! ${n}: ${w}`)));
  const blocked = Object.entries(incomplete);
  if (blocked.length) lines.push('', 'Not computable without more inputs:', ...blocked.map(([n, m]) => `  ${n}: needs ${m.join(', ')}`));
  return lines.join('\n');
}

export function renderExplain(rule: Rule, s: Structure, v: Verdict): string {
  const out: string[] = [];
  out.push(`${rule.id} on ${s.id}: ${STATUS_WORDS[v.status].toUpperCase()}`);
  out.push(`${rule.title}`);
  out.push(`requires ${v.quantity} ${limitsPhrase(rule.sides, v.unit)} (${rule.evaluateAt}, ${rule.severity})`);
  if (v.status === 'not-applicable' || v.status === 'incomplete') {
    out.push(v.reason ?? '');
    return out.join('\n');
  }
  out.push(`value ${valuePhrase(v)}, margin ${formatMargin(v.margin)}`);
  if (v.waiver) {
    const w = v.waiver;
    out.push(v.status === 'waived' ? `${waivedPhrase(w)}; ${waiverPeoplePhrase(w)} (${w.file}:${w.line})` : `${lapsePhrase(w, v.unit)} (${w.file}:${w.line})`);
    if (w.stillWithin) out.push(`the waived value must stay ${floorPhrase(w.stillWithin, v.unit)}`);
  }
  out.push(...modeLines(v, (name) => unitOfParam(v, name)));
  const t = v.trace;
  if (t) {
    out.push('', 'Inputs:');
    for (const i of t.inputs) {
      const tol = i.low !== undefined ? ` [${formatValue(i.low, i.unit)} … ${formatValue(i.high ?? null, i.unit)}]` : '';
      const side = i.side && i.side !== 'nominal' ? ` (${i.side} end used)` : '';
      out.push(`  ${i.name} = ${formatValue(i.value, i.unit)}${side}${tol}  — ${originPhrase(i.origin)}`);
    }
    out.push('', 'Derivation:');
    for (const st of t.steps) {
      out.push(`  ${st.name}: ${st.title}${st.label ? ` (${st.label})` : ''}`);
      out.push(`    ${st.formula}`);
      out.push(`    with ${st.args.map((a) => `${a.symbol} = ${formatValue(a.value, unitOfArg(t, a.from))}`).join(', ')}`);
      out.push(`    = ${st.value === null ? `no value: ${st.reason}` : formatValue(st.value, st.unit)}`);
      out.push(`    source: ${st.source}`);
      for (const w of st.warnings) out.push(`    ! outside validity: ${w}`);
    }
  }
  out.push(...leverLines(v));
  out.push('', CAUTION);
  return out.join('\n');
}

function unitOfParam(v: Verdict, name: string): string {
  return v.trace?.inputs.find((i) => i.name === name)?.unit ?? '1';
}
function unitOfArg(t: NonNullable<Verdict['trace']>, from: string): string {
  return t.inputs.find((i) => i.name === from)?.unit ?? QUANTITIES.get(from)?.unit ?? '1';
}

/** A structure's rules across the sweep's grid: one row per point, one column per rule. */
export function renderSweep(r: StructureSweep): string {
  const head = [...r.axes.map((a) => a.input), ...r.rules.map((x) => x.id)];
  const rows = [head];
  for (const p of r.points) {
    const at = p.at.map((x, k) => formatValue(x, r.axes[k]!.unit));
    if (p.invalid) {
      rows.push([...at, `not a valid structure: ${p.invalid}`, ...r.rules.slice(1).map(() => '')]);
      continue;
    }
    rows.push([...at, ...p.verdicts.map((v, i) => `${SWEEP_MARK[v.status] ?? v.status} ${v.value === null ? '—' : formatValue(v.value, r.rules[i]!.unit)}`)]);
  }
  const modes = r.rules.map((x) => `${x.id} (${x.quantity}, ${x.mode})`).join('; ');
  return [`${r.structure}: every rule that applies, across ${r.axes.map((a) => `${a.input} ${formatValue(a.from, a.unit)} … ${formatValue(a.to, a.unit)}`).join(' and ')}; the other inputs as written, waivers not applied.`, '', table(rows), '', `Rules: ${modes}.`, '', CAUTION].join('\n');
}

const SWEEP_MARK: Partial<Record<Status, string>> = { pass: 'ok', fail: 'FAIL', incomplete: '?', 'not-applicable': '-' };
