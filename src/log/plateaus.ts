/**
 * Held levels of the steering command: the stretches where the command stays
 * within a band around its running mean. A step-steer test is a move from one
 * held level to the next.
 */

export interface Plateau {
  /** First sample of the held stretch. */
  readonly start: number;
  /** Last sample still at the held level (the command starts to move after it). */
  readonly end: number;
  /** Mean command over [start, end], rad. */
  readonly level_rad: number;
}

export interface PlateauOptions {
  /** Half-width of the band a held command stays in, rad. */
  readonly band_rad: number;
  /** A held stretch shorter than this is part of a transition, s. */
  readonly minPlateau_s: number;
  /** Neighbouring held stretches at the same level separated by less than this are one plateau (a spike between them), s. */
  readonly maxRamp_s: number;
  /** Tolerance for "still at the old level" when locating the onset, rad. */
  readonly onsetTolerance_rad: number;
}

/**
 * Robust standard deviation of the sample-to-sample noise of a signal, from the
 * median absolute first difference: σ ≈ median|Δx| / (0.6745·√2) (MAD estimator
 * for Gaussian noise; a piecewise-constant command gives 0).
 */
export function differenceNoise(values: Float64Array): number {
  if (values.length < 2) return 0;
  const differences = new Float64Array(values.length - 1);
  for (let i = 1; i < values.length; i += 1) differences[i - 1] = Math.abs(values[i] - values[i - 1]);
  differences.sort();
  const median = differences[differences.length >> 1];
  return median / (0.6745 * Math.SQRT2);
}

/** Held stretches of `command_rad` (sampled at `time_s`), in time order. */
export function findPlateaus(time_s: Float64Array, command_rad: Float64Array, options: PlateauOptions): Plateau[] {
  const n = command_rad.length;
  const runs: { start: number; end: number; sum: number }[] = [];
  let i = 0;
  while (i < n) {
    const start = i;
    let sum = command_rad[i];
    let count = 1;
    i += 1;
    while (i < n && Math.abs(command_rad[i] - sum / count) <= options.band_rad) {
      sum += command_rad[i];
      count += 1;
      i += 1;
    }
    if (time_s[i - 1] - time_s[start] >= options.minPlateau_s) runs.push({ start, end: i - 1, sum });
  }

  // Merge held stretches at the same level separated by a short excursion (a spike or a dropout in the command).
  const merged: { start: number; end: number; sum: number }[] = [];
  for (const run of runs) {
    const last = merged[merged.length - 1];
    if (
      last !== undefined &&
      time_s[run.start] - time_s[last.end] < options.maxRamp_s &&
      Math.abs(run.sum / (run.end - run.start + 1) - last.sum / (last.end - last.start + 1)) <= options.band_rad
    ) {
      let sum = 0;
      for (let k = last.start; k <= run.end; k += 1) sum += command_rad[k];
      merged[merged.length - 1] = { start: last.start, end: run.end, sum };
    } else {
      merged.push(run);
    }
  }

  return merged.map((run) => {
    const level_rad = run.sum / (run.end - run.start + 1);
    // The band lets the first ramp samples join the plateau; step back to the last sample still at the level.
    let end = run.end;
    while (end > run.start && Math.abs(command_rad[end] - level_rad) > options.onsetTolerance_rad) end -= 1;
    return { start: run.start, end, level_rad };
  });
}
