// A verdict reduced to what its history needs: the verdict, its value and limit, the inputs it
// read (as written, and where), and a hash of those inputs. Rows are what the ledger writes, what
// history and diff compare, and what the cache keeps, so a revision whose inputs were seen before
// is never evaluated again.
import { createHash } from 'node:crypto';
import { appliesTo, evaluateRule, PlanCache, type Status, type Verdict } from '../checker/evaluate.ts';
import { shapeOf, type Plan } from '../checker/plan.ts';
import { byCodePoint } from '../diagnostics/diagnostic.ts';
import { QUANTITIES } from '../engines/index.ts';
import type { Handbook, Rule, Structure } from '../model/types.ts';

/** One input as the verdict read it. */
export interface RowInput {
  name: string;
  /** As written in the handbook (or the material table). */
  written: string;
  /** `structures/x.yaml:10` when it is written in the handbook. */
  at?: string;
  /** The built-in material it came from, when not written in the handbook. */
  material?: string;
}

/** What evaluating a rule on a structure gave, before any waiver: the part a cache may keep. */
export interface Outcome {
  status: Exclude<Status, 'waived'>;
  value: number | null;
  unbounded?: 'above' | 'below';
  margin: number | null;
  nominal?: number | null;
  reason?: string;
  missing?: string[];
}

export interface VerdictRow extends Outcome {
  rule: string;
  structure: string;
  /** The verdict after waivers (`waived` for a failure a waiver excuses). */
  verdict: Status;
  severity: Rule['severity'];
  quantity: string;
  film?: string;
  unit: string;
  /** The rule's limits: one, or a window's two (`at_least` first). */
  sides: Rule['sides'];
  mode: Rule['evaluateAt'];
  /** Short hash of everything the verdict read: the rule's test and the inputs' values and tolerances. */
  inputs: string;
  read: RowInput[];
  waiver?: { id: string; expires: string; lapsed?: 'expired' | 'beyond-floor' };
}

/** Stores outcomes by inputs hash; counts what it had to evaluate. */
export interface OutcomeCache {
  get(key: string): Outcome | undefined;
  set(key: string, outcome: Outcome): void;
}

/** JSON with keys in code-point order, so equal values hash equally on every machine. */
export function canonicalJson(v: unknown): string {
  if (v === null || typeof v !== 'object') return JSON.stringify(v ?? null);
  if (Array.isArray(v)) return `[${v.map(canonicalJson).join(',')}]`;
  const o = v as Record<string, unknown>;
  return `{${Object.keys(o)
    .filter((k) => o[k] !== undefined)
    .sort(byCodePoint)
    .map((k) => `${JSON.stringify(k)}:${canonicalJson(o[k])}`)
    .join(',')}}`;
}

export function shortHash(text: string, chars = 12): string {
  return createHash('sha256').update(text).digest('hex').slice(0, chars);
}

/**
 * The hash of what a verdict reads: the rule's test (quantity, film step, comparison, limit,
 * mode), whether the rule selects the structure, the structure's shape facts and, from the
 * compiled plan, each input's SI value and tolerance bounds (or what is missing). Ids, titles,
 * positions and prose are left out: moving a value to another line, or rewording a rationale,
 * does not change the hash; changing a tolerance does.
 */
export function inputsHash(rule: Rule, s: Structure, plan: Plan | null): string {
  return shortHash(
    canonicalJson({
      // A one-sided rule hashes as it always has, so committed ledgers stay current; a window, a
      // yield requirement, a uniform band or a correlation add what they change.
      test: [rule.quantity, rule.film ?? null, ...rule.sides.flatMap((x) => [x.comparison, x.limit]), rule.evaluateAt, ...(rule.yield ? [rule.yield.required, rule.yield.confidence, rule.yield.maxSamples, rule.yield.seed] : [])],
      selects: plan !== null,
      shape: shapeOf(s, rule.film),
      plan:
        plan === null
          ? null
          : plan.status === 'ready'
            ? plan.params.map((p) => [p.name, p.value, p.low ?? null, p.high ?? null, ...(p.spread ? [p.spread] : [])])
            : plan.status === 'incomplete'
              ? { missing: plan.missing }
              : { na: plan.reason },
      ...(s.correlations.length ? { correlated: s.correlations.map((c) => [...c.inputs, c.coefficient]) } : {}),
    }),
  );
}

function outcomeOf(v: Verdict): Outcome {
  const o: Outcome = { status: v.status === 'waived' ? 'fail' : v.status, value: v.value, margin: v.margin };
  if (v.unbounded) o.unbounded = v.unbounded;
  if (v.nominal !== undefined) o.nominal = v.nominal;
  if (v.reason !== undefined) o.reason = v.reason;
  if (v.missing) o.missing = v.missing;
  return o;
}

function readOf(plan: Plan | null): RowInput[] {
  if (!plan || plan.status !== 'ready') return [];
  return plan.params.map((p) => ({
    name: p.name,
    written: p.written,
    ...(p.origin.type !== 'material-table' ? { at: `${p.origin.pos.file}:${p.origin.pos.line}` } : { material: p.origin.material }),
  }));
}

export interface EvaluatedRows {
  rows: VerdictRow[];
  /** Rule × structure pairs evaluated (not found in the cache). */
  evaluated: number;
}

/**
 * Every rule on every structure it selects, as rows sorted by rule then structure, reusing cached
 * outcomes by inputs hash. Pairs the rule does not select are left out; `waive` turns failures into
 * `waived` rows where a waiver holds.
 */
export function evaluateRows(h: Handbook, cache?: OutcomeCache, waive?: (row: VerdictRow) => VerdictRow): EvaluatedRows {
  const plans = new PlanCache();
  const rows: VerdictRow[] = [];
  let evaluated = 0;
  for (const rule of h.rules) {
    for (const s of h.structures) {
      if (!appliesTo(rule, s)) continue;
      const plan = plans.get(s, rule.quantity, rule.film);
      const key = inputsHash(rule, s, plan);
      let outcome = cache?.get(key);
      if (!outcome) {
        outcome = outcomeOf(evaluateRule(rule, s, plans));
        evaluated++;
        cache?.set(key, outcome);
      }
      const row: VerdictRow = {
        ...outcome,
        rule: rule.id,
        structure: s.id,
        verdict: outcome.status,
        severity: rule.severity,
        quantity: rule.quantity,
        ...(rule.film !== undefined ? { film: rule.film } : {}),
        unit: unitOf(rule, plan),
        sides: rule.sides,
        mode: rule.evaluateAt,
        inputs: key,
        read: readOf(plan),
      };
      rows.push(waive ? waive(row) : row);
    }
  }
  rows.sort((a, b) => byCodePoint(a.rule, b.rule) || byCodePoint(a.structure, b.structure));
  return { rows, evaluated };
}

function unitOf(rule: Rule, plan: Plan): string {
  if (plan.status === 'ready') return plan.steps[plan.steps.length - 1]!.def.unit;
  return QUANTITIES.get(rule.quantity)?.unit ?? '1';
}

/** `rule structure` — the key a verdict keeps across revisions. */
export function rowKey(r: { rule: string; structure: string }): string {
  return `${r.rule} ${r.structure}`;
}
