/**
 * The inputs of simulated scenario runs (speed, reference, measurement, feed-forward input, sample by sample) and
 * the commands the TypeScript controller equation gave, for replaying them through a compiled header's step function.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { ScenarioName } from '../../src/performance/scenario-catalogue.js';
import { type ScenarioRunAt, simulateSchedule } from '../../src/pipeline/simulate-schedule.js';
import type { ScheduleFile } from '../../src/schedule/schedule-types.js';
import type { SingleTrackParameters } from '../../src/vehicle/types.js';

export const GCC_FLAGS = ['-std=c99', '-Wall', '-Wextra', '-Werror', '-pedantic', '-O2'] as const;

/** One scenario run: its inputs and the simulation's commands (the controller started from rest). */
export interface ReplayRun {
  readonly name: string;
  readonly speed_mps: Float64Array;
  readonly reference: Float64Array;
  readonly measurement: Float64Array;
  readonly feedForwardInput: Float64Array;
  readonly command: Float64Array;
}

/** Scenario runs of a schedule on a single-track model (simulateSchedule), as replays. */
export function scenarioReplays(input: {
  readonly schedule: ScheduleFile;
  readonly parameters: SingleTrackParameters;
  readonly steeringLimits: { readonly maxSteerAngle_rad: number; readonly maxSteerRate_radps: number };
  readonly scenarios: readonly ScenarioName[];
  readonly speeds: readonly number[];
}): ReplayRun[] {
  return replaysOf(simulateSchedule(input));
}

/** Scenario runs already simulated (simulateSchedule, traces to the end: not stopped at rest), as replays. */
export function replaysOf(runs: readonly ScenarioRunAt[]): ReplayRun[] {
  return runs.map((run) => ({
    name: `${run.scenario.name} at ${run.speed_mps} m/s`,
    speed_mps: run.traces.speed_mps,
    reference: run.traces.reference,
    measurement: run.traces.measurement,
    feedForwardInput: run.traces.feedForwardInput,
    command: run.traces.command_rad,
  }));
}

/**
 * Compile `main` (C99, all warnings errors, plus `extraFlags`) with the header as schedule.h, run it on `input`
 * (lines on standard input) and return its standard output lines.
 */
export function compileAndRun(header: string, main: string, input: string, extraFlags: readonly string[] = []): string[] {
  const dir = mkdtempSync(join(tmpdir(), 'speedband-c-step-'));
  writeFileSync(join(dir, 'schedule.h'), header);
  writeFileSync(join(dir, 'main.c'), main);
  // Test schedules are stand-ins that need not pass their check: the header's #error is lifted for the harness.
  execFileSync('gcc', [...GCC_FLAGS, ...extraFlags, '-DSPEEDBAND_SCHEDULE_ALLOW_FAILING_SCHEDULE', '-o', join(dir, 'step'), join(dir, 'main.c')], { cwd: dir });
  return execFileSync(join(dir, 'step'), { input, encoding: 'utf8', maxBuffer: 64 * 1024 * 1024 })
    .trim()
    .split('\n');
}

/**
 * The C harness of a header's step function: a line "start" resets the state; "speed,reference,measurement,feed_forward_input"
 * runs the lookup at the speed and one step, printing the command — doubles (%.17g) for the floating-point header,
 * integers for the fixed-point one (speed in 2^-16 m/s, signals and command in their integer scales).
 */
export function harnessText(numbers: 'double' | 'integer'): string {
  const integer = numbers === 'integer';
  const cast = (name: string): string => (integer ? `(int32_t)${name}` : name);
  return `#include <stdio.h>
#include <string.h>
#include "schedule.h"
int main(void)
{
  char line[256];
  speedband_schedule_state state;
  speedband_schedule_controller_init(&state);
  while (fgets(line, sizeof line, stdin) != NULL) {
    ${integer ? 'long' : 'double'} speed, reference, measurement, feed_forward_input;
    speedband_schedule_gains gains;
    if (strncmp(line, "start", 5) == 0) {
      speedband_schedule_controller_init(&state);
      continue;
    }
    if (sscanf(line, "${integer ? '%ld,%ld,%ld,%ld' : '%lf,%lf,%lf,%lf'}", &speed, &reference, &measurement, &feed_forward_input) != 4) {
      return 2;
    }
    if (speedband_schedule_lookup(${cast('speed')}, &gains) != SPEEDBAND_SCHEDULE_LOOKUP_OK) {
      return 3;
    }
    printf("${integer ? '%ld' : '%.17g'}\\n", ${integer ? '(long)' : ''}speedband_schedule_step(&gains, &state, ${cast('reference')}, ${cast('measurement')}, ${cast('feed_forward_input')}));
  }
  return 0;
}
`;
}

/** The harness's standard input for runs, each from rest: `format` writes one sample's four numbers. */
export function harnessInput(runs: readonly ReplayRun[], format: (run: ReplayRun, k: number) => readonly (number | bigint | string)[]): string {
  const lines = runs.flatMap((run) => ['start', ...Array.from(run.speed_mps, (_, k) => format(run, k).join(','))]);
  return `${lines.join('\n')}\n`;
}

/** The harness output split back into runs. */
export function perRun(output: readonly number[], runs: readonly ReplayRun[]): number[][] {
  let offset = 0;
  return runs.map((run) => {
    const values = output.slice(offset, offset + run.speed_mps.length);
    offset += run.speed_mps.length;
    return values;
  });
}
