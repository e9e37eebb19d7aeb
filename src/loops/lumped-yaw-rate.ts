import type { LumpedModel } from '../identify/types.js';
import type { TransferFunction } from '../lti/types.js';

/**
 * The steer command → yaw rate transfer function of a lumped per-speed model ((rad/s)/rad, delay in s):
 *   FOPDT K·e^(−θs)/(τs + 1);
 *   second order K(βs + 1)·e^(−θs)/(s²/ωn² + 2ζs/ωn + 1) = K·ωn²(βs + 1)/(s² + 2ζωn·s + ωn²)·e^(−θs).
 */
export function lumpedYawRateTransferFunction(model: LumpedModel): TransferFunction {
  if (model.kind === 'fopdt') {
    const tau = model.timeConstant_s;
    return { numerator: [model.gain], denominator: tau > 0 ? [tau, 1] : [1], delay_s: model.deadTime_s };
  }
  const omega = model.naturalFrequency_radps;
  const scale = model.gain * omega * omega;
  const beta = model.zeroTimeConstant_s;
  return {
    numerator: beta !== 0 ? [scale * beta, scale] : [scale],
    denominator: [1, 2 * model.dampingRatio * omega, omega * omega],
    delay_s: model.deadTime_s,
  };
}
