/**
 * Response of a second-order lag with an optional numerator zero and a continuous
 * dead time, K(βs + 1)e^(−θs)/(s²/ωn² + 2ζs/ωn + 1), to a sampled input held or
 * linearly interpolated between samples (`CommandHold`, as in simulate-fopdt.ts; m = 0 when held).
 *
 * State space (controllable form): ẋ = A x + B u, A = [0 1; −ωn² −2ζωn], B = [0; 1],
 * y = Kωn²(x1 + β x2). Over an interval of length s with input u_j + m·σ the exact
 * update is x(s) = Φ(s)x + Γ(s)u_j + Λ(s)m, the blocks of exp(M s) with the augmented
 * M = [A B 0; 0 0 1; 0 0 0] (Van Loan's construction). The output at t_k is
 * y(t_k − θ), evaluated by the same update at the fractional offset. The system rests
 * at the steady state of u_0 before the first sample. Finite for any real parameters.
 */

import type { CommandHold } from './simulate-fopdt.js';

/** Scratch for expm4 (no allocation in the hot path; single-threaded use). */
const scaledScratch = new Float64Array(16);
const productScratch = new Float64Array(16);

/** out = x·y for 4×4 row-major matrices (out must not alias x or y). */
function multiply4Into(x: Float64Array, y: Float64Array, out: Float64Array): void {
  for (let r = 0; r < 4; r++) {
    const x0 = x[r * 4];
    const x1 = x[r * 4 + 1];
    const x2 = x[r * 4 + 2];
    const x3 = x[r * 4 + 3];
    for (let c = 0; c < 4; c++) out[r * 4 + c] = x0 * y[c] + x1 * y[4 + c] + x2 * y[8 + c] + x3 * y[12 + c];
  }
}

/**
 * exp of a 4×4 matrix (row-major), by scaling and squaring: scaled to an ∞-norm ≤ 1/4, a
 * degree-10 Taylor polynomial by Horner's rule (truncation ≤ (1/4)^11/11! ≈ 6e−15 relative),
 * then squared back (Moler & Van Loan 2003, "Nineteen dubious ways", method 3).
 */
export function expm4(m: Float64Array): Float64Array {
  let norm = 0;
  for (let r = 0; r < 4; r++) {
    const row = Math.abs(m[r * 4]) + Math.abs(m[r * 4 + 1]) + Math.abs(m[r * 4 + 2]) + Math.abs(m[r * 4 + 3]);
    if (row > norm) norm = row;
  }
  const squarings = norm > 0.25 ? Math.ceil(Math.log2(norm / 0.25)) : 0;
  const scale = Math.pow(2, -squarings);
  const a = scaledScratch;
  for (let i = 0; i < 16; i++) a[i] = m[i] * scale;
  // Horner: I + a(I + a/2(I + a/3(… (I + a/10))))
  let result = new Float64Array(16);
  for (let i = 0; i < 16; i++) result[i] = a[i] / 10;
  for (let i = 0; i < 4; i++) result[i * 5] += 1;
  for (let k = 9; k >= 1; k--) {
    multiply4Into(a, result, productScratch);
    for (let i = 0; i < 16; i++) result[i] = productScratch[i] / k;
    for (let i = 0; i < 4; i++) result[i * 5] += 1;
  }
  let spare = new Float64Array(16);
  for (let s = 0; s < squarings; s++) {
    multiply4Into(result, result, spare);
    const t = result;
    result = spare;
    spare = t;
  }
  return result;
}

/** The exact first-order-hold update over an interval of length s: 2×2 Φ and 2-vectors Γ, Λ. */
interface Update {
  readonly p11: number;
  readonly p12: number;
  readonly p21: number;
  readonly p22: number;
  readonly g1: number;
  readonly g2: number;
  readonly l1: number;
  readonly l2: number;
}

function holdUpdate(a21: number, a22: number, s: number): Update {
  const m = new Float64Array(16);
  m[1] = s; // A12 = 1
  m[4] = a21 * s;
  m[5] = a22 * s;
  m[6] = s; // B2 = 1
  m[11] = s; // v̇ = m
  const e = expm4(m);
  return { p11: e[0], p12: e[1], p21: e[4], p22: e[5], g1: e[2], g2: e[6], l1: e[3], l2: e[7] };
}

/** K(βs + 1)e^(−θs)/(s²/ωn² + 2ζs/ωn + 1) driven by a sampled command. */
export interface SecondOrderResponseInput {
  /** Sample times, s, increasing. */
  readonly time_s: Float64Array;
  /** The command at those times, in its own unit (same length as time_s). */
  readonly input: Float64Array;
  /** K, output unit per input unit. */
  readonly gain: number;
  /** ωn, rad/s. */
  readonly naturalFrequency_radps: number;
  /** ζ. */
  readonly dampingRatio: number;
  /** β, s (0: no zero). */
  readonly zeroTimeConstant_s: number;
  /** θ, s. */
  readonly deadTime_s: number;
  /** How the command is taken between samples. */
  readonly hold: CommandHold;
  /** Where to write the output (same length as time_s); a new array when not given. */
  readonly out?: Float64Array;
}

/**
 * Output of K(βs + 1)e^(−θs)/(s²/ωn² + 2ζs/ωn + 1) at each sample time (formulas in the file comment).
 * Units: time s, ωn rad/s, β and θ s; output = gain × input unit.
 */
export function simulateSecondOrder(options: SecondOrderResponseInput): Float64Array {
  const { time_s, input, gain, naturalFrequency_radps, dampingRatio, zeroTimeConstant_s, deadTime_s, hold } = options;
  const out = options.out ?? new Float64Array(time_s.length);
  const n = time_s.length;
  const slopes = hold === 'linear' ? 1 : 0;
  const w2 = naturalFrequency_radps * naturalFrequency_radps;
  const a21 = -w2;
  const a22 = -2 * dampingRatio * naturalFrequency_radps;
  // Intervals within 1e−12 s of the last two seen reuse their update (uniform sampling: one for the
  // sample period, one for the fractional delay offset).
  let keyA = Number.NaN;
  let keyB = Number.NaN;
  let updateA: Update | null = null;
  let updateB: Update | null = null;
  const update = (interval_s: number): Update => {
    if (Math.abs(interval_s - keyA) <= 1e-12 && updateA !== null) return updateA;
    if (Math.abs(interval_s - keyB) <= 1e-12 && updateB !== null) return updateB;
    const found = holdUpdate(a21, a22, interval_s);
    keyB = keyA;
    updateB = updateA;
    keyA = interval_s;
    updateA = found;
    return found;
  };
  const x1 = new Float64Array(n);
  const x2 = new Float64Array(n);
  // Rest at the steady state of u_0: x1 = u_0/ωn² (so that y = K·u_0), x2 = 0.
  x1[0] = w2 !== 0 ? input[0] / w2 : 0;
  for (let j = 0; j + 1 < n; j++) {
    const h = time_s[j + 1] - time_s[j];
    const g = update(h);
    const u = input[j];
    const slope = (slopes * (input[j + 1] - u)) / h;
    x1[j + 1] = g.p11 * x1[j] + g.p12 * x2[j] + g.g1 * u + g.l1 * slope;
    x2[j + 1] = g.p21 * x1[j] + g.p22 * x2[j] + g.g2 * u + g.l2 * slope;
  }
  const c1 = gain * w2;
  const c2 = gain * w2 * zeroTimeConstant_s;
  const t0 = time_s[0];
  const tLast = time_s[n - 1];
  let j = 0;
  for (let k = 0; k < n; k++) {
    const q = time_s[k] - deadTime_s;
    if (q <= t0) {
      out[k] = c1 * x1[0] + c2 * x2[0];
      continue;
    }
    let s: number;
    let slope: number;
    let index: number;
    if (q >= tLast) {
      index = n - 1;
      s = q - tLast;
      slope = 0;
    } else {
      while (j + 1 < n - 1 && time_s[j + 1] <= q) j++;
      while (j > 0 && time_s[j] > q) j--;
      index = j;
      s = q - time_s[j];
      slope = (slopes * (input[j + 1] - input[j])) / (time_s[j + 1] - time_s[j]);
    }
    const g = update(s);
    const u = input[index];
    const y1 = g.p11 * x1[index] + g.p12 * x2[index] + g.g1 * u + g.l1 * slope;
    const y2 = g.p21 * x1[index] + g.p22 * x2[index] + g.g2 * u + g.l2 * slope;
    out[k] = c1 * y1 + c2 * y2;
  }
  return out;
}
