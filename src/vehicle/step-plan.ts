/**
 * The steering command of an open-loop step-steer test at one constant speed
 * (docs/domain.md §6): a held zero, then left and right steps at a large and a small
 * amplitude, each a fast ramp to the amplitude, a hold, a ramp back to zero and a
 * hold at zero. Amplitudes are chosen per speed to stay in the linear tyre range.
 */
import { SpeedbandError } from '../core/errors.js';
import { degreesToRadians, radiansToDegrees } from '../core/units.js';
import { steadyStateYawGain_perS } from './single-track.js';
import type { SingleTrackParameters } from './types.js';

export const STEP_PLAN_DEFAULTS = {
  /** Held zero before the first step, s. */
  preHold_s: 2,
  /** Shortest command ramp from one level to the next, s (a fast ramp, docs/domain.md §6). */
  ramp_s: 0.15,
  /** Longest command ramp, s; kept under what step detection accepts as a step. */
  maxRamp_s: 0.4,
  /** The command ramps at most at this fraction of the actuator's rate limit (so the limit never binds). */
  rateLimitFraction: 0.8,
  /** Hold at each amplitude, s. */
  hold_s: 4.5,
  /** Hold at zero after each return, s. */
  returnHold_s: 3,
  /** Steady lateral acceleration aimed at by the large amplitude, m/s² (well under ~4 m/s², common practice). */
  targetLateralAcceleration_mps2: 1.5,
  /** Small amplitude as a fraction of the large one. */
  smallAmplitudeFraction: 0.5,
  /** The large amplitude stays below this fraction of the actuator's angle limit. */
  angleLimitFraction: 0.5,
  /** Amplitudes are rounded down to a multiple of this, degrees (readable logs). */
  amplitudeResolution_deg: 0.05,
} as const;

export type StepPlanSettings = { readonly [K in keyof typeof STEP_PLAN_DEFAULTS]: number };

/** One commanded step (a change of held level), including the returns to zero. */
export interface PlannedStep {
  /** Time the command starts to move, s from the start of the log. */
  readonly onset_s: number;
  readonly from_rad: number;
  readonly to_rad: number;
  readonly ramp_s: number;
  /** Time the new level is held after the ramp, s. */
  readonly hold_s: number;
}

export interface StepAmplitudes {
  readonly large_rad: number;
  readonly small_rad: number;
  /** Which bound chose the large amplitude. */
  readonly limitedBy: 'lateralAcceleration' | 'angleLimit' | 'rateLimit' | 'given';
  /** Steady lateral acceleration the large amplitude gives on the nominal model, vx·(r/δ)·δ, m/s². */
  readonly steadyLateralAcceleration_mps2: number;
}

/** What chose the large amplitude, in words for tables. */
export const LIMITED_BY_WORDS: Readonly<Record<StepAmplitudes['limitedBy'], string>> = {
  lateralAcceleration: 'lateral acceleration target',
  angleLimit: 'half the steer-angle limit',
  rateLimit: 'steer rate limit',
  given: 'given amplitudes',
};

/** Actuator limits the plan must respect, rad and rad/s. */
export interface ActuatorLimits {
  readonly maxSteerAngle_rad: number;
  readonly maxSteerRate_radps: number;
}

/**
 * Road-wheel angle amplitudes (rad, positive magnitudes) for a step test at `speed_mps`.
 * Rule: large = the smallest of
 *   (a) target ay / (vx · r/δ), with r/δ = vx/(L + K vx²) (steady-state yaw gain, Gillespie 1992 §6)
 *       — so the steady lateral acceleration is the target (1.5 m/s² by default), smaller at high speed;
 *   (b) angleLimitFraction · maxSteerAngle_rad;
 *   (c) rateLimitFraction · maxSteerRate_radps · maxRamp_s — the ramp never meets the rate limit;
 * rounded down to amplitudeResolution_deg; small = smallAmplitudeFraction · large, rounded likewise.
 * Throws `testLogs.unstableSpeed` above an oversteering vehicle's critical speed (no steady state).
 */
export function stepAmplitudes(
  params: SingleTrackParameters,
  limits: ActuatorLimits,
  speed_mps: number,
  settings: StepPlanSettings = STEP_PLAN_DEFAULTS,
): StepAmplitudes {
  const yawGain_perS = steadyStateYawGain_perS(params, speed_mps);
  if (!(yawGain_perS > 0 && Number.isFinite(yawGain_perS))) {
    throw new SpeedbandError(
      'testLogs.unstableSpeed',
      `at ${speed_mps} m/s the vehicle is at or above its critical speed (oversteer): the open-loop yaw response has no steady state, so no step test can be run — choose speeds below the critical speed`,
      { details: { speed_mps } },
    );
  }
  const candidates: { value: number; limitedBy: StepAmplitudes['limitedBy'] }[] = [
    { value: settings.targetLateralAcceleration_mps2 / (speed_mps * yawGain_perS), limitedBy: 'lateralAcceleration' },
    { value: settings.angleLimitFraction * limits.maxSteerAngle_rad, limitedBy: 'angleLimit' },
    { value: settings.rateLimitFraction * limits.maxSteerRate_radps * settings.maxRamp_s, limitedBy: 'rateLimit' },
  ];
  const chosen = candidates.reduce((best, candidate) => (candidate.value < best.value ? candidate : best));
  const roundDown = (angle_rad: number): number => {
    const steps = Math.floor(radiansToDegrees(angle_rad) / settings.amplitudeResolution_deg + 1e-9);
    return degreesToRadians(steps * settings.amplitudeResolution_deg);
  };
  const large_rad = roundDown(chosen.value);
  const small_rad = roundDown(large_rad * settings.smallAmplitudeFraction);
  if (!(small_rad > 0)) {
    throw new SpeedbandError(
      'testLogs.amplitudeTooSmall',
      `at ${speed_mps} m/s the step amplitude rounds to 0 (${radiansToDegrees(chosen.value).toFixed(4)}° before rounding, limited by ${chosen.limitedBy}) — give amplitudes explicitly`,
      { details: { speed_mps } },
    );
  }
  return { large_rad, small_rad, limitedBy: chosen.limitedBy, steadyLateralAcceleration_mps2: speed_mps * yawGain_perS * large_rad };
}

/**
 * The sequence of steps for the given amplitudes (rad, positive): left large, right large,
 * left small, right small, each followed by a return to zero (ISO 8855: positive = left).
 * Ramp duration per step = max(ramp_s, |Δ|/(rateLimitFraction · maxSteerRate_radps)), at most maxRamp_s.
 */
export function planSteps(amplitudes_rad: readonly number[], maxSteerRate_radps: number, settings: StepPlanSettings = STEP_PLAN_DEFAULTS): PlannedStep[] {
  const steps: PlannedStep[] = [];
  let time_s = settings.preHold_s;
  const rampFor = (change_rad: number): number =>
    Math.min(settings.maxRamp_s, Math.max(settings.ramp_s, Math.abs(change_rad) / (settings.rateLimitFraction * maxSteerRate_radps)));
  for (const amplitude of amplitudes_rad) {
    for (const target of [amplitude, -amplitude]) {
      const outRamp = rampFor(target);
      steps.push({ onset_s: time_s, from_rad: 0, to_rad: target, ramp_s: outRamp, hold_s: settings.hold_s });
      time_s += outRamp + settings.hold_s;
      const backRamp = rampFor(target);
      steps.push({ onset_s: time_s, from_rad: target, to_rad: 0, ramp_s: backRamp, hold_s: settings.returnHold_s });
      time_s += backRamp + settings.returnHold_s;
    }
  }
  return steps;
}

/** Total duration of a plan, s (the end of the last hold). */
export function planDuration_s(steps: readonly PlannedStep[]): number {
  const last = steps[steps.length - 1];
  return last === undefined ? 0 : last.onset_s + last.ramp_s + last.hold_s;
}

/** The planned command sampled at `time_s` (rad): linear ramps between held levels. */
export function sampleCommand(steps: readonly PlannedStep[], time_s: Float64Array): Float64Array {
  const command = new Float64Array(time_s.length);
  let index = 0;
  let level = 0;
  for (let k = 0; k < time_s.length; k += 1) {
    const t = time_s[k];
    while (index < steps.length && t >= steps[index].onset_s + steps[index].ramp_s) {
      level = steps[index].to_rad;
      index += 1;
    }
    const step = steps[index];
    command[k] = step !== undefined && t > step.onset_s ? step.from_rad + ((step.to_rad - step.from_rad) * (t - step.onset_s)) / step.ramp_s : level;
  }
  return command;
}
