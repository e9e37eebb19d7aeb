/**
 * Data passed from log reading to segmentation and identification.
 * Plain, readonly, JSON-able apart from the typed arrays of samples.
 * All values SI, ISO 8855 signs (positive steer and yaw rate to the left).
 */

/** One contiguous run of samples (a log split at time gaps gives several). */
export interface LogSegment {
  /** Source file path as given by the user. */
  readonly file: string;
  /** 0-based index of this segment within its file (splits at time gaps). */
  readonly segmentIndex: number;
  /** 1-based file line of the first sample (the header is line 1). */
  readonly firstLine: number;
  readonly time_s: Float64Array;
  readonly speed_mps: Float64Array;
  /** Road-wheel angle command, rad. */
  readonly steerCommand_rad: Float64Array;
  readonly yawRate_radps: Float64Array;
  /** Measured road-wheel angle, rad, when logged. */
  readonly steerAngle_rad?: Float64Array;
  readonly lateralAcceleration_mps2?: Float64Array;
}

export interface LogSplit {
  /** 1-based file line where the new segment starts. */
  readonly line: number;
  readonly gap_s: number;
}

/** A whole log file after reading and validation. */
export interface SteerLog {
  readonly file: string;
  readonly segments: readonly LogSegment[];
  /** Rows read from the file (excluding the header). */
  readonly rowCount: number;
  /** Rows not used, with the count per reason; nothing is dropped silently. */
  readonly droppedRows: Readonly<Record<string, number>>;
  readonly splits: readonly LogSplit[];
  /** Median sample period, s. */
  readonly samplePeriod_s: number;
  readonly warnings: readonly string[];
  /** Delimiter detected from the header. */
  readonly delimiter?: ',' | ';' | '\t';
  /** Header names that map to no channel (read past). */
  readonly ignoredColumns?: readonly string[];
  /** Where each channel came from in the file. */
  readonly channels?: readonly LogChannelSource[];
}

/** One channel of a log and the file column it was read from. */
export interface LogChannelSource {
  /** Channel name, e.g. 'steer_cmd_rad'. */
  readonly channel: string;
  /** Header name in the file. */
  readonly header: string;
  /** 1-based column number in the file. */
  readonly columnNumber: number;
  /** Unit the column was recorded in (converted to SI on reading), e.g. 'km/h'. */
  readonly unit: string;
  /** The factor a recorded value was multiplied by to give SI (1/steering ratio included for steering-wheel units). */
  readonly toSi?: number;
}

/** Transient metrics of one step in the spirit of ISO 7401 (definitions from memory; see src/log/metrics.ts). */
export interface StepMetrics {
  /** Steady-state yaw rate per unit steer command, (rad/s)/rad = 1/s. */
  readonly steadyYawGain_perS: number;
  /** From 50 % of the steer input to 90 % of the steady yaw rate, s. */
  readonly responseTime_s: number | null;
  /** From 50 % of the steer input to the yaw-rate peak, s. */
  readonly peakResponseTime_s: number | null;
  /** (peak − steady)/steady × 100, %; 0 when there is no peak above steady. */
  readonly overshoot_pct: number;
}

/** One step-steer event found in a log, with its window of samples. */
export interface StepTest {
  readonly file: string;
  readonly segmentIndex: number;
  /** 0-based index of the step within its file, in time order. */
  readonly stepIndex: number;
  /** Time at which the command starts to move, s (log time base). */
  readonly onset_s: number;
  /** Signed command change, rad (positive = left). */
  readonly amplitude_rad: number;
  readonly direction: 'left' | 'right';
  /** Mean speed during the hold, m/s, and its spread (max − min). */
  readonly speed_mps: number;
  readonly speedSpread_mps: number;
  /** Samples from the start of the pre-step window to the end of the hold, with time starting at 0 at the window start. */
  readonly time_s: Float64Array;
  readonly steerCommand_rad: Float64Array;
  readonly yawRate_radps: Float64Array;
  readonly steerAngle_rad?: Float64Array;
  /** Lateral acceleration, m/s², when logged. */
  readonly lateralAcceleration_mps2?: Float64Array;
  /** Number of samples at the start of the window before the onset. */
  readonly preStepSamples: number;
  readonly metrics: StepMetrics;
}

/** A candidate step that was not accepted, and why (a sentence a user can act on). */
export interface RejectedStep {
  readonly file: string;
  readonly onset_s: number;
  readonly reasonCode: 'holdTooShort' | 'speedNotConstant' | 'steerNotHeld' | 'actuatorAtLimit' | 'tooSmallAgainstNoise' | 'noPreStepWindow';
  readonly reason: string;
}
