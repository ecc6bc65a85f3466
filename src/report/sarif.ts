// Results → a SARIF 2.1.0 log (OASIS Static Analysis Results Interchange Format, Version 2.1.0 Plus
// Errata 01), for code-review tools that read SARIF. Pure: the same handbook, results and options
// give the same log, byte for byte; it has no timestamp unless one is passed in.
//
//   rules (sorted by id) ──▶ tool.driver.rules        one reportingDescriptor per rule (§3.49)
//   verdicts that need attention ──▶ run.results      one result per fail, waived or incomplete (§3.27)
//   baseline verdicts ──▶ result.baselineState        new / unchanged / updated, plus absent (§3.27.24)
//
// Section numbers (§) below are those of the OASIS standard.
import type { Results, Status, Verdict, WaiverRef } from '../checker/evaluate.ts';
import { byCodePoint } from '../diagnostics/diagnostic.ts';
import { QUANTITIES } from '../engines/index.ts';
import type { Handbook, Rule, SourcePos, Structure } from '../model/types.ts';
import { urls } from '../model/urls.ts';
import { formatMargin, formatValue } from '../model/format.ts';
import { limitsPhrase, MODE_WORDS, verdictLimitsPhrase, yieldPhrases } from './words.ts';

// ---------------------------------------------------------------------------------------------
// The subset of SARIF 2.1.0 this module writes.

export type SarifLevel = 'none' | 'note' | 'warning' | 'error';
export type SarifKind = 'notApplicable' | 'pass' | 'fail' | 'review' | 'open' | 'informational';
export type BaselineState = 'new' | 'unchanged' | 'updated' | 'absent';

/** A JSON value, for property bags (§3.8). */
export type PropertyValue = string | number | boolean | null | PropertyValue[] | { [key: string]: PropertyValue };
export type PropertyBag = Record<string, PropertyValue>;

/** §3.11 */
export interface SarifMessage {
  text: string;
}
/** §3.12 */
export interface MultiformatMessageString {
  text: string;
  markdown?: string;
}
/** §3.4 */
export interface ArtifactLocation {
  uri?: string;
  uriBaseId?: string;
  description?: SarifMessage;
}
/** §3.30 */
export interface Region {
  startLine: number;
  startColumn: number;
}
/** §3.29 */
export interface PhysicalLocation {
  artifactLocation: ArtifactLocation;
  region: Region;
}
/** §3.28 */
export interface Location {
  id?: number;
  physicalLocation: PhysicalLocation;
  message?: SarifMessage;
}
/** §3.35 */
export interface Suppression {
  kind: 'inSource' | 'external';
  status: 'accepted' | 'underReview' | 'rejected';
  justification: string;
  location: Location;
  properties: PropertyBag;
}
/** §3.50 */
export interface ReportingConfiguration {
  level: SarifLevel;
}
/** §3.49 */
export interface ReportingDescriptor {
  id: string;
  name: string;
  shortDescription: MultiformatMessageString;
  fullDescription?: MultiformatMessageString;
  helpUri?: string;
  defaultConfiguration: ReportingConfiguration;
  properties: PropertyBag;
}
/** §3.19 */
export interface ToolComponent {
  name: string;
  version: string;
  informationUri?: string;
  rules: ReportingDescriptor[];
}
/** §3.27 */
export interface SarifResult {
  ruleId: string;
  ruleIndex?: number;
  kind: SarifKind;
  level: SarifLevel;
  message: SarifMessage;
  locations: Location[];
  relatedLocations?: Location[];
  partialFingerprints: Record<string, string>;
  suppressions?: Suppression[];
  baselineState?: BaselineState;
  properties: PropertyBag;
}
/** §3.23 */
export interface VersionControlDetails {
  repositoryUri: string;
  revisionId: string;
  mappedTo: ArtifactLocation;
}
/** §3.20 */
export interface Invocation {
  executionSuccessful: boolean;
  startTimeUtc?: string;
}
/** §3.14 */
export interface SarifRun {
  tool: { driver: ToolComponent };
  invocations?: Invocation[];
  originalUriBaseIds: Record<string, ArtifactLocation>;
  versionControlProvenance?: VersionControlDetails[];
  columnKind: 'utf16CodeUnits' | 'unicodeCodePoints';
  results: SarifResult[];
  properties: PropertyBag;
}
/** §3.13 */
export interface SarifLog {
  $schema: string;
  version: '2.1.0';
  runs: [SarifRun];
}

export interface SarifInput {
  handbook: Handbook;
  results: Results;
  toolVersion: string;
  /** The handbook folder relative to the repository root: '' when the handbook is the repository, or e.g. 'handbook/'. */
  uriBase: string;
  /** Absolute base URL of the published report; without it no URL is written (helpUri, verdictPage, informationUri). */
  siteUrl?: string;
  /** The revision checked; versionControlProvenance needs the repository's URI too (§3.23.3 requires it). */
  revision?: { commit: string; repositoryUri?: string };
  /** The verdicts of a baseline revision: every result then carries a baselineState. */
  baseline?: readonly Verdict[];
  /** When given (ISO 8601 UTC), written as the invocation's start; otherwise the log has no time in it. */
  startTimeUtc?: string;
}

export const SARIF_SCHEMA_URI = 'https://json.schemastore.org/sarif-2.1.0.json';
/** Our base id for the repository root (§3.14.14): artifact URIs are relative to it. */
export const REPO_ROOT = 'REPOROOT';
/** The partialFingerprints key (§3.27.17): rule and structure only, so a result keeps its identity while its value moves. */
export const FINGERPRINT_KEY = 'plumblineVerdict/v1';

// ---------------------------------------------------------------------------------------------
// Baseline comparison.

/**
 * The statuses that become results. SARIF could carry passes too (kinds "pass" and "notApplicable",
 * §3.27.9), but a pass or a not-applicable verdict is nothing to review: a run checks every rule
 * against every structure, so a result for each would bury the few that need attention in tools
 * that list every result. The run's properties keep the counts of all statuses.
 */
const REPORTED: ReadonlySet<Status> = new Set<Status>(['fail', 'waived', 'incomplete']);
export function isReported(v: Pick<Verdict, 'status'>): boolean {
  return REPORTED.has(v.status);
}

/** The identity of a verdict across revisions (rule and structure ids are URL-safe, so '/' cannot occur in them). */
export function verdictKey(v: Pick<Verdict, 'rule' | 'structure'>): string {
  return `${v.rule}/${v.structure}`;
}

function sameValue(a: Verdict, b: Verdict): boolean {
  if (a.value === null || b.value === null) return a.value === b.value && a.unbounded === b.unbounded;
  return a.value.toPrecision(4) === b.value.toPrecision(4);
}

export interface BaselineComparison {
  /** For every reported verdict of the current run, by `verdictKey`. */
  states: Map<string, Exclude<BaselineState, 'absent'>>;
  /** Reported verdicts of the baseline with no reported verdict now, sorted by rule then structure. */
  absent: Verdict[];
}

/**
 * §3.27.24: `new` when the baseline reported nothing for the rule and structure, `unchanged` when it
 * reported the same status with the same value to 4 significant digits, `updated` otherwise; and
 * `absent` for what the baseline reported and the current run does not.
 */
export function compareWithBaseline(current: readonly Verdict[], baseline: readonly Verdict[]): BaselineComparison {
  const before = new Map(baseline.filter(isReported).map((v) => [verdictKey(v), v]));
  const states = new Map<string, Exclude<BaselineState, 'absent'>>();
  for (const v of current.filter(isReported)) {
    const b = before.get(verdictKey(v));
    states.set(verdictKey(v), !b ? 'new' : b.status === v.status && sameValue(b, v) ? 'unchanged' : 'updated');
  }
  const absent = [...before.values()].filter((b) => !states.has(verdictKey(b))).sort(byRuleThenStructure);
  return { states, absent };
}

function byRuleThenStructure(a: Pick<Verdict, 'rule' | 'structure'>, b: Pick<Verdict, 'rule' | 'structure'>): number {
  return byCodePoint(a.rule, b.rule) || byCodePoint(a.structure, b.structure);
}

// ---------------------------------------------------------------------------------------------
// Places and addresses.

/**
 * Where a verdict is decided: for worst-case verdicts the first input of the worst corner written in
 * the handbook, else the first input written in the handbook, else the structure itself (an
 * incomplete verdict has no trace). Inputs from the built-in material table have no handbook line.
 */
export function decidingPosition(v: Verdict, s: Pick<Structure, 'pos'> | undefined): SourcePos | undefined {
  const inputs = v.trace?.inputs ?? [];
  const written = (name: string): SourcePos | undefined => {
    const origin = inputs.find((i) => i.name === name)?.origin;
    return origin?.type === 'handbook' ? origin.pos : undefined;
  };
  if (v.mode?.kind === 'worst-case') {
    for (const c of v.mode.worstCorner) {
      const pos = written(c.name);
      if (pos) return pos;
    }
  }
  for (const i of inputs) if (i.origin.type === 'handbook') return i.origin.pos;
  return s?.pos;
}

/** A relative URI reference (§3.4.3) for a path under the handbook; each segment percent-encoded. */
function artifactUri(uriBase: string, file: string): string {
  const base = uriBase.replace(/^\.\//, '').replace(/^\/+/, '');
  const path = base === '' ? file : `${base.replace(/\/+$/, '')}/${file}`;
  return path.split('/').map(encodeURIComponent).join('/');
}

function locationAt(uriBase: string, pos: Pick<SourcePos, 'file' | 'line' | 'column'>, extra: { id?: number; message?: string } = {}): Location {
  return {
    ...(extra.id !== undefined ? { id: extra.id } : {}),
    physicalLocation: {
      artifactLocation: { uri: artifactUri(uriBase, pos.file), uriBaseId: REPO_ROOT },
      region: { startLine: pos.line, startColumn: pos.column },
    },
    ...(extra.message !== undefined ? { message: { text: extra.message } } : {}),
  };
}

/** A report page's absolute URL: the site URL (without trailing slashes) followed by the page's path. */
export function pageUrl(siteUrl: string, path: string): string {
  return `${siteUrl.replace(/\/+$/, '')}${path}`;
}

// ---------------------------------------------------------------------------------------------
// Rules.

/** §3.49.7: a name for people, without spaces; from the rule's title ("Hole bottom at least 30 nm" → HoleBottomAtLeast30Nm). */
function ruleName(rule: Rule): string {
  const words = rule.title.split(/[^A-Za-z0-9]+/).filter((w) => w !== '');
  return words.length ? words.map((w) => w[0]!.toUpperCase() + w.slice(1)).join('') : rule.id;
}

function levelOf(severity: Rule['severity']): SarifLevel {
  return severity === 'blocking' ? 'error' : 'warning';
}

function describeRule(rule: Rule, siteUrl: string | undefined): ReportingDescriptor {
  const unit = QUANTITIES.get(rule.quantity)?.unit ?? '1';
  const rationale = rule.rationale.trim();
  return {
    id: rule.id,
    name: ruleName(rule),
    shortDescription: { text: rule.title },
    // The rationale is handbook Markdown; its source reads as plain text too.
    ...(rationale !== '' ? { fullDescription: { text: rationale, markdown: rationale } } : {}),
    ...(siteUrl !== undefined ? { helpUri: pageUrl(siteUrl, urls.rule(rule.id)) } : {}),
    defaultConfiguration: { level: levelOf(rule.severity) },
    properties: {
      quantity: rule.quantity,
      ...(rule.film !== undefined ? { film: rule.film } : {}),
      comparison: rule.sides[0]!.comparison,
      limit: rule.sides[0]!.limit,
      ...(rule.sides.length > 1 ? { sides: rule.sides.map((x) => ({ comparison: x.comparison, limit: x.limit })) } : {}),
      unit,
      limitText: limitsPhrase(rule.sides, unit),
      evaluateAt: rule.evaluateAt,
      severity: rule.severity,
    },
  };
}

// ---------------------------------------------------------------------------------------------
// Results.

function quantityWords(v: Verdict): string {
  const title = QUANTITIES.get(v.quantity)?.title;
  return title ? title.charAt(0).toLowerCase() + title.slice(1) : v.quantity;
}

function valueClause(v: Verdict): string {
  const where = MODE_WORDS[v.evaluateAt].where;
  if (v.value !== null) return `${formatValue(v.value, v.unit)} ${where}`;
  const end = v.unbounded === 'above' ? '+∞' : v.unbounded === 'below' ? '−∞' : 'undefined';
  return `without a finite value ${where} (${end}: ${v.reason ?? 'no value'})`;
}

function lapsedClause(w: WaiverRef): string {
  const why = w.lapsed === 'expired' ? `it expired after ${w.expires}` : 'the value is beyond the limit the waiver still requires';
  return ` Waiver ${w.id} does not apply: ${why}.`;
}

/** One plain sentence (or two) with the value, the limit and the margin (§3.27.11: the first sentence stands alone). */
function resultMessage(v: Verdict): string {
  if (v.status === 'incomplete') {
    const what = v.missing && v.missing.length ? `it needs ${v.missing.join(', ')}` : (v.reason ?? 'it has no value');
    return `${v.structure} cannot be checked against ${v.rule}: ${what}.`;
  }
  const verb = v.status === 'waived' && v.waiver ? `fails ${v.rule} under waiver ${v.waiver.id}` : `fails ${v.rule}`;
  const sentence =
    v.mode?.kind === 'yield'
      ? `${v.structure} ${verb}: with ${quantityWords(v)} required ${verdictLimitsPhrase(v)}, the ${yieldPhrases(v.mode).found} (${valueClause(v)}).`
      : `${v.structure} ${verb}: ${quantityWords(v)} is ${valueClause(v)}, against ${v.sides ? 'the limits' : 'a limit of'} ${verdictLimitsPhrase(v)} (margin ${formatMargin(v.margin)}).`;
  return v.status === 'fail' && v.waiver?.lapsed ? sentence + lapsedClause(v.waiver) : sentence;
}

function verdictProperties(v: Verdict): PropertyBag {
  return {
    status: v.status,
    structure: v.structure,
    severity: v.severity,
    quantity: v.quantity,
    unit: v.unit,
    comparison: v.comparison,
    limit: v.limit,
    value: v.value,
    ...(v.unbounded !== undefined ? { unbounded: v.unbounded } : {}),
    margin: v.margin,
    evaluateAt: v.evaluateAt,
    ...(v.nominal !== undefined ? { nominal: v.nominal } : {}),
    ...(v.mode && v.mode.kind !== 'nominal' ? { mode: JSON.parse(JSON.stringify(v.mode)) as PropertyBag } : {}),
    ...(v.missing && v.missing.length ? { missing: [...v.missing] } : {}),
    ...(v.reason !== undefined ? { reason: v.reason } : {}),
  };
}

function waiverProperties(w: WaiverRef): PropertyBag {
  return { waiver: w.id, owner: w.owner, approvedBy: w.approvedBy, expires: w.expires, file: w.file, line: w.line };
}

interface Context {
  uriBase: string;
  siteUrl: string | undefined;
  ruleIndex: Map<string, number>;
  rules: Map<string, Rule>;
  structures: Map<string, Structure>;
}

/** The parts every result has, in the order they are written: identity first, then places. */
function identity(v: Verdict, ctx: Context): Pick<SarifResult, 'ruleId' | 'ruleIndex'> {
  const index = ctx.ruleIndex.get(v.rule);
  return { ruleId: v.rule, ...(index !== undefined ? { ruleIndex: index } : {}) };
}

function places(v: Verdict, ctx: Context, pos: SourcePos | undefined): Pick<SarifResult, 'locations' | 'relatedLocations' | 'partialFingerprints'> {
  const rule = ctx.rules.get(v.rule);
  return {
    locations: pos ? [locationAt(ctx.uriBase, pos)] : [],
    // §3.27.12: one location unless every one must change; the rule's own place is related (§3.27.22).
    ...(rule ? { relatedLocations: [locationAt(ctx.uriBase, rule.pos, { id: 1, message: `rule ${rule.id}` })] } : {}),
    partialFingerprints: { [FINGERPRINT_KEY]: verdictKey(v) },
  };
}

function resultOf(v: Verdict, ctx: Context, baselineState: BaselineState | undefined): SarifResult {
  // §3.27.9 and §3.27.10: a failure (waived or not) is kind "fail" with the rule's level; an
  // incomplete verdict is kind "open" (the tool could not decide), and a kind other than "fail"
  // carries level "none".
  const open = v.status === 'incomplete';
  const waived = v.status === 'waived' && v.waiver !== undefined;
  const lapsed = v.status === 'fail' && v.waiver?.lapsed !== undefined ? v.waiver : undefined;
  return {
    ...identity(v, ctx),
    kind: open ? 'open' : 'fail',
    level: open ? 'none' : levelOf(v.severity),
    message: { text: resultMessage(v) },
    ...places(v, ctx, decidingPosition(v, ctx.structures.get(v.structure))),
    // §3.27.23 and §3.35: a waiver is an approved suppression kept outside the structure's file.
    ...(waived
      ? {
          suppressions: [
            {
              kind: 'external',
              status: 'accepted',
              justification: v.waiver!.reason,
              location: locationAt(ctx.uriBase, v.waiver!, { message: `waiver ${v.waiver!.id}` }),
              properties: waiverProperties(v.waiver!),
            },
          ],
        }
      : {}),
    ...(baselineState !== undefined ? { baselineState } : {}),
    properties: {
      ...verdictProperties(v),
      ...(ctx.siteUrl !== undefined ? { verdictPage: pageUrl(ctx.siteUrl, urls.verdict(v.rule, v.structure)) } : {}),
      ...(lapsed ? { lapsedWaiver: { ...waiverProperties(lapsed), lapsed: lapsed.lapsed ?? '' } } : {}),
    },
  };
}

/**
 * A result the baseline had and the current run has not (§3.27.24 "absent"), built from the
 * baseline verdict. Its kind says what the pair is now — pass, not applicable, or gone from the
 * handbook (informational) — so it is never counted as a current problem, and level is "none".
 */
function absentResultOf(b: Verdict, now: Verdict | undefined, ctx: Context): SarifResult {
  const kind: SarifKind = now?.status === 'pass' ? 'pass' : now?.status === 'not-applicable' ? 'notApplicable' : 'informational';
  const nowWords = now ? (now.status === 'pass' ? 'passes now' : 'is not applicable now') : 'is no longer in the handbook';
  // The baseline's lines may have moved since: point at the structure as it is now, when it still exists.
  const pos = ctx.structures.get(b.structure)?.pos ?? decidingPosition(b, undefined);
  return {
    ...identity(b, ctx),
    kind,
    level: 'none',
    message: { text: `${b.structure} against ${b.rule} was ${b.status} in the baseline and ${nowWords}.` },
    ...places(b, ctx, pos),
    baselineState: 'absent',
    properties: {
      ...verdictProperties(b),
      status: now?.status ?? 'removed',
      baselineStatus: b.status,
      ...(ctx.siteUrl !== undefined && now ? { verdictPage: pageUrl(ctx.siteUrl, urls.verdict(b.rule, b.structure)) } : {}),
    },
  };
}

// ---------------------------------------------------------------------------------------------

export function toSarif(input: SarifInput): SarifLog {
  const { handbook: h, results, siteUrl, revision } = input;
  const rules = [...h.rules].sort((a, b) => byCodePoint(a.id, b.id));
  const ctx: Context = {
    uriBase: input.uriBase,
    siteUrl,
    ruleIndex: new Map(rules.map((r, i) => [r.id, i])),
    rules: new Map(rules.map((r) => [r.id, r])),
    structures: new Map(h.structures.map((s) => [s.id, s])),
  };

  const current = results.verdicts.filter(isReported);
  const comparison = input.baseline ? compareWithBaseline(results.verdicts, input.baseline) : undefined;
  const byKey = new Map(results.verdicts.map((v) => [verdictKey(v), v]));
  const entries: Array<{ v: Verdict; result: SarifResult }> = [
    ...current.map((v) => ({ v, result: resultOf(v, ctx, comparison?.states.get(verdictKey(v))) })),
    ...(comparison?.absent ?? []).map((b) => ({ v: b, result: absentResultOf(b, byKey.get(verdictKey(b)), ctx) })),
  ];
  entries.sort((a, b) => byRuleThenStructure(a.v, b.v));

  const run: SarifRun = {
    tool: {
      driver: {
        name: 'plumbline',
        version: input.toolVersion,
        ...(siteUrl !== undefined ? { informationUri: pageUrl(siteUrl, '/') } : {}),
        rules: rules.map((r) => describeRule(r, siteUrl)),
      },
    },
    ...(input.startTimeUtc !== undefined ? { invocations: [{ executionSuccessful: true, startTimeUtc: input.startTimeUtc }] } : {}),
    // §3.14.14: the repository root's absolute URI is not known where the log is written, so the
    // base id carries only a description; consumers map it to their checkout.
    originalUriBaseIds: { [REPO_ROOT]: { description: { text: 'The root of the repository that holds the handbook.' } } },
    ...(revision?.repositoryUri !== undefined
      ? { versionControlProvenance: [{ repositoryUri: revision.repositoryUri, revisionId: revision.commit, mappedTo: { uriBaseId: REPO_ROOT } }] }
      : {}),
    // Positions come from offsets into the decoded text (JavaScript strings), so columns count UTF-16 code units.
    columnKind: 'utf16CodeUnits',
    results: entries.map((e) => e.result),
    properties: {
      handbook: h.meta.title,
      ...(revision !== undefined ? { revision: revision.commit } : {}),
      counts: { ...results.counts },
      blockingFailures: results.blockingFailures,
    },
  };
  return { $schema: SARIF_SCHEMA_URI, version: '2.1.0', runs: [run] };
}
