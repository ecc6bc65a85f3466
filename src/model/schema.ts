// JSON Schemas of the handbook files, generated from the parameter catalogue so they never drift
// from what the loader accepts. They are published with the site for editors to validate against.
import { BLOCK_LIST, type InputBlock, type InputPart } from './blocks.ts';
import { GEOMETRY_PARAMS, MATERIAL_PROPERTIES, PROPERTY_ALIASES, type ParamSpec } from './parameters.ts';
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

/** A block's or a part's numbers (with the aliases of material properties) and its other fields. */
function mappingSchema(m: { inputs: Record<string, ParamSpec>; fields?: Record<string, JsonSchema>; required?: readonly string[] }, parts: Record<string, JsonSchema> = {}): JsonSchema {
  const aliases = Object.fromEntries(Object.keys(m.inputs).flatMap((k) => (PROPERTY_ALIASES[k] ? [[PROPERTY_ALIASES[k], valueWithUnit(`Alias of ${k}.`)]] : [])));
  return {
    type: 'object',
    additionalProperties: false,
    ...(m.required ? { required: [...m.required] } : {}),
    properties: { ...(m.fields ?? {}), ...propertiesFrom(m.inputs), ...aliases, ...parts },
  };
}

function partSchema(p: InputPart): JsonSchema {
  const description = p.description ? { description: p.description } : {};
  if (p.form === 'values') return { type: 'array', items: { type: ['string', 'number'] }, ...description };
  if (p.form === 'list') return { type: 'array', minItems: 1, ...description, items: mappingSchema(p) };
  return { ...mappingSchema(p), ...description };
}

/** The schema of an input block, from its declaration. */
function blockSchema(b: InputBlock): JsonSchema {
  const parts = Object.fromEntries(Object.entries(b.parts ?? {}).map(([k, p]) => [k, partSchema(p)]));
  if (b.form === 'list') return { type: 'array', minItems: 1, description: b.description, items: mappingSchema(b) };
  return { ...mappingSchema(b, parts), description: b.description };
}

/** An input's dotted path, as rules, sweeps and variations name it (`geometry.cd`). */
const INPUT_PATH = '^[a-z][a-z0-9_]*(\\.[a-z0-9_-]+)+$';

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
      ...Object.fromEntries(BLOCK_LIST.map((b) => [b.key, blockSchema(b)])),
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
      process_window: {
        type: 'object',
        additionalProperties: false,
        required: ['inputs'],
        description: 'Two inputs whose plane the structure page maps: the region where every blocking rule passes, the other inputs at nominal, with the rule that bounds each edge.',
        properties: { inputs: { type: 'array', minItems: 2, maxItems: 2, items: { type: 'string', pattern: INPUT_PATH } } },
      },
      variation: {
        type: 'object',
        additionalProperties: false,
        description: 'How toleranced inputs vary when a rule samples them (evaluate_at: yield, and the probability of failure of a worst case). Without it each tolerance band is ±3σ of a normal distribution and inputs vary independently.',
        properties: {
          uniform: { type: 'array', minItems: 1, items: { type: 'string', pattern: INPUT_PATH }, description: 'Inputs whose tolerance band is spread evenly instead of ±3σ normal.' },
          correlated: {
            type: 'array',
            minItems: 1,
            description: 'Pairs of inputs that vary together (a CD and its wall from one litho step).',
            items: {
              type: 'object',
              additionalProperties: false,
              required: ['inputs', 'coefficient'],
              properties: {
                inputs: { type: 'array', minItems: 2, maxItems: 2, items: { type: 'string', pattern: INPUT_PATH } },
                coefficient: { type: 'number', exclusiveMinimum: -1, exclusiveMaximum: 1, description: 'Correlation of the two inputs\' underlying normal deviates.' },
              },
            },
          },
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
  map: { type: 'array', minItems: 2, maxItems: 2, items: { type: 'string', pattern: INPUT_PATH }, description: 'Two inputs whose plane the verdict page maps as a process window: where the rule passes, the other inputs at nominal.' },
  evaluate_at: { type: 'string', enum: ['nominal', 'worst-case', 'yield'], description: 'nominal: the written values; worst-case: the worst corner of every toleranced input; yield: the fraction of sampled inputs that pass, against required_yield.' },
  required_yield: { type: ['string', 'number'], description: 'With evaluate_at: yield, the fraction that must pass: a number below 1 (0.997) or a percentage ("99.7 %").' },
  sampling: {
    type: 'object',
    additionalProperties: false,
    description: 'How a yield rule samples (all optional).',
    properties: {
      confidence: { type: ['string', 'number'], description: 'Two-sided confidence with which the sequential stop decides (default 95 %).' },
      max_samples: { type: 'integer', minimum: 128, maximum: 1048576, description: 'Most samples before the point estimate decides (default 16384).' },
      seed: { type: 'integer', minimum: 0, maximum: 4294967295, description: 'Seed of the shifted quasi-random sequence (default 1).' },
    },
  },
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
