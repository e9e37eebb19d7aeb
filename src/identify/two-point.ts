import { meanOf, type StepSignals } from './step-signals.js';

/**
 * Graphical two-point FOPDT estimate from a step response (Smith 1972; as taught in
 * Seborg, Edgar & Mellichamp, Process Dynamics and Control, §7.2 — from memory):
 * with t28 and t63 the times at which the response reaches 28.3 % and 63.2 % of its
 * final change, measured from the step,
 *   τ = 1.5·(t63 − t28),  θ = t63 − τ,  K = Δy/Δu.
 * A ramped step is taken as a step at the instant the input crosses half its change
 * (common practice). The final value is the mean of the last 20 % of the window; the
 * response is smoothed by a centred 5-sample moving average before the crossings.
 * Used for initial guesses and as an independent check of the fits.
 */
export interface TwoPointEstimate {
  readonly gain: number;
  readonly timeConstant_s: number;
  readonly deadTime_s: number;
  /** Time of the equivalent step (half the input change), s from the window start. */
  readonly stepTime_s: number;
  /** Output level before the step. */
  readonly baseline: number;
  /** Final output change and input change. */
  readonly outputChange: number;
  readonly inputChange: number;
}

/** First time at or after sample `from` at which x rises through `level`, interpolated linearly between samples; null when it never does. */
function risingCrossingTime(time_s: Float64Array, x: Float64Array, from: number, level: number): number | null {
  for (let i = Math.max(1, from); i < x.length; i++) {
    const a = x[i - 1];
    const b = x[i];
    if (b >= level && a < level) {
      const f = b === a ? 0 : (level - a) / (b - a);
      return time_s[i - 1] + f * (time_s[i] - time_s[i - 1]);
    }
  }
  return null;
}

/** Smith's two-point estimate (formulas in the file comment), or null when the response never reaches 63.2 %. */
export function twoPointEstimate(signals: StepSignals): TwoPointEstimate | null {
  const { time_s, input, output, preStepSamples } = signals;
  const n = time_s.length;
  const pre = Math.max(1, preStepSamples);
  const tail = Math.max(pre + 1, Math.floor(0.8 * n));
  const inputChange = meanOf(input, tail, n) - meanOf(input, 0, pre);
  const baseline = meanOf(output, 0, pre);
  const outputChange = meanOf(output, tail, n) - baseline;
  if (inputChange === 0 || outputChange === 0 || !Number.isFinite(outputChange)) return null;
  const smooth = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const a = Math.max(0, i - 2);
    const b = Math.min(n, i + 3);
    smooth[i] = (meanOf(output, a, b) - baseline) / outputChange;
  }
  const inputBefore = meanOf(input, 0, pre);
  const relativeInput = input.map((v) => (v - inputBefore) / inputChange);
  const stepTime_s = risingCrossingTime(time_s, relativeInput, pre - 1, 0.5);
  if (stepTime_s === null) return null;
  const from = time_s.findIndex((t) => t >= stepTime_s);
  const t28 = risingCrossingTime(time_s, smooth, from, 0.283);
  const t63 = risingCrossingTime(time_s, smooth, from, 0.632);
  if (t28 === null || t63 === null) return null;
  const timeConstant_s = 1.5 * (t63 - t28);
  return {
    gain: outputChange / inputChange,
    timeConstant_s,
    deadTime_s: t63 - stepTime_s - timeConstant_s,
    stepTime_s,
    baseline,
    outputChange,
    inputChange,
  };
}
