/**
 * The exported controller in the loop: the header's step function, compiled with gcc, replays the inputs of a
 * simulated scenario (speed, reference, measurement, feed-forward input, sample by sample, from a CSV read by a
 * small C harness) and gives the commands the TypeScript controller equation gave in the simulation. The fixed-point
 * header's integer step function: c-integer-controller.test.ts.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { simulateSchedule } from '../../src/pipeline/simulate-schedule.js';
import { firmwareStep, initialFirmwareState } from '../../src/controller/firmware-step.js';
import { exportC } from '../../src/export/c-header.js';
import { scheduleFirmware } from '../../src/schedule/schedule-lookup.js';
import type { ScheduleFile } from '../../src/schedule/schedule-types.js';
import { loadVehicle } from '../../src/vehicle/load.js';
import { singleTrackParametersFromVehicle } from '../../src/vehicle/single-track.js';
import { vehicleSchedule } from '../compare/vehicle-schedules.js';

const GCC_FLAGS = ['-std=c99', '-Wall', '-Wextra', '-Werror', '-pedantic', '-O2'] as const;
/** Double: the C commands equal the TypeScript ones within this, relative to the largest command (our tolerance; the arithmetic is the same). */
const DOUBLE_AGREEMENT = 1e-12;

const vehicle = loadVehicle('vehicles/parcel-van/vehicle.json');
const parameters = singleTrackParametersFromVehicle(vehicle);
const baseSchedule = vehicleSchedule('parcel-van', parameters);

interface Replay {
  readonly speed: Float64Array;
  readonly reference: Float64Array;
  readonly measurement: Float64Array;
  readonly feedForwardInput: Float64Array;
  readonly command: Float64Array;
}

/** A large step through the steering limits between breakpoints, then a speed ramp in a curve: clamps, anti-windup, interpolation and feed-forward all act. */
function simulatedInputs(schedule: ScheduleFile): Replay {
  const runs = simulateSchedule({ schedule, parameters, steeringLimits: vehicle, scenarios: ['large-step', 'speed-ramp-in-curve'], speeds: [6.3] });
  const join = (pick: (run: (typeof runs)[number]) => Float64Array): Float64Array => Float64Array.from(runs.flatMap((run) => Array.from(pick(run))));
  // Each run starts its controller from rest: the harness is told where a run starts by a speed of -1.
  const marker = (_run: (typeof runs)[number], values: Float64Array): number[] => [Number.NaN, ...Array.from(values)];
  return {
    speed: Float64Array.from(runs.flatMap((run) => marker(run, run.traces.speed_mps))),
    reference: Float64Array.from(runs.flatMap((run) => marker(run, run.traces.reference))),
    measurement: Float64Array.from(runs.flatMap((run) => marker(run, run.traces.measurement))),
    feedForwardInput: Float64Array.from(runs.flatMap((run) => marker(run, run.traces.feedForwardInput))),
    command: join((run) => run.traces.command_rad),
  };
}

/** The C harness: a line "start" resets the state; "speed,reference,measurement,feed_forward_input" runs lookup and step. */
function runC(header: string, replay: Replay): number[] {
  const dir = mkdtempSync(join(tmpdir(), 'speedband-c-step-'));
  writeFileSync(join(dir, 'schedule.h'), header);
  writeFileSync(
    join(dir, 'main.c'),
    `#include <stdio.h>
#include <string.h>
#include "schedule.h"
int main(void)
{
  char line[256];
  speedband_schedule_state state;
  speedband_schedule_controller_init(&state);
  while (fgets(line, sizeof line, stdin) != NULL) {
    double speed, reference, measurement, feed_forward_input;
    speedband_schedule_gains gains;
    if (strncmp(line, "start", 5) == 0) {
      speedband_schedule_controller_init(&state);
      continue;
    }
    if (sscanf(line, "%lf,%lf,%lf,%lf", &speed, &reference, &measurement, &feed_forward_input) != 4) {
      return 2;
    }
    if (speedband_schedule_lookup(speed, &gains) != SPEEDBAND_SCHEDULE_LOOKUP_OK) {
      return 3;
    }
    printf("%.17g\\n", speedband_schedule_step(&gains, &state, reference, measurement, feed_forward_input));
  }
  return 0;
}
`,
  );
  // The fixture's schedule is a test stand-in that need not pass its check: the header's #error is lifted for the harness.
  execFileSync('gcc', [...GCC_FLAGS, '-DSPEEDBAND_SCHEDULE_ALLOW_FAILING_SCHEDULE', '-o', join(dir, 'step'), join(dir, 'main.c')], { cwd: dir });
  const csv = Array.from(replay.speed, (speed, k) =>
    Number.isNaN(speed) ? 'start' : [speed, replay.reference[k], replay.measurement[k], replay.feedForwardInput[k]].map((x) => x.toPrecision(17)).join(','),
  ).join('\n');
  return execFileSync(join(dir, 'step'), { input: `${csv}\n`, encoding: 'utf8', maxBuffer: 64 * 1024 * 1024 })
    .trim()
    .split('\n')
    .map(Number);
}

/** The TypeScript controller equation replayed on the same inputs with a given lookup. */
function replayTs(schedule: ScheduleFile, replay: Replay, at = scheduleFirmware(schedule).at): number[] {
  const { settings } = scheduleFirmware(schedule);
  const commands: number[] = [];
  let state = initialFirmwareState();
  replay.speed.forEach((speed, k) => {
    if (Number.isNaN(speed)) {
      state = initialFirmwareState();
      return;
    }
    const { gains } = at(speed);
    const out = firmwareStep(gains, settings, state, {
      reference: replay.reference[k],
      measurement: replay.measurement[k],
      feedForwardInput: replay.feedForwardInput[k],
    });
    state = out.state;
    commands.push(out.command);
  });
  return commands;
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
        const replay = simulatedInputs(schedule);
        // The replay is complete: the TypeScript controller on the recorded inputs gives the simulation's commands exactly.
        expect(largestDifference(replayTs(schedule, replay), replay.command)).toBe(0);
        const scale = Math.max(...Array.from(replay.command, Math.abs));
        expect(scale).toBeGreaterThan(0.1);
        // The commands reach the limit: the clamp and the anti-windup act.
        expect(scale).toBeCloseTo(schedule.controller.integratorClamp_rad, 12);
        expect(largestDifference(runC(exportC(schedule).text, replay), replay.command)).toBeLessThanOrEqual(DOUBLE_AGREEMENT * scale);
      });
    }
  }
});
