import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { inspectLog } from '../../src/log/inspect.js';
import { readSteerLog } from '../../src/log/read.js';
import { findStepTests } from '../../src/log/segment.js';
import { DEMO_FLEET } from '../../src/vehicle/demo-fleet.js';
import { loadVehicle } from '../../src/vehicle/load.js';
import { generateTestLog } from '../../src/vehicle/test-logs.js';

const VEHICLES = new URL('../../vehicles/', import.meta.url).pathname;

// The demo logs are written by the vehicle stage's generator (make-test-logs); its plan says which steps each file holds.
describe('findStepTests on every committed demo log', () => {
  for (const demo of DEMO_FLEET) {
    it(`${demo.folder}: finds exactly the steps the generator commanded, none rejected, each within one sample of its planned onset`, () => {
      const vehicle = loadVehicle(join(VEHICLES, demo.folder));
      for (const speed_mps of demo.speeds_mps) {
        const planned = generateTestLog(vehicle, speed_mps, { seed: demo.seed });
        const log = readSteerLog(join(VEHICLES, demo.folder, 'logs', planned.fileName));
        const { steps, rejected } = findStepTests(log, { maxSteerAngle_rad: vehicle.maxSteerAngle_rad });
        expect(rejected, planned.fileName).toEqual([]);
        expect(steps.length, planned.fileName).toBe(planned.steps.length);
        steps.forEach((step, k) => {
          const plan = planned.steps[k];
          // Our onset is the last sample still at the old level (within the onset tolerance): within one sample period of the planned ramp start.
          expect(Math.abs(step.onset_s - plan.onset_s)).toBeLessThan(log.samplePeriod_s + 1e-9);
          // Amplitudes are written with 5 decimals: agree to 1e-4 rad.
          expect(Math.abs(step.amplitude_rad - (plan.to_rad - plan.from_rad))).toBeLessThan(1e-4);
          expect(Math.abs(step.speed_mps - speed_mps)).toBeLessThan(0.05 * speed_mps);
          // Steady yaw gain of the linear single-track model, r/δ = vx/(L + K·vx²), K = (m/L)(b/Cf − a/Cr)
          // (Gillespie 1992; docs/domain.md §3), from the vehicle file's nominal stiffnesses the logs were simulated with.
          const { mass_kg: m, cgToFrontAxle_m: a, cgToRearAxle_m: b } = vehicle;
          const Cf = vehicle.frontCorneringStiffness_NPerRad ?? NaN;
          const Cr = vehicle.rearCorneringStiffness_NPerRad ?? NaN;
          const K = (m / (a + b)) * (b / Cf - a / Cr);
          const modelGain_perS = speed_mps / (a + b + K * speed_mps * speed_mps);
          // 3 %: sensor noise and bias on the shorter holds of small steps.
          expect(Math.abs(step.metrics.steadyYawGain_perS / modelGain_perS - 1), `${planned.fileName} step ${k}`).toBeLessThan(0.03);
        });
      }
    });
  }

  it('inspectLog of a parcel-van log reports the six channels with the default columns', () => {
    const log = readSteerLog(join(VEHICLES, 'parcel-van', 'logs', generateTestLog(loadVehicle(join(VEHICLES, 'parcel-van')), 10, { seed: 101 }).fileName));
    const inspection = inspectLog(log);
    expect(inspection.channels.map((channel) => channel.channel)).toEqual([
      'time_s',
      'speed_mps',
      'steer_cmd_rad',
      'yaw_rate_radps',
      'steer_angle_rad',
      'lat_accel_mps2',
    ]);
    expect(inspection.sampleRate_Hz).toBeCloseTo(50, 6); // the demo logs are written at 50 Hz (vehicles/*/logs/README.md)
    expect(inspection.warnings).toEqual([]);
  });
});
