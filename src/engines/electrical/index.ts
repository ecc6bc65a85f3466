// Electrical job of a storage cell: the capacitance of a cylinder electrode and the bit-line signal
// it gives, at read and after the refresh interval; the capacitance and height the requirement
// takes. Fins and through-silicon vias follow; isolation trenches are in isolation.ts.
//
// Capacitance of each electrode wall as a cylindrical (coaxial) capacitor per unit height,
// 2π·ε₀·k / ln(r_outer/r_inner) (Gauss's law; e.g. Griffiths, Introduction to Electrodynamics,
// ch. 2), summed up the tapered wall; the floor as a parallel plate ε₀·k·A/t; charge sharing with
// the bit line ΔV = (V_cell − V_pre)·C_s/(C_s + C_BL) (e.g. Rabaey, Chandrakasan & Nikolić, Digital
// Integrated Circuits, ch. 12 [memory for chapter]).
import { noted, noValue, variant, type Engine, type NoValue, type QuantityDef, type Shape } from '../quantity.ts';
import { cavity } from '../geometry/index.ts';
import { integrate } from '../numeric.ts';

/** Permittivity of free space, CODATA 2018 (F/m). */
export const EPSILON_0 = 8.8541878128e-12;
/** Elementary charge (C) and Boltzmann's constant (J/K), exact since the SI of 2019. */
export const Q = 1.602176634e-19;
const KB = 1.380649e-23;

// Silicon at 300 K, one choice for every quantity of this folder: Sze & Ng, Physics of
// Semiconductor Devices, 3rd ed., Appendix G [memory for the appendix] list ε_Si = 11.9 and
// n_i = 9.65e9 cm⁻³. Many texts use 11.7, which would narrow every depletion width by 0.85 %.
export const SI_RELATIVE_PERMITTIVITY = 11.9;
export const EPS_SI = SI_RELATIVE_PERMITTIVITY * EPSILON_0;
export const N_I = 9.65e15; // m⁻³
const TEMPERATURE = 300; // K
/** Thermal voltage k_BT/q at 300 K. */
export const THERMAL_VOLTAGE = (KB * TEMPERATURE) / Q;
/** The silicon facts above as a reader sees them among a quantity's assumptions. */
export const SILICON_FACTS = `Silicon at 300 K: ε_Si = ${SI_RELATIVE_PERMITTIVITY}·ε₀, n_i = 9.65e9 cm⁻³ (Sze & Ng, 3rd ed., Appendix G; 11.7·ε₀ is also quoted).`;

/**
 * Where f, negative at lo and not at hi, changes sign, by bisection to 1e-13 of hi: the last x
 * found with f(x) < 0 (so a predicate written as −1/+1 gives a point where it still holds).
 */
function bisect(f: (x: number) => number, lo: number, hi: number): number {
  // Stryker disable next-line all: the cap and the tolerance only stop halving; past 1e-13 the point no longer moves by a printed digit
  for (let i = 0; i < 200 && hi - lo > 1e-13 * hi; i++) {
    const mid = (lo + hi) / 2;
    // Stryker disable next-line EqualityOperator: f exactly 0 at a midpoint is not a case
    if (f(mid) < 0) lo = mid;
    else hi = mid;
  }
  return lo;
}

export interface CellGeometry {
  /** Outer diameter of the electrode at its top and at its base, its height and wall (measured across). */
  cd: number;
  bottom: number;
  height: number;
  wall: number;
  /** Thickness (measured across) and relative permittivity of the dielectric. */
  thickness: number;
  k: number;
}

/** What a unit of wall height gives at radius r outside and inside the electrode, and the floor of radius r. */
interface SurfaceModel {
  outer: (r: number) => number;
  inner: (r: number) => number;
  floor: (r: number) => number;
}

/** Coaxial walls (the film around the outer wall, within the inner one); the floor a plate inside the inner film. */
function coaxial({ thickness: t, k }: CellGeometry): SurfaceModel {
  const c = 2 * Math.PI * EPSILON_0 * k;
  return { outer: (r) => c / Math.log((r + t) / r), inner: (r) => c / Math.log(r / (r - t)), floor: (r) => (EPSILON_0 * k * Math.PI * (r - t) ** 2) / t };
}

/** Parallel plates of the electrode's own area: the approximation the derivation compares with. */
function plates({ thickness: t, k }: CellGeometry): SurfaceModel {
  const plate = (area: number) => (EPSILON_0 * k * area) / t;
  return { outer: (r) => plate(2 * Math.PI * r), inner: (r) => plate(2 * Math.PI * r), floor: (r) => plate(Math.PI * r * r) };
}

/**
 * Each electrode surface summed up its straight tapered wall: the outer radius runs from CD_b/2 at
 * the base to CD/2 at the top, the inner one from the cavity's floor to its rim. Inner wall and
 * floor give nothing where no plate fits inside (the quantities say so before they get here).
 */
function surfaces(g: CellGeometry, m: SurfaceModel): { outer: number; inner: number; bottom: number } {
  const outer = integrate((z) => m.outer(g.bottom / 2 + ((g.cd - g.bottom) * z) / (2 * g.height)), 0, g.height, 4);
  const c = cavity(g.cd, g.bottom, g.height, g.wall);
  // Stryker disable next-line EqualityOperator: a film exactly as thick as the radius is refused before (noRoomForPlate)
  if ('reason' in c || Math.min(c.top, c.bottom) / 2 <= g.thickness) return { outer, inner: 0, bottom: 0 };
  const inner = integrate((z) => m.inner(c.bottom / 2 + ((c.top - c.bottom) * z) / (2 * c.depth)), 0, c.depth, 4);
  return { outer, inner, bottom: m.floor(c.bottom / 2) };
}

/** Capacitance of each electrode surface: coaxial up the tapered walls, a parallel plate on the floor. */
export function surfaceCapacitances(g: CellGeometry): { outer: number; inner: number; bottom: number } {
  return surfaces(g, coaxial(g));
}

/** Signal of the weaker stored state: min(p, 1 − p)·V·C_s/(C_s + C_BL), less the charge leaked. */
export function bitlineSignal(cs: number, cbl: number, v: number, precharge: number, leakedCharge = 0): number {
  const swing = Math.min(precharge, 1 - precharge) * v;
  return (swing * cs - leakedCharge) / (cs + cbl);
}

const CELL_SOURCE = 'Charge sharing with the bit line, ΔV = (V_cell − V_pre)·C_s/(C_s + C_BL) (e.g. Rabaey, Chandrakasan & Nikolić, Digital Integrated Circuits, 2nd ed., memory chapter; chapter recalled)';
const COAX_SOURCE = 'Coaxial capacitor 2π·ε₀·k·h/ln(r₂/r₁) (Gauss’s law; e.g. Griffiths, Introduction to Electrodynamics, ch. 2), per unit height along the taper; floor as a parallel plate; ε₀ from CODATA 2018';
const TAPER_ASSUMPTION = 'Straight tapered walls (from the base CD to the top CD), each height slice a long coaxial capacitor at its own radius, with the wall and dielectric thickness measured across (normal to a wall within 1° of vertical they differ by under 0.02 %); the outer wall faces the plate over the full height, the inner one from the floor (one wall thick) up; fringe fields at the rim and the corner at the floor ignored.';

const cellInputs = {
  cd: 'geometry.cd',
  bottom: 'geometry.bottom_cd',
  wall: 'geometry.wall',
  height: 'geometry.height',
  thickness: 'cell.dielectric_thickness',
  k: 'cell.dielectric_dielectric_constant',
};
const circuitInputs = { cbl: 'cell.bitline_capacitance', v: 'cell.array_voltage', p: 'cell.precharge' };
const SYMBOLS: Record<string, string> = {
  cd: '\\mathrm{CD}',
  wall: 't_w',
  height: 'H',
  thickness: 't_d',
  k: 'k',
  space: 's',
  bottom: '\\mathrm{CD}_b',
  cs: 'C_s',
  cbl: 'C_{BL}',
  v: 'V_{DD}',
  p: 'p',
  leak: 'I_{leak}',
  refresh: 't_{ref}',
  required: '\\Delta V_{req}',
  creq: 'C_{req}',
};

function cellOnly(shape: Shape): { notApplicable: string } | { incomplete: string[] } | null {
  if (shape.kind !== 'cylinder') return { notApplicable: 'a storage cell is a hollow cylinder electrode' };
  if (!shape.cell) return { incomplete: ['cell'] };
  return null;
}

/** The inputs a cell's capacitance reads: the gap to the neighbours bounds the film on the outer wall. */
function cellInputsOf(shape: Shape): Record<string, string> {
  return { ...cellInputs, ...(shape.cell!.surfaces.includes('outer') ? { space: 'geometry.space' } : {}) };
}

function cellOf(a: Record<string, number>): CellGeometry {
  return { cd: a.cd!, bottom: a.bottom!, height: a.height!, wall: a.wall!, thickness: a.thickness!, k: a.k! };
}

function capacitanceOf(shape: Shape, a: Record<string, number>, model: (g: CellGeometry) => SurfaceModel = coaxial): number {
  const g = cellOf(a);
  const c = surfaces(g, model(g));
  return shape.cell!.surfaces.reduce((sum, s) => sum + c[s], 0);
}

/**
 * Why the dielectric leaves no room for the plate electrode on a surface it is written on, if it
 * does not: inside, it fills the cup (r_i ≤ t_d); outside, the films of neighbouring cylinders
 * meet across the gap (s ≤ 2·t_d). A capacitor without a plate has no capacitance to give.
 */
function noRoomForPlate(shape: Shape, a: Record<string, number>): string | null {
  const surfaces = shape.cell!.surfaces;
  // A gap of a billionth of the radius is no gap (and floating-point noise must not open one).
  // Stryker disable next-line EqualityOperator: a gap of exactly a billionth is not a case
  const room = (gap: number, of: number) => gap > 1e-9 * of;
  // Inside, the narrowest inner radius counts: a re-entrant cup narrows toward its floor, and no
  // plate may be counted where none fits.
  if (surfaces.includes('inner') || surfaces.includes('bottom')) {
    const c = cavity(a.cd!, a.bottom!, a.height!, a.wall!);
    if ('reason' in c) return c.reason;
    const ri = Math.min(c.top, c.bottom) / 2;
    if (!room(ri - a.thickness!, ri)) {
      return 'the dielectric fills the cup where it is narrowest (it is at least as thick as the inner radius there): there is no room for a plate electrode inside';
    }
  }
  if (surfaces.includes('outer') && !room(a.space! - 2 * a.thickness!, a.space!)) {
    return 'the dielectric films of neighbouring cylinders meet across the gap (the space is not more than twice the dielectric thickness): there is no room for a plate electrode between them';
  }
  return null;
}

const storageCapacitance: QuantityDef = {
  name: 'electrical.storage_capacitance',
  title: 'Storage capacitance',
  unit: 'F',
  symbol: 'C_s',
  description: 'Capacitance of the cylinder electrode over the surfaces that carry the dielectric: each wall as a coaxial capacitor summed up its taper, the floor as a parallel plate.',
  source: COAX_SOURCE,
  assumptions: [TAPER_ASSUMPTION],
  better: 'higher',
  sweep: { input: () => 'geometry.height', from: 0.25, to: 2 },
  variant: (shape) => {
    const no = cellOnly(shape);
    if (no) return no;
    const surfaces = shape.cell!.surfaces;
    const terms: Record<string, string> = {
      outer: '\\int_0^H \\frac{2\\pi\\varepsilon_0 k\\,dz}{\\ln\\frac{r_o + t_d}{r_o}}',
      inner: '\\int_{t_w}^H \\frac{2\\pi\\varepsilon_0 k\\,dz}{\\ln\\frac{r_i}{r_i - t_d}}',
      bottom: '\\frac{\\varepsilon_0 k \\pi (r_f - t_d)^2}{t_d}',
    };
    return variant({
      label: `electrode surfaces: ${surfaces.join(', ')}`,
      inputs: cellInputsOf(shape),
      symbols: SYMBOLS,
      formula: `C_s = ${surfaces.map((s) => terms[s]).join(' + ')},\\;\\; r_o(z) = \\tfrac{1}{2}\\left[\\mathrm{CD}_b + (\\mathrm{CD} - \\mathrm{CD}_b)\\tfrac{z}{H}\\right],\\; r_i = r_o - t_w,\\; r_f = r_i(t_w)`,
      compute: (a: Record<string, number>) => {
        const full = noRoomForPlate(shape, a);
        if (full) return noValue(full);
        const coax = capacitanceOf(shape, a);
        const plate = capacitanceOf(shape, a, plates);
        // Stryker disable next-line EqualityOperator: when the two are equal the size printed is 0.0 % either way
        return noted(coax, `a parallel-plate estimate on the electrode's own area would give ${Math.abs((plate / coax - 1) * 100).toFixed(1)} % ${plate >= coax ? 'more' : 'less'}`);
      },
    });
  },
};

const senseSignal: QuantityDef = {
  name: 'electrical.sense_signal',
  title: 'Sense signal on the bit line',
  unit: 'V',
  symbol: '\\Delta V',
  description: 'Bit-line signal of the weaker stored state right after writing: the smaller of the 1 and 0 swings from the precharge level, shared with the bit line.',
  source: CELL_SOURCE,
  better: 'higher',
  sweep: { input: () => 'geometry.height', from: 0.25, to: 2 },
  variant: (shape) =>
    cellOnly(shape) ??
    variant({
      inputs: { cs: 'electrical.storage_capacitance', ...circuitInputs },
      symbols: SYMBOLS,
      formula: '\\Delta V = \\min(p, 1 - p)\\,V_{DD}\\,\\frac{C_s}{C_s + C_{BL}}',
      compute: ({ cs, cbl, v, p }) => bitlineSignal(cs, cbl, v, p),
    }),
};

const retentionSignal: QuantityDef = {
  name: 'electrical.retention_signal',
  title: 'Signal after the refresh interval',
  unit: 'V',
  symbol: '\\Delta V_{ret}',
  description: 'Bit-line signal of the weaker stored state after the cell has leaked for one refresh interval.',
  source: `${CELL_SOURCE}; charge lost I_leak·t_ref`,
  assumptions: ['Constant leakage current over the interval.'],
  better: 'higher',
  sweep: { input: () => 'cell.refresh_interval', from: 0, to: 2 },
  extraSweep: { input: () => 'geometry.height', from: 0.25, to: 2 },
  variant: (shape) =>
    cellOnly(shape) ??
    variant({
      inputs: { cs: 'electrical.storage_capacitance', ...circuitInputs, leak: 'cell.leakage_current', refresh: 'cell.refresh_interval' },
      symbols: SYMBOLS,
      formula: '\\Delta V_{ret} = \\frac{\\min(p, 1-p)\\,V_{DD}\\,C_s - I_{leak}\\,t_{ref}}{C_s + C_{BL}}',
      compute: ({ cs, cbl, v, p, leak, refresh }) => bitlineSignal(cs, cbl, v, p, leak * refresh),
    }),
};

const requiredCapacitance: QuantityDef = {
  name: 'electrical.required_capacitance',
  title: 'Capacitance the signal requirement takes',
  unit: 'F',
  symbol: 'C_{req}',
  description: 'Smallest storage capacitance that still leaves the required signal at the end of the refresh interval.',
  source: `${CELL_SOURCE}, solved for C_s`,
  better: 'lower',
  variant: (shape) =>
    cellOnly(shape) ??
    variant({
      inputs: { ...circuitInputs, leak: 'cell.leakage_current', refresh: 'cell.refresh_interval', required: 'cell.required_signal' },
      symbols: SYMBOLS,
      formula: 'C_{req} = \\frac{\\Delta V_{req}\\,C_{BL} + I_{leak}\\,t_{ref}}{\\min(p, 1-p)\\,V_{DD} - \\Delta V_{req}}',
      compute: ({ cbl, v, p, leak, refresh, required }) => {
        const headroom = Math.min(p, 1 - p) * v - required;
        if (headroom <= 0) return noValue('the required signal is not below the swing from the precharge level: no capacitance reaches it', 'above');
        return (required * cbl + leak * refresh) / headroom;
      },
    }),
};

/**
 * The cell's inputs at another height: the same straight wall down from the same top, cut or
 * extended at the base; the gap to the neighbours follows the widest CD (s = p − max(CD, CD_b)).
 */
function atHeight(a: Record<string, number>, h: number): Record<string, number> {
  const bottom = a.cd! + ((a.bottom! - a.cd!) * h) / a.height!;
  const widest = (base: number) => Math.max(a.cd!, base);
  // Stryker disable next-line ConditionalExpression: without an outer wall the space is never read
  return { ...a, height: h, bottom, ...(a.space !== undefined ? { space: a.space + widest(a.bottom!) - widest(bottom) } : {}) };
}

const requiredHeight: QuantityDef = {
  name: 'electrical.required_height',
  title: 'Height the signal requirement takes',
  unit: 'm',
  symbol: 'H_{req}',
  description: 'Height of the cylinder at its top CD, taper, wall and dielectric that would just meet the signal requirement at the end of the refresh interval (the storage capacitance grows with the height; the height is found by bisection).',
  source: `${COAX_SOURCE}; inverted for the height`,
  assumptions: [`${TAPER_ASSUMPTION} The taper continues at the same angle below the structure's base when the cell must be taller.`],
  better: 'lower',
  variant: (shape) => {
    const no = cellOnly(shape);
    if (no) return no;
    return variant({
      inputs: { ...cellInputsOf(shape), creq: 'electrical.required_capacitance' },
      symbols: SYMBOLS,
      formula: 'C_s(H_{req}) = C_{req}',
      compute: (a: Record<string, number>) => {
        const full = noRoomForPlate(shape, a);
        if (full) return noValue(full);
        const fits = (h: number) => atHeight(a, h).bottom! > 0 && noRoomForPlate(shape, atHeight(a, h)) === null;
        const short = (h: number) => capacitanceOf(shape, atHeight(a, h)) - a.creq!;
        // A shorter cell fits wherever this one does (its base is nearer the top's CD); a cup is
        // at least one wall tall, and one that low already meeting the requirement needs no more.
        let lo = shape.cell!.surfaces.some((s) => s !== 'outer') ? a.wall! : 0;
        // Stryker disable next-line all: bisection from a point that already meets the requirement returns that point too
        if (lo > 0 && short(lo * (1 + 1e-9)) >= 0) return lo;
        let hi = a.height!;
        // Stryker disable next-line EqualityOperator: a 61st doubling, or a cell meeting the requirement exactly, ends the same
        for (let i = 0; i < 60 && short(hi) < 0; i++) {
          if (!fits(2 * hi)) {
            // Taller, the taper closes the cup or the gap: the tallest cell that still fits must do.
            // Stryker disable next-line ArithmeticOperator: any bracket above the cell that no longer fits finds the same edge
            const tallest = bisect((h) => (fits(h) ? -1 : 1), hi, 2 * hi);
            // Stryker disable next-line EqualityOperator: the tallest cell meeting the requirement exactly is not a case
            if (short(tallest) < 0) return noValue(`no height reaches the required capacitance: above ${(tallest * 1e9).toFixed(0)} nm the taper leaves no room for the plate electrode`, 'above');
            [lo, hi] = [hi, tallest];
            break;
          }
          // Stryker disable next-line ArithmeticOperator: a wider bracket finds the same root (the tolerance shrinks with the bracket)
          [lo, hi] = [hi, 2 * hi];
        }
        // Stryker disable next-line EqualityOperator: meeting the requirement exactly is not a case
        if (short(hi) < 0) return noValue('the electrode surfaces chosen do not grow with the height', 'above');
        return bisect(short, lo, hi);
      },
    });
  },
};

// ── Fins ──────────────────────────────────────────────────────────────────────────────────────

const effectiveWidth: QuantityDef = {
  name: 'electrical.effective_width',
  title: 'Effective channel width per fin',
  unit: 'm',
  symbol: 'W_{eff}',
  description: 'Gate-controlled channel width of one fin in a tri-gate device: both sidewalls and the top.',
  source: 'Tri-gate fin: W_eff = 2·H_fin + W_fin (common practice; 2·H_fin with a thick top mask)',
  better: 'higher',
  variant: (shape) =>
    shape.kind !== 'line'
      ? { notApplicable: 'fins are lines' }
      : variant({
          inputs: { height: 'geometry.height', cd: 'geometry.cd' },
          symbols: { height: 'H', cd: 'W' },
          formula: 'W_{eff} = 2H + W',
          compute: ({ height, cd }) => 2 * height + cd,
        }),
};

const widthPerFootprint: QuantityDef = {
  name: 'electrical.effective_width_per_footprint',
  title: 'Effective width per unit of footprint',
  unit: '1',
  symbol: 'W_{eff}/p',
  description: 'Channel width a fin array gives per unit of layout width: the reason fins are tall.',
  source: 'Tri-gate fin array: (2·H_fin + W_fin)/p (common practice)',
  better: 'higher',
  sweep: { input: () => 'geometry.height', from: 0.5, to: 2 },
  variant: (shape) =>
    shape.kind !== 'line'
      ? { notApplicable: 'fins are lines' }
      : variant({
          inputs: { width: 'electrical.effective_width', pitch: 'geometry.pitch' },
          symbols: { width: 'W_{eff}', pitch: 'p' },
          formula: '\\frac{W_{eff}}{p}',
          compute: ({ width, pitch }) => width / pitch,
        }),
};

// ── Through-silicon vias ──────────────────────────────────────────────────────────────────────

/** Permeability of free space, CODATA 2018 (H/m). */
export const MU_0 = 1.25663706212e-6;

/**
 * Partial self-inductance of a straight round conductor of length l and radius r with uniform
 * current (internal part μ₀l/8π included): (μ₀/2π)[l·asinh(l/r) − √(l² + r²) + r + l/4]; for l ≫ r
 * it is Rosa's (μ₀l/2π)[ln(2l/r) − 3/4] (Rosa, Bull. Bur. Stand. 4, 301 (1908); Grover, Inductance
 * Calculations).
 */
export function wireInductance(length: number, radius: number): number {
  return (MU_0 / (2 * Math.PI)) * (length * Math.asinh(length / radius) - Math.hypot(length, radius) + radius + length / 4);
}

const viaInputs = { cd: 'geometry.cd', bottom: 'geometry.bottom_cd', depth: 'geometry.depth', liner: 'via.liner_thickness' };
const VIA_SYMBOLS: Record<string, string> = { cd: '\\mathrm{CD}', bottom: '\\mathrm{CD}_b', depth: 'L', liner: 't_l', rho: '\\rho', k: 'k_l', r: 'R', c: 'C_{ox}' };

function viaOnly(shape: Shape): { notApplicable: string } | { incomplete: string[] } | null {
  if (shape.kind !== 'via') return { notApplicable: 'via parasitics concern through-silicon vias' };
  if (!shape.via) return { incomplete: ['via'] };
  return null;
}

const viaResistance: QuantityDef = {
  name: 'electrical.via_resistance',
  title: 'Via resistance',
  unit: 'ohm',
  symbol: 'R',
  description: 'DC resistance of the via conductor inside its liner, along its taper.',
  source: 'R = ρ∫dz/(π r(z)²) = ρL/(π·r_top·r_bottom) for a straight taper (Ohm’s law for a cone frustum)',
  assumptions: ['Uniform current; resistivity of the fill as given (grain and barrier effects included only through it).'],
  better: 'lower',
  sweep: { input: () => 'geometry.depth', from: 0.25, to: 2 },
  variant: (shape) =>
    viaOnly(shape) ??
    variant({
      inputs: { ...viaInputs, rho: 'via.conductor_resistivity' },
      symbols: VIA_SYMBOLS,
      formula: 'R = \\frac{\\rho L}{\\pi\\,(\\mathrm{CD}/2 - t_l)(\\mathrm{CD}_b/2 - t_l)}',
      compute: ({ cd, bottom, depth, liner, rho }) => {
        const r1 = cd / 2 - liner;
        const r2 = bottom / 2 - liner;
        // Stryker disable next-line EqualityOperator,ConditionalExpression: a conductor radius not above 0 is caught before (the liner fills the via)
        return r1 > 0 && r2 > 0 ? (rho * depth) / (Math.PI * r1 * r2) : noValue('the liner fills the via: no conductor left');
      },
    }),
};

/**
 * Why no conductor runs the whole depth, if none does: the liner closes the via at its narrowest
 * (usually the bottom of a tapered hole), so no model of a conductor inside the liner applies.
 */
function linerFills(cd: number, bottom: number, liner: number): NoValue | null {
  const narrowest = Math.min(cd, bottom) / 2;
  // Stryker disable next-line EqualityOperator,ArithmeticOperator: the billionth only keeps floating-point noise from opening a via its liner exactly fills
  if (narrowest > liner * (1 + 1e-9)) return null;
  return noValue(`the liner fills the via ${bottom < cd ? 'toward its bottom' : 'at its top'} (its narrowest radius is not more than the liner): no conductor runs the whole depth`);
}

const LINER_SOURCE = 'Coaxial capacitor 2π·ε₀·k·L/ln(r_ox/r_cu) (Gauss’s law; Katti et al., IEEE Trans. Electron Devices 57, 256 (2010))';

const viaCapacitance: QuantityDef = {
  name: 'electrical.via_capacitance',
  title: 'Via liner capacitance (oxide only: upper bound)',
  unit: 'F',
  symbol: 'C_{ox}',
  description: 'Capacitance between the via conductor and the silicon across the liner alone, as a coaxial capacitor at the top (widest) CD along the whole depth: an upper bound of the via’s capacitance, reached only when the silicon at the liner is accumulated. With the substrate doping given, electrical.via_min_capacitance adds the depleted silicon in series.',
  source: `${LINER_SOURCE}; the depletion capacitance Katti et al. add in series is left out`,
  assumptions: [
    'Liner only: the silicon is taken as a conductor at the liner, so the series depletion capacitance (which can only lower C) is left out.',
    'Top (widest) CD along the whole depth: the narrower liner toward the bottom of a tapered via would lower C too.',
  ],
  better: 'lower',
  sweep: { input: () => 'via.liner_thickness', from: 0.25, to: 3 },
  variant: (shape) =>
    viaOnly(shape) ??
    variant({
      inputs: { cd: 'geometry.cd', bottom: 'geometry.bottom_cd', depth: 'geometry.depth', liner: 'via.liner_thickness', k: 'via.liner_dielectric_constant' },
      symbols: VIA_SYMBOLS,
      formula: 'C_{ox} = \\frac{2\\pi\\varepsilon_0 k_l L}{\\ln\\frac{\\mathrm{CD}/2}{\\mathrm{CD}/2 - t_l}}',
      compute: ({ cd, bottom, depth, liner, k }) => linerFills(cd, bottom, liner) ?? (2 * Math.PI * EPSILON_0 * k * depth) / Math.log(cd / 2 / (cd / 2 - liner)),
    }),
};

/** Surface potential at the onset of strong inversion, 2φ_F = 2(k_BT/q)·ln(N/n_i) (Sze & Ng, ch. 4). */
export function inversionPotential(doping: number): number {
  return 2 * THERMAL_VOLTAGE * Math.log(doping / N_I);
}

/**
 * Outer radius of the silicon depleted around a liner of outer radius r at surface potential ψ
 * (depletion approximation). Gauss's law in the annulus gives E(ρ) = qN(r_d² − ρ²)/(2ε_Si·ρ), so
 * ψ = (qN/2ε_Si)[r_d²·ln(r_d/r) − (r_d² − r²)/2] (the cylindrical solution Katti et al. use),
 * solved for r_d. ψ grows with r_d, and the annulus is never thicker than a planar depletion layer
 * at the same ψ (its field is the stronger), which brackets the root.
 */
export function depletionRadius(r: number, doping: number, psi: number): number {
  const excess = (rd: number) => ((Q * doping) / (2 * EPS_SI)) * (rd * rd * Math.log(rd / r) - (rd * rd - r * r) / 2) - psi;
  // Stryker disable next-line ArithmeticOperator: the planar width brackets the (thinner) cylindrical layer; a wider bracket finds the same root
  return bisect(excess, r, r + Math.sqrt((2 * EPS_SI * psi) / (Q * doping)));
}

/** Per unit length at liner radius r: the liner (conductor radius r − t) in series with the silicon depleted to inversion onset. */
function depletedPerLength(r: number, liner: number, k: number, doping: number): number {
  const oxide = (2 * Math.PI * EPSILON_0 * k) / Math.log(r / (r - liner));
  const silicon = (2 * Math.PI * EPS_SI) / Math.log(depletionRadius(r, doping, inversionPotential(doping)) / r);
  return 1 / (1 / oxide + 1 / silicon);
}

const viaMinCapacitance: QuantityDef = {
  name: 'electrical.via_min_capacitance',
  title: 'Via capacitance at maximum depletion (high-frequency minimum)',
  unit: 'F',
  symbol: 'C_{min}',
  description: 'Capacitance between the via conductor and the silicon when the silicon around the liner is depleted as deeply as a high-frequency signal sees it (at the onset of inversion): the liner in series with the cylindrical depletion layer, summed along the tapered depth. The oxide-only liner capacitance is its upper bound.',
  source: 'Katti et al., IEEE Trans. Electron Devices 57, 256 (2010): liner 2π·ε₀·k·L/ln(r_ox/r_cu) in series with the depletion layer 2π·ε_Si·L/ln(r_dep/r_ox), r_dep from the cylindrical Poisson equation; the deepest depletion at the surface potential 2φ_F of inversion onset (Sze & Ng, Physics of Semiconductor Devices, 3rd ed., ch. 4)',
  assumptions: [
    'Depletion approximation in uniformly doped silicon of either type, the via biased toward inversion. The inversion charge does not follow a high-frequency signal, so the depletion at inversion onset is the deepest it sees: the minimum of the high-frequency C–V curve. Oxide charge, interface states and the work-function difference move the bias at which the minimum is reached, not the minimum; a fast sweep into deep depletion goes lower.',
    'Each depth slice a long coaxial capacitor at its own liner radius (the taper followed); no neighbouring via within the depletion radius.',
    SILICON_FACTS,
  ],
  better: 'lower',
  sweep: { input: () => 'via.substrate_doping', from: 0.1, to: 10 },
  variant: (shape) =>
    viaOnly(shape) ??
    variant({
      inputs: { cd: 'geometry.cd', bottom: 'geometry.bottom_cd', depth: 'geometry.depth', liner: 'via.liner_thickness', k: 'via.liner_dielectric_constant', n: 'via.substrate_doping' },
      symbols: { ...VIA_SYMBOLS, n: 'N' },
      formula:
        'C_{min} = \\int_0^L \\left[\\frac{\\ln\\frac{r}{r - t_l}}{2\\pi\\varepsilon_0 k_l} + \\frac{\\ln\\frac{r_d}{r}}{2\\pi\\varepsilon_{Si}}\\right]^{-1} dz,\\;\\; r(z) = \\tfrac{1}{2}\\left[\\mathrm{CD} + (\\mathrm{CD}_b - \\mathrm{CD})\\tfrac{z}{L}\\right],\\;\\; \\frac{qN}{2\\varepsilon_{Si}}\\left[r_d^2\\ln\\frac{r_d}{r} - \\frac{r_d^2 - r^2}{2}\\right] = 2\\frac{k_BT}{q}\\ln\\frac{N}{n_i}',
      compute: ({ cd, bottom, depth, liner, k, n }) => {
        const fills = linerFills(cd, bottom, liner);
        if (fills) return fills;
        // Stryker disable next-line EqualityOperator: a doping of exactly n_i is not a case
        if (!(n > N_I)) return noValue('the substrate doping is not above the intrinsic density: no depletion layer forms');
        return integrate((z) => depletedPerLength((cd + ((bottom - cd) * z) / depth) / 2, liner, k, n), 0, depth, 2);
      },
    }),
};

const viaInductance: QuantityDef = {
  name: 'electrical.via_inductance',
  title: 'Via partial self-inductance',
  unit: 'H',
  symbol: 'L_p',
  description: 'Partial self-inductance of the via conductor as a straight round wire.',
  source: 'Rosa, Bull. Bur. Stand. 4, 301 (1908); Grover, Inductance Calculations: (μ₀/2π)[l·asinh(l/r) − √(l² + r²) + r + l/4]',
  assumptions: ['Uniform (low-frequency) current; mean conductor radius; the return path is not included (partial inductance).'],
  better: 'lower',
  variant: (shape) =>
    viaOnly(shape) ??
    variant({
      inputs: viaInputs,
      symbols: VIA_SYMBOLS,
      formula: 'L_p = \\frac{\\mu_0}{2\\pi}\\left[L\\,\\mathrm{asinh}\\frac{L}{r} - \\sqrt{L^2 + r^2} + r + \\frac{L}{4}\\right],\\;\\; r = \\frac{\\mathrm{CD} + \\mathrm{CD}_b}{4} - t_l',
      compute: ({ cd, bottom, depth, liner }) => linerFills(cd, bottom, liner) ?? wireInductance(depth, (cd + bottom) / 4 - liner),
    }),
};

const viaRc: QuantityDef = {
  name: 'electrical.via_rc',
  title: 'Via RC product',
  unit: 's',
  symbol: 'RC',
  description: 'Resistance times the oxide-only liner capacitance of the via (its upper bound): the largest intrinsic delay scale.',
  source: 'R·C of the via resistance and the oxide-only liner capacitance',
  better: 'lower',
  variant: (shape) =>
    viaOnly(shape) ??
    variant({
      inputs: { r: 'electrical.via_resistance', c: 'electrical.via_capacitance' },
      symbols: VIA_SYMBOLS,
      formula: '\\tau = R\\,C_{ox}',
      compute: ({ r, c }) => r * c,
    }),
};

export const electricalEngine: Engine = {
  id: 'electrical',
  title: 'Electrical: cells, fins and vias',
  summary: 'Storage-cell capacitance (coaxial surfaces along the taper) and bit-line signal at read and after refresh, the capacitance and height the requirement takes; fin effective width; via resistance, liner capacitance (oxide-only upper bound, and the high-frequency minimum with the silicon depleted), inductance and RC.',
  quantities: [storageCapacitance, senseSignal, retentionSignal, requiredCapacitance, requiredHeight, effectiveWidth, widthPerFootprint, viaResistance, viaCapacitance, viaMinCapacitance, viaInductance, viaRc],
};
