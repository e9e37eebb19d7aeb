import { Ajv, type ErrorObject, type ValidateFunction } from 'ajv';
import { SpeedbandError } from './errors.js';

let sharedAjv: Ajv | undefined;

/**
 * Ajv settings of the process. `validateSchema: false`: our schemas are constants of the program, so
 * checking them against the JSON Schema meta-schema at every start (compiling the meta-schema costs
 * ≈ 60 ms, a tenth of a `build`) is done once in the tests instead (test/core/schema.test.ts);
 * strict mode still refuses unknown keywords while compiling.
 */
export const AJV_OPTIONS = { allErrors: true, strict: true, allowUnionTypes: true, validateSchema: false } as const;

/** One Ajv instance for the process (schemas compile once, on first use). */
function ajv(): Ajv {
  sharedAjv ??= new Ajv(AJV_OPTIONS);
  return sharedAjv;
}

/** Text for one Ajv error: where, what was found, what was expected. */
function describeAjvError(error: ErrorObject): string {
  const path = error.instancePath === '' ? '(top level)' : error.instancePath;
  switch (error.keyword) {
    case 'required':
      return `${path}: missing required field "${String(error.params.missingProperty)}"`;
    case 'additionalProperties':
      return `${path}: unknown field "${String(error.params.additionalProperty)}" — check its spelling against the schema`;
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
 * and every problem listed in the message.
 */
export function makeValidator<T>(schema: object, code: string, what: string): (value: unknown, file: string) => T {
  let compiled: ValidateFunction | undefined;
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

/** Parse JSON text with an error that names the file and line of a syntax error. */
export function parseJsonText(text: string, file: string): unknown {
  try {
    return JSON.parse(text.charCodeAt(0) === 0xfeff ? text.slice(1) : text);
  } catch (cause) {
    const message = (cause as Error).message;
    const position = /position (\d+)/.exec(message);
    const line = position ? text.slice(0, Number(position[1])).split('\n').length : undefined;
    throw new SpeedbandError('json.syntax', `not valid JSON: ${message} — fix the syntax`, {
      location: { file, line },
      cause,
    });
  }
}
