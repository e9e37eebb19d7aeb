/**
 * One sample of the firmware's discrete PID (the equation of discrete.ts), for
 * closed-loop simulations with gains that change from sample to sample (a speed
 * schedule). The integral stores Σ w·(ki·e), so a change of ki moves no stored
 * state: bumpless (docs/domain.md §7).
 */
import { derivativeFilterTime_s } from './pid.js';
import type { ControllerSettings, PidGains } from './types.js';

/** What the controller remembers between samples; start from initialDiscretePidState(). */
export interface DiscretePidState {
  /** I_(k−1), output units. */
  readonly integral: number;
  /** D_(k−1), output units. */
  readonly derivative: number;
  /** e_(k−1), error units (null before the first sample: the first difference is 0). */
  readonly previousError: number | null;
  /** (ki·e)_(k−1), output units per s. */
  readonly previousIntegrand: number;
}

export function initialDiscretePidState(): DiscretePidState {
  return { integral: 0, derivative: 0, previousError: null, previousIntegrand: 0 };
}

/**
 * u_k for the error e_k with this sample's gains, and the state for the next sample.
 * Settings are assumed validated (discretePidCoefficients validates them). The
 * first sample takes e_(−1) = e_0, so a non-zero initial error gives no derivative kick.
 */
export function discretePidStep(
  gains: PidGains,
  settings: ControllerSettings,
  state: DiscretePidState,
  error: number,
): { output: number; state: DiscretePidState } {
  const t = settings.sampleTime_s;
  const tf = derivativeFilterTime_s(gains, settings.derivativeFilter);
  const tustin = settings.discretisation === 'tustin';
  const integrand = gains.ki * error;
  const integral = state.integral + (tustin ? (t / 2) * (integrand + state.previousIntegrand) : t * integrand);
  const difference = state.previousError === null ? 0 : error - state.previousError;
  const derivative = tustin
    ? ((2 * tf - t) / (2 * tf + t)) * state.derivative + ((2 * gains.kd) / (2 * tf + t)) * difference
    : (tf / (tf + t)) * state.derivative + (gains.kd / (tf + t)) * difference;
  return {
    output: gains.kp * error + integral + derivative,
    state: { integral, derivative, previousError: error, previousIntegrand: integrand },
  };
}
