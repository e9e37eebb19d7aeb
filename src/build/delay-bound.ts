/**
 * Bounded work for the loop analysis: the sampled loop carries its dead time as ℓ whole samples
 * (a z^−(ℓ+1) factor: a characteristic polynomial of degree ℓ + plant order, and a Nyquist count that
 * winds ℓ times), and the continuous design loop a Padé approximant whose order grows with θ·ω. A
 * delay of thousands of samples (a latency typed in ms as s, a sample time of 1e−9 s) would run for
 * hours; it is refused as bad input before the analysis instead. The bounds are generous for
 * steering: 1,000 samples (10 s at 100 Hz, 1 s at 1 kHz) and 10 s in all.
 */
import { SpeedbandError } from '../core/errors.js';
import type { ControllerSettings } from '../controller/types.js';
import type { OperatingPointModel } from '../tuning/operating-point.js';

export const DELAY_BOUNDS = { maximumSamples: 1000, maximum_s: 10 } as const;

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
