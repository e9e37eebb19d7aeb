import { describe, expect, it } from 'vitest';
import { isSpeedbandError } from '../../src/core/errors.js';
import { makeLoopAnalysis } from '../../src/pipeline/loop-analysis.js';
import { checkModelFromSummary } from '../../src/pipeline/check-model.js';
import { simc } from '../../src/tuning/simc.js';
import { tuneOperatingPoint } from '../../src/tuning/operating-point.js';
import type { DesignModel } from '../../src/tuning/types.js';
import type { SingleTrackParameters } from '../../src/vehicle/types.js';
import { PARCEL_VAN, PARCEL_VAN_CONTROLLER } from '../helpers/parcel-van.js';

// An invented van (synthetic demo numbers).
const van: SingleTrackParameters = PARCEL_VAN;
const controller = PARCEL_VAN_CONTROLLER;

describe('simc on a path loop (a double integrator with the preview lead)', () => {
  it('either refuses, naming the reason and the rules that apply, or gives a loop the exact sampled analysis finds stable — at every speed and preview', () => {
    const model = checkModelFromSummary({ kind: 'single-track', understeerGradient_radPerMps2: 0, ...van }, 'test');
    let refused = 0;
    let tuned = 0;
    for (const preview_m of [0, 2, 8]) {
      const loop = { kind: 'path' as const, preview_m, referencePoint: 'front-axle' as const };
      const analyse = makeLoopAnalysis(model, loop, controller);
      for (const speed of [1, 2, 4, 8, 15, 25]) {
        for (const tauC of [undefined, 0.5, 2]) {
          try {
            const result = tuneOperatingPoint({
              loop,
              speed_mps: speed,
              model: { kind: 'single-track', parameters: van },
              rule: 'simc',
              ruleParameters: tauC === undefined ? {} : { simcClosedLoopTimeConstant_s: tauC },
              controller,
            });
            expect(analyse(speed, result.gains).verdict, `${speed} m/s, preview ${preview_m} m, τc ${tauC}`).toBe('stable');
            tuned++;
          } catch (error) {
            if (!isSpeedbandError(error) || error.code !== 'tuning.ruleNotApplicable') throw error;
            expect(error.message).toMatch(/lead T0 = .* lies between .* neither the double integrator .* nor the integrator .*rules that apply: .*migo/);
            refused++;
          }
        }
      }
    }
    // Both branches occur on this vehicle: the rule is neither always refused nor always applied.
    expect(refused).toBeGreaterThan(0);
    expect(tuned).toBeGreaterThan(0);
  });

  it("treats a lead at least 4(τc + θ) as cancelling an integrator: the integrating rule on k' = k''·T0 (Skogestad 2003, §3.1)", () => {
    const model: DesignModel = { integrators: 2, gain: 6, lags_s: [], deadTime_s: 0.1, leadTimeConstant_s: 3 };
    const result = simc(model, { simcClosedLoopTimeConstant_s: 0.2 });
    // Source: Skogestad 2003, SIMC integrating process k'·e^(−θs)/s, PI: Kc = 1/(k'(τc + θ)), τI = 4(τc + θ).
    const k = 6 * 3;
    expect(result.ruleForm.gain).toBeCloseTo(1 / (k * 0.3), 12);
    expect(result.ruleForm.integralTime_s).toBeCloseTo(1.2, 12);
    expect(result.warnings[0]).toMatch(/integrating rule was applied to k' = k''·T0/);
    // A lead at most (τc + θ)/2 is neglected: the double-integrator rule, Kc = 1/(4k''(τc + θ)²).
    const small = simc({ ...model, leadTimeConstant_s: 0.1 }, { simcClosedLoopTimeConstant_s: 0.2 });
    expect(small.ruleForm.gain).toBeCloseTo(1 / (4 * 6 * 0.09), 12);
  });
});
