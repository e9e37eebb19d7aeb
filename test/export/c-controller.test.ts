/**
 * The exported controller in the loop: the header's step function, compiled with gcc, replays the inputs of a
 * simulated scenario (speed, reference, measurement, feed-forward input, sample by sample, from a CSV read by a
 * small C harness) and gives the commands the TypeScript controller equation gave in the simulation. The fixed-point
 * header's integer step function: c-integer-controller.test.ts.
 */
import { describe, expect, it } from 'vitest';
import { firmwareStep, initialFirmwareState } from '../../src/controller/firmware-step.js';
import { exportC } from '../../src/export/c-header.js';
import { scheduleFirmware } from '../../src/schedule/schedule-lookup.js';
import type { ScheduleFile } from '../../src/schedule/schedule-types.js';
import { loadVehicle } from '../../src/vehicle/load.js';
import { singleTrackParametersFromVehicle } from '../../src/vehicle/single-track.js';
import { vehicleSchedule } from '../compare/vehicle-schedules.js';
import { compileAndRun, harnessInput, harnessText, scenarioReplays, type ReplayRun } from './controller-replay.js';

/** Double: the C commands equal the TypeScript ones within this, relative to the largest command (our tolerance; the arithmetic is the same). */
const DOUBLE_AGREEMENT = 1e-12;

const vehicle = loadVehicle('vehicles/parcel-van/vehicle.json');
const parameters = singleTrackParametersFromVehicle(vehicle);
const baseSchedule = vehicleSchedule('parcel-van', parameters);

/** A large step through the steering limits between breakpoints, then a speed ramp in a curve: clamps, anti-windup, interpolation and feed-forward all act. */
const simulatedRuns = (schedule: ScheduleFile): ReplayRun[] =>
  scenarioReplays({ schedule, parameters, steeringLimits: vehicle, scenarios: ['large-step', 'speed-ramp-in-curve'], speeds: [6.3] });

/** The compiled step's commands on the runs (the harness reads the inputs as CSV, 17 significant digits). */
function runC(header: string, runs: readonly ReplayRun[]): number[] {
  const input = harnessInput(runs, (run, k) => [run.speed_mps[k], run.reference[k], run.measurement[k], run.feedForwardInput[k]].map((x) => x.toPrecision(17)));
  return compileAndRun(header, harnessText('double'), input).map(Number);
}

/** The TypeScript controller equation replayed on the same inputs, each run from rest. */
function replayTs(schedule: ScheduleFile, runs: readonly ReplayRun[]): number[] {
  const { settings, at } = scheduleFirmware(schedule);
  return runs.flatMap((run) => {
    let state = initialFirmwareState();
    return Array.from(run.speed_mps, (speed, k) => {
      const out = firmwareStep(at(speed).gains, settings, state, {
        reference: run.reference[k],
        measurement: run.measurement[k],
        feedForwardInput: run.feedForwardInput[k],
      });
      state = out.state;
      return out.command;
    });
  });
}

const largestDifference = (a: ArrayLike<number>, b: ArrayLike<number>): number => {
  expect(a.length).toBe(b.length);
  let worst = 0;
  for (let k = 0; k < a.length; k++) worst = Math.max(worst, Math.abs(a[k] - b[k]));
  return worst;
};

describe("the header's step function compiled with gcc", () => {
  for (const discretisation of ['backward-euler', 'tustin'] as const) {
    for (const antiWindup of ['conditional-integration', 'back-calculation'] as const) {
      it(`${discretisation}, ${antiWindup}: gives the simulated commands within 1e-12 of the largest, through the steering limits and a speed ramp`, () => {
        const schedule: ScheduleFile = { ...baseSchedule, controller: { ...baseSchedule.controller, discretisation, antiWindup } };
        const runs = simulatedRuns(schedule);
        const commands = runs.flatMap((run) => Array.from(run.command));
        // The replay is complete: the TypeScript controller on the recorded inputs gives the simulation's commands exactly.
        expect(largestDifference(replayTs(schedule, runs), commands)).toBe(0);
        const scale = commands.reduce((most, value) => Math.max(most, Math.abs(value)), 0);
        expect(scale).toBeGreaterThan(0.1);
        // The commands reach the limit: the clamp and the anti-windup act.
        expect(scale).toBeCloseTo(schedule.controller.integratorClamp_rad, 12);
        expect(largestDifference(runC(exportC(schedule).text, runs), commands)).toBeLessThanOrEqual(DOUBLE_AGREEMENT * scale);
      });
    }
  }
});
