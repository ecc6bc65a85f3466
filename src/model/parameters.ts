// The catalogue of numeric inputs a handbook may write, with the SI unit each must convert to.
// The JSON Schemas and the loader are both generated from it, so a new input is added here once.

export interface ParamSpec {
  unit: string;
  description: string;
  /** Allowed range in SI, checked at load. */
  min?: number;
  max?: number;
  exclusiveMin?: boolean;
  exclusiveMax?: boolean;
  /** A difference (a temperature change): units with an offset (°C, °F) are refused. */
  meaning?: 'difference';
}

export const GEOMETRY_PARAMS: Record<string, ParamSpec> = {
  cd: { unit: 'm', description: 'Top critical dimension: diameter of round kinds, width of trenches and lines (outer diameter of a cylinder).', min: 0, exclusiveMin: true },
  depth: { unit: 'm', description: 'Depth of an opening (hole, trench, via), from the top surface to the bottom.', min: 0, exclusiveMin: true },
  height: { unit: 'm', description: 'Height of a standing structure (pillar, cylinder, line), from its base to its top.', min: 0, exclusiveMin: true },
  pitch: { unit: 'm', description: 'Centre-to-centre distance to the nearest neighbour in the array.', min: 0, exclusiveMin: true },
  sidewall_angle: { unit: 'rad', description: 'Angle between sidewall and wafer plane, measured in the solid: 90° vertical; below 90° an opening narrows toward its bottom and a standing structure widens toward its base.', min: 0, max: Math.PI, exclusiveMin: true, exclusiveMax: true },
  wall: { unit: 'm', description: 'Wall thickness of a hollow cylinder.', min: 0, exclusiveMin: true },
  length: { unit: 'm', description: 'Length along the wafer of a trench or line (for areas and volumes).', min: 0, exclusiveMin: true },
};

export const MATERIAL_PROPERTIES: Record<string, ParamSpec> = {
  youngs_modulus: { unit: 'Pa', description: "Young's modulus; for a crystal, along the wafer normal (the axis of a standing structure)", min: 0, exclusiveMin: true },
  poisson_ratio: { unit: '1', description: "Poisson's ratio; for a crystal, for load along the wafer normal with lateral strain in the wafer plane", min: -1, max: 0.5 },
  isotropic_youngs_modulus: { unit: 'Pa', description: "Young's modulus of an isotropic stand-in for a crystal, read by isotropic models; an isotropic material without it uses its youngs_modulus", min: 0, exclusiveMin: true },
  isotropic_poisson_ratio: { unit: '1', description: "Poisson's ratio of that isotropic stand-in; an isotropic material without it uses its poisson_ratio", min: -1, max: 0.5 },
  thermal_expansion: { unit: '1/K', description: 'Linear thermal expansion coefficient near room temperature' },
  dielectric_constant: { unit: '1', description: 'Relative permittivity (static)', min: 1 },
  resistivity: { unit: 'ohm*m', description: 'Electrical resistivity at 20 °C', min: 0, exclusiveMin: true },
  surface_tension: { unit: 'N/m', description: 'Liquid–vapour surface tension at 25 °C', min: 0 },
  fracture_strength: { unit: 'Pa', description: 'Stress at which the material breaks in bending', min: 0, exclusiveMin: true },
};

/** Inputs of a `drying:` block (rinse and dry of standing structures). */
export const DRYING_PARAMS: Record<string, ParamSpec> = {
  surface_tension: { unit: 'N/m', description: 'Surface tension of the rinse liquid (overrides the liquid material’s value).', min: 0 },
  contact_angle: { unit: 'rad', description: 'Contact angle of the rinse liquid on the structure’s sidewall.', min: 0, max: Math.PI },
};

/** Inputs of an `etch:` block (the etch that cuts an opening). */
export const ETCH_PARAMS: Record<string, ParamSpec> = {
  open_rate: { unit: 'm/s', description: 'Etch rate on an open field (no aspect-ratio loss).', min: 0, exclusiveMin: true },
  reaction_probability: { unit: '1', description: 'Reaction probability of the limiting neutral at the etch front.', min: 0, max: 1, exclusiveMin: true },
  time_budget: { unit: 's', description: 'Etch time the recipe may use.', min: 0, exclusiveMin: true },
  mask_thickness: { unit: 'm', description: 'Thickness of the mask above the opening (part of the conductance path).', min: 0 },
  reference_cd: { unit: 'm', description: 'CD of a wider feature etched in the same step (for lag).', min: 0, exclusiveMin: true },
  stop_fraction: { unit: '1', description: 'Fraction of the open-field rate below which the etch counts as stopped.', min: 0, max: 1, exclusiveMin: true, exclusiveMax: true },
};

/** Inputs of the optional `etch.ion` block (ion–neutral synergy). */
export const ION_PARAMS: Record<string, ParamSpec> = {
  neutral_to_ion_ratio: { unit: '1', description: 'Open-field ratio of the reacting neutral supply to the ion-driven removal capacity, s₀Γₙ/(YΓᵢ).', min: 0, exclusiveMin: true },
  angular_spread: { unit: 'rad', description: 'Width of the ions’ polar-angle distribution about the wafer normal.', min: 0, max: Math.PI / 2, exclusiveMin: true },
};

/** Spec of one calibration point of `etch.calibration`. */
export const CALIBRATION_SPECS: Record<string, ParamSpec> = {
  aspect_ratio: { unit: '1', description: 'Aspect ratio at which the rate was measured.', min: 0, exclusiveMin: true },
  rate: { unit: 'm/s', description: 'Measured etch rate at that aspect ratio.', min: 0, exclusiveMin: true },
};

/** Inputs of one film step in a `deposition:` list (`deposition.<film>.<name>`). */
export const DEPOSITION_PARAMS: Record<string, ParamSpec> = {
  thickness: { unit: 'm', description: 'Target film thickness on the top surface.', min: 0, exclusiveMin: true },
  exposure: { unit: 'Pa*s', description: 'ALD precursor exposure: partial pressure times pulse time.', min: 0, exclusiveMin: true },
  molar_mass: { unit: 'kg/mol', description: 'Molar mass of the precursor.', min: 0, exclusiveMin: true },
  temperature: { unit: 'K', description: 'Gas temperature.', min: 0, exclusiveMin: true },
  site_density: { unit: '1/m^2', description: 'ALD saturation density of reacted precursor molecules.', min: 0, exclusiveMin: true },
  sticking_probability: { unit: '1', description: 'CVD reaction (sticking) probability of the growth species on the wall.', min: 0, max: 1, exclusiveMin: true },
};

/** Inputs of a `fill:` block (how the opening is filled). */
export const FILL_PARAMS: Record<string, ParamSpec> = {
  sticking_probability: { unit: '1', description: 'Sticking probability of the filling species (sticking-limited fill).', min: 0, max: 1, exclusiveMin: true },
  bottom_up_ratio: { unit: '1', description: 'Growth rate of the bottom over that of the sidewalls (bottom-up fill).', min: 0, exclusiveMin: true },
};

/** Inputs of a `cell:` block (the storage cell a standing cylinder is the electrode of). */
export const CELL_PARAMS: Record<string, ParamSpec> = {
  bitline_capacitance: { unit: 'F', description: 'Capacitance of the bit line the cell shares its charge with.', min: 0, exclusiveMin: true },
  array_voltage: { unit: 'V', description: 'Voltage of a stored 1 (the array supply).', min: 0, exclusiveMin: true },
  precharge: { unit: '1', description: 'Bit-line precharge level as a fraction of the array voltage (50% for half-supply precharge).', min: 0, max: 1 },
  required_signal: { unit: 'V', description: 'Smallest bit-line signal the sense amplifier reads reliably.', min: 0, exclusiveMin: true },
  leakage_current: { unit: 'A', description: 'Leakage current draining the stored charge.', min: 0 },
  refresh_interval: { unit: 's', description: 'Time between refreshes.', min: 0 },
};

/** Inputs of the cell's `dielectric:` (`cell.dielectric_<name>`). */
export const CELL_DIELECTRIC_PARAMS: Record<string, ParamSpec> = {
  thickness: { unit: 'm', description: 'Physical thickness of the capacitor dielectric.', min: 0, exclusiveMin: true },
  dielectric_constant: { unit: '1', description: 'Relative permittivity of the capacitor dielectric.', min: 1 },
};

/** Inputs of a `via:` block: `via.conductor_resistivity`, `via.liner_thickness`, `via.liner_dielectric_constant`. */
export const VIA_PARAMS: Record<string, ParamSpec> = {
  conductor_resistivity: { unit: 'ohm*m', description: 'Resistivity of the via conductor.', min: 0, exclusiveMin: true },
  liner_thickness: { unit: 'm', description: 'Thickness of the insulating liner between conductor and silicon.', min: 0, exclusiveMin: true },
  liner_dielectric_constant: { unit: '1', description: 'Relative permittivity of the liner.', min: 1 },
  substrate_doping: { unit: '1/m^3', description: 'Doping of the silicon around the via (either type), for the depletion capacitance in series with the liner.', min: 0, exclusiveMin: true },
};

/** Inputs of an `isolation:` block. */
export const ISOLATION_PARAMS: Record<string, ParamSpec> = {
  voltage: { unit: 'V', description: 'Largest voltage between the neighbours the trench separates.', min: 0, exclusiveMin: true },
  doping: { unit: '1/m^3', description: 'Substrate (well) doping around the trench.', min: 0, exclusiveMin: true },
  breakdown_field: { unit: 'V/m', description: 'Breakdown field of the trench fill.', min: 0, exclusiveMin: true },
};

/** Thermo-mechanical blocks: `anneal`, `keep_out`, `film`, `wafer` (their inputs are `<block>.<name>`). */
export const THERMOMECH_PARAMS: Record<string, Record<string, ParamSpec>> = {
  anneal: { temperature_change: { unit: 'K', meaning: 'difference', description: 'Temperature change from the stress-free state to the state of use (negative on cooling), in K.' } },
  keep_out: {
    mobility_shift: { unit: '1', description: 'Largest relative mobility change allowed in a transistor.', min: 0, exclusiveMin: true },
    channel_doping: { unit: '1/m^3', description: 'Doping of the transistor channels near the via (sets the piezoresistance factor).', min: 0, exclusiveMin: true },
    temperature: { unit: 'K', description: 'Operating temperature of those transistors (sets the piezoresistance factor).', min: 0, exclusiveMin: true },
  },
  film: {
    stress: { unit: 'Pa', description: 'Biaxial stress of the film on the wafer (tensile positive).' },
    thickness: { unit: 'm', description: 'Film thickness.', min: 0, exclusiveMin: true },
  },
  wafer: {
    thickness: { unit: 'm', description: 'Wafer thickness.', min: 0, exclusiveMin: true },
    diameter: { unit: 'm', description: 'Wafer diameter.', min: 0, exclusiveMin: true },
    bow_limit: { unit: 'm', description: 'Largest bow the next steps accept.', min: 0, exclusiveMin: true },
  },
};

/** Mechanical properties of the via conductor: `via.conductor_<name>`. */
export const VIA_CONDUCTOR_MECH: Record<string, ParamSpec> = {
  youngs_modulus: { unit: 'Pa', description: "Young's modulus of the conductor.", min: 0, exclusiveMin: true },
  poisson_ratio: { unit: '1', description: "Poisson's ratio of the conductor.", min: -1, max: 0.5 },
  thermal_expansion: { unit: '1/K', description: 'Expansion coefficient of the conductor.' },
};

/** Spec of one support height in `drying.supports`. */
export const SUPPORT_SPEC: ParamSpec = { unit: 'm', description: 'Height above the base of a lateral support lattice.', min: 0, exclusiveMin: true };

/** Standing kinds have a height, openings a depth; the rest are shared. */
export const GEOMETRY_BY_KIND: Record<string, string[]> = {
  hole: ['cd', 'depth', 'pitch', 'sidewall_angle'],
  via: ['cd', 'depth', 'pitch', 'sidewall_angle'],
  trench: ['cd', 'depth', 'pitch', 'sidewall_angle', 'length'],
  pillar: ['cd', 'height', 'pitch', 'sidewall_angle'],
  cylinder: ['cd', 'height', 'pitch', 'sidewall_angle', 'wall'],
  line: ['cd', 'height', 'pitch', 'sidewall_angle', 'length'],
};

/** Unit of any parameter path, or undefined when the path is not an input. */
export function paramSpecOf(path: string): ParamSpec | undefined {
  const [block, a, b] = path.split('.');
  if (block === 'geometry' && a) return GEOMETRY_PARAMS[a];
  if (block === 'drying' && a) return a.startsWith('support_') ? SUPPORT_SPEC : DRYING_PARAMS[a];
  if (block === 'deposition' && b) return DEPOSITION_PARAMS[b];
  if (block === 'fill' && a) return FILL_PARAMS[a];
  if (block === 'via' && a) return VIA_PARAMS[a] ?? VIA_CONDUCTOR_MECH[a.replace(/^conductor_/, '')];
  if (block && a && THERMOMECH_PARAMS[block]) return THERMOMECH_PARAMS[block]![a];
  if (block === 'isolation' && a) return ISOLATION_PARAMS[a];
  if (block === 'cell' && a) return a.startsWith('dielectric_') ? CELL_DIELECTRIC_PARAMS[a.slice('dielectric_'.length)] : CELL_PARAMS[a];
  if (block === 'etch' && a) {
    if (a.startsWith('calibration_')) return CALIBRATION_SPECS[a.replace(/^calibration_\d+_/, '')];
    if (a.startsWith('ion_')) return ION_PARAMS[a.slice(4)];
    return ETCH_PARAMS[a];
  }
  if (block === 'materials' && b) return MATERIAL_PROPERTIES[b];
  return undefined;
}
