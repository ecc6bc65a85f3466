// The OASIS SARIF 2.1.0 JSON Schema (shipped as test data) compiled for validating logs.
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { Ajv, type ValidateFunction } from 'ajv';
import addFormats from 'ajv-formats';

const SCHEMA_FILE = resolve(import.meta.dirname, '../data/sarif-schema-2.1.0.json');
export type Json = null | boolean | number | string | Json[] | { [k: string]: Json };
export const schemaText = readFileSync(SCHEMA_FILE, 'utf8');
export const rawSchema = JSON.parse(schemaText) as { [k: string]: Json };

/**
 * The OASIS schema is written in JSON Schema draft-04 ("$schema": draft-04, "id" for its id). Ajv 8
 * has no draft-04 meta-schema, so it is compiled as draft-07 after two edits in memory: "$schema" is
 * dropped and "id" becomes "$id". That is sound because the schema uses no keyword whose meaning
 * changed between the drafts (draft-04's boolean exclusiveMinimum/exclusiveMaximum; checked below).
 * Strict mode stays on except two checks the standard's schema does not meet by design:
 * `allowUnionTypes` (it writes "type": ["array", "null"]) and `strictRequired: false` (it says
 * "at least one of these" as anyOf: [{ required: [a] }, { required: [b] }], whose required names are
 * declared in the enclosing "properties"). ajv-formats supplies uri, uri-reference and date-time.
 */
export function sarifValidator(): ValidateFunction {
  const { $schema: _draft04, id, ...body } = rawSchema;
  const ajv = new Ajv({ strict: true, strictRequired: false, allowUnionTypes: true, allErrors: true });
  addFormats.default(ajv);
  return ajv.compile({ ...body, $id: id as string });
}
