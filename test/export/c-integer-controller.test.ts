/**
 * The fixed-point header's controller in the loop: its integer step function, compiled with gcc (integers only:
 * -mgeneral-regs-only), replays the inputs of simulated scenario runs converted to its integer scales, and its
 * commands stay within the stated quantisation error bound of the TypeScript controller equation's (double,
 * exact lookup) at every sample; the bound is not vacuous; no input the int32 signals carry makes it overflow
 * (UndefinedBehaviorSanitizer); a schedule whose gains would overflow is refused with the term, gain and scale.
 */
import { describe, expect, it } from 'vitest';
import { exportC } from '../../src/export/c-header.js';
import { parseFixedPointRequest } from '../../src/export/fixed-point.js';
import { fixedPointCommandBound } from '../../src/export/fixed-point-bound.js';
import { speedToInteger } from '../../src/export/integer-lookup.js';
import { ACCUMULATOR_LIMIT_RAD, SIGNAL_FRACTIONAL_BITS } from '../../src/export/integer-step-plan.js';
import { scheduleFirmware } from '../../src/schedule/schedule-lookup.js';
import { makeRandom } from '../../src/core/random.js';
import type { ScheduleFile } from '../../src/schedule/schedule-types.js';
import { loadVehicle } from '../../src/vehicle/load.js';
import { singleTrackParametersFromVehicle } from '../../src/vehicle/single-track.js';
import { vehicleSchedule } from '../compare/vehicle-schedules.js';
import { compileAndRun, scenarioReplays, type ReplayRun } from './controller-replay.js';

/**
 * Our acceptance of the bound (our choice for a firmware port): the quantisation may move the command by at most 1 % of
 * its peak on the scenario. Where conditional integration rides the steering limit its decision is discontinuous: two
 * implementations of the law — even two floating-point ones rounding differently — may hold the integrator one sample
 * apart, one increment T·ki·e; from the first sample where the bound finds the integer step undecided, that one
 * increment is allowed on top.
 */
const USEFUL_BOUND = 0.01;

const vehicle = loadVehicle('vehicles/parcel-van/vehicle.json');
const parameters = singleTrackParametersFromVehicle(vehicle);
const baseSchedule = vehicleSchedule('parcel-van', parameters);

const SCALE = 2 ** SIGNAL_FRACTIONAL_BITS;
const toSignal = (x: number): bigint => BigInt(Math.round(x * SCALE));

const HARNESS = `#include <stdio.h>
#include <string.h>
#include "schedule.h"
int main(void)
{
  char line[256];
  speedband_schedule_state state;
  speedband_schedule_controller_init(&state);
  while (fgets(line, sizeof line, stdin) != NULL) {
    long speed, reference, measurement, feed_forward_input;
    speedband_schedule_gains gains;
    if (strncmp(line, "start", 5) == 0) {
      speedband_schedule_controller_init(&state);
      continue;
    }
    if (sscanf(line, "%ld,%ld,%ld,%ld", &speed, &reference, &measurement, &feed_forward_input) != 4) {
      return 2;
    }
    if (speedband_schedule_lookup((int32_t)speed, &gains) != SPEEDBAND_SCHEDULE_LOOKUP_OK) {
      return 3;
    }
    printf("%ld\\n", (long)speedband_schedule_step(&gains, &state, (int32_t)reference, (int32_t)measurement, (int32_t)feed_forward_input));
  }
  return 0;
}
`;

/** The integer commands (rad) of the compiled step on the runs, each run from rest; `flags` extra gcc flags. */
function runIntegerC(header: string, runs: readonly ReplayRun[], flags: readonly string[] = ['-mgeneral-regs-only']): number[][] {
  const lines = runs.flatMap((run) => [
    'start',
    ...Array.from(run.speed_mps, (speed, k) =>
      [speedToInteger(speed), toSignal(run.reference[k]), toSignal(run.measurement[k]), toSignal(run.feedForwardInput[k])].join(','),
    ),
  ]);
  const output = compileAndRun(header, HARNESS, `${lines.join('\n')}\n`, flags).map(Number);
  let offset = 0;
  return runs.map((run) => {
    const commands = output.slice(offset, offset + run.speed_mps.length).map((value) => value / SCALE);
    offset += run.speed_mps.length;
    return commands;
  });
}

/** A large step through the steering limits, then a speed ramp in a curve: clamps, anti-windup, interpolation and feed-forward all act. */
const replaysOf = (schedule: ScheduleFile): ReplayRun[] =>
  scenarioReplays({ schedule, parameters, steeringLimits: vehicle, scenarios: ['large-step', 'speed-ramp-in-curve'], speeds: [6.3] });

interface Comparison {
  readonly worstDifference: number;
  readonly worstBound: number;
  readonly peakCommand: number;
  readonly undecidedSamples: number;
}

/**
 * Compile, replay, and hold every sample to the bound; then the bound's usefulness: at most USEFUL_BOUND of the peak
 * command, plus, from the first undecided sample of a run on, the largest integral increment T·|ki·e| of the run.
 */
function compareWithBound(schedule: ScheduleFile, request: string): Comparison {
  const exported = exportC(schedule, { fixedPoint: parseFixedPointRequest(request) });
  expect(exported.text).not.toMatch(/\bdouble\b|\bfloat\b/);
  const runs = replaysOf(schedule);
  const fromC = runIntegerC(exported.text, runs);
  const peakCommand = Math.max(...runs.flatMap((run) => Array.from(run.command, Math.abs)));
  const { at } = scheduleFirmware(schedule);
  let worstDifference = 0;
  let worstBound = 0;
  let undecidedSamples = 0;
  runs.forEach((run, j) => {
    const { command, bound, undecided } = fixedPointCommandBound(schedule, exported.stepPlan!, exported.quantisation!.lookupErrorBounds, run);
    // The bound is taken around the simulation's own commands (the TypeScript controller equation, double).
    expect(Array.from(command)).toEqual(Array.from(run.command));
    const increment = Math.max(
      ...Array.from(run.speed_mps, (speed, k) => schedule.controller.sampleTime_s * Math.abs(at(speed).gains.ki * (run.reference[k] - run.measurement[k]))),
    );
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

/**
 * The header with its integer helpers made to trap where the header comment says they never go: a product or a
 * quotient that does not fit below 2^62 (the sanitizer sees signed overflow in the sums, not lost unsigned bits).
 */
function instrumented(header: string): string {
  const product = '  return (a < 0) != (b < 0) ? -(int64_t)magnitude : (int64_t)magnitude;';
  const quotient = '    quotient <<= 1;';
  expect(header).toContain(product);
  expect(header).toContain(quotient);
  return header
    .replace(product, `  if ((shift > 0 ? high >> shift : high) != 0 || magnitude >= ((uint64_t)1 << 62)) __builtin_trap();\n${product}`)
    .replace(quotient, `    if (quotient >> 62 != 0) __builtin_trap();\n${quotient}`);
}

/** Inputs anywhere in the int32 range — the extremes included — and speeds from below the floor to beyond the table, seeded. */
function extremeInputs(samples: number, seed: number): string {
  const random = makeRandom(seed);
  const extremes = [2 ** 31 - 1, -(2 ** 31), 0, 1, -1];
  const signal = (): number =>
    random.uniform() < 0.3 ? extremes[Math.floor(random.uniform() * extremes.length)] : Math.floor(random.uniform() * 2 ** 32) - 2 ** 31;
  const lines: string[] = [];
  for (let k = 0; k < samples; k += 1) {
    if (k % 500 === 0) lines.push('start');
    lines.push([Math.floor(random.uniform() * 40 * 2 ** 16), signal(), signal(), signal()].join(','));
  }
  return `${lines.join('\n')}\n`;
}

describe("the fixed-point header's step function compiled with gcc (integers only)", () => {
  for (const discretisation of ['backward-euler', 'tustin'] as const) {
    for (const antiWindup of ['conditional-integration', 'back-calculation'] as const) {
      it(`Q16.16, ${discretisation}, ${antiWindup}: within the stated bound of the floating-point controller at every sample; the bound within 1 % of the peak command`, () => {
        const schedule: ScheduleFile = { ...baseSchedule, controller: { ...baseSchedule.controller, discretisation, antiWindup } };
        const { worstDifference, peakCommand, undecidedSamples } = compareWithBound(schedule, 'Q16.16');
        // The commands reach the steering limit: the clamps and the anti-windup act.
        expect(peakCommand).toBeCloseTo(schedule.controller.integratorClamp_rad, 12);
        // Quantisation moves the commands (the comparison can fail); back-calculation has no decision to flip.
        expect(worstDifference).toBeGreaterThan(0);
        if (antiWindup === 'back-calculation') expect(undecidedSamples).toBe(0);
      });
    }
  }

  it('auto formats: within the bound, and a finer format gives a smaller bound than Q16.16', () => {
    const coarse = compareWithBound(baseSchedule, 'Q16.16');
    const fine = compareWithBound(baseSchedule, 'auto');
    expect(fine.worstBound).toBeLessThan(coarse.worstBound);
    expect(fine.worstDifference).toBeLessThan(coarse.worstDifference);
  });

  it('no undefined behaviour for any int32 inputs (UndefinedBehaviorSanitizer), gains near the overflow check included; the command within its limit', () => {
    // The van's gains scaled up until the largest term is between a quarter and a half of what the accumulator holds.
    const scaled = (factor: number): ScheduleFile => ({
      ...baseSchedule,
      breakpoints: baseSchedule.breakpoints.map((row) => ({
        ...row,
        kp: row.kp * factor,
        ki: row.ki * factor,
        kd: row.kd * factor,
        feedForward: row.feedForward * factor,
      })),
    });
    const baseline = exportC(baseSchedule, { fixedPoint: 'auto' }).stepPlan!;
    // The instrumentation is live: a product beyond 2^62 traps.
    const overflowing =
      '#include "schedule.h"\nint main(void)\n{\n  return (int)(speedband_schedule_multiply((int64_t)1 << 40, (int64_t)1 << 40, 10) & 1);\n}\n';
    expect(() => compileAndRun(instrumented(exportC(baseSchedule, { fixedPoint: 'auto' }).text), overflowing, '')).toThrow(
      expect.objectContaining({ signal: 'SIGILL' }),
    );
    const factor = ACCUMULATOR_LIMIT_RAD / 3 / baseline.ranges.unlimited;
    for (const discretisation of ['backward-euler', 'tustin'] as const) {
      for (const antiWindup of ['conditional-integration', 'back-calculation'] as const) {
        for (const schedule of [baseSchedule, scaled(factor)]) {
          const variant: ScheduleFile = { ...schedule, controller: { ...schedule.controller, discretisation, antiWindup } };
          const exported = exportC(variant, { fixedPoint: 'auto' });
          expect(exported.stepPlan!.ranges.unlimited).toBeLessThan(ACCUMULATOR_LIMIT_RAD);
          const commands = compileAndRun(instrumented(exported.text), HARNESS, extremeInputs(3000, 7), [
            '-fsanitize=undefined',
            '-fno-sanitize-recover=all',
          ]).map(Number);
          expect(commands).toHaveLength(3000);
          const limit = Math.round(variant.controller.integratorClamp_rad * SCALE);
          for (const command of commands) expect(Math.abs(command)).toBeLessThanOrEqual(limit);
        }
      }
    }
  });

  it('refuses a schedule whose gains would overflow, naming the term, the gain and the scale; and kp = 0 with derivative action', () => {
    const huge: ScheduleFile = { ...baseSchedule, breakpoints: baseSchedule.breakpoints.map((row) => ({ ...row, kd: row.kd * 20000 })) };
    expect(() => exportC(huge, { fixedPoint: 'auto' })).toThrow(
      expect.objectContaining({
        code: 'export.fixedPointStepRange',
        message: expect.stringMatching(/derivative term.*int32 range.*2\^-24.*kd up to .*sample time 0\.01 s/),
      }),
    );
    const noKp: ScheduleFile = { ...baseSchedule, breakpoints: baseSchedule.breakpoints.map((row, k) => ({ ...row, kp: k === 1 ? 0 : row.kp })) };
    expect(() => exportC(noKp, { fixedPoint: 'auto' })).toThrow(
      expect.objectContaining({ code: 'export.fixedPointStepRange', message: expect.stringMatching(/kp is 0/) }),
    );
    // The floating-point header takes both.
    expect(exportC(huge).text).toMatch(/speedband_schedule_step\(/);
  });
});
