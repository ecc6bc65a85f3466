// JSON Schemas of the handbook files, generated from the parameter catalogue so they never drift
// from what the loader accepts. They are published with the site for editors to validate against.
import { THERMOMECH_PARAMS, CELL_DIELECTRIC_PARAMS, CELL_PARAMS, DEPOSITION_PARAMS, DRYING_PARAMS, ETCH_PARAMS, FILL_PARAMS, GEOMETRY_PARAMS, ION_PARAMS, ISOLATION_PARAMS, MATERIAL_PROPERTIES } from './parameters.ts';
import { KINDS } from './types.ts';
import { CALENDAR_DATE_PATTERN } from './calendar.ts';

export const SCHEMA_BASE = 'https://plumbline.invalid/schemas/';
export const STRUCTURE_ID_PATTERN = '^[a-z0-9]+(-[a-z0-9]+)*$';
export const RULE_ID_PATTERN = '^[A-Z0-9]+(-[A-Z0-9]+)*$';
export const MATERIAL_ID_PATTERN = '^[a-z0-9]+(-[a-z0-9]+)*$';
/** Ids are URL path segments and file names: short enough for every file system and for a reader. */
export const MAX_ID_LENGTH = 64;

type JsonSchema = Record<string, unknown>;

const valueWithUnit = (description: string): JsonSchema => ({
  type: ['string', 'number'],
  description: `${description} Written with a unit and optional tolerance, e.g. "32 nm ± 1.5 nm".`,
});

function propertiesFrom(catalogue: Record<string, { description: string }>): Record<string, JsonSchema> {
  return Object.fromEntries(Object.entries(catalogue).map(([k, v]) => [k, valueWithUnit(v.description)]));
}

export function structureSchema(): JsonSchema {
  return {
    $schema: 'http://json-schema.org/draft-07/schema#',
    $id: `${SCHEMA_BASE}structure.schema.json`,
    title: 'plumbline structure',
    type: 'object',
    additionalProperties: false,
    required: ['id', 'title', 'kind'],
    properties: {
      id: { type: 'string', pattern: STRUCTURE_ID_PATTERN, maxLength: MAX_ID_LENGTH, description: 'Permanent id, lower-case kebab; equals the file name.' },
      title: { type: 'string', minLength: 1 },
      kind: { type: 'string', enum: [...KINDS] },
      tags: { type: 'array', items: { type: 'string', pattern: MATERIAL_ID_PATTERN, maxLength: MAX_ID_LENGTH } },
      description: { type: 'string' },
      geometry: {
        type: 'object',
        additionalProperties: false,
        properties: {
          ...propertiesFrom(GEOMETRY_PARAMS),
          array: { type: 'string', enum: ['hexagonal', 'square', 'lines'], description: 'Arrangement of neighbours.' },
        },
      },
      etch: {
        type: 'object',
        description: 'The etch that cuts the opening: rates, reaction probability, time budget (aspect-ratio-dependent etching).',
        additionalProperties: false,
        properties: {
          ...propertiesFrom(ETCH_PARAMS),
          ion: {
            type: 'object',
            description: 'Ion–neutral synergy: without it the etch is neutral-limited (Coburn–Winters).',
            additionalProperties: false,
            required: ['neutral_to_ion_ratio'],
            properties: propertiesFrom(ION_PARAMS),
          },
          calibration: {
            type: 'array',
            minItems: 1,
            description: 'Measured (aspect ratio, rate) points of this opening at increasing depth (aspect ratio without the mask); the engine fits the reaction probability to them, and a written reaction_probability is then not used.',
            items: {
              type: 'object',
              additionalProperties: false,
              required: ['aspect_ratio', 'rate'],
              properties: { aspect_ratio: { type: ['string', 'number'] }, rate: { type: ['string', 'number'] } },
            },
          },
        },
      },
      deposition: {
        type: 'array',
        minItems: 1,
        description: 'Film steps that line the opening, in order (hole, trench, via; the inside of a hollow cylinder).',
        items: {
          type: 'object',
          additionalProperties: false,
          required: ['film', 'method'],
          properties: {
            film: { type: 'string', pattern: '^[a-z][a-z0-9_-]*$', maxLength: MAX_ID_LENGTH, description: 'Name of the film step (rules select it with `film`).' },
            method: { type: 'string', enum: ['ald', 'cvd', 'pvd'] },
            ...propertiesFrom(DEPOSITION_PARAMS),
          },
        },
      },
      via: {
        type: 'object',
        description: 'Conductor and liner of a through-silicon via (the liner sits inside the etched hole).',
        additionalProperties: false,
        required: ['conductor', 'liner'],
        properties: {
          conductor: {
            type: 'object',
            additionalProperties: false,
            required: ['material'],
            properties: {
              material: { type: 'string' },
              resistivity: valueWithUnit('Resistivity override.'),
              youngs_modulus: valueWithUnit("Young's modulus override."),
              poisson_ratio: valueWithUnit("Poisson's ratio override."),
              expansion: valueWithUnit('Expansion coefficient override (alias of thermal_expansion).'),
              thermal_expansion: valueWithUnit('Expansion coefficient override.'),
            },
          },
          liner: { type: 'object', additionalProperties: false, required: ['material', 'thickness'], properties: { material: { type: 'string' }, thickness: valueWithUnit('Liner thickness.'), dielectric_constant: valueWithUnit('Permittivity override.') } },
        },
      },
      anneal: { type: 'object', additionalProperties: false, required: ['temperature_change'], properties: propertiesFrom(THERMOMECH_PARAMS.anneal!) },
      keep_out: { type: 'object', additionalProperties: false, required: ['mobility_shift'], properties: propertiesFrom(THERMOMECH_PARAMS.keep_out!) },
      film: { type: 'object', additionalProperties: false, required: ['stress', 'thickness'], properties: propertiesFrom(THERMOMECH_PARAMS.film!) },
      wafer: {
        type: 'object',
        additionalProperties: false,
        properties: { ...propertiesFrom(THERMOMECH_PARAMS.wafer!), orientation: { type: 'string', enum: ['001', '111'] } },
      },
      isolation: {
        type: 'object',
        description: 'What an isolation trench must withstand.',
        additionalProperties: false,
        required: ['voltage', 'doping', 'breakdown_field'],
        properties: propertiesFrom(ISOLATION_PARAMS),
      },
      cell: {
        type: 'object',
        description: 'The storage cell a hollow cylinder is the bottom electrode of.',
        additionalProperties: false,
        required: ['dielectric', 'electrode_surfaces'],
        properties: {
          dielectric: {
            type: 'object',
            additionalProperties: false,
            properties: { material: { type: 'string' }, ...propertiesFrom(CELL_DIELECTRIC_PARAMS) },
          },
          electrode_surfaces: { type: 'array', minItems: 1, uniqueItems: true, items: { type: 'string', enum: ['inner', 'outer', 'bottom'] } },
          ...propertiesFrom(CELL_PARAMS),
        },
      },
      fill: {
        type: 'object',
        description: 'How the opening is filled: the profile is marched in time to find voids and seams.',
        additionalProperties: false,
        required: ['method'],
        properties: {
          method: { type: 'string', enum: ['conformal', 'sticking-limited', 'bottom-up'] },
          ...propertiesFrom(FILL_PARAMS),
        },
      },
      drying: {
        type: 'object',
        description: 'The rinse and dry the standing structures go through (capillary collapse).',
        additionalProperties: false,
        required: ['liquid'],
        properties: {
          liquid: { type: 'string', description: 'Rinse liquid: a material with a surface tension, or `none` for drying without a liquid–vapour interface.' },
          ...propertiesFrom(DRYING_PARAMS),
          supports: { type: 'array', items: { type: ['string', 'number'] }, description: 'Heights above the base of lateral support lattices, e.g. ["0.6 um", "1.2 um"].' },
          supports_hold: { type: 'string', enum: ['pinned', 'clamped'], description: 'How a support holds the structure between supports (default pinned).' },
        },
      },
      materials: {
        type: 'object',
        description: 'Material by role (body, fill, liner, ...): a material id, or { material, <property>: value } to override.',
        propertyNames: { pattern: '^[a-z][a-z0-9_]*$' },
        additionalProperties: {
          type: ['string', 'object'],
          required: ['material'],
          additionalProperties: false,
          properties: { material: { type: 'string' }, ...propertiesFrom(MATERIAL_PROPERTIES), expansion: valueWithUnit('Alias of thermal_expansion.') },
        },
      },
    },
  };
}

/** Which structures a rule or a waiver selects. */
const selector = (): JsonSchema => ({
  type: 'object',
  additionalProperties: false,
  properties: {
    kinds: { type: 'array', minItems: 1, items: { type: 'string', enum: [...KINDS] } },
    tags: { type: 'array', minItems: 1, items: { type: 'string' } },
    structures: { type: 'array', minItems: 1, items: { type: 'string' } },
  },
});

const ruleProperties = (): JsonSchema => ({
  id: { type: 'string', pattern: RULE_ID_PATTERN, maxLength: MAX_ID_LENGTH, description: 'Permanent id, upper-case with dashes.' },
  title: { type: 'string', minLength: 1 },
  applies_to: selector(),
  quantity: { type: 'string', pattern: '^[a-z_]+\\.[a-z0-9_]+$', description: 'Quantity name, engine.name.' },
  film: { type: 'string', pattern: '^[a-z][a-z0-9_-]*$', description: 'For quantities of one film step: the film name of the step.' },
  at_least: { type: ['string', 'number'], description: 'Lower limit, in the unit of the quantity.' },
  at_most: { type: ['string', 'number'], description: 'Upper limit, in the unit of the quantity.' },
  evaluate_at: { type: 'string', enum: ['nominal', 'worst-case'] },
  severity: { type: 'string', enum: ['blocking', 'advisory'] },
  rationale: { type: 'string' },
  references: { type: 'array', items: { type: 'string' } },
});

export function ruleSchema(): JsonSchema {
  const rule = {
    type: 'object',
    additionalProperties: false,
    required: ['id', 'title', 'applies_to', 'quantity'],
    properties: ruleProperties(),
  };
  return {
    $schema: 'http://json-schema.org/draft-07/schema#',
    $id: `${SCHEMA_BASE}rule.schema.json`,
    title: 'plumbline rules (one rule, or a list of rules)',
    ...rule,
    // Object keywords apply to a single rule, `items` to a list: one schema serves both forms.
    type: ['object', 'array'],
    items: rule,
  };
}

/** A waiver's fields, in the order the format reference gives them. */
export const WAIVER_FIELDS = ['id', 'rule', 'structures', 'applies_to', 'reason', 'owner', 'approved_by', 'expires', 'still_within'] as const;

export function waiverSchema(): JsonSchema {
  const name = (description: string): JsonSchema => ({ type: 'string', minLength: 1, description });
  const waiver = {
    type: 'object',
    additionalProperties: false,
    // `structures` or `applies_to` (exactly one) is checked by the loader, which says which is missing.
    required: ['id', 'rule', 'reason', 'owner', 'approved_by', 'expires'],
    properties: {
      id: { type: 'string', pattern: RULE_ID_PATTERN, maxLength: MAX_ID_LENGTH, description: 'Permanent id, upper-case with dashes (it is the URL of the waiver page).' },
      rule: { type: 'string', minLength: 1, description: 'The id of the rule it waives.' },
      structures: { type: 'array', minItems: 1, items: { type: 'string' }, description: 'The ids of the structures it waives the rule for (or give applies_to).' },
      applies_to: { ...selector(), description: 'The structures it waives the rule for, selected as a rule selects them (or give structures).' },
      reason: name('Why the failure is accepted (Markdown).'),
      owner: name('Who answers for the exception.'),
      approved_by: name('Who approved it.'),
      expires: { type: 'string', pattern: CALENDAR_DATE_PATTERN, description: 'Last day the waiver holds, YYYY-MM-DD (UTC); from the day after, the failure counts again.' },
      still_within: {
        type: 'object',
        additionalProperties: false,
        description: "A limit the waived value must still meet: the rule's comparison, at or beyond the rule's limit.",
        properties: {
          at_least: { type: ['string', 'number'], description: 'Lower limit the waived value must still meet, in the unit of the quantity.' },
          at_most: { type: ['string', 'number'], description: 'Upper limit the waived value must still meet, in the unit of the quantity.' },
        },
      },
    },
  };
  return {
    $schema: 'http://json-schema.org/draft-07/schema#',
    $id: `${SCHEMA_BASE}waiver.schema.json`,
    title: 'plumbline waivers (one waiver, or a list of waivers)',
    ...waiver,
    type: ['object', 'array'],
    items: waiver,
  };
}

export function materialsSchema(): JsonSchema {
  return {
    $schema: 'http://json-schema.org/draft-07/schema#',
    $id: `${SCHEMA_BASE}materials.schema.json`,
    title: 'plumbline handbook materials',
    type: 'array',
    items: {
      type: 'object',
      additionalProperties: false,
      required: ['id', 'title'],
      properties: {
        id: { type: 'string', pattern: MATERIAL_ID_PATTERN, maxLength: MAX_ID_LENGTH },
        title: { type: 'string' },
        based_on: { type: 'string', description: 'A material whose properties this one starts from.' },
        source: { type: 'string', description: 'Where these values come from.' },
        ...propertiesFrom(MATERIAL_PROPERTIES),
        expansion: valueWithUnit('Alias of thermal_expansion.'),
      },
    },
  };
}

export function handbookSchema(): JsonSchema {
  return {
    $schema: 'http://json-schema.org/draft-07/schema#',
    $id: `${SCHEMA_BASE}handbook.schema.json`,
    title: 'plumbline handbook',
    type: 'object',
    additionalProperties: false,
    required: ['title'],
    properties: {
      title: { type: 'string' },
      organisation: { type: 'string' },
      summary: { type: 'string' },
      links: {
        type: 'object',
        additionalProperties: false,
        description: 'Where the report is published and where commits can be read: used for links in change-request summaries, SARIF and history pages.',
        properties: {
          report: { type: 'string', pattern: '^https?://[^\\s]+$', description: 'base URL of the published report, e.g. https://handbooks.example/fh-m12/' },
          commit: { type: 'string', pattern: '^https?://[^\\s]*\\{commit\\}[^\\s]*$', description: 'a commit page on the repository host, with {commit} where the commit id goes' },
        },
      },
    },
  };
}

export const SCHEMAS = {
  'structure.schema.json': structureSchema,
  'rule.schema.json': ruleSchema,
  'waiver.schema.json': waiverSchema,
  'materials.schema.json': materialsSchema,
  'handbook.schema.json': handbookSchema,
} as const;
