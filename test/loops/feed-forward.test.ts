import { describe, expect, it } from 'vitest';
import { feedForwardFromLumped, feedForwardFromSingleTrack, rampLag_s } from '../../src/loops/feed-forward.js';
import { simulateSingleTrack } from '../../src/vehicle/simulate.js';
import { understeerGradient_radPerMps2 } from '../../src/vehicle/single-track.js';
import type { SingleTrackParameters } from '../../src/vehicle/types.js';
import { PARCEL_VAN } from '../helpers/parcel-van.js';

// An invented understeering van (synthetic demo numbers) and an oversteering variant below its critical speed.
const van: SingleTrackParameters = PARCEL_VAN;
const oversteering: SingleTrackParameters = { ...van, frontCorneringStiffness_NPerRad: 180000, rearCorneringStiffness_NPerRad: 110000 };

describe('feedForwardFromSingleTrack(path)', () => {
  it('steers the simulated vehicle onto a circle of the path radius: steady offset below 1 mm with zero error feedback, several speeds and curvatures', () => {
    // Source: Gillespie 1992, Fundamentals of Vehicle Dynamics, ch. 6 — steady-state cornering δ = L/R + K·ay
    // = (L + K·v²)·κ. The exact simulator (src/vehicle/simulate.ts) integrates the single-track model with its
    // actuator; at steady state the centre of gravity runs on a circle of radius v/r, whose offset from the
    // path circle (radius 1/κ, same centre after the transient) is |v/r − 1/κ|.
    for (const params of [van, oversteering]) {
      const L = params.cgToFrontAxle_m + params.cgToRearAxle_m;
      for (const speed of [2, 8, 15]) {
        for (const radius of [40, 150]) {
          const curvature = 1 / radius;
          const ff = feedForwardFromSingleTrack({ kind: 'path', parameters: params, speed_mps: speed, controllerDelay_s: 0, previewFromCg_m: 0 });
          expect(ff.gain).toBeCloseTo(L + understeerGradient_radPerMps2(params) * speed * speed, 12);
          const ts = 0.01;
          const n = 3001;
          const time = Float64Array.from({ length: n }, (_, k) => k * ts);
          const command = new Float64Array(n).fill(ff.gain * curvature);
          const run = simulateSingleTrack({ params, speed_mps: speed, time_s: time, steerCommand_rad: command });
          const yawRate = run.yawRate_radps[n - 1];
          expect(Math.abs(speed / yawRate - radius)).toBeLessThan(1e-3);
        }
      }
    }
  });

  it('gives the heading and yaw-rate loops the same steering per unit yaw-rate reference r = v·κ', () => {
    // Source: Rajamani 2012, Vehicle Dynamics and Control, §3.3 — steady yaw rate r = v/R for the path radius R.
    const speed = 12;
    const path = feedForwardFromSingleTrack({ kind: 'path', parameters: van, speed_mps: speed, controllerDelay_s: 0.015, previewFromCg_m: 0 });
    const heading = feedForwardFromSingleTrack({ kind: 'heading', parameters: van, speed_mps: speed, controllerDelay_s: 0.015, previewFromCg_m: 0 });
    expect(heading.gain * speed).toBeCloseTo(path.gain, 12);
    expect(feedForwardFromSingleTrack({ kind: 'yaw-rate', parameters: van, speed_mps: speed, controllerDelay_s: 0.015, previewFromCg_m: 0 }).gain).toBe(
      heading.gain,
    );
  });

  it('reads the input ahead by the ramp lag of the yaw response: the simulated yaw rate lags a steering ramp by exactly that time', () => {
    // A steering ramp δ(t) = a·t gives, once the transients have died out, r(t) = Gr(0)·a·(t − λ) with λ the ramp lag
    // (first moment of the impulse response; e.g. Åström & Murray 2008, Feedback Systems, §5.3, steady-state ramp error).
    // Checked on the exact simulator, actuator included, with no controller delay.
    const speed = 10;
    const ff = feedForwardFromSingleTrack({ kind: 'heading', parameters: van, speed_mps: speed, controllerDelay_s: 0, previewFromCg_m: 0 });
    const ts = 0.005;
    const n = 4001;
    const time = Float64Array.from({ length: n }, (_, k) => k * ts);
    const slope = 0.002;
    const run = simulateSingleTrack({ params: van, speed_mps: speed, time_s: time, steerCommand_rad: time.map((t) => slope * t) });
    const t = time[n - 1];
    const lag = t - run.yawRate_radps[n - 1] / (ff.steadyYawGain_perS * slope);
    // The simulator holds the command over each sample: its ramp is late by half a sample on average.
    expect(lag - ts / 2).toBeCloseTo(ff.rampLag_s, 4);
  });

  it('for the path loop reads the curvature earlier by the ramp lag and later by the lead T0 = (d + Gvy(0)/Gr(0))/v', () => {
    const speed = 6;
    const d = 3.5;
    const path = feedForwardFromSingleTrack({ kind: 'path', parameters: van, speed_mps: speed, controllerDelay_s: 0.015, previewFromCg_m: d });
    const heading = feedForwardFromSingleTrack({ kind: 'heading', parameters: van, speed_mps: speed, controllerDelay_s: 0.015, previewFromCg_m: 0 });
    // Gvy(0)/Gr(0) = b − m·a·v²/(L·Cr) for the linear single-track model (Gillespie 1992, ch. 6, sideslip at the centre of gravity).
    const L = van.cgToFrontAxle_m + van.cgToRearAxle_m;
    const sideslipLead = van.cgToRearAxle_m - (van.mass_kg * van.cgToFrontAxle_m * speed * speed) / (L * van.rearCorneringStiffness_NPerRad);
    expect(heading.leadTime_s - path.leadTime_s).toBeCloseTo((d + sideslipLead) / speed, 10);
  });
});

describe('feedForwardFromLumped', () => {
  it('inverts the identified steady yaw gain and lags by θ + τ of the FOPDT, controller delay included', () => {
    // FOPDT K·e^(−θs)/(τs + 1): Gr(0) = K, ramp lag θ + τ (first moment of the impulse response).
    const ff = feedForwardFromLumped({
      kind: 'path',
      model: { kind: 'fopdt', gain: 2.5, timeConstant_s: 0.2, deadTime_s: 0.1 },
      speed_mps: 8,
      controllerDelay_s: 0.015,
      previewFromCg_m: 4,
    });
    expect(ff.gain).toBeCloseTo(8 / 2.5, 12);
    expect(ff.rampLag_s).toBeCloseTo(0.1 + 0.2 + 0.015, 12);
    expect(ff.leadTime_s).toBeCloseTo(0.315 - 4 / 8, 12);
  });

  it('rampLag_s of (b1 s + b0)/(s² + a1 s + a0) is a1/a0 − b1/b0 plus the delay', () => {
    // First moment of the impulse response: −d/ds ln G(s) at s = 0 (e.g. Åström & Murray 2008, §5.3).
    expect(rampLag_s({ numerator: [2, 5], denominator: [1, 3, 4], delay_s: 0.1 })).toBeCloseTo(3 / 4 - 2 / 5 + 0.1, 14);
  });
});
