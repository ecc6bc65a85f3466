// Results → report data: everything the templates show, already worded and formatted. Templates
// only lay it out; no physics and no pass/fail logic lives in them.
import { exampleShapes } from '../model/shape-examples.ts';
import { appliesTo, evaluateStructure, margin, PlanCache, type Results, type StructureQuantity, type Verdict, type WaiverUse } from '../checker/evaluate.ts';
import { ENGINES, QUANTITIES } from '../engines/index.ts';
import { GEOMETRY_PARAMS, MATERIAL_PROPERTIES } from '../model/parameters.ts';
import { SCHEMAS } from '../model/schema.ts';
import { KINDS, isElongated, isOpening, type ArrayLayout, type Handbook, type Rule, type Selector, type Structure, type Waiver } from '../model/types.ts';
import { countsChart, marginChart, sweepChart, tornadoChart, trendChart, valueChart, windowChart } from './charts.ts';
import { OUTSIDE, type ProcessWindow, type WindowEdge } from '../checker/windows.ts';
import { meetsAll } from '../checker/excursions.ts';
import type { HistoryPages } from './history-pages.ts';
import { renderCrossSection } from './cross-section.ts';
import { renderFigure } from './figures.ts';
import { displayScale, formatMargin, formatValue, sig } from '../model/format.ts';
import { texToMathml } from './math.ts';
import { renderMarkdown } from './markdown.ts';
import { CONTENT_SECURITY_POLICY } from './policy.ts';
import { describeDiagnostic } from '../diagnostics/messages.ts';
import { CAUTION, MODE_WORDS, STATUS_WORDS, bySidePhrase, failurePhrase, passingPhrase, percent, yieldPhrases, WAIVER_STATE_WORDS, expiredUnneededPhrase, failsAgainPhrase, floorPhrase, lapsePhrase, limitsPhrase, originPhrase, unusedPhrase, valuePhrase, waivedPhrase, waiverPeoplePhrase } from './words.ts';


export { urls } from '../model/urls.ts';
import { urls } from '../model/urls.ts';

export interface VerdictRow {
  rule: string;
  ruleTitle: string;
  ruleUrl: string;
  structure: string;
  structureTitle: string;
  structureUrl: string;
  status: Verdict['status'];
  statusWord: string;
  severity: string;
  /** A failing advisory rule: shown apart from blocking failures. */
  advisory: boolean;
  valueText: string;
  /** The value cell holds a sentence (what is missing, why there is no value), not a number: it wraps. */
  valueIsText: boolean;
  limitText: string;
  marginText: string;
  url: string;
  /** The waiver a waived verdict stands on, or the one a failure's waiver lapsed from ('' for none). */
  waiverId: string;
  waiverUrl: string;
  /** `waived by W-X through 2027-06-30`, or why the waiver no longer excuses the failure. */
  waiverNote: string;
  /** A failure whose waiver no longer holds (expired, or beyond its limit). */
  waiverLapsed: boolean;
}

function row(v: Verdict, rule: Rule, s: Structure): VerdictRow {
  return {
    rule: rule.id,
    ruleTitle: rule.title,
    ruleUrl: urls.rule(rule.id),
    structure: s.id,
    structureTitle: s.title,
    structureUrl: urls.structure(s.id),
    status: v.status,
    statusWord: STATUS_WORDS[v.status],
    severity: v.severity,
    advisory: v.status === 'fail' && v.severity === 'advisory',
    valueText: v.status === 'incomplete' ? `needs ${v.missing?.join(', ')}` : v.status === 'not-applicable' ? (v.reason ?? '') : valuePhrase(v),
    valueIsText: v.status === 'incomplete' || v.status === 'not-applicable' || v.value === null,
    limitText: limitsPhrase(rule.sides, v.unit),
    marginText: formatMargin(v.margin),
    url: urls.verdict(rule.id, s.id),
    waiverId: v.waiver?.id ?? '',
    waiverUrl: v.waiver ? urls.waiver(v.waiver.id) : '',
    waiverNote: !v.waiver ? '' : v.status === 'waived' ? waivedPhrase(v.waiver) : lapsePhrase(v.waiver, v.unit),
    waiverLapsed: v.waiver?.lapsed !== undefined,
  };
}

/** `structures a, b`; `kinds trench; tagged isolation`; `every structure` — a rule's or a waiver's selection. */
function selectorText(a: Selector): string {
  const parts: string[] = [];
  if (a.kinds) parts.push(`kinds ${a.kinds.join(', ')}`);
  if (a.tags) parts.push(`tagged ${a.tags.join(' or ')}`);
  if (a.structures) parts.push(`structures ${a.structures.join(', ')}`);
  return parts.length ? parts.join('; ') : 'every structure';
}

function paramLabel(name: string): string {
  const [block, a, b] = name.split('.');
  if (block === 'geometry' && a) return a.replace(/_/g, ' ');
  if (block === 'materials' && a && b) return `${a} ${MATERIAL_PROPERTIES[b]?.description.toLowerCase() ?? b}`;
  return name;
}

function unitOfStep(v: Verdict, from: string): string {
  return v.trace?.inputs.find((i) => i.name === from)?.unit ?? QUANTITIES.get(from)?.unit ?? '1';
}

/** What a build adds to the handbook's own data: the tool's version, and the handbook's history
 * when it lives in a git repository. */
export interface ReportExtras {
  tool?: string;
  history?: HistoryPages;
}

export async function assembleReport(h: Handbook, results: Results, extras: ReportExtras = {}) {
  const ruleById = new Map(h.rules.map((r) => [r.id, r]));
  const structureById = new Map(h.structures.map((s) => [s.id, s]));
  const plans = new PlanCache();
  const inScope = (v: Verdict) => appliesTo(ruleById.get(v.rule)!, structureById.get(v.structure)!);
  const scoped = results.verdicts.filter(inScope);
  const waiverById = new Map(h.waivers.map((w) => [w.id, w]));
  const useById = new Map(results.waivers.map((u) => [u.id, u]));

  const verdictPages = [];
  for (const v of scoped) {
    const rule = ruleById.get(v.rule)!;
    const s = structureById.get(v.structure)!;
    const t = v.trace;
    const sweep = await sweepOf(v);
    const extra = await sweepOf(v, true);
    verdictPages.push({
      ...row(v, rule, s),
      quantity: v.quantity,
      /** Which end of the corner sweep decides: the lowest value for at_least, the highest for at_most. */
      worstWord: v.comparison === 'at_least' ? 'lowest' : 'highest',
      quantityTitle: QUANTITIES.get(v.quantity)?.title ?? v.quantity,
      quantityUrl: urls.quantity(v.quantity),
      evaluateAt: v.evaluateAt,
      reason: v.reason ?? '',
      missing: v.missing ?? [],
      nominalText: v.nominal !== undefined ? formatValue(v.nominal, v.unit) : '',
      mode: modePage(v),
      levers: await leversPage(v),
      windowMap: v.window ? await windowPage(v.window) : null,
      windowNotMapped: v.windowNotMapped ?? '',
      inputs: (t?.inputs ?? []).map((i) => ({
        name: i.name,
        label: paramLabel(i.name),
        valueText: formatValue(i.value, i.unit),
        side: i.side ?? 'nominal',
        rangeText: i.low !== undefined ? `${formatValue(i.low, i.unit)} … ${formatValue(i.high ?? null, i.unit)}` : '',
        written: i.written,
        origin: originPhrase(i.origin),
      })),
      steps: (t?.steps ?? []).map((st) => ({
        name: st.name,
        title: st.title,
        label: st.label ?? '',
        url: urls.quantity(st.name),
        formulaHtml: texToMathml(st.formula, true),
        args: st.args.map((a) => ({ symbolHtml: texToMathml(a.symbol), from: a.from, valueText: formatValue(a.value, unitOfStep(v, a.from)) })),
        valueText: st.value === null ? `no value: ${st.reason ?? ''}` : formatValue(st.value, st.unit),
        source: st.source,
        note: st.note ?? '',
        figureSvg: st.figure ? renderFigure(st.figure) : '',
        warnings: st.warnings,
      })),
      waiver: waiverOnVerdict(v, waiverById),
      sweepSvg: sweep?.svg ?? '',
      sweepCaption: sweep?.caption ?? '',
      extraSweepSvg: extra?.svg ?? '',
      extraSweepCaption: extra?.caption ?? '',
    });
  }

  const rules = [];
  for (const rule of h.rules) {
    const q = QUANTITIES.get(rule.quantity)!;
    const vs = scoped.filter((v) => v.rule === rule.id);
    const scale = displayScale(q.unit, rule.sides[0]!.limit);
    const points = vs
      .filter((v) => v.value !== null)
      .map((v) => ({ label: v.structure, value: v.value! * scale.factor, status: v.status, ...(typeof v.nominal === 'number' ? { nominal: v.nominal * scale.factor } : {}) }));
    const axisTitle = `${q.title}${scale.label ? ` (${scale.label})` : ''}`;
    rules.push({
      id: rule.id,
      title: rule.title,
      url: urls.rule(rule.id),
      quantity: rule.quantity,
      quantityTitle: q.title,
      quantityUrl: urls.quantity(rule.quantity),
      symbolHtml: texToMathml(q.symbol),
      limitText: limitsPhrase(rule.sides, q.unit),
      requirementText: rule.sides.map((x) => `${x.comparison === 'at_least' ? 'at least' : 'at most'} ${formatValue(x.limit, q.unit)}`).join(' and '),
      severity: rule.severity,
      evaluateAt: rule.evaluateAt,
      modeNote: MODE_WORDS[rule.evaluateAt].ruleNote + (rule.yield ? `, required ${rule.yield.written}` : ''),
      chartNote: MODE_WORDS[rule.evaluateAt].chartNote,
      limitsWord: rule.sides.length > 1 ? 'the limits' : 'the limit',
      scopeText: scopeText(rule),
      rationaleHtml: renderMarkdown(rule.rationale),
      references: rule.references,
      file: `${rule.pos.file}:${rule.pos.line}`,
      verdicts: vs.map((v) => row(v, rule, structureById.get(v.structure)!)),
      waivers: h.waivers.filter((w) => w.rule === rule.id).map((w) => waiverLink(w, useById.get(w.id), results.on)),
      worst: worstWord(vs),
      chartSvg: points.length ? await valueChart(points, rule.sides.map((x) => x.limit * scale.factor), axisTitle) : '',
    });
  }

  const structures = [];
  for (const s of h.structures) {
    const { quantities, incomplete } = evaluateStructure(s, plans);
    const vs = scoped.filter((v) => v.structure === s.id);
    const num = (name: string) => (quantities[name]?.value ?? undefined) as number | undefined;
    const p = (name: string) => s.params.get(name)?.value;
    const bars = vs.filter((v) => v.margin !== null).map((v) => ({ label: v.rule, margin: v.margin!, status: v.status }));
    structures.push({
      id: s.id,
      title: s.title,
      url: urls.structure(s.id),
      kind: s.kind,
      array: s.array ?? '',
      tags: s.tags,
      file: `${s.pos.file}`,
      descriptionHtml: s.description ? renderMarkdown(s.description) : '',
      params: [...s.params.values()]
        .filter((x) => x.origin.type === 'handbook')
        .map((x) => ({ name: x.name, label: paramLabel(x.name), written: x.written, valueText: formatValue(x.value, x.unit), rangeText: x.low !== undefined ? `${formatValue(x.low, x.unit)} … ${formatValue(x.high ?? null, x.unit)}` : '', description: GEOMETRY_PARAMS[x.name.split('.')[1] ?? '']?.description ?? '' })),
      materials: Object.entries(s.materialRoles).map(([role, id]) => {
        const m = h.materials.get(id)!;
        return {
          role,
          id,
          title: m.title,
          properties: Object.keys(m.properties).map((prop) => {
            const param = s.params.get(`materials.${role}.${prop}`)!;
            return { name: MATERIAL_PROPERTIES[prop]?.description ?? prop, valueText: formatValue(param.value, param.unit), origin: originPhrase(param.origin) };
          }),
        };
      }),
      quantities: Object.entries(quantities).map(([name, q]) => ({
        name,
        title: QUANTITIES.get(baseName(name))!.title,
        url: urls.quantity(baseName(name)),
        valueText: q.value === null ? valuePhrase({ value: null, unit: q.unit, ...(q.reason ? { reason: q.reason } : {}), ...(q.unbounded ? { unbounded: q.unbounded } : {}) }) : formatValue(q.value, q.unit),
        valueIsText: q.value === null,
        flagged: (q.outside_validity?.length ?? 0) > 0,
      })),
      outsideValidity: flagsByReason(quantities),
      incomplete: Object.entries(incomplete).map(([name, missing]) => ({ name, title: QUANTITIES.get(baseName(name))!.title, missing: missing.join(', ') })),
      verdicts: vs.map((v) => row(v, ruleById.get(v.rule)!, s)),
      waivers: h.waivers.filter((w) => appliesTo(w, s)).map((w) => waiverLink(w, useById.get(w.id), results.on)),
      worst: worstWord(vs),
      processWindow: results.windows?.[s.id] ? await windowPage(results.windows[s.id]!) : null,
      sectionSvg: renderCrossSection({
        kind: s.kind,
        cd: p('geometry.cd') ?? 0,
        ...(p(isOpening(s.kind) ? 'geometry.depth' : 'geometry.height') !== undefined ? { extent: p(isOpening(s.kind) ? 'geometry.depth' : 'geometry.height')! } : {}),
        ...(num('geometry.bottom_cd') !== undefined ? { bottomCd: num('geometry.bottom_cd')! } : {}),
        ...(p('geometry.pitch') !== undefined ? { pitch: p('geometry.pitch')! } : {}),
        ...(p('geometry.wall') !== undefined ? { wall: p('geometry.wall')! } : {}),
        ...(num('geometry.closure_depth') !== undefined ? { closesAt: num('geometry.closure_depth')! } : {}),
      }),
      chartSvg: bars.length ? await marginChart(bars) : '',
    });
  }

  const verdictAt = new Map(results.verdicts.map((v) => [`${v.rule}\u0000${v.structure}`, v]));
  const matrix = {
    rules: h.rules.map((r) => ({ id: r.id, title: r.title, url: urls.rule(r.id) })),
    rows: h.structures.map((s) => ({
      id: s.id,
      title: s.title,
      url: urls.structure(s.id),
      cells: h.rules.map((r) => {
        const v = verdictAt.get(`${r.id}\u0000${s.id}`)!;
        const scopedCell = inScope(v);
        // A waiver's part, said in words (the cell's colour is not the only sign of it).
        const waiverWords = !v.waiver ? '' : v.status === 'waived' ? `, ${waivedPhrase(v.waiver)}` : `; ${lapsePhrase(v.waiver, v.unit)}`;
        return {
          status: scopedCell ? v.status : 'out-of-scope',
          advisory: scopedCell && v.status === 'fail' && v.severity === 'advisory',
          waiverLapsed: scopedCell && v.waiver?.lapsed !== undefined,
          // The margin when there is one (a zero limit or an unbounded value has none). A waived
          // failure is marked W, its margin still shown: it is a failure that is excused.
          short: !scopedCell
            ? ''
            : v.status === 'fail'
              ? v.margin === null ? '✗' : `✗ ${formatMargin(v.margin)}`
              : v.status === 'waived'
                ? v.margin === null ? 'W' : `W ${formatMargin(v.margin)}`
                : v.status === 'pass'
                  ? v.margin === null ? '✓' : formatMargin(v.margin)
                  : v.status === 'incomplete' ? '?' : 'n/a',
          url: scopedCell ? urls.verdict(r.id, s.id) : '',
          label: `${r.id} on ${s.id}: ${scopedCell ? STATUS_WORDS[v.status] : 'outside the rule’s scope'}${v.margin !== null ? `, margin ${formatMargin(v.margin)}` : ''}${scopedCell ? waiverWords : ''}`,
        };
      }),
    })),
  };

  const engines = ENGINES.map((e) => ({
    id: e.id,
    title: e.title,
    summary: e.summary,
    url: urls.engine(e.id),
    quantities: e.quantities.map((q) => ({
      name: q.name,
      anchor: q.name.replace('.', '-'),
      title: q.title,
      unitText: q.unit === '1' ? 'dimensionless' : q.unit,
      symbolHtml: texToMathml(q.symbol),
      description: q.description,
      source: q.source,
      assumptions: q.assumptions ?? [],
      validity: (q.validity ?? []).map((c) => c.why),
      variants: variantsOf(q.name),
    })),
  }));

  const blocking = verdictPages.filter((v) => v.status === 'fail' && v.severity === 'blocking');
  return {
    meta: { title: h.meta.title, organisation: h.meta.organisation ?? '', summaryHtml: h.meta.summary ? renderMarkdown(h.meta.summary) : '' },
    caution: CAUTION,
    contentSecurityPolicy: CONTENT_SECURITY_POLICY,
    /** Files and entries the handbook's loading left out (warnings), for the overview. */
    leftOut: h.warnings.map((w) => ({ place: `${w.file}${w.line > 1 || w.column > 1 ? `:${w.line}:${w.column}` : ''}`, text: describeDiagnostic(w) })),
    counts: results.counts,
    scopedCount: scoped.length,
    blockingFailures: results.blockingFailures,
    blocking: blocking.map((v) => ({ rule: v.rule, structure: v.structure, url: v.url, valueText: v.valueText, limitText: v.limitText, marginText: v.marginText, ruleTitle: v.ruleTitle })),
    advisoryFailures: verdictPages.filter((v) => v.status === 'fail' && v.severity !== 'blocking').map((v) => ({ rule: v.rule, structure: v.structure, url: v.url, marginText: v.marginText, ruleTitle: v.ruleTitle })),
    incompletes: verdictPages.filter((v) => v.status === 'incomplete').map((v) => ({ rule: v.rule, structure: v.structure, url: v.url, missing: v.missing.join(', '), ruleTitle: v.ruleTitle })),
    waived: verdictPages.filter((v) => v.status === 'waived').map((v) => ({ rule: v.rule, structure: v.structure, url: v.url, marginText: v.marginText, ruleTitle: v.ruleTitle, waiverNote: v.waiverNote, waiverUrl: v.waiverUrl })),
    waivers: waiverPages(h, results, ruleById, structureById),
    /** The day waivers were judged on ('' when none was given). */
    waiversOn: results.on ?? '',
    /** Failures whose waiver no longer holds, and waivers that excuse nothing, for the overview. */
    waiverAlerts: waiverAlerts(h, results),
    countsSvg: await countsChart(results.counts),
    rules,
    structures,
    verdicts: verdictPages,
    tool: extras.tool ?? '',
    history: await historyOf(extras.history),
    matrix,
    engines,
    schemas: Object.entries(SCHEMAS).map(([file, make]) => ({ file, url: `/schemas/${file}`, json: JSON.stringify(make(), null, 2) })),
  };
}

export type ReportData = Awaited<ReturnType<typeof assembleReport>>;

/** History page data, with a margin chart for each verdict whose margin was known at two revisions or more. */
async function historyOf(pages: HistoryPages | undefined) {
  if (!pages) return null;
  const trends: Record<string, string> = {};
  for (const [key, points] of Object.entries(pages.margins)) {
    const known = points.filter((p): p is typeof p & { margin: number } => p.margin !== null && Number.isFinite(p.margin));
    if (known.length >= 2) trends[key] = await trendChart(known);
  }
  return { ...pages, trends };
}


/** A process window as its page lays it out: the heat map, the edges in words, the rules mapped. */
async function windowPage(w: ProcessWindow) {
  const [ax, ay] = w.axes;
  const xs = displayScale(ax.unit, Math.abs(ax.nominal));
  const ys = displayScale(ay.unit, Math.abs(ay.nominal));
  const cells = w.cells.map((c) => ({
    x0: c.x0 * xs.factor,
    x1: c.x1 * xs.factor,
    y0: c.y0 * ys.factor,
    y1: c.y1 * ys.factor,
    state: (c.pass ? 'pass' : c.failing?.includes(OUTSIDE) ? 'outside' : 'fail') as 'pass' | 'fail' | 'outside',
  }));
  const box =
    ax.low !== undefined || ay.low !== undefined
      ? { x0: (ax.low ?? ax.nominal) * xs.factor, x1: (ax.high ?? ax.nominal) * xs.factor, y0: (ay.low ?? ay.nominal) * ys.factor, y1: (ay.high ?? ay.nominal) * ys.factor }
      : null;
  const edgePoint = (e: WindowEdge) => (e.axis === 0 ? { x: e.at * xs.factor, y: ay.nominal * ys.factor } : { x: ax.nominal * xs.factor, y: e.at * ys.factor });
  const title = (a: typeof ax, s: typeof xs) => `${a.input}${s.label ? ` (${s.label})` : ''}`;
  const svg = await windowChart(cells, { x: ax.nominal * xs.factor, y: ay.nominal * ys.factor }, box, (w.edges ?? []).map(edgePoint), title(ax, xs), title(ay, ys));
  const edges = (w.edges ?? []).map((e) => {
    const a = w.axes[e.axis];
    const bound = e.rule ? `bounded by ${e.rule}` : 'the end of the range mapped, unbounded there';
    return `${a.input} ${e.side === 'low' ? '≥' : '≤'} ${formatValue(e.at, a.unit)} (now ${formatValue(a.nominal, a.unit)}): ${bound}`;
  });
  // A rule that fails at the nominal point and reads neither axis would empty the window everywhere.
  const failingHere = [...new Set(w.cells.flatMap((c) => c.failing ?? []).filter((r) => r !== OUTSIDE))];
  return {
    svg,
    edges,
    nominalPasses: w.nominalPasses,
    rulesText: w.rules.join(', ') || 'none',
    notMapped: (w.notMapped ?? []).map((n) => `${n.rule} (${n.why})`),
    failingText: failingHere.join(', '),
    evaluations: w.evaluations,
    rangeText: `${formatValue(ax.from, ax.unit)} … ${formatValue(ax.to, ax.unit)} by ${formatValue(ay.from, ay.unit)} … ${formatValue(ay.to, ay.unit)}`,
  };
}

/** The verdict's inputs ranked by what they move, the tornado chart and what would pass. */
async function leversPage(v: Verdict) {
  const levers = v.levers ?? [];
  const unit = v.unit;
  const toleranced = levers.filter((l) => l.ends && l.ends.valueAtLow !== null && l.ends.valueAtHigh !== null);
  const nominal = v.nominal ?? v.value;
  let chartSvg = '';
  if (toleranced.length && nominal !== null && nominal !== undefined) {
    const scale = displayScale(unit, Math.abs(nominal) || Math.abs(v.limit));
    const sides = v.sides ?? [v];
    const pass = (x: number) => (meetsAll(x, sides) ? 'pass' : 'fail') as 'pass' | 'fail';
    chartSvg = await tornadoChart(
      toleranced.map((l) => ({ label: l.name, low: l.ends!.valueAtLow! * scale.factor, high: l.ends!.valueAtHigh! * scale.factor, lowStatus: pass(l.ends!.valueAtLow!), highStatus: pass(l.ends!.valueAtHigh!) })),
      nominal * scale.factor,
      sides.map((x) => x.limit * scale.factor),
      `${QUANTITIES.get(v.quantity)?.title ?? v.quantity}${scale.label ? ` (${scale.label})` : ''}`,
    );
  }
  return {
    notComputed: v.leversNotComputed ?? '',
    chartSvg,
    limitsWord: v.sides ? 'the dashed ones the limits' : 'the dashed one the limit',
    rows: levers.map((l) => ({
      name: l.name,
      toleranceText: l.ends ? `${formatValue(l.ends.low, l.unit)} … ${formatValue(l.ends.high, l.unit)}` : '',
      endsText: l.ends ? `${formatValue(l.ends.valueAtLow, unit)} … ${formatValue(l.ends.valueAtHigh, unit)}` : '',
      swingText: l.ends && l.ends.valueAtLow !== null && l.ends.valueAtHigh !== null ? swingText(l.ends.valueAtLow, l.ends.valueAtHigh, v) : '',
      elasticityText: l.elasticity === null ? '—' : `${l.elasticity >= 0 ? '+' : '−'}${sig(Math.abs(l.elasticity), 3)}`,
      passingText: passingPhrase(l),
      searchedText: l.searched ? `${formatValue(l.searched[0], l.unit)} … ${formatValue(l.searched[1], l.unit)}` : '',
    })),
  };
}

/** How far the margin moves across a tolerance, in margin points (or in the value's unit for a zero limit). */
function swingText(a: number, b: number, v: Pick<Verdict, 'limit' | 'comparison' | 'unit'>): string {
  const ma = margin(a, v.limit, v.comparison);
  const mb = margin(b, v.limit, v.comparison);
  if (ma === null || mb === null) return formatValue(Math.abs(b - a), v.unit);
  return `${sig(Math.abs(mb - ma) * 100, 3)} points`;
}

/**
 * What the verdict's evaluation mode found, as its template partial (`mode-<kind>.njk`) lays it
 * out: one shape per mode, formatted here, computed by the checker.
 */
function modePage(v: Verdict) {
  const m = v.mode;
  if (!m) return { kind: 'none' };
  switch (m.kind) {
    case 'nominal':
      return { kind: m.kind, summary: 'nominal' };
    case 'worst-case':
      return {
        kind: m.kind,
        summary: `worst case, ${m.corners} corner${m.corners === 1 ? '' : 's'}`,
        corners: m.corners,
        worstCorner: m.worstCorner.map((c) => ({ name: c.name, side: c.side, valueText: formatValue(c.value, unitOfStep(v, c.name)) })),
        failureText: m.failure ? failurePhrase(m.failure) : '',
        failureSeed: m.failure?.seed ?? 0,
        failureNotSampled: m.failureNotSampled ?? '',
        bySideText: m.bySide ? bySidePhrase(m.bySide, v.unit) : '',
      };
    case 'yield': {
      const y = yieldPhrases(m);
      return {
        kind: m.kind,
        summary: `yield, required ${m.requiredWritten}`,
        estimateText: percent(m.estimate),
        intervalText: `${percent(m.low)} – ${percent(m.high)}`,
        confidenceText: percent(m.confidence),
        requiredText: m.requiredWritten,
        samples: m.samples,
        failures: m.failures,
        foundText: y.found,
        decidedText: y.decided,
        seed: m.seed,
      };
    }
  }
}

/**
 * The chart of the verdict's quantity against the input its declaration sweeps (the height, say),
 * as the checker ran it from the deciding inputs (`Verdict.sweeps`). Null when there is none.
 */
async function sweepOf(v: Verdict, extra = false): Promise<{ svg: string; caption: string } | null> {
  const c = v.sweeps?.[extra ? 1 : 0];
  if (!c) return null;
  const def = QUANTITIES.get(c.quantity)!;
  const xScale = displayScale(c.axis.unit, c.own.x);
  const yScale = displayScale(def.unit, c.own.y);
  const scaled = (pts: Array<{ x: number; y: number }>) => pts.map((p) => ({ x: p.x * xScale.factor, y: p.y * yScale.factor }));
  const companion = c.companion ? scaled(c.companion.points) : [];
  const overlay = c.overlay ? scaled(c.overlay.points) : [];
  const xTitle = `${c.axis.label}${xScale.label ? ` (${xScale.label})` : ''}`;
  const yTitle = `${def.title}${yScale.label ? ` (${yScale.label})` : ''}`;
  const limits = c.quantity === v.quantity ? (v.sides ?? [v]).map((x) => x.limit * yScale.factor) : [];
  const svg = await sweepChart(scaled(c.points), { x: c.own.x * xScale.factor, y: c.own.y * yScale.factor, status: v.status }, limits, xTitle, yTitle, companion, overlay);
  const corner = MODE_WORDS[v.evaluateAt].others;
  const also =
    (companion.length > 1 && c.companion ? `; dotted: the ${c.companion.label}` : '') +
    (overlay.length && c.overlay ? `; ○ ${c.overlay.label}` : '') +
    (limits.length > 1 ? '; dashed: the limits' : limits.length ? '; dashed: the limit' : '');
  return { svg, caption: `${def.title} against ${c.axis.label}, with ${corner}; ◆ this structure${also}.` };
}

/** `deposition.step_coverage[liner]` → `deposition.step_coverage`. */
function baseName(listed: string): string {
  return listed.replace(/\[.*\]$/, '');
}

function scopeText(rule: Rule): string {
  return selectorText(rule.appliesTo);
}

function worstWord(vs: Verdict[]): string {
  if (vs.some((v) => v.status === 'fail' && v.severity === 'blocking')) return 'fail';
  if (vs.some((v) => v.status === 'fail')) return 'fail-advisory';
  if (vs.some((v) => v.status === 'incomplete')) return 'incomplete';
  // An excused failure is still not a pass.
  if (vs.some((v) => v.status === 'waived')) return 'waived';
  if (vs.some((v) => v.status === 'pass')) return 'pass';
  return 'not-applicable';
}

/** Formula of each variant a quantity has, for the methods page: every kind with every array it can have. */
/** The example shapes every quantity's methods-page formulas are found on (the same for all). */
const EXAMPLE_SHAPES = exampleShapes();

/**
 * Every formula a quantity has over the example shapes of every kind and block, each labelled by
 * where it applies: the kinds, and the block alternative when the formula differs from the base.
 */
function variantsOf(name: string): Array<{ label: string; formulaHtml: string }> {
  const q = QUANTITIES.get(name)!;
  const seen = new Map<string, { kinds: Set<string>; when: Set<string> }>();
  const baseFormula = new Map<string, string>();
  for (const ex of EXAMPLE_SHAPES) {
    const v = q.variant(ex.shape);
    if (!('formula' in v)) continue;
    const where = isElongated(ex.kind) ? ex.kind : `${ex.kind} (${ex.array})`;
    if (ex.alternative === undefined) baseFormula.set(where, v.formula);
    else if (baseFormula.get(where) === v.formula) continue;
    const entry = seen.get(v.formula) ?? { kinds: new Set(), when: new Set() };
    entry.kinds.add(where);
    if (ex.alternative !== undefined) entry.when.add(ex.alternative);
    seen.set(v.formula, entry);
  }
  return [...seen.entries()].map(([formula, { kinds, when }]) => ({
    label: `${[...kinds].join(', ')}${when.size ? ` — with ${[...when].join(' or ')}` : ''}`,
    formulaHtml: texToMathml(formula, true),
  }));
}

type WaiverState = WaiverUse['state'] | 'not-judged';

/** A waiver's state on the evaluation date: a word and a sentence (no date given: not judged). */
function waiverState(w: Waiver, use: WaiverUse | undefined, on: string | undefined): { state: WaiverState; stateWord: string; stateText: string } {
  if (!use || on === undefined) return { state: 'not-judged', stateWord: WAIVER_STATE_WORDS['not-judged'], stateText: 'No evaluation date was given, so no waiver was applied: every failure counts.' };
  const n = use.waives.length;
  const beyond = use.lapsed.filter((l) => l.lapsed === 'beyond-floor').length;
  const text =
    use.state === 'expired'
      ? use.lapsed.length
        ? `Expired: its last day was ${w.expires} (judged on ${on}); the ${use.lapsed.length === 1 ? 'failure it selected counts' : `${use.lapsed.length} failures it selected count`} again.`
        : `Judged on ${on}: ${expiredUnneededPhrase(use)}.`
      : use.state === 'unused'
        ? `Judged on ${on}: ${unusedPhrase(use)}.`
        : `Holds through ${w.expires} (judged on ${on}): it waives ${n === 1 ? 'one failure' : `${n} failures`}${beyond ? `; ${beyond === 1 ? 'one failure is' : `${beyond} failures are`} beyond the limit it requires and ${beyond === 1 ? 'counts' : 'count'}` : ''}.`;
  return { state: use.state, stateWord: WAIVER_STATE_WORDS[use.state], stateText: text };
}

/** A waiver named on a rule's or a structure's page. */
function waiverLink(w: Waiver, use: WaiverUse | undefined, on: string | undefined) {
  const { state, stateWord } = waiverState(w, use, on);
  return { id: w.id, url: urls.waiver(w.id), state, stateWord, expires: w.expires, selectionText: selectionOf(w) };
}

function selectionOf(w: Waiver): string {
  return selectorText(w.appliesTo);
}

/** A phrase as a sentence: its first letter in capitals. */
function sentence(text: string): string {
  return text.charAt(0).toUpperCase() + text.slice(1);
}

/** Where a waiver is written, as editors link it. */
function placeOf(w: Waiver): string {
  return `${w.pos.file}:${w.pos.line}:${w.pos.column}`;
}

/** The waiver section of a verdict page: what the waiver says, and whether it holds for this verdict. */
function waiverOnVerdict(v: Verdict, waiverById: ReadonlyMap<string, Waiver>) {
  if (!v.waiver) return null;
  const w = waiverById.get(v.waiver.id)!;
  const holds = v.status === 'waived';
  return {
    id: w.id,
    url: urls.waiver(w.id),
    holds,
    heading: holds ? 'Waived' : 'Waiver no longer holds',
    stateText: sentence(holds ? `${waivedPhrase(v.waiver)}: this failure is excused and does not count as one.` : `${lapsePhrase(v.waiver, v.unit)}; this failure counts.`),
    reasonHtml: renderMarkdown(w.reason),
    owner: w.owner,
    approvedBy: w.approvedBy,
    expires: w.expires,
    place: placeOf(w),
    floorText: w.stillWithin ? floorPhrase(w.stillWithin, v.unit) : '',
    selectionText: selectionOf(w),
  };
}

/** Every waiver with its state, and the verdicts of its rule on the structures it selects. */
function waiverPages(h: Handbook, results: Results, ruleById: ReadonlyMap<string, Rule>, structureById: ReadonlyMap<string, Structure>) {
  const useById = new Map(results.waivers.map((u) => [u.id, u]));
  return h.waivers.map((w) => {
    const rule = ruleById.get(w.rule)!;
    const unit = QUANTITIES.get(rule.quantity)!.unit;
    const use = useById.get(w.id);
    const selected = results.verdicts.filter((v) => {
      if (v.rule !== w.rule) return false;
      const s = structureById.get(v.structure)!;
      return appliesTo(w, s) && appliesTo(rule, s);
    });
    const lines: string[] = [];
    if (use) {
      for (const l of use.lapsed) {
        const v = selected.find((x) => x.structure === l.structure);
        lines.push(failsAgainPhrase(use, w.rule, l.structure, l.lapsed, v?.waiver?.stillWithin ? floorPhrase(v.waiver.stillWithin, v.unit) : undefined));
      }
    }
    return {
      id: w.id,
      url: urls.waiver(w.id),
      rule: rule.id,
      ruleTitle: rule.title,
      ruleUrl: urls.rule(rule.id),
      limitText: limitsPhrase(rule.sides, unit),
      selectionText: selectionOf(w),
      reasonHtml: renderMarkdown(w.reason),
      owner: w.owner,
      approvedBy: w.approvedBy,
      peopleText: waiverPeoplePhrase(w),
      expires: w.expires,
      place: placeOf(w),
      floorText: w.stillWithin ? floorPhrase(w.stillWithin, unit) : '',
      ...waiverState(w, use, results.on),
      failsAgain: lines,
      verdicts: selected.map((v) => ({ ...row(v, rule, structureById.get(v.structure)!), effect: effectOn(v, w) })),
    };
  });
}

/** What a waiver does to one verdict of its rule that it selects. */
function effectOn(v: Verdict, w: Waiver): string {
  if (v.status === 'waived') return v.waiver?.id === w.id ? 'waived by this waiver' : `waived by ${v.waiver?.id ?? 'another waiver'}`;
  if (v.status === 'fail') return v.waiver?.id === w.id ? `counts: ${lapsePhrase(v.waiver, v.unit)}` : 'counts: no waiver of it holds';
  if (v.status === 'pass') return 'passes: nothing to waive';
  if (v.status === 'incomplete') return 'incomplete: a waiver excuses failures only';
  return 'not applicable';
}

/** Sentences for the overview: each failure that counts again, each waiver that excuses nothing. */
function waiverAlerts(h: Handbook, results: Results): Array<{ id: string; url: string; text: string }> {
  const out: Array<{ id: string; url: string; text: string }> = [];
  for (const use of results.waivers) {
    const url = urls.waiver(use.id);
    for (const l of use.lapsed) {
      const v = results.verdicts.find((x) => x.rule === use.rule && x.structure === l.structure);
      out.push({ id: use.id, url, text: failsAgainPhrase(use, use.rule, l.structure, l.lapsed, v?.waiver?.stillWithin ? floorPhrase(v.waiver.stillWithin, v.unit) : undefined) });
    }
    if (use.expired && use.lapsed.length === 0) out.push({ id: use.id, url, text: expiredUnneededPhrase(use) });
    else if (use.unused) out.push({ id: use.id, url, text: unusedPhrase(use) });
  }
  return h.waivers.length ? out : [];
}

/** A structure's validity flags, one entry per reason with the quantities it affects. */
function flagsByReason(quantities: Record<string, StructureQuantity>): Array<{ why: string; quantities: string[] }> {
  const byWhy = new Map<string, string[]>();
  for (const [name, q] of Object.entries(quantities)) for (const why of q.outside_validity ?? []) byWhy.set(why, [...(byWhy.get(why) ?? []), name]);
  return [...byWhy].map(([why, names]) => ({ why, quantities: names }));
}
