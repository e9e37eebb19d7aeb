import { describe, expect, it } from 'vitest';
import { SpeedbandError } from '../../src/core/errors.js';
import { discretePidFrequencyResponse } from '../../src/controller/discrete.js';
import { evaluateTransferFunction, transferFunction } from '../../src/lti/transfer-function.js';
import { polynomialRoots } from '../../src/lti/roots.js';
import { compileLoopResponse, evaluateLoopResponse, newLoopPoint } from '../../src/verify/loop-response.js';
import { analyseLoop, analyseOpenLoop, openLoopOf } from '../../src/verify/index.js';

const plant = { numerator: [1.5], denominator: [0.8, 1], delay_s: 0.1 };

function thrown(work: () => unknown): SpeedbandError {
  try {
    work();
  } catch (error) {
    if (error instanceof SpeedbandError) return error;
    throw error;
  }
  throw new Error('expected a SpeedbandError');
}

describe('analyseLoop({ plant, pid })', () => {
  it('the three PID forms describing one controller give the same margins', () => {
    // Source: docs/domain.md §4 (Åström & Hägglund 2006): series Kc = 1, τI = 2, τD = 0.5 is ideal
    // Kc' = 1·(1 + 0.5/2) = 1.25, Ti = 2.5, Td = 2·0.5/2.5 = 0.4, i.e. parallel kp = 1.25, ki = 0.5, kd = 0.5.
    const series = analyseLoop({ plant, pid: { kp: 1, ki: 2, kd: 0.5, form: 'series' } });
    const ideal = analyseLoop({ plant, pid: { kp: 1.25, ki: 2.5, kd: 0.4, form: 'ideal' } });
    const parallel = analyseLoop({ plant, pid: { kp: 1.25, ki: 0.5, kd: 0.5 } });
    for (const other of [ideal, parallel]) {
      expect(other.phaseMargin_deg).toBeCloseTo(series.phaseMargin_deg as number, 9);
      expect(other.upperGainMargin_dB).toBeCloseTo(series.upperGainMargin_dB as number, 9);
      expect(other.sensitivityPeak).toBeCloseTo(series.sensitivityPeak, 9);
    }
    expect(series.stable).toBe(true);
  });

  it('ki = Infinity in the ideal form means no integral action: the loop then has no pole at the origin', () => {
    const margins = analyseLoop({ plant, pid: { kp: 2, ki: Infinity, kd: 0, form: 'ideal' } });
    expect(margins.analysis?.openLoopOriginPoles).toBe(0);
    expect(margins.stable).toBe(true);
  });

  it('refuses bad input with typed errors that name the field', () => {
    const nan = thrown(() => analyseLoop({ plant: { ...plant, numerator: [Number.NaN] }, pid: { kp: 1, ki: 0, kd: 0 } }));
    expect(nan.code).toBe('verify.invalidLoop');
    expect(nan.location.jsonPath).toBe('plant.numerator[0]');
    const delay = thrown(() => analyseLoop({ plant: { ...plant, delay_s: -0.1 }, pid: { kp: 1, ki: 0, kd: 0 } }));
    expect(delay.code).toBe('verify.invalidLoop');
    expect(delay.message).toMatch(/plant\.delay_s is -0\.1 — expected a finite time ≥ 0 s/);
    const time = thrown(() => analyseLoop({ plant, pid: { kp: 1, ki: -3, kd: 0, form: 'ideal' } }));
    expect(time.code).toBe('verify.invalidController');
    expect(time.location.jsonPath).toBe('pid.ki');
    const improper = thrown(() => analyseOpenLoop({ numerator: [1, 0, 0], denominator: [1, 1], delay_s: 0 }));
    expect(improper.code).toBe('verify.improperLoop');
    const sample = thrown(() => analyseLoop({ plant, pid: { kp: 1, ki: 1, kd: 0 }, sampleTime_s: 0 }));
    expect(sample.code).toBe('verify.invalidLoop');
  });

  it('an open-loop pole pair on the imaginary axis away from 0 is not counted: the verdict is undetermined, never stable', () => {
    // 1/(s² + 1) under P: the Nyquist count needs indentations at ±j, which are not handled (documented).
    const margins = analyseOpenLoop({ numerator: [0.5], denominator: [1, 0, 1], delay_s: 0.1 });
    expect(margins.analysis?.encirclementVerdict).toBe('undetermined');
    expect(margins.stable).toBe(false);
  });

  it('absent margins are null, never Infinity or NaN: a first-order lag under P has no phase crossover', () => {
    const margins = analyseOpenLoop({ numerator: [0.5], denominator: [1, 1], delay_s: 0 });
    expect(margins.upperGainMargin_dB).toBeNull();
    expect(margins.lowerGainMargin_dB).toBeNull();
    expect(margins.phaseMargin_deg).toBeNull();
    expect(margins.delayMargin_s).toBeNull();
    expect(JSON.parse(JSON.stringify(margins))).toEqual(margins);
  });
});

describe('loops with the discrete PID the firmware runs', () => {
  const pid = { kp: 1.2, ki: 3, kd: 0.05, derivativeFilter: 10 };
  const settings = { derivativeFilter: 10, sampleTime_s: 0.02, discretisation: 'tustin' as const, computationLatency_s: 0.004 };

  it('L(jω) = G(jω)·e^(−jω(θ + latency + Ts/2))·C(e^(jωTs)) matches the controller module, with a continuous phase', () => {
    const loop = openLoopOf({ plant, pid, sampleTime_s: settings.sampleTime_s, discretisation: 'tustin', latency_s: settings.computationLatency_s });
    const compiled = compileLoopResponse({
      numerator: loop.numerator,
      denominator: loop.denominator,
      delay_s: loop.delay_s,
      roots: { zeros: [], poles: polynomialRoots(loop.denominator), axisTolerance: 0 },
      discreteController: loop.discreteController!,
    });
    const frequencies = Float64Array.from({ length: 400 }, (_, i) => 0.01 * Math.pow(10, (4.19 * i) / 399));
    const controller = discretePidFrequencyResponse(pid, settings, frequencies);
    const g = transferFunction(plant.numerator, plant.denominator, plant.delay_s + settings.computationLatency_s + settings.sampleTime_s / 2);
    const point = newLoopPoint();
    let previous = Number.NaN;
    frequencies.forEach((w, i) => {
      const gj = evaluateTransferFunction(g, w);
      const re = gj.re * controller.real[i] - gj.im * controller.imaginary[i];
      const im = gj.re * controller.imaginary[i] + gj.im * controller.real[i];
      evaluateLoopResponse(compiled, w, point);
      expect(Math.hypot(point.re - re, point.im - im) / Math.hypot(re, im)).toBeLessThan(1e-9);
      if (i > 0) expect(Math.abs(point.phase_rad - previous)).toBeLessThan(Math.PI / 2);
      previous = point.phase_rad;
    });
  });

  it('an unstable lag 1/(s − 1) under P has its lower gain margin 1/kp at ω = 0, continuous or sampled', () => {
    // Source: derived — 1 + kp/(s − 1) = 0 gives s = 1 − kp: stable iff kp > 1, so reducing kp by 1/kp destabilises.
    for (const sampleTime_s of [undefined, 0.01]) {
      const margins = analyseLoop({
        plant: { numerator: [1], denominator: [1, -1], delay_s: 0.05 },
        pid: { kp: 2, ki: 0, kd: 0 },
        ...(sampleTime_s === undefined ? {} : { sampleTime_s }),
      });
      expect(margins.stable).toBe(true);
      expect(margins.lowerGainMargin_dB).toBeCloseTo(20 * Math.log10(1 / 2), 10);
      expect(margins.lowerGainMarginFrequency_radps).toBe(0);
      expect(margins.analysis?.openLoopRightHalfPlanePoles).toBe(1);
    }
  });

  it('sampling costs phase margin close to ω_c·Ts/2 and the verdict stays that of the continuous loop', () => {
    // Source: common practice — the zero-order hold acts like a delay of about Ts/2 (docs/domain.md §5).
    const continuous = analyseLoop({ plant, pid });
    const sampled = analyseLoop({ plant, pid, sampleTime_s: 0.02 });
    const expectedLoss_deg = (continuous.phaseMarginFrequency_radps as number) * 0.01 * (180 / Math.PI);
    const loss = (continuous.phaseMargin_deg as number) - (sampled.phaseMargin_deg as number);
    expect(loss).toBeGreaterThan(0.5 * expectedLoss_deg);
    expect(loss).toBeLessThan(2 * expectedLoss_deg);
    expect(sampled.stable).toBe(true);
    expect(sampled.analysis?.bandHigh_radps).toBeCloseTo(Math.PI / 0.02, 9);
  });
});
