import type { SingleTrackParameters } from '../vehicle/types.js';
import { singleTrackTransferFunctions } from '../vehicle/single-track.js';
import { newHoldUpdateCache, simulateThirdOrderHeld, type HoldUpdateCache } from './simulate-third-order.js';

/** Lags below this are simulated at this value (the third-order form divides by τa), s. */
const MIN_LAG_S = 1e-4;

/**
 * Yaw rate (rad/s) from rest for a road-wheel angle command (rad) held between samples, through the
 * actuator e^(−θa s)/(τa s + 1) and the single-track δ → r transfer function at speed_mps (ISO 8855 signs).
 * `cache` shares exact updates between consecutive calls; `delayDerivative` receives ∂r/∂θa (simulate-third-order.ts).
 */
export function simulateYawThroughActuator(
  params: SingleTrackParameters,
  speed_mps: number,
  time_s: Float64Array,
  input: Float64Array,
  out: Float64Array = new Float64Array(time_s.length),
  states: Float64Array = new Float64Array(3 * time_s.length),
  cache: HoldUpdateCache = newHoldUpdateCache(),
  delayDerivative: Float64Array | null = null,
): Float64Array {
  const yaw = singleTrackTransferFunctions(params, speed_mps).yawRate;
  const [b1, b0] = yaw.numerator.length === 2 ? yaw.numerator : [0, yaw.numerator[0]];
  const [, a1, a0] = yaw.denominator;
  const tau = Math.max(params.actuatorLag_s, MIN_LAG_S);
  // (τs + 1)(s² + a1 s + a0) / τ, monic
  const denominator: [number, number, number, number] = [1, a1 + 1 / tau, a0 + a1 / tau, a0 / tau];
  return simulateThirdOrderHeld(time_s, input, [0, b1 / tau, b0 / tau], denominator, params.actuatorDelay_s, out, states, cache, delayDerivative);
}
