/**
 * The discrete PID the firmware runs every sample time T (docs/domain.md §7), with the
 * derivative on the error, filtered, and the integral accumulating ki·e (not ki·∫e),
 * so a gain change between samples moves no stored state and causes no output jump:
 *
 *   P_k = kp·e_k
 *   I_k = I_(k−1) + wc·(ki·e)_k + wp·(ki·e)_(k−1)      backward Euler wc = T,   wp = 0
 *                                                       Tustin         wc = T/2, wp = T/2
 *   D_k = p·D_(k−1) + g·(e_k − e_(k−1))                 backward Euler p = Tf/(Tf + T),     g = kd/(Tf + T)
 *                                                       Tustin         p = (2Tf − T)/(2Tf + T), g = 2kd/(2Tf + T)
 *   u_k = P_k + I_k + D_k
 * (s replaced by (1 − z⁻¹)/T or (2/T)(1 − z⁻¹)/(1 + z⁻¹) in kp + ki/s + kd·s/(1 + Tf·s);
 * Franklin, Powell & Workman, Digital Control of Dynamic Systems, §6.3; Åström &
 * Hägglund 2006, §3.6). Tf = Td/N from derivativeFilterTime_s.
 * Tustin's filter pole p → −1 as Tf → 0 (2Tf < T makes it negative: the derivative
 * term alternates sign each sample, "ringing"); backward Euler's stays in [0, 1).
 */
import { SpeedbandError } from '../core/errors.js';
import type { FrequencyResponse } from '../lti/types.js';
import { derivativeFilterTime_s } from './pid.js';
import type { ControllerSettings, PidGains } from './types.js';

/** A finding about a discrete controller that is not an error but must be shown. */
export interface ControllerWarning {
  readonly code: string;
  readonly message: string;
}

/** Coefficients of the difference equation above, plus its transfer function in z⁻¹. */
export interface DiscretePidCoefficients {
  readonly sampleTime_s: number;
  readonly discretisation: ControllerSettings['discretisation'];
  /** kp, multiplies e_k. */
  readonly proportionalGain: number;
  /** wc (s): weight of (ki·e)_k in the integral update. */
  readonly integralWeightCurrent_s: number;
  /** wp (s): weight of (ki·e)_(k−1) in the integral update. */
  readonly integralWeightPrevious_s: number;
  /** ki, for the products (ki·e)_k. */
  readonly integralGain: number;
  /** Tf (s), the continuous derivative filter time constant. */
  readonly derivativeFilterTime_s: number;
  /** p, the discrete derivative-filter pole (D_k = p·D_(k−1) + …); 0 when kd = 0 (no derivative state). */
  readonly derivativeFilterPole: number;
  /** g, multiplies (e_k − e_(k−1)) in the derivative update. */
  readonly derivativeDifferenceGain: number;
  /**
   * C(z) numerator, coefficients of z⁰, z⁻¹, z⁻² (fixed gains). Without integral or
   * derivative action the cancelled factor is left out, so the lists may be shorter.
   */
  readonly numerator: readonly number[];
  /** C(z) denominator, coefficients of z⁰, z⁻¹, …: (1 − z⁻¹)(1 − p·z⁻¹) with ki ≠ 0 and kd ≠ 0. */
  readonly denominator: readonly number[];
  /** The difference equation in words and symbols, for exports. */
  readonly equation: string;
  readonly warnings: readonly ControllerWarning[];
}

export const DISCRETE_PID_EQUATION = 'u_k = kp*e_k + I_k + D_k; I_k = I_(k-1) + wc*(ki*e)_k + wp*(ki*e)_(k-1); D_k = p*D_(k-1) + g*(e_k - e_(k-1))';

/**
 * The coefficients of the discrete PID for gains at sample time settings.sampleTime_s
 * (s) with settings.discretisation; see the module comment for the equation. Throws
 * `controller.invalidSettings` for T ≤ 0, N ≤ 0, a negative latency or an unknown
 * discretisation. Warns (`controller.derivativeRinging`) when the Tustin filter pole
 * is ≤ 0, i.e. 2·Tf ≤ T.
 */
export function discretePidCoefficients(gains: PidGains, settings: ControllerSettings): DiscretePidCoefficients {
  validateSettings(settings);
  const { kp, ki, kd } = gains;
  const t = settings.sampleTime_s;
  const tf = derivativeFilterTime_s(gains, settings.derivativeFilter);
  const tustin = settings.discretisation === 'tustin';
  const weightCurrent = tustin ? t / 2 : t;
  const weightPrevious = tustin ? t / 2 : 0;
  const pole = tustin ? (2 * tf - t) / (2 * tf + t) : tf / (tf + t);
  const differenceGain = tustin ? (2 * kd) / (2 * tf + t) : kd / (tf + t);
  const warnings: ControllerWarning[] = [];
  if (tustin && kd !== 0 && pole <= 0) {
    warnings.push({
      code: 'controller.derivativeRinging',
      message: `Tustin derivative filter pole is ${pole.toPrecision(3)} (Tf = ${tf.toPrecision(3)} s, T = ${t} s): the derivative term alternates sign every sample${pole === -1 ? ' and never decays' : ''} — use backward Euler or a filter time Tf = Td/N above T/2`,
    });
  }
  const { numerator, denominator } = combinedTransferFunction(kp, ki * weightCurrent, ki * weightPrevious, differenceGain, kd === 0 ? 0 : pole);
  return {
    sampleTime_s: t,
    discretisation: settings.discretisation,
    proportionalGain: kp,
    integralWeightCurrent_s: weightCurrent,
    integralWeightPrevious_s: weightPrevious,
    integralGain: ki,
    derivativeFilterTime_s: tf,
    derivativeFilterPole: kd === 0 ? 0 : pole,
    derivativeDifferenceGain: differenceGain,
    numerator,
    denominator,
    equation: DISCRETE_PID_EQUATION,
    warnings,
  };
}

/**
 * C(z) = kp + (i0 + i1·z⁻¹)/(1 − z⁻¹) + d0·(1 − z⁻¹)/(1 − p·z⁻¹) over one denominator,
 * coefficients of z⁰, z⁻¹, z⁻². A term that is absent leaves its pole out (no
 * cancelled factor, so no 0/0 at ω = 0 or at the Nyquist frequency).
 */
function combinedTransferFunction(kp: number, i0: number, i1: number, d0: number, p: number): { numerator: number[]; denominator: number[] } {
  const integral = i0 !== 0 || i1 !== 0;
  const derivative = d0 !== 0;
  if (integral && derivative) {
    return {
      numerator: [kp + i0 + d0, -kp * (1 + p) + i1 - i0 * p - 2 * d0, kp * p - i1 * p + d0],
      denominator: [1, -(1 + p), p],
    };
  }
  if (integral) return { numerator: [kp + i0, -kp + i1], denominator: [1, -1] };
  if (derivative) return { numerator: [kp + d0, -kp * p - d0], denominator: [1, -p] };
  return { numerator: [kp], denominator: [1] };
}

/**
 * C(e^(jωT)) of the discrete PID at each ω in frequency_radps (rad/s), from the
 * z⁻¹ transfer function of discretePidCoefficients (controller only: the hold and
 * computation delay are in samplingDelay_s). At ω = 0 the integrator gives ±∞/NaN
 * when ki ≠ 0. Valid up to the Nyquist frequency π/T (the response is periodic).
 */
export function discretePidFrequencyResponse(gains: PidGains, settings: ControllerSettings, frequency_radps: Float64Array): FrequencyResponse {
  const { numerator: b, denominator: a } = discretePidCoefficients(gains, settings);
  const t = settings.sampleTime_s;
  const count = frequency_radps.length;
  const real = new Float64Array(count);
  const imaginary = new Float64Array(count);
  const b1 = b[1] ?? 0;
  const b2 = b[2] ?? 0;
  const a1 = a[1] ?? 0;
  const a2 = a[2] ?? 0;
  for (let k = 0; k < count; k++) {
    const angle = frequency_radps[k] * t;
    const c1 = Math.cos(angle);
    const s1 = Math.sin(angle);
    const c2 = Math.cos(2 * angle);
    const s2 = Math.sin(2 * angle);
    // z⁻¹ = cos − j·sin
    const nRe = b[0] + b1 * c1 + b2 * c2;
    const nIm = -b1 * s1 - b2 * s2;
    const dRe = a[0] + a1 * c1 + a2 * c2;
    const dIm = -a1 * s1 - a2 * s2;
    const d2 = dRe * dRe + dIm * dIm;
    real[k] = (nRe * dRe + nIm * dIm) / d2;
    imaginary[k] = (nIm * dRe - nRe * dIm) / d2;
  }
  return { frequency_radps: Float64Array.from(frequency_radps), real, imaginary };
}

/**
 * Delay (s) that the sampled implementation adds to the loop: the zero-order hold
 * behaves like a delay of T/2 at frequencies well below π/T (Franklin, Powell &
 * Workman §6.2; docs/domain.md §5), plus the computation latency from sample to command.
 */
export function samplingDelay_s(settings: ControllerSettings): number {
  validateSettings(settings);
  return settings.sampleTime_s / 2 + settings.computationLatency_s;
}

function validateSettings(settings: ControllerSettings): void {
  const problems: string[] = [];
  if (!(Number.isFinite(settings.sampleTime_s) && settings.sampleTime_s > 0))
    problems.push(`sampleTime_s is ${settings.sampleTime_s} — expected a finite time > 0 s`);
  if (!(settings.derivativeFilter > 0)) problems.push(`derivativeFilter is ${settings.derivativeFilter} — expected N > 0 (Infinity means unfiltered)`);
  if (!(Number.isFinite(settings.computationLatency_s) && settings.computationLatency_s >= 0)) {
    problems.push(`computationLatency_s is ${settings.computationLatency_s} — expected a finite time ≥ 0 s`);
  }
  if (settings.discretisation !== 'tustin' && settings.discretisation !== 'backward-euler') {
    problems.push(`discretisation is ${JSON.stringify(settings.discretisation)} — expected "tustin" or "backward-euler"`);
  }
  if (problems.length > 0) {
    throw new SpeedbandError('controller.invalidSettings', `controller settings: ${problems.join('; ')}`, { details: { ...settings } });
  }
}
