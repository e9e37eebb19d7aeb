/**
 * The inputs of simulated scenario runs (speed, reference, measurement, feed-forward input, sample by sample) and
 * the commands the TypeScript controller equation gave, for replaying them through a compiled header's step function.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { ScenarioName } from '../../src/performance/scenario-catalogue.js';
import { simulateSchedule } from '../../src/pipeline/simulate-schedule.js';
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
  return simulateSchedule(input).map((run) => ({
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
