/**
 * THE controller equation of a schedule, one sample at a time: what the firmware runs and what every
 * time-domain figure of a build is computed with (src/performance), so the two cannot differ.
 * Two-degree-of-freedom PID with a filtered derivative (Åström & Hägglund, Advanced PID Control, 2006,
 * §3.4 set-point weighting, §3.3 derivative filter, §3.5 integrator windup), a feed-forward term, the
 * discretisation of discrete.ts, an integrator clamp that leaves room for the feed-forward, and
 * anti-windup by conditional integration or back-calculation:
 *
 *   e_k  = r_k − y_k                                       error (the integral acts on it)
 *   F_k  = kff·w_k                                         feed-forward (w: path curvature or yaw-rate reference)
 *   P_k  = kp·(b·r_k − y_k)                                proportional, set-point weight b
 *   D_k  = p·D_(k−1) + g·(d_k − d_(k−1)),  d_k = c·r_k − y_k   derivative, set-point weight c (usually 0)
 *   I_k  = I_(k−1) + wc·(ki·e)_k + wp·(ki·e)_(k−1) [+ Ts·(u_(k−1) − v_(k−1))/Tt, back-calculation,
 *          Tt = √(Ti·Td), Ti = kp/ki, Td = kd/kp; Tt = Ti when kd = 0 — Åström & Hägglund 2006, §3.5]
 *          then clamped to [−Imax − F_k, Imax − F_k]        (F_k + I_k stays within ±Imax)
 *   v_k  = F_k + P_k + I_k + D_k                            unsaturated command
 *   u_k  = clamp(v_k, ±umax)                                 road-wheel angle command, rad
 *   conditional integration: when v_k is beyond ±umax and the integral increment pushes it further,
 *   I_k = I_(k−1) (the increment is dropped).
 *
 * wc, wp, p, g as in discretePidCoefficients (backward Euler or Tustin; Tf = Td/N). The integral
 * accumulates ki·e (the current gain inside the sum), so a gain change with speed moves no stored
 * state (bumpless). The first sample takes d_(−1) = d_0: no derivative kick from an initial error.
 * With b = 1, c = 1, kff = 0 and no limits reached this is discretePidStep exactly.
 */
import { clamp } from '../core/clamp.js';
import { derivativeFilterTime_s } from './pid.js';
import type { ControllerSettings } from './types.js';

/** How the integrator is kept from winding up while the command is limited. */
export type AntiWindup = 'conditional-integration' | 'back-calculation';

/** The scheduled numbers at one speed: PID gains, set-point weights and feed-forward gain. */
export interface FirmwareGains {
  readonly kp: number;
  readonly ki: number;
  readonly kd: number;
  /** b: the proportional term acts on b·r − y (0 ≤ b ≤ 1). */
  readonly setpointWeightProportional: number;
  /** c: the derivative term acts on c·r − y (usually 0: no derivative kick on reference steps). */
  readonly setpointWeightDerivative: number;
  /** kff: command per unit feed-forward input (rad per 1/m of path curvature, or rad per rad/s of yaw-rate reference). */
  readonly feedForward: number;
}

/** What the firmware runs beyond the gains. Infinite limits give the linear controller. */
export interface FirmwareSettings extends ControllerSettings {
  readonly antiWindup: AntiWindup;
  /** The command is clamped to ±this, rad (the steering-angle limit; Infinity: none). */
  readonly commandLimit_rad: number;
  /** F + I is kept within ±this, rad (Infinity: none). */
  readonly integratorClamp_rad: number;
}

/** The controller's memory between samples; start from initialFirmwareState(). */
export interface FirmwareState {
  readonly integral: number;
  readonly derivative: number;
  /** d_(k−1) = c·r − y of the previous sample (null before the first). */
  readonly previousDerivativeInput: number | null;
  /** (ki·e)_(k−1). */
  readonly previousIntegrand: number;
  /** u_(k−1) − v_(k−1): how far the last command was limited (for back-calculation). */
  readonly previousSaturation: number;
}

/** The controller state at start: integral, filter and previous values at zero. */
export function initialFirmwareState(): FirmwareState {
  return { integral: 0, derivative: 0, previousDerivativeInput: null, previousIntegrand: 0, previousSaturation: 0 };
}

/** The signals of one sample. */
export interface FirmwareInput {
  /** r_k, the loop's reference (yaw rate, heading or lateral position of the path at the preview point). */
  readonly reference: number;
  /** y_k, the measured loop output. */
  readonly measurement: number;
  /** w_k, the feed-forward input (path curvature at the preview point, 1/m; or the yaw-rate reference, rad/s). */
  readonly feedForwardInput: number;
}

/** One sample of the controller: the steer command (rad) and what limited it. */
export interface FirmwareOutput {
  /** u_k, the road-wheel angle command after the limit, rad. */
  readonly command: number;
  /** v_k, before the limit, rad. */
  readonly unlimited: number;
  readonly state: FirmwareState;
}

/** Back-calculation tracking time Tt = √(Ti·Td) (Ti when kd = 0), s, from the gains; Åström & Hägglund 2006, §3.5. */
export function trackingTime_s(gains: { readonly kp: number; readonly ki: number; readonly kd: number }): number {
  const ti = gains.kp === 0 ? Math.sqrt(Math.abs(gains.kd / gains.ki)) : gains.kp / gains.ki;
  const td = gains.kp === 0 ? 0 : gains.kd / gains.kp;
  return td > 0 ? Math.sqrt(ti * td) : ti;
}

/** One sample of the controller equation (see the file comment). Settings are assumed validated. */
export function firmwareStep(gains: FirmwareGains, settings: FirmwareSettings, state: FirmwareState, input: FirmwareInput): FirmwareOutput {
  const t = settings.sampleTime_s;
  const { reference: r, measurement: y } = input;
  const tf = derivativeFilterTime_s(gains, settings.derivativeFilter);
  const tustin = settings.discretisation === 'tustin';
  const feedForward = gains.feedForward * input.feedForwardInput;
  const proportional = gains.kp * (gains.setpointWeightProportional * r - y);
  const derivativeInput = gains.setpointWeightDerivative * r - y;
  const difference = state.previousDerivativeInput === null ? 0 : derivativeInput - state.previousDerivativeInput;
  const derivative = tustin
    ? ((2 * tf - t) / (2 * tf + t)) * state.derivative + ((2 * gains.kd) / (2 * tf + t)) * difference
    : (tf / (tf + t)) * state.derivative + (gains.kd / (tf + t)) * difference;
  const integrand = gains.ki * (r - y);
  let increment = tustin ? (t / 2) * (integrand + state.previousIntegrand) : t * integrand;
  if (settings.antiWindup === 'back-calculation' && state.previousSaturation !== 0 && gains.ki !== 0)
    increment += (t * state.previousSaturation) / trackingTime_s(gains);
  // The integral is clamped so that feed-forward plus integral stays within ±integratorClamp_rad.
  const high = settings.integratorClamp_rad - feedForward;
  const low = -settings.integratorClamp_rad - feedForward;
  let integral = clamp(state.integral + increment, low, high);
  let unlimited = feedForward + proportional + integral + derivative;
  const limit = settings.commandLimit_rad;
  if (settings.antiWindup === 'conditional-integration' && Math.abs(unlimited) > limit && Math.sign(increment) === Math.sign(unlimited)) {
    integral = clamp(state.integral, low, high);
    unlimited = feedForward + proportional + integral + derivative;
  }
  const command = unlimited > limit ? limit : unlimited < -limit ? -limit : unlimited;
  return {
    command,
    unlimited,
    state: { integral, derivative, previousDerivativeInput: derivativeInput, previousIntegrand: integrand, previousSaturation: command - unlimited },
  };
}
