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
 * fractional offset, so the response is continuous and smooth in θ (no rounding
 * of the delay to samples). Before the first sample the system rests at x = u_0;
 * after the last the input is held. τ ≤ 1e−9 s is treated as no lag and θ < 0 is
 * allowed (a time advance), so that derivative probes outside the bounds stay finite.
 *
 * Units: time in s, input in its own unit, output = gain × input unit.
 */
const MIN_TIME_CONSTANT_S = 1e-9;

/** How the sampled command is taken between samples: held (zero-order hold) or linearly interpolated. */
export type CommandHold = 'zeroOrder' | 'linear';

/**
 * Lag state at every sample (exact for the linearly interpolated input), starting from rest at u_0.
 * With `sensitivity`, also S = ∂x/∂τ at every sample (recursion in `fopdtSensitivities`), in the same pass.
 */
export function firstOrderStates(
  time_s: Float64Array,
  input: Float64Array,
  timeConstant_s: number,
  hold: CommandHold,
  out: Float64Array,
  sensitivity: Float64Array | null = null,
): Float64Array {
  const slopes = hold === 'linear' ? 1 : 0;
  const n = time_s.length;
  const tau = timeConstant_s;
  const inverseTauSquared = 1 / (tau * tau);
  out[0] = input[0];
  if (sensitivity !== null) sensitivity[0] = 0;
  // Uniform sampling reuses one decay factor (the interval is compared to 1e−12 s).
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
      if (!(Math.abs(h - lastH) <= 1e-12)) {
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
 * y_k = gain·x(t_k − deadTime_s) for the first-order lag driven by the linearly interpolated input
 * (formula in the file comment). `states` is scratch of the same length (reused to avoid allocation).
 */
export function simulateFopdt(
  time_s: Float64Array,
  input: Float64Array,
  gain: number,
  timeConstant_s: number,
  deadTime_s: number,
  hold: CommandHold,
  out: Float64Array = new Float64Array(time_s.length),
  states: Float64Array = new Float64Array(time_s.length),
): Float64Array {
  firstOrderStates(time_s, input, timeConstant_s, hold, states);
  return delayedFirstOrderOutput(time_s, input, gain, timeConstant_s, deadTime_s, hold, states, out);
}

/**
 * The output part of simulateFopdt: y_k = gain·x(t_k − deadTime_s) from the lag states at the samples
 * (`firstOrderStates` with the same input, time constant and hold). Split out so that a grid over dead
 * times reuses one set of states per time constant. Units as in simulateFopdt.
 */
export function delayedFirstOrderOutput(
  time_s: Float64Array,
  input: Float64Array,
  gain: number,
  timeConstant_s: number,
  deadTime_s: number,
  hold: CommandHold,
  states: Float64Array,
  out: Float64Array,
): Float64Array {
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
      if (!lagFree && !(Math.abs(s - lastS) <= 1e-12)) {
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
 * θ = 0 can move to). No lag (τ ≤ 1e−9 s): ∂y/∂τ = 0. `states` and `stateSensitivities` are
 * scratch of the same length as time_s; the columns are written into `out`.
 */
export function fopdtSensitivities(
  time_s: Float64Array,
  input: Float64Array,
  gain: number,
  timeConstant_s: number,
  deadTime_s: number,
  hold: CommandHold,
  out: FopdtSensitivities,
  states: Float64Array,
  stateSensitivities: Float64Array,
): FopdtSensitivities {
  const n = time_s.length;
  const tau = timeConstant_s;
  const lagFree = tau <= MIN_TIME_CONSTANT_S;
  const slopes = hold === 'linear' ? 1 : 0;
  const sensitivity = stateSensitivities;
  firstOrderStates(time_s, input, tau, hold, states, sensitivity);
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
        if (!(Math.abs(s - lastS) <= 1e-12)) {
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
