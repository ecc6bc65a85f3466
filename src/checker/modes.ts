// Evaluation modes: how a rule's plan is evaluated against its limit. A mode takes the plan and the
// rule and returns the point the verdict is decided at (its derivation is shown), whether it
// passes, and a tagged result with what the mode found; the report formats that result with one
// template partial per mode (`templates/_includes/mode-<kind>.njk`). Adding a mode is one entry
// here, its result type and its partial.
import type { Comparison, EvaluateAt, Rule, Structure } from '../model/types.ts';
import { comparable, costlyStep, decidingSide, MAX_CORNER_INPUTS, meetsAll, nominalPoint, sampleYield, tolerancedInputs, worstCorner, type Point, type ReadyPlan, type Side, type YieldEstimate } from './excursions.ts';

/** One input at the end of its tolerance that decides a worst case. */
export interface CornerNote {
  name: string;
  side: 'low' | 'high';
  value: number;
}

/** The chance that a structure evaluated at its worst corner fails, from sampling its inputs. */
export interface FailureEstimate {
  probability: number;
  low: number;
  high: number;
  samples: number;
  confidence: number;
  seed: number;
}

export type ModeResult =
  | { kind: 'nominal' }
  | {
      kind: 'worst-case';
      /** Tolerance corners evaluated (2^n; 1 when no input carries a tolerance). */
      corners: number;
      /** The toleranced inputs that decide the worst corner, at the end used. */
      worstCorner: CornerNote[];
      /** How likely the structure is to fail the limit, its inputs sampled (absent without tolerances). */
      failure?: FailureEstimate;
      /** Why the probability of failure was not sampled, when a step is too costly to run a thousand times. */
      failureNotSampled?: string;
      /** For a rule with two sides (a window): the worst corner's value against each side. */
      bySide?: Array<{ comparison: Comparison; limit: number; value: number | null }>;
    }
  | ({
      kind: 'yield';
      /** The passing fraction required. */
      required: number;
      requiredWritten: string;
      /** The interval decided before the maximum (false: the point estimate decided at the maximum). */
      decided: boolean;
      maxSamples: number;
      seed: number;
    } & YieldEstimate);

export interface ModeOutcome {
  nominal: Point;
  /** The point whose derivation the verdict shows. */
  decisive: Point;
  /** Set when the mode decides pass or fail itself; otherwise the decisive value against the limits decides. */
  pass?: boolean;
  /** Which of the rule's sides decides (the one the value comes closest to failing). */
  side: number;
  result: ModeResult;
}

/** What the caller asks of every evaluation of a run. */
export interface ModeContext {
  /**
   * Work out the details a reader asks for beyond the verdict: a worst case's probability of
   * failure, every input's sensitivity and the values that would pass (the report, `explain` and
   * `check --json`; a plain check leaves them out for speed).
   */
  detail: boolean;
}

export interface EvaluationMode {
  readonly id: EvaluateAt;
  /** Why this plan cannot be evaluated in this mode (the verdict is then incomplete), if it cannot. */
  refuse?(plan: ReadyPlan): string | undefined;
  /** What outcomes of this mode depend on beyond the plan, so rules that ask the same share one. */
  key(rule: Rule): string;
  evaluate(plan: ReadyPlan, rule: Rule, structure: Structure, ctx: ModeContext): ModeOutcome;
}

/** Samples behind the probability of failure of a worst-case verdict, and its seed. */
export const FAILURE_SAMPLES = 512;
const FAILURE_SEED = 1;
const FAILURE_CONFIDENCE = 0.95;

const nominal: EvaluationMode = {
  id: 'nominal',
  key: () => '',
  evaluate(plan, rule) {
    const p = nominalPoint(plan);
    return { nominal: p, decisive: p, side: decidingSide(comparable(p), rule.sides), result: { kind: 'nominal' } };
  },
};

const worstCase: EvaluationMode = {
  id: 'worst-case',
  refuse(plan) {
    const n = tolerancedInputs(plan).length;
    return n > MAX_CORNER_INPUTS ? `${n} toleranced inputs are more than a corner sweep covers (${MAX_CORNER_INPUTS}); evaluate at nominal or drop tolerances that do not matter` : undefined;
  },
  key: (rule) => sidesKey(rule),
  evaluate(plan, rule, structure, ctx) {
    const p = nominalPoint(plan);
    const { decisive, corners, side, worstBySide } = worstCorner(plan, p, rule.sides);
    const worstCornerNotes = plan.params.flatMap((param, i): CornerNote[] => {
      const side = decisive.sides[i];
      return side === 'low' || side === 'high' ? [{ name: param.name, side, value: decisive.inputs[i]! }] : [];
    });
    const varies = tolerancedInputs(plan).length > 0;
    const costly = costlyStep(plan);
    const failure = ctx.detail && varies && !costly ? failureOf(plan, rule.sides, structure) : undefined;
    const notSampled = ctx.detail && varies ? costly : undefined;
    const bySide = rule.sides.length > 1 ? rule.sides.map((s, k) => ({ comparison: s.comparison, limit: s.limit, value: Number.isFinite(worstBySide[k]!) ? worstBySide[k]! : null })) : undefined;
    return {
      nominal: p,
      decisive,
      side,
      result: { kind: 'worst-case', corners, worstCorner: worstCornerNotes, ...(failure ? { failure } : {}), ...(notSampled ? { failureNotSampled: notSampled } : {}), ...(bySide ? { bySide } : {}) },
    };
  },
};

/** What evaluations of a rule's sides share: its limits in order. */
function sidesKey(rule: Rule): string {
  return rule.sides.map((s) => `${s.comparison} ${s.limit}`).join(' ');
}

function failureOf(plan: ReadyPlan, sides: readonly Side[], s: Structure): FailureEstimate {
  const y = sampleYield(plan, { sides, correlations: s.correlations, seed: FAILURE_SEED, confidence: FAILURE_CONFIDENCE, maxSamples: FAILURE_SAMPLES });
  return { probability: 1 - y.estimate, low: 1 - y.high, high: 1 - y.low, samples: y.samples, confidence: y.confidence, seed: FAILURE_SEED };
}

const yieldMode: EvaluationMode = {
  id: 'yield',
  key: (rule) => {
    const y = rule.yield!;
    return `${sidesKey(rule)} ${y.required} ${y.confidence} ${y.maxSamples} ${y.seed}`;
  },
  evaluate(plan, rule, structure) {
    const y = rule.yield;
    // Loading requires required_yield with evaluate_at: yield.
    if (!y) throw new Error(`${rule.id} is evaluated for yield without a required yield`);
    const p = nominalPoint(plan);
    const side = decidingSide(comparable(p), rule.sides);
    if (tolerancedInputs(plan).length === 0) {
      // Nothing varies: the structure either always passes or never does.
      const ok = meetsAll(comparable(p), rule.sides);
      const e = ok ? 1 : 0;
      return {
        nominal: p,
        decisive: p,
        side,
        pass: e >= y.required,
        result: { kind: 'yield', required: y.required, requiredWritten: y.written, decided: true, maxSamples: y.maxSamples, seed: y.seed, samples: 1, failures: ok ? 0 : 1, estimate: e, low: e, high: e, confidence: y.confidence },
      };
    }
    const r = sampleYield(plan, { sides: rule.sides, correlations: structure.correlations, seed: y.seed, confidence: y.confidence, maxSamples: y.maxSamples, required: y.required });
    return {
      nominal: p,
      decisive: p,
      side,
      pass: r.decided ? r.low >= y.required : r.estimate >= y.required,
      result: { kind: 'yield', required: y.required, requiredWritten: y.written, maxSamples: y.maxSamples, seed: y.seed, ...r },
    };
  },
};

export const MODES: Record<EvaluateAt, EvaluationMode> = { nominal, 'worst-case': worstCase, yield: yieldMode };
