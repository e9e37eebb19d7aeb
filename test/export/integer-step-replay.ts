/**
 * Replaying simulated runs through the fixed-point header's integer step function (compiled with gcc, integers only)
 * and holding its commands to the quantisation error bound (fixedPointCommandBound) at every sample.
 */
import { expect } from 'vitest';
import { exportC } from '../../src/export/c-header.js';
import { parseFixedPointRequest } from '../../src/export/fixed-point.js';
import { fixedPointCommandBound } from '../../src/export/fixed-point-bound.js';
import { speedToInteger } from '../../src/export/integer-lookup.js';
import { SIGNAL_FRACTIONAL_BITS } from '../../src/export/integer-step-plan.js';
import { scheduleFirmware } from '../../src/schedule/schedule-lookup.js';
import type { ScheduleFile } from '../../src/schedule/schedule-types.js';
import { compileAndRun, harnessInput, harnessText, perRun, type ReplayRun } from './controller-replay.js';

/**
 * Our acceptance of the bound (our choice for a firmware port): the quantisation may move the command by at most 1 % of
 * its peak on the scenario. Where conditional integration rides the steering limit its decision is discontinuous: two
 * implementations of the law — even two floating-point ones rounding differently — may hold the integrator one sample
 * apart, one increment T·ki·e; from the first sample where the bound finds the integer step undecided, that one
 * increment is allowed on top.
 */
export const USEFUL_BOUND = 0.01;

export const SCALE = 2 ** SIGNAL_FRACTIONAL_BITS;
const toSignal = (x: number): bigint => BigInt(Math.round(x * SCALE));

export const HARNESS = harnessText('integer');

/** The integer commands (rad) of the compiled step on the runs, each run from rest; `flags` extra gcc flags. */
export function runIntegerC(header: string, runs: readonly ReplayRun[], flags: readonly string[] = ['-mgeneral-regs-only']): number[][] {
  const input = harnessInput(runs, (run, k) => [
    speedToInteger(run.speed_mps[k]),
    toSignal(run.reference[k]),
    toSignal(run.measurement[k]),
    toSignal(run.feedForwardInput[k]),
  ]);
  return perRun(compileAndRun(header, HARNESS, input, flags).map(Number), runs).map((commands) => commands.map((value) => value / SCALE));
}

export interface Comparison {
  readonly worstDifference: number;
  readonly worstBound: number;
  readonly peakCommand: number;
  readonly undecidedSamples: number;
}

/**
 * Compile, replay, and hold every sample to the bound; then the bound's usefulness: at most USEFUL_BOUND of the peak
 * command, plus, from the first undecided sample of a run on, the largest integral increment T·|ki·e| of the run.
 */
export function compareIntegerStep(schedule: ScheduleFile, request: string, runs: readonly ReplayRun[]): Comparison {
  const exported = exportC(schedule, { fixedPoint: parseFixedPointRequest(request) });
  expect(exported.text).not.toMatch(/\bdouble\b|\bfloat\b/);
  const fromC = runIntegerC(exported.text, runs);
  const peakCommand = runs.reduce((peak, run) => run.command.reduce((most, value) => Math.max(most, Math.abs(value)), peak), 0);
  const { at } = scheduleFirmware(schedule);
  let worstDifference = 0;
  let worstBound = 0;
  let undecidedSamples = 0;
  runs.forEach((run, j) => {
    const { command, bound, undecided } = fixedPointCommandBound(schedule, exported.stepPlan!, exported.quantisation!.lookupErrorBounds, run);
    // The bound is taken around the simulation's own commands (the TypeScript controller equation, double).
    expect(command.length).toBe(run.command.length);
    expect(
      command.findIndex((value, k) => !Object.is(value, run.command[k])),
      `${run.name}: first sample where the commands differ`,
    ).toBe(-1);
    let increment = 0;
    run.speed_mps.forEach((speed, k) => {
      increment = Math.max(increment, schedule.controller.sampleTime_s * Math.abs(at(speed).gains.ki * (run.reference[k] - run.measurement[k])));
    });
    let allowance = USEFUL_BOUND * peakCommand;
    fromC[j].forEach((value, k) => {
      const difference = Math.abs(value - run.command[k]);
      if (!(difference <= bound[k])) expect.fail(`${run.name}, sample ${k}: |${value} - ${run.command[k]}| = ${difference} > bound ${bound[k]}`);
      if (undecided[k] === 1 && allowance === USEFUL_BOUND * peakCommand) allowance += increment;
      if (!(bound[k] <= allowance)) expect.fail(`${run.name}, sample ${k}: the bound ${bound[k]} exceeds ${allowance}`);
      worstDifference = Math.max(worstDifference, difference);
      worstBound = Math.max(worstBound, bound[k]);
    });
    undecidedSamples += undecided.reduce((sum, flag) => sum + flag, 0);
  });
  return { worstDifference, worstBound, peakCommand, undecidedSamples };
}
