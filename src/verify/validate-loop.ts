/**
 * Checks on an `OpenLoop` before analysis, as typed errors (`verify.invalidLoop`,
 * `verify.improperLoop`) that say what was found and what to do.
 */
import { SpeedbandError } from '../core/errors.js';
import { trimPolynomial } from '../lti/polynomial.js';
import type { OpenLoop } from './types.js';

const invalid = (message: string, jsonPath: string, details: Record<string, unknown>): never => {
  throw new SpeedbandError('verify.invalidLoop', message, { location: { jsonPath }, details });
};

/** Throws `verify.invalidLoop` unless `values` is a non-empty list of finite numbers; `name` is its JSON path. */
export function checkCoefficients(values: readonly number[], name: string): void {
  if (!Array.isArray(values) || values.length === 0) invalid(`${name} is empty — expected coefficients, highest power first, e.g. [1, 2]`, name, {});
  values.forEach((value, i) => {
    if (typeof value !== 'number' || !Number.isFinite(value)) {
      invalid(`${name}[${i}] is ${String(value)} — expected a finite number (coefficients highest power first)`, `${name}[${i}]`, { [name]: [...values] });
    }
  });
}

/** Validate and return the loop with leading zeros trimmed. Throws `SpeedbandError`. */
export function validateOpenLoop(loop: OpenLoop): OpenLoop {
  checkCoefficients(loop.numerator, 'numerator');
  checkCoefficients(loop.denominator, 'denominator');
  if (typeof loop.delay_s !== 'number' || !Number.isFinite(loop.delay_s) || loop.delay_s < 0) {
    invalid(`delay_s is ${String(loop.delay_s)} — expected a finite delay ≥ 0 s`, 'delay_s', { delay_s: loop.delay_s });
  }
  const numerator = trimPolynomial(loop.numerator);
  const denominator = trimPolynomial(loop.denominator);
  if (denominator.length === 1 && denominator[0] === 0) invalid('denominator is the zero polynomial — expected a non-zero coefficient', 'denominator', {});
  if (numerator.length > denominator.length) {
    throw new SpeedbandError(
      'verify.improperLoop',
      `the loop has more zeros (${numerator.length - 1}) than poles (${denominator.length - 1}): its gain grows without bound at high frequency — add the derivative filter the firmware runs (derivative filter N, Tf = Td/N) or a plant lag`,
      { location: { jsonPath: 'numerator' }, details: { numerator, denominator } },
    );
  }
  const discrete = loop.discreteController;
  if (discrete !== undefined) {
    checkCoefficients(discrete.numerator, 'discreteController.numerator');
    checkCoefficients(discrete.denominator, 'discreteController.denominator');
    checkCoefficients(discrete.continuousCounterpart.numerator, 'discreteController.continuousCounterpart.numerator');
    checkCoefficients(discrete.continuousCounterpart.denominator, 'discreteController.continuousCounterpart.denominator');
    if (!(discrete.sampleTime_s > 0) || !Number.isFinite(discrete.sampleTime_s)) {
      invalid(
        `discreteController.sampleTime_s is ${String(discrete.sampleTime_s)} — expected a finite sample time > 0 s`,
        'discreteController.sampleTime_s',
        {},
      );
    }
  }
  return { ...loop, numerator, denominator };
}
