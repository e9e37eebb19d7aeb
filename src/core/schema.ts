import { createRequire } from 'node:module';
import type { Ajv, ErrorObject } from 'ajv';
import { SpeedbandError } from './errors.js';
import { AJV_OPTIONS } from './schema-options.js';
import { cutText, quoted } from './quote.js';

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

/** Text for one Ajv error: where, what was found, what was expected. */
function describeAjvError(error: ErrorObject): string {
  const path = error.instancePath === '' ? '(top level)' : cutText(error.instancePath, 200);
  switch (error.keyword) {
    case 'required':
      return `${path}: missing required field "${String(error.params.missingProperty)}"`;
    case 'additionalProperties':
      return `${path}: unknown field ${quoted(String(error.params.additionalProperty))} — check its spelling against the schema`;
    case 'enum':
      return `${path}: ${error.message ?? 'not allowed'} (${(error.params.allowedValues as unknown[]).map(String).join(', ')})`;
    default:
      return `${path}: ${error.message ?? 'invalid'}`;
  }
}

/**
 * Build a validator from a JSON Schema. The returned function checks a parsed
 * value and returns it typed, or throws a `SpeedbandError` with `code`
 * (e.g. 'vehicle.invalid'), the file and the JSON path of the first problem,
 * and every problem listed in the message. `precompiled`: the schema's validator from
 * src/core/precompiled-validators.ts (generated; no Ajv compile at run time); without it the
 * schema is compiled on first use.
 */
export function makeValidator<T>(schema: object, code: string, what: string, precompiled?: SchemaValidator): (value: unknown, file: string) => T {
  let compiled: SchemaValidator | undefined = precompiled;
  return (value: unknown, file: string): T => {
    compiled ??= ajv().compile(schema);
    if (compiled(value)) return value as T;
    const errors = compiled.errors ?? [];
    const lines = errors.map(describeAjvError);
    throw new SpeedbandError(code, `not a valid ${what}:\n  ${lines.join('\n  ')}`, {
      location: { file, jsonPath: errors[0]?.instancePath || '/' },
      details: { problems: lines },
    });
  };
}

/** The strict JSON parser of every file speedband reads (src/core/json-text.ts), re-exported for its callers. */
export { parseJsonText } from './json-text.js';
