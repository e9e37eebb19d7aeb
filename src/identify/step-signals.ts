import type { StepTest } from '../log/types.js';

/**
 * The signals one step fit works on: an input (steering command, rad) taken relative to
 * its pre-step level, and an output (yaw rate, rad/s, or measured steer angle, rad).
 * Time in s from the window start; the first `preStepSamples` samples are before the onset.
 */
export interface StepSignals {
  readonly time_s: Float64Array;
  /** Input minus its pre-step mean. */
  readonly input: Float64Array;
  readonly output: Float64Array;
  readonly preStepSamples: number;
}

/** Mean of x over [from, to). */
export function meanOf(x: Float64Array, from: number, to: number): number {
  let sum = 0;
  for (let i = from; i < to; i++) sum += x[i];
  return sum / Math.max(1, to - from);
}

/** Sample standard deviation of x over [from, to) (0 for fewer than two samples). */
export function standardDeviationOf(x: Float64Array, from: number, to: number): number {
  const n = to - from;
  if (n < 2) return 0;
  const mean = meanOf(x, from, to);
  let sum = 0;
  for (let i = from; i < to; i++) sum += (x[i] - mean) ** 2;
  return Math.sqrt(sum / (n - 1));
}

/** Input relative to its mean over the pre-step window (the first sample when there is none). */
export function relativeToPreStep(input: Float64Array, preStepSamples: number): Float64Array {
  const base = meanOf(input, 0, Math.max(1, preStepSamples));
  return input.map((v) => v - base);
}

/** Steering command → yaw rate signals of a segmented step. */
export function yawSignals(step: StepTest): StepSignals {
  return {
    time_s: step.time_s,
    input: relativeToPreStep(step.steerCommand_rad, step.preStepSamples),
    output: step.yawRate_radps,
    preStepSamples: step.preStepSamples,
  };
}

/** Steering command → measured steer angle signals (actuator), or null when the angle is not logged. */
export function actuatorSignals(step: StepTest): StepSignals | null {
  if (step.steerAngle_rad === undefined) return null;
  return {
    time_s: step.time_s,
    input: relativeToPreStep(step.steerCommand_rad, step.preStepSamples),
    output: step.steerAngle_rad,
    preStepSamples: step.preStepSamples,
  };
}

/**
 * The step with its window cut to at most `maxHold_s` after the onset (the pre-step samples kept).
 * A hold far longer than the response adds no information on the dynamics, only fitting time
 * (e.g. the last step of a run followed by minutes of straight driving). Arrays are views, not copies.
 */
export function truncateStep(step: StepTest, maxHold_s: number): StepTest {
  const onsetTime_s = step.time_s[Math.min(step.preStepSamples, step.time_s.length - 1)];
  let end = step.time_s.length;
  while (end > step.preStepSamples + 2 && step.time_s[end - 1] - onsetTime_s > maxHold_s) end--;
  if (end === step.time_s.length) return step;
  return {
    ...step,
    time_s: step.time_s.subarray(0, end),
    steerCommand_rad: step.steerCommand_rad.subarray(0, end),
    yawRate_radps: step.yawRate_radps.subarray(0, end),
    ...(step.steerAngle_rad === undefined ? {} : { steerAngle_rad: step.steerAngle_rad.subarray(0, end) }),
    ...(step.lateralAcceleration_mps2 === undefined ? {} : { lateralAcceleration_mps2: step.lateralAcceleration_mps2.subarray(0, end) }),
  };
}
