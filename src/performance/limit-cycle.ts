/**
 * A sustained oscillation (limit cycle) in a signal's tail: what a saturating steering loop falls into
 * (Gelb & Vander Velde 1968, Multiple-Input Describing Functions and Nonlinear System Design) and no linear
 * figure shows. The tail (the last `tailFraction` of the run) is centred on its mean; it oscillates when it
 * crosses zero at least `minimumCrossings` times, its half-cycle peaks do not decay (the last few within
 * `sustainedRatio` of their largest: a damped oscillation of damping ratio ζ loses a factor e^(−πζ/√(1−ζ²))
 * each half cycle, so ζ ≳ 0.025 decays past it over three half cycles) and the amplitude is above `floor`.
 * Thresholds are our choice.
 */
export const LIMIT_CYCLE_DETECTOR = {
  tailFraction: 0.4,
  minimumCrossings: 6,
  /** Half-cycle peaks judged: the last this many. */
  judgedHalfCycles: 4,
  sustainedRatio: 0.8,
} as const;

/** A sustained oscillation found in the end of a run: its amplitude and period. */
export interface LimitCycle {
  /** Half the peak-to-peak swing, in the signal's unit (mean of the judged half-cycle peaks). */
  readonly amplitude: number;
  readonly period_s: number;
}

/** The limit cycle in the tail of `signal` sampled every `sampleTime_s`, or null; `floor`: smallest amplitude that counts. */
export function detectLimitCycle(signal: Float64Array, sampleTime_s: number, floor: number): LimitCycle | null {
  const d = LIMIT_CYCLE_DETECTOR;
  const start = Math.floor(signal.length * (1 - d.tailFraction));
  const length = signal.length - start;
  if (length < 8) return null;
  let mean = 0;
  for (let k = start; k < signal.length; k++) mean += signal[k];
  mean /= length;
  const crossings: number[] = [];
  const peaks: number[] = [];
  let sign = 0;
  let peak = 0;
  for (let k = start; k < signal.length; k++) {
    const value = signal[k] - mean;
    const s = Math.sign(value);
    if (s !== 0 && s !== sign) {
      if (sign !== 0) {
        // Linear interpolation of the crossing instant between k − 1 and k.
        const previous = signal[k - 1] - mean;
        crossings.push(k - 1 + previous / (previous - value));
        peaks.push(peak);
      }
      sign = s;
      peak = 0;
    }
    peak = Math.max(peak, Math.abs(value));
  }
  if (crossings.length < d.minimumCrossings) return null;
  // peaks[i] is the half cycle that ended at crossing i; the first one may be cut by the window.
  const judged = peaks.slice(1).slice(-d.judgedHalfCycles);
  const largest = Math.max(...judged);
  const smallest = Math.min(...judged);
  if (!(largest > floor) || smallest < d.sustainedRatio * largest) return null;
  const span = crossings[crossings.length - 1] - crossings[0];
  return { amplitude: judged.reduce((sum, value) => sum + value, 0) / judged.length, period_s: (2 * span * sampleTime_s) / (crossings.length - 1) };
}
