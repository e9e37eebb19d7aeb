/**
 * Records of the time-domain figures: the exact sampled linear closed loop's responses at one speed.
 * Plain, readonly, JSON-able. Errors in the loop's unit (yaw-rate rad/s, heading rad, path m).
 */

/** Limits on the time-domain figures (plan `acceptance`); see PLAN_DEFAULTS for their sources. */
export interface TimeDomainLimits {
  /** Reference step, with the set-point weights: overshoot at most this, % of the step. */
  readonly maximumOvershoot_pct: number;
  /** A steering misalignment or a lateral force step removed to 5 % of its peak error within this, s. */
  readonly maximumRecoveryTime_s: number;
  /** Path loop: largest error while tracking the lane change, m. */
  readonly maximumLaneChangeError_m: number;
  /** Path loop: largest error from 3 s after a curve entry on, m. */
  readonly maximumCurveEntryError_m: number;
}

export interface ReferenceStepFigures {
  /** Overshoot, % of the step (0 when none), with the chosen set-point weights. */
  readonly overshoot_pct: number;
  /** Time until the output stays within 2 % of the step, s; null when it does not within the simulated time. */
  readonly settlingTime_s: number | null;
  /** The distance travelled in that time, m. */
  readonly settlingDistance_m: number | null;
}

export interface DisturbanceFigures {
  /** Size of the disturbance: rad (misalignment) or N (lateral force). */
  readonly size: number;
  /** Largest |error|, loop units. */
  readonly peakError: number;
  /** Time until |error| stays within 5 % of that peak, s; null when it does not within the simulated time. */
  readonly recoveryTime_s: number | null;
}

export interface LaneChangeFigures {
  readonly size_m: number;
  readonly length_m: number;
  /** Largest |error| at the preview point while changing lane (path planned with the lane change, feed-forward on), m. */
  readonly peakError_m: number;
}

export interface CurveEntryFigures {
  /** The curvature step, 1/m. */
  readonly curvature_perM: number;
  /** Largest |error| at the preview point, m. */
  readonly peakError_m: number;
  /** Largest |error| from 3 s after the preview point enters the curve on, m. */
  readonly errorAfterSettle_m: number;
}

/** A reference step through the actuator's angle and rate limits (the nonlinear loop, limited-loop-simulation.ts). */
export interface LimitedStepFigures {
  /** The step: heading rad, yaw rate rad/s. */
  readonly size: number;
  readonly overshoot_pct: number;
  /** Time until the output stays within 2 % of the step, s; null when it does not settle within the simulated time (a limit cycle, or too slow). */
  readonly settlingTime_s: number | null;
  /** Largest road-wheel angle rate reached, rad/s (at the limit: the rate limit was reached). */
  readonly peakSteerRate_radps: number;
}

/** The largest reference change that keeps the commanded angle and the asked-for steering rate within the vehicle's limits. */
export interface ActuatorRoom {
  /** Reference step (yaw rate rad/s, heading rad) or, for the path loop, lane-change size (m). */
  readonly largestReference: number;
  /** Which limit binds first. */
  readonly limitedBy: 'angle' | 'rate';
  /** Peak commanded road-wheel angle per unit of the reference, rad per unit. */
  readonly peakAnglePerUnit: number;
  /** Peak steering rate the actuator is asked for per unit of the reference, rad/s per unit. */
  readonly peakRatePerUnit: number;
}

export interface TimeDomainFigures {
  readonly referenceStep: ReferenceStepFigures;
  readonly steeringMisalignment: DisturbanceFigures;
  /** Null on a lumped model (it has no lateral-force input). */
  readonly lateralForce: DisturbanceFigures | null;
  /** Path loop only. */
  readonly laneChange: LaneChangeFigures | null;
  readonly curveEntry: CurveEntryFigures | null;
  readonly actuator: ActuatorRoom;
  /** Heading and yaw-rate loops on the single-track model: a large step through the actuator's limits. */
  readonly limitedStep: LimitedStepFigures | null;
}
