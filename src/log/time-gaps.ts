/**
 * Time structure of a log: the median sample period, missed samples, and the
 * split into segments at time gaps.
 */
import type { ChannelName } from './columns.js';
import type { LogSegment, LogSplit } from './types.js';

/** Median of the time steps of the first `rows` samples, s. */
export function medianStep(time_s: Float64Array, rows: number): number {
  const steps = new Float64Array(rows - 1);
  for (let i = 1; i < rows; i += 1) steps[i - 1] = time_s[i] - time_s[i - 1];
  steps.sort();
  const middle = steps.length >> 1;
  return steps.length % 2 === 1 ? steps[middle] : 0.5 * (steps[middle - 1] + steps[middle]);
}

/** Time steps between 1.5 and `gapFactor` median periods (missed samples that do not split the log). */
export function countIrregularSteps(time_s: Float64Array, rows: number, samplePeriod_s: number, gapFactor: number): number {
  let count = 0;
  for (let i = 1; i < rows; i += 1) {
    const step_s = time_s[i] - time_s[i - 1];
    if (step_s > 1.5 * samplePeriod_s && step_s <= gapFactor * samplePeriod_s) count += 1;
  }
  return count;
}

/** The rows read from a log, to be cut at gaps (splitAtGaps). */
export interface GapSplitInput {
  /** The log file, as the user named it. */
  readonly file: string;
  /** How many rows were read (the columns may be longer). */
  readonly rows: number;
  /** The 1-based file line of each row. */
  readonly lineOfRow: Int32Array;
  /** A time step longer than this starts a new segment, s. */
  readonly maxStep_s: number;
  /** The full column of a channel (undefined when the log has none). */
  readonly channel: (name: ChannelName) => Float64Array | undefined;
}

/**
 * Cut the first `rows` samples into segments wherever a time step exceeds
 * `maxStep_s`; each split is reported with the 1-based file line where the new
 * segment starts and the gap, s. `channel` gives the full column of a channel.
 */
export function splitAtGaps(input: GapSplitInput): { segments: LogSegment[]; splits: LogSplit[] } {
  const { file, rows, lineOfRow, maxStep_s, channel } = input;
  const time_s = channel('time_s') as Float64Array;
  const starts = [0];
  const splits: LogSplit[] = [];
  for (let i = 1; i < rows; i += 1) {
    const gap_s = time_s[i] - time_s[i - 1];
    if (gap_s > maxStep_s) {
      starts.push(i);
      splits.push({ line: lineOfRow[i], gap_s });
    }
  }
  const segments: LogSegment[] = starts.map((start, segmentIndex) => {
    const end = segmentIndex + 1 < starts.length ? starts[segmentIndex + 1] : rows;
    const cut = (name: ChannelName): Float64Array | undefined => channel(name)?.slice(start, end);
    const steerAngle_rad = cut('steer_angle_rad');
    const lateralAcceleration_mps2 = cut('lat_accel_mps2');
    return {
      file,
      segmentIndex,
      firstLine: lineOfRow[start],
      time_s: cut('time_s') as Float64Array,
      speed_mps: cut('speed_mps') as Float64Array,
      steerCommand_rad: cut('steer_cmd_rad') as Float64Array,
      yawRate_radps: cut('yaw_rate_radps') as Float64Array,
      ...(steerAngle_rad === undefined ? {} : { steerAngle_rad }),
      ...(lateralAcceleration_mps2 === undefined ? {} : { lateralAcceleration_mps2 }),
    };
  });
  return { segments, splits };
}
