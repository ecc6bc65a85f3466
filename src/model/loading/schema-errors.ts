// The JSON Schemas compiled once, and ajv's errors translated into diagnostics: unknown and
// missing fields, wrong types, values outside a list, ids.
import { Ajv, type ErrorObject, type ValidateFunction } from 'ajv';
import { handbookSchema, materialsSchema, ruleSchema, structureSchema, waiverSchema } from '../schema.ts';
import { FileReport, jsonType, sourceSpelling, suggest, valueAt, writtenText } from './file-report.ts';

export let validators: { structure: ValidateFunction; rule: ValidateFunction; waiver: ValidateFunction; materials: ValidateFunction; handbook: ValidateFunction } | undefined;
export function getValidators(): NonNullable<typeof validators> {
  if (!validators) {
    const ajv = new Ajv({ allErrors: true, strict: true, allowUnionTypes: true });
    validators = {
      structure: ajv.compile(structureSchema()),
      rule: ajv.compile(ruleSchema()),
      waiver: ajv.compile(waiverSchema()),
      materials: ajv.compile(materialsSchema()),
      handbook: ajv.compile(handbookSchema()),
    };
  }
  return validators;
}

/** Translate ajv's errors into diagnostics: unknown and missing fields, types, enums, ids. */
export function reportSchemaErrors(errors: ErrorObject[], report: FileReport, allowedAt: (pointer: string) => string[]): void {
  const seen = new Set<string>();
  // A value of the wrong type is one problem: its enum, pattern or length are not judged as well
  // (`orientation: 001` is the number 1, not also an orientation outside the list), nor its unit.
  for (const e of errors) if (e.keyword === 'type') report.mistyped.add(e.instancePath);
  for (const e of errors) {
    const value = valueAt(report.src.value, e.instancePath);
    let key = `${e.keyword}:${e.instancePath}`;
    if (e.keyword !== 'type' && report.mistyped.has(e.instancePath)) continue;
    switch (e.keyword) {
      case 'additionalProperties': {
        const name = (e.params as { additionalProperty: string }).additionalProperty;
        const pointer = `${e.instancePath}/${name}`;
        key += name;
        if (seen.has(key)) continue;
        const allowed = allowedAt(e.instancePath);
        report.add('unknown-field', pointer, { expected: `one of ${allowed.join(', ')}`, suggestions: suggest(name, allowed) }, 'key');
        break;
      }
      case 'required': {
        const name = (e.params as { missingProperty: string }).missingProperty;
        key += name;
        if (seen.has(key)) continue;
        // Placed at the mapping that lacks it, named by the path it should have.
        report.addAt('missing-field', e.instancePath, `${e.instancePath}/${name}`);
        break;
      }
      case 'type':
        // .inf and .nan are numbers the schema calls no number: where a number belongs, the problem
        // is that the value is not finite (said the same way readValue says it, so said once).
        if (typeof value === 'number' && !Number.isFinite(value) && allowsNumber(e)) {
          report.add('bad-value', e.instancePath, { expected: 'a finite value', found: sourceSpelling(report.src, e.instancePath) ?? String(value) });
          break;
        }
        report.add('wrong-type', e.instancePath, { expected: describeType((e.params as { type: string | string[] }).type), found: writtenText(report.src, e.instancePath, value, jsonType) });
        break;
      case 'maxLength':
        if (/\/id$|\/tags\/\d+$|\/film$/.test(e.instancePath)) {
          report.add('id-too-long', e.instancePath, { expected: `at most ${(e.params as { limit: number }).limit} characters (ids are addresses and file names)`, found: `${String(value).length} characters` });
        } else report.add('bad-value', e.instancePath, { expected: `at most ${(e.params as { limit: number }).limit} characters`, found: `${String(value).length} characters` });
        break;
      case 'minLength':
        report.add('bad-value', e.instancePath, { expected: 'a text that is not empty', found: jsonType(value) });
        break;
      case 'minItems': {
        const n = (e.params as { limit: number }).limit;
        report.add('bad-value', e.instancePath, { expected: `a list of at least ${n} ${n === 1 ? 'entry' : 'entries'} (or leave the field out)`, found: Array.isArray(value) && value.length === 0 ? 'an empty list' : jsonType(value) });
        break;
      }
      case 'uniqueItems':
        report.add('bad-value', e.instancePath, { expected: 'a list without repeated entries', found: jsonType(value) });
        break;
      case 'enum': {
        const allowed = (e.params as { allowedValues: unknown[] }).allowedValues.map(String);
        const isKind = e.instancePath === '/kind' || /\/kinds\/\d+$/.test(e.instancePath);
        report.add(isKind ? 'unknown-kind' : 'bad-value', e.instancePath, {
          expected: `one of ${allowed.join(', ')}`,
          found: String(value),
          suggestions: typeof value === 'string' ? suggest(value, allowed) : [],
        });
        break;
      }
      case 'pattern':
        if ((e as { propertyName?: string }).propertyName !== undefined) continue; // reported with propertyNames
        if (/\/id$/.test(e.instancePath)) {
          report.add('id-not-url-safe', e.instancePath, {
            expected: e.instancePath.includes('rule') || /^\/(\d+\/)?id$/.test(e.instancePath) ? describePattern(e.schemaPath) : 'lower-case letters, digits and single dashes',
            found: String(value),
          });
        } else if (/\/expires$/.test(e.instancePath)) {
          report.add('bad-date', e.instancePath, { expected: DATE_EXPECTED, found: jsonType(value) });
        } else {
          report.add('bad-value', e.instancePath, { expected: describePattern(e.schemaPath), found: jsonType(value) });
        }
        break;
      case 'propertyNames': {
        const name = (e.params as { propertyName: string }).propertyName;
        key += name;
        if (seen.has(key)) continue;
        report.add('bad-value', `${e.instancePath}/${name}`, { expected: 'a role name in lower case (letters, digits, underscores), such as body or fill', found: `"${name}"` }, 'key');
        break;
      }
      case 'if':
        continue;
      default:
        report.add('bad-value', e.instancePath, { expected: e.message ?? e.keyword, found: jsonType(value) });
    }
    seen.add(key);
  }
}

export function allowsNumber(e: ErrorObject): boolean {
  const t = (e.params as { type: string | string[] }).type;
  return (Array.isArray(t) ? t : [t]).includes('number');
}

export function describeType(t: string | string[]): string {
  const names: Record<string, string> = { string: 'text', number: 'a number', object: 'a mapping', array: 'a list', integer: 'a whole number', boolean: 'true or false' };
  const list = Array.isArray(t) ? t : [t];
  return list.map((x) => names[x] ?? x).join(' or ');
}

export function describePattern(schemaPath: string): string {
  if (schemaPath.includes('quantity')) return 'a quantity name such as geometry.aspect_ratio';
  return 'an id of letters, digits and single dashes (lower-case for structures, upper-case for rules and waivers)';
}

export const DATE_EXPECTED = 'a calendar date written YYYY-MM-DD, such as 2027-06-30';
