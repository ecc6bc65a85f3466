// Capillary collapse of standing structures through rinse and dry.
//
// Load. Lines: the liquid left in the gap on one side of a line pulls it with the Laplace
// pressure ΔP = 2γ|cosθ|/s over its whole height (Tanaka, Morigami & Atoda 1993). Round bodies
// (pillars, cylinders): as the liquid drains, the meniscus between neighbours pulls them together
// with the lateral immersion force F = 2πγr²cos²θ/p at the liquid level (Kralchevsky & Nagayama
// 1994; linearised meniscus, an estimate in dense arrays); every level is tried and the worst kept.
//
// Body. The standing structure is one continuous beam: clamped at its base, held laterally by its
// support lattices (pinned, or clamped), free at its top unless a support is there, its section
// following the taper (finite elements, ./beam.ts). It bends with its axial stress along its height
// (the wafer normal): a round body with the Young's modulus E along it; a long line, held in plane
// strain along its length, with the plate modulus E' = E/(1 − ν²) (cylindrical bending of a plate,
// Timoshenko & Woinowsky-Krieger, Theory of Plates and Shells, ch. 1). For single-crystal silicon on a
// (001) wafer the materials table gives E⟨100⟩ and ν for ⟨100⟩ load, so E' is the anisotropic plate
// modulus 1/(S11 − S12²/S11) of lines along ⟨100⟩ exactly, and 2.5 % under that of lines along ⟨110⟩.
//
// Collapse. The load grows as the gap closes (ΔP ∝ 1/(s − 2δ) for lines, F ∝ 1/(p − 2δ) for round
// bodies, neighbours bending toward each other), so the body is a spring of deflection δ₁ under the
// initial load facing a load that rises with δ. It stands while an equilibrium exists before
// contact: δ₁·d₀ ≤ max over δ ≤ min(s/2, d₀/4) of δ(d₀ − 2δ), with d₀ = s for lines and p for round
// bodies. For lines that is δ₁ ≤ s/8 and, for a prismatic cantilever, the critical height
// H⁴ = E'·W³·s²/(24γcosθ) — √2 lower than the geometric criterion δ₁ = s/2 (Namatsu et al. 1995).
// Deflection grows as (length)⁴ under a line load and (length)³ under a point load, so the collapse
// margin L_c/L = (δ_crit/δ₁)^¼ or ^⅓ is the factor by which every span could lengthen, at the same
// sections, gap and load, before the structure collapses.
import { isElongated, type SupportHold } from '../../model/types.ts';
import { formatValue } from '../../model/format.ts';
import { bottomCd } from '../geometry/index.ts';
import { noted, noValue, variant, type Engine, type NoValue, type Outcome, type QuantityDef, type Shape, type Variant } from '../quantity.ts';
import { memoTable } from '../memo.ts';
import { factorBeam, maxDeflection, meshBeam, peakStress, sectionAt, uniformLoad, type SectionShape } from './beam.ts';

const TANAKA = 'Tanaka, Morigami & Atoda, Jpn. J. Appl. Phys. 32, 6059 (1993): Laplace pressure 2γcosθ/s on a line, root stress (6γcosθ/s)(H/W)²';
const KRALCHEVSKY = 'Kralchevsky & Nagayama, Langmuir 10, 23 (1994): lateral capillary immersion force between vertical cylinders, F ≈ 2πγ·Q₁Q₂/L with Q = r·cosθ';
const BEAM = 'Euler–Bernoulli beam by finite elements (Cook, Malkus, Plesha & Witt, Concepts and Applications of Finite Element Analysis, ch. 2), checked against Roark’s Formulas for Stress and Strain, Table 8.1; a line bends as a plate in cylindrical bending, with E/(1 − ν²) (Timoshenko & Woinowsky-Krieger, Theory of Plates and Shells, ch. 1)';
const SPRING = 'Elastocapillary stability: the capillary load grows as the gap closes; the body stands while an equilibrium exists before contact (one-degree-of-freedom spring model, as in Mastrangelo & Hsu, J. Microelectromech. Syst. 2, 33 (1993))';

/** Plate modulus of a long line in plane strain along its length (cylindrical bending): E/(1 − ν²). */
export function plateModulus(modulus: number, poisson: number): number {
  return modulus / (1 - poisson * poisson);
}

/** |cos θ|, exactly zero at 90° (floating-point cos(π/2) is 6e-17). */
export function wettingFactor(contact: number): number {
  const c = Math.abs(Math.cos(contact));
  // Stryker disable next-line EqualityOperator: |cos θ| exactly 1e-12 is not a contact angle anyone writes
  return c < 1e-12 ? 0 : c;
}

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
  /** Bending modulus: E for a round body, the plate modulus E/(1 − ν²) for a line. */
  modulus: number;
  /** Lines: capillary pressure (Pa). Round bodies: immersion force at the top (N), scaling with r². */
  load: number;
  /** Heights of the supports above the base. */
  supports: number[];
  hold: SupportHold;
}

export interface CollapseResult {
  /** Largest deflection under the initial capillary load (linear, before the gap closes). */
  deflection: number;
  /** Height where it occurs (lines) or where the liquid level loads the body worst (round bodies). */
  at: number;
  /** The deflection at which no equilibrium remains before contact. */
  critical: number;
  /** L_c/L: how far every span could lengthen before collapse (Infinity without load). */
  margin: number;
  /** The span that holds the worst point: between the supports (or base, or top) around it. */
  span: { from: number; to: number; length: number; describe: string };
  /** Peak bending stress anywhere along the body under the initial load. */
  stress: number;
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

// Large enough for a worst case's corners, its 512 failure samples and its levers, which the stress
// and margin rules of one structure share.
const solved = memoTable<string, CollapseResult | NoValue>(4096);

/** Solve the collapse problem: the continuous beam under the capillary load. */
export function analyseCollapse(p: CollapseProblem): CollapseResult | NoValue {
  return solved.get(JSON.stringify(p), () => solveCollapse(p));
}

function solveCollapse(p: CollapseProblem): CollapseResult | NoValue {
  // Stryker disable next-line EqualityOperator: a base of exactly zero width needs a taper that meets at the base to the last bit
  if (widthAt(p, 0) <= 0) return noValue('the re-entrant body narrows to nothing before its base');
  const model = meshBeam({
    height: p.height,
    supports: p.supports,
    hold: p.hold,
    modulus: p.modulus,
    section: (z) => sectionAt(p.section, widthAt(p, z), p.wall),
  });
  const solver = factorBeam(model);
  const critical = criticalDeflection(p.section, p.gap, p.pitch);
  let deflection = 0;
  let at = p.height;
  let stress = 0;
  if (p.section === 'line') {
    const pressure = () => p.load;
    const u = solver.solve(uniformLoad(model, pressure));
    const worst = maxDeflection(model, u);
    deflection = worst.value;
    at = worst.z;
    stress = peakStress(model, u, pressure);
  } else {
    // The liquid level sweeps down the body: a force at each free node, scaled with r² there.
    // Stryker disable next-line EqualityOperator: a node past the last takes no force (writes past the load vector are ignored)
    for (let i = 1; i < model.z.length; i++) {
      // Stryker disable next-line ConditionalExpression: a force on a held node moves nothing (the solve zeroes held degrees of freedom); skipping it saves the solve
      if (model.held.has(i)) continue;
      const f = new Float64Array(2 * model.z.length);
      f[2 * i] = p.load * (widthAt(p, model.z[i]!) / p.cd) ** 2;
      const u = solver.solve(f, 2 * i);
      // Stryker disable next-line EqualityOperator: on a tie the later level is reported, as deflected as the first
      if (Math.abs(u[2 * i]!) > deflection) {
        deflection = Math.abs(u[2 * i]!);
        at = model.z[i]!;
      }
      stress = Math.max(stress, peakStress(model, u));
    }
  }
  const exponent = p.section === 'line' ? 4 : 3;
  // Stryker disable next-line ConditionalExpression,LogicalOperator: critical/0 is Infinity as well (δ_crit > 0 for any open gap); the guard names the intent
  const margin = p.load === 0 || deflection === 0 ? Infinity : (critical / deflection) ** (1 / exponent);
  return { deflection, at, critical, margin, span: spanAround(p, model.z, model.held, at), stress };
}

function spanAround(p: CollapseProblem, z: number[], held: Map<number, string>, at: number): CollapseResult['span'] {
  // Stryker disable next-line MethodExpression,ArrowFunction,ArithmeticOperator: held nodes are entered base first, then up the sorted supports
  const heldNodes = [...held.keys()].sort((a, b) => a - b);
  // Stryker disable next-line EqualityOperator: the worst point of a loaded body is never a held node (its deflection there is 0)
  const below = heldNodes.filter((i) => z[i]! < at).pop() ?? 0;
  // Stryker disable next-line EqualityOperator: as above
  const above = heldNodes.find((i) => z[i]! > at);
  const from = z[below]!;
  const to = above !== undefined ? z[above]! : p.height;
  const show = (h: number) => formatValue(h, 'm', 3);
  const lower = below === 0 ? 'the base (clamped)' : `the support at ${show(from)} (${p.hold})`;
  const upper = above !== undefined ? `the support at ${show(to)} (${p.hold})` : 'the free top';
  const describe = below === 0 && above === undefined ? 'the whole height, clamped at the base with a free top' : `the span from ${lower} to ${upper}`;
  return { from, to, length: to - from, describe };
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
  // A line bends as a plate: its Poisson ratio enters the plate modulus.
  if (shape.kind === 'line') inputs.poisson = 'materials.body.poisson_ratio';
  if (shape.kind === 'cylinder') inputs.wall = 'geometry.wall';
  // Stryker disable next-line OptionalChaining: only shapes with a drying block get here
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
  poisson: '\\nu',
  wall: 't_w',
  strength: '\\sigma_f',
  length: 'L',
  deflection: '\\delta_1',
};

function problemOf(shape: Shape, a: Record<string, number>): CollapseProblem {
  // Stryker disable next-line OptionalChaining: only shapes with a drying block get here
  const supports = Array.from({ length: shape.drying?.supportCount ?? 0 }, (_, i) => a[`support_${i + 1}`]!);
  return {
    section: sectionOf(shape)!,
    cd: a.cd!,
    height: a.height!,
    angle: a.angle!,
    // Stryker disable next-line ConditionalExpression: a wall of undefined is the same as none (solid sections have no wall)
    ...(a.wall !== undefined ? { wall: a.wall } : {}),
    pitch: a.pitch!,
    gap: a.gap!,
    modulus: a.poisson !== undefined ? plateModulus(a.modulus!, a.poisson) : a.modulus!,
    load: a.load!,
    // Stryker disable next-line MethodExpression,ArrowFunction,ArithmeticOperator: the mesh does not depend on the order; sorted, one support set is one memo key
    supports: supports.sort((x, y) => x - y),
    // Stryker disable next-line OptionalChaining: only shapes with a drying block get here
    hold: shape.drying?.supportHold ?? 'pinned',
  };
}

/** A collapse quantity: one pure function of the solved body. */
function collapseQuantity(
  def: Omit<QuantityDef, 'variant'>,
  formula: (shape: Shape) => string,
  pick: (r: CollapseResult, args: Record<string, number>) => Outcome,
  extraInputs: Record<string, string> = {},
): QuantityDef {
  return {
    ...def,
    variant: (shape): Variant | { notApplicable: string } | { incomplete: string[] } => {
      if (!sectionOf(shape)) return STANDING_ONLY;
      if (!shape.drying) return NO_DRYING;
      const symbols: Record<string, string> = { ...COLLAPSE_SYMBOLS, load: shape.kind === 'line' ? '\\Delta P' : 'F' };
      const n = shape.drying.supportCount;
      for (let i = 1; i <= n; i++) symbols[`support_${i}`] = `z_{${i}}`;
      return variant({
        label: `${shape.kind}, ${n === 0 ? 'no supports' : `${n} support${n > 1 ? 's' : ''} (${shape.drying.supportHold})`}`,
        inputs: { ...collapseInputs(shape), ...extraInputs },
        symbols,
        formula: formula(shape),
        compute: (a: Record<string, number>) => {
          const r = analyseCollapse(problemOf(shape, a));
          return 'reason' in r ? r : pick(r, a);
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
  description: 'Pressure difference across the meniscus of the rinse liquid held in the gap between neighbouring lines, as the wafer dries.',
  source: `Young–Laplace equation for a cylindrical meniscus of radius s/(2cosθ); ${TANAKA}`,
  assumptions: ['Continuum meniscus between parallel walls; |cos θ| is used, so a non-wetting liquid loads the structure as much as a wetting one.'],
  validity: [{ arg: 'gap', min: 2e-9, why: 'a gap of a few nanometres is only a few molecules wide: the continuum Laplace pressure is not reliable there.' }],
  variant: (shape) => {
    if (!sectionOf(shape)) return STANDING_ONLY;
    if (!isElongated(shape.kind)) return { notApplicable: 'round bodies are loaded by the meniscus force between neighbours (mechanics.meniscus_force)' };
    if (!shape.drying) return NO_DRYING;
    return variant({
      inputs: { gamma: 'drying.surface_tension', contact: 'drying.contact_angle', gap: 'geometry.space' },
      symbols: { gamma: '\\gamma', contact: '\\theta_c', gap: 's' },
      formula: '\\Delta P = \\frac{2\\gamma\\,|\\cos\\theta_c|}{s}',
      compute: ({ gamma, contact, gap }) => (2 * gamma * wettingFactor(contact)) / gap,
    });
  },
};

const meniscusForce: QuantityDef = {
  name: 'mechanics.meniscus_force',
  title: 'Meniscus force between round neighbours',
  unit: 'N',
  symbol: 'F',
  description: 'Lateral capillary force pulling two neighbouring round bodies together where the draining liquid level meets them; shown at the top, it scales with the local radius squared lower down.',
  source: KRALCHEVSKY,
  assumptions: [
    'Linearised meniscus (small slopes), r ≪ p ≪ capillary length; in dense arrays with steep menisci it is an estimate only (Cooray, Cicuta & Vella, J. Phys.: Condens. Matter 24, 284104 (2012)).',
    '|cos θ| as for the Laplace pressure.',
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
      compute: ({ gamma, contact, cd, pitch }) => (2 * Math.PI * gamma * (cd / 2) ** 2 * wettingFactor(contact) ** 2) / pitch,
    });
  },
};

const noLoad = (what: string): Outcome => noValue(`no capillary load (no liquid–vapour interface, or a 90° contact angle): ${what}`, 'above');

const BODY_ASSUMPTIONS = [
  'One continuous Euler–Bernoulli beam clamped at its base; support lattices hold it laterally (pinned: free to rotate, or clamped); the section follows the straight taper.',
  'Small deflections, linear elastic body.',
  'The bending stress runs along the height (the wafer normal): a round body bends with materials.body.youngs_modulus E, a long line (plane strain along its length) with the plate modulus E′ = E/(1 − ν²). For single-crystal silicon on a (001) wafer the table gives E⟨100⟩ = 130.1 GPa and ν = 0.278 (Hopcroft, Nix & Kenny 2010), so E′ = 141.1 GPa: exact for lines along ⟨100⟩, 2.5 % under the 144.7 GPa of lines along ⟨110⟩ (conservative).',
];

const freeLength = collapseQuantity(
  {
    name: 'mechanics.free_length',
    title: 'Governing free span',
    unit: 'm',
    symbol: 'L',
    description: 'Length of the unsupported span that holds the worst point of the body: the whole height without supports; otherwise the span between the base, the supports and the free top in which the capillary load deflects the body most.',
    source: `${BEAM}; support lattices split the height into spans`,
    assumptions: BODY_ASSUMPTIONS,
  },
  () => 'L = z_{above} - z_{below} \\text{ around the point of largest deflection}',
  (r) => noted(r.span.length, r.span.describe),
);

const tipDeflection = collapseQuantity(
  {
    name: 'mechanics.tip_deflection',
    title: 'Deflection under the capillary load',
    unit: 'm',
    symbol: '\\delta_1',
    description: 'Largest deflection of the body under the initial capillary load, before the gap starts to close: the Laplace pressure over the whole height of a line, or the meniscus force at the worst liquid level of a round body.',
    source: BEAM,
    assumptions: BODY_ASSUMPTIONS,
    validity: [{ holds: ({ cd, height }) => height! > 2 * cd!, why: 'beam theory needs a body several times taller than it is wide (height above twice the CD).' }],
    better: 'lower',
    sweep: { input: () => 'geometry.height', from: 0.25, to: 2 },
  },
  (shape) =>
    shape.kind === 'line'
      ? '\\left(E\'\\,I(z)\\,w\'\'\\right)\'\' = \\Delta P,\\;\\; E\' = \\frac{E}{1-\\nu^2},\\;\\; \\delta_1 = \\max_z |w| \\;\\;(\\tfrac{\\Delta P H^4}{8E\'I} \\text{ for a prismatic free line})'
      : '\\left(E\\,I(z)\\,w\'\'\\right)\'\' = F\\,\\delta(z - z_F),\\;\\; \\delta_1 = \\max_{z_F} w(z_F) \\;\\;(\\tfrac{F H^3}{3EI} \\text{ at the top of a prismatic free body})',
  (r) => noted(r.deflection, `at ${formatValue(r.at, 'm', 3)} above the base, in ${r.span.describe}`),
);

const criticalHeight = collapseQuantity(
  {
    name: 'mechanics.critical_height',
    title: 'Critical free length',
    unit: 'm',
    symbol: 'L_c',
    description: 'Length the governing span could reach — every span lengthened in proportion, at the same sections, gap and load — before the structure finds no equilibrium short of touching its neighbour. Without supports: the unsupported height at which it collapses.',
    source: `${SPRING}; lines: prismatic limit H_c⁴ = E′·W³·s²/(24γcosθ), E′ = E/(1 − ν²), with the load of ${TANAKA.split(':')[0]}`,
    assumptions: ['Neighbours bend toward each other (pairwise collapse); the narrowest gap is used for both load and contact.', 'Gap and load held at this structure’s values as the spans lengthen.'],
    better: 'higher',
  },
  (shape) =>
    shape.kind === 'line'
      ? 'L_c = L\\left(\\frac{s/8}{\\delta_1}\\right)^{1/4} \\;\\Rightarrow\\; L_c^4 = \\frac{E\'\\,W^3 s^2}{24\\,\\gamma\\cos\\theta_c} \\text{ (prismatic, free)},\\;\\; E\' = \\frac{E}{1-\\nu^2}'
      : 'L_c = L\\left(\\frac{\\delta_{crit}}{\\delta_1}\\right)^{1/3},\\;\\; \\delta_{crit} = \\frac{\\delta^*(p - 2\\delta^*)}{p},\\;\\; \\delta^* = \\min\\left(\\tfrac{s}{2}, \\tfrac{p}{4}\\right)',
  (r) => (Number.isFinite(r.margin) ? noted(r.margin * r.span.length, r.span.describe) : noLoad('nothing pulls the structures together')),
  // Shown in the derivation: the span and the deflection that set L_c.
  { length: 'mechanics.free_length', deflection: 'mechanics.tip_deflection' },
);

const collapseMargin = collapseQuantity(
  {
    name: 'mechanics.collapse_margin',
    title: 'Collapse margin',
    unit: '1',
    symbol: 'L_c/L',
    description: 'Critical free length over the length of the governing span: above 1 the structures stand through the dry.',
    source: SPRING,
    validity: [
      // Stryker disable next-line EqualityOperator: a deflection of exactly a tenth of the span is not a case
      { holds: ({ deflection, length }) => deflection! <= 0.1 * length!, why: 'the deflection under the initial load exceeds a tenth of the span: small-deflection beam theory no longer holds (the span has long collapsed).' },
    ],
    better: 'higher',
    sweep: { input: () => 'geometry.height', from: 0.25, to: 2 },
  },
  (shape) => (shape.kind === 'line' ? '\\frac{L_c}{L} = \\left(\\frac{s/8}{\\delta_1}\\right)^{1/4}' : '\\frac{L_c}{L} = \\left(\\frac{\\delta_{crit}}{\\delta_1}\\right)^{1/3}'),
  (r) => (Number.isFinite(r.margin) ? noted(r.margin, r.span.describe) : noLoad('the structures stand whatever their height')),
  { length: 'mechanics.free_length', deflection: 'mechanics.tip_deflection' },
);

const baseStress = collapseQuantity(
  {
    name: 'mechanics.base_stress',
    title: 'Peak bending stress',
    unit: 'Pa',
    symbol: '\\sigma_{max}',
    description: 'Largest bending stress anywhere along the body under the initial capillary load (for round bodies, over every liquid level).',
    source: `${TANAKA}; ${BEAM}; σ = M·c/I`,
    assumptions: ['Linear elastic bending; for a prismatic free line it is exactly (6γcosθ/s)(H/W)².', ...BODY_ASSUMPTIONS.slice(0, 1)],
    better: 'lower',
  },
  (shape) =>
    shape.kind === 'line'
      ? '\\sigma_{max} = \\max_z \\frac{M(z)\\,W(z)/2}{W(z)^3/12} \\;\\Rightarrow\\; \\frac{6\\gamma\\cos\\theta_c}{s}\\left(\\frac{H}{W}\\right)^2 \\text{ (prismatic, free)}'
      : '\\sigma_{max} = \\max_{z, z_F} \\frac{M(z)\\,D(z)/2}{I(z)}',
  (r) => r.stress,
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
  (r, a) => (r.stress === 0 ? noLoad('no bending stress') : a.strength! / r.stress),
  { strength: 'materials.body.fracture_strength' },
);

export const mechanicsEngine: Engine = {
  id: 'mechanics',
  title: 'Mechanics: capillary collapse',
  summary: 'Capillary load, the standing body as a beam held by its support lattices, deflection, critical length and bending stress through rinse and dry.',
  quantities: [capillaryPressure, meniscusForce, freeLength, tipDeflection, criticalHeight, collapseMargin, baseStress, stressMargin],
};
