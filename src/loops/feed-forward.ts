/**
 * Curvature feed-forward: the steady-state road-wheel angle for a path curvature κ at speed vx from the
 * identified single-track model, δ_ff = (L + K·vx²)·κ, K the understeer gradient in rad per m/s²
 * (Gillespie 1992, Fundamentals of Vehicle Dynamics, ch. 6, steady-state cornering; Rajamani 2012,
 * Vehicle Dynamics and Control, §3.3). The same in terms of the steady yaw-rate gain Gr(0) = vx/(L + K·vx²):
 * δ_ff = vx·κ/Gr(0) — which is how a lumped per-speed model gives it (its gain is Gr(0) with the actuator).
 * For the heading and yaw-rate loops the input is the yaw-rate reference r_ref = vx·κ: δ_ff = r_ref/Gr(0).
 *
 * When to read the input. Between the command and the yaw rate lie the controller's latency and hold (Ts/2),
 * the actuator and the vehicle: for a slowly changing input the yaw rate follows the command late by the
 * ramp lag λ = −d/ds ln Gr(s) at s = 0 (delays, plus the sum of pole time constants minus the sum of zero
 * time constants — the first moment of the impulse response). A path loop's error is also ahead of the
 * centre of gravity by its lead T0 = (d + Gvy(0)/Gr(0))/vx (preview d and the steady sideslip of the centre
 * of gravity, the low-frequency zero of the path plant, src/loops/path.ts). Reading the input
 * T_ff = λ − T0 (path) or λ (heading, yaw rate) ahead in time makes the feed-forward cancel a curvature
 * change to first order — no lateral-error ramp is left for the feedback to remove (our derivation: first-order
 * matching of the feed-forward response at s = 0). T_ff may be negative: the input is then read behind.
 */
import type { LumpedModel } from '../identify/types.js';
import type { TransferFunction } from '../lti/types.js';
import { actuatorTransferFunction, singleTrackTransferFunctions } from '../vehicle/single-track.js';
import type { SingleTrackParameters } from '../vehicle/types.js';
import { lumpedYawRateTransferFunction } from './lumped-yaw-rate.js';
import type { LoopKind } from './types.js';

/** The feed-forward at one speed. */
export interface FeedForward {
  /**
   * kff: path loop, rad per 1/m (command per unit path curvature, = L + K·vx² on the single-track model);
   * heading and yaw-rate loops, rad per rad/s (command per unit yaw-rate reference, = (L + K·vx²)/vx).
   */
  readonly gain: number;
  /** T_ff, s: the input is read this long ahead (negative: behind); see the file comment. */
  readonly leadTime_s: number;
  /** Gr(0), the steady yaw-rate gain of the command, 1/s. */
  readonly steadyYawGain_perS: number;
  /** λ, the ramp lag from command to yaw rate, s (controller latency and hold included). */
  readonly rampLag_s: number;
}

/** −d/ds ln G(s) at s = 0 for a transfer function with a finite non-zero DC gain: delay + a1/a0 − b1/b0, s. */
export function rampLag_s(g: TransferFunction): number {
  const n = g.numerator;
  const d = g.denominator;
  const ratio = (p: readonly number[]): number => (p.length >= 2 ? p[p.length - 2] / p[p.length - 1] : 0);
  return g.delay_s + ratio(d) - ratio(n);
}

function assemble(kind: LoopKind, speed_mps: number, yawGain: number, lag_s: number, lead_s: number): FeedForward {
  const perYawRate = 1 / yawGain;
  return {
    gain: kind === 'path' ? speed_mps * perYawRate : perYawRate,
    leadTime_s: kind === 'path' ? lag_s - lead_s : lag_s,
    steadyYawGain_perS: yawGain,
    rampLag_s: lag_s,
  };
}

/**
 * The feed-forward from the single-track model at a speed (m/s > 0): kff from Gr(0) = vx/(L + K·vx²), the
 * ramp lag of actuator and vehicle plus `controllerDelay_s` (Ts/2 + latency), and (path loop) the lead
 * T0 = (previewFromCg_m + Gvy(0)/Gr(0))/vx.
 */
export function feedForwardFromSingleTrack(kind: LoopKind, parameters: SingleTrackParameters, speed_mps: number, controllerDelay_s: number, previewFromCg_m: number): FeedForward {
  const { yawRate, lateralVelocity } = singleTrackTransferFunctions(parameters, speed_mps);
  const last = (p: readonly number[]): number => p[p.length - 1];
  const yawGain = last(yawRate.numerator) / last(yawRate.denominator);
  const lateralPerYaw = last(lateralVelocity.numerator) / last(yawRate.numerator);
  const lag = controllerDelay_s + rampLag_s(actuatorTransferFunction(parameters)) + rampLag_s(yawRate);
  return assemble(kind, speed_mps, yawGain, lag, (previewFromCg_m + lateralPerYaw) / speed_mps);
}

/** The feed-forward from a lumped per-speed yaw-rate model (actuator included; lateral velocity neglected: T0 = d/vx). */
export function feedForwardFromLumped(kind: LoopKind, model: LumpedModel, speed_mps: number, controllerDelay_s: number, previewFromCg_m: number): FeedForward {
  const yawRate = lumpedYawRateTransferFunction(model);
  const last = (p: readonly number[]): number => p[p.length - 1];
  const yawGain = last(yawRate.numerator) / last(yawRate.denominator);
  return assemble(kind, speed_mps, yawGain, controllerDelay_s + rampLag_s(yawRate), previewFromCg_m / speed_mps);
}
