/**
 * The single-track vehicle with its steering actuator, relative to a path: the state equations the scenario
 * simulator integrates. States x = [vy, r, eψ, ey, δ]: lateral velocity (m/s) and yaw rate (rad/s) of the
 * linear single-track model (src/vehicle/single-track.ts, Rajamani 2012 §2.3) at the instantaneous speed vx,
 * the heading error eψ = ψ − ψpath (rad) and lateral offset ey (m, positive left) of the centre of gravity
 * from the path, and the road-wheel angle δ (rad). Path-relative kinematics, linear in the errors (Rajamani
 * 2012, §2.5, error dynamics with respect to the road):
 *   ėψ = r − vx·κ(s),   ėy = vy + vx·eψ,   ṡ = vx,
 * κ the path curvature at the centre of gravity. The wheels see δ + b (b: a steering misalignment); a lateral
 * force F at the centre of gravity enters m·v̇y. The actuator's row is set per piece (actuator-motion.ts):
 * δ̇ = w (a fixed rate) or δ̇ = (w − δ)/τa. Lateral acceleration ay = v̇y + vx·r.
 */
import { singleTrackStateSpace } from '../vehicle/single-track.js';
import type { SingleTrackParameters } from '../vehicle/types.js';

export const STATE = { lateralVelocity: 0, yawRate: 1, headingError: 2, lateralOffset: 3, steerAngle: 4 } as const;
export const STATES = 5;
/** Inputs of the continuous system: the actuator's w, the path curvature κ (1/m), the lateral force F (N), the misalignment b (rad). */
export const INPUTS = 4;

/** The exogenous signals at one instant. */
export interface PathFrameInputs {
  readonly curvature_perM: number;
  readonly lateralForce_N: number;
  readonly misalignment_rad: number;
}

/**
 * Continuous system ẋ = A·x + B·[w, κ, F, b] at speed vx (m/s > 0) for one actuator piece kind, as row-major
 * arrays (A: 5×5, B: 5×4). `lag_s` is the actuator's τa (used by 'track' only).
 */
export function pathFrameSystem(
  parameters: SingleTrackParameters,
  speed_mps: number,
  kind: 'free' | 'track',
  lag_s: number,
): { a: Float64Array; b: Float64Array } {
  const { A, B } = singleTrackStateSpace(parameters, speed_mps);
  const a = new Float64Array(STATES * STATES);
  const b = new Float64Array(STATES * INPUTS);
  const set = (m: Float64Array, columns: number, i: number, j: number, value: number): void => {
    m[i * columns + j] = value;
  };
  for (let i = 0; i < 2; i++) {
    for (let j = 0; j < 2; j++) set(a, STATES, i, j, A[i][j]);
    set(a, STATES, i, STATE.steerAngle, B[i][0]);
    set(b, INPUTS, i, 3, B[i][0]);
  }
  set(b, INPUTS, STATE.lateralVelocity, 2, 1 / parameters.mass_kg);
  set(a, STATES, STATE.headingError, STATE.yawRate, 1);
  set(b, INPUTS, STATE.headingError, 1, -speed_mps);
  set(a, STATES, STATE.lateralOffset, STATE.lateralVelocity, 1);
  set(a, STATES, STATE.lateralOffset, STATE.headingError, speed_mps);
  if (kind === 'track' && lag_s > 0) {
    set(a, STATES, STATE.steerAngle, STATE.steerAngle, -1 / lag_s);
    set(b, INPUTS, STATE.steerAngle, 0, 1 / lag_s);
  } else {
    set(b, INPUTS, STATE.steerAngle, 0, 1);
  }
  return { a, b };
}

/** ẋ into `out` for the system (a, b) of pathFrameSystem, state x and inputs [w, κ, F, b]. */
export function pathFrameDerivative(
  system: { readonly a: Float64Array; readonly b: Float64Array },
  x: Float64Array,
  inputs: ArrayLike<number>,
  out: Float64Array,
): void {
  for (let i = 0; i < x.length; i++) out[i] = pathFrameDerivativeRow(system, x, inputs, i);
}

/** Row i of ẋ = A·x + B·[w, κ, F, b] (pathFrameDerivative one row at a time: the lateral acceleration needs only row 0). */
export function pathFrameDerivativeRow(
  system: { readonly a: Float64Array; readonly b: Float64Array },
  x: Float64Array,
  inputs: ArrayLike<number>,
  i: number,
): number {
  const n = x.length;
  const m = inputs.length;
  let sum = 0;
  for (let j = 0; j < n; j++) sum += system.a[i * n + j] * x[j];
  for (let j = 0; j < m; j++) sum += system.b[i * m + j] * inputs[j];
  return sum;
}

/** Lateral acceleration ay = v̇y + vx·r, m/s², from v̇y (row 0 of the derivative) and the state. */
export function lateralAcceleration_mps2(lateralVelocityRate: number, x: Float64Array, speed_mps: number): number {
  return lateralVelocityRate + speed_mps * x[STATE.yawRate];
}

/**
 * ẋ into `out` at speed vx (m/s > 0) without building the matrices (the Runge–Kutta inner loop): the same
 * equations as pathFrameSystem, coefficients of singleTrackStateSpace written out.
 */
export function pathFrameDerivativeAt(
  parameters: SingleTrackParameters,
  speed_mps: number,
  kind: 'free' | 'track',
  lag_s: number,
  x: Float64Array,
  inputs: ArrayLike<number>,
  out: Float64Array,
): void {
  const { yawInertia_kgm2: iz, cgToFrontAxle_m: a, cgToRearAxle_m: b } = parameters;
  const cf = parameters.frontCorneringStiffness_NPerRad;
  const cr = parameters.rearCorneringStiffness_NPerRad;
  const vx = speed_mps;
  const r = x[1];
  const wheel = x[4] + inputs[3];
  out[0] = lateralVelocityRateAt(parameters, speed_mps, x, inputs);
  out[1] = (-(a * cf - b * cr) / (iz * vx)) * x[0] + (-(a * a * cf + b * b * cr) / (iz * vx)) * r + ((a * cf) / iz) * wheel;
  out[2] = r - vx * inputs[1];
  out[3] = x[0] + vx * x[2];
  out[4] = kind === 'track' && lag_s > 0 ? (inputs[0] - x[4]) / lag_s : inputs[0];
}

/** v̇y, the first row of pathFrameDerivativeAt (all the lateral acceleration needs). */
export function lateralVelocityRateAt(parameters: SingleTrackParameters, speed_mps: number, x: Float64Array, inputs: ArrayLike<number>): number {
  const { mass_kg: m, cgToFrontAxle_m: a, cgToRearAxle_m: b } = parameters;
  const cf = parameters.frontCorneringStiffness_NPerRad;
  const cr = parameters.rearCorneringStiffness_NPerRad;
  const vx = speed_mps;
  const wheel = x[4] + inputs[3];
  return (-(cf + cr) / (m * vx)) * x[0] + (-(a * cf - b * cr) / (m * vx) - vx) * x[1] + (cf / m) * wheel + inputs[2] / m;
}
