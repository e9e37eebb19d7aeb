/**
 * Containment: a box around the parcel van that includes the loaded van's parameters (vehicles/parcel-van-loaded:
 * +900 kg, CG 0.18 m rearward, more yaw inertia, softer rear tyres) must give, for the van's own schedule, a worst
 * phase margin no larger than the loaded van's actual phase margin under the same gains — the loaded van is a
 * member of the set. Its actual margin is computed here from the single-track formulas and checked against scipy.
 */
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { recordedCheckModel } from '../../src/pipeline/recheck-schedule.js';
import { worstCaseMarginsAt } from '../../src/pipeline/robust-analysis.js';
import type { ScheduleFile } from '../../src/schedule/schedule-types.js';
import { analyseLoop } from '../../src/verify/analyse-loop.js';
import { loadVehicle } from '../../src/vehicle/load.js';
import type { SingleTrackParameters } from '../../src/vehicle/types.js';
import { demoSchedule } from '../helpers/demo-builds.js';
import { sampledSingleTrackMarginsInPython } from '../helpers/sampled-loop-reference.js';
import { CONTROLLER, YAW_LOOP, vanContext } from './van-loop.js';

const loadedFile = loadVehicle(join('vehicles', 'parcel-van-loaded'));
const LOADED: SingleTrackParameters = {
  mass_kg: loadedFile.mass_kg,
  yawInertia_kgm2: loadedFile.yawInertia_kgm2,
  cgToFrontAxle_m: loadedFile.cgToFrontAxle_m,
  cgToRearAxle_m: loadedFile.cgToRearAxle_m,
  frontCorneringStiffness_NPerRad: loadedFile.frontCorneringStiffness_NPerRad!,
  rearCorneringStiffness_NPerRad: loadedFile.rearCorneringStiffness_NPerRad!,
  actuatorLag_s: loadedFile.actuatorLag_s!,
  actuatorDelay_s: loadedFile.actuatorDelay_s!,
};

/**
 * Phase margin of the sampled yaw-rate loop of a single-track vehicle under PID gains, its plant written out here:
 * r/δ = (b1·s + b0)/(s² + a1·s + a0) (Rajamani 2012, Vehicle Dynamics and Control, §2.3; Gillespie 1992 §6) behind
 * the actuator e^(−θa·s)/(τa·s + 1), under the backward-Euler PID at 100 Hz with one sample of latency.
 */
function phaseMarginOf(p: SingleTrackParameters, vx: number, gains: { kp: number; ki: number; kd: number }): number | null {
  const { mass_kg: m, yawInertia_kgm2: iz, cgToFrontAxle_m: a, cgToRearAxle_m: b, frontCorneringStiffness_NPerRad: cf, rearCorneringStiffness_NPerRad: cr } = p;
  const L = a + b;
  const a1 = (cf + cr) / (m * vx) + (a * a * cf + b * b * cr) / (iz * vx);
  const a0 = (cf * cr * L * L) / (m * iz * vx * vx) + (b * cr - a * cf) / iz;
  const b1 = (a * cf) / iz;
  const b0 = (cf * cr * L) / (m * iz * vx);
  const tau = p.actuatorLag_s;
  const denominator = [tau, 1 + a1 * tau, a1 + a0 * tau, a0];
  return analyseLoop({
    plant: { numerator: [b1, b0], denominator, delay_s: p.actuatorDelay_s },
    pid: { ...gains, derivativeFilter: CONTROLLER.derivativeFilter },
    sampleTime_s: CONTROLLER.sampleTime_s,
    discretisation: CONTROLLER.discretisation,
    latency_s: CONTROLLER.computationLatency_s,
  }).phaseMargin_deg;
}

let schedule: ScheduleFile;
beforeAll(async () => {
  // The van's default schedule from its bundled logs (shared with the other tests that read it).
  schedule = (await demoSchedule('parcel-van')).schedule;
}, 120_000);

describe('containment of the loaded van in a box around the van', () => {
  const box = {
    mass_pct: [-5, 30] as const,
    yawInertia_pct: [-5, 10] as const,
    cgRearwardShift_m: [-0.05, 0.2] as const,
    frontCorneringStiffness_pct: 2,
    rearCorneringStiffness_pct: [-12, 2] as const,
    actuatorLag_pct: 2,
    addedLatency_s: 0.001,
  };

  it("the box holds the loaded van: each of its parameters lies within the box around the van's check model", () => {
    const model = recordedCheckModel(schedule)!;
    const context = vanContext(box, {}, model);
    const nominal = model.summary as unknown as SingleTrackParameters;
    for (const dimension of context.set.dimensions) {
      const parameter = dimension.parameter as keyof SingleTrackParameters;
      const change = dimension.change === 'scale' ? LOADED[parameter] / nominal[parameter] : LOADED[parameter] - nominal[parameter];
      expect(change, parameter).toBeGreaterThanOrEqual(dimension.minimum);
      expect(change, parameter).toBeLessThanOrEqual(dimension.maximum);
    }
    expect(context.set.dimensions.map((dimension) => dimension.parameter).sort()).toEqual([
      'actuatorDelay_s',
      'actuatorLag_s',
      'cgToFrontAxle_m',
      'frontCorneringStiffness_NPerRad',
      'mass_kg',
      'rearCorneringStiffness_NPerRad',
      'yawInertia_kgm2',
    ]);
  });

  it("gives at every breakpoint of the van's schedule a worst phase margin no larger than the loaded van's actual one (checked against scipy)", () => {
    const model = recordedCheckModel(schedule)!;
    const context = { ...vanContext(box, { samples: 64, localSearchEvaluations: 24 }, model), loop: YAW_LOOP };
    const loadedMargins = schedule.breakpoints.map((row) => phaseMarginOf(LOADED, row.speed_mps, row));
    // Source: the same sampled loops computed independently in python (single-track formulas, scipy.signal.cont2discrete).
    const reference = sampledSingleTrackMarginsInPython({
      ...LOADED,
      T: CONTROLLER.sampleTime_s,
      N: CONTROLLER.derivativeFilter,
      latency: CONTROLLER.computationLatency_s,
      breakpoints: schedule.breakpoints,
    });
    schedule.breakpoints.forEach((row, k) => {
      expect(Math.abs(loadedMargins[k]! - reference[k].pm!)).toBeLessThan(1e-3 * reference[k].pm!);
      const worst = worstCaseMarginsAt(row.speed_mps, row, context);
      expect(worst.instability).toBeNull();
      expect(worst.worst.phaseMargin_deg!.value, `${row.speed_mps} m/s`).toBeLessThanOrEqual(loadedMargins[k]!);
    });
    // The loaded van breaks the van's 45° limit at its top speed: the case the check exists for.
    expect(loadedMargins[loadedMargins.length - 1]!).toBeLessThan(45);
  });
});
