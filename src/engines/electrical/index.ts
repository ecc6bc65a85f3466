// Electrical job of a storage cell: the capacitance of a cylinder electrode and the bit-line signal
// it gives, at read and after the refresh interval; the capacitance and height the requirement
// takes. (Isolation, fins and vias come next; see the project notes.)
//
// Capacitance of each electrode surface as a cylindrical (coaxial) capacitor,
// C = 2π·ε₀·k·h / ln(r_outer/r_inner) (Gauss's law; e.g. Griffiths, Introduction to
// Electrodynamics, ch. 2), the floor as a parallel plate ε₀·k·A/t; charge sharing with the bit line
// ΔV = (V_cell − V_pre)·C_s/(C_s + C_BL) (e.g. Rabaey, Chandrakasan & Nikolić, Digital Integrated
// Circuits, ch. 12 [memory for chapter]).
import { noted, noValue, variant, type Engine, type NoValue, type QuantityDef, type Shape } from '../quantity.ts';
import { cavity } from '../geometry/index.ts';

/** Permittivity of free space, CODATA 2018 (F/m). */
export const EPSILON_0 = 8.8541878128e-12;

export interface CellGeometry {
  /** Outer diameter of the electrode, its wall, its height. */
  cd: number;
  wall: number;
  height: number;
  thickness: number;
  k: number;
}

/** Capacitance of each electrode surface: coaxial for the walls, parallel plate for the floor. */
export function surfaceCapacitances(g: CellGeometry): { outer: number; inner: number; bottom: number } {
  const ro = g.cd / 2;
  const ri = g.cd / 2 - g.wall;
  const outer = (2 * Math.PI * EPSILON_0 * g.k * g.height) / Math.log((ro + g.thickness) / ro);
  const inner = ri > g.thickness ? (2 * Math.PI * EPSILON_0 * g.k * (g.height - g.wall)) / Math.log(ri / (ri - g.thickness)) : 0;
  const bottom = ri > g.thickness ? (EPSILON_0 * g.k * Math.PI * (ri - g.thickness) ** 2) / g.thickness : 0;
  return { outer, inner, bottom };
}

/** The same surfaces as parallel plates of the electrode's own area (the approximation compared). */
export function parallelPlateCapacitances(g: CellGeometry): { outer: number; inner: number; bottom: number } {
  const ro = g.cd / 2;
  const ri = g.cd / 2 - g.wall;
  const plate = (area: number) => (EPSILON_0 * g.k * area) / g.thickness;
  return { outer: plate(2 * Math.PI * ro * g.height), inner: plate(2 * Math.PI * ri * (g.height - g.wall)), bottom: plate(Math.PI * ri * ri) };
}

/** Signal of the weaker stored state: min(p, 1 − p)·V·C_s/(C_s + C_BL), less the charge leaked. */
export function bitlineSignal(cs: number, cbl: number, v: number, precharge: number, leakedCharge = 0): number {
  const swing = Math.min(precharge, 1 - precharge) * v;
  return (swing * cs - leakedCharge) / (cs + cbl);
}

const CELL_SOURCE = 'Charge sharing with the bit line, ΔV = (V_cell − V_pre)·C_s/(C_s + C_BL) (e.g. Rabaey, Chandrakasan & Nikolić, Digital Integrated Circuits, 2nd ed., memory chapter; chapter recalled)';
const COAX_SOURCE = 'Coaxial capacitor 2π·ε₀·k·h/ln(r₂/r₁) (Gauss’s law; e.g. Griffiths, Introduction to Electrodynamics, ch. 2); floor as a parallel plate; ε₀ from CODATA 2018';

const cellInputs = {
  cd: 'geometry.cd',
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

function capacitanceOf(shape: Shape, a: Record<string, number>): number {
  const c = surfaceCapacitances({ cd: a.cd!, wall: a.wall!, height: a.height!, thickness: a.thickness!, k: a.k! });
  return shape.cell!.surfaces.reduce((sum, s) => sum + c[s], 0);
}

/**
 * Why the dielectric leaves no room for the plate electrode on a surface it is written on, if it
 * does not: inside, it fills the cup (r_i ≤ t_d); outside, the films of neighbouring cylinders
 * meet across the gap (s ≤ 2·t_d). A capacitor without a plate has no capacitance to give.
 */
function noRoomForPlate(shape: Shape, a: Record<string, number>): string | null {
  const surfaces = shape.cell!.surfaces;
  // Inside, the narrowest inner radius counts: a tapered cup narrows toward its floor, and the
  // vertical-wall capacitance must not count a plate where none fits.
  let ri = a.cd! / 2 - a.wall!;
  if (a.bottom !== undefined && (surfaces.includes('inner') || surfaces.includes('bottom'))) {
    const c = cavity(a.cd!, a.bottom, a.height!, a.wall!);
    if ('reason' in c) return c.reason;
    ri = Math.min(c.top, c.bottom) / 2;
  }
  // A gap of a billionth of the radius is no gap (and floating-point noise must not open one).
  const room = (gap: number, of: number) => gap > 1e-9 * of;
  if ((surfaces.includes('inner') || surfaces.includes('bottom')) && !room(ri - a.thickness!, ri)) {
    return 'the dielectric fills the cup where it is narrowest (it is at least as thick as the inner radius there): there is no room for a plate electrode inside';
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
  description: 'Capacitance of the cylinder electrode over the surfaces that carry the dielectric: each wall as a coaxial capacitor, the floor as a parallel plate.',
  source: COAX_SOURCE,
  assumptions: ['Vertical walls at the top CD; the outer wall faces the plate over the full height, the inner one from the floor (one wall thick) up; fringe fields at the rim ignored.'],
  better: 'higher',
  sweep: { input: () => 'geometry.height', from: 0.25, to: 2 },
  variant: (shape) => {
    const no = cellOnly(shape);
    if (no) return no;
    const surfaces = shape.cell!.surfaces;
    const terms: Record<string, string> = {
      outer: '\\frac{2\\pi\\varepsilon_0 k H}{\\ln\\frac{r_o + t_d}{r_o}}',
      inner: '\\frac{2\\pi\\varepsilon_0 k (H - t_w)}{\\ln\\frac{r_i}{r_i - t_d}}',
      bottom: '\\frac{\\varepsilon_0 k \\pi (r_i - t_d)^2}{t_d}',
    };
    return variant({
      label: `electrode surfaces: ${surfaces.join(', ')}`,
      // The gap to the neighbours bounds the dielectric on the outer wall.
      inputs: { ...cellInputs, ...(surfaces.includes('outer') ? { space: 'geometry.space' } : {}), ...(surfaces.includes('inner') || surfaces.includes('bottom') ? { bottom: 'geometry.bottom_cd' } : {}) },
      symbols: SYMBOLS,
      formula: `C_s = ${surfaces.map((s) => terms[s]).join(' + ')},\\;\\; r_o = \\tfrac{\\mathrm{CD}}{2},\\; r_i = r_o - t_w`,
      compute: (a: Record<string, number>) => {
        const full = noRoomForPlate(shape, a);
        if (full) return noValue(full);
        const coax = capacitanceOf(shape, a);
        const g = { cd: a.cd!, wall: a.wall!, height: a.height!, thickness: a.thickness!, k: a.k! };
        const pp = parallelPlateCapacitances(g);
        const plate = shape.cell!.surfaces.reduce((sum, s) => sum + pp[s], 0);
        return noted(coax, `a parallel-plate estimate on the electrode's own area would give ${((plate / coax - 1) * 100).toFixed(1)} % ${plate >= coax ? 'more' : 'less'}`);
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

const requiredHeight: QuantityDef = {
  name: 'electrical.required_height',
  title: 'Height the signal requirement takes',
  unit: 'm',
  symbol: 'H_{req}',
  description: 'Height of the cylinder at its CD, wall and dielectric that would just meet the signal requirement at the end of the refresh interval (the capacitance is linear in the height, so it is solved directly).',
  source: `${COAX_SOURCE}; inverted for the height`,
  better: 'lower',
  variant: (shape) => {
    const no = cellOnly(shape);
    if (no) return no;
    return variant({
      inputs: { ...cellInputs, ...(shape.cell!.surfaces.includes('outer') ? { space: 'geometry.space' } : {}), ...(shape.cell!.surfaces.some((x) => x !== 'outer') ? { bottom: 'geometry.bottom_cd' } : {}), creq: 'electrical.required_capacitance' },
      symbols: SYMBOLS,
      formula: 'C_s(H_{req}) = C_{req},\\;\\; C_s(H) = \\alpha H + \\beta',
      compute: (a: Record<string, number>) => {
        const full = noRoomForPlate(shape, a);
        if (full) return noValue(full);
        // C_s(H) is affine in H: two evaluations give slope and intercept.
        const at = (h: number) => capacitanceOf(shape, { ...a, height: h });
        const beta = at(0);
        const alpha = at(1) - beta;
        if (!(alpha > 0)) return noValue('the electrode surfaces chosen do not grow with the height');
        return (a.creq! - beta) / alpha;
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
const VIA_SYMBOLS: Record<string, string> = { cd: '\\mathrm{CD}', bottom: '\\mathrm{CD}_b', depth: 'L', liner: 't_l', rho: '\\rho', k: 'k_l', r: 'R', c: 'C' };

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
  if (narrowest > liner * (1 + 1e-9)) return null;
  return noValue(`the liner fills the via ${bottom < cd ? 'toward its bottom' : 'at its top'} (its narrowest radius is not more than the liner): no conductor runs the whole depth`);
}

const viaCapacitance: QuantityDef = {
  name: 'electrical.via_capacitance',
  title: 'Via liner capacitance',
  unit: 'F',
  symbol: 'C',
  description: 'Capacitance between the via conductor and the silicon across the liner, as a coaxial capacitor along the depth.',
  source: 'Coaxial capacitor 2π·ε₀·k·L/ln(r_ox/r_cu) (Katti et al., IEEE Trans. Electron Devices 57, 256 (2010), who add the depletion capacitance in series)',
  assumptions: ['Liner only: the series depletion capacitance of the silicon (which lowers C) is not included; top CD along the depth.'],
  better: 'lower',
  sweep: { input: () => 'via.liner_thickness', from: 0.25, to: 3 },
  variant: (shape) =>
    viaOnly(shape) ??
    variant({
      inputs: { cd: 'geometry.cd', bottom: 'geometry.bottom_cd', depth: 'geometry.depth', liner: 'via.liner_thickness', k: 'via.liner_dielectric_constant' },
      symbols: VIA_SYMBOLS,
      formula: 'C = \\frac{2\\pi\\varepsilon_0 k_l L}{\\ln\\frac{\\mathrm{CD}/2}{\\mathrm{CD}/2 - t_l}}',
      compute: ({ cd, bottom, depth, liner, k }) => linerFills(cd, bottom, liner) ?? (2 * Math.PI * EPSILON_0 * k * depth) / Math.log(cd / 2 / (cd / 2 - liner)),
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
  description: 'Resistance times liner capacitance of the via: its intrinsic delay scale.',
  source: 'R·C of the two quantities above',
  better: 'lower',
  variant: (shape) =>
    viaOnly(shape) ??
    variant({
      inputs: { r: 'electrical.via_resistance', c: 'electrical.via_capacitance' },
      symbols: VIA_SYMBOLS,
      formula: '\\tau = R\\,C',
      compute: ({ r, c }) => r * c,
    }),
};

export const electricalEngine: Engine = {
  id: 'electrical',
  title: 'Electrical: cells, fins and vias',
  summary: 'Storage-cell capacitance (coaxial surfaces) and bit-line signal at read and after refresh, the capacitance and height the requirement takes; fin effective width; via resistance, liner capacitance, inductance and RC.',
  quantities: [storageCapacitance, senseSignal, retentionSignal, requiredCapacitance, requiredHeight, effectiveWidth, widthPerFootprint, viaResistance, viaCapacitance, viaInductance, viaRc],
};
