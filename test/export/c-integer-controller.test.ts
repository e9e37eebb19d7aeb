/**
 * The fixed-point header's controller in the loop: its integer step function, compiled with gcc (integers only:
 * -mgeneral-regs-only), replays the inputs of simulated scenario runs converted to its integer scales, and its
 * commands stay within the stated quantisation error bound of the TypeScript controller equation's (double,
 * exact lookup) at every sample; the bound is not vacuous; no input the int32 signals carry makes it overflow
 * (UndefinedBehaviorSanitizer); a schedule whose gains would overflow is refused with the term, gain and scale.
 */
import { describe, expect, it } from 'vitest';
import { exportC } from '../../src/export/c-header.js';
import { ACCUMULATOR_LIMIT_RAD } from '../../src/export/integer-step-plan.js';
import { makeRandom } from '../../src/core/random.js';
import type { ScheduleFile } from '../../src/schedule/schedule-types.js';
import { loadVehicle } from '../../src/vehicle/load.js';
import { singleTrackParametersFromVehicle } from '../../src/vehicle/single-track.js';
import { vehicleSchedule } from '../compare/vehicle-schedules.js';
import { compileAndRun, scenarioReplays, type ReplayRun } from './controller-replay.js';
import { compareIntegerStep, HARNESS, SCALE } from './integer-step-replay.js';

const vehicle = loadVehicle('vehicles/parcel-van/vehicle.json');
const parameters = singleTrackParametersFromVehicle(vehicle);
const baseSchedule = vehicleSchedule('parcel-van', parameters);

/** A large step through the steering limits, then a speed ramp in a curve: clamps, anti-windup, interpolation and feed-forward all act. */
const replaysOf = (schedule: ScheduleFile): ReplayRun[] =>
  scenarioReplays({ schedule, parameters, steeringLimits: vehicle, scenarios: ['large-step', 'speed-ramp-in-curve'], speeds: [6.3] });
const compareWithBound = (schedule: ScheduleFile, request: string) => compareIntegerStep(schedule, request, replaysOf(schedule));

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
          // Unoptimised: every operation is instrumented as written (none folded away first), and it compiles in half the time.
          const commands = compileAndRun(instrumented(exported.text), HARNESS, extremeInputs(3000, 7), [
            '-O0',
            '-fsanitize=undefined',
            '-fno-sanitize-recover=all',
          ]).map(Number);
          expect(commands).toHaveLength(3000);
          const limit = Math.round(variant.controller.integratorClamp_rad * SCALE);
          expect(commands.reduce((largest, command) => Math.max(largest, Math.abs(command)), 0)).toBeLessThanOrEqual(limit);
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
