// Films that line deep openings: does each film step reach the bottom, and with what exposure?
// The models are in ./models.ts (where a reacting species arrives, from the reactive-wall Clausing
// problem; Gordon's ALD exposure along the opening's own profile). A structure lists its film steps
// under `deposition:`; a quantity of one step takes the step a rule names with `film`, or the only
// step there is. Each step lines the opening the steps before it left: narrowed at every depth by
// their local thickness, their thickness on the top times their coverage there.
import { isElongated, isOpening, type DepositionMethod } from '../../model/types.ts';
import { noted, noValue, variant, type Engine, type NoValue, type Outcome, type QuantityDef, type Shape, type Variant } from '../quantity.ts';
import { bottomCd, cavity } from '../geometry/index.ts';
import { MARCH_BANDS, marchFill, RESOLVE_GROWTH, SEAM_WIDTH_DEFAULT, type FillMethod, type FillResult } from './fill.ts';
import { aldExposureFactor, aldFlatExposure, aldSaturatedDepth, arrival, aspectRatioOfFactor, depthOf, straightOpening, wallCoverageAt, widthAt, type Opening } from './models.ts';
import { memoTable } from '../memo.ts';

const GORDON =
  'Gordon, Hausmann, Kim & Shepard, Chem. Vap. Deposition 9, 73 (2003): P·t = S·√(2πmk_BT)·(1 + 19a/4 + 3a²/2); trenches with a = L/(2w) (Cremers, Puurunen & Dendooven, Appl. Phys. Rev. 6, 021302 (2019)); along a taper or a lined profile, Gordon’s derivation (a saturation front fed through the resistance above it) carried out with the local cross-section [derived], a the equivalent aspect ratio';
const ARRIVAL =
  'Reactive-wall form of Clausing’s integral equation (Clausing, Ann. Phys. 12, 961 (1932)): A_e·G_e = T_e + Σ_f (1 − s)·A_f·F_fe·G_f on wall bands and bottom rings, with the exact view factors of coaxial discs (Howell, Mengüç & Siegel, Thermal Radiation Heat Transfer, catalogue) or parallel strips (Hottel’s crossed strings); held to a test-particle Monte Carlo (Davis, J. Appl. Phys. 31, 1169 (1960)) over s = 1e-4…0.3 and aspect ratios 1…50';

type Film = { film: string; method: DepositionMethod };

/** The steps of the methods a quantity asks for (all of them without a filter). */
function stepsOf(films: readonly Film[], methods?: DepositionMethod[]): Film[] {
  return films.filter((f) => !methods || methods.includes(f.method));
}

/** The film step a quantity speaks of, or why it cannot tell. */
function stepOf(shape: Shape, methods?: DepositionMethod[]): { film: string; method: DepositionMethod } | { notApplicable: string } | { incomplete: string[] } {
  if (!shape.deposition) return { incomplete: ['deposition'] };
  if (shape.film !== undefined) {
    const f = shape.deposition.films.find((x) => x.film === shape.film);
    if (!f) return { incomplete: [`deposition.${shape.film}`] };
    if (methods && !methods.includes(f.method)) return { notApplicable: `film step "${shape.film}" is ${f.method}, not ${methods.join(' or ')}` };
    return f;
  }
  const films = stepsOf(shape.deposition.films, methods);
  if (films.length === 1) return films[0]!;
  // The format asks for at least one step, so only a method filter leaves none.
  if (films.length === 0) return { notApplicable: `no ${methods!.join(' or ')} film step` };
  // Several steps and no choice: the rule must name one (incomplete, never a guess).
  return { incomplete: [`film (one of ${films.map((f) => f.film).join(', ')})`] };
}

// ── Film steps: recipe, coverage, the opening they leave ─────────────────────────────────────

/** What decides where a step's film goes: its thickness on the top, and its coverage. */
interface Recipe {
  method: DepositionMethod;
  thickness: number;
  /** CVD: sticking probability of the growth species; PVD: 1 (line of sight, no re-emission). */
  sticking?: number;
  /** ALD: the exposure over the flat-surface dose S·√(2πmk_BT). */
  doses?: number;
}

/** Inputs of a step's recipe, by short name (an earlier step's take prior_i_ in front). */
function recipeInputs(f: Film): Record<string, string> {
  const at = (name: string) => `deposition.${f.film}.${name}`;
  if (f.method === 'ald') return { exposure: at('exposure'), molar: at('molar_mass'), temperature: at('temperature'), sites: at('site_density') };
  if (f.method === 'cvd') return { sticking: at('sticking_probability') };
  return {};
}

/**
 * The films before `film` in the list (all of them without one), with the inputs that describe
 * them (step i's named prior_i, prior_i_sticking, …) and their TeX symbols (t₁, s₁, (P t)₁, …).
 */
function priorFilms(shape: Shape, film?: string): { films: Film[]; inputs: Record<string, string>; symbols: Record<string, string> } {
  const all = shape.deposition?.films ?? [];
  const upTo = film === undefined ? all.length : Math.max(0, all.findIndex((f) => f.film === film));
  const films = all.slice(0, upTo);
  const inputs: Record<string, string> = {};
  const symbols: Record<string, string> = {};
  films.forEach((f, i) => {
    const n = i + 1;
    inputs[`prior_${n}`] = `deposition.${f.film}.thickness`;
    symbols[`prior_${n}`] = `t_{${n}}`;
    for (const [name, input] of Object.entries(recipeInputs(f))) {
      inputs[`prior_${n}_${name}`] = input;
      // A symbol of two letters (P t) takes brackets before its subscript.
      const symbol = SYMBOLS[name]!;
      symbols[`prior_${n}_${name}`] = symbol.includes(' ') ? `(${symbol})_{${n}}` : `${symbol}_{${n}}`;
    }
  });
  return { films, inputs, symbols };
}

function recipeOf(a: Record<string, number>, method: DepositionMethod, key: string, thickness: number): Recipe {
  if (method === 'ald') return { method, thickness, doses: a[`${key}exposure`]! / aldFlatExposure(a[`${key}sites`]!, a[`${key}molar`]!, a[`${key}temperature`]!) };
  // Stryker disable next-line ConditionalExpression: an undefined sticking makes no surface re-emit in the band solve (NaN > 0 is false), as 1 does
  return { method, thickness, sticking: method === 'cvd' ? a[`${key}sticking`]! : 1 };
}

/** Where a step's film goes: its coverage along the wall and on the bottom, and the depths it changes at. */
interface Coverage {
  wall: (z: number) => number;
  bottom: number;
  /** Depths to sample the lined profile at. */
  at: number[];
}

/**
 * ALD: the full thickness down to the depth the dose saturates (Gordon's front), nothing below.
 * CVD: the arriving flux with the growth species' sticking; PVD: the same with sticking 1 (line of
 * sight, no re-emission).
 */
function coverageOf(o: Opening, r: Recipe): Coverage {
  if (r.method === 'ald') {
    const depth = depthOf(o);
    const reach = aldSaturatedDepth(o, r.doses!);
    // The film ends at the front: sample the profile on both sides of it (at the bottom, both
    // samples are the bottom itself, already in the profile).
    return { wall: (z) => (z <= reach ? 1 : 0), bottom: reach >= depth ? 1 : 0, at: [reach, Math.min(depth, reach + 1e-6 * depth)] };
  }
  const a = arrival(o, r.sticking!);
  return { wall: (z) => wallCoverageAt(a, z), bottom: a.bottom, at: a.wall.map((_, i) => (a.z[i]! + a.z[i + 1]!) / 2) };
}

/** The opening a film leaves: narrowed on each wall by its local thickness. */
function lined(o: Opening, r: Recipe, c: Coverage): Opening {
  const z = [...new Set([...o.z, ...c.at])].sort((x, y) => x - y);
  return { elongated: o.elongated, z, width: z.map((v) => widthAt(o, v) - 2 * r.thickness * c.wall(v)) };
}

const nmText = (m: number) => `${Number((m * 1e9).toPrecision(3))} nm`;

/** Where a lined opening has closed (no width left), described for the reader, or null. */
function closure(before: Opening, after: Opening): string | null {
  const tiny = 1e-9 * before.width[0]!;
  // Stryker disable next-line EqualityOperator: a width of exactly one billionth of the mouth's, either way
  const i = after.width.findIndex((w) => !(w > tiny));
  if (i < 0) return null;
  const z = after.z[i]!;
  const was = nmText(widthAt(before, z));
  if (i === 0) return `its mouth (${was} wide there): it pinches off, closing over the opening below`;
  if (i === after.z.length - 1) return `its bottom (${was} wide there): it fills the opening where it is narrower than twice the film`;
  return `${nmText(z)} below the top (${was} wide there): it pinches off, closing over the opening below`;
}

/** The opening of the geometry: the hole, via or trench itself, or the inside of a hollow cylinder. */
function geometryInputs(shape: Shape): Record<string, string> | null {
  if (isOpening(shape.kind)) return { depth: 'geometry.depth', cd: 'geometry.cd', bottom: 'geometry.bottom_cd' };
  if (shape.kind === 'cylinder') return { height: 'geometry.height', cd: 'geometry.cd', bottom: 'geometry.bottom_cd', wall: 'geometry.wall' };
  return null;
}

/**
 * The straight opening of the geometry, or why there is none: the taper may close it (a re-entrant
 * cup narrows to nothing at its base).
 */
function baseOpening(a: Record<string, number>, elongated: boolean): Opening | NoValue {
  let depth = a.depth;
  let [top, bottom] = [a.cd!, a.bottom!];
  if (depth === undefined) {
    // Inside a cup: the cavity of the geometry engine (its floor one wall above the base).
    const c = cavity(a.cd!, a.bottom!, a.height!, a.wall!);
    if ('reason' in c) return c;
    [depth, top, bottom] = [c.depth, c.top, c.bottom];
  }
  if (!(Math.min(top, bottom) > 0)) return noValue('the opening closes before its bottom (its narrowest width is not above zero), so there is nothing below to coat');
  if (!(depth > 0)) return noValue('the opening has no depth left to coat');
  return straightOpening(elongated, depth, top, bottom);
}

/** The opening the earlier steps leave for the next one, or why they close it. */
function linedByPriors(o: Opening, films: Film[], a: Record<string, number>): Opening | NoValue {
  let open = o;
  for (const [i, f] of films.entries()) {
    const r = recipeOf(a, f.method, `prior_${i + 1}_`, a[`prior_${i + 1}`]!);
    const next = lined(open, r, coverageOf(open, r));
    const shut = closure(open, next);
    if (shut) return noValue(`the earlier film step ${f.film} (${nmText(r.thickness)} on the top) closes the opening at ${shut}, so later films have nowhere to go`);
    open = next;
  }
  return open;
}

/** A film step in the opening left for it, with its coverage there. */
interface Lining {
  opening: Opening;
  recipe: Recipe;
  coverage: Coverage;
}

/**
 * The opening a step lines and where its film goes, or why there is nothing to line: the taper or
 * the earlier films may close it (two 10 nm films fill a 20 nm gap), or this film itself closes it
 * (then it is no longer a lined opening, and coverage, exposure and margin have no value).
 */
function liningOf(a: Record<string, number>, elongated: boolean, films: Film[], own: Film): Lining | NoValue {
  const base = baseOpening(a, elongated);
  if ('reason' in base) return base;
  const opening = linedByPriors(base, films, a);
  if ('reason' in opening) return opening;
  const recipe = recipeOf(a, own.method, '', a.own!);
  const coverage = coverageOf(opening, recipe);
  const shut = closure(opening, lined(opening, recipe, coverage));
  if (shut) return noValue(`this film (${nmText(recipe.thickness)} on each wall) closes the opening at ${shut}; the models of a lined opening do not apply`);
  return { opening, recipe, coverage };
}

const SYMBOLS: Record<string, string> = {
  depth: 'L',
  own: 't',
  height: 'H',
  cd: '\\mathrm{CD}',
  bottom: '\\mathrm{CD}_b',
  wall: 't_w',
  exposure: 'P t',
  molar: 'M',
  temperature: 'T',
  sites: 'S',
  sticking: 's',
};

/** A quantity of one film step. */
function stepQuantity(
  def: Omit<QuantityDef, 'variant' | 'steps'>,
  methods: DepositionMethod[] | undefined,
  formula: (method: DepositionMethod, elongated: boolean) => string,
  compute: (l: Lining, a: Record<string, number>) => Outcome,
): QuantityDef {
  return {
    ...def,
    // Stryker disable next-line ArrayDeclaration: without a deposition block any film named is reported as the missing block
    steps: (shape) => (shape.deposition ? stepsOf(shape.deposition.films, methods).map((f) => f.film) : []),
    variant: (shape): Variant | { notApplicable: string } | { incomplete: string[] } => {
      const geometry = geometryInputs(shape);
      if (!geometry) return { notApplicable: 'films line openings (hole, trench, via) and the inside of hollow cylinders' };
      const step = stepOf(shape, methods);
      if (!('film' in step)) return step;
      const priors = priorFilms(shape, step.film);
      const elongated = isElongated(shape.kind);
      return variant({
        label: `${step.film} (${step.method})`,
        inputs: { ...geometry, ...priors.inputs, own: `deposition.${step.film}.thickness`, ...recipeInputs(step) },
        symbols: { ...SYMBOLS, ...priors.symbols },
        formula: formula(step.method, elongated),
        compute: (a: Record<string, number>) => {
          const l = liningOf(a, elongated, priors.films, step);
          return 'reason' in l ? l : compute(l, a);
        },
      });
    },
  };
}

const OPENING_ASSUMPTION =
  'The opening follows its straight taper from the top CD to the bottom CD (for a hollow cylinder, its inside); each earlier film step narrows it at every depth by its local thickness: its thickness on the top times its coverage there (ALD: the full thickness down to the depth its dose saturates).';

/** Exposure to saturate the lined opening, over the flat dose, and the equivalent aspect ratio it corresponds to. */
function requiredDoses(l: Lining): { doses: number; aspect: number } {
  const doses = aldExposureFactor(l.opening);
  return { doses, aspect: aspectRatioOfFactor(doses) };
}

const stepCoverage = stepQuantity(
  {
    name: 'deposition.step_coverage',
    title: 'Step coverage',
    unit: '1',
    symbol: 't_{bottom}/t_{top}',
    description:
      'Film thickness averaged over the bottom over the thickness on the open top surface, for one film step: 1 for an ALD step whose dose saturates the whole opening (0 when it does not reach the bottom); for CVD and PVD the flux arriving on the bottom over that on the top surface (the same sticking everywhere, so thickness follows arrival).',
    source: `ALD: ${GORDON}; CVD and PVD (sticking 1, line of sight): ${ARRIVAL}`,
    assumptions: [
      OPENING_ASSUMPTION,
      'CVD and PVD: free-molecular transport, diffuse re-emission of what does not react, the same sticking probability on walls and bottom (PVD: 1), quasi-steady (the film does not change the opening during the step). Walls in bands half the local width tall (finer at the mouth; Richardson-extrapolated), bottom in four rings: within 0.1 % of Cole’s tube table and of the slot solution for s = 0, and of the Monte Carlo within its error plus 1 % on the bottom.',
      'The opening is taken as convex (every surface sees every other): exact for straight openings, and for profiles lined by films that thin with depth.',
    ],
    better: 'higher',
    // A cylinder's film lines its inside over its height; openings have a depth.
    sweep: { input: (shape) => (shape.kind === 'cylinder' ? 'geometry.height' : 'geometry.depth'), from: 0.25, to: 2, axis: { label: 'aspect ratio', unit: '1', map: (depth, p) => depth / p['geometry.cd']! } },
  },
  undefined,
  (method, elongated) =>
    method === 'ald'
      ? '\\frac{t_b}{t_t} = \\begin{cases} 1 & P t \\ge (P t)_{min} \\\\ 0 & \\text{otherwise} \\end{cases}'
      : method === 'cvd'
        ? '\\frac{t_b}{t_t} = G_b,\\;\\; A_e G_e = T_e + (1 - s)\\sum_f A_f F_{fe}\\, G_f \\text{ over wall bands and bottom rings}'
        : `\\frac{t_b}{t_t} = \\frac{A_0 F_{0b}}{A_b}\\;\\text{(line of sight, } s = 1\\text{)}${elongated ? ',\\; \\sqrt{1 + A^2} - A \\text{ for vertical walls}' : ',\\; \\frac{(2 + X^2) - X\\sqrt{X^2 + 4}}{2},\\; X = 2L/d \\text{ for vertical walls}'}`,
  (l) => {
    if (l.recipe.method !== 'ald') return l.coverage.bottom;
    if (l.coverage.bottom === 1) return 1;
    return noted(0, `the dose saturates only the top ${((aldSaturatedDepth(l.opening, l.recipe.doses!) / depthOf(l.opening)) * 100).toFixed(0)} % of the depth`);
  },
);

// Stryker disable next-line ArrayDeclaration: prose shown on the pages (the report's tests read it)
const ALD_ASSUMPTIONS = [
  'Initial sticking probability 1 until the surface saturates (a lower one raises the exposure roughly as its inverse); free-molecular transport; a sharp saturation front.',
  OPENING_ASSUMPTION,
  'Along a taper the exposure follows the local cross-section (Gordon’s front derivation, derived; no published tapered form was found): Knudsen’s resistance of each depth’s cross-section plus the orifice’s, shared between the mouth and the front at their own areas. It reduces to Gordon’s formula for vertical holes and to Cremers’ L/(2w) for vertical trenches; against a test-particle Monte Carlo of the same front the taper’s effect is within 5 %, and Gordon’s formula itself sits 5–9 % below the front with exact transmissions (aspect ratio 10–30). For trenches that mapping (a tube of hydraulic diameter 2w) understates how well a slot conducts (a test-particle Monte Carlo of Gordon’s front gives less exposure), so for trenches the value is an upper bound.',
];

/** Resistance from the mouth to depth z: the orifice shared between the mouth and the front, plus Knudsen's. */
const RESISTANCE_TEX = 'R(z) = \\tfrac{1}{2}\\left(\\frac{1}{A_0} + \\frac{1}{A(z)}\\right) + \\int_0^z \\frac{3P}{16A^2}\\,dz\'';

const GORDON_TEX = `S\\sqrt{2\\pi m k_B T}\\left[\\int_0^L P R\\,dz + A_b R(L)\\right] = S\\sqrt{2\\pi m k_B T}\\left(1 + \\tfrac{19}{4}a + \\tfrac{3}{2}a^2\\right),\\;\\; ${RESISTANCE_TEX}`;

const aldRequired = stepQuantity(
  {
    name: 'deposition.ald_required_exposure',
    title: 'ALD exposure needed to saturate the opening',
    unit: 'Pa*s',
    symbol: '(P t)_{min}',
    description: 'Smallest precursor exposure (partial pressure × pulse time) that saturates the whole depth of the opening, along its taper.',
    source: GORDON,
    assumptions: ALD_ASSUMPTIONS,
    better: 'lower',
  },
  ['ald'],
  () => `(P t)_{min} = ${GORDON_TEX},\\;\\; m = M/N_A`,
  (l, a) => {
    const r = requiredDoses(l);
    return noted(aldFlatExposure(a.sites!, a.molar!, a.temperature!) * r.doses, `equivalent aspect ratio ${r.aspect.toPrecision(3)}`);
  },
);

const aldMargin = stepQuantity(
  {
    name: 'deposition.ald_exposure_margin',
    title: 'ALD exposure margin',
    unit: '1',
    symbol: '\\frac{P t}{(P t)_{min}}',
    description: 'Exposure the recipe gives over the exposure needed to saturate the opening: at least 1 for a film that reaches the bottom.',
    source: GORDON,
    assumptions: ALD_ASSUMPTIONS,
    better: 'higher',
    sweep: {
      input: (shape) => (shape.kind === 'cylinder' ? 'geometry.height' : 'geometry.depth'),
      from: 0.25,
      to: 2,
      axis: {
        label: 'aspect ratio',
        unit: '1',
        // Depth over top CD; inside a cup, (H − t_w)/(CD − 2t_w).
        map: (x, p) => (p['geometry.wall'] !== undefined ? (x - p['geometry.wall']) / (p['geometry.cd']! - 2 * p['geometry.wall']) : x / p['geometry.cd']!),
      },
    },
  },
  ['ald'],
  () => `\\frac{P t}{(P t)_{min}},\\;\\; (P t)_{min} = ${GORDON_TEX}`,
  (l) => l.recipe.doses! / requiredDoses(l).doses,
);

const coatedDepth = stepQuantity(
  {
    name: 'deposition.ald_coated_depth_fraction',
    title: 'Depth fraction an ALD dose saturates',
    unit: '1',
    symbol: 'z_{sat}/L',
    description: 'Fraction of the opening’s depth that the given ALD exposure saturates: the depth at which the opening, cut off there, would need just this exposure (1: down to the bottom).',
    source: GORDON,
    assumptions: ALD_ASSUMPTIONS,
    better: 'higher',
  },
  ['ald'],
  () => `\\frac{z_{sat}}{L}:\\;\\; \\int_0^{z_{sat}} P R\\,dz + A(z_{sat}) R(z_{sat}) = \\frac{P t}{S\\sqrt{2\\pi m k_B T}},\\;\\; ${RESISTANCE_TEX}`,
  (l) => aldSaturatedDepth(l.opening, l.recipe.doses!) / depthOf(l.opening),
);

// ── Gap fill ──────────────────────────────────────────────────────────────────────────────────

const MARCH =
  'Profile marched in time with the local growth rate (conformal; sticking-limited from the reactive-wall Clausing problem re-solved in the narrowing opening; bottom-up); a slice closes when its walls meet, and open slices cut off below a closed one are trapped: a void when at least the seam width wide';

function fillInputs(method: FillMethod, priors: Record<string, string>): Record<string, string> {
  const inputs: Record<string, string> = { cd: 'geometry.cd', depth: 'geometry.depth', angle: 'geometry.sidewall_angle', seam: 'fill.seam_width', ...priors };
  if (method === 'sticking-limited') inputs.sticking = 'fill.sticking_probability';
  if (method === 'bottom-up') inputs.ratio = 'fill.bottom_up_ratio';
  return inputs;
}

const fills = memoTable<string, FillResult | NoValue>(64);

/** March the fill of the opening described by the inputs (memoised: several quantities share it). */
function fillOf(shape: Shape, method: FillMethod, a: Record<string, number>, depth = a.depth!): FillResult | NoValue {
  return fills.get(JSON.stringify([shape.kind, method, shape.deposition?.films, a, depth]), () => marchOpening(shape, method, a, depth));
}

function marchOpening(shape: Shape, method: FillMethod, a: Record<string, number>, depth: number): FillResult | NoValue {
  const elongated = isElongated(shape.kind);
  const bottom = bottomCd(a.cd!, depth, a.angle!, true);
  // Stryker disable next-line EqualityOperator: a V closing exactly at its bottom, which the angle's rounding never gives
  const base = bottom > 0 ? straightOpening(elongated, depth, a.cd!, bottom) : noValue('the opening closes before its bottom (its taper): there is nothing to fill below that');
  const opening = 'reason' in base ? base : linedByPriors(base, priorFilms(shape).films, a);
  const march =
    'reason' in opening
      ? opening
      : marchFill({
          opening,
          method,
          seamWidth: a.seam!,
          sticking: a.sticking,
          ratio: a.ratio,
        });
  // Stryker disable next-line ConditionalExpression: the march's step limit is a safety net no test or handbook reaches (see fill.ts)
  return 'reason' in march || march.converged ? march : noValue('the fill march did not close within its step limit');
}

function fillQuantity(def: Omit<QuantityDef, 'variant'>, formula: string, pick: (r: FillResult, a: Record<string, number>, fill: (depth: number) => FillResult | NoValue) => Outcome): QuantityDef {
  return {
    ...def,
    variant: (shape) => {
      if (!isOpening(shape.kind)) return { notApplicable: 'gap fill concerns openings (hole, trench, via)' };
      if (!shape.fill) return { incomplete: ['fill.method'] };
      const method = shape.fill.method;
      const priors = priorFilms(shape);
      return variant({
        label: `${shape.kind}, ${method} fill`,
        costly: 'it marches the fill in time, up to a few tenths of a second a run',
        inputs: fillInputs(method, priors.inputs),
        symbols: { cd: '\\mathrm{CD}', depth: 'D', angle: '\\theta', seam: 'w_{seam}', sticking: 's', ratio: 'R_b', ...priors.symbols },
        formula,
        compute: (a: Record<string, number>) => {
          const r = fillOf(shape, method, a);
          return 'reason' in r ? r : pick(r, a, (depth) => fillOf(shape, method, a, depth));
        },
      });
    },
  };
}

const FILL_ASSUMPTIONS = [
  `Straight sidewalls; growth normal to the wall taken as horizontal; 200 slices over the depth. Earlier film steps narrow the opening by their local thickness (thickness on the top times coverage at that depth). A trapped gap narrower than the seam width (fill.seam_width; ${SEAM_WIDTH_DEFAULT * 1e9} nm, a few atomic layers, unless the structure says otherwise) closes as a seam, not a void; fill.trapped_width reports the widest trapped gap either way.`,
  `Sticking-limited growth: the flux arriving on the walls and the bottom (reactive-wall Clausing problem on ${MARCH_BANDS} wall bands), quasi-steady, solved again after every ${RESOLVE_GROWTH * 100} % of the top width of wall growth as the opening narrows.`,
];

const voidHeight = fillQuantity(
  {
    name: 'fill.void_height',
    title: 'Void height',
    unit: 'm',
    symbol: 'h_{void}',
    description: 'Height of the void the fill traps below the point where the opening first pinches off: 0 when the fill closes from the bottom up.',
    source: MARCH,
    assumptions: FILL_ASSUMPTIONS,
    better: 'lower',
    sweep: { input: () => 'geometry.depth', from: 0.25, to: 1.5, axis: { label: 'aspect ratio', unit: '1', map: (depth, p) => depth / p['geometry.cd']! } },
  },
  'h_{void} = z_{bottom,\\,open} - z_{pinch}',
  (r, a) => ({
    value: r.voidHeight,
    note:
      r.voidHeight > 0
        ? `pinched off ${(r.closureDepth * 1e9).toFixed(0)} nm below the top, trapping an opening up to ${(r.voidWidth * 1e9).toFixed(1)} nm wide`
        : r.seamLength > 0
          ? `no void: the walls meet in a seam ${(r.seamLength * 1e9).toFixed(0)} nm long`
          : 'closes from the bottom up: no void',
    figure: {
      type: 'profile-history',
      elongated: r.elongated,
      depth: a.depth!,
      frames: r.history,
      ...(r.voidHeight > 0 ? { void: { from: r.closureDepth, to: r.closureDepth + r.voidHeight } } : {}),
    },
  }),
);

const closureDepth = fillQuantity(
  {
    name: 'fill.closure_depth',
    title: 'Depth where the fill closes',
    unit: 'm',
    symbol: 'z_c',
    description: 'Depth below the top where the opening pinches off (above a void), or where it closed last when the fill is void-free.',
    source: MARCH,
    assumptions: FILL_ASSUMPTIONS,
  },
  'z_c',
  (r) => r.closureDepth,
);

const seamLength = fillQuantity(
  {
    name: 'fill.seam_length',
    title: 'Seam length',
    unit: 'm',
    symbol: 'L_{seam}',
    description: 'Length along which the growing walls met (a seam in the fill): the full depth for a conformal fill of a vertical trench, none for a fill that rises from the bottom.',
    source: MARCH,
    assumptions: FILL_ASSUMPTIONS,
    better: 'lower',
  },
  'L_{seam} = \\sum \\Delta z \\text{ over slices closed by their walls}',
  (r) => r.seamLength,
);

const trappedWidth = fillQuantity(
  {
    name: 'fill.trapped_width',
    title: 'Widest gap trapped at pinch-off',
    unit: 'm',
    symbol: 'w_{trap}',
    description: 'Widest gap cut off below the point where the opening pinches off, whether it stays a void or closes as a seam; 0 when the fill closes from the bottom up. A rule can limit it directly, whatever seam width the void height counts from.',
    source: MARCH,
    assumptions: FILL_ASSUMPTIONS,
    better: 'lower',
  },
  'w_{trap} = \\max_{z > z_{pinch}} w(z)\\big|_{t_{pinch}}',
  (r) => r.trappedWidth,
);

const maxFillable = fillQuantity(
  {
    name: 'fill.max_fillable_aspect_ratio',
    title: 'Largest aspect ratio filled without a void',
    unit: '1',
    symbol: '\\mathrm{AR}_{max}',
    description: 'Largest depth over top CD that this fill closes void-free, at the structure’s CD and sidewall angle (bisection on the depth, marching the fill at each).',
    source: MARCH,
    assumptions: FILL_ASSUMPTIONS,
    better: 'higher',
  },
  '\\mathrm{AR}_{max} = \\max\\{D/\\mathrm{CD} : h_{void}(D) = 0\\}',
  (_r, a, fillAt) => {
    const cd = a.cd!;
    const voids = (depth: number) => {
      const r = fillAt(depth);
      return 'reason' in r || r.voidHeight > 0;
    };
    // The taper closes the opening at (CD/2)·tan θ: no deeper opening exists to fill.
    const cot = Math.cos(a.angle!) / Math.sin(a.angle!);
    // Stryker disable next-line EqualityOperator: cot θ of exactly 1e-12 (θ within 1e-12 rad of 90°), either way
    const tapered = cot > 1e-12;
    const limit = tapered ? 0.999 * (cd / 2 / cot) : 1000 * cd;
    let lo = 0.25 * cd;
    if (voids(lo)) return noValue('this fill leaves a void (or the opening closes) even at an aspect ratio of 0.25');
    let hi = Math.min(limit, 4 * a.depth!);
    if (!voids(hi)) return noted(hi / cd, hi >= limit ? (tapered ? 'fills void-free down to where the taper closes (the recipe is not the limit)' : 'fills void-free far beyond the structure’s depth') : 'fills void-free beyond four times the depth');
    // Bisection to 1e-3 CD: the bracket starts at most 1000 CD wide, so within 20 halvings.
    // Stryker disable next-line EqualityOperator: a bracket of exactly 1e-3 CD, either way
    while (hi - lo > 1e-3 * cd) {
      const mid = (lo + hi) / 2;
      if (voids(mid)) hi = mid;
      else lo = mid;
    }
    return lo / cd;
  },
);

export const depositionEngine: Engine = {
  id: 'deposition',
  title: 'Deposition: films in deep openings',
  summary: 'Step coverage of ALD, CVD and PVD film steps and the ALD exposure that saturates the opening (Gordon et al.), per film step.',
  quantities: [stepCoverage, aldRequired, aldMargin, coatedDepth],
};

/** Gap fill shares this folder's models; its quantities carry the `fill.` prefix of their own engine. */
export const fillEngine: Engine = {
  id: 'fill',
  title: 'Fill: closing openings without voids',
  summary: 'Gap fill marched in time (conformal, sticking-limited, bottom-up): void height, trapped width, closure depth, seam length and the largest aspect ratio filled void-free.',
  quantities: [voidHeight, trappedWidth, closureDepth, seamLength, maxFillable],
};
