/**
 * Exact simulation of the linear single-track model at constant speed behind a
 * steering actuator with transport delay, first-order lag, angle and rate limits.
 *
 * Command: given at uniform samples t_k and held constant between them (zero-order
 * hold, the usual assumption for a command a controller or test rig writes at samples).
 *
 * Actuator, with c(t) = clamp(u(t − θa), ±δmax) the delayed and angle-limited command:
 *   τa > 0:  δ̇ = clamp((c − δ)/τa, ±δ̇max)   — a rate-limited first-order position loop;
 *   τa = 0:  δ moves towards c at ±δ̇max and stays there (δ = c at once without a rate limit).
 * The rate limit saturates the lag state's derivative. Within an interval where c is
 * constant, |c − δ| only shrinks, so the solution is a ramp at δ̇max until |c − δ| = τa·δ̇max
 * and then the exponential approach: the switching instant is known in closed form,
 * and each piece is linear with constant input. Every piece is therefore integrated
 * exactly with the matrix exponential of the augmented state [vy, r, δ] — no Euler steps.
 *
 * A lag below 10⁻⁶ of the sample period is treated as 0.
 * The delay is exact for any value: θa = (n + f)·T splits each sample interval at f·T,
 * where the delayed command switches. The vehicle starts at rest (vy = r = δ = 0) and the
 * command before t_0 is taken as 0.
 *
 * Outputs at each t_k: states are continuous; δ and ay are reported as their values
 * just before any jump at t_k (a jump exists only with τa = 0 and no rate limit).
 */
import { SpeedbandError } from '../core/errors.js';
import { matrixExponential } from '../lti/matrix-exponential.js';
import { singleTrackStateSpace } from './single-track.js';
import type { SingleTrackParameters } from './types.js';

/** Input of simulateSingleTrack: parameters, speed, time grid, steer command and the actuator limits. */
export interface SingleTrackSimulationInput {
  readonly params: SingleTrackParameters;
  /** Constant forward speed, m/s (> 0). */
  readonly speed_mps: number;
  /** Uniformly sampled time, s (strictly increasing, constant step). */
  readonly time_s: Float64Array;
  /** Road-wheel angle command at each sample, rad, positive left (ISO 8855); held between samples. */
  readonly steerCommand_rad: Float64Array;
  /** Largest road-wheel angle, rad; the command is clamped to ±this (default: no limit). */
  readonly maxSteerAngle_rad?: number;
  /** Largest road-wheel angle rate, rad/s (default: no limit). */
  readonly maxSteerRate_radps?: number;
}

/** Simulated signals at each sample time, SI units, ISO 8855 signs. */
export interface SingleTrackSimulation {
  readonly yawRate_radps: Float64Array;
  readonly lateralVelocity_mps: Float64Array;
  readonly lateralAcceleration_mps2: Float64Array;
  /** Road-wheel angle after delay, lag and limits, rad. */
  readonly steerAngle_rad: Float64Array;
}

/** Relative tolerance on the sample period of "uniformly sampled" time. */
const UNIFORM_TOLERANCE = 1e-6;
/** A delay within this fraction of a sample of a whole number of samples is taken as whole. */
const DELAY_SNAP = 1e-9;

/** Lags below this fraction of the sample period are simulated as 0 (their e^(−T/τa) underflows to 0). */
const NEGLIGIBLE_LAG = 1e-6;

/** Exact discretisation over h of ż = F z + G w with w constant: z(h) = Φ z(0) + Γ w. */
interface Step {
  readonly phi: Float64Array; // 3×3 row-major
  readonly gamma: Float64Array; // 3
}

function discretise(f: readonly number[][], g: readonly number[], h: number): Step {
  const augmented = [
    [f[0][0] * h, f[0][1] * h, f[0][2] * h, g[0] * h],
    [f[1][0] * h, f[1][1] * h, f[1][2] * h, g[1] * h],
    [f[2][0] * h, f[2][1] * h, f[2][2] * h, g[2] * h],
    [0, 0, 0, 0],
  ];
  const e = matrixExponential(augmented);
  return {
    phi: Float64Array.of(e[0][0], e[0][1], e[0][2], e[1][0], e[1][1], e[1][2], e[2][0], e[2][1], e[2][2]),
    gamma: Float64Array.of(e[0][3], e[1][3], e[2][3]),
  };
}

function apply(step: Step, z: Float64Array, w: number): void {
  const { phi, gamma } = step;
  const z0 = z[0];
  const z1 = z[1];
  const z2 = z[2];
  z[0] = phi[0] * z0 + phi[1] * z1 + phi[2] * z2 + gamma[0] * w;
  z[1] = phi[3] * z0 + phi[4] * z1 + phi[5] * z2 + gamma[1] * w;
  z[2] = phi[6] * z0 + phi[7] * z1 + phi[8] * z2 + gamma[2] * w;
}

function invalid(message: string, details: Record<string, unknown>): SpeedbandError {
  return new SpeedbandError('simulate.invalidInput', message, { details });
}

function checkInput(input: SingleTrackSimulationInput): number {
  const { time_s, steerCommand_rad } = input;
  if (time_s.length !== steerCommand_rad.length) {
    throw invalid(`time_s has ${time_s.length} samples but steerCommand_rad has ${steerCommand_rad.length} — give one command per sample`, {});
  }
  if (time_s.length < 2) throw invalid(`need at least 2 samples to know the sample period, got ${time_s.length}`, {});
  const period_s = (time_s[time_s.length - 1] - time_s[0]) / (time_s.length - 1);
  if (!(period_s > 0)) throw invalid(`time_s must increase, got ${time_s[0]} … ${time_s[time_s.length - 1]} s`, {});
  for (let k = 1; k < time_s.length; k += 1) {
    if (Math.abs(time_s[k] - time_s[k - 1] - period_s) > UNIFORM_TOLERANCE * period_s) {
      throw invalid(
        `time_s must be uniformly sampled at ${period_s} s, found a step of ${time_s[k] - time_s[k - 1]} s at sample ${k} — resample the command first`,
        { sample: k },
      );
    }
  }
  for (let k = 0; k < steerCommand_rad.length; k += 1) {
    if (!Number.isFinite(steerCommand_rad[k]))
      throw invalid(`steerCommand_rad is ${steerCommand_rad[k]} at sample ${k}, expected a finite angle in rad`, { sample: k });
  }
  const { actuatorLag_s, actuatorDelay_s } = input.params;
  if (!(actuatorLag_s >= 0 && actuatorDelay_s >= 0)) throw invalid(`actuator lag and delay must be ≥ 0 s, got ${actuatorLag_s} s and ${actuatorDelay_s} s`, {});
  const rate = input.maxSteerRate_radps ?? Infinity;
  const angle = input.maxSteerAngle_rad ?? Infinity;
  if (!(rate > 0 && angle > 0)) throw invalid(`steer angle and rate limits must be above 0, got ${angle} rad and ${rate} rad/s`, {});
  return period_s;
}

/**
 * Simulate the single-track model with actuator at constant speed for a sampled steer command
 * (see the file comment for the exact method). Units: rad, rad/s, m/s, m/s²; ISO 8855 signs.
 * Throws `simulate.invalidInput` for mismatched lengths, non-uniform time or bad limits,
 * and `vehicle.speedNotPositive` for a speed ≤ 0.
 */
export function simulateSingleTrack(input: SingleTrackSimulationInput): SingleTrackSimulation {
  const period_s = checkInput(input);
  const { params, speed_mps, steerCommand_rad: command } = input;
  const maxAngle = input.maxSteerAngle_rad ?? Infinity;
  const maxRate = input.maxSteerRate_radps ?? Infinity;
  // A lag below a millionth of the sample period decays by e^(−10⁶) within one sample: a pure delay.
  const lag = params.actuatorLag_s < NEGLIGIBLE_LAG * period_s ? 0 : params.actuatorLag_s;
  const { A, B, C } = singleTrackStateSpace(params, speed_mps);

  const delaySamples = params.actuatorDelay_s / period_s;
  let whole = Math.floor(delaySamples + DELAY_SNAP);
  let fraction = delaySamples - whole;
  if (fraction < DELAY_SNAP) fraction = 0;
  if (whole < 0) whole = 0;
  const split_s = fraction * period_s;
  const standardLengths = new Set([period_s, split_s, period_s - split_s]);
  // ż = F z + G w for the two kinds of piece: tracking the command through the lag (w = c),
  // and a free-running wheel angle moving at a fixed rate (w = δ̇; 0 holds it).
  const free = [
    [A[0][0], A[0][1], B[0][0]],
    [A[1][0], A[1][1], B[1][0]],
    [0, 0, 0],
  ];
  const track = lag > 0 ? [free[0], free[1], [0, 0, -1 / lag]] : free;
  const trackInput = [0, 0, lag > 0 ? 1 / lag : 0];
  const rateInput = [0, 0, 1];
  // Pieces of the standard lengths (a sample period and the two parts of a split one) are
  // discretised once; pieces cut by a rate-limit switching instant are discretised when met.
  const cache = new Map<string, Step>();
  const stepFor = (kind: 'track' | 'free', h: number): Step => {
    const key = `${kind}:${h}`;
    const cached = cache.get(key);
    if (cached !== undefined) return cached;
    const step = kind === 'track' ? discretise(track, trackInput, h) : discretise(free, rateInput, h);
    if (standardLengths.has(h)) cache.set(key, step);
    return step;
  };

  const z = new Float64Array(3);
  const advance = (c: number, h: number): void => {
    if (h <= 0) return;
    const error = c - z[2];
    const direction = Math.sign(error);
    if (lag > 0) {
      const band = maxRate * lag;
      let remaining = h;
      if (Math.abs(error) > band) {
        const ramp_s = (Math.abs(error) - band) / maxRate;
        if (ramp_s >= remaining) {
          apply(stepFor('free', remaining), z, direction * maxRate);
          return;
        }
        apply(stepFor('free', ramp_s), z, direction * maxRate);
        z[2] = c - direction * band;
        remaining -= ramp_s;
      }
      apply(stepFor('track', remaining), z, c);
      return;
    }
    if (error !== 0 && !Number.isFinite(maxRate)) z[2] = c;
    if (z[2] === c) {
      apply(stepFor('free', h), z, 0);
      return;
    }
    const ramp_s = Math.abs(error) / maxRate;
    if (ramp_s >= h) {
      apply(stepFor('free', h), z, direction * maxRate);
      return;
    }
    apply(stepFor('free', ramp_s), z, direction * maxRate);
    z[2] = c;
    apply(stepFor('free', h - ramp_s), z, 0);
  };

  const delayed = (j: number): number => (j < 0 ? 0 : Math.min(maxAngle, Math.max(-maxAngle, command[j])));

  const count = command.length;
  const yawRate = new Float64Array(count);
  const lateralVelocity = new Float64Array(count);
  const lateralAcceleration = new Float64Array(count);
  const steerAngle = new Float64Array(count);
  for (let k = 0; k < count; k += 1) {
    yawRate[k] = z[1];
    lateralVelocity[k] = z[0];
    steerAngle[k] = z[2];
    lateralAcceleration[k] = C[2][0] * z[0] + C[2][1] * z[1] + B[0][0] * z[2];
    if (k === count - 1) break;
    // Over [t_k, t_k+1): u(t − θa) is u_(k−n−1) until t_k + f·T, then u_(k−n).
    if (fraction > 0) {
      advance(delayed(k - whole - 1), split_s);
      advance(delayed(k - whole), period_s - split_s);
    } else {
      advance(delayed(k - whole), period_s);
    }
  }
  return { yawRate_radps: yawRate, lateralVelocity_mps: lateralVelocity, lateralAcceleration_mps2: lateralAcceleration, steerAngle_rad: steerAngle };
}
