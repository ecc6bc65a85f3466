// Films that line deep openings: does each film step reach the bottom, and with what exposure?
// The models are in ./models.ts (Gordon's ALD exposure, Knudsen diffusion–reaction for CVD,
// line-of-sight view factors for PVD). A structure lists its film steps under `deposition:`; a
// quantity of one step takes the step a rule names with `film`, or the only step there is.
import { isElongated, isOpening, type DepositionMethod } from '../../model/types.ts';
import { noted, noValue, variant, type Engine, type NoValue, type Outcome, type QuantityDef, type Shape, type Variant } from '../quantity.ts';
import { bottomCd, cavity } from '../geometry/index.ts';
import { marchFill, VOID_MIN_WIDTH, type FillResult } from './fill.ts';
import {
  aldAspectRatio,
  aldRequiredExposure,
  cvdStepCoverage,
  pvdHoleBottomAverage,
  pvdTrenchBottomAverage,
} from './models.ts';

const GORDON = 'Gordon, Hausmann, Kim & Shepard, Chem. Vap. Deposition 9, 73 (2003): P·t = S·√(2πmk_BT)·(1 + 19a/4 + 3a²/2); trenches with a = L/(2w) (Cremers, Puurunen & Dendooven, Appl. Phys. Rev. 6, 021302 (2019))';
const KNUDSEN = 'Knudsen diffusion with first-order wall reaction in a hole (as in Yanguas-Gil & Elam, Chem. Vap. Deposition 18, 46 (2012)): step coverage 1/[cosh φ + (√(3s)/4)·sinh φ], φ = √(3s)·L/d';
const VIEW = 'Line-of-sight arrival from a cosine source over the opening: coaxial-disc and parallel-strip view factors (Howell, Mengüç & Siegel, Thermal Radiation Heat Transfer, view-factor catalogue)';

/** The film step a quantity speaks of, or why it cannot tell. */
function stepOf(shape: Shape, methods?: DepositionMethod[]): { film: string; method: DepositionMethod } | { notApplicable: string } | { incomplete: string[] } {
  const films = (shape.deposition?.films ?? []).filter((f) => !methods || methods.includes(f.method));
  if (!shape.deposition) return { incomplete: ['deposition'] };
  if (shape.film !== undefined) {
    const f = shape.deposition.films.find((x) => x.film === shape.film);
    if (!f) return { incomplete: [`deposition.${shape.film}`] };
    if (methods && !methods.includes(f.method)) return { notApplicable: `film step "${shape.film}" is ${f.method}, not ${methods.join(' or ')}` };
    return f;
  }
  if (films.length === 1) return films[0]!;
  if (films.length === 0) return { notApplicable: `no ${methods?.join(' or ') ?? ''} film step`.replace('  ', ' ') };
  // Several steps and no choice: the rule must name one (incomplete, never a guess).
  return { incomplete: [`film (one of ${films.map((f) => f.film).join(', ')})`] };
}

/**
 * The opening a film lines: the hole, via or trench itself, or the inside of a hollow cylinder;
 * and the thicknesses of the film steps before `film`, which narrow it first.
 */
function openingInputs(shape: Shape, film?: string): Record<string, string> | null {
  const earlier: Record<string, string> = {};
  const films = shape.deposition?.films ?? [];
  const upTo = film === undefined ? films.length : films.findIndex((f) => f.film === film);
  films.slice(0, Math.max(0, upTo)).forEach((f, i) => (earlier[`prior_${i + 1}`] = `deposition.${f.film}.thickness`));
  // The step's own thickness: a film as thick as half the opening closes it (pinches off).
  if (film !== undefined && upTo >= 0) earlier.own = `deposition.${film}.thickness`;
  if (isOpening(shape.kind)) return { depth: 'geometry.depth', cd: 'geometry.cd', bottom: 'geometry.bottom_cd', ...earlier };
  if (shape.kind === 'cylinder') return { height: 'geometry.height', cd: 'geometry.cd', bottom: 'geometry.bottom_cd', wall: 'geometry.wall', ...earlier };
  return null;
}

const nmText = (m: number) => `${Number((m * 1e9).toPrecision(3))} nm`;

/** Depth and narrowest width of the opening left to coat, from the inputs of openingInputs. */
function opening(a: Record<string, number>): { depth: number; width: number } {
  const o = openingOrClosed(a);
  if ('reason' in o) throw new Error(`deposition: opening() on a closed opening (${o.reason}); stepQuantity checks first`);
  return o;
}

/**
 * The opening left to coat, or why there is none: the taper or the earlier films may close it
 * (a re-entrant cup narrows to nothing at its base; two 10 nm films fill a 20 nm gap). A film step
 * in a closed opening has no coverage, exposure or margin to give.
 */
function openingOrClosed(a: Record<string, number>): { depth: number; width: number } | { reason: string } {
  let narrowed = 0;
  for (let i = 1; a[`prior_${i}`] !== undefined; i++) narrowed += 2 * a[`prior_${i}`]!;
  let depth: number;
  let top: number;
  let bottom: number;
  if (a.depth !== undefined) {
    depth = a.depth;
    top = a.cd!;
    bottom = a.bottom!;
  } else {
    // Inside a cup: the cavity of the geometry engine (its floor one wall above the base).
    const c = cavity(a.cd!, a.bottom!, a.height!, a.wall!);
    if ('reason' in c) return { reason: c.reason };
    depth = c.depth;
    top = c.top;
    bottom = c.bottom;
  }
  const narrowest = Math.min(top, bottom);
  if (!(narrowest > 0)) return { reason: 'the opening closes before its bottom (its narrowest width is not above zero), so there is nothing below to coat' };
  if (!(narrowest - narrowed > 0)) return { reason: `the earlier films (${nmText(narrowed / 2)} on each wall) close the opening at its narrowest width, so this film has nowhere to go` };
  if (!(depth > 0)) return { reason: 'the opening has no depth left to coat' };
  const own = a.own ?? 0;
  if (!(narrowest - narrowed - 2 * own > 1e-9 * narrowest)) {
    // The film closes the opening where it is narrowest: at the mouth it pinches off over what lies
    // below; at the bottom it fills it. Either way this is no longer a lined opening.
    const where = top <= bottom ? `its mouth (${nmText(top - narrowed)} wide there): it pinches off, closing over the opening below` : `its bottom (${nmText(bottom - narrowed)} wide there): it fills the opening where it is narrower than twice the film`;
    return { reason: `this film (${nmText(own)} on each wall) closes the opening at ${where}; the models of a lined opening do not apply` };
  }
  return { depth, width: narrowest - narrowed };
}

const SYMBOLS: Record<string, string> = {
  depth: 'L',
  width: 'd',
  own: 't',
  height: 'H',
  cd: '\\mathrm{CD}',
  wall: 't_w',
  exposure: 'P t',
  molar: 'M',
  temperature: 'T',
  sites: 'S',
  sticking: 's',
  required: '(P t)_{min}',
};

/** A quantity of one film step. */
function stepQuantity(
  def: Omit<QuantityDef, 'variant' | 'steps'>,
  methods: DepositionMethod[] | undefined,
  inputs: (film: string, method: DepositionMethod) => Record<string, string>,
  formula: (method: DepositionMethod, elongated: boolean) => string,
  compute: (a: Record<string, number>, method: DepositionMethod, elongated: boolean) => Outcome,
): QuantityDef {
  return {
    ...def,
    steps: (shape) => (shape.deposition?.films ?? []).filter((f) => !methods || methods.includes(f.method)).map((f) => f.film),
    variant: (shape): Variant | { notApplicable: string } | { incomplete: string[] } => {
      if (!openingInputs(shape)) return { notApplicable: 'films line openings (hole, trench, via) and the inside of hollow cylinders' };
      const step = stepOf(shape, methods);
      if (!('film' in step)) return step;
      const geo = openingInputs(shape, step.film)!;
      const elongated = isElongated(shape.kind);
      return variant({
        label: `${step.film} (${step.method})`,
        inputs: { ...geo, ...inputs(step.film, step.method) },
        symbols: SYMBOLS,
        formula: formula(step.method, elongated),
        compute: (a: Record<string, number>) => {
          const o = openingOrClosed(a);
          return 'reason' in o ? noValue(o.reason) : compute(a, step.method, elongated);
        },
      });
    },
  };
}

const aldInputs = (film: string) => ({
  exposure: `deposition.${film}.exposure`,
  molar: `deposition.${film}.molar_mass`,
  temperature: `deposition.${film}.temperature`,
  sites: `deposition.${film}.site_density`,
});

function required(a: Record<string, number>, elongated: boolean): number {
  const o = opening(a);
  return aldRequiredExposure(a.sites!, a.molar!, a.temperature!, aldAspectRatio(elongated, o.depth, o.width));
}

/** Fraction of the depth an ALD dose saturates: the a that Gordon's formula gives for the exposure. */
function saturatedFraction(a: Record<string, number>, elongated: boolean): number {
  const o = opening(a);
  const flat = aldRequiredExposure(a.sites!, a.molar!, a.temperature!, 0);
  // 1 + 19a/4 + 3a²/2 = E/flat → a = [−19/4 + √((19/4)² − 6(1 − E/flat))]/3
  const ratio = a.exposure! / flat;
  const reach = ratio <= 1 ? 0 : (-19 / 4 + Math.sqrt((19 / 4) ** 2 + 6 * (ratio - 1))) / 3;
  const needed = aldAspectRatio(elongated, o.depth, o.width);
  return needed === 0 ? 1 : Math.min(1, reach / needed);
}

const stepCoverage = stepQuantity(
  {
    name: 'deposition.step_coverage',
    title: 'Step coverage',
    unit: '1',
    symbol: 't_{bottom}/t_{top}',
    description: 'Film thickness at the bottom over thickness on the top surface, for one film step: 1 for an ALD step whose dose saturates the whole opening (0 when it does not reach the bottom), the diffusion–reaction solution for CVD, the bottom view factor for PVD.',
    source: `ALD: ${GORDON}; CVD: ${KNUDSEN}; PVD: ${VIEW}`,
    assumptions: ['Vertical-walled opening of the narrowest (bottom) width; for a hollow cylinder, its inside.', 'CVD: quasi-steady, first-order wall reaction, free-molecular (Knudsen) transport, reacting bottom. PVD: sticking 1, no re-emission.'],
    validity: [{ arg: 'sticking', max: 0.1, why: 'the diffusion–reaction model assumes a small sticking probability (s ≪ 1); above about 0.1 it overstates the coverage.' }],
    better: 'higher',
    sweep: { input: () => 'geometry.depth', from: 0.25, to: 2, axis: { label: 'aspect ratio', unit: '1', map: (depth, p) => depth / p['geometry.cd']! } },
  },
  undefined,
  (film, method): Record<string, string> => (method === 'ald' ? aldInputs(film) : method === 'cvd' ? { sticking: `deposition.${film}.sticking_probability` } : {}),
  (method, elongated) =>
    method === 'ald'
      ? '\\frac{t_b}{t_t} = \\begin{cases} 1 & P t \\ge (P t)_{min} \\\\ 0 & \\text{otherwise} \\end{cases}'
      : method === 'cvd'
        ? `\\frac{t_b}{t_t} = \\frac{1}{\\cosh\\varphi + \\frac{\\sqrt{3s}}{4}\\sinh\\varphi},\\;\\; \\varphi = \\sqrt{3s}\\,\\frac{L}{${elongated ? '2d' : 'd'}}`
        : elongated
          ? '\\frac{t_b}{t_t} = \\sqrt{1 + A^2} - A,\\;\\; A = L/d'
          : '\\frac{t_b}{t_t} = \\frac{(2 + X^2) - X\\sqrt{X^2 + 4}}{2},\\;\\; X = 2L/d',
  (a, method, elongated) => {
    const o = opening(a);
    if (o.width <= 0 || o.depth <= 0) return noValue('the opening has no width or depth left to coat');
    if (method === 'ald') {
      if (a.exposure! >= required(a, elongated)) return 1;
      return noted(0, `the dose saturates only the top ${(saturatedFraction(a, elongated) * 100).toFixed(0)} % of the depth`);
    }
    if (method === 'cvd') return cvdStepCoverage(a.sticking!, o.depth, elongated ? 2 * o.width : o.width);
    return elongated ? pvdTrenchBottomAverage(o.depth / o.width) : pvdHoleBottomAverage(o.depth / o.width);
  },
);

const aldRequired = stepQuantity(
  {
    name: 'deposition.ald_required_exposure',
    title: 'ALD exposure needed to saturate the opening',
    unit: 'Pa*s',
    symbol: '(P t)_{min}',
    description: 'Smallest precursor exposure (partial pressure × pulse time) that saturates the whole depth of the opening.',
    source: GORDON,
    assumptions: ['Initial sticking probability 1 until the surface saturates (a lower one raises the exposure roughly as its inverse); free-molecular transport; narrowest (bottom) width.'],
    better: 'lower',
  },
  ['ald'],
  (film) => aldInputs(film),
  (_m, elongated) => `(P t)_{min} = S\\sqrt{2\\pi m k_B T}\\left(1 + \\tfrac{19}{4}a + \\tfrac{3}{2}a^2\\right),\\;\\; a = ${elongated ? '\\frac{L}{2d}' : '\\frac{L}{d}'},\\;\\; m = M/N_A`,
  (a, _m, elongated) => required(a, elongated),
);

const aldMargin = stepQuantity(
  {
    name: 'deposition.ald_exposure_margin',
    title: 'ALD exposure margin',
    unit: '1',
    symbol: '\\frac{P t}{(P t)_{min}}',
    description: 'Exposure the recipe gives over the exposure needed to saturate the opening: at least 1 for a film that reaches the bottom.',
    source: GORDON,
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
  (film) => aldInputs(film),
  () => '\\frac{P t}{(P t)_{min}}',
  (a, _m, elongated) => a.exposure! / required(a, elongated),
);

const coatedDepth = stepQuantity(
  {
    name: 'deposition.ald_coated_depth_fraction',
    title: 'Depth fraction an ALD dose saturates',
    unit: '1',
    symbol: 'z_{sat}/L',
    description: 'Fraction of the opening’s depth that the given ALD exposure saturates (1: down to the bottom).',
    source: GORDON,
    better: 'higher',
  },
  ['ald'],
  (film) => aldInputs(film),
  (_m, elongated) => `1 + \\tfrac{19}{4}a_{sat} + \\tfrac{3}{2}a_{sat}^2 = \\frac{P t}{S\\sqrt{2\\pi m k_B T}},\\;\\; \\frac{z_{sat}}{L} = \\min\\left(1, \\frac{a_{sat}}{a}\\right),\\;\\; a = ${elongated ? '\\frac{L}{2d}' : '\\frac{L}{d}'}`,
  (a, _m, elongated) => saturatedFraction(a, elongated),
);

// ── Gap fill ──────────────────────────────────────────────────────────────────────────────────

const MARCH = 'Profile marched in time with the local growth rate (conformal; sticking-limited from the Knudsen diffusion–reaction equation in the narrowing opening; bottom-up); a slice closes when its walls meet, and open slices cut off below a closed one form a void';

function fillInputs(shape: Shape): Record<string, string> {
  const inputs: Record<string, string> = { cd: 'geometry.cd', depth: 'geometry.depth', angle: 'geometry.sidewall_angle' };
  (shape.deposition?.films ?? []).forEach((f, i) => (inputs[`prior_${i + 1}`] = `deposition.${f.film}.thickness`));
  if (shape.fill?.method === 'sticking-limited') inputs.sticking = 'fill.sticking_probability';
  if (shape.fill?.method === 'bottom-up') inputs.ratio = 'fill.bottom_up_ratio';
  return inputs;
}

const fillMemo = new Map<string, FillResult | NoValue>();

/** March the fill of the opening described by the inputs (memoised: several quantities share it). */
export function fillOf(shape: Shape, a: Record<string, number>, depth = a.depth!): FillResult | NoValue {
  const key = JSON.stringify([shape.kind, shape.fill?.method, a, depth]);
  const hit = fillMemo.get(key);
  if (hit) return hit;
  // Film steps before the fill narrow the opening by their thickness on each wall.
  let narrowed = 0;
  for (let i = 1; a[`prior_${i}`] !== undefined; i++) narrowed += 2 * a[`prior_${i}`]!;
  const top = a.cd! - narrowed;
  const bottom = bottomCd(a.cd!, depth, a.angle!, true) - narrowed;
  const march =
    bottom <= 0 || top <= 0
      ? noValue('the opening closes before its bottom (taper or earlier films): there is nothing to fill below that')
      : marchFill({
          elongated: isElongated(shape.kind),
          cd: top,
          depth,
          bottom,
          method: shape.fill!.method,
          ...(a.sticking !== undefined ? { sticking: a.sticking } : {}),
          ...(a.ratio !== undefined ? { ratio: a.ratio } : {}),
        });
  const result: FillResult | NoValue = 'reason' in march || march.converged ? march : noValue('the fill march did not close within its step limit');
  if (fillMemo.size > 64) fillMemo.clear();
  fillMemo.set(key, result);
  return result;
}

function fillQuantity(def: Omit<QuantityDef, 'variant'>, formula: string, pick: (r: FillResult, a: Record<string, number>, shape: Shape) => Outcome): QuantityDef {
  return {
    ...def,
    variant: (shape) => {
      if (!isOpening(shape.kind)) return { notApplicable: 'gap fill concerns openings (hole, trench, via)' };
      if (!shape.fill) return { incomplete: ['fill.method'] };
      return variant({
        label: `${shape.kind}, ${shape.fill.method} fill`,
        inputs: fillInputs(shape),
        symbols: { cd: '\\mathrm{CD}', depth: 'D', angle: '\\theta', sticking: 's', ratio: 'R_b' },
        formula,
        compute: (a: Record<string, number>) => {
          const r = fillOf(shape, a);
          return 'reason' in r ? r : pick(r, a, shape);
        },
      });
    },
  };
}

const FILL_ASSUMPTIONS = [
  `Straight sidewalls; growth normal to the wall taken as horizontal; ${200} slices over the depth. A trapped opening narrower than ${VOID_MIN_WIDTH * 1e9} nm counts as a seam, not a void. Earlier film steps narrow the opening by their full thickness.`,
  'Sticking-limited growth: quasi-steady Knudsen diffusion with first-order wall reaction, recomputed as the opening narrows.',
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
    note: r.voidHeight > 0 ? `pinched off ${(r.closureDepth * 1e9).toFixed(0)} nm below the top, trapping an opening up to ${(r.voidWidth * 1e9).toFixed(1)} nm wide` : 'closes from the bottom up: no void',
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
  (_r, a, shape) => {
    const cd = a.cd!;
    const voids = (depth: number) => {
      const r = fillOf(shape, a, depth);
      return 'reason' in r || r.voidHeight > 0;
    };
    // The taper closes the opening at (CD/2)·tan θ: no deeper opening exists to fill.
    const cot = Math.cos(a.angle!) / Math.sin(a.angle!);
    const limit = cot > 1e-12 ? 0.999 * (cd / 2 / cot) : 1000 * cd;
    let lo = 0.25 * cd;
    if (voids(lo)) return noValue('this fill leaves a void (or the opening closes) even at an aspect ratio of 0.25');
    let hi = Math.min(limit, 4 * a.depth!);
    if (!voids(hi)) return noted(hi / cd, hi >= limit ? (cot > 1e-12 ? 'fills void-free down to where the taper closes (the recipe is not the limit)' : 'fills void-free far beyond the structure’s depth') : 'fills void-free beyond four times the depth');
    for (let i = 0; i < 24 && hi - lo > 1e-3 * cd; i++) {
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
  summary: 'Gap fill marched in time (conformal, sticking-limited, bottom-up): void height, closure depth, seam length and the largest aspect ratio filled void-free.',
  quantities: [voidHeight, closureDepth, seamLength, maxFillable],
};
