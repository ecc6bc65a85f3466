// Capillary collapse of standing structures through rinse and dry.
//
// Load. Lines: the liquid left in the gap on one side of a line pulls it with the Laplace
// pressure ΔP = 2γ|cosθ|/s over the whole free span (Tanaka, Morigami & Atoda 1993). Round bodies
// (pillars, cylinders): the meniscus between neighbours, as the liquid drains below their tops,
// pulls the top of the free span with the lateral immersion force F = 2πγr²cos²θ/p
// (Kralchevsky & Nagayama 1994; linearised meniscus, an estimate in dense arrays).
//
// Collapse. The load grows as the gap closes (ΔP ∝ 1/(s − 2δ) for lines, F ∝ 1/(p − 2δ) for round
// bodies, neighbours bending toward each other), so a span is a spring of deflection δ₁ under
// the initial load facing a load that rises with δ. It stands while an equilibrium exists before
// contact: δ₁·d₀ ≤ max over δ ≤ min(s/2, d₀/4) of δ(d₀ − 2δ), with d₀ = s for lines and p for round
// bodies. For lines that is δ₁ ≤ s/8 and, for a prismatic cantilever, the critical height
// H⁴ = E·W³·s²/(24γcosθ) — √2 lower than the geometric criterion δ₁ = s/2 (Namatsu et al. 1995).
//
// Spans. A structure without supports is a cantilever clamped at its base. Lateral support
// lattices split it into spans: base to first support (clamped–pinned, or clamped–clamped),
// between supports (pinned–pinned or clamped–clamped), and a free top above the highest support
// (clamped at that support: the body below restrains its rotation). The span with the smallest
// margin governs. A free cantilever is integrated along its taper; spans between supports use
// the section at mid-span (Roark's coefficients).
import { isElongated, type SupportHold } from '../../model/types.ts';
import { bottomCd } from '../geometry/index.ts';
import { noted, noValue, variant, type Engine, type Outcome, type QuantityDef, type Shape, type Variant } from '../quantity.ts';
import { SPAN_COEFFICIENTS, sectionAt, taperedCantilever, type EndConditions, type LoadCase, type SectionShape } from './beam.ts';

const TANAKA = 'Tanaka, Morigami & Atoda, Jpn. J. Appl. Phys. 32, 6059 (1993): Laplace pressure 2γcosθ/s on a line, root stress (6γcosθ/s)(H/W)²';
const KRALCHEVSKY = 'Kralchevsky & Nagayama, Langmuir 10, 23 (1994): lateral capillary immersion force between vertical cylinders, F ≈ 2πγ·Q₁Q₂/L with Q = r·cosθ';
const ROARK = "Roark's Formulas for Stress and Strain (Young & Budynas, 7th ed.), Table 8.1: beams under uniform and point loads";
const SPRING = 'Elastocapillary stability: the capillary load grows as the gap closes; the span stands while an equilibrium exists before contact (one-degree-of-freedom spring model, as in Mastrangelo & Hsu, J. Microelectromech. Syst. 2, 33 (1993))';

/** The collapse problem for one structure, in SI. */
export interface CollapseProblem {
  section: SectionShape;
  /** Top CD (width of a line, outer diameter of a round body). */
  cd: number;
  height: number;
  /** Sidewall angle (90° vertical; below 90° the body widens toward its base). */
  angle: number;
  /** Wall of a hollow cylinder. */
  wall?: number;
  pitch: number;
  /** Narrowest gap to the neighbour. */
  gap: number;
  modulus: number;
  /** Lines: capillary pressure (Pa). Round bodies: immersion force at the top of the free span (N). */
  load: number;
  /** Heights of the supports above the base, rising. */
  supports: number[];
  hold: SupportHold;
}

export interface SpanResult {
  from: number;
  to: number;
  length: number;
  ends: EndConditions;
  /** Deflection under the initial capillary load (linear, before the gap closes). */
  deflection: number;
  /** The deflection at which no equilibrium remains before contact. */
  critical: number;
  /** Longest span of the same kind that still stands. */
  criticalLength: number;
  margin: number;
  /** Peak bending stress at the span's most stressed section, under the initial load. */
  stress: number;
  describe: string;
}

/** Width of the body at height z above its base (straight sidewall). */
function widthAt(p: CollapseProblem, z: number): number {
  const base = bottomCd(p.cd, p.height, p.angle, false);
  return base + ((p.cd - base) * z) / p.height;
}

/** Deflection at which equilibrium is lost before contact, from δ₁·d₀ ≤ max δ(d₀ − 2δ). */
export function criticalDeflection(section: SectionShape, gap: number, pitch: number): number {
  const d0 = section === 'line' ? gap : pitch;
  const limit = Math.min(gap / 2, d0 / 4);
  return (limit * (d0 - 2 * limit)) / d0;
}

function loadCase(p: CollapseProblem): LoadCase {
  return p.section === 'line' ? 'uniform' : 'point';
}

/** Linear deflection and peak stress of a prismatic span held at both ends (section at mid-span). */
function heldSpan(p: CollapseProblem, from: number, to: number, ends: EndConditions): { deflection: number; stress: number } {
  const s = sectionAt(p.section, widthAt(p, (from + to) / 2), p.wall);
  const c = SPAN_COEFFICIENTS[ends][loadCase(p)];
  const length = to - from;
  // Lines: load per unit length of line is the pressure (uniform, δ ∝ L⁴); round bodies: the
  // immersion force where it is worst, at mid-span (δ ∝ L³).
  const power = p.section === 'line' ? 4 : 3;
  const deflection = (c.deflection * p.load * length ** power) / (p.modulus * s.inertia);
  const moment = c.moment * p.load * length ** (power - 2);
  return { deflection, stress: (moment * s.fibre) / s.inertia };
}

/** Linear tip deflection and root stress of a free top of length L ending at the structure's top. */
function freeTop(p: CollapseProblem, length: number): { deflection: number; stress: number } {
  const r = taperedCantilever({
    shape: p.section,
    length,
    tipWidth: p.cd,
    // The taper is linear, so it extends below the base when the search tries a longer span.
    rootWidth: widthAt(p, p.height - length),
    ...(p.wall !== undefined ? { wall: p.wall } : {}),
    modulus: p.modulus,
    load: p.section === 'line' ? { case: 'uniform', pressure: p.load } : { case: 'point', force: p.load },
  });
  return { deflection: r.deflection, stress: (r.rootMoment * r.rootSection.fibre) / r.rootSection.inertia };
}

/**
 * Longest free top of the same taper that still stands: δ₁(L) = δ_crit, by bisection (δ₁ grows
 * monotonically with L). Infinite when there is no load.
 */
function criticalFreeTop(p: CollapseProblem, critical: number): number {
  if (p.load === 0) return Infinity;
  // A body narrowing toward its base reaches zero width some way below its top: stay above that.
  const slope = (widthAt(p, 0) - p.cd) / p.height; // width gained per metre down from the top
  const maxLength = slope < 0 ? (0.999 * p.cd) / -slope : Infinity;
  let lo = 0;
  let hi = Math.min(p.height, maxLength);
  while (freeTop(p, hi).deflection < critical) {
    if (hi >= maxLength) return maxLength;
    lo = hi;
    hi = Math.min(hi * 2, maxLength);
  }
  for (let i = 0; i < 60 && hi - lo > 1e-12 * hi; i++) {
    const mid = (lo + hi) / 2;
    if (freeTop(p, mid).deflection < critical) lo = mid;
    else hi = mid;
  }
  return (lo + hi) / 2;
}

const HOLD_WORDS: Record<EndConditions, string> = {
  'clamped-free': 'clamped at its root, free at its top',
  'clamped-pinned': 'clamped at the base, pinned at the support',
  'pinned-pinned': 'pinned at both supports',
  'clamped-clamped': 'clamped at both ends',
};

/** All spans of the structure with their margins; the first with the smallest margin governs. */
export function analyseCollapse(p: CollapseProblem): { spans: SpanResult[]; governing: SpanResult } {
  const critical = criticalDeflection(p.section, p.gap, p.pitch);
  const power = p.section === 'line' ? 4 : 3;
  const fmt = (z: number) => `${Number((z * 1e6).toPrecision(3))} µm`;
  const inner = p.supports.filter((z) => z > 0 && z < p.height);
  const topHeld = p.supports.some((z) => z >= p.height);
  const bounds = [0, ...inner, ...(topHeld ? [p.height] : [])];
  const spans: SpanResult[] = [];
  for (let i = 0; i + 1 < bounds.length; i++) {
    const from = bounds[i]!;
    const to = bounds[i + 1]!;
    const ends: EndConditions = p.hold === 'clamped' ? 'clamped-clamped' : i === 0 ? 'clamped-pinned' : 'pinned-pinned';
    const r = heldSpan(p, from, to, ends);
    const lc = p.load === 0 ? Infinity : (to - from) * (critical / r.deflection) ** (1 / power);
    spans.push({
      from,
      to,
      length: to - from,
      ends,
      deflection: r.deflection,
      critical,
      criticalLength: lc,
      margin: lc / (to - from),
      stress: r.stress,
      describe: `the span from ${i === 0 ? 'the base' : fmt(from)} to the support at ${fmt(to)}, ${HOLD_WORDS[ends]}`,
    });
  }
  if (!topHeld) {
    const root = bounds[bounds.length - 1]!;
    const length = p.height - root;
    const r = freeTop(p, length);
    const lc = criticalFreeTop(p, critical);
    spans.push({
      from: root,
      to: p.height,
      length,
      ends: 'clamped-free',
      deflection: r.deflection,
      critical,
      criticalLength: lc,
      margin: lc / length,
      stress: r.stress,
      describe: root === 0 ? 'the whole height, clamped at the base with a free top' : `the free top above the support at ${fmt(root)}, clamped there`,
    });
  }
  let governing = spans[0]!;
  for (const s of spans) if (s.margin < governing.margin) governing = s;
  return { spans, governing };
}

// ── Quantity declarations ─────────────────────────────────────────────────────────────────────

function sectionOf(shape: Shape): SectionShape | null {
  if (shape.kind === 'line') return 'line';
  if (shape.kind === 'pillar') return 'solid-round';
  if (shape.kind === 'cylinder') return 'hollow-round';
  return null;
}

const STANDING_ONLY = { notApplicable: 'capillary collapse concerns standing structures (pillar, cylinder, line)' } as const;
const NO_DRYING = { incomplete: ['drying.liquid'] };

/** Inputs shared by every collapse quantity; supports are numbered inputs. */
function collapseInputs(shape: Shape): Record<string, string> {
  const inputs: Record<string, string> = {
    cd: 'geometry.cd',
    height: 'geometry.height',
    angle: 'geometry.sidewall_angle',
    pitch: 'geometry.pitch',
    gap: 'geometry.space',
    modulus: 'materials.body.youngs_modulus',
    load: shape.kind === 'line' ? 'mechanics.capillary_pressure' : 'mechanics.meniscus_force',
  };
  if (shape.kind === 'cylinder') inputs.wall = 'geometry.wall';
  for (let i = 1; i <= (shape.drying?.supportCount ?? 0); i++) inputs[`support_${i}`] = `drying.support_${i}`;
  return inputs;
}

const COLLAPSE_SYMBOLS: Record<string, string> = {
  cd: '\\mathrm{CD}',
  height: 'H',
  angle: '\\theta',
  pitch: 'p',
  gap: 's',
  modulus: 'E',
  load: 'q',
  wall: 't_w',
};

function problemOf(shape: Shape, a: Record<string, number>): CollapseProblem {
  const supports: number[] = [];
  for (let i = 1; i <= (shape.drying?.supportCount ?? 0); i++) supports.push(a[`support_${i}`]!);
  return {
    section: sectionOf(shape)!,
    cd: a.cd!,
    height: a.height!,
    angle: a.angle!,
    ...(a.wall !== undefined ? { wall: a.wall } : {}),
    pitch: a.pitch!,
    gap: a.gap!,
    modulus: a.modulus!,
    load: a.load!,
    supports: supports.sort((x, y) => x - y),
    hold: shape.drying?.supportHold ?? 'pinned',
  };
}

/** A collapse quantity: one pure function of the governing span. */
function collapseQuantity(
  def: Omit<QuantityDef, 'variant'>,
  formula: (shape: Shape) => string,
  pick: (g: SpanResult, args: Record<string, number>) => Outcome,
  extraInputs: Record<string, string> = {},
): QuantityDef {
  return {
    ...def,
    variant: (shape): Variant | { notApplicable: string } | { incomplete: string[] } => {
      if (!sectionOf(shape)) return STANDING_ONLY;
      if (!shape.drying) return NO_DRYING;
      const symbols: Record<string, string> = { ...COLLAPSE_SYMBOLS, load: shape.kind === 'line' ? '\\Delta P' : 'F', strength: '\\sigma_f', length: 'L', deflection: '\\delta_1' };
      for (let i = 1; i <= shape.drying.supportCount; i++) symbols[`support_${i}`] = `z_{${i}}`;
      return variant({
        label: `${shape.kind}, ${shape.drying.supportCount === 0 ? 'no supports' : `${shape.drying.supportCount} support${shape.drying.supportCount > 1 ? 's' : ''} (${shape.drying.supportHold})`}`,
        inputs: { ...collapseInputs(shape), ...extraInputs },
        symbols,
        formula: formula(shape),
        compute: (a: Record<string, number>) => {
          const { governing } = analyseCollapse(problemOf(shape, a));
          return pick(governing, a);
        },
      });
    },
  };
}

const capillaryPressure: QuantityDef = {
  name: 'mechanics.capillary_pressure',
  title: 'Capillary (Laplace) pressure in the gap',
  unit: 'Pa',
  symbol: '\\Delta P',
  description: 'Pressure difference across the meniscus of the rinse liquid held in the gap between neighbours, as the wafer dries.',
  source: `Young–Laplace equation for a cylindrical meniscus of radius s/(2cosθ); ${TANAKA}`,
  assumptions: ['Continuum meniscus between parallel walls; |cos θ| is used, so a non-wetting liquid loads the structure as much as a wetting one.'],
  validity: [{ arg: 'gap', min: 2e-9, why: 'a gap of a few nanometres is only a few molecules wide: the continuum Laplace pressure is not reliable there.' }],
  variant: (shape) => {
    if (!sectionOf(shape)) return STANDING_ONLY;
    if (!shape.drying) return NO_DRYING;
    return variant({
      inputs: { gamma: 'drying.surface_tension', contact: 'drying.contact_angle', gap: 'geometry.space' },
      symbols: { gamma: '\\gamma', contact: '\\theta_c', gap: 's' },
      formula: '\\Delta P = \\frac{2\\gamma\\,|\\cos\\theta_c|}{s}',
      compute: ({ gamma, contact, gap }) => (2 * gamma * Math.abs(Math.cos(contact))) / gap,
    });
  },
};

const meniscusForce: QuantityDef = {
  name: 'mechanics.meniscus_force',
  title: 'Meniscus force between round neighbours',
  unit: 'N',
  symbol: 'F',
  description: 'Lateral capillary force pulling two neighbouring round bodies together when the liquid level has drained below their tops.',
  source: KRALCHEVSKY,
  assumptions: [
    'Linearised meniscus (small slopes), r ≪ p ≪ capillary length; in dense arrays with steep menisci it is an estimate only (Cooray, Cicuta & Vella, J. Phys.: Condens. Matter 24, 284104 (2012)).',
    'Radius at the top of the body; |cos θ| as for the Laplace pressure.',
  ],
  validity: [
    {
      holds: ({ cd, pitch }) => cd! / pitch! <= 0.5,
      why: 'the linearised meniscus assumes neighbours far apart compared with their radius (CD/p ≤ 0.5); in a denser array the force is an order-of-magnitude estimate.',
    },
  ],
  variant: (shape) => {
    if (!sectionOf(shape)) return STANDING_ONLY;
    if (isElongated(shape.kind)) return { notApplicable: 'lines are loaded by the Laplace pressure over their height (mechanics.capillary_pressure)' };
    if (!shape.drying) return NO_DRYING;
    return variant({
      inputs: { gamma: 'drying.surface_tension', contact: 'drying.contact_angle', cd: 'geometry.cd', pitch: 'geometry.pitch' },
      symbols: { gamma: '\\gamma', contact: '\\theta_c', cd: '\\mathrm{CD}', pitch: 'p' },
      formula: 'F = \\frac{2\\pi\\gamma\\,(\\mathrm{CD}/2)^2\\cos^2\\theta_c}{p}',
      compute: ({ gamma, contact, cd, pitch }) => (2 * Math.PI * gamma * (cd / 2) ** 2 * Math.cos(contact) ** 2) / pitch,
    });
  },
};

const noLoad = (what: string): Outcome => noValue(`no capillary load (no liquid–vapour interface, or a 90° contact angle): ${what}`, 'above');

const freeLength = collapseQuantity(
  {
    name: 'mechanics.free_length',
    title: 'Governing free span',
    unit: 'm',
    symbol: 'L',
    description: 'Length of the unsupported span that governs collapse, and how its ends are held: the whole height without supports; otherwise the free top above the highest support or a span between supports, whichever has the smallest margin.',
    source: `${ROARK}; support lattices split the height into spans`,
    assumptions: ['A free top is clamped at the highest support (the body below restrains its rotation).'],
  },
  () => 'L = \\text{the span } [z_i, z_{i+1}] \\text{ with the smallest } L_c/L',
  (g) => noted(g.length, g.describe),
);

const tipDeflection = collapseQuantity(
  {
    name: 'mechanics.tip_deflection',
    title: 'Deflection under the capillary load',
    unit: 'm',
    symbol: '\\delta_1',
    description: 'Largest deflection of the governing span under the initial capillary load, before the gap starts to close (linear beam theory with its end conditions).',
    source: `${ROARK}; a free top is integrated along its taper by the unit-load method, δ = ∫M·x/(E·I) dx`,
    assumptions: ['Small deflections, linear elastic body, straight sidewall; spans held at both ends use the section at mid-span.'],
    validity: [{ holds: ({ cd, height }) => cd! > 0 && height! > 2 * cd!, why: 'beam theory needs a span several times longer than it is wide (height above twice the CD).' }],
    better: 'lower',
    sweep: { input: () => 'geometry.height', from: 0.25, to: 2 },
  },
  (shape) =>
    shape.kind === 'line'
      ? '\\delta_1 = \\int_0^L \\frac{\\Delta P\\,x^2/2 \\cdot x}{E\\,W(x)^3/12}\\,dx \\;\\;(\\text{free top}; \\tfrac{\\Delta P L^4}{8EI} \\text{ when prismatic})'
      : '\\delta_1 = \\int_0^L \\frac{F\\,x \\cdot x}{E\\,I(x)}\\,dx \\;\\;(\\text{free top}; \\tfrac{F L^3}{3EI} \\text{ when prismatic})',
  (g) => noted(g.deflection, g.describe),
);

const criticalHeight = collapseQuantity(
  {
    name: 'mechanics.critical_height',
    title: 'Critical free length',
    unit: 'm',
    symbol: 'L_c',
    description: 'Longest span of the governing kind (same section, taper and end conditions) that still finds an equilibrium before it touches its neighbour: the unsupported height at which the structure collapses.',
    source: `${SPRING}; lines: prismatic limit H_c⁴ = E·W³·s²/(24γcosθ), from ${TANAKA.split(':')[0]}`,
    assumptions: ['Neighbours bend toward each other (pairwise collapse); the narrowest gap is used for both load and contact.'],
    better: 'higher',
  },
  (shape) =>
    shape.kind === 'line'
      ? '\\delta_1(L_c) = \\frac{s}{8} \\;\\;\\Rightarrow\\;\\; L_c^4 = \\frac{E\\,W^3 s^2}{24\\,\\gamma\\cos\\theta_c} \\text{ (prismatic)}'
      : '\\delta_1(L_c)\\,p = \\delta^*(p - 2\\delta^*),\\;\\; \\delta^* = \\min\\left(\\tfrac{s}{2}, \\tfrac{p}{4}\\right)',
  (g) => (Number.isFinite(g.criticalLength) ? noted(g.criticalLength, g.describe) : noLoad('nothing pulls the structures together')),
  // Shown in the derivation: the span's deflection under the initial load, which sets L_c.
  { deflection: 'mechanics.tip_deflection' },
);

const collapseMargin = collapseQuantity(
  {
    name: 'mechanics.collapse_margin',
    title: 'Collapse margin',
    unit: '1',
    symbol: 'L_c/L',
    description: 'Critical free length over the actual length of the governing span: above 1 the structures stand through the dry.',
    source: SPRING,
    validity: [
      { holds: ({ deflection, length }) => deflection! <= 0.1 * length!, why: 'the deflection under the initial load exceeds a tenth of the span: small-deflection beam theory no longer holds (the span has long collapsed).' },
    ],
    better: 'higher',
    sweep: { input: () => 'geometry.height', from: 0.25, to: 2 },
  },
  (shape) =>
    shape.kind === 'line'
      ? '\\frac{L_c}{L},\\;\\; \\delta_1(L_c) = \\frac{s}{8}'
      : '\\frac{L_c}{L},\\;\\; \\delta_1(L_c)\\,p = \\delta^*(p - 2\\delta^*),\\;\\; \\delta^* = \\min\\left(\\tfrac{s}{2}, \\tfrac{p}{4}\\right)',
  (g, a) => (Number.isFinite(g.criticalLength) ? noted(g.criticalLength / a.length!, g.describe) : noLoad('the structures stand whatever their height')),
  // The governing span and its deflection appear as steps of the derivation.
  { length: 'mechanics.free_length', deflection: 'mechanics.tip_deflection' },
);

const baseStress = collapseQuantity(
  {
    name: 'mechanics.base_stress',
    title: 'Peak bending stress',
    unit: 'Pa',
    symbol: '\\sigma_{max}',
    description: 'Largest bending stress in the governing span under the initial capillary load: at the root of a free top, or where Roark places the largest moment of a held span.',
    source: `${TANAKA}; ${ROARK}; σ = M·c/I`,
    assumptions: ['Linear elastic bending; for a line in a prismatic free top it is exactly (6γcosθ/s)(H/W)².'],
    better: 'lower',
  },
  (shape) =>
    shape.kind === 'line'
      ? '\\sigma_{max} = \\frac{M\\,W/2}{W^3/12},\\;\\; M = \\frac{\\Delta P\\,L^2}{2} \\;\\Rightarrow\\; \\frac{6\\gamma\\cos\\theta_c}{s}\\left(\\frac{L}{W}\\right)^2 \\text{ (prismatic)}'
      : '\\sigma_{max} = \\frac{M\\,D/2}{I},\\;\\; M = F\\,L',
  (g) => g.stress,
);

const stressMargin = collapseQuantity(
  {
    name: 'mechanics.stress_margin',
    title: 'Bending-strength margin',
    unit: '1',
    symbol: '\\sigma_f/\\sigma_{max}',
    description: 'Strength of the body material over the peak bending stress: above 1 the structure does not break before it bends into its neighbour.',
    source: `${TANAKA} (stress criterion)`,
    better: 'higher',
  },
  () => '\\frac{\\sigma_f}{\\sigma_{max}}',
  (g, a) => (g.stress === 0 ? noLoad('no bending stress') : a.strength! / g.stress),
  { strength: 'materials.body.fracture_strength' },
);

export const mechanicsEngine: Engine = {
  id: 'mechanics',
  title: 'Mechanics: capillary collapse',
  summary: 'Capillary load, spans between support lattices, deflection, critical height and bending stress of standing structures through rinse and dry.',
  quantities: [capillaryPressure, meniscusForce, freeLength, tipDeflection, criticalHeight, collapseMargin, baseStress, stressMargin],
};
