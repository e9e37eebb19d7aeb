import { expm4 } from './simulate-second-order.js';

/**
 * Fast exact response of a strictly proper third-order transfer function with delay,
 * (b2 s² + b1 s + b0)e^(−θs)/(s³ + a2 s² + a1 s + a0), to an input HELD between samples
 * (zero-order hold), from rest. Controllable canonical form, ẋ = A x + B u with
 * A = [0 1 0; 0 0 1; −a0 −a1 −a2], B = [0; 0; 1], y = b0 x1 + b1 x2 + b2 x3; each interval
 * is propagated exactly by Φ, Γ from exp([A B; 0 0]·h) (Van Loan 1978), and the output at
 * t_k is y(t_k − θ) by the same update over the fractional offset. The last two updates
 * are reused for intervals within 1e−12 s, so uniform sampling needs two exponentials.
 * Used by the joint single-track fit, where the generic src/lti response is too slow
 * for thousands of evaluations; test/identify checks the two agree.
 */
interface Update {
  readonly phi: Float64Array; // 3×3 row-major
  readonly gamma: Float64Array; // 3
}

function zeroOrderHoldUpdate(a0: number, a1: number, a2: number, s: number): Update {
  const m = new Float64Array(16);
  m[1] = s; // A12
  m[6] = s; // A23
  m[8] = -a0 * s;
  m[9] = -a1 * s;
  m[10] = -a2 * s;
  m[11] = s; // B3
  const e = expm4(m);
  return { phi: Float64Array.of(e[0], e[1], e[2], e[4], e[5], e[6], e[8], e[9], e[10]), gamma: Float64Array.of(e[3], e[7], e[11]) };
}

/**
 * y(t_k) for numerator [b2, b1, b0] and monic denominator [1, a2, a1, a0] (highest power first), delay θ ≥ 0 or < 0 (advance),
 * input held between samples and 0 before the first sample. Units: those of the transfer function.
 */
export function simulateThirdOrderHeld(
  time_s: Float64Array,
  input: Float64Array,
  numerator: readonly [number, number, number],
  denominator: readonly [number, number, number, number],
  delay_s: number,
  out: Float64Array = new Float64Array(time_s.length),
  states: Float64Array = new Float64Array(3 * time_s.length),
): Float64Array {
  const n = time_s.length;
  const [, a2, a1, a0] = denominator;
  const [b2, b1, b0] = numerator;
  // Intervals within 1e−12 s of the last two seen reuse their update (uniform sampling: one for the
  // sample period, one for the fractional delay offset).
  let keyA = Number.NaN;
  let keyB = Number.NaN;
  let updateA: Update | null = null;
  let updateB: Update | null = null;
  const update = (interval_s: number): Update => {
    if (Math.abs(interval_s - keyA) <= 1e-12 && updateA !== null) return updateA;
    if (Math.abs(interval_s - keyB) <= 1e-12 && updateB !== null) return updateB;
    const found = zeroOrderHoldUpdate(a0, a1, a2, interval_s);
    keyB = keyA;
    updateB = updateA;
    keyA = interval_s;
    updateA = found;
    return found;
  };
  const x = states; // ≥ 3n; starts at rest
  x[0] = 0;
  x[1] = 0;
  x[2] = 0;
  for (let j = 0; j + 1 < n; j++) {
    const { phi, gamma } = update(time_s[j + 1] - time_s[j]);
    const o = 3 * j;
    const u = input[j];
    for (let r = 0; r < 3; r++) {
      x[o + 3 + r] = phi[3 * r] * x[o] + phi[3 * r + 1] * x[o + 1] + phi[3 * r + 2] * x[o + 2] + gamma[r] * u;
    }
  }
  const t0 = time_s[0];
  let j = 0;
  for (let k = 0; k < n; k++) {
    const q = time_s[k] - delay_s;
    if (q <= t0) {
      out[k] = 0;
      continue;
    }
    while (j + 1 < n && time_s[j + 1] <= q) j++;
    while (j > 0 && time_s[j] > q) j--;
    const { phi, gamma } = update(q - time_s[j]);
    const o = 3 * j;
    const u = input[j];
    const y1 = phi[0] * x[o] + phi[1] * x[o + 1] + phi[2] * x[o + 2] + gamma[0] * u;
    const y2 = phi[3] * x[o] + phi[4] * x[o + 1] + phi[5] * x[o + 2] + gamma[1] * u;
    const y3 = phi[6] * x[o] + phi[7] * x[o + 1] + phi[8] * x[o + 2] + gamma[2] * u;
    out[k] = b0 * y1 + b1 * y2 + b2 * y3;
  }
  return out;
}
