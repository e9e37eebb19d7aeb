import { describe, expect, it } from 'vitest';
import type { FirmwareSettings } from '../../src/controller/firmware-step.js';
import { stepResponse } from '../../src/lti/time-response.js';
import { breakpointPerformance } from '../../src/performance/breakpoint-performance.js';
import { simulateClosedLoop } from '../../src/performance/closed-loop-simulation.js';
import { overshoot_pct } from '../../src/performance/figures.js';
import { performanceLoopAt } from '../../src/performance/loop-at-speed.js';
import { tuneOperatingPoint } from '../../src/tuning/operating-point.js';
import type { SingleTrackParameters } from '../../src/vehicle/types.js';
import { PARCEL_VAN, PARCEL_VAN_CONTROLLER } from '../helpers/parcel-van.js';

// An invented van (synthetic demo numbers).
const van: SingleTrackParameters = PARCEL_VAN;
const controller = PARCEL_VAN_CONTROLLER;
const settings: FirmwareSettings = { ...controller, antiWindup: 'conditional-integration', commandLimit_rad: Infinity, integratorClamp_rad: Infinity };
const limits = { maximumOvershoot_pct: 25, maximumRecoveryTime_s: 15, maximumLaneChangeError_m: 0.5, maximumCurveEntryError_m: 0.3 };

describe('set-point weights (two-degree-of-freedom PID, Åström & Hägglund 2006, §3.4)', () => {
  for (const kind of ['heading', 'path'] as const) {
    const speed = 6;
    const loop = { kind, preview_m: 0.5, previewTime_s: 0.3, referencePoint: 'front-axle' as const };
    const model = { kind: 'single-track' as const, parameters: van };
    const gains = tuneOperatingPoint({ loop, speed_mps: speed, model, rule: kind === 'path' ? 'migo' : 'simc', ruleParameters: {}, controller }).gains;
    const performanceLoop = performanceLoopAt(model, loop, speed, controller);

    it(`${kind} loop: the response to a disturbance is the same for every b and c to 1e-12, the response to the reference is not`, () => {
      const count = 3000;
      const time = Float64Array.from({ length: count }, (_, k) => k * controller.sampleTime_s);
      const misalignment = Float64Array.from(stepResponse(performanceLoop.misalignment, time).output, (y) => 0.01 * y);
      const reference = new Float64Array(count).fill(1);
      const run = (b: number, c: number, withReference: boolean, withDisturbance: boolean) =>
        simulateClosedLoop({
          plant: performanceLoop.plant,
          gains: { ...gains, setpointWeightProportional: b, setpointWeightDerivative: c, feedForward: 0 },
          settings,
          reference: withReference ? reference : new Float64Array(count),
          ...(withDisturbance ? { outputDisturbance: misalignment } : {}),
        }).output;
      const disturbanceAlone = run(1, 1, false, true);
      for (const [b, c] of [
        [0, 0],
        [0.4, 0],
        [0.7, 0.5],
      ]) {
        // Superposition: (reference and disturbance) − (reference alone) is the disturbance response, whatever b and c.
        const both = run(b, c, true, true);
        const referenceAlone = run(b, c, true, false);
        let worst = 0;
        for (let k = 0; k < count; k++) worst = Math.max(worst, Math.abs(both[k] - referenceAlone[k] - disturbanceAlone[k]));
        expect(worst).toBeLessThan(1e-12);
      }
      const atOne = run(1, 0, true, false);
      const atZero = run(0, 0, true, false);
      expect(Math.max(...atOne.map((y, k) => Math.abs(y - atZero[k])))).toBeGreaterThan(0.01);
    });

    it(`${kind} loop: the overshoot to a reference step falls as b falls, and the chosen b keeps the 25 % limit`, () => {
      const count = 4000;
      const reference = new Float64Array(count).fill(1);
      const overshoots = [1, 0.75, 0.5, 0.25, 0].map((b) =>
        overshoot_pct(
          simulateClosedLoop({
            plant: performanceLoop.plant,
            gains: { ...gains, setpointWeightProportional: b, setpointWeightDerivative: 0, feedForward: 0 },
            settings,
            reference,
          }).output,
        ),
      );
      for (let i = 1; i < overshoots.length; i++) expect(overshoots[i]).toBeLessThanOrEqual(overshoots[i - 1] + 1e-9);
      expect(overshoots[0]).toBeGreaterThan(overshoots[overshoots.length - 1]);
      const chosen = breakpointPerformance({
        loop: performanceLoop,
        gains,
        limits,
        vehicleLimits: { maxSteerAngle_rad: 0.6, maxSteerRate_radps: 0.5 },
        slowestTimeConstant_s: 5,
        antiWindup: 'conditional-integration',
      });
      expect(chosen.figures.referenceStep.overshoot_pct).toBeLessThanOrEqual(25 + 1e-6);
      if (overshoots[0] > 25) expect(chosen.setpointWeights.proportional).toBeLessThan(1);
    });
  }
});
