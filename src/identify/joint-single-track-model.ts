import type { StepTest } from '../log/types.js';
import type { SingleTrackParameters, Vehicle } from '../vehicle/types.js';
import { LEAST_SQUARES_DEFAULTS } from './least-squares.js';
import { simulateYawThroughActuator } from './simulate-single-track-yaw.js';
import { newHoldUpdateCache, type HoldUpdateCache } from './simulate-third-order.js';
import { yawSignals, type StepSignals } from './step-signals.js';

/**
 * The model of the joint single-track fit (joint-single-track.ts): every step's yaw rate, simulated
 * through the actuator and the single-track model at the step's speed, stacked end to end, each step
 * shifted by its own offset (the mean residual: solved exactly, so the fitter never sees it).
 * Parameters p = [ln Cf, ln Cr, τa, θa].
 */

/** All steps' signals and their measured yaw rates end to end (rad/s), in the order of `steps`. */
export interface StackedSteps {
  readonly steps: readonly StepTest[];
  readonly signals: readonly StepSignals[];
  /** The measured yaw rates of every step, stacked. */
  readonly data: Float64Array;
  /** Samples in all steps (the length of data). */
  readonly total: number;
}

/** Buffers every simulation of one fit reuses: the state scratch (3 × the longest step) and the exact-update cache. */
export interface JointSimulationScratch {
  readonly states: Float64Array;
  readonly cache: HoldUpdateCache;
}

/** The steps' signals and measured yaw rates, stacked. */
export function stackSteps(steps: readonly StepTest[]): StackedSteps {
  const signals = steps.map(yawSignals);
  const total = signals.reduce((sum, s) => sum + s.time_s.length, 0);
  const data = new Float64Array(total);
  let offset = 0;
  for (const s of signals) {
    data.set(s.output, offset);
    offset += s.output.length;
  }
  return { steps, signals, data, total };
}

/** Scratch for simulating the stacked steps: one state buffer for every simulation, one update cache. */
export function newJointSimulationScratch(stacked: StackedSteps): JointSimulationScratch {
  const longest = stacked.signals.reduce((most, s) => Math.max(most, s.time_s.length), 0);
  return { states: new Float64Array(3 * longest), cache: newHoldUpdateCache() };
}

/** The single-track parameters of the vehicle with the fitted p = [ln Cf, ln Cr, τa, θa]. */
export function jointParameters(vehicle: Vehicle, p: readonly number[]): SingleTrackParameters {
  return {
    mass_kg: vehicle.mass_kg,
    yawInertia_kgm2: vehicle.yawInertia_kgm2,
    cgToFrontAxle_m: vehicle.cgToFrontAxle_m,
    cgToRearAxle_m: vehicle.cgToRearAxle_m,
    frontCorneringStiffness_NPerRad: Math.exp(p[0]),
    rearCorneringStiffness_NPerRad: Math.exp(p[1]),
    actuatorLag_s: p[2],
    actuatorDelay_s: p[3],
  };
}

/** Subtract the mean of `values` from each (in place). */
function removeMean(values: Float64Array): void {
  let mean = 0;
  for (let k = 0; k < values.length; k++) mean += values[k];
  mean /= values.length;
  for (let k = 0; k < values.length; k++) values[k] -= mean;
}

/**
 * Yaw rate of every step at p, each step shifted by its best offset (its mean residual), stacked. With
 * `delayColumn` (length total), also ∂/∂θa, written there: the offset moves with the prediction, so each
 * step's part of the column has its mean removed too. Each step is simulated straight into its part.
 */
export function simulateStackedSteps(
  vehicle: Vehicle,
  stacked: StackedSteps,
  p: readonly number[],
  buffers: JointSimulationScratch & { readonly delayColumn: Float64Array | null },
): Float64Array {
  const { steps, signals, total } = stacked;
  const { states, cache, delayColumn } = buffers;
  const params = jointParameters(vehicle, p);
  const prediction = new Float64Array(total);
  let at = 0;
  for (let i = 0; i < steps.length; i++) {
    const s = signals[i];
    const end = at + s.time_s.length;
    const derivative = delayColumn === null ? null : delayColumn.subarray(at, end);
    const y = simulateYawThroughActuator({
      params,
      speed_mps: steps[i].speed_mps,
      time_s: s.time_s,
      input: s.input,
      out: prediction.subarray(at, end),
      states,
      cache,
      delayDerivative: derivative,
    });
    let mean = 0;
    for (let k = 0; k < y.length; k++) mean += s.output[k] - y[k];
    mean /= y.length;
    for (let k = 0; k < y.length; k++) y[k] = y[k] + mean;
    if (derivative !== null) removeMean(derivative);
    at = end;
  }
  return prediction;
}

/** The model and its Jacobian as the least-squares adapter takes them. */
export interface JointModel {
  readonly model: (p: readonly number[]) => Float64Array;
  readonly jacobian: (p: readonly number[]) => readonly Float64Array[];
}

/**
 * The joint model for the fitter. Each evaluation keeps its exact ∂/∂θa, since the fitter asks for the
 * Jacobian where it last evaluated. Jacobian: ∂/∂θa exact (simulate-third-order.ts), the other three by
 * forward differences with the adapter's step rule (relative to max(|p/scale|, 1), in scaled units).
 */
export function jointModel(vehicle: Vehicle, stacked: StackedSteps, scale: readonly number[]): JointModel {
  const { total } = stacked;
  const scratch = newJointSimulationScratch(stacked);
  const simulate = (p: readonly number[], delayColumn: Float64Array | null): Float64Array =>
    simulateStackedSteps(vehicle, stacked, p, { ...scratch, delayColumn });
  let last: { readonly p: readonly number[]; readonly prediction: Float64Array; readonly delayColumn: Float64Array } | null = null;
  const model = (p: readonly number[]): Float64Array => {
    const delayColumn = new Float64Array(total);
    const prediction = simulate(p, delayColumn);
    last = { p: p.slice(), prediction, delayColumn };
    return prediction;
  };
  const jacobian = (p: readonly number[]): readonly Float64Array[] => {
    const here = last?.p.every((v, i) => v === p[i]) ? last : null;
    const delayColumn = here?.delayColumn ?? new Float64Array(total);
    const base = here?.prediction ?? simulate(p, delayColumn);
    const columns: Float64Array[] = [];
    for (let i = 0; i < 3; i++) {
      const h = LEAST_SQUARES_DEFAULTS.relativeDifferenceStep * Math.max(Math.abs(p[i]) / scale[i], 1) * scale[i];
      const probe = p.slice();
      probe[i] += h;
      const column = simulate(probe, null);
      for (let k = 0; k < total; k++) column[k] = (column[k] - base[k]) / h;
      columns.push(column);
    }
    columns.push(delayColumn);
    return columns;
  };
  return { model, jacobian };
}
