/**
 * The one JSON parser for the files speedband reads (vehicle, plan, models, schedule, log profile):
 * strict RFC 8259 syntax (JSON.parse), a leading byte-order mark accepted, and a key repeated in one
 * object refused. RFC 8259 §4 leaves the meaning of a repeated name to the implementation, and
 * JSON.parse silently keeps the last value: a vehicle file with "mass_kg": 3400 … "mass_kg": 1 would
 * build a schedule for a vehicle of 1 kg. The repeated keys are found by jsonc-parser's event visitor
 * (the parser of a widely used editor's JSON support; it reports each property with its line, column
 * and JSON path), after JSON.parse has accepted the text, so the two must agree on the syntax.
 */
import { visit } from 'jsonc-parser';
import { SpeedbandError } from './errors.js';
import { quoted } from './quote.js';

/** A JSON Pointer (RFC 6901) for a path of keys and indices: '' for the top level. */
export function jsonPointer(path: readonly (string | number)[]): string {
  return path.map((part) => `/${String(part).replace(/~/g, '~0').replace(/\//g, '~1')}`).join('');
}

/** Parse JSON text with errors that name the file, line and JSON path (syntax errors, repeated keys). */
export function parseJsonText(text: string, file: string): unknown {
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  let value: unknown;
  try {
    value = JSON.parse(body);
  } catch (cause) {
    const message = (cause as Error).message;
    const position = /position (\d+)/.exec(message);
    const line = position ? body.slice(0, Number(position[1])).split('\n').length : undefined;
    throw new SpeedbandError('json.syntax', `not valid JSON: ${message.length > 200 ? `${message.slice(0, 200)}…` : message} — fix the syntax`, {
      location: { file, line },
      cause,
    });
  }
  refuseRepeatedKeys(body, file);
  return value;
}

/** Throw `json.duplicateKey` at the first key that appears twice in one object. */
function refuseRepeatedKeys(text: string, file: string): void {
  // Only objects and arrays can hold a repeated key; a scalar document needs no visit.
  if (!/[{]/.test(text)) return;
  const open: Map<string, number>[] = [];
  let found: SpeedbandError | undefined;
  visit(
    text,
    {
      onObjectBegin: () => {
        open.push(new Map());
        return found === undefined;
      },
      onObjectEnd: () => {
        open.pop();
      },
      onObjectProperty: (key, _offset, _length, startLine, startCharacter, pathSupplier) => {
        const keys = open[open.length - 1];
        if (found !== undefined || keys === undefined) return;
        const first = keys.get(key);
        if (first === undefined) {
          keys.set(key, startLine + 1);
          return;
        }
        const jsonPath = jsonPointer([...pathSupplier(), key]);
        found = new SpeedbandError(
          'json.duplicateKey',
          `the key ${quoted(key)} appears twice in the same object (lines ${first} and ${startLine + 1}) — JSON does not say which value counts, ` +
            'so speedband refuses to guess: keep one of them',
          { location: { file, line: startLine + 1, column: startCharacter + 1, jsonPath }, details: { key, firstLine: first } },
        );
      },
    },
    { disallowComments: true, allowTrailingComma: false },
  );
  if (found !== undefined) throw found;
}
