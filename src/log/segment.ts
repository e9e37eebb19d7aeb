/**
 * Step segmentation: find the step-steer events in a log. A step is the
 * command moving from one held level to another within a short ramp and being
 * held there; returns to zero are steps too. Every candidate is accepted (a
 * `StepTest` with its window of samples and metrics) or rejected with a reason
 * the user can act on.
 */
import { SpeedbandError } from '../core/errors.js';
import { degreesToRadians, radiansToDegrees } from '../core/units.js';
import { stepLevels, stepMetrics, METRICS_DEFAULTS } from './metrics.js';
import { firstIndexAtOrAfter, lastIndexWithinSpeedBand, maxAbs, preStepDrift, speedDuringHold } from './hold-signals.js';
import { differenceNoise, findPlateaus, type Plateau } from './plateaus.js';
import { edgeStretches } from './edge-stretches.js';
import type { LogSegment, LogSplit, RejectedStep, SteerLog, StepTest } from './types.js';

/** Defaults of finding steps in a log (hold, ramp, pre-step window, speed tolerance, noise thresholds), each with its reason in the comments beside it. */
export const SEGMENT_DEFAULTS = {
  /** Smallest half-width of the band a held command stays in, rad (0.1°). */
  heldBand_rad: degreesToRadians(0.1),
  /** The band is also at least this many command-noise σ wide. */
  commandNoiseMultiple: 5,
  /** A held stretch shorter than this is part of a transition, s. */
  minPlateau_s: 0.3,
  /** The command must reach its new level within this time after it starts to move, s (step ramps are ~0.1–0.2 s). */
  maxRamp_s: 0.6,
  /** The new level must be held at least this long after the onset, s. */
  minHold_s: 1.5,
  /** At least this much held command before the onset (for bias estimation), s. */
  minPreStep_s: 0.5,
  /** At most this much of the previous hold goes into a step's window, s. */
  preStepWindow_s: 1,
  /** The yaw rate may drift by at most this fraction of the step's yaw-rate change across the pre-step window (previous response settled). */
  maxPreStepDriftFraction: 0.05,
  /** Allowed speed spread (max − min) during the hold: the larger of this, m/s ... */
  speedToleranceAbsolute_mps: 0.3,
  /** ... and this fraction of the mean speed. */
  speedToleranceFraction: 0.05,
  /** A command or measured steer angle above this fraction of the vehicle's maxSteerAngle_rad is at the actuator limit. */
  actuatorLimitFraction: 0.98,
  /** The steady yaw-rate change must be at least this many yaw-rate noise σ. */
  minSignalToNoise: 5,
} as const;

/** Options of findStepTests: any SEGMENT_DEFAULTS value, and the steer-angle limit for the actuator-limit check. */
export type SegmentOptions = Partial<{ -readonly [K in keyof typeof SEGMENT_DEFAULTS]: number }> & {
  /** The vehicle's road-wheel angle limit, rad; enables the actuator-limit check. */
  readonly maxSteerAngle_rad?: number;
};

/** The steps found in a log and the candidates rejected, each with its reason. */
export interface StepSearch {
  /** Accepted steps, in time order, `stepIndex` counting from 0 within the file. */
  readonly steps: readonly StepTest[];
  readonly rejected: readonly RejectedStep[];
}

/**
 * Find and judge every step-steer candidate in a log (all segments). SI units, positive amplitude = left.
 * A command move next to a segment edge (start or end of the file, a time gap) whose level there is held
 * shorter than `minPlateau_s` is a candidate too, so it is rejected with a reason (`noPreStepWindow`,
 * `holdTooShort`) rather than lost.
 * Throws `log.badOption` when an option is not a positive finite number (fractions at most 1).
 */
export function findStepTests(log: SteerLog, options: SegmentOptions = {}): StepSearch {
  const settings: Settings = { ...SEGMENT_DEFAULTS, ...options };
  checkSettings(settings);
  const steps: StepTest[] = [];
  const rejected: RejectedStep[] = [];
  for (const segment of log.segments) {
    const edges = describeEdges(log.segments.length, log.splits, segment.segmentIndex);
    for (const candidate of segmentCandidates(segment, settings)) {
      const outcome = judgeCandidate(segment, candidate, settings, steps.length, edges);
      if ('reasonCode' in outcome) rejected.push(outcome);
      else steps.push(outcome);
    }
  }
  return { steps, rejected };
}

type Settings = { readonly [K in keyof typeof SEGMENT_DEFAULTS]: number } & { readonly maxSteerAngle_rad?: number };

interface Candidate {
  readonly before: Plateau;
  readonly after: Plateau;
  /** Set when `before` starts at the segment's first sample or `after` ends at its last one and that stretch is not a full plateau. */
  readonly edge?: 'start' | 'end';
}

/** What cuts a segment at each end, in words: 'the log starts' / 'a 2.02 s time gap at line 1001 ...'. */
interface EdgeWords {
  readonly start: string;
  readonly end: string;
}

function describeEdges(segmentCount: number, splits: readonly LogSplit[], segmentIndex: number): EdgeWords {
  const gapWords = (split: LogSplit | undefined): string =>
    split === undefined ? 'a time gap' : `a ${split.gap_s.toFixed(2)} s time gap (line ${split.line})`;
  return {
    start: segmentIndex === 0 ? 'the log starts' : `the log resumes after ${gapWords(splits[segmentIndex - 1])}`,
    end: segmentIndex === segmentCount - 1 ? 'the log ends' : `${gapWords(splits[segmentIndex])} cuts the log`,
  };
}

function checkSettings(settings: Settings): void {
  for (const [name, value] of Object.entries(settings)) {
    if (value === undefined) continue;
    const fraction = name.endsWith('Fraction');
    if (typeof value !== 'number' || !Number.isFinite(value) || value < 0 || (value === 0 && !name.startsWith('speedTolerance')) || (fraction && value > 1)) {
      throw new SpeedbandError(
        'log.badOption',
        `segmentation option ${name} is ${String(value)} — it must be a ${fraction ? 'fraction in (0, 1]' : 'positive number'} (default ${
          (SEGMENT_DEFAULTS as Record<string, number>)[name] ?? 'none'
        })`,
        { details: { option: name, value } },
      );
    }
  }
}

function segmentCandidates(segment: LogSegment, settings: Settings): Candidate[] {
  const noise = differenceNoise(segment.steerCommand_rad);
  const band_rad = Math.max(settings.heldBand_rad, settings.commandNoiseMultiple * noise);
  const plateaus = findPlateaus(segment.time_s, segment.steerCommand_rad, {
    band_rad,
    minPlateau_s: settings.minPlateau_s,
    maxRamp_s: settings.maxRamp_s,
    onsetTolerance_rad: Math.max(3 * noise, 0.1 * band_rad),
  });
  const { leading, trailing } = edgeStretches(segment.steerCommand_rad, plateaus, {
    band_rad,
    minPlateau_s: settings.minPlateau_s,
    maxRamp_s: settings.maxRamp_s,
    onsetTolerance_rad: Math.max(3 * noise, 0.1 * band_rad),
  });
  const levels = [...(leading === null ? [] : [leading]), ...plateaus, ...(trailing === null ? [] : [trailing])];
  const candidates: Candidate[] = [];
  for (let k = 1; k < levels.length; k += 1) {
    const edge = k === 1 && leading !== null ? 'start' : k === levels.length - 1 && trailing !== null ? 'end' : undefined;
    candidates.push({ before: levels[k - 1], after: levels[k], ...(edge === undefined ? {} : { edge }) });
  }
  return candidates;
}

function judgeCandidate(
  segment: LogSegment,
  { before, after, edge }: Candidate,
  settings: Settings,
  stepIndex: number,
  edges: EdgeWords,
): StepTest | RejectedStep {
  const t = segment.time_s;
  const onset = before.end;
  const onset_s = t[onset];
  const amplitude_rad = after.level_rad - before.level_rad;
  const reject = (reasonCode: RejectedStep['reasonCode'], reason: string): RejectedStep => ({ file: segment.file, onset_s, reasonCode, reason });
  const stepText = `step ${formatDegrees(before.level_rad)} → ${formatDegrees(after.level_rad)}`;

  const ramp_s = t[after.start] - t[onset];
  if (ramp_s > settings.maxRamp_s) {
    return reject(
      'steerNotHeld',
      `${stepText}: the command took ${ramp_s.toFixed(2)} s to settle at its new level (a step ramp takes at most ${settings.maxRamp_s} s) — apply the step as a fast ramp and hold the steering still`,
    );
  }
  const preStep_s = t[onset] - t[before.start];
  if (preStep_s < settings.minPreStep_s && edge === 'start') {
    return reject(
      'noPreStepWindow',
      `${stepText}: ${edges.start} only ${preStep_s.toFixed(2)} s before the step (need ≥ ${settings.minPreStep_s} s of held command to measure the yaw-rate bias) — start logging earlier or keep the logger running through the step`,
    );
  }
  if (preStep_s < settings.minPreStep_s) {
    return reject(
      'noPreStepWindow',
      `${stepText}: the command was held only ${preStep_s.toFixed(2)} s before the step (need ≥ ${settings.minPreStep_s} s to measure the yaw-rate bias) — hold the steering still longer before each step`,
    );
  }
  const hold_s = t[after.end] - t[onset];
  if (hold_s < settings.minHold_s && edge === 'end') {
    return reject(
      'holdTooShort',
      `${stepText}: ${edges.end} ${hold_s.toFixed(2)} s after the step (need ≥ ${settings.minHold_s} s of hold for the yaw rate to settle) — keep logging until the yaw rate settles after the last step`,
    );
  }
  if (hold_s < settings.minHold_s) {
    return reject(
      'holdTooShort',
      `${stepText}: held ${hold_s.toFixed(2)} s (need ≥ ${settings.minHold_s} s for the yaw rate to settle) — hold each step longer`,
    );
  }
  const limit = settings.maxSteerAngle_rad;
  if (limit !== undefined) {
    const reached = Math.max(Math.abs(after.level_rad), maxAbs(segment.steerAngle_rad, after.start, after.end));
    if (reached >= settings.actuatorLimitFraction * limit) {
      return reject(
        'actuatorAtLimit',
        `${stepText}: the steer angle reaches ${formatDegrees(reached)}, at the actuator limit ${formatDegrees(limit)} (vehicle file) so the response is clipped — repeat with a smaller amplitude`,
      );
    }
  }

  const windowStart = firstIndexAtOrAfter(t, onset_s - settings.preStepWindow_s, before.start);
  // The hold ends where the command moves again or where the speed leaves its band, whichever comes first
  // (a driver may change speed while holding the steering at zero after a step).
  const allowedSpread_mps = Math.max(settings.speedToleranceAbsolute_mps, settings.speedToleranceFraction * segment.speed_mps[onset]);
  const holdEnd = lastIndexWithinSpeedBand(segment.speed_mps, onset, after.end, allowedSpread_mps);
  if (t[holdEnd] - t[onset] < settings.minHold_s) {
    const needed = firstIndexAtOrAfter(t, onset_s + settings.minHold_s, onset);
    const speed = speedDuringHold(segment.speed_mps, onset, Math.min(needed, after.end) + 1);
    return reject(
      'speedNotConstant',
      `${stepText}: speed varied by ${speed.spread_mps.toFixed(2)} m/s (${speed.min_mps.toFixed(2)}–${speed.max_mps.toFixed(2)}) within ${settings.minHold_s} s of the step, more than the ${allowedSpread_mps.toFixed(2)} m/s allowed — hold the speed constant during each step`,
    );
  }
  const windowEnd = holdEnd + 1;
  const speed = speedDuringHold(segment.speed_mps, onset, windowEnd);

  const origin = t[windowStart];
  const time_s = new Float64Array(windowEnd - windowStart);
  for (let i = 0; i < time_s.length; i += 1) time_s[i] = t[windowStart + i] - origin;
  const window = {
    time_s,
    steerCommand_rad: segment.steerCommand_rad.slice(windowStart, windowEnd),
    yawRate_radps: segment.yawRate_radps.slice(windowStart, windowEnd),
    preStepSamples: onset - windowStart + 1,
  };
  const levels = stepLevels(window, METRICS_DEFAULTS.steadyFraction);
  const yawChange = Math.abs(levels.yawRateSteady_radps - levels.yawRateBefore_radps);
  if (yawChange < settings.minSignalToNoise * levels.yawRateNoise_radps) {
    const needed_rad = (Math.abs(amplitude_rad) * settings.minSignalToNoise * levels.yawRateNoise_radps) / Math.max(yawChange, 1e-12);
    return reject(
      'tooSmallAgainstNoise',
      `${stepText}: amplitude ${formatDegrees(Math.abs(amplitude_rad))} changed the yaw rate by ${formatDegrees(yawChange)}/s against yaw-rate noise ${formatDegrees(levels.yawRateNoise_radps)}/s (1σ; need ≥ ${settings.minSignalToNoise}×) — repeat with ≥ ${formatDegrees(roundUpNicely(needed_rad))}`,
    );
  }

  const drift_radps = preStepDrift(window.yawRate_radps, window.preStepSamples);
  const third = Math.max(1, Math.floor(window.preStepSamples / 3));
  const driftNoise_radps = 4 * levels.yawRateNoise_radps * Math.sqrt(2 / third);
  if (drift_radps > Math.max(settings.maxPreStepDriftFraction * yawChange, driftNoise_radps)) {
    return reject(
      'noPreStepWindow',
      `${stepText}: the yaw rate was still changing before the step (by ${formatDegrees(drift_radps)}/s over the last ${(t[onset] - t[windowStart]).toFixed(2)} s, ${((100 * drift_radps) / yawChange).toFixed(0)} % of the step's response) so its starting level is unknown — hold the previous level until the yaw rate settles`,
    );
  }

  const steerAngle_rad = segment.steerAngle_rad?.slice(windowStart, windowEnd);
  const lateralAcceleration_mps2 = segment.lateralAcceleration_mps2?.slice(windowStart, windowEnd);
  // The plateau means include a ramp sample or two inside the band; the step levels do not.
  const measuredAmplitude_rad = levels.commandSteady_rad - levels.commandBefore_rad;
  return {
    file: segment.file,
    segmentIndex: segment.segmentIndex,
    stepIndex,
    onset_s,
    amplitude_rad: measuredAmplitude_rad,
    direction: measuredAmplitude_rad > 0 ? 'left' : 'right',
    speed_mps: speed.mean_mps,
    speedSpread_mps: speed.spread_mps,
    ...window,
    ...(steerAngle_rad === undefined ? {} : { steerAngle_rad }),
    ...(lateralAcceleration_mps2 === undefined ? {} : { lateralAcceleration_mps2 }),
    metrics: stepMetrics(window),
  };
}

function formatDegrees(angle_rad: number): string {
  const degrees = radiansToDegrees(angle_rad);
  // A level of −0.001° is zero in words ("−0.00°" reads as a sign error).
  return `${(Math.abs(degrees) < 0.005 ? 0 : degrees).toFixed(2)}°`;
}

/** Round an angle up to 1, 2 or 5 × 10^k degrees, for advice. */
function roundUpNicely(angle_rad: number): number {
  const degrees = radiansToDegrees(angle_rad);
  const decade = Math.pow(10, Math.floor(Math.log10(degrees)));
  const nice = [1, 2, 5, 10].map((m) => m * decade).find((value) => value >= degrees) ?? 10 * decade;
  return (nice * Math.PI) / 180;
}
