/**
 * What the found steps say about the scale of the logged channels, before any fit: ratios that the
 * kinematics of a turning vehicle fix at 1 whatever its tyres, mass or understeer.
 *
 * - Kinematic yaw gain. The linear single-track model's steady yaw gain is r/δ = v/(L + K·v²)
 *   (Gillespie 1992, Fundamentals of Vehicle Dynamics, ch. 6; Rajamani 2012, Vehicle Dynamics and
 *   Control, §3.3), so v/(L·r/δ) = 1 + (K/L)·v² is a straight line in v² through 1 at standstill
 *   (Ackermann steering), whatever the understeer gradient K. Its intercept, fitted over the test
 *   speeds, is 1 for correct logs; a speed channel reading f times too high makes it f, a steering
 *   channel g times too high g, a yaw-rate channel h times too high 1/h.
 * - Steady turning: a_y = v·r (lateral acceleration at steady state; same sources), so v·Δr/Δa_y = 1.
 * - The measured road-wheel angle follows the road-wheel command: Δδ_measured/Δδ_command = 1 (steady).
 * Each is taken from the steady levels of each step (the means over the last quarter of the hold and
 * the pre-step window, src/log/metrics.ts), the same levels as the steady yaw gain of `inspect`.
 */
import { stepLevels } from '../log/metrics.js';
import type { StepTest } from '../log/types.js';

/** The ratios the kinematics fix at 1; null when the logs do not carry what one needs. */
export interface ChannelObservations {
  /** Intercept at v = 0 of v·δ_command/(L·r) against v², over the test speeds. */
  readonly kinematicCommand: number | null;
  /** The same with the measured road-wheel angle (steer_angle_rad). */
  readonly kinematicMeasured: number | null;
  /** Median of v·Δr/Δa_y over steps with a clear lateral acceleration. */
  readonly steadyTurning: number | null;
  /** Median of Δδ_measured/Δδ_command. */
  readonly actuatorGain: number | null;
  /** Number of test speeds (groups of steps) the intercepts come from. */
  readonly speedCount: number;
}

/** A step's lateral acceleration counts for the steady-turning ratio from this v·Δr, m/s² (noise on the demo logs: 0.03 m/s² per sample). */
const MINIMUM_TURNING_ACCELERATION_mps2 = 0.1;
/** Steps within this fraction of a speed (or 0.3 m/s) are one test speed. */
const SPEED_GROUP_FRACTION = 0.05;

const mean = (values: Float64Array, from: number, to: number): number => {
  let sum = 0;
  for (let i = from; i < to; i += 1) sum += values[i];
  return sum / (to - from);
};

const median = (values: readonly number[]): number | null => {
  const finite = values.filter(Number.isFinite).sort((a, b) => a - b);
  if (finite.length === 0) return null;
  const middle = Math.floor(finite.length / 2);
  return finite.length % 2 === 1 ? finite[middle] : (finite[middle - 1] + finite[middle]) / 2;
};

interface StepChanges {
  readonly speed_mps: number;
  readonly command_rad: number;
  readonly yawRate_radps: number;
  readonly measured_rad: number | null;
  readonly lateralAcceleration_mps2: number | null;
}

/** Steady changes of each channel across one step. */
function stepChanges(step: StepTest): StepChanges {
  const levels = stepLevels(step);
  const n = step.time_s.length;
  const change = (values: Float64Array | undefined): number | null =>
    values === undefined ? null : mean(values, levels.steadyStart, n) - mean(values, 0, step.preStepSamples);
  return {
    speed_mps: step.speed_mps,
    command_rad: levels.commandSteady_rad - levels.commandBefore_rad,
    yawRate_radps: levels.yawRateSteady_radps - levels.yawRateBefore_radps,
    measured_rad: change(step.steerAngle_rad),
    lateralAcceleration_mps2: change(step.lateralAcceleration_mps2),
  };
}

/** Steps grouped by speed (sorted), for one value per test speed. */
function speedGroups(changes: readonly StepChanges[]): StepChanges[][] {
  const sorted = [...changes].sort((a, b) => a.speed_mps - b.speed_mps);
  const groups: StepChanges[][] = [];
  for (const change of sorted) {
    const group = groups[groups.length - 1];
    const first = group?.[0].speed_mps;
    if (first !== undefined && change.speed_mps - first <= Math.max(0.3, SPEED_GROUP_FRACTION * first)) group.push(change);
    else groups.push([change]);
  }
  return groups;
}

/**
 * Intercept of y = v·δ/(L·r) against x = v² (least squares over the test speeds, one median per speed);
 * null with fewer than two speeds or an intercept that is not a positive number.
 */
function kinematicIntercept(groups: readonly StepChanges[][], wheelbase_m: number, angle: (change: StepChanges) => number | null): number | null {
  const points = groups.flatMap((group) => {
    const y = median(
      group.map((change) => {
        const delta = angle(change);
        return delta === null ? NaN : Math.abs((change.speed_mps * delta) / (wheelbase_m * change.yawRate_radps));
      }),
    );
    const speed = median(group.map((change) => change.speed_mps));
    return y === null || speed === null || !(speed > 0) ? [] : [{ x: speed * speed, y }];
  });
  if (points.length < 2) return null;
  const xMean = points.reduce((sum, p) => sum + p.x, 0) / points.length;
  const yMean = points.reduce((sum, p) => sum + p.y, 0) / points.length;
  const sxx = points.reduce((sum, p) => sum + (p.x - xMean) ** 2, 0);
  if (!(sxx > 0)) return null;
  const slope = points.reduce((sum, p) => sum + (p.x - xMean) * (p.y - yMean), 0) / sxx;
  const intercept = yMean - slope * xMean;
  return Number.isFinite(intercept) && intercept > 0 ? intercept : null;
}

/** The observations of a set of steps on a vehicle of wheelbase L (m). Pure. */
export function channelObservations(steps: readonly StepTest[], wheelbase_m: number): ChannelObservations {
  const changes = steps.map(stepChanges).filter((change) => change.yawRate_radps !== 0 && change.command_rad !== 0);
  const groups = speedGroups(changes);
  const turning = changes.filter(
    (change) => change.lateralAcceleration_mps2 !== null && Math.abs(change.speed_mps * change.yawRate_radps) >= MINIMUM_TURNING_ACCELERATION_mps2,
  );
  const withMeasured = changes.filter((change) => change.measured_rad !== null);
  return {
    kinematicCommand: kinematicIntercept(groups, wheelbase_m, (change) => change.command_rad),
    kinematicMeasured: withMeasured.length === 0 ? null : kinematicIntercept(groups, wheelbase_m, (change) => change.measured_rad),
    steadyTurning:
      turning.length === 0
        ? null
        : median(turning.map((change) => Math.abs((change.speed_mps * change.yawRate_radps) / (change.lateralAcceleration_mps2 as number)))),
    actuatorGain: withMeasured.length === 0 ? null : median(withMeasured.map((change) => Math.abs((change.measured_rad as number) / change.command_rad))),
    speedCount: groups.length,
  };
}
