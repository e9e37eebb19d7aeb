/**
 * Transient metrics of one step-steer response, in the spirit of ISO 7401
 * (definitions from memory, not checked against the standard's text):
 * - steady yaw gain: steady yaw-rate change / steady command change;
 * - response time: from 50 % of the steering input to 90 % of the steady
 *   yaw-rate change;
 * - peak response time: from 50 % of the steering input to the yaw-rate peak;
 * - overshoot: (peak − steady)/steady × 100 %, with peak and steady measured
 *   as changes from the pre-step level (so a step back to zero is measured too).
 * Crossing times are interpolated linearly between samples, on the yaw rate
 * smoothed by a centred moving average of `smoothingSamples` samples (no phase
 * lag; it keeps sensor noise from triggering the 90 % crossing or the peak early).
 */
import type { StepMetrics } from './types.js';

export const METRICS_DEFAULTS = {
  /** The steady level is the mean over this last fraction of the samples after the onset. */
  steadyFraction: 0.25,
  /** A peak counts only when it exceeds the steady level by more than this many σ of the smoothed yaw-rate noise. */
  peakNoiseMultiple: 3,
  /** Width of the centred moving average applied to the yaw rate before crossings and the peak are found, samples (odd). */
  smoothingSamples: 5,
} as const;

/** The samples of one step: a pre-step part (command at its old level) followed by the ramp and hold. */
export interface StepWindow {
  /** Time, s (any origin). */
  readonly time_s: Float64Array;
  readonly steerCommand_rad: Float64Array;
  readonly yawRate_radps: Float64Array;
  /** Samples [0, preStepSamples) are before the command starts to move. */
  readonly preStepSamples: number;
}

/** Levels before and after a step, as means over the pre-step samples and the steady part of the hold. */
export interface StepLevels {
  readonly commandBefore_rad: number;
  readonly commandSteady_rad: number;
  readonly yawRateBefore_radps: number;
  readonly yawRateSteady_radps: number;
  /** Yaw-rate noise σ, rad/s: the smaller of the standard deviations over the pre-step and steady parts. */
  readonly yawRateNoise_radps: number;
  /** First sample of the steady part. */
  readonly steadyStart: number;
}

/** Means before the step and over the last `steadyFraction` of the hold (SI units, ISO 8855 signs). */
export function stepLevels(window: StepWindow, steadyFraction: number = METRICS_DEFAULTS.steadyFraction): StepLevels {
  const n = window.time_s.length;
  const pre = window.preStepSamples;
  const steadyStart = Math.min(n - 1, n - Math.max(1, Math.round((n - pre) * steadyFraction)));
  const yawBefore = meanAndDeviation(window.yawRate_radps, 0, pre);
  const yawSteady = meanAndDeviation(window.yawRate_radps, steadyStart, n);
  return {
    commandBefore_rad: meanAndDeviation(window.steerCommand_rad, 0, pre).mean,
    commandSteady_rad: meanAndDeviation(window.steerCommand_rad, steadyStart, n).mean,
    yawRateBefore_radps: yawBefore.mean,
    yawRateSteady_radps: yawSteady.mean,
    yawRateNoise_radps: Math.min(yawBefore.deviation, yawSteady.deviation),
    steadyStart,
  };
}

/**
 * Transient metrics of a step window (see the file comment for definitions).
 * Units: gain (rad/s)/rad = 1/s, times s, overshoot %. Times are null when the
 * crossing does not happen within the window; overshoot is 0 and the peak time
 * null when the yaw rate never rises above its steady level by more than
 * `peakNoiseMultiple` σ of the smoothed noise before the steady part.
 */
export function stepMetrics(window: StepWindow, options: { steadyFraction?: number; peakNoiseMultiple?: number; smoothingSamples?: number } = {}): StepMetrics {
  const levels = stepLevels(window, options.steadyFraction ?? METRICS_DEFAULTS.steadyFraction);
  const peakNoiseMultiple = options.peakNoiseMultiple ?? METRICS_DEFAULTS.peakNoiseMultiple;
  const { time_s, steerCommand_rad, preStepSamples } = window;
  const smoothingSamples = options.smoothingSamples ?? METRICS_DEFAULTS.smoothingSamples;
  const yawRate_radps = centredMovingAverage(window.yawRate_radps, smoothingSamples);
  // White noise σ shrinks by √width under the moving average.
  const smoothedNoise_radps = levels.yawRateNoise_radps / Math.sqrt(Math.max(1, smoothingSamples));
  const commandChange = levels.commandSteady_rad - levels.commandBefore_rad;
  const yawChange = levels.yawRateSteady_radps - levels.yawRateBefore_radps;
  const start = Math.max(1, preStepSamples);

  const halfInput_s = firstCrossing({
    time_s,
    values: steerCommand_rad,
    target: levels.commandBefore_rad + 0.5 * commandChange,
    direction: Math.sign(commandChange),
    from: start,
  });
  const yaw90_s = firstCrossing({
    time_s,
    values: yawRate_radps,
    target: levels.yawRateBefore_radps + 0.9 * yawChange,
    direction: Math.sign(yawChange),
    from: start,
  });

  const direction = Math.sign(yawChange);
  let peakIndex = -1;
  let peakValue = -Infinity;
  for (let i = start; i < time_s.length; i += 1) {
    const value = direction * (yawRate_radps[i] - levels.yawRateBefore_radps);
    if (value > peakValue) {
      peakValue = value;
      peakIndex = i;
    }
  }
  const excess = peakValue - Math.abs(yawChange);
  const hasPeak = direction !== 0 && peakIndex >= 0 && peakIndex < levels.steadyStart && excess > peakNoiseMultiple * smoothedNoise_radps && excess > 0;
  const peak_s = hasPeak ? refinedPeakTime(time_s, yawRate_radps, peakIndex, direction) : null;

  return {
    steadyYawGain_perS: yawChange / commandChange,
    responseTime_s: halfInput_s === null || yaw90_s === null ? null : yaw90_s - halfInput_s,
    peakResponseTime_s: halfInput_s === null || peak_s === null ? null : peak_s - halfInput_s,
    overshoot_pct: hasPeak ? (100 * excess) / Math.abs(yawChange) : 0,
  };
}

/** Centred moving average over `width` samples (odd; the window shrinks symmetrically at the ends). */
export function centredMovingAverage(values: Float64Array, width: number): Float64Array {
  const half = Math.max(0, Math.floor(width / 2));
  if (half === 0) return values;
  const n = values.length;
  const smoothed = new Float64Array(n);
  for (let i = 0; i < n; i += 1) {
    const reach = Math.min(half, i, n - 1 - i);
    let sum = 0;
    for (let k = i - reach; k <= i + reach; k += 1) sum += values[k];
    smoothed[i] = sum / (2 * reach + 1);
  }
  return smoothed;
}

function meanAndDeviation(values: Float64Array, from: number, to: number): { mean: number; deviation: number } {
  const count = to - from;
  if (count <= 0) return { mean: NaN, deviation: NaN };
  let sum = 0;
  for (let i = from; i < to; i += 1) sum += values[i];
  const mean = sum / count;
  let squares = 0;
  for (let i = from; i < to; i += 1) squares += (values[i] - mean) ** 2;
  return { mean, deviation: count > 1 ? Math.sqrt(squares / (count - 1)) : 0 };
}

/** A sampled signal and the level it should cross (firstCrossing). */
export interface CrossingSearch {
  /** Sample times, s. */
  readonly time_s: Float64Array;
  /** The signal at those times. */
  readonly values: Float64Array;
  /** The level to reach, in the signal's unit. */
  readonly target: number;
  /** +1: reached moving up, −1: moving down, 0: never (null). */
  readonly direction: number;
  /** The sample the search starts at. */
  readonly from: number;
}

/**
 * Time at which `values` first reaches `target` moving in `direction` (+1 up, −1 down),
 * searching from sample `from`; linear interpolation between the two samples around
 * the crossing. Null when it never does (or direction is 0).
 */
export function firstCrossing(search: CrossingSearch): number | null {
  const { time_s, values, target, direction, from } = search;
  if (direction === 0) return null;
  for (let i = Math.max(1, from); i < values.length; i += 1) {
    if (direction * (values[i] - target) >= 0) {
      const before = values[i - 1];
      if (direction * (before - target) >= 0) return time_s[i - 1];
      const fraction = (target - before) / (values[i] - before);
      return time_s[i - 1] + fraction * (time_s[i] - time_s[i - 1]);
    }
  }
  return null;
}

/** Peak time refined by the vertex of the parabola through the peak sample and its neighbours (uniform sampling). */
function refinedPeakTime(time_s: Float64Array, values: Float64Array, index: number, direction: number): number {
  if (index <= 0 || index >= values.length - 1) return time_s[index];
  const left = direction * values[index - 1];
  const middle = direction * values[index];
  const right = direction * values[index + 1];
  const curvature = left - 2 * middle + right;
  if (curvature >= 0) return time_s[index];
  const offset = (0.5 * (left - right)) / curvature;
  const step = offset < 0 ? time_s[index] - time_s[index - 1] : time_s[index + 1] - time_s[index];
  return time_s[index] + offset * step;
}
