import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { isSpeedbandError } from '../../src/core/errors.js';
import { idealToParallel, idealToSeries, parallelToIdeal, parallelToSeries, seriesToIdeal, seriesToParallel } from '../../src/controller/pid-forms.js';
import type { SeriesPid } from '../../src/controller/types.js';

function codeOf(work: () => unknown): string | undefined {
  try {
    work();
  } catch (error) {
    return isSpeedbandError(error) ? error.code : 'not a SpeedbandError';
  }
  return undefined;
}

/** Series and ideal forms evaluated at s = jω, to check they are the same controller. */
function seriesAt(series: SeriesPid, w: number): { re: number; im: number } {
  // Kc(1 + 1/(jωτI))(1 + jωτD) = Kc(1 − j/(ωτI))(1 + jωτD)
  const aRe = 1;
  const aIm = series.integralTime_s === null ? 0 : -1 / (w * series.integralTime_s);
  const bRe = 1;
  const bIm = w * series.derivativeTime_s;
  return { re: series.gain * (aRe * bRe - aIm * bIm), im: series.gain * (aRe * bIm + aIm * bRe) };
}

describe('PID form conversions', () => {
  it('series Kc = 2, τI = 4 s, τD = 1 s is ideal Kc = 2.5, Ti = 5 s, Td = 0.8 s', () => {
    // Source: series → ideal formula, docs/domain.md §4 and Åström & Hägglund, Advanced PID Control (2006), §3.2:
    // Kc' = Kc(1 + τD/τI) = 2·1.25, Ti = τI + τD = 5, Td = τI·τD/(τI + τD) = 4/5.
    const ideal = seriesToIdeal({ gain: 2, integralTime_s: 4, derivativeTime_s: 1 });
    expect(ideal.gain).toBeCloseTo(2.5, 15);
    expect(ideal.integralTime_s).toBeCloseTo(5, 15);
    expect(ideal.derivativeTime_s).toBeCloseTo(0.8, 15);
    const parallel = seriesToParallel({ gain: 2, integralTime_s: 4, derivativeTime_s: 1 });
    // kp = Kc', ki = Kc'/Ti = 0.5, kd = Kc'·Td = 2
    expect(parallel.kp).toBeCloseTo(2.5, 15);
    expect(parallel.ki).toBeCloseTo(0.5, 15);
    expect(parallel.kd).toBeCloseTo(2, 15);
  });

  it('at Ti = 4·Td exactly the series form has τI = τD = Ti/2 (double real zero)', () => {
    // Source: x² − Ti·x + Ti·Td = 0 has the double root Ti/2 when Ti = 4Td (quadratic formula).
    const series = idealToSeries({ gain: 3, integralTime_s: 8, derivativeTime_s: 2 });
    expect(series.integralTime_s).toBeCloseTo(4, 12);
    expect(series.derivativeTime_s).toBeCloseTo(4, 12);
    expect(series.gain).toBeCloseTo(1.5, 12);
  });

  it('refuses Ti < 4·Td with controller.noSeriesForm, saying why', () => {
    // Source: docs/domain.md §5b (parallel → series exists only if Ti ≥ 4Td); kp = 1, ki = 0.5, kd = 1 → Ti = 2 s, Td = 1 s.
    expect(codeOf(() => parallelToSeries({ kp: 1, ki: 0.5, kd: 1 }))).toBe('controller.noSeriesForm');
    expect(() => parallelToSeries({ kp: 1, ki: 0.5, kd: 1 })).toThrow(/complex/);
  });

  it('handles no integral (ki = 0 ↔ integralTime_s null) and no derivative (kd = 0)', () => {
    expect(parallelToIdeal({ kp: 2, ki: 0, kd: 0.4 })).toEqual({ gain: 2, integralTime_s: null, derivativeTime_s: 0.2 });
    expect(parallelToSeries({ kp: 2, ki: 0, kd: 0.4 })).toEqual({ gain: 2, integralTime_s: null, derivativeTime_s: 0.2 });
    expect(seriesToParallel({ gain: 2, integralTime_s: null, derivativeTime_s: 0.2 })).toEqual({ kp: 2, ki: 0, kd: 0.4 });
    expect(parallelToSeries({ kp: 2, ki: 0.5, kd: 0 })).toEqual({ gain: 2, integralTime_s: 4, derivativeTime_s: 0 });
    expect(idealToParallel({ gain: 0, integralTime_s: null, derivativeTime_s: 0 })).toEqual({ kp: 0, ki: 0, kd: 0 });
  });

  it('carries a negative gain through every form with positive times', () => {
    // Source: docs/domain.md §5b — a negative plant gain must give negative controller gains.
    const series = parallelToSeries({ kp: -2.5, ki: -0.5, kd: -2 });
    expect(series.gain).toBeCloseTo(-2, 12);
    expect(series.integralTime_s).toBeCloseTo(4, 12);
    expect(series.derivativeTime_s).toBeCloseTo(1, 12);
  });

  it('refuses kp = 0 with integral or derivative action (no ideal form) and gains of mixed sign', () => {
    expect(codeOf(() => parallelToIdeal({ kp: 0, ki: 1, kd: 0 }))).toBe('controller.noIdealForm');
    expect(codeOf(() => parallelToIdeal({ kp: 1, ki: -1, kd: 0 }))).toBe('controller.mixedSigns');
    expect(codeOf(() => parallelToIdeal({ kp: Number.NaN, ki: 1, kd: 0 }))).toBe('controller.invalidGains');
    expect(codeOf(() => seriesToIdeal({ gain: 1, integralTime_s: -1, derivativeTime_s: 0 }))).toBe('controller.invalidGains');
  });

  it('round trips parallel → ideal → parallel and series → parallel → series (property, fast-check)', () => {
    const positive = fc.double({ min: 1e-3, max: 1e3, noNaN: true });
    fc.assert(
      fc.property(positive, positive, positive, fc.boolean(), (kp, ki, kd, negative) => {
        const sign = negative ? -1 : 1;
        const gains = { kp: sign * kp, ki: sign * ki, kd: sign * kd };
        const back = idealToParallel(parallelToIdeal(gains));
        expect(Math.abs(back.kp - gains.kp)).toBeLessThanOrEqual(1e-12 * kp);
        expect(Math.abs(back.ki - gains.ki)).toBeLessThanOrEqual(1e-12 * ki);
        expect(Math.abs(back.kd - gains.kd)).toBeLessThanOrEqual(1e-12 * kd);
      }),
      { seed: 11, numRuns: 300 },
    );
    fc.assert(
      fc.property(positive, positive, positive, (gain, tauI, tauD) => {
        const series = { gain, integralTime_s: tauI, derivativeTime_s: tauD };
        const back = parallelToSeries(seriesToParallel(series));
        // the series form is unique up to swapping τI and τD (our convention: τI ≥ τD)
        const swapped = tauI < tauD;
        const expectedTauI = swapped ? tauD : tauI;
        const expectedTauD = swapped ? tauI : tauD;
        const expectedGain = (gain * (tauI + tauD)) / tauI / ((expectedTauI + expectedTauD) / expectedTauI);
        expect(Math.abs(back.integralTime_s! - expectedTauI)).toBeLessThanOrEqual(1e-7 * expectedTauI);
        expect(Math.abs(back.derivativeTime_s - expectedTauD)).toBeLessThanOrEqual(1e-7 * expectedTauI);
        expect(Math.abs(back.gain - expectedGain)).toBeLessThanOrEqual(1e-7 * Math.abs(expectedGain));
      }),
      { seed: 12, numRuns: 300 },
    );
  });

  it('series and ideal forms of one controller have the same frequency response (property)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0.01, max: 100, noNaN: true }),
        fc.double({ min: 0.01, max: 10, noNaN: true }),
        fc.double({ min: 0.001, max: 10, noNaN: true }),
        (gain, tauI, tauD) => {
          const series = { gain, integralTime_s: tauI, derivativeTime_s: tauD };
          const ideal = seriesToIdeal(series);
          for (const w of [0.1, 1, 10]) {
            const s = seriesAt(series, w);
            const iRe = ideal.gain;
            const iIm = ideal.gain * (w * ideal.derivativeTime_s - 1 / (w * ideal.integralTime_s!));
            expect(Math.hypot(s.re - iRe, s.im - iIm)).toBeLessThanOrEqual(1e-10 * Math.hypot(s.re, s.im));
          }
        },
      ),
      { seed: 13, numRuns: 200 },
    );
  });
});
