import { multiplyPolynomials } from '../lti/polynomial.js';
import type { TransferFunction } from '../lti/types.js';
import type { LoopDefinition } from './types.js';

/** G/s: one more integrator, delay kept. */
function integrate(g: TransferFunction): TransferFunction {
  return { numerator: [...g.numerator], denominator: multiplyPolynomials(g.denominator, [1, 0]), delay_s: g.delay_s };
}

/** Heading loop: δcmd → ψ (rad), ψ = r/s (ISO 8855 yaw angle), integrating. */
export const HEADING_LOOP: LoopDefinition = {
  kind: 'heading',
  description: 'steer command → heading ψ = r/s (integrating)',
  outputUnit: 'rad',
  gainUnits: { kp: 'rad per rad', ki: 'rad per rad·s', kd: 'rad per rad/s' },
  fromYawRate: (yawRate) => integrate(yawRate),
  fromSingleTrack: (responses) => integrate(responses.yawRate),
  integrators: 1,
  designGainFactor: () => 1,
  designLead_s: () => 0,
};
