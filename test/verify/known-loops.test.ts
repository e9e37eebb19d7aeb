import { describe, expect, it } from 'vitest';
import { analyseLoop, analyseOpenLoop } from '../../src/verify/index.js';
import { decibelsToRatio } from '../../src/core/units.js';

/** Relative tolerances, dimensionless. */
const TIGHT = 1e-9;
const FROM_MEMORY = 0.01;

const gainRatio = (gain_dB: number | null): number => decibelsToRatio(gain_dB as number);

describe('analyseOpenLoop on loops with closed-form margins', () => {
  // Source: textbook (Ogata, Modern Control Engineering; Franklin, Powell & Emami-Naeini), derived here:
  // s(s+1)(s+2) at s = jω is −3ω² + j(2ω − ω³); the imaginary part vanishes at ω = √2, where
  // L = −K/6, so the phase crossover is ω = √2 and the gain margin is 6/K.
  it.each([0.5, 1, 2, 4])('K/(s(s+1)(s+2)) with K = %s crosses −180° at √2 rad/s with gain margin 6/K', (k) => {
    const margins = analyseOpenLoop({ numerator: [k], denominator: [1, 3, 2, 0], delay_s: 0 });
    expect(margins.upperGainMarginFrequency_radps).toBeCloseTo(Math.SQRT2, 9);
    expect(gainRatio(margins.upperGainMargin_dB)).toBeCloseTo(6 / k, 8);
    expect(margins.lowerGainMargin_dB).toBeNull();
    expect(margins.stable).toBe(true);
  });

  it('K/(s(s+1)(s+2)) with K = 10 > 6 is unstable with two closed-loop poles in the right half-plane by both tests', () => {
    // Source: Routh array of s³ + 3s² + 2s + K: stable iff 0 < K < 6 (textbook, derived).
    const margins = analyseOpenLoop({ numerator: [10], denominator: [1, 3, 2, 0], delay_s: 0 });
    expect(margins.stable).toBe(false);
    expect(margins.verdict).toBe('unstable');
    expect(margins.analysis?.closedLoopPoleVerdict).toBe('unstable');
    expect(margins.analysis?.closedLoopRightHalfPlanePoles).toBe(2);
    expect(margins.delayMargin_s).toBeNull();
  });

  // Source: derived. L = k·e^(−θs)/s has |L| = k/ω, so the gain crossover is ω = k, the phase there
  // is −90° − kθ·180/π, so PM = 90° − kθ·180/π and the delay margin PM/ω = π/(2k) − θ. The phase
  // crosses −180° at ω = π/(2θ), where |L| = 2kθ/π: the ultimate loop gain is reached at kθ = π/2.
  it.each([
    [1, 1],
    [0.5, 0.2],
    [3, 0.1],
    [0.1, 5],
  ])('k·e^(−θs)/s with k = %s, θ = %s s: crossover ω = k, PM = 90° − kθ·180/π, upper gain margin π/(2kθ)', (k, theta) => {
    const margins = analyseOpenLoop({ numerator: [k], denominator: [1, 0], delay_s: theta });
    expect(margins.phaseMarginFrequency_radps).toBeCloseTo(k, 9);
    expect(margins.phaseMargin_deg).toBeCloseTo(90 - (k * theta * 180) / Math.PI, 8);
    expect(margins.delayMargin_s).toBeCloseTo(Math.PI / (2 * k) - theta, 8);
    expect(margins.upperGainMarginFrequency_radps).toBeCloseTo(Math.PI / (2 * theta), 8);
    expect(gainRatio(margins.upperGainMargin_dB) / (Math.PI / (2 * k * theta)) - 1).toBeLessThan(TIGHT);
    expect(margins.stable).toBe(true);
  });

  // Source: Skogestad 2003 (J. Process Control 13:291–309), SIMC with τc = θ on an integrating
  // process k'e^(−θs)/s: Kc = 1/(k'(τc + θ)), τI = 4(τc + θ); GM ≈ 2.96, PM ≈ 46.9°, Ms ≈ 1.70 as
  // recomputed in docs/domain.md §4 and matching the paper's table as remembered (from memory).
  it.each([
    [1, 1],
    [0.2, 0.5],
    [4, 0.05],
  ])("SIMC PI on an integrating process k' = %s, θ = %s s gives GM ≈ 2.96, PM ≈ 46.9°, Ms ≈ 1.70", (kPrime, theta) => {
    const kc = 1 / (kPrime * 2 * theta);
    const tauI = 8 * theta;
    const margins = analyseLoop({
      plant: { numerator: [kPrime], denominator: [1, 0], delay_s: theta },
      pid: { kp: kc, ki: tauI, kd: 0, form: 'ideal' },
    });
    expect(margins.stable).toBe(true);
    expect(Math.abs(gainRatio(margins.upperGainMargin_dB) / 2.96 - 1)).toBeLessThan(FROM_MEMORY);
    expect(Math.abs((margins.phaseMargin_deg as number) / 46.9 - 1)).toBeLessThan(FROM_MEMORY);
    expect(Math.abs(margins.sensitivityPeak / 1.7 - 1)).toBeLessThan(FROM_MEMORY);
  });

  // Source: Skogestad 2003, SIMC PI with τc = θ on FOPDT with τ ≤ 8θ: Kc = τ/(K·2θ), τI = τ, so
  // L = e^(−θs)/(2θs) exactly. Derived: crossover ω = 1/(2θ), PM = 90° − 0.5 rad = 61.35°;
  // phase crossover ωθ = π/2 where |L| = 1/π, so GM = π. Ms ≈ 1.59 (docs/domain.md §4, from memory).
  it.each([
    [1, 5, 1],
    [-2, 0.3, 0.1],
    [0.7, 8, 1],
  ])('SIMC PI on FOPDT K = %s, τ = %s s, θ = %s s: GM = π, PM = 90° − 0.5 rad, Ms ≈ 1.59', (gain, tau, theta) => {
    const margins = analyseLoop({
      plant: { numerator: [gain], denominator: [tau, 1], delay_s: theta },
      pid: { kp: tau / (gain * 2 * theta), ki: tau, kd: 0, form: 'ideal' },
    });
    expect(margins.stable).toBe(true);
    expect(gainRatio(margins.upperGainMargin_dB)).toBeCloseTo(Math.PI, 8);
    expect(margins.phaseMargin_deg).toBeCloseTo(90 - 0.5 * (180 / Math.PI), 7);
    expect(margins.phaseMarginFrequency_radps).toBeCloseTo(1 / (2 * theta), 8);
    expect(Math.abs(margins.sensitivityPeak / 1.59 - 1)).toBeLessThan(FROM_MEMORY);
  });

  // Source: Skogestad 2003, SIMC for a double integrator k''e^(−θs)/s² with τc = θ:
  // series PID Kc = 1/(4k''(τc + θ)²), τI = τD = 4(τc + θ); docs/domain.md §4 recomputed PM ≈ 33°,
  // upper GM ≈ 2.76, lower GM ≈ 0.165, Ms ≈ 1.96 (from memory; the brute-force sweep in
  // cross-check.test.ts checks both gain margins independently).
  it('SIMC series PID on a double integrator with delay is conditionally stable: both gain margins', () => {
    const theta = 1;
    const margins = analyseLoop({
      plant: { numerator: [1], denominator: [1, 0, 0], delay_s: theta },
      pid: { kp: 1 / (4 * 4 * theta * theta), ki: 8 * theta, kd: 8 * theta, form: 'series', derivativeFilter: Infinity },
    });
    expect(margins.stable).toBe(true);
    expect(Math.abs((margins.phaseMargin_deg as number) / 33 - 1)).toBeLessThan(0.02);
    expect(Math.abs(gainRatio(margins.upperGainMargin_dB) / 2.76 - 1)).toBeLessThan(FROM_MEMORY);
    expect(Math.abs(gainRatio(margins.lowerGainMargin_dB) / 0.165 - 1)).toBeLessThan(FROM_MEMORY);
    expect(margins.lowerGainMargin_dB as number).toBeLessThan(0);
    expect(Math.abs(margins.sensitivityPeak / 1.96 - 1)).toBeLessThan(FROM_MEMORY);
  });

  it('a derivative filter N = 10 costs the double-integrator loop about 11° of phase margin', () => {
    // Source: docs/domain.md §4 ("a derivative filter N = 10 costs another ~11°", recomputed there; from memory).
    const plant = { numerator: [1], denominator: [1, 0, 0], delay_s: 1 };
    const pid = { kp: 1 / 16, ki: 8, kd: 8, form: 'series' as const };
    const unfiltered = analyseLoop({ plant, pid: { ...pid, derivativeFilter: Infinity } });
    const filtered = analyseLoop({ plant, pid: { ...pid, derivativeFilter: 10 } });
    const cost = (unfiltered.phaseMargin_deg as number) - (filtered.phaseMargin_deg as number);
    expect(cost).toBeGreaterThan(9);
    expect(cost).toBeLessThan(13);
  });
});
