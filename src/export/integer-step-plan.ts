/**
 * The numbers of the fixed-point header's controller step function (c-integer-controller.ts): the scales of its
 * signals, the fractional bits of every intermediate, its integer constants, and the proof that no intermediate
 * overflows for any inputs the int32 signals can carry — or `export.fixedPointStepRange` naming the term, the gain
 * and the scale when a schedule's gains would overflow.
 *
 * Signals: reference r, measurement y, feed-forward input w and the command u are int32 in units of 2^−24 of their
 * unit (±128 units). The four terms, the integral and the command are int64 in units of 2^−32 rad (the
 * accumulator). Each product is exact in 128 bits and rounded once, half away from zero; each quotient is rounded
 * half up; the square root is the floor. Per sample, with q = 1 − p of the derivative filter:
 *   F = kff·w                 P = kp·(b·r − y)              d = c·r − y
 *   Td = |kd|/|kp|            q = N·T/(N·T + Td) (backward Euler), 2·N·T/(N·T + 2·Td) (Tustin)
 *   D = (1 − q)·D' + (kd/T)·q·(d − d')                     (the coefficients of discretePidCoefficients)
 *   I-increment = T·ki·e (backward Euler), (T·ki·e + the previous one)/2 (Tustin)
 *     back-calculation: + (T/Tt)·(u' − v'), T/Tt = T·|ki|/|kp| (kd = 0) or √(T²·|ki|/|kd|)
 * then the integrator clamp, conditional integration and the command limit as the floating-point step.
 */
import type { AntiWindup } from '../controller/firmware-step.js';
import type { Discretisation } from '../controller/types.js';
import { SpeedbandError } from '../core/errors.js';
import type { ScheduleFile } from '../schedule/schedule-types.js';
import type { LookupField } from './c-lookup.js';
import type { IntegerTable } from './integer-lookup.js';
import { roundToInteger } from './integer-lookup.js';

/** Fractional bits of the signals: reference, measurement, feed-forward input and command (int32, ±128 units). */
export const SIGNAL_FRACTIONAL_BITS = 24;
/** Fractional bits of the accumulator (int64, rad): the terms, the integral, the unlimited command. */
export const ACCUMULATOR_FRACTIONAL_BITS = 32;
/** Fractional bits of q = 1 − p, the derivative filter's complement (q ≤ 2). */
export const COMPLEMENT_FRACTIONAL_BITS = 60;
/** Fractional bits of the sample time T (T ≤ 1 s). */
export const SAMPLE_TIME_FRACTIONAL_BITS = 61;
/** Every accumulator value stays below 2^60 units, ±2^28 rad, for any int32 inputs: four of them add up inside int64. */
export const ACCUMULATOR_LIMIT_RAD = 2 ** (60 - ACCUMULATOR_FRACTIONAL_BITS);
/** The largest magnitude an int32 signal carries, in its unit. */
export const SIGNAL_LIMIT = (2 ** 31 - 1) / 2 ** SIGNAL_FRACTIONAL_BITS;

/** An integer constant of the step function: value·2^−fractionalBits. */
export interface IntegerConstant {
  readonly value: bigint;
  readonly fractionalBits: number;
}

/** The terms whose largest magnitudes the overflow check bounds (rad, inputs anywhere in the int32 range). */
export type RangeTerm = 'feedForward' | 'proportional' | 'derivative' | 'integral' | 'increment' | 'unlimited';

export interface IntegerStepPlan {
  readonly discretisation: Discretisation;
  readonly antiWindup: AntiWindup;
  /** Fractional bits of each field of the gains struct. */
  readonly fractionalBits: Readonly<Record<LookupField, number>>;
  readonly sampleTime: IntegerConstant;
  readonly inverseSampleTime: IntegerConstant;
  /** N·T, in the format of the derivative time Td. */
  readonly filterTime: IntegerConstant;
  /** Fractional bits of Td = kd/kp, s. */
  readonly derivativeTimeBits: number;
  /** Fractional bits of kd/T and of the filter gain g = (kd/T)·q. */
  readonly derivativeGainBits: number;
  /** Fractional bits of ki·T. */
  readonly integralGainBits: number;
  /** Fractional bits of T/Tt (back-calculation). */
  readonly trackingBits: number;
  /** The integrator clamp and the command limit in accumulator units (round(x·2^32)). */
  readonly integratorClamp: bigint;
  readonly commandLimit: bigint;
  /** Largest magnitude of each term for inputs anywhere in the int32 range, rad. */
  readonly ranges: Readonly<Record<RangeTerm, number>>;
  /** Largest Td = kd/kp the integer lookup's gains can give, s. */
  readonly largestDerivativeTime: number;
  /** Largest |T/Tt| the step can compute (back-calculation; 0 otherwise). */
  readonly largestTracking: number;
}

/** The most fractional bits F ≤ cap with value·2^F < 2^bits (value ≥ 0). */
function bitsFor(value: number, bits: number, cap: number): number {
  if (!(value > 0)) return cap;
  let fractionalBits = Math.floor(bits - Math.log2(value));
  while (value * 2 ** fractionalBits >= 2 ** bits) fractionalBits -= 1;
  while (value * 2 ** (fractionalBits + 1) < 2 ** bits) fractionalBits += 1;
  return Math.min(cap, fractionalBits);
}

/** The step function's plan for a quantised table with its extra columns (see the file comment). */
export function integerStepPlan(schedule: Pick<ScheduleFile, 'controller' | 'units'>, integer: IntegerTable<string>): IntegerStepPlan {
  const { controller, units } = schedule;
  const fields = ['kp', 'ki', 'kd', 'setpoint_weight_p', 'setpoint_weight_d', 'feed_forward', 'feed_forward_lead_time_s'] as const;
  for (const name of fields) if (integer.gains[name] === undefined) throw new SpeedbandError('internal', `the integer table has no column ${name}`);
  const value = (name: LookupField, k: number): number => Math.abs(Number(integer.gains[name][k])) / 2 ** integer.fractionalBits[name];
  const n = integer.speeds.length;
  const rows = Array.from({ length: n }, (_, k) => k);
  const largest = (name: LookupField): number => Math.max(...rows.map((k) => value(name, k)));
  // Between breakpoints the integer lookup stays between the neighbours' stored values: the pairs to bound over.
  const pairs = n === 1 ? [[0, 0]] : rows.slice(1).map((k) => [k - 1, k]);
  const smallest = (name: LookupField, [a, b]: number[]): number => Math.min(value(name, a), value(name, b));
  const larger = (name: LookupField, [a, b]: number[]): number => Math.max(value(name, a), value(name, b));
  const T = controller.sampleTime_s;
  const N = controller.derivativeFilter;
  const M = controller.integratorClamp_rad;
  const refuse = (what: string, advice: string, details: Record<string, unknown>): never => {
    throw new SpeedbandError(
      'export.fixedPointStepRange',
      `the integer step function cannot hold ${what} — ${advice}, or export the floating-point header (without --q-format)`,
      { details },
    );
  };
  if (!(M < SIGNAL_LIMIT))
    refuse(`the integrator clamp ${M} rad in an int32 command`, `the command is an int32 in units of 2^-${SIGNAL_FRACTIONAL_BITS} rad`, {
      gain: 'integratorClamp_rad',
    });
  const kpCanBeZero = rows.some((k) => value('kp', k) === 0);
  if (kpCanBeZero && largest('kd') > 0) {
    refuse(
      'the derivative filter time Td/N = kd/(N·kp): kp is 0 at a breakpoint of a schedule with derivative action, so Td has no bound',
      'give kp ≠ 0 at every breakpoint',
      {
        gain: 'kp',
      },
    );
  }
  const backCalculation = controller.antiWindup === 'back-calculation';
  if (backCalculation && kpCanBeZero && largest('ki') > 0) {
    refuse(
      'the back-calculation tracking time Tt = kp/ki: kp and kd are 0 at a breakpoint with integral action, so T/Tt has no bound',
      'give kp ≠ 0 at every breakpoint or use conditional integration',
      {
        gain: 'kp',
      },
    );
  }
  const derivativeTime = Math.max(0, ...pairs.map((pair) => (larger('kd', pair) === 0 ? 0 : larger('kd', pair) / smallest('kp', pair))));
  const tracking = backCalculation
    ? Math.max(
        0,
        ...pairs.map((pair) => {
          const ki = larger('ki', pair);
          if (ki === 0) return 0;
          const kdFloor = Math.max(smallest('kd', pair), 2 ** -integer.fractionalBits.kd);
          return Math.max(larger('kd', pair) > 0 ? T * Math.sqrt(ki / kdFloor) : 0, smallest('kd', pair) === 0 ? (T * ki) / smallest('kp', pair) : 0);
        }),
      )
    : 0;
  const fractional = integer.fractionalBits as Readonly<Record<LookupField, number>>;
  const inverseBits = bitsFor(1 / T, 62, 62);
  const derivativeTimeBits = bitsFor(N * T + 2 * derivativeTime, 60, 62);
  const derivativeGainBits = bitsFor((2 * largest('kd')) / T, 61, Math.min(62, fractional.kd + inverseBits));
  const integralGainBits = bitsFor(largest('ki') * T, 60, Math.min(62, fractional.ki + SAMPLE_TIME_FRACTIONAL_BITS));
  const trackingBits = bitsFor(tracking * tracking, 62, 60) >> 1;
  const minimumBits = ACCUMULATOR_FRACTIONAL_BITS - SIGNAL_FRACTIONAL_BITS;
  if (derivativeGainBits < minimumBits) refuse(`kd/T = ${largest('kd') / T}`, 'lower kd or raise the sample time', { gain: 'kd' });
  if (integralGainBits < minimumBits) refuse(`ki·T = ${largest('ki') * T}`, 'lower ki', { gain: 'ki' });

  // Largest magnitudes for inputs anywhere in the int32 range (with a factor 2 on the filter for its roundings).
  const X = SIGNAL_LIMIT;
  const feedForward = largest('feed_forward') * X;
  const proportional = largest('kp') * (largest('setpoint_weight_p') + 1) * X;
  const filterGain = controller.discretisation === 'tustin' ? Math.max(largest('kd') / T, (N * largest('kp')) / 2) : largest('kd') / T;
  const derivative = 2 * filterGain * 2 * (largest('setpoint_weight_d') + 1) * X;
  const integral = M + feedForward;
  const unlimited = feedForward + proportional + integral + derivative;
  const increment = largest('ki') * T * 2 * X + tracking * (unlimited + M);
  const ranges: Record<RangeTerm, number> = { feedForward, proportional, derivative, integral: integral + increment, increment, unlimited };
  const gainOf: Record<RangeTerm, string> = {
    feedForward: `the feed-forward gain up to ${largest('feed_forward')} ${units.feedForward}`,
    proportional: `kp up to ${largest('kp')} ${units.kp}`,
    derivative: `kd up to ${largest('kd')} ${units.kd} with the sample time ${T} s`,
    integral: `the integrator clamp ${M} rad with the feed-forward`,
    increment: `ki up to ${largest('ki')} ${units.ki}`,
    unlimited: 'the sum of the four terms',
  };
  for (const term of Object.keys(ranges) as RangeTerm[]) {
    if (!(ranges[term] < ACCUMULATOR_LIMIT_RAD)) {
      refuse(
        `its ${term} term: it could reach ${ranges[term].toPrecision(3)} rad for inputs anywhere in their int32 range (±${Math.round(X)} ${units.error}, ` +
          `2^-${SIGNAL_FRACTIONAL_BITS} units) from ${gainOf[term]}, beyond the ±2^${Math.log2(ACCUMULATOR_LIMIT_RAD)} rad its int64 arithmetic holds at 2^-${ACCUMULATOR_FRACTIONAL_BITS} rad`,
        'check the gains and their units',
        { term, largest_rad: ranges[term] },
      );
    }
  }
  return {
    discretisation: controller.discretisation,
    antiWindup: controller.antiWindup,
    fractionalBits: fractional,
    sampleTime: { value: roundToInteger(T * 2 ** SAMPLE_TIME_FRACTIONAL_BITS), fractionalBits: SAMPLE_TIME_FRACTIONAL_BITS },
    inverseSampleTime: { value: roundToInteger(2 ** inverseBits / T), fractionalBits: inverseBits },
    filterTime: { value: roundToInteger(N * T * 2 ** derivativeTimeBits), fractionalBits: derivativeTimeBits },
    derivativeTimeBits,
    derivativeGainBits,
    integralGainBits,
    trackingBits,
    integratorClamp: roundToInteger(M * 2 ** ACCUMULATOR_FRACTIONAL_BITS),
    commandLimit: roundToInteger(M * 2 ** ACCUMULATOR_FRACTIONAL_BITS),
    ranges,
    largestDerivativeTime: derivativeTime,
    largestTracking: tracking,
  };
}
