/**
 * Fast, exact response of a first-order lag with a continuous dead time,
 * K·e^(−θs)/(τs + 1), to a sampled input, either HELD between samples (zero-order
 * hold: what a rig or controller writing a command at samples produces, and what the
 * log simulator assumes) or LINEARLY INTERPOLATED between them (for a command that is
 * a continuous ramp sampled by the logger). The choice is `CommandHold`.
 *
 * Between samples t_j and t_j + h the input is u_j + m·s (m = slope, 0 when held), and the
 * lag state solves τẋ = −x + u_j + m·s exactly:
 *   x(t_j + s) = u_j + m(s − τ) + (x_j − u_j + mτ)·e^(−s/τ).
 * The output at t_k is K·x(t_k − θ), evaluated with the same formula at the
 * fractional offset, so the response is continuous in θ (no rounding of the delay
 * to samples): smooth with the interpolated command; with the command held it has a
 * kink wherever t_k − θ crosses a sample (ẋ jumps there). Before the first sample the
 * system rests at x = u_0; after the last the input is held. τ at or below
 * `FIRST_ORDER_LAG_NUMERICS.lagFreeTimeConstant_s` is treated as no lag and θ < 0 is
 * allowed (a time advance), so that derivative probes outside the bounds stay finite.
 *
 * Units: time in s, input in its own unit, output = gain × input unit.
 */

/** Numerical thresholds of the lag simulation (our choice; none changes a result beyond rounding). */
export const FIRST_ORDER_LAG_NUMERICS = {
  /** A time constant at or below this is no lag: the state follows the command (avoids e^(−h/τ) underflow and 1/τ²). */
  lagFreeTimeConstant_s: 1e-9,
  /** Two intervals (or offsets) closer than this share one decay factor e^(−h/τ) (uniform sampling computes it once). */
  decayReuseTolerance_s: 1e-12,
} as const;

const MIN_TIME_CONSTANT_S = FIRST_ORDER_LAG_NUMERICS.lagFreeTimeConstant_s;
const DECAY_REUSE_TOLERANCE_S = FIRST_ORDER_LAG_NUMERICS.decayReuseTolerance_s;

/** How the sampled command is taken between samples: held (zero-order hold) or linearly interpolated. */
export type CommandHold = 'zeroOrder' | 'linear';

/** The lag driven by a sampled command: what every function of this file takes. */
export interface FirstOrderLagInput {
  /** Sample times, s, increasing. */
  readonly time_s: Float64Array;
  /** The command at those times, in its own unit (same length as time_s). */
  readonly input: Float64Array;
  /** τ, s. */
  readonly timeConstant_s: number;
  /** How the command is taken between samples. */
  readonly hold: CommandHold;
}

/** A first-order lag plus dead time, K·e^(−θs)/(τs + 1), driven by a sampled command. */
export interface FopdtResponseInput extends FirstOrderLagInput {
  /** K, output unit per input unit. */
  readonly gain: number;
  /** θ, s (negative allowed: a time advance). */
  readonly deadTime_s: number;
}

/**
 * Lag state x at every sample (exact for the held and for the linearly interpolated command), starting from
 * rest at u_0, written into `states`. With `stateSensitivities`, also S = ∂x/∂τ at every sample (recursion in
 * `fopdtSensitivities`), in the same pass. Both arrays have the length of time_s.
 */
export function firstOrderStates(
  options: FirstOrderLagInput & { readonly states: Float64Array; readonly stateSensitivities?: Float64Array | null },
): Float64Array {
  const { time_s, input, timeConstant_s, hold } = options;
  const out = options.states;
  const sensitivity = options.stateSensitivities ?? null;
  const slopes = hold === 'linear' ? 1 : 0;
  const n = time_s.length;
  const tau = timeConstant_s;
  const inverseTauSquared = 1 / (tau * tau);
  out[0] = input[0];
  if (sensitivity !== null) sensitivity[0] = 0;
  // Uniform sampling reuses one decay factor (intervals compared within DECAY_REUSE_TOLERANCE_S).
  let lastH = Number.NaN;
  let decay = 0;
  for (let j = 0; j + 1 < n; j++) {
    const h = time_s[j + 1] - time_s[j];
    const u = input[j];
    const m = (slopes * (input[j + 1] - u)) / h;
    if (tau <= MIN_TIME_CONSTANT_S) {
      out[j + 1] = u + m * h;
      if (sensitivity !== null) sensitivity[j + 1] = 0;
    } else {
      if (!(Math.abs(h - lastH) <= DECAY_REUSE_TOLERANCE_S)) {
        lastH = h;
        decay = Math.exp(-h / tau);
      }
      if (sensitivity !== null) sensitivity[j + 1] = -m + (sensitivity[j] + m) * decay + (out[j] - u + m * tau) * decay * h * inverseTauSquared;
      out[j + 1] = u + m * (h - tau) + (out[j] - u + m * tau) * decay;
    }
  }
  return out;
}

/**
 * y_k = gain·x(t_k − deadTime_s) for the first-order lag driven by the command, held or linearly interpolated
 * as `hold` says (formula in the file comment). Written into `out` (a new array when not given); `states` is
 * scratch of the same length (reused to avoid allocation; a new array when not given).
 */
export function simulateFopdt(options: FopdtResponseInput & { readonly out?: Float64Array; readonly states?: Float64Array }): Float64Array {
  const n = options.time_s.length;
  const states = firstOrderStates({ ...options, states: options.states ?? new Float64Array(n), stateSensitivities: null });
  return delayedFirstOrderOutput({ ...options, states, out: options.out ?? new Float64Array(n) });
}

/**
 * The output part of simulateFopdt: y_k = gain·x(t_k − deadTime_s) from the lag states at the samples
 * (`firstOrderStates` with the same input, time constant and hold). Split out so that a grid over dead
 * times reuses one set of states per time constant. Units as in simulateFopdt.
 */
export function delayedFirstOrderOutput(options: FopdtResponseInput & { readonly states: Float64Array; readonly out: Float64Array }): Float64Array {
  const { time_s, input, gain, timeConstant_s, deadTime_s, hold, states, out } = options;
  const n = time_s.length;
  const tau = timeConstant_s;
  const lagFree = tau <= MIN_TIME_CONSTANT_S;
  const slopes = hold === 'linear' ? 1 : 0;
  const t0 = time_s[0];
  const tLast = time_s[n - 1];
  let j = 0;
  let lastS = Number.NaN;
  let decay = 0;
  for (let k = 0; k < n; k++) {
    const q = time_s[k] - deadTime_s;
    let x: number;
    if (q <= t0) {
      x = input[0];
    } else if (q >= tLast) {
      const s = q - tLast;
      const u = input[n - 1];
      x = lagFree ? u : u + (states[n - 1] - u) * Math.exp(-s / tau);
    } else {
      while (j + 1 < n - 1 && time_s[j + 1] <= q) j++;
      while (j > 0 && time_s[j] > q) j--;
      const s = q - time_s[j];
      const u = input[j];
      const m = (slopes * (input[j + 1] - u)) / (time_s[j + 1] - time_s[j]);
      if (!lagFree && !(Math.abs(s - lastS) <= DECAY_REUSE_TOLERANCE_S)) {
        lastS = s;
        decay = Math.exp(-s / tau);
      }
      x = lagFree ? u + m * s : u + m * (s - tau) + (states[j] - u + m * tau) * decay;
    }
    out[k] = gain * x;
  }
  return out;
}

/** Derivatives of simulateFopdt's output with respect to its three parameters, one column each (same length as time_s). */
export interface FopdtSensitivities {
  /** ∂y/∂K: the unit-gain response x(t_k − θ). */
  readonly gain: Float64Array;
  /** ∂y/∂τ, output units per s. */
  readonly timeConstant: Float64Array;
  /** ∂y/∂θ = −K·ẋ(t_k − θ), output units per s. */
  readonly deadTime: Float64Array;
}

/**
 * Exact derivatives of simulateFopdt (same formulas, differentiated). With the state sensitivity
 * S = ∂x/∂τ, over an interval of length h with d = e^(−h/τ):
 *   S_{j+1} = −m + (S_j + m)·d + (x_j − u_j + mτ)·d·h/τ²,  S_0 = 0,
 * and at the fractional offset s the same with e^(−s/τ); ẋ = m − (x_j − u_j + mτ)·e^(−s/τ)/τ.
 * With the command held, ẋ jumps at sample times: a point t_k − θ falling exactly on a sample
 * takes the interval before it, i.e. the derivative for a growing dead time (the side a fit at
 * θ = 0 can move to). No lag (τ ≤ lagFreeTimeConstant_s): ∂y/∂τ = 0. `states` and `stateSensitivities` are
 * scratch of the same length as time_s; the columns are written into `out`.
 */
export function fopdtSensitivities(
  options: FopdtResponseInput & { readonly out: FopdtSensitivities; readonly states: Float64Array; readonly stateSensitivities: Float64Array },
): FopdtSensitivities {
  const { time_s, input, gain, timeConstant_s, deadTime_s, hold, out, states, stateSensitivities } = options;
  const n = time_s.length;
  const tau = timeConstant_s;
  const lagFree = tau <= MIN_TIME_CONSTANT_S;
  const slopes = hold === 'linear' ? 1 : 0;
  const sensitivity = stateSensitivities;
  firstOrderStates({ time_s, input, timeConstant_s: tau, hold, states, stateSensitivities: sensitivity });
  const inverseTauSquared = lagFree ? 0 : 1 / (tau * tau);
  let decay = 0;
  const t0 = time_s[0];
  const tLast = time_s[n - 1];
  let j = 0;
  let lastS = Number.NaN;
  for (let k = 0; k < n; k++) {
    const q = time_s[k] - deadTime_s;
    let x: number;
    let dxdTau: number;
    let rate: number;
    if (q <= t0) {
      x = input[0];
      dxdTau = 0;
      rate = 0;
    } else if (q > tLast) {
      const s = q - tLast;
      const u = input[n - 1];
      if (lagFree) {
        x = u;
        dxdTau = 0;
        rate = 0;
      } else {
        const e = Math.exp(-s / tau);
        const away = (states[n - 1] - u) * e;
        x = u + away;
        dxdTau = sensitivity[n - 1] * e + away * s * inverseTauSquared;
        rate = -away / tau;
      }
    } else {
      while (j + 1 < n - 1 && time_s[j + 1] < q) j++;
      while (j > 0 && time_s[j] >= q) j--;
      const s = q - time_s[j];
      const u = input[j];
      const m = (slopes * (input[j + 1] - u)) / (time_s[j + 1] - time_s[j]);
      if (lagFree) {
        x = u + m * s;
        dxdTau = 0;
        rate = m;
      } else {
        if (!(Math.abs(s - lastS) <= DECAY_REUSE_TOLERANCE_S)) {
          lastS = s;
          decay = Math.exp(-s / tau);
        }
        const away = (states[j] - u + m * tau) * decay;
        x = u + m * (s - tau) + away;
        dxdTau = -m + (sensitivity[j] + m) * decay + away * s * inverseTauSquared;
        rate = m - away / tau;
      }
    }
    out.gain[k] = x;
    out.timeConstant[k] = gain * dxdTau;
    out.deadTime[k] = -gain * rate;
  }
  return out;
}
