/**
 * The scenarios a schedule is driven through, by name (our names), and what each sets up for a loop at a
 * speed (sizes in defaults.ts). Reference steps change the feedback reference only (the feed-forward follows
 * the path); disturbances start at the end of the lead-in; path manoeuvres start when the centre of gravity
 * has driven the lead-in. A scenario that means nothing for a loop (an initial lateral offset for a yaw-rate
 * loop) is not applicable there.
 */
import type { LoopKind } from '../loops/types.js';
import { understeerGradient_radPerMps2 } from '../vehicle/single-track.js';
import type { SingleTrackParameters } from '../vehicle/types.js';
import { SCENARIO_DEFAULTS, SIMULATION_DEFAULTS } from './defaults.js';
import type { ScenarioSetup } from './scenario-simulation.js';
import { curveEntryPath, laneChangePath, STRAIGHT_PATH } from './scenarios.js';
import { changeDuration_s, constantSpeed, type SpeedProfile } from './speed-profile.js';

/** The scenarios of a test day, in the order they run: reference steps, offset, misalignment, side force, lane change, curve entry, speed ramp and braking in a curve. */
export const SCENARIO_NAMES = [
  'small-step',
  'large-step',
  'initial-offset',
  'misalignment',
  'side-force',
  'lane-change',
  'curve-entry',
  'speed-ramp-in-curve',
  'braking-in-curve',
] as const;
/** The name of one scenario (see SCENARIO_NAMES). */
export type ScenarioName = (typeof SCENARIO_NAMES)[number];

/** The small step is at most this fraction of the actuator room (our choice). */
export const SMALL_STEP_ROOM_FRACTION = 0.5;

/** Scenarios run over the whole speed range (once per schedule), not at one speed. */
export const RANGE_SCENARIOS: readonly ScenarioName[] = ['speed-ramp-in-curve', 'braking-in-curve'];

export const SCENARIO_DESCRIPTIONS: Readonly<Record<ScenarioName, string>> = {
  'small-step':
    'reference step meant to stay in the linear range (heading 0.01 rad, yaw rate 0.01 rad/s, path 0.05 m; at most half the step the actuator allows)',
  'large-step': 'reference step through the steering limits (heading 0.2 rad, path 1 m, yaw rate 2 m/s² of lateral acceleration)',
  'initial-offset': 'start beside the path (path 0.5 m) or off its heading (heading 0.05 rad); not for a yaw-rate loop',
  misalignment: 'constant road-wheel angle misalignment of 0.01 rad from the end of the lead-in',
  'side-force': 'lateral force step at the centre of gravity, 5 % of the vehicle weight (crosswind-like)',
  'lane-change': '3.5 m lane change over 4 s of travel (at least 20 m), fifth-order path',
  'curve-entry': 'from straight into a constant curve (2 m/s² lateral acceleration, at most half the steering range)',
  'speed-ramp-in-curve':
    "in a curve, accelerate from the lowest to the highest speed of the range (the plan's check.rampAcceleration_mps2: the vehicle's own in service, else 1 m/s²)",
  'braking-in-curve':
    "in a curve, brake from the highest to the lowest speed of the range (the plan's check.brakingDeceleration_mps2: the vehicle's service braking, else 2 m/s²)",
};

/** How the metrics judge a run: a step (overshoot, settling to 2 % of it) or a disturbance or manoeuvre (recovery to 5 % of the peak error). */
export type ScenarioKind = 'step' | 'disturbance';

export interface PreparedScenario {
  readonly name: ScenarioName;
  readonly kind: ScenarioKind;
  /** Step size (loop unit) for a step; the disturbance or manoeuvre size otherwise (rad, N, m, 1/m). */
  readonly size: number;
  /** Metrics are taken from this time on, s. */
  readonly judgeFrom_s: number;
  readonly setup: ScenarioSetup;
}

export interface ScenarioContext {
  readonly loop: LoopKind;
  readonly parameters: SingleTrackParameters;
  readonly maxSteerAngle_rad: number;
  /** The schedule's speed range, m/s (for the ramps). */
  readonly range: { readonly minimum_mps: number; readonly maximum_mps: number };
  /**
   * The largest reference step the actuator allows at a speed without reaching its angle or rate limit (the
   * breakpoints' actuator room, src/performance/actuator-room.ts), loop unit; absent: not known. The small step
   * is kept within half of it, so that it stays in the linear range on a vehicle with a slow or fast actuator alike.
   */
  readonly linearRoomAt?: (speed_mps: number) => number;
  /** Sizes that replace the defaults (a user's own lane change or speed change). */
  readonly sizes?: ScenarioSizes;
}

/** The scenario sizes a user may give; absent fields keep the defaults. */
export interface ScenarioSizes {
  readonly laneChangeWidth_m?: number;
  readonly laneChangeLength_m?: number;
  readonly acceleration_mps2?: number;
  readonly deceleration_mps2?: number;
}

/** Curvature of the curve scenarios at speed v: 2 m/s² of lateral acceleration, at most half the steering range in steady state (L + K·v²)·κ. */
export function scenarioCurvature_perM(context: ScenarioContext, speed_mps: number): number {
  const d = SCENARIO_DEFAULTS;
  const p = context.parameters;
  const steerPerCurvature = p.cgToFrontAxle_m + p.cgToRearAxle_m + understeerGradient_radPerMps2(p) * speed_mps * speed_mps;
  return Math.min(d.curveLateralAcceleration_mps2 / (speed_mps * speed_mps), (d.curveSteerFraction * context.maxSteerAngle_rad) / Math.abs(steerPerCurvature));
}

/** The scenario `name` at `speed_mps` (ignored by the range scenarios), or null when it does not apply to the loop. */
export function prepareScenario(name: ScenarioName, context: ScenarioContext, speed_mps: number): PreparedScenario | null {
  const d = SCENARIO_DEFAULTS;
  const s = SIMULATION_DEFAULTS;
  const lead = d.leadIn_s;
  const base: ScenarioSetup = {
    duration_s: lead + s.settle_s,
    speed: constantSpeed(speed_mps),
    path: STRAIGHT_PATH,
    pathStart_m: speed_mps * lead,
    referenceStep: null,
    lateralForce: null,
    misalignment: null,
    initialLateralOffset_m: 0,
    initialHeadingError_rad: 0,
    restAfter_s: lead,
  };
  const step = (size: number): PreparedScenario => ({ name, kind: 'step', size, judgeFrom_s: lead, setup: { ...base, referenceStep: { time_s: lead, size } } });
  const loop = context.loop;
  switch (name) {
    case 'small-step': {
      const room = context.linearRoomAt?.(speed_mps);
      return step(room === undefined || !(room > 0) ? s.smallStep[loop] : Math.min(s.smallStep[loop], SMALL_STEP_ROOM_FRACTION * room));
    }
    case 'large-step': {
      if (loop !== 'yaw-rate') return step(s.largeStep[loop]);
      const steerPerYawRate =
        (context.parameters.cgToFrontAxle_m + context.parameters.cgToRearAxle_m + understeerGradient_radPerMps2(context.parameters) * speed_mps ** 2) /
        speed_mps;
      return step(
        Math.min(d.limitedYawStepLateralAcceleration_mps2 / speed_mps, (d.curveSteerFraction * context.maxSteerAngle_rad) / Math.abs(steerPerYawRate)),
      );
    }
    case 'initial-offset': {
      if (loop === 'yaw-rate') return null;
      const size = s.initialOffset[loop];
      return {
        name,
        kind: 'disturbance',
        size,
        judgeFrom_s: 0,
        setup: {
          ...base,
          duration_s: s.settle_s,
          restAfter_s: 0,
          initialLateralOffset_m: loop === 'path' ? size : 0,
          initialHeadingError_rad: loop === 'heading' ? size : 0,
        },
      };
    }
    case 'misalignment':
      return {
        name,
        kind: 'disturbance',
        size: d.steeringMisalignment_rad,
        judgeFrom_s: lead,
        setup: { ...base, misalignment: { time_s: lead, size: d.steeringMisalignment_rad } },
      };
    case 'side-force': {
      const size = d.lateralForcePerWeight * context.parameters.mass_kg * d.gravity_mps2;
      return { name, kind: 'disturbance', size, judgeFrom_s: lead, setup: { ...base, lateralForce: { time_s: lead, size } } };
    }
    case 'lane-change': {
      const length = context.sizes?.laneChangeLength_m ?? Math.max(d.laneChangeDuration_s * speed_mps, d.laneChangeShortestLength_m);
      const width = context.sizes?.laneChangeWidth_m ?? d.laneChangeSize_m;
      return {
        name,
        kind: 'disturbance',
        size: width,
        judgeFrom_s: 0,
        setup: { ...base, duration_s: lead + length / speed_mps + s.settle_s, restAfter_s: lead + length / speed_mps, path: laneChangePath(width, length) },
      };
    }
    case 'curve-entry': {
      const curvature = scenarioCurvature_perM(context, speed_mps);
      return { name, kind: 'disturbance', size: curvature, judgeFrom_s: 0, setup: { ...base, path: curveEntryPath(curvature) } };
    }
    case 'speed-ramp-in-curve':
    case 'braking-in-curve': {
      const { minimum_mps, maximum_mps } = context.range;
      const accelerating = name === 'speed-ramp-in-curve';
      const profile: SpeedProfile = {
        initial_mps: accelerating ? minimum_mps : maximum_mps,
        final_mps: accelerating ? maximum_mps : minimum_mps,
        changeStart_s: lead + s.rampHold_s,
        acceleration_mps2: accelerating
          ? (context.sizes?.acceleration_mps2 ?? s.rampAcceleration_mps2)
          : (context.sizes?.deceleration_mps2 ?? s.brakingDeceleration_mps2),
      };
      return rampScenario(name, context, profile);
    }
  }
}

/** A speed change through the range while following a constant curve (entered at the start speed, held for rampHold_s, then the change). */
export function rampScenario(name: ScenarioName, context: ScenarioContext, profile: SpeedProfile): PreparedScenario {
  const s = SIMULATION_DEFAULTS;
  const lead = SCENARIO_DEFAULTS.leadIn_s;
  // One curvature for the whole run, sized at the speed where it asks most of the steering or the tyres.
  const curvature = Math.min(scenarioCurvature_perM(context, profile.initial_mps), scenarioCurvature_perM(context, profile.final_mps));
  return {
    name,
    kind: 'disturbance',
    size: curvature,
    judgeFrom_s: profile.changeStart_s,
    setup: {
      duration_s: profile.changeStart_s + changeDuration_s(profile) + s.rampHold_s,
      speed: profile,
      path: curveEntryPath(curvature),
      pathStart_m: profile.initial_mps * lead,
      referenceStep: null,
      lateralForce: null,
      misalignment: null,
      initialLateralOffset_m: 0,
      initialHeadingError_rad: 0,
      restAfter_s: profile.changeStart_s + changeDuration_s(profile),
    },
  };
}
