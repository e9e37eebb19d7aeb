/**
 * What `speedband inspect` reports about one log: its extent and sampling, each
 * channel's source column and range, splits and skipped lines, the steps found
 * with their metrics, and the candidates rejected with reasons. Plain JSON-able
 * data (no sample arrays).
 */
import { CHANNEL_DEFINITIONS, isChannelName } from './columns.js';
import { findStepTests, type SegmentOptions } from './segment.js';
import type { LogSplit, RejectedStep, SteerLog, StepMetrics, StepTest } from './types.js';

export const INSPECT_DEFAULTS = {
  /** Steady lateral acceleration above which a step leaves the linear tyre range, m/s² (common practice, docs/domain.md §6). */
  linearRangeLateralAcceleration_mps2: 4,
} as const;

export interface ChannelSummary {
  readonly channel: string;
  readonly describe: string;
  /** Header name and 1-based column number in the file, and the unit it was recorded in. */
  readonly header: string;
  readonly columnNumber: number;
  readonly recordedUnit: string;
  /** SI unit of min/max. */
  readonly unit: string;
  readonly min: number;
  readonly max: number;
}

export interface StepSummary {
  readonly stepIndex: number;
  readonly segmentIndex: number;
  readonly onset_s: number;
  readonly amplitude_rad: number;
  readonly direction: 'left' | 'right';
  readonly speed_mps: number;
  readonly speedSpread_mps: number;
  /** Length of the step's window after the onset, s. */
  readonly hold_s: number;
  readonly metrics: StepMetrics;
}

/** What `inspect` reports of one log: channels, sampling, splits, steps with their metrics, rejected candidates (JSON-able). */
export interface LogInspection {
  readonly file: string;
  /** Last minus first time stamp, s (gaps included). */
  readonly duration_s: number;
  readonly samplePeriod_s: number;
  /** 1 / median sample period, Hz. */
  readonly sampleRate_Hz: number;
  readonly rowCount: number;
  readonly segmentCount: number;
  readonly splits: readonly LogSplit[];
  readonly droppedRows: Readonly<Record<string, number>>;
  readonly channels: readonly ChannelSummary[];
  readonly steps: readonly StepSummary[];
  readonly rejected: readonly RejectedStep[];
  readonly warnings: readonly string[];
}

/** Summarise a log and find its steps (see `findStepTests` for the options). */
export function inspectLog(log: SteerLog, options: SegmentOptions = {}): LogInspection {
  const { steps, rejected } = findStepTests(log, options);
  const first = log.segments[0];
  const last = log.segments[log.segments.length - 1];
  const warnings = [...log.warnings];
  for (const step of steps) {
    // Steady lateral acceleration ≈ vx·r (single-track kinematics at constant speed).
    const lateral_mps2 = Math.abs(step.speed_mps * step.metrics.steadyYawGain_perS * (step.amplitude_rad + levelBefore(step)));
    if (lateral_mps2 > INSPECT_DEFAULTS.linearRangeLateralAcceleration_mps2) {
      warnings.push(
        `step ${step.stepIndex} at ${step.onset_s.toFixed(2)} s: steady lateral acceleration ≈ ${lateral_mps2.toFixed(1)} m/s² (vx·r), beyond the linear tyre range (~${INSPECT_DEFAULTS.linearRangeLateralAcceleration_mps2} m/s², common practice) — its gain may be low; repeat with a smaller amplitude`,
      );
    }
  }
  if (steps.length === 0) {
    warnings.push(
      rejected.length === 0
        ? 'no step-steer event found: the steering command never moved from one held level to another — check the steer command column'
        : 'no usable step: every candidate was rejected (see the reasons)',
    );
  }
  return {
    file: log.file,
    duration_s: last.time_s[last.time_s.length - 1] - first.time_s[0],
    samplePeriod_s: log.samplePeriod_s,
    sampleRate_Hz: 1 / log.samplePeriod_s,
    rowCount: log.rowCount,
    segmentCount: log.segments.length,
    splits: log.splits,
    droppedRows: log.droppedRows,
    channels: channelSummaries(log),
    steps: steps.map(stepSummary),
    rejected,
    warnings,
  };
}

/** Command level before the step (mean over the pre-step samples), rad. */
function levelBefore(step: StepTest): number {
  let sum = 0;
  for (let i = 0; i < step.preStepSamples; i += 1) sum += step.steerCommand_rad[i];
  return sum / step.preStepSamples;
}

function stepSummary(step: StepTest): StepSummary {
  return {
    stepIndex: step.stepIndex,
    segmentIndex: step.segmentIndex,
    onset_s: step.onset_s,
    amplitude_rad: step.amplitude_rad,
    direction: step.direction,
    speed_mps: step.speed_mps,
    speedSpread_mps: step.speedSpread_mps,
    hold_s: step.time_s[step.time_s.length - 1] - step.time_s[step.preStepSamples - 1],
    metrics: step.metrics,
  };
}

const SEGMENT_FIELD = {
  time_s: 'time_s',
  speed_mps: 'speed_mps',
  steer_cmd_rad: 'steerCommand_rad',
  yaw_rate_radps: 'yawRate_radps',
  steer_angle_rad: 'steerAngle_rad',
  lat_accel_mps2: 'lateralAcceleration_mps2',
} as const;

function channelSummaries(log: SteerLog): ChannelSummary[] {
  const sources = log.channels ?? [];
  return sources.flatMap((source) => {
    if (!isChannelName(source.channel)) return [];
    const definition = CHANNEL_DEFINITIONS[source.channel];
    let min = Infinity;
    let max = -Infinity;
    for (const segment of log.segments) {
      const values = segment[SEGMENT_FIELD[source.channel]];
      if (values === undefined) continue;
      for (let i = 0; i < values.length; i += 1) {
        if (values[i] < min) min = values[i];
        if (values[i] > max) max = values[i];
      }
    }
    return [
      {
        channel: source.channel,
        describe: definition.describe,
        header: source.header,
        columnNumber: source.columnNumber,
        recordedUnit: source.unit,
        unit: definition.siUnit,
        min,
        max,
      },
    ];
  });
}
