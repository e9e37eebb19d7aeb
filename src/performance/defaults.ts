/**
 * The scenarios the time-domain figures are computed for, in one place. Sources beside each value;
 * 'our choice' where the value is a convention of this tool.
 */
export const SCENARIO_DEFAULTS = {
  /** Settling band of a reference step, fraction of the step: 2 % (common practice; e.g. Franklin, Powell & Emami-Naeini, Feedback Control of Dynamic Systems, §3.4). */
  settlingBand: 0.02,
  /** A disturbance counts as removed when the error stays within this fraction of its peak: 5 % (our choice). */
  recoveryBand: 0.05,
  /** Constant steering misalignment (road-wheel angle offset), rad: 0.01 rad ≈ 0.57° (our choice: a wheel-alignment error a workshop would correct). */
  steeringMisalignment_rad: 0.01,
  /** Lateral force step at the centre of gravity as a fraction of the vehicle's weight: 0.05 ≈ a 3° cross slope or a strong crosswind gust (our choice). */
  lateralForcePerWeight: 0.05,
  /** Standard gravity, m/s² (ISO 80000-3). */
  gravity_mps2: 9.80665,
  /** Lane change: 3.5 m lateral (a lane width of common practice on roads) over max(this many seconds of travel, the shortest length). */
  laneChangeSize_m: 3.5,
  laneChangeDuration_s: 4,
  laneChangeShortestLength_m: 20,
  /** Curve entry: a curvature step sized for this lateral acceleration, m/s² (2 m/s²: comfortable cornering, common practice) … */
  curveLateralAcceleration_mps2: 2,
  /** … but at most the curvature that needs this fraction of the steering-angle limit in steady state (our choice). */
  curveSteerFraction: 0.5,
  /** The curve-entry error is judged from this long after the preview point enters the curve, s (our choice). */
  curveEntrySettle_s: 3,
  /** Step through the actuator's limits: heading 0.2 rad (a large heading change; common practice for a limit-cycle test) … */
  limitedHeadingStep_rad: 0.2,
  /** … yaw rate: the step giving this lateral acceleration, m/s² (our choice), at most half the steering range in steady state. */
  limitedYawStepLateralAcceleration_mps2: 2,
  /** Straight driving before a manoeuvre starts, s. */
  leadIn_s: 1,
  /** Simulated time after a manoeuvre: this many slowest closed-loop time constants, within the bounds below (s). */
  horizonTimeConstants: 12,
  shortestHorizon_s: 20,
  longestHorizon_s: 300,
} as const;

/**
 * The scenarios `speedband simulate`, `build` and `check` drive a schedule through (scenario-catalogue.ts).
 * Sizes are our choice unless a source is named; the lane change, curve, misalignment and lateral force
 * reuse SCENARIO_DEFAULTS above.
 */
export const SIMULATION_DEFAULTS = {
  /** Small reference steps, meant to stay in the linear range: heading rad, yaw rate rad/s, path m. */
  smallStep: { heading: 0.01, 'yaw-rate': 0.01, path: 0.05 },
  /** Large reference steps, meant to reach the steering limits: heading 0.2 rad (SCENARIO_DEFAULTS), path 1 m; yaw rate: the step of SCENARIO_DEFAULTS. */
  largeStep: { heading: 0.2, path: 1 },
  /** Initial offset from the path: path loop m, heading loop rad (none for a yaw-rate loop). */
  initialOffset: { heading: 0.05, path: 0.5 },
  /** Time simulated after a manoeuvre, s: long enough for a 15 s recovery and a tail in which to look for a limit cycle. */
  settle_s: 30,
  /**
   * Speed ramp through the range while following a curve: acceleration, m/s² (≈ 0.1 g, a moderate acceleration; our
   * choice). A vehicle file's serviceAcceleration_mps2 replaces it (plan check.rampAcceleration_mps2).
   */
  rampAcceleration_mps2: 1,
  /**
   * Braking through the range: deceleration, m/s² (≈ 0.2 g, firm but not an emergency stop for a road vehicle; our
   * choice). The scenario judges the schedule at the braking the vehicle does in service, so a vehicle file's
   * serviceDeceleration_mps2 replaces it (plan check.brakingDeceleration_mps2): a vineyard sprayer with a full tank on
   * a slope brakes far more gently than a van in traffic (common practice: agricultural machines keep their braking
   * gentle to keep the load and the machine stable on a slope). What the schedule would stand — the largest rate
   * that keeps the limits — is the speed-change certificate, whatever rate is judged here.
   */
  brakingDeceleration_mps2: 2,
  /** Constant speed in the curve before and after a speed change, s. */
  rampHold_s: 10,
} as const;
