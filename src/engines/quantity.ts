// What an engine declares. A quantity is a named, sourced formula over SI numbers; the checker and
// the report read only these declarations, never a specific engine.
import type { ShapeFacts } from '../model/types.ts';

/** A result that has no finite value for this structure, with the reason shown to the reader. */
export interface NoValue {
  value: null;
  reason: string;
  /**
   * Set when the quantity is unbounded rather than undefined: `above` compares as +∞ (a collapse
   * margin with no capillary load), `below` as −∞. Left unset, the value does not exist (an
   * opening that closes before its bottom has no bottom CD) and any limit on it fails.
   */
  unbounded?: 'above' | 'below';
}

/** A value with a short note on how it was reached (which span governs, how its ends are held). */
export interface Noted {
  value: number;
  note: string;
  /** Data for a figure the report draws beside the step (engines never draw). */
  figure?: Figure;
}

/** Figures an engine can hand to the report, as plain data in SI. */
export type Figure = {
  type: 'profile-history';
  elongated: boolean;
  depth: number;
  /** Opening widths at slice centres (top to bottom) at successive times, and the bottom's depth. */
  frames: Array<{ time: number; widths: number[]; bottom: number }>;
  /** Depth range of a trapped void, if any. */
  void?: { from: number; to: number };
} | {
  /** Radial and hoop stress in the matrix against distance from a via's centre. */
  type: 'stress-profile';
  radius: number;
  points: Array<{ r: number; radial: number; hoop: number }>;
} | {
  /** Relative mobility change on a square grid around a via, channel along +x, with the keep-out circle. */
  type: 'mobility-map';
  channel: string;
  radius: number;
  keepOut: number;
  threshold: number;
  /** Half-width of the square, centred on the via. */
  extent: number;
  n: number;
  /** Row-major, top row first (y = +extent), null inside the via. */
  values: Array<number | null>;
};

export type Outcome = number | NoValue | Noted;

export function noted(value: number, note: string): Noted {
  return { value, note };
}

export function noValue(reason: string, unbounded?: 'above' | 'below'): NoValue {
  return unbounded ? { value: null, reason, unbounded } : { value: null, reason };
}

/** The shape facts a quantity may branch on, and the film step it is evaluated for. */
export interface Shape extends ShapeFacts {
  /** The film step a rule (or a per-step listing) selects, for quantities of one film step. */
  film?: string;
}

/**
 * One way of computing a quantity for a given shape. `inputs` maps the formula's argument names
 * to parameter paths (`geometry.cd`) or other quantities (`geometry.bottom_cd`).
 */
export interface Variant<A extends string = string> {
  /** Short label shown when a quantity has several variants, e.g. "round hole". */
  label?: string;
  inputs: Record<A, string>;
  /** TeX of the formula, in the symbols of `symbols`. */
  formula: string;
  /** TeX symbol for each argument. */
  symbols?: Partial<Record<NoInfer<A>, string>>;
  compute: (args: Record<A, number>) => Outcome;
  /**
   * Why one run costs far more than a closed form (a march in time), when it does: evaluations
   * that sample a plan by the thousand leave out the optional ones (a worst case's probability of
   * failure) for a plan with such a step, and say so.
   */
  costly?: string;
}

/**
 * Where a model holds: a range on one argument, or a condition over several. Inputs outside it
 * are still evaluated but flagged on the verdict page with `why`.
 */
export type ValidityCheck =
  | { arg: string; min?: number; max?: number; why: string }
  | { holds: (args: Record<string, number>) => boolean; why: string };

export interface QuantityDef {
  /** `engine.name`, snake_case. */
  name: string;
  title: string;
  /** SI unit of the value ("1" when dimensionless). */
  unit: string;
  /** TeX symbol of the result. */
  symbol: string;
  description: string;
  /** The published source the formula implements. */
  source: string;
  assumptions?: string[];
  validity?: ValidityCheck[];
  /**
   * For quantities of one film step: the steps a structure has. With one step the quantity keeps
   * its plain name; with several, each step's value is listed as `name[film]` and a rule picks a
   * step with its `film` field.
   */
  steps?: (shape: Shape) => string[];
  /** Which way is better; the report uses it for chart direction, never for verdicts. */
  better?: 'higher' | 'lower';
  /**
   * The input a verdict page sweeps to chart this quantity against (e.g. the height), as a
   * range of multiples of the structure's own value. The report runs the same plan at each point.
   */
  /** A second chart against another input (e.g. a signal against height as well as over time). */
  extraSweep?: NonNullable<QuantityDef['sweep']>;
  sweep?: {
    /** Chart another quantity's sweep instead (a fit residual shows the fitted curve). */
    of?: string;
    input: (shape: Shape) => string;
    from: number;
    to: number;
    /**
     * A second curve for comparison: the same plan with some inputs replaced by another input's
     * value or a constant (e.g. the reference feature's CD and vertical walls).
     */
    companion?: { label: string; replace: Record<string, string | number> };
    /** Show the swept input as another variable (e.g. depth as aspect ratio = depth/CD). */
    axis?: { label: string; unit: string; map: (x: number, inputs: Record<string, number>) => number };
    /** Measured points to draw over the curve, in the axis' variable and the quantity's unit. */
    overlay?: { label: string; points: (inputs: Record<string, number>) => Array<{ x: number; y: number }> };
  };
  /**
   * The way to compute it for a shape; or a reason it does not apply to that shape; or the shape
   * facts (such as `geometry.array`) the structure must state before it can be computed.
   */
  variant: (shape: Shape) => Variant | { notApplicable: string } | { incomplete: string[] };
}

export interface Engine {
  id: string;
  title: string;
  summary: string;
  quantities: QuantityDef[];
}

/** Helper that keeps argument names checked against the inputs' keys. */
export function variant<A extends string>(v: Variant<A>): Variant {
  return v as unknown as Variant;
}
