/**
 * Rational transfer functions with a pure input delay, G(s) = N(s)/D(s)·e^(−θs),
 * as plain readonly records (`TransferFunction`, src/lti/types.ts). Coefficients
 * highest power first; denominators are stored monic (leading coefficient 1).
 */
import { SpeedbandError } from '../core/errors.js';
import { addPolynomials, evaluatePolynomial, multiplyPolynomials, scalePolynomial, trimPolynomial } from './polynomial.js';
import { polynomialRoots } from './roots.js';
import type { Complex, TransferFunction } from './types.js';

/**
 * Build and validate N(s)/D(s)·e^(−delay_s·s). Both coefficient lists must be
 * non-empty and finite, the denominator must not be the zero polynomial, and
 * delay_s must be finite and ≥ 0 (s). Leading zeros are dropped and the result is
 * normalised so that the denominator is monic. Throws `lti.invalidTransferFunction`.
 */
export function transferFunction(numerator: readonly number[], denominator: readonly number[], delay_s = 0): TransferFunction {
  const invalid = (what: string, details: Record<string, unknown>): never => {
    throw new SpeedbandError('lti.invalidTransferFunction', `transfer function ${what}`, { details });
  };
  if (numerator.length === 0) invalid('numerator is empty — expected at least one coefficient (highest power first), e.g. [1]', {});
  if (denominator.length === 0) invalid('denominator is empty — expected at least one coefficient (highest power first), e.g. [1, 1]', {});
  if (!numerator.every(Number.isFinite))
    invalid(`numerator [${numerator.join(', ')}] has a non-finite coefficient — expected finite numbers`, { numerator: [...numerator] });
  if (!denominator.every(Number.isFinite))
    invalid(`denominator [${denominator.join(', ')}] has a non-finite coefficient — expected finite numbers`, { denominator: [...denominator] });
  if (!Number.isFinite(delay_s) || delay_s < 0) invalid(`delay_s is ${delay_s} — expected a finite delay ≥ 0 s`, { delay_s });
  const den = trimPolynomial(denominator);
  if (den.length === 1 && den[0] === 0)
    invalid('denominator is the zero polynomial — expected a non-zero leading coefficient', { denominator: [...denominator] });
  const lead = den[0];
  return {
    numerator: trimPolynomial(numerator).map((c) => c / lead),
    denominator: den.map((c) => c / lead),
    delay_s,
  };
}

/** a·b in series: numerators and denominators multiply, delays add. */
export function seriesConnection(a: TransferFunction, b: TransferFunction): TransferFunction {
  return transferFunction(multiplyPolynomials(a.numerator, b.numerator), multiplyPolynomials(a.denominator, b.denominator), a.delay_s + b.delay_s);
}

/**
 * a + b in parallel: (Na·Db + Nb·Da)/(Da·Db)·e^(−θs). Only defined here for equal
 * delays (a sum of different delays is not a rational function times one delay);
 * throws `lti.unequalDelays` otherwise.
 */
export function parallelConnection(a: TransferFunction, b: TransferFunction): TransferFunction {
  if (a.delay_s !== b.delay_s) {
    throw new SpeedbandError(
      'lti.unequalDelays',
      `parallel connection needs equal delays, found ${a.delay_s} s and ${b.delay_s} s — replace the delays by Padé approximants (replaceDelayWithPade) first`,
      { details: { delayA_s: a.delay_s, delayB_s: b.delay_s } },
    );
  }
  const numerator = addPolynomials(multiplyPolynomials(a.numerator, b.denominator), multiplyPolynomials(b.numerator, a.denominator));
  return transferFunction(numerator, multiplyPolynomials(a.denominator, b.denominator), a.delay_s);
}

/**
 * Closed loop of a unity negative-feedback loop, T = L/(1 + L) = N/(D + N), for a
 * delay-free open loop L = N/D. A loop with delay has no rational closed loop:
 * throws `lti.delayInLoop` (use replaceDelayWithPade first).
 */
export function unityFeedback(openLoop: TransferFunction): TransferFunction {
  if (openLoop.delay_s !== 0) {
    throw new SpeedbandError(
      'lti.delayInLoop',
      `unity feedback needs a delay-free loop, found delay ${openLoop.delay_s} s — replace the delay by a Padé approximant (replaceDelayWithPade, order from padeOrderFor) first`,
      { details: { delay_s: openLoop.delay_s } },
    );
  }
  return transferFunction(openLoop.numerator, addPolynomials(openLoop.denominator, openLoop.numerator), 0);
}

/** g·k (a static gain k, any sign). */
export function scaleTransferFunction(g: TransferFunction, k: number): TransferFunction {
  return transferFunction(scalePolynomial(g.numerator, k), g.denominator, g.delay_s);
}

/**
 * G(jω) at ω = frequency_radps (rad/s), including the exact delay factor
 * e^(−jωθ) = cos(ωθ) − j·sin(ωθ). Returns ±Infinity/NaN parts at a pole on the axis.
 */
export function evaluateTransferFunction(g: TransferFunction, frequency_radps: number): Complex {
  const n = evaluatePolynomial(g.numerator, 0, frequency_radps);
  const d = evaluatePolynomial(g.denominator, 0, frequency_radps);
  const d2 = d.re * d.re + d.im * d.im;
  const ratioRe = (n.re * d.re + n.im * d.im) / d2;
  const ratioIm = (n.im * d.re - n.re * d.im) / d2;
  if (g.delay_s === 0) return { re: ratioRe, im: ratioIm };
  const angle = frequency_radps * g.delay_s;
  const c = Math.cos(angle);
  const s = Math.sin(angle);
  return { re: ratioRe * c + ratioIm * s, im: ratioIm * c - ratioRe * s };
}

/** Poles: roots of the denominator (rad/s), sorted by real then imaginary part. */
export function transferFunctionPoles(g: TransferFunction): Complex[] {
  return polynomialRoots(g.denominator);
}

/** Zeros: roots of the numerator (rad/s); none for a constant or zero numerator. */
export function transferFunctionZeros(g: TransferFunction): Complex[] {
  const numerator = trimPolynomial(g.numerator);
  if (numerator.length <= 1) return [];
  return polynomialRoots(numerator);
}

/**
 * Steady-state gain G(0) = N(0)/D(0) (the delay does not change it). Common factors
 * of s are cancelled first; null when a pole at s = 0 remains (integrating plant).
 */
export function dcGain(g: TransferFunction): number | null {
  const numerator = trimPolynomial(g.numerator);
  let numEnd = numerator.length;
  let denEnd = g.denominator.length;
  while (numEnd > 1 && denEnd > 1 && numerator[numEnd - 1] === 0 && g.denominator[denEnd - 1] === 0) {
    numEnd--;
    denEnd--;
  }
  const d0 = g.denominator[denEnd - 1];
  if (d0 === 0) return numerator.every((c) => c === 0) ? 0 : null;
  return numerator[numEnd - 1] / d0;
}

/** Relative degree: deg D − deg N (≥ 0 for a proper G; the zero numerator counts as degree 0). */
export function relativeDegree(g: TransferFunction): number {
  return trimPolynomial(g.denominator).length - trimPolynomial(g.numerator).length;
}
