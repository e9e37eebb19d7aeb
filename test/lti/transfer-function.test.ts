import { describe, expect, it } from 'vitest';
import { isSpeedbandError } from '../../src/core/errors.js';
import {
  dcGain,
  evaluateTransferFunction,
  parallelConnection,
  relativeDegree,
  scaleTransferFunction,
  seriesConnection,
  transferFunction,
  transferFunctionPoles,
  transferFunctionZeros,
  unityFeedback,
} from '../../src/lti/transfer-function.js';

function codeOf(work: () => unknown): string | undefined {
  try {
    work();
  } catch (error) {
    return isSpeedbandError(error) ? error.code : 'not a SpeedbandError';
  }
  return undefined;
}

describe('transferFunction(numerator, denominator, delay_s)', () => {
  it('normalises to a monic denominator and drops leading zeros', () => {
    const g = transferFunction([0, 4, 2], [2, 6, 4], 0.1);
    expect(g).toEqual({ numerator: [2, 1], denominator: [1, 3, 2], delay_s: 0.1 });
  });

  it('refuses empty, non-finite, zero-denominator and negative-delay input with lti.invalidTransferFunction', () => {
    expect(codeOf(() => transferFunction([], [1]))).toBe('lti.invalidTransferFunction');
    expect(codeOf(() => transferFunction([1], []))).toBe('lti.invalidTransferFunction');
    expect(codeOf(() => transferFunction([1, Number.NaN], [1, 1]))).toBe('lti.invalidTransferFunction');
    expect(codeOf(() => transferFunction([1], [0, 0]))).toBe('lti.invalidTransferFunction');
    expect(codeOf(() => transferFunction([1], [1, 1], -0.1))).toBe('lti.invalidTransferFunction');
    expect(codeOf(() => transferFunction([1], [1, 1], Number.POSITIVE_INFINITY))).toBe('lti.invalidTransferFunction');
  });
});

describe('connections', () => {
  it('seriesConnection multiplies and adds delays; parallelConnection adds over a common denominator', () => {
    const a = transferFunction([1], [1, 1], 0.2);
    const b = transferFunction([2], [1, 3], 0.05);
    const series = seriesConnection(a, b);
    expect(series.numerator).toEqual([2]);
    expect(series.denominator).toEqual([1, 4, 3]);
    expect(series.delay_s).toBeCloseTo(0.25, 15);
    // Source: partial fractions by hand: 1/(s+1) + 2/(s+3) = (3s+5)/(s²+4s+3).
    const sum = parallelConnection(transferFunction([1], [1, 1]), transferFunction([2], [1, 3]));
    expect(sum).toEqual({ numerator: [3, 5], denominator: [1, 4, 3], delay_s: 0 });
    expect(codeOf(() => parallelConnection(a, b))).toBe('lti.unequalDelays');
  });

  it('unityFeedback of K/(s(s+a)) gives K/(s² + a s + K); a loop with delay is refused', () => {
    // Source: textbook closed loop T = L/(1+L) (e.g. Ogata, Modern Control Engineering, second-order servo).
    const closed = unityFeedback(transferFunction([4], [1, 2, 0]));
    expect(closed).toEqual({ numerator: [4], denominator: [1, 2, 4], delay_s: 0 });
    expect(codeOf(() => unityFeedback(transferFunction([1], [1, 0], 0.1)))).toBe('lti.delayInLoop');
    expect(scaleTransferFunction(closed, -2).numerator).toEqual([-8]);
  });
});

describe('evaluateTransferFunction(g, ω)', () => {
  it('gives 1/(1 + jωτ)·e^(−jωθ) for a first-order lag with delay', () => {
    // Source: textbook FOPDT frequency response: |G| = K/√(1+ω²τ²), ∠G = −atan(ωτ) − ωθ.
    const K = 2.5;
    const tau = 0.4;
    const theta = 0.15;
    const w = 3.7;
    const value = evaluateTransferFunction(transferFunction([K], [tau, 1], theta), w);
    expect(Math.hypot(value.re, value.im)).toBeCloseTo(K / Math.sqrt(1 + (w * tau) ** 2), 13);
    expect(Math.atan2(value.im, value.re)).toBeCloseTo(-Math.atan(w * tau) - w * theta, 13);
  });

  it('is ±∞ or NaN at an imaginary-axis pole rather than a silent finite number', () => {
    const value = evaluateTransferFunction(transferFunction([1], [1, 0]), 0);
    expect(Number.isFinite(value.re) && Number.isFinite(value.im)).toBe(false);
  });
});

describe('poles, zeros, dcGain, relativeDegree', () => {
  it('reads poles and zeros of (s+4)/((s+1)(s²+2s+5))', () => {
    const g = transferFunction([1, 4], [1, 3, 7, 5]);
    const poles = transferFunctionPoles(g);
    expect(poles.map((p) => [p.re, p.im].map((x) => Math.round(x * 1e9) / 1e9))).toEqual([
      [-1, -2],
      [-1, 0],
      [-1, 2],
    ]);
    expect(transferFunctionZeros(g)).toEqual([{ re: -4, im: 0 }]);
    expect(transferFunctionZeros(transferFunction([3], [1, 1]))).toEqual([]);
  });

  it('dcGain is N(0)/D(0), ignores the delay, cancels common s factors, and is null for an integrator', () => {
    expect(dcGain(transferFunction([2, 6], [1, 3, 4], 0.3))).toBe(1.5);
    expect(dcGain(transferFunction([1], [1, 0]))).toBeNull();
    expect(dcGain(transferFunction([5, 0], [1, 2, 0]))).toBe(2.5);
    expect(dcGain(transferFunction([-1.2], [0.5, 1]))).toBe(-1.2);
  });

  it('relativeDegree is the pole excess', () => {
    expect(relativeDegree(transferFunction([1, 4], [1, 3, 7, 5]))).toBe(2);
    expect(relativeDegree(transferFunction([1, 0, 1], [1, 1]))).toBe(-1);
  });
});
