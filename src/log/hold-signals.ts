/**
 * Measurements over a step's samples that decide whether it is usable: speed
 * during the hold, where the speed leaves its band, yaw-rate drift before the
 * onset, the largest steer angle. Index ranges on a segment's arrays; SI units.
 */

/** Mean, min, max and spread (max − min) of the speed over samples [from, to), m/s. */
export function speedDuringHold(speed_mps: Float64Array, from: number, to: number): { mean_mps: number; min_mps: number; max_mps: number; spread_mps: number } {
  let sum = 0;
  let min = Infinity;
  let max = -Infinity;
  for (let i = from; i < to; i += 1) {
    sum += speed_mps[i];
    if (speed_mps[i] < min) min = speed_mps[i];
    if (speed_mps[i] > max) max = speed_mps[i];
  }
  return { mean_mps: sum / (to - from), min_mps: min, max_mps: max, spread_mps: max - min };
}

/** |mean of the last third − mean of the first third| of the pre-step samples, rad/s. */
export function preStepDrift(yawRate_radps: Float64Array, preStepSamples: number): number {
  const third = Math.max(1, Math.floor(preStepSamples / 3));
  let first = 0;
  let last = 0;
  for (let i = 0; i < third; i += 1) {
    first += yawRate_radps[i];
    last += yawRate_radps[preStepSamples - 1 - i];
  }
  return Math.abs(last - first) / third;
}

/** Last index in [from, to] before the speed spread (max − min) since `from` exceeds `allowed_mps`. */
export function lastIndexWithinSpeedBand(speed_mps: Float64Array, from: number, to: number, allowed_mps: number): number {
  let min = speed_mps[from];
  let max = speed_mps[from];
  for (let i = from + 1; i <= to; i += 1) {
    min = Math.min(min, speed_mps[i]);
    max = Math.max(max, speed_mps[i]);
    if (max - min > allowed_mps) return i - 1;
  }
  return to;
}

/** Largest |value| over samples [from, to] (0 when the channel is absent). */
export function maxAbs(values: Float64Array | undefined, from: number, to: number): number {
  let largest = 0;
  if (values !== undefined) for (let i = from; i <= to; i += 1) largest = Math.max(largest, Math.abs(values[i]));
  return largest;
}

/** First sample index ≥ `from` whose time is at or after `target_s`. */
export function firstIndexAtOrAfter(time_s: Float64Array, target_s: number, from: number): number {
  let i = from;
  while (time_s[i] < target_s) i += 1;
  return i;
}
