import { describe, expect, it } from 'vitest';
import { aggregateSpeed, groupBySpeed, inverseVarianceMean } from '../../src/identify/aggregate.js';
import { IDENTIFY_DEFAULTS } from '../../src/identify/defaults.js';
import { identifyStep } from '../../src/identify/identify-step.js';
import { truncateStep } from '../../src/identify/step-signals.js';
import { rampStepTest } from './synthetic.js';

const FAST = { ...IDENTIFY_DEFAULTS, fitSecondOrder: false, hold: 'linear' as const };

describe('inverseVarianceMean(values, standardErrors)', () => {
  it('weights by 1/SE²: 10 ± 1 and 12 ± 2 give 10.4 ± 0.894 (Taylor 1997, §7.2)', () => {
    // Source: x̄ = (10/1 + 12/4)/(1 + 1/4) = 10.4, SE = 1/√1.25 = 0.8944 (Birge ratio √0.8 < 1: no inflation)
    const combined = inverseVarianceMean([10, 12], [1, 2]);
    expect(combined.value).toBeCloseTo(10.4, 12);
    expect(combined.standardError).toBeCloseTo(1 / Math.sqrt(1.25), 12);
    expect(combined.birgeRatio).toBeCloseTo(Math.sqrt(0.8), 12);
  });

  it('inflates the error by the Birge ratio when repeats disagree beyond their errors', () => {
    // Source: Birge 1932; 0 ± 1 and 10 ± 1: χ² = 50, ratio √50, SE = √50/√2 = 5
    const combined = inverseVarianceMean([0, 10], [1, 1]);
    expect(combined.value).toBe(5);
    expect(combined.standardError).toBeCloseTo(5, 12);
  });
});

describe('groupBySpeed and aggregateSpeed', () => {
  it('groups steps within the speed tolerance, and warns about a 20 % left/right gain asymmetry naming both gains', () => {
    const steps = [
      identifyStep(rampStepTest({ seed: 1, speed_mps: 10, gain: 2.5 }), FAST),
      identifyStep(rampStepTest({ seed: 2, speed_mps: 10.2, gain: 2.0, amplitude: -0.03, stepIndex: 1 }), FAST),
      identifyStep(rampStepTest({ seed: 3, speed_mps: 15, gain: 3, stepIndex: 2 }), FAST),
    ];
    const groups = groupBySpeed(steps, 0.5, 0.05);
    expect(groups.map((g) => g.length)).toEqual([2, 1]);
    // Source: common practice — slow machines are tested at speeds a fraction of a m/s apart: 0.5 and 0.75 m/s stay apart
    const slowSteps = [
      identifyStep(rampStepTest({ seed: 6, speed_mps: 0.5 }), FAST),
      identifyStep(rampStepTest({ seed: 7, speed_mps: 0.51, stepIndex: 1 }), FAST),
      identifyStep(rampStepTest({ seed: 8, speed_mps: 0.75, stepIndex: 2 }), FAST),
    ];
    expect(groupBySpeed(slowSteps, 0.5, 0.05).map((g) => g.length)).toEqual([2, 1]);
    const slow = aggregateSpeed(groups[0], FAST);
    expect(slow.asymmetry_pct).toBeGreaterThan(15);
    expect(slow.warnings.join('\n')).toMatch(/left and right yaw gains differ/);
    expect(slow.gain.value).toBeGreaterThan(2.0);
    expect(slow.gain.value).toBeLessThan(2.5);
    const fast = aggregateSpeed(groups[1], FAST);
    expect(fast.warnings).toEqual([]);
    expect(fast.asymmetry_pct).toBeNull();
  });
});

describe('the quality gate', () => {
  it('refuses a step too small against the noise and says which amplitude to repeat it with', () => {
    const tiny = identifyStep(rampStepTest({ amplitude: 0.0005, noise: 0.004, seed: 4 }), FAST);
    expect(tiny.refusal?.reasonCode).toBe('tooSmallAgainstNoise');
    expect(tiny.refusal?.reason).toMatch(/step too small against noise: amplitude 0\.03°, yaw noise 0\.2\d°\/s/);
    expect(tiny.refusal?.reason).toMatch(/repeat with ≥ \d/);
  });

  it('accepts a clean step', () => {
    expect(identifyStep(rampStepTest({ seed: 5 }), FAST).refusal).toBeNull();
  });
});

describe('truncateStep(step, maxHold_s)', () => {
  it('keeps the pre-step samples and at most maxHold_s after the onset, and leaves short steps alone', () => {
    const step = rampStepTest({ samples: 3000 }); // onset at 1 s, 29 s of hold
    const cut = truncateStep(step, 5);
    expect(cut.preStepSamples).toBe(step.preStepSamples);
    expect(cut.time_s[cut.time_s.length - 1] - step.onset_s).toBeLessThanOrEqual(5 + 1e-9);
    expect(cut.time_s.length).toBe(step.preStepSamples + 501);
    expect(cut.yawRate_radps.length).toBe(cut.time_s.length);
    expect(truncateStep(step, 100)).toBe(step);
  });
});
