import { createRequire } from 'node:module';
import type { Ajv, ErrorObject } from 'ajv';
import type { ErrorCode } from './error-codes.js';
import { SpeedbandError } from './errors.js';
import { AJV_OPTIONS } from './schema-options.js';
import { cutText, quoted } from './quote.js';
import { closestName } from './closest-name.js';

export { AJV_OPTIONS } from './schema-options.js';

let sharedAjv: Ajv | undefined;

/**
 * One Ajv instance for the process (schemas compile once, on first use). Ajv is loaded only here, on
 * the first schema compiled at run time: the program's own file formats use precompiled validators.
 */
function ajv(): Ajv {
  if (sharedAjv === undefined) {
    const { Ajv: AjvClass } = createRequire(import.meta.url)('ajv') as typeof import('ajv');
    sharedAjv = new AjvClass(AJV_OPTIONS);
  }
  return sharedAjv;
}

/** A validator function as Ajv compiles it (or as its standalone code defines it): true when valid, problems in `errors`. */
export interface SchemaValidator {
  (value: unknown): boolean;
  errors?: ErrorObject[] | null;
}

/** The field names the schema allows where an `additionalProperties` error was raised (its schemaPath names that node). */
function knownFieldsAt(schema: object, schemaPath: string): string[] {
  let node: unknown = schema;
  const parts = schemaPath
    .replace(/^#\/?/, '')
    .split('/')
    .filter((part) => part !== '');
  for (const part of parts.slice(0, -1)) {
    node = node !== null && typeof node === 'object' ? (node as Record<string, unknown>)[part.replace(/~1/g, '/').replace(/~0/g, '~')] : undefined;
  }
  const properties = node !== null && typeof node === 'object' ? (node as { properties?: object }).properties : undefined;
  return properties === undefined ? [] : Object.keys(properties).filter((name) => name !== '$schema');
}

/** Text for one Ajv error: where, what was found, what was expected. */
function describeAjvError(error: ErrorObject, schema: object): string {
  const path = error.instancePath === '' ? '(top level)' : cutText(error.instancePath, 200);
  switch (error.keyword) {
    case 'required':
      return `${path}: missing required field "${String(error.params.missingProperty)}"`;
    case 'additionalProperties': {
      const found = String(error.params.additionalProperty);
      const known = knownFieldsAt(schema, error.schemaPath);
      const closest = closestName(found, known);
      const hint = closest !== null ? `did you mean "${closest}"?` : known.length > 0 ? `known fields here: ${known.join(', ')}` : 'check its spelling';
      return `${path}: unknown field ${quoted(found)} — ${hint}`;
    }
    case 'enum':
      return `${path}: ${error.message ?? 'not allowed'} (${(error.params.allowedValues as unknown[]).map(String).join(', ')})`;
    default:
      return `${path}: ${error.message ?? 'invalid'}`;
  }
}

/** A file format's schema and how its errors read (makeValidator). */
export interface ValidatorDefinition {
  /** The JSON Schema. */
  readonly schema: object;
  /** The error code of a value the schema refuses (e.g. 'vehicle.invalid'). */
  readonly code: ErrorCode;
  /** The format's name in messages: "not a valid <what>" (e.g. 'vehicle file'). */
  readonly what: string;
  /** The schema's validator from src/core/precompiled-validators.ts (generated; no Ajv compile at run time); without it the schema is compiled on first use. */
  readonly precompiled?: SchemaValidator;
  /** Words after the problems, e.g. where the format's reference is. */
  readonly reference?: () => string;
}

/**
 * Build a validator from a JSON Schema. The returned function checks a parsed
 * value and returns it typed, or throws a `SpeedbandError` with `code`
 * (e.g. 'vehicle.invalid'), the file and the JSON path of the first problem,
 * and every problem listed in the message.
 */
export function makeValidator<T>(definition: ValidatorDefinition): (value: unknown, file: string) => T {
  const { schema, code, what, precompiled, reference } = definition;
  let compiled: SchemaValidator | undefined = precompiled;
  return (value: unknown, file: string): T => {
    compiled ??= ajv().compile(schema);
    if (compiled(value)) return value as T;
    const errors = compiled.errors ?? [];
    const lines = errors.map((error) => describeAjvError(error, schema));
    throw new SpeedbandError(code, `not a valid ${what}:\n  ${lines.join('\n  ')}${reference === undefined ? '' : `\n${reference()}`}`, {
      location: { file, jsonPath: errors[0]?.instancePath || '/' },
      details: { problems: lines },
    });
  };
}

/** The strict JSON parser of every file speedband reads (src/core/json-text.ts), re-exported for its callers. */
export { parseJsonText } from './json-text.js';
