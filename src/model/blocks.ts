// The input blocks of a structure file (`etch:`, `deposition:`, `fill:`, `drying:`, `cell:`, `via:`,
// `isolation:`, `anneal:`, `keep_out:`, `film:`, `wafer:`), each declared once. From these
// declarations come the JSON Schema of the block, the keys the loader accepts (and suggests), which
// kinds a block belongs on, the numeric inputs it gives (`<block>.<name>`, with their SI units and
// defaults), the shape facts engines branch on, and the example shapes of the methods pages.
//
// Adding an input to a block is one line in its `inputs`; adding a block is one entry in BLOCKS
// (and, if it gives shape facts, a field of ShapeFacts, which the compiler then asks for here).
import type { ParamSpec } from './parameters.ts';
import type { DepositionMethod, ElectrodeSurface, Kind, ShapeFacts, SupportHold } from './types.ts';

export type JsonSchema = Record<string, unknown>;

/**
 * A nested part of a block. Its numbers are inputs of the block under the part's name:
 * - `mapping`: `<block>.<part>_<name>` (`etch.ion_angular_spread`);
 * - `list` of mappings: `<block>.<part>_<n>_<name>`, n from 1 (`etch.calibration_2_rate`);
 * - `values`, a list of single values: `<block>.<item>_<n>` (`drying.support_1`), `inputs` then
 *   holding the one spec under the item's name.
 */
export interface InputPart {
  form: 'mapping' | 'list' | 'values';
  description?: string;
  required?: readonly string[];
  inputs: Record<string, ParamSpec>;
  /** Fields that are not numbers (a material id, a list of words), as JSON Schema. */
  fields?: Record<string, JsonSchema>;
  /** A `material` field whose table values give these inputs unless the part writes them. */
  material?: readonly string[];
}

/** Shape facts a block gives: read from its raw mapping once it has loaded cleanly. */
export type BlockFacts = Omit<ShapeFacts, 'kind' | 'array'>;

export interface InputBlock {
  /** The YAML key, and the first segment of its inputs' names. */
  key: string;
  description: string;
  /** A mapping, or (deposition) a list of steps each naming itself with `entryName`. */
  form: 'mapping' | 'list';
  /** For a list block: the field naming each entry; its inputs are `<block>.<entry>.<name>`. */
  entryName?: string;
  /** The kinds the block belongs on, and how the format reference names them. */
  kinds: readonly Kind[];
  where: string;
  required?: readonly string[];
  inputs: Record<string, ParamSpec>;
  fields?: Record<string, JsonSchema>;
  parts?: Record<string, InputPart>;
}

const ALL_KINDS: readonly Kind[] = ['hole', 'trench', 'via', 'pillar', 'cylinder', 'line'];
const OPENINGS: readonly Kind[] = ['hole', 'trench', 'via'];
const materialId: JsonSchema = { type: 'string', description: 'A material id: built in, or from materials.yaml.' };

export const BLOCKS = {
  etch: {
    key: 'etch',
    description: 'The etch that cuts the opening: rates, reaction probability, time budget (aspect-ratio-dependent etching).',
    form: 'mapping',
    kinds: OPENINGS,
    where: 'openings (hole, trench, via)',
    inputs: {
      open_rate: { unit: 'm/s', description: 'Etch rate on an open field (no aspect-ratio loss).', min: 0, exclusiveMin: true },
      reaction_probability: { unit: '1', description: 'Reaction probability of the limiting neutral at the etch front.', min: 0, max: 1, exclusiveMin: true },
      time_budget: { unit: 's', description: 'Etch time the recipe may use.', min: 0, exclusiveMin: true },
      mask_thickness: { unit: 'm', description: 'Thickness of the mask above the opening (part of the conductance path); none when not written.', min: 0, default: { value: 0, written: '0 (no mask written)' } },
      reference_cd: { unit: 'm', description: 'CD of a wider feature etched in the same step (for lag).', min: 0, exclusiveMin: true },
      stop_fraction: { unit: '1', description: 'Fraction of the open-field rate below which the etch counts as stopped.', min: 0, max: 1, exclusiveMin: true, exclusiveMax: true },
    },
    parts: {
      ion: {
        form: 'mapping',
        description: 'Ion–neutral synergy: without it the etch is neutral-limited (Coburn–Winters).',
        required: ['neutral_to_ion_ratio'],
        inputs: {
          neutral_to_ion_ratio: { unit: '1', description: 'Open-field ratio of the reacting neutral supply to the ion-driven removal capacity, s₀Γₙ/(YΓᵢ).', min: 0, exclusiveMin: true },
          angular_spread: { unit: 'rad', description: 'Width of the ions’ polar-angle distribution about the wafer normal.', min: 0, max: Math.PI / 2, exclusiveMin: true },
        },
      },
      calibration: {
        form: 'list',
        description: 'Measured (aspect ratio, rate) points of this opening at increasing depth (aspect ratio without the mask); the engine fits the reaction probability to them, and a written reaction_probability is then not used.',
        required: ['aspect_ratio', 'rate'],
        inputs: {
          aspect_ratio: { unit: '1', description: 'Aspect ratio at which the rate was measured.', min: 0, exclusiveMin: true },
          rate: { unit: 'm/s', description: 'Measured etch rate at that aspect ratio.', min: 0, exclusiveMin: true },
        },
      },
    },
  },
  deposition: {
    key: 'deposition',
    description: 'Film steps that line the opening, in order (hole, trench, via; the inside of a hollow cylinder).',
    form: 'list',
    entryName: 'film',
    kinds: ['hole', 'trench', 'via', 'cylinder'],
    where: 'openings and hollow cylinders',
    required: ['film', 'method'],
    fields: {
      film: { type: 'string', pattern: '^[a-z][a-z0-9_-]*$', maxLength: 64, description: 'Name of the film step (rules select it with `film`).' },
      method: { type: 'string', enum: ['ald', 'cvd', 'pvd'] },
    },
    inputs: {
      thickness: { unit: 'm', description: 'Target film thickness on the top surface.', min: 0, exclusiveMin: true },
      exposure: { unit: 'Pa*s', description: 'ALD precursor exposure: partial pressure times pulse time.', min: 0, exclusiveMin: true },
      molar_mass: { unit: 'kg/mol', description: 'Molar mass of the precursor.', min: 0, exclusiveMin: true },
      temperature: { unit: 'K', description: 'Gas temperature.', min: 0, exclusiveMin: true },
      site_density: { unit: '1/m^2', description: 'ALD saturation density of reacted precursor molecules.', min: 0, exclusiveMin: true },
      sticking_probability: { unit: '1', description: 'CVD reaction (sticking) probability of the growth species on the wall.', min: 0, max: 1, exclusiveMin: true },
    },
  },
  fill: {
    key: 'fill',
    description: 'How the opening is filled: the profile is marched in time to find voids and seams.',
    form: 'mapping',
    kinds: OPENINGS,
    where: 'openings (hole, trench, via)',
    required: ['method'],
    fields: { method: { type: 'string', enum: ['conformal', 'sticking-limited', 'bottom-up'] } },
    inputs: {
      sticking_probability: { unit: '1', description: 'Sticking probability of the filling species (sticking-limited fill).', min: 0, max: 1, exclusiveMin: true },
      bottom_up_ratio: { unit: '1', description: 'Growth rate of the bottom over that of the sidewalls (bottom-up fill).', min: 0, exclusiveMin: true },
      seam_width: {
        unit: 'm',
        description: 'Widest trapped gap still counted as a seam rather than a void (default 1 nm, a few atomic layers that a later anneal or film closes).',
        min: 0,
        default: { value: 1e-9, written: '1 nm (default)' },
      },
    },
  },
  drying: {
    key: 'drying',
    description: 'The rinse and dry the standing structures go through (capillary collapse).',
    form: 'mapping',
    kinds: ['pillar', 'cylinder', 'line'],
    where: 'standing kinds (pillar, cylinder, line)',
    required: ['liquid'],
    fields: {
      liquid: { type: 'string', description: 'Rinse liquid: a material with a surface tension, or `none` for drying without a liquid–vapour interface.' },
      supports_hold: { type: 'string', enum: ['pinned', 'clamped'], description: 'How a support holds the structure between supports (default pinned).' },
    },
    inputs: {
      surface_tension: { unit: 'N/m', description: 'Surface tension of the rinse liquid (overrides the liquid material’s value).', min: 0 },
      contact_angle: { unit: 'rad', description: 'Contact angle of the rinse liquid on the structure’s sidewall.', min: 0, max: Math.PI },
    },
    parts: {
      supports: {
        form: 'values',
        description: 'Heights above the base of lateral support lattices, e.g. ["0.6 um", "1.2 um"].',
        inputs: { support: { unit: 'm', description: 'Height above the base of a lateral support lattice.', min: 0, exclusiveMin: true } },
      },
    },
  },
  cell: {
    key: 'cell',
    description: 'The storage cell a hollow cylinder is the bottom electrode of.',
    form: 'mapping',
    kinds: ['cylinder'],
    where: 'a hollow cylinder (the storage electrode)',
    required: ['dielectric', 'electrode_surfaces'],
    fields: { electrode_surfaces: { type: 'array', minItems: 1, uniqueItems: true, items: { type: 'string', enum: ['inner', 'outer', 'bottom'] } } },
    inputs: {
      bitline_capacitance: { unit: 'F', description: 'Capacitance of the bit line the cell shares its charge with.', min: 0, exclusiveMin: true },
      array_voltage: { unit: 'V', description: 'Voltage of a stored 1 (the array supply).', min: 0, exclusiveMin: true },
      precharge: { unit: '1', description: 'Bit-line precharge level as a fraction of the array voltage (50% for half-supply precharge).', min: 0, max: 1 },
      required_signal: { unit: 'V', description: 'Smallest bit-line signal the sense amplifier reads reliably.', min: 0, exclusiveMin: true },
      leakage_current: { unit: 'A', description: 'Leakage current draining the stored charge.', min: 0 },
      refresh_interval: { unit: 's', description: 'Time between refreshes.', min: 0 },
    },
    parts: {
      dielectric: {
        form: 'mapping',
        fields: { material: materialId },
        material: ['dielectric_constant'],
        inputs: {
          thickness: { unit: 'm', description: 'Physical thickness of the capacitor dielectric.', min: 0, exclusiveMin: true },
          dielectric_constant: { unit: '1', description: 'Relative permittivity of the capacitor dielectric.', min: 1 },
        },
      },
    },
  },
  via: {
    key: 'via',
    description: 'Conductor and liner of a through-silicon via (the liner sits inside the etched hole).',
    form: 'mapping',
    kinds: ['via'],
    where: 'a via',
    required: ['conductor', 'liner'],
    inputs: {
      substrate_doping: { unit: '1/m^3', description: 'Doping of the silicon around the via (either type), for the depletion capacitance in series with the liner.', min: 0, exclusiveMin: true },
    },
    parts: {
      conductor: {
        form: 'mapping',
        required: ['material'],
        fields: { material: materialId },
        material: ['resistivity', 'youngs_modulus', 'poisson_ratio', 'thermal_expansion'],
        inputs: {
          resistivity: { unit: 'ohm*m', description: 'Resistivity of the via conductor.', min: 0, exclusiveMin: true },
          youngs_modulus: { unit: 'Pa', description: "Young's modulus of the conductor.", min: 0, exclusiveMin: true },
          poisson_ratio: { unit: '1', description: "Poisson's ratio of the conductor.", min: -1, max: 0.5 },
          thermal_expansion: { unit: '1/K', description: 'Expansion coefficient of the conductor.' },
        },
      },
      liner: {
        form: 'mapping',
        required: ['material', 'thickness'],
        fields: { material: materialId },
        material: ['dielectric_constant'],
        inputs: {
          thickness: { unit: 'm', description: 'Thickness of the insulating liner between conductor and silicon.', min: 0, exclusiveMin: true },
          dielectric_constant: { unit: '1', description: 'Relative permittivity of the liner.', min: 1 },
        },
      },
    },
  },
  isolation: {
    key: 'isolation',
    description: 'What an isolation trench must withstand.',
    form: 'mapping',
    kinds: ['trench'],
    where: 'a trench',
    required: ['voltage', 'doping', 'breakdown_field'],
    inputs: {
      voltage: { unit: 'V', description: 'Largest voltage between the neighbours the trench separates.', min: 0, exclusiveMin: true },
      doping: { unit: '1/m^3', description: 'Substrate (well) doping around the trench.', min: 0, exclusiveMin: true },
      breakdown_field: { unit: 'V/m', description: 'Breakdown field of the trench fill.', min: 0, exclusiveMin: true },
    },
  },
  anneal: {
    key: 'anneal',
    description: 'The temperature step that leaves the via and its silicon stressed.',
    form: 'mapping',
    kinds: ALL_KINDS,
    where: 'any kind',
    required: ['temperature_change'],
    inputs: { temperature_change: { unit: 'K', meaning: 'difference', description: 'Temperature change from the stress-free state to the state of use (negative on cooling), in K.' } },
  },
  keep_out: {
    key: 'keep_out',
    description: 'What the transistors near a via tolerate.',
    form: 'mapping',
    kinds: ALL_KINDS,
    where: 'any kind',
    required: ['mobility_shift'],
    inputs: {
      mobility_shift: { unit: '1', description: 'Largest relative mobility change allowed in a transistor.', min: 0, exclusiveMin: true },
      channel_doping: { unit: '1/m^3', description: 'Doping of the transistor channels near the via (sets the piezoresistance factor).', min: 0, exclusiveMin: true },
      temperature: { unit: 'K', description: 'Operating temperature of those transistors (sets the piezoresistance factor).', min: 0, exclusiveMin: true },
    },
  },
  film: {
    key: 'film',
    description: 'A stressed film over the wafer (for its bow).',
    form: 'mapping',
    kinds: ALL_KINDS,
    where: 'any kind',
    required: ['stress', 'thickness'],
    inputs: {
      stress: { unit: 'Pa', description: 'Biaxial stress of the film on the wafer (tensile positive).' },
      thickness: { unit: 'm', description: 'Film thickness.', min: 0, exclusiveMin: true },
    },
  },
  wafer: {
    key: 'wafer',
    description: 'The wafer the structure is built on (for bow).',
    form: 'mapping',
    kinds: ALL_KINDS,
    where: 'any kind',
    fields: { orientation: { type: 'string', enum: ['001', '111'] } },
    inputs: {
      thickness: { unit: 'm', description: 'Wafer thickness.', min: 0, exclusiveMin: true },
      diameter: { unit: 'm', description: 'Wafer diameter.', min: 0, exclusiveMin: true },
      bow_limit: { unit: 'm', description: 'Largest bow the next steps accept.', min: 0, exclusiveMin: true },
    },
  },
} as const satisfies Record<string, InputBlock>;

export type BlockKey = keyof typeof BLOCKS;
export const BLOCK_LIST: readonly InputBlock[] = Object.values(BLOCKS);

/**
 * How each shape fact is read from its block's raw mapping (already checked by the schema), and
 * example facts for the methods pages, the first being the one every example shape has. The
 * mapped type makes a new shape fact a compile error here until it is read and has examples.
 */
export const SHAPE_FACTS: {
  [K in keyof BlockFacts]-?: { block: BlockKey; read: (raw: Record<string, unknown>) => NonNullable<BlockFacts[K]> | undefined; examples: Array<{ facts: NonNullable<BlockFacts[K]>; label: string; film?: string }> };
} = {
  drying: {
    block: 'drying',
    read: (d) => ({ liquid: String(d.liquid), supportCount: Array.isArray(d.supports) ? d.supports.length : 0, supportHold: (d.supports_hold === 'clamped' ? 'clamped' : 'pinned') as SupportHold }),
    examples: [
      { facts: { liquid: 'water', supportCount: 0, supportHold: 'pinned' }, label: 'no supports' },
      { facts: { liquid: 'water', supportCount: 1, supportHold: 'pinned' }, label: 'one pinned support' },
      { facts: { liquid: 'water', supportCount: 1, supportHold: 'clamped' }, label: 'one clamped support' },
    ],
  },
  etch: {
    block: 'etch',
    read: (e) => {
      const ion = e.ion !== null && typeof e.ion === 'object' ? { ion: { spread: (e.ion as Record<string, unknown>).angular_spread !== undefined } } : {};
      return { calibrationPoints: Array.isArray(e.calibration) ? e.calibration.length : 0, ...ion };
    },
    examples: [
      { facts: { calibrationPoints: 1 }, label: 'calibrated recipe' },
      { facts: { calibrationPoints: 0 }, label: 'recipe with its reaction probability' },
      { facts: { calibrationPoints: 0, ion: { spread: false } }, label: 'ion–neutral synergy' },
      { facts: { calibrationPoints: 0, ion: { spread: true } }, label: 'ion synergy with angular spread' },
    ],
  },
  deposition: {
    block: 'deposition',
    read: (list) => ({ films: (Object.values(list) as Array<Record<string, unknown>>).map((s) => ({ film: String(s.film), method: s.method as DepositionMethod })) }),
    examples: [
      { facts: { films: [{ film: 'film', method: 'ald' }] }, film: 'film', label: 'ALD film' },
      { facts: { films: [{ film: 'film', method: 'cvd' }] }, film: 'film', label: 'CVD film' },
      { facts: { films: [{ film: 'film', method: 'pvd' }] }, film: 'film', label: 'PVD film' },
    ],
  },
  fill: {
    block: 'fill',
    read: (f) => ({ method: f.method as NonNullable<BlockFacts['fill']>['method'] }),
    examples: [
      { facts: { method: 'conformal' }, label: 'conformal fill' },
      { facts: { method: 'sticking-limited' }, label: 'sticking-limited fill' },
      { facts: { method: 'bottom-up' }, label: 'bottom-up fill' },
    ],
  },
  cell: {
    block: 'cell',
    read: (c) => ({ surfaces: (Array.isArray(c.electrode_surfaces) ? c.electrode_surfaces : []) as ElectrodeSurface[] }),
    examples: [
      { facts: { surfaces: ['inner', 'outer', 'bottom'] }, label: 'inner, outer and bottom electrode' },
      { facts: { surfaces: ['outer'] }, label: 'outer electrode only' },
    ],
  },
  via: { block: 'via', read: () => true, examples: [{ facts: true, label: 'via block' }] },
  isolation: { block: 'isolation', read: () => true, examples: [{ facts: true, label: 'isolation block' }] },
  waferOrientation: {
    block: 'wafer',
    read: (w) => (w.orientation === '001' || w.orientation === '111' ? w.orientation : undefined),
    examples: [
      { facts: '001', label: '(001) wafer' },
      { facts: '111', label: '(111) wafer' },
    ],
  },
};

/** Every key a block (or a part of it) accepts, for the loader's suggestions. */
export function keysOf(b: { inputs: Record<string, unknown>; fields?: Record<string, unknown>; parts?: Record<string, unknown> }, aliases: Record<string, string> = {}): string[] {
  const inputs = Object.keys(b.inputs).flatMap((k) => (aliases[k] ? [k, aliases[k]] : [k]));
  return [...Object.keys(b.fields ?? {}), ...inputs, ...Object.keys(b.parts ?? {})];
}
