// The numeric inputs of a structure's geometry and of materials, with the SI unit each must convert
// to. The input blocks (etch, deposition, fill, ...) are declared in blocks.ts. The JSON Schemas and
// the loader are both generated from these, so a new input is added in one place.

import type { Param } from './types.ts';
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
  /** The value used when the block leaves the input out, and how the trace shows it. */
  default?: { value: number; written: string };
}

/** The physical range a declaration allows, carried on the input (the inverse solve searches inside it). */
export function rangeOf(spec: ParamSpec): Pick<Param, 'range'> {
  if (spec.min === undefined && spec.max === undefined) return {};
  return { range: { ...(spec.min !== undefined ? { min: spec.min } : {}), ...(spec.max !== undefined ? { max: spec.max } : {}) } };
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

/** Shorter names a block may use for a material property (`expansion` for `thermal_expansion`). */
export const PROPERTY_ALIASES: Record<string, string> = { thermal_expansion: 'expansion' };

/** Standing kinds have a height, openings a depth; the rest are shared. */
export const GEOMETRY_BY_KIND: Record<string, string[]> = {
  hole: ['cd', 'depth', 'pitch', 'sidewall_angle'],
  via: ['cd', 'depth', 'pitch', 'sidewall_angle'],
  trench: ['cd', 'depth', 'pitch', 'sidewall_angle', 'length'],
  pillar: ['cd', 'height', 'pitch', 'sidewall_angle'],
  cylinder: ['cd', 'height', 'pitch', 'sidewall_angle', 'wall'],
  line: ['cd', 'height', 'pitch', 'sidewall_angle', 'length'],
};
