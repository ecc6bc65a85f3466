// The typed handbook: what loading produces and every later phase reads.
// All numbers are SI; no strings with units survive past loading.
import type { Diagnostic } from '../diagnostics/diagnostic.ts';

/** A place in a source file, 1-based line and column. */
export interface SourcePos {
  file: string;
  line: number;
  column: number;
}

/** Structure kinds. Openings are cut into the wafer; standing kinds rise from it. */
export const OPENING_KINDS = ['hole', 'trench', 'via'] as const;
export const STANDING_KINDS = ['pillar', 'cylinder', 'line'] as const;
export const KINDS = [...OPENING_KINDS, ...STANDING_KINDS] as const;
export type Kind = (typeof KINDS)[number];
export type ArrayLayout = 'hexagonal' | 'square' | 'lines';

export function isOpening(kind: Kind): boolean {
  return (OPENING_KINDS as readonly string[]).includes(kind);
}
/** Kinds whose section is long in one direction (a slot or a wall) rather than round. */
export function isElongated(kind: Kind): boolean {
  return kind === 'trench' || kind === 'line';
}

/** A numeric input of a structure: nominal value in SI with optional tolerance bounds. */
export interface Param {
  /** Dotted path, e.g. `geometry.cd` or `materials.body.youngs_modulus`. */
  name: string;
  value: number;
  /** Lower and upper bounds when the value carries a tolerance. */
  low?: number;
  high?: number;
  /** SI unit of `value` ("1" when dimensionless). */
  unit: string;
  /** The text as written in the handbook (or in the material table). */
  written: string;
  /** Where the value came from. */
  origin: ParamOrigin;
  /** How a toleranced value varies within its band when sampled: absent, the band is ±3σ of a
   * normal distribution; `uniform`, evenly spread over it (a structure's `variation:` says so). */
  spread?: 'uniform';
  /** The physical range the input's declaration allows (a CD above 0, an angle inside 0 … π), in SI. */
  range?: { min?: number; max?: number };
}

/** Two toleranced inputs of a structure that vary together (a CD and its wall from one litho step). */
export interface Correlation {
  inputs: [string, string];
  /** Correlation coefficient of the underlying normal deviates, −1 … 1. */
  coefficient: number;
  pos: SourcePos;
}

export type ParamOrigin =
  | { type: 'handbook'; pos: SourcePos }
  /** Not written: the documented default of an input its block leaves out (`pos` is the block). */
  | { type: 'default'; pos: SourcePos }
  | { type: 'material-table'; material: string; source: string; pos?: SourcePos };

export type SupportHold = 'pinned' | 'clamped';

/** Shape facts of a drying step (the numbers are params: `drying.surface_tension`, ...). */
export interface DryingShape {
  /** Material id of the rinse liquid, or `none` for drying without a liquid–vapour interface. */
  liquid: string;
  /** How many lateral support lattices tie the structures together (`drying.support_1` ...). */
  supportCount: number;
  /** How a support holds the structure between supports. */
  supportHold: SupportHold;
}

/** Shape facts of an etch step (its numbers are params: `etch.open_rate`, ...). */
export interface EtchShape {
  /** Measured (aspect ratio, rate) points: `etch.calibration_1_aspect_ratio`, `..._rate`, ... */
  calibrationPoints: number;
  /** Ion–neutral synergy parameters (`etch.ion_neutral_to_ion_ratio`, `etch.ion_angular_spread`). */
  ion?: { spread: boolean };
}

export type DepositionMethod = 'ald' | 'cvd' | 'pvd';

/** Shape facts of the film steps (their numbers are params: `deposition.<film>.thickness`, ...). */
export interface DepositionShape {
  films: Array<{ film: string; method: DepositionMethod }>;
}

export type ElectrodeSurface = 'inner' | 'outer' | 'bottom';

/** Shape facts of a storage cell (its numbers are params: `cell.bitline_capacitance`, ...). */
export interface CellShape {
  surfaces: ElectrodeSurface[];
}

export interface FillShape {
  method: 'conformal' | 'sticking-limited' | 'bottom-up';
}

/** The facts of a structure's shape that decide which formulas apply (never numbers: those are inputs). */
export interface ShapeFacts {
  kind: Kind;
  array?: ArrayLayout;
  drying?: DryingShape;
  etch?: EtchShape;
  deposition?: DepositionShape;
  fill?: FillShape;
  cell?: CellShape;
  /** A `via:` block is present (conductor and liner). */
  via?: true;
  /** An `isolation:` block is present. */
  isolation?: true;
  /** Wafer orientation, when a `wafer:` block gives it. */
  waferOrientation?: '001' | '111';
}

export interface Structure extends ShapeFacts {
  id: string;
  title: string;
  tags: string[];
  description?: string;
  /** Numeric inputs by dotted path. */
  params: Map<string, Param>;
  /** Material id used in each role (`body`, `fill`, ...). */
  materialRoles: Record<string, string>;
  /** Inputs that vary together when sampled (from `variation:`); empty when none are stated. */
  correlations: Correlation[];
  /** Two inputs whose plane the structure page maps for every blocking rule at once (`process_window:`). */
  processWindow?: [string, string];
  file: string;
  pos: SourcePos;
}

export type Comparison = 'at_least' | 'at_most';
export type EvaluateAt = 'nominal' | 'worst-case' | 'yield';
export type Severity = 'blocking' | 'advisory';

/** Which structures a rule (or a waiver) selects: all given criteria must hold; {} selects every structure. */
export interface Selector {
  kinds?: Kind[];
  /** Any of these tags. */
  tags?: string[];
  /** These ids. */
  structures?: string[];
}

export interface Rule {
  id: string;
  title: string;
  appliesTo: Selector;
  quantity: string;
  /** For quantities of one film step: which step (its film name). */
  film?: string;
  /**
   * The limits the value must meet: one side (`at_least` or `at_most`), or both, `at_least` first
   * (a window). Every side must hold for the rule to pass.
   */
  sides: RuleSide[];
  evaluateAt: EvaluateAt;
  /** For `evaluate_at: yield`: the passing fraction required and how it is sampled. */
  yield?: YieldRequirement;
  /** Two inputs whose plane the verdict page maps: where the rule passes, the others at nominal. */
  map?: [string, string];
  severity: Severity;
  rationale: string;
  references: string[];
  file: string;
  pos: SourcePos;
}

/** One limit of a rule, in the quantity's SI unit. */
export interface RuleSide {
  comparison: Comparison;
  limit: number;
  /** The limit as written. */
  written: string;
}

/** What a yield rule asks of sampling. */
export interface YieldRequirement {
  /** Fraction of the distribution of inputs that must meet the limit, 0 … 1 (exclusive). */
  required: number;
  /** As written (`99.7 %`). */
  written: string;
  /** Two-sided confidence with which the sequential stop decides, 0 … 1 (default 0.95). */
  confidence: number;
  /** Most samples drawn before the point estimate decides (default 16 384). */
  maxSamples: number;
  /** Seed of the shifted quasi-random sequence (default 1): the same seed, the same verdict. */
  seed: number;
}

/**
 * A recorded, approved exception to one rule for some structures, until a date: while it holds, a
 * failure it selects is `waived` rather than `fail`. It never changes any other verdict.
 */
export interface Waiver {
  id: string;
  /** The rule it excuses (an id of the handbook). */
  rule: string;
  /** Which structures: the `structures` list as `{ structures }`, or the `applies_to` selector. */
  appliesTo: Selector;
  /** How it was written, for the report's wording. */
  selectedBy: 'structures' | 'applies_to';
  /** Markdown. */
  reason: string;
  owner: string;
  approvedBy: string;
  /** Last day it holds, `YYYY-MM-DD` (UTC): it holds on that day and stops the day after. */
  expires: string;
  /** A limit the waived value must still meet (the rule's comparison, in the rule's SI unit). */
  stillWithin?: { comparison: Comparison; limit: number; written: string };
  file: string;
  pos: SourcePos;
}

export interface MaterialProperty {
  value: number;
  low?: number;
  high?: number;
  unit: string;
  written: string;
  source: string;
}

export interface Material {
  id: string;
  title: string;
  /** Property name (snake_case) to value. */
  properties: Record<string, MaterialProperty>;
  origin: 'built-in' | 'handbook';
  file?: string;
}

export interface HandbookMeta {
  title: string;
  organisation?: string;
  summary?: string;
  /** Where the team publishes the report and keeps the repository, for links in summaries and pages. */
  links?: {
    /** Base URL of the published report. */
    report?: string;
    /** A commit's page on the team's repository host, with `{commit}` where the commit id goes. */
    commit?: string;
  };
}

/**
 * What loading needs to know of the engines' quantities: their names, units and titles, and which
 * are quantities of one film step. The pipeline hands the engines' registry in, so the model
 * imports no engine.
 */
export interface QuantityCatalogue {
  get(name: string): { title: string; unit: string; steps?: unknown } | undefined;
  keys(): IterableIterator<string>;
}

export interface Handbook {
  root: string;
  meta: HandbookMeta;
  structures: Structure[];
  rules: Rule[];
  /** From `waivers/` (optional: empty without it), sorted by id. */
  waivers: Waiver[];
  materials: Map<string, Material>;
  /** What loading left out or doubted without failing (files not loaded, ...), for every command to show. */
  warnings: Diagnostic[];
}
