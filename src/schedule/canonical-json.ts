/**
 * Canonical JSON for checksums, following RFC 8785 (JSON Canonicalization Scheme) for the values a
 * schedule holds: object keys sorted by UTF-16 code units, no whitespace, strings escaped as
 * ECMAScript JSON.stringify does, numbers in ECMAScript's shortest round-trip form
 * (Number.prototype.toString: 0.1 → "0.1", 1e21 → "1e+21", 1e-7 → "1e-7", −0 → "0").
 * Non-finite numbers and undefined have no JSON form and are refused.
 */
import { SpeedbandError } from '../core/errors.js';

export function canonicalJson(value: unknown): string {
  if (value === null) return 'null';
  switch (typeof value) {
    case 'boolean':
      return value ? 'true' : 'false';
    case 'string':
      return JSON.stringify(value);
    case 'number':
      if (!Number.isFinite(value)) {
        throw new SpeedbandError('schedule.notSerialisable', `the number ${value} has no JSON form — every checksummed number must be finite`);
      }
      return Object.is(value, -0) ? '0' : String(value);
    case 'object': {
      if (Array.isArray(value)) return `[${value.map(canonicalJson).join(',')}]`;
      const record = value as Record<string, unknown>;
      const keys = Object.keys(record)
        .filter((key) => record[key] !== undefined)
        .sort();
      return `{${keys.map((key) => `${JSON.stringify(key)}:${canonicalJson(record[key])}`).join(',')}}`;
    }
    default:
      throw new SpeedbandError('schedule.notSerialisable', `a value of type ${typeof value} has no JSON form`);
  }
}
