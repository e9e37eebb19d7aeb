import { addPolynomials, multiplyPolynomials, scalePolynomial } from '../lti/polynomial.js';
import type { TransferFunction } from '../lti/types.js';
import type { LoopDefinition } from './types.js';

/**
 * Path loop: δcmd → lateral offset e (m, positive left) of the point d ahead of the CG from a
 * straight reference path, e = ey + d·eψ. Kinematics on a straight path: ėy = vy + vx·eψ, ėψ = r, so
 * the point moves sideways at ė = vy + d·r + vx·eψ and
 *   e(s) = (vy(s) + d·r(s))/s + vx·r(s)/s²  =  [(G_vy + d·G_r)·s + vx·G_r]/s² · δ(s)   (single-track, exact);
 *   e(s) ≈ G_r(s)·(vx + d·s)/s² · δ(s)                                                  (lumped, vy neglected).
 * Double-integrating: with d = 0 a P-only loop is never stable; d > 0 adds a zero at −vx/d.
 */
export const PATH_LOOP: LoopDefinition = {
  kind: 'path',
  description: 'steer command → lateral offset at a preview point (double-integrating)',
  outputUnit: 'm',
  gainUnits: { kp: 'rad per m', ki: 'rad per m·s', kd: 'rad per m/s' },
  fromYawRate: (yawRate, { speed_mps, previewFromCg_m }) => ({
    numerator: multiplyPolynomials(yawRate.numerator, [previewFromCg_m, speed_mps]),
    denominator: multiplyPolynomials(yawRate.denominator, [1, 0, 0]),
    delay_s: yawRate.delay_s,
  }),
  fromSingleTrack: ({ yawRate, lateralVelocity }, { speed_mps, previewFromCg_m }) => {
    if (!sameDenominator(yawRate, lateralVelocity)) {
      throw new Error('path loop: the yaw-rate and lateral-velocity responses must share one denominator');
    }
    const pointVelocity = addPolynomials(lateralVelocity.numerator, scalePolynomial(yawRate.numerator, previewFromCg_m));
    const numerator = addPolynomials(multiplyPolynomials(pointVelocity, [1, 0]), scalePolynomial(yawRate.numerator, speed_mps));
    return { numerator, denominator: multiplyPolynomials(yawRate.denominator, [1, 0, 0]), delay_s: yawRate.delay_s };
  },
  integrators: 2,
  designGainFactor: ({ speed_mps }) => speed_mps,
  designLead_s: ({ speed_mps, previewFromCg_m }, lateralVelocityPerYawRate_m) => (previewFromCg_m + lateralVelocityPerYawRate_m) / speed_mps,
};

function sameDenominator(a: TransferFunction, b: TransferFunction): boolean {
  return a.denominator.length === b.denominator.length && a.denominator.every((c, i) => c === b.denominator[i]);
}
