/**
 * A plan value that may vary with speed — one number, a table over speed (linear between its speeds, end
 * values held beyond them), or an expression in speed_mps (src/core/speed-expression.ts: parsed once with
 * mathjs, restricted scope) — made into a function of speed. Expressions are compiled when the function is
 * made, so a plan's errors come before any tuning or checking; every value is checked against the field's
 * range where it is evaluated. Errors name the plan field (JSON path), the expression and, for a value out
 * of range, the speed.
 */
import { valueAtSpeed } from '../core/by-speed.js';
import { SpeedbandError } from '../core/errors.js';
import { quoted } from '../core/quote.js';
import { compileSpeedExpression } from '../core/speed-expression.js';
import { planReferenceHint } from './plan-reference-path.js';
import type { SpeedVarying } from './plan.js';

/** What values a field takes: the range in words (for the error) and the test. */
export interface ValueRange {
  readonly words: string;
  readonly holds: (value: number) => boolean;
}

export const POSITIVE: ValueRange = { words: 'a positive number', holds: (value) => value > 0 };

const shown = (value: number): string => String(Number(value.toPrecision(6)));

/** Where a speed-varying value sits in the plan, for errors. */
export interface FieldPlace {
  /** The field's name as the plan writes it. */
  readonly name: string;
  /** JSON path of the field in the plan. */
  readonly jsonPath: string;
  readonly file?: string;
}

/**
 * The value as a function of speed (m/s). Throws `plan.invalid` at the field's JSON path for an expression
 * outside the restricted scope or with a syntax error (naming the character position); the function throws
 * `plan.invalid` when the value at a speed is not finite or outside `range` (naming the speed and the value).
 */
export async function compileSpeedVarying(value: SpeedVarying, range: ValueRange, place: FieldPlace): Promise<(speed_mps: number) => number> {
  if (typeof value !== 'string') {
    return (speed_mps) => checked(valueAtSpeed(value, speed_mps), JSON.stringify(value), speed_mps, range, place);
  }
  const compiled = await compileSpeedExpression(value);
  if (compiled.kind === 'refused') {
    const where = compiled.position === null ? '' : ` (at character ${compiled.position} of the expression)`;
    throw new SpeedbandError(
      'plan.invalid',
      `${place.name} ${quoted(value)}: ${compiled.reason}${where} — write a number, a table {"speeds_mps": […], "values": […]}, or an expression in speed_mps such as "max(15, 1.2 * speed_mps)"\n${planReferenceHint()}`,
      {
        location: { file: place.file, jsonPath: place.jsonPath },
        details: { parameter: place.name, reason: compiled.reason, position: compiled.position },
      },
    );
  }
  return (speed_mps) => {
    const result = compiled.evaluate(speed_mps);
    return checked(result.kind === 'number' ? result.value : result.found, quoted(value), speed_mps, range, place);
  };
}

function checked(value: number | string, text: string, speed_mps: number, range: ValueRange, place: FieldPlace): number {
  if (typeof value === 'number' && Number.isFinite(value) && range.holds(value)) return value;
  const found = typeof value === 'number' ? shown(value) : value;
  throw new SpeedbandError(
    'plan.invalid',
    `${place.name} ${text} gives ${found} at ${shown(speed_mps)} m/s — it must be ${range.words} at every speed it is used at; change the value (e.g. bound an expression with max(…, …) or min(…, …))\n${planReferenceHint()}`,
    { location: { file: place.file, jsonPath: place.jsonPath }, details: { parameter: place.name, speed_mps, found } },
  );
}
