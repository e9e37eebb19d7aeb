import { describe, expect, it } from 'vitest';
import { fitFopdt, FOPDT_FIT_DEFAULTS } from '../../src/identify/fit-fopdt.js';
import { tallyTwoPointAgreement, twoPointAgreesWithFit, TWO_POINT_AGREEMENT } from '../../src/identify/two-point-agreement.js';
import { twoPointEstimate } from '../../src/identify/two-point.js';
import { rampStepSignals } from './synthetic.js';

const FIT = { gain: 2, timeConstant_s: 0.3, deadTime_s: 0.1 };

describe('twoPointAgreesWithFit(twoPoint, fit)', () => {
  it('agrees within 10 % in gain and 25 % of τ + θ in each time, and not beyond', () => {
    expect(TWO_POINT_AGREEMENT).toEqual({ gainFraction: 0.1, timeFraction: 0.25 });
    // τ + θ = 0.4 s: each time may move by 0.1 s.
    expect(twoPointAgreesWithFit({ gain: 2.19, timeConstant_s: 0.39, deadTime_s: 0.01 }, FIT)).toBe(true);
    expect(twoPointAgreesWithFit({ gain: 2.21, timeConstant_s: 0.3, deadTime_s: 0.1 }, FIT)).toBe(false);
    expect(twoPointAgreesWithFit({ gain: 2, timeConstant_s: 0.41, deadTime_s: 0.1 }, FIT)).toBe(false);
    expect(twoPointAgreesWithFit({ gain: 2, timeConstant_s: 0.3, deadTime_s: -0.01 }, FIT)).toBe(false);
    // A gain of the other sign never agrees; a negative plant agrees with a negative estimate (axis conventions).
    expect(twoPointAgreesWithFit({ gain: -2, timeConstant_s: 0.3, deadTime_s: 0.1 }, FIT)).toBe(false);
    expect(twoPointAgreesWithFit({ gain: -2.1, timeConstant_s: 0.3, deadTime_s: 0.1 }, { ...FIT, gain: -2 })).toBe(true);
    expect(twoPointAgreesWithFit({ gain: Number.NaN, timeConstant_s: 0.3, deadTime_s: 0.1 }, FIT)).toBe(false);
  });

  it('a fast step on a first-order-plus-dead-time response: the estimate agrees with the fit', () => {
    // Source: Smith 1972 (Seborg, Edgar & Mellichamp §7.2, from memory): on K·e^(−θs)/(τs + 1) after a true step the
    // 28.3 % and 63.2 % crossings are at θ + τ/3 and θ + τ, so the two points return τ and θ exactly.
    const signals = rampStepSignals({ noise: 0, ramp_s: 0.01 });
    const estimate = twoPointEstimate(signals)!;
    const fit = fitFopdt(signals);
    expect(Math.abs(estimate.timeConstant_s - 0.35)).toBeLessThan(0.02);
    expect(twoPointAgreesWithFit(estimate, fit.model)).toBe(true);
  });

  it('a ramp long against the response (0.15 s ramp, τ + θ = 0.057 s, 50 Hz — the sidewalk robot): the estimate disagrees, the fit does not', () => {
    const truth = { gain: 2, timeConstant_s: 0.03, deadTime_s: 0.027 };
    const signals = rampStepSignals({ ...truth, noise: 0, bias: 0, ramp_s: 0.15, samplePeriod_s: 0.02, samples: 300, preStepSamples: 50 });
    const estimate = twoPointEstimate(signals)!;
    // The response follows the ramp: the 28.3 %–63.2 % span is about 0.35 of the 0.15 s ramp, so τ ≈ 1.5·0.35·0.15 ≈ 0.08 s.
    expect(estimate.timeConstant_s).toBeGreaterThan(2 * truth.timeConstant_s);
    expect(twoPointAgreesWithFit(estimate, truth)).toBe(false);
    // The synthetic command is a continuous ramp: the fit takes it as linear between samples.
    const fit = fitFopdt(signals, { ...FOPDT_FIT_DEFAULTS, hold: 'linear' });
    expect(Math.abs(fit.model.timeConstant_s - truth.timeConstant_s)).toBeLessThan(0.005);
    expect(Math.abs(fit.model.deadTime_s - truth.deadTime_s)).toBeLessThan(0.005);
  });
});

describe('tallyTwoPointAgreement(tests)', () => {
  it('counts disagreeing estimates and steps without one; records written before the flag count as neither', () => {
    const step = (twoPoint: { agreesWithFit?: boolean } | null) => ({ fopdt: { twoPoint } });
    expect(
      tallyTwoPointAgreement([step({ agreesWithFit: true }), step({ agreesWithFit: false }), step({ agreesWithFit: false }), step(null), step({})]),
    ).toEqual({
      steps: 5,
      disagreeing: 2,
      withoutEstimate: 1,
    });
  });
});
