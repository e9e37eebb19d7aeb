/**
 * Bounded work for the loop analysis, stated in the build's terms: the sampled loop carries its dead
 * time as ℓ whole samples (a delay register of ℓ + 1 states; past a few hundred the argument principle
 * decides instead of the eigenvalues, at a cost that does not grow with ℓ), bounded by the analysis at
 * ANALYSIS_DEFAULTS.bounds.maximumWholeSampleDelay samples. A delay beyond that, or beyond 10 s in all (a
 * latency typed in ms as s, a sample time of 1e−9 s), is refused as bad input before any analysis, naming
 * its parts.
 */
import { SpeedbandError } from '../core/errors.js';
import type { ControllerSettings } from '../controller/types.js';
import type { OperatingPointModel } from '../tuning/operating-point.js';
import { ANALYSIS_DEFAULTS } from '../verify/defaults.js';

export const DELAY_BOUNDS = { maximumSamples: ANALYSIS_DEFAULTS.bounds.maximumWholeSampleDelay, maximum_s: 10 } as const;

/** The vehicle's own dead time in a model at one speed (actuator delay, or the lumped model's dead time), s. */
export function modelDelay_s(model: OperatingPointModel): number {
  return model.kind === 'single-track' ? model.parameters.actuatorDelay_s : model.yawRate.deadTime_s;
}

/** Throw `check.delayTooLong` when the loop's dead time (vehicle delay + computation latency + Ts/2) passes the bounds. */
export function requireBoundedDelay(vehicleDelay_s: number, controller: ControllerSettings, speed_mps: number): void {
  const total_s = vehicleDelay_s + controller.computationLatency_s + controller.sampleTime_s / 2;
  const samples = total_s / controller.sampleTime_s;
  if (Number.isFinite(total_s) && total_s <= DELAY_BOUNDS.maximum_s && samples <= DELAY_BOUNDS.maximumSamples) return;
  throw new SpeedbandError(
    'check.delayTooLong',
    `at ${speed_mps} m/s the loop's dead time is ${Number(total_s.toPrecision(4))} s (vehicle ${Number(vehicleDelay_s.toPrecision(4))} s + computation latency ` +
      `${controller.computationLatency_s} s + half the sample time ${controller.sampleTime_s} s) = ${Number(samples.toPrecision(4))} samples; ` +
      `speedband analyses at most ${DELAY_BOUNDS.maximumSamples} samples and ${DELAY_BOUNDS.maximum_s} s — check the units of the latency, the sample time and the actuator delay`,
    { details: { total_s, samples, speed_mps } },
  );
}
