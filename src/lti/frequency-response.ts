/**
 * Frequency responses on a grid, in typed arrays (hot loops on plain numbers:
 * generic complex-number objects are ~40× slower in sweeps, docs/domain.md §5b).
 */
import { SpeedbandError } from '../core/errors.js';
import type { FrequencyResponse, TransferFunction } from './types.js';

/**
 * G(jω) for every ω in frequency_radps (rad/s), with the exact delay e^(−jωθ)
 * applied analytically (no phase unwrapping involved). Polynomials are evaluated by
 * complex Horner's rule; the result shares no memory with the input grid.
 */
export function frequencyResponse(g: TransferFunction, frequency_radps: Float64Array): FrequencyResponse {
  const count = frequency_radps.length;
  const real = new Float64Array(count);
  const imaginary = new Float64Array(count);
  const num = g.numerator;
  const den = g.denominator;
  const delay = g.delay_s;
  for (let k = 0; k < count; k++) {
    const w = frequency_radps[k];
    let nRe = 0;
    let nIm = 0;
    for (let i = 0; i < num.length; i++) {
      const next = -nIm * w + num[i];
      nIm = nRe * w;
      nRe = next;
    }
    let dRe = 0;
    let dIm = 0;
    for (let i = 0; i < den.length; i++) {
      const next = -dIm * w + den[i];
      dIm = dRe * w;
      dRe = next;
    }
    const d2 = dRe * dRe + dIm * dIm;
    const re = (nRe * dRe + nIm * dIm) / d2;
    const im = (nIm * dRe - nRe * dIm) / d2;
    if (delay === 0) {
      real[k] = re;
      imaginary[k] = im;
    } else {
      const c = Math.cos(w * delay);
      const s = Math.sin(w * delay);
      real[k] = re * c + im * s;
      imaginary[k] = im * c - re * s;
    }
  }
  return { frequency_radps: Float64Array.from(frequency_radps), real, imaginary };
}

/**
 * `count` frequencies (rad/s) equally spaced in log10 from low to high, both ends
 * included exactly. Needs 0 < low < high and count ≥ 2; throws `lti.invalidFrequencyGrid`.
 */
export function logarithmicFrequencies(low: number, high: number, count: number): Float64Array {
  if (!(low > 0) || !(high > low) || !Number.isFinite(high) || !Number.isInteger(count) || count < 2) {
    throw new SpeedbandError(
      'lti.invalidFrequencyGrid',
      `frequency grid from ${low} to ${high} rad/s with ${count} points — expected 0 < low < high (finite) and an integer count ≥ 2`,
      { details: { low, high, count } },
    );
  }
  const grid = new Float64Array(count);
  const logLow = Math.log10(low);
  const step = (Math.log10(high) - logLow) / (count - 1);
  for (let k = 0; k < count; k++) grid[k] = Math.pow(10, logLow + k * step);
  grid[0] = low;
  grid[count - 1] = high;
  return grid;
}

/** Magnitude |G(jω)| per grid point (ratio, not dB). */
export function responseMagnitude(response: FrequencyResponse): Float64Array {
  const out = new Float64Array(response.real.length);
  for (let k = 0; k < out.length; k++) out[k] = Math.hypot(response.real[k], response.imaginary[k]);
  return out;
}
