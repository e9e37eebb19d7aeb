import { SpeedbandError } from '../core/errors.js';
import { stepResponse } from '../lti/time-response.js';
import { dcGain, transferFunctionPoles } from '../lti/transfer-function.js';
import type { TransferFunction } from '../lti/types.js';

/** A first order plus dead time approximation K·e^(−θs)/(τs + 1) of a richer self-regulating response. */
export interface TwoPointFopdt {
  /** K = G(0), same units as the response. */
  readonly gain: number;
  readonly timeConstant_s: number;
  readonly deadTime_s: number;
  /** Times at which the unit-step response reaches 28.3 % and 63.2 % of K, s after the step. */
  readonly time28_s: number;
  readonly time63_s: number;
}

/** Grid points of the step response used to find the crossings (linear interpolation between them). */
const STEP_POINTS = 400;

function crossing(time_s: Float64Array, output: Float64Array, level: number): number | null {
  for (let i = 1; i < output.length; i++) {
    if (output[i] >= level && output[i - 1] < level) {
      return time_s[i - 1] + ((level - output[i - 1]) / (output[i] - output[i - 1])) * (time_s[i] - time_s[i - 1]);
    }
  }
  return null;
}

/**
 * FOPDT of a stable response by Smith's two-point method on its exact unit-step response
 * (Smith 1972; Seborg, Edgar & Mellichamp, Process Dynamics and Control, §7.2 — from memory), the
 * same reading a test engineer makes of a logged step: t28, t63 where y/K reaches 0.283 and 0.632,
 *   τ = 1.5·(t63 − t28),  θ = t63 − τ  (θ clamped at 0: then τ = t63),  K = G(0).
 * Throws `tuning.unstablePlant` for an open-loop unstable response (oversteer above the critical
 * speed) and `tuning.noSteadyState` for G(0) = 0 or ∞.
 */
export function fopdtByTwoPoints(g: TransferFunction): TwoPointFopdt {
  const poles = transferFunctionPoles(g);
  const scale = poles.reduce((largest, pole) => Math.max(largest, Math.hypot(pole.re, pole.im)), 1);
  const unstable = poles.find((pole) => pole.re >= -1e-12 * scale);
  if (unstable !== undefined) {
    throw new SpeedbandError(
      'tuning.unstablePlant',
      `the yaw-rate response has a pole at ${unstable.re.toPrecision(4)}${unstable.im === 0 ? '' : ` ± ${Math.abs(unstable.im).toPrecision(4)}j`} rad/s, not in the left half plane (oversteer above the critical speed?) — the tuning rules need a stable yaw-rate response; lower the speed or check the cornering stiffnesses`,
      { details: { poleReal_radps: unstable.re, poleImaginary_radps: unstable.im } },
    );
  }
  const gain = dcGain(g);
  if (gain === null || gain === 0 || !Number.isFinite(gain)) {
    throw new SpeedbandError(
      'tuning.noSteadyState',
      'the yaw-rate response has no finite non-zero steady-state gain, so no first-order-plus-dead-time approximation exists',
      {
        details: { numerator: [...g.numerator], denominator: [...g.denominator] },
      },
    );
  }
  const slowest_s = poles.reduce((longest, pole) => Math.max(longest, 1 / Math.abs(pole.re)), 0);
  let horizon_s = g.delay_s + 3 * slowest_s;
  for (let attempt = 0; attempt < 6; attempt++, horizon_s *= 2) {
    const time_s = new Float64Array(STEP_POINTS);
    for (let i = 0; i < STEP_POINTS; i++) time_s[i] = (horizon_s * i) / (STEP_POINTS - 1);
    const { output } = stepResponse(g, time_s);
    const normalised = output.map((y) => y / gain);
    const time28_s = crossing(time_s, normalised, 0.283);
    const time63_s = crossing(time_s, normalised, 0.632);
    if (time28_s === null || time63_s === null) continue;
    const tau = 1.5 * (time63_s - time28_s);
    const deadTime_s = Math.max(time63_s - tau, 0);
    return { gain, timeConstant_s: time63_s - deadTime_s, deadTime_s, time28_s, time63_s };
  }
  throw new SpeedbandError('tuning.noSteadyState', 'the yaw-rate step response does not reach 63 % of its final value — check the model', {
    details: { numerator: [...g.numerator], denominator: [...g.denominator] },
  });
}
