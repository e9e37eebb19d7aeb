/** Figures of sampled responses (values at the sample instants k·Ts, which is where the loop is exact). */

/** Overshoot of a response to a unit step, %: 100·(max y − 1), 0 when y never exceeds 1. */
export function overshoot_pct(output: Float64Array): number {
  let peak = Number.NEGATIVE_INFINITY;
  for (const y of output) if (y > peak) peak = y;
  return Math.max(0, 100 * (peak - 1));
}

/** A sampled signal and the band it must settle in (settlingTime_s). */
export interface SettlingTimeInput {
  /** The signal at the sample instants k·Ts. */
  readonly signal: Float64Array;
  /** The value it settles to, in the signal's unit. */
  readonly target: number;
  /** Half-width of the band around `target`, in the signal's unit. */
  readonly band: number;
  /** The sample time Ts, s. */
  readonly sampleTime_s: number;
  /** The sample the clock starts at; default 0. */
  readonly start?: number;
}

/**
 * First time (s) from which |signal − target| stays within `band` to the end; null when the last sample
 * is outside (not settled within the simulated time). `start` is the sample the clock starts at.
 */
export function settlingTime_s(input: SettlingTimeInput): number | null {
  const { signal, target, band, sampleTime_s, start = 0 } = input;
  const last = signal.length - 1;
  if (!(Math.abs(signal[last] - target) <= band)) return null;
  let k = last;
  while (k > start && Math.abs(signal[k - 1] - target) <= band) k--;
  return (k - start) * sampleTime_s;
}

/** Largest |x| from sample `start` on (0 for an empty range). */
export function peakMagnitude(signal: Float64Array, start = 0): number {
  let peak = 0;
  for (let k = start; k < signal.length; k++) {
    const size = Math.abs(signal[k]);
    if (size > peak) peak = size;
  }
  return peak;
}
