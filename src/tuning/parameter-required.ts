import { SpeedbandError } from '../core/errors.js';
import type { RuleName } from './types.js';

/**
 * The typed error for a rule parameter that has no usable default for this model (code
 * `tuning.parameterRequired`), e.g. a closed-loop time constant defaulted from a zero dead time.
 */
export function parameterRequired(rule: RuleName, parameter: string, reason: string): SpeedbandError {
  return new SpeedbandError('tuning.parameterRequired', `rule ${rule} needs ${parameter}: ${reason} — give it explicitly`, {
    details: { rule, parameter, reason },
  });
}

/** Throw `tuning.invalidParameter` unless value is finite and > 0. */
export function requirePositive(rule: RuleName, parameter: string, value: number): number {
  if (!(Number.isFinite(value) && value > 0)) {
    throw new SpeedbandError('tuning.invalidParameter', `rule ${rule}: ${parameter} is ${value}; expected a finite number above 0`, {
      details: { rule, parameter, value },
    });
  }
  return value;
}
