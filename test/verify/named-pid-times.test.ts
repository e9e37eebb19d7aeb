import { describe, expect, it } from 'vitest';
import { SpeedbandError } from '../../src/core/errors.js';
import { analyseLoop, parallelGainsOf } from '../../src/verify/index.js';

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

describe('analyseLoop with the PID times named integralTime_s and derivativeTime_s', () => {
  it('parallelGainsOf({ form: series, integralTime_s, derivativeTime_s }) converts by Kc(1 + τD/τI), Ti = τI + τD, Td = τIτD/(τI + τD)', () => {
    // Source: docs/domain.md §4 (Åström & Hägglund 2006): series Kc = 1, τI = 2, τD = 0.5 → ideal Kc' = 1.25, Ti = 2.5, Td = 0.4
    // → parallel kp = 1.25, ki = Kc'/Ti = 0.5, kd = Kc'·Td = 0.5.
    const gains = parallelGainsOf({ kp: 1, integralTime_s: 2, derivativeTime_s: 0.5, form: 'series' });
    expect(gains.kp).toBeCloseTo(1.25, 12);
    expect(gains.ki).toBeCloseTo(0.5, 12);
    expect(gains.kd).toBeCloseTo(0.5, 12);
  });

  it('the named times win over ki/kd read as times, and give the same margins as the old spelling', () => {
    const named = analyseLoop({ plant, pid: { kp: 1.25, integralTime_s: 2.5, derivativeTime_s: 0.4, form: 'ideal' } });
    const old = analyseLoop({ plant, pid: { kp: 1.25, ki: 2.5, kd: 0.4, form: 'ideal' } });
    const both = analyseLoop({ plant, pid: { kp: 1.25, ki: 99, kd: 99, integralTime_s: 2.5, derivativeTime_s: 0.4, form: 'ideal' } });
    expect(named.phaseMargin_deg).toBe(old.phaseMargin_deg);
    expect(both.phaseMargin_deg).toBe(old.phaseMargin_deg);
    expect(named.sensitivityPeak).toBe(old.sensitivityPeak);
  });

  it('integralTime_s: null means no integral action (no open-loop pole at the origin)', () => {
    const margins = analyseLoop({ plant, pid: { kp: 2, integralTime_s: null, derivativeTime_s: 0, form: 'ideal' } });
    expect(margins.analysis?.openLoopOriginPoles).toBe(0);
  });

  it('refuses named times with the parallel form, and a missing time, naming the field', () => {
    const parallel = thrown(() => analyseLoop({ plant, pid: { kp: 1, ki: 1, kd: 0, integralTime_s: 2 } }));
    expect(parallel.code).toBe('verify.invalidController');
    expect(parallel.location.jsonPath).toBe('pid.integralTime_s');
    expect(parallel.message).toMatch(/parallel form takes ki \(1\/s\) and kd \(s\)/);
    const missing = thrown(() => analyseLoop({ plant, pid: { kp: 1, integralTime_s: 2, form: 'ideal' } }));
    expect(missing.location.jsonPath).toBe('pid.kd');
    expect(missing.message).toMatch(/give integralTime_s and derivativeTime_s in s/);
    const negative = thrown(() => analyseLoop({ plant, pid: { kp: 1, integralTime_s: -2, derivativeTime_s: 0, form: 'series' } }));
    expect(negative.location.jsonPath).toBe('pid.integralTime_s');
    expect(negative.message).toMatch(/expected a time > 0 s, or null for no integral action/);
  });
});
