import type { SingleTrackParameters } from '../vehicle/types.js';
import { singleTrackTransferFunctions } from '../vehicle/single-track.js';
import { simulateThirdOrderHeld, type HeldSimulationBuffers } from './simulate-third-order.js';

/** Lags below this are simulated at this value (the third-order form divides by τa), s. */
const MIN_LAG_S = 1e-4;

/** One step of the single-track model through its actuator, driven by a held road-wheel angle command. */
export interface YawThroughActuatorInput extends HeldSimulationBuffers {
  readonly params: SingleTrackParameters;
  readonly speed_mps: number;
  /** Sample times, s, increasing. */
  readonly time_s: Float64Array;
  /** Road-wheel angle command, rad (same length as time_s). */
  readonly input: Float64Array;
}

/**
 * Yaw rate (rad/s) from rest for a road-wheel angle command (rad) held between samples, through the
 * actuator e^(−θa s)/(τa s + 1) and the single-track δ → r transfer function at speed_mps (ISO 8855 signs).
 * `cache` shares exact updates between consecutive calls; `delayDerivative` receives ∂r/∂θa (simulate-third-order.ts).
 */
export function simulateYawThroughActuator(options: YawThroughActuatorInput): Float64Array {
  const { params, speed_mps } = options;
  const yaw = singleTrackTransferFunctions(params, speed_mps).yawRate;
  const [b1, b0] = yaw.numerator.length === 2 ? yaw.numerator : [0, yaw.numerator[0]];
  const [, a1, a0] = yaw.denominator;
  const tau = Math.max(params.actuatorLag_s, MIN_LAG_S);
  // (τs + 1)(s² + a1 s + a0) / τ, monic
  const denominator: [number, number, number, number] = [1, a1 + 1 / tau, a0 + a1 / tau, a0 / tau];
  return simulateThirdOrderHeld({
    time_s: options.time_s,
    input: options.input,
    numerator: [0, b1 / tau, b0 / tau],
    denominator,
    delay_s: params.actuatorDelay_s,
    out: options.out,
    states: options.states,
    cache: options.cache,
    delayDerivative: options.delayDerivative,
  });
}
