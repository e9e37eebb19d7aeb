import { expm4 } from './simulate-second-order.js';

/**
 * Fast exact response of a strictly proper third-order transfer function with delay,
 * (b2 s² + b1 s + b0)e^(−θs)/(s³ + a2 s² + a1 s + a0), to an input HELD between samples
 * (zero-order hold), from rest. Controllable canonical form, ẋ = A x + B u with
 * A = [0 1 0; 0 0 1; −a0 −a1 −a2], B = [0; 0; 1], y = b0 x1 + b1 x2 + b2 x3; each interval
 * is propagated exactly by Φ, Γ from exp([A B; 0 0]·h) (Van Loan 1978), and the output at
 * t_k is y(t_k − θ) by the same update over the fractional offset (a point falling exactly on a
 * sample takes the interval before it, with the full update: the same value). Updates are
 * looked up in a small cache keyed by (a0, a1, a2, interval within 1e−12 s), so uniform sampling
 * needs two exponentials, and steps simulated one after another at the same speed share them.
 * Used by the joint single-track fit, where the generic src/lti response is too slow
 * for thousands of evaluations; test/identify checks the two agree.
 */

/** Entries kept by a HoldUpdateCache: the sample period and the delay's fraction, for two models. */
const CACHE_ENTRIES = 4;
/** Floats per entry: a0, a1, a2, interval, Φ (3×3 row-major), Γ (3). */
const ENTRY = 16;

/** Exact zero-order-hold updates already computed, reused across calls (see newHoldUpdateCache). */
export interface HoldUpdateCache {
  readonly entries: Float64Array;
  /** Entries filled so far, and the one to replace next (round robin). */
  filled: number;
  next: number;
}

/** An empty cache; pass the same one to consecutive simulations (one per fit, single-threaded). */
export function newHoldUpdateCache(): HoldUpdateCache {
  return { entries: new Float64Array(CACHE_ENTRIES * ENTRY), filled: 0, next: 0 };
}

/** Offset in cache.entries of the update over interval_s for the denominator (a0, a1, a2); computed when missing. */
function holdUpdate(cache: HoldUpdateCache, a0: number, a1: number, a2: number, interval_s: number): number {
  const e = cache.entries;
  for (let i = 0; i < cache.filled; i++) {
    const o = i * ENTRY;
    if (e[o] === a0 && e[o + 1] === a1 && e[o + 2] === a2 && Math.abs(e[o + 3] - interval_s) <= 1e-12) return o;
  }
  const m = new Float64Array(16);
  m[1] = interval_s; // A12
  m[6] = interval_s; // A23
  m[8] = -a0 * interval_s;
  m[9] = -a1 * interval_s;
  m[10] = -a2 * interval_s;
  m[11] = interval_s; // B3
  const x = expm4(m);
  const o = cache.next * ENTRY;
  e[o] = a0;
  e[o + 1] = a1;
  e[o + 2] = a2;
  e[o + 3] = interval_s;
  e[o + 4] = x[0];
  e[o + 5] = x[1];
  e[o + 6] = x[2];
  e[o + 7] = x[4];
  e[o + 8] = x[5];
  e[o + 9] = x[6];
  e[o + 10] = x[8];
  e[o + 11] = x[9];
  e[o + 12] = x[10];
  e[o + 13] = x[3];
  e[o + 14] = x[7];
  e[o + 15] = x[11];
  cache.next = (cache.next + 1) % CACHE_ENTRIES;
  cache.filled = Math.max(cache.filled, cache.next === 0 ? CACHE_ENTRIES : cache.next);
  return o;
}

/** Buffers a held-command simulation may reuse; each is made fresh when not given. */
export interface HeldSimulationBuffers {
  /** The output, same length as time_s. */
  readonly out?: Float64Array;
  /** State scratch, at least 3 × the length of time_s. */
  readonly states?: Float64Array;
  /** Exact updates shared between consecutive simulations (newHoldUpdateCache). */
  readonly cache?: HoldUpdateCache;
  /** When given, receives ∂y/∂θ at every sample (same length as time_s). */
  readonly delayDerivative?: Float64Array | null;
}

/** A third-order transfer function with delay driven by a held command. */
export interface ThirdOrderHeldInput extends HeldSimulationBuffers {
  /** Sample times, s, increasing. */
  readonly time_s: Float64Array;
  /** The command at those times (same length as time_s). */
  readonly input: Float64Array;
  /** [b2, b1, b0], highest power first. */
  readonly numerator: readonly [number, number, number];
  /** Monic [1, a2, a1, a0], highest power first. */
  readonly denominator: readonly [number, number, number, number];
  /** θ, s (negative: an advance). */
  readonly delay_s: number;
}

/**
 * y(t_k) for numerator [b2, b1, b0] and monic denominator [1, a2, a1, a0] (highest power first), delay θ ≥ 0 or < 0 (advance),
 * input held between samples and 0 before the first sample. Units: those of the transfer function.
 * `delayDerivative`, when given, receives ∂y/∂θ = −C·ẋ(t_k − θ) at every sample (for a growing delay).
 */
export function simulateThirdOrderHeld(options: ThirdOrderHeldInput): Float64Array {
  const { time_s, input, numerator, denominator, delay_s } = options;
  const out = options.out ?? new Float64Array(time_s.length);
  const states = options.states ?? new Float64Array(3 * time_s.length);
  const cache = options.cache ?? newHoldUpdateCache();
  const delayDerivative = options.delayDerivative ?? null;
  const n = time_s.length;
  const [, a2, a1, a0] = denominator;
  const [b2, b1, b0] = numerator;
  const e = cache.entries;
  const x = states; // ≥ 3n; starts at rest
  x[0] = 0;
  x[1] = 0;
  x[2] = 0;
  let interval = Number.NaN;
  let o = 0;
  for (let j = 0; j + 1 < n; j++) {
    const h = time_s[j + 1] - time_s[j];
    if (!(Math.abs(h - interval) <= 1e-12)) {
      o = holdUpdate(cache, a0, a1, a2, h);
      interval = h;
    }
    const s = 3 * j;
    const x1 = x[s];
    const x2 = x[s + 1];
    const x3 = x[s + 2];
    const u = input[j];
    x[s + 3] = e[o + 4] * x1 + e[o + 5] * x2 + e[o + 6] * x3 + e[o + 13] * u;
    x[s + 4] = e[o + 7] * x1 + e[o + 8] * x2 + e[o + 9] * x3 + e[o + 14] * u;
    x[s + 5] = e[o + 10] * x1 + e[o + 11] * x2 + e[o + 12] * x3 + e[o + 15] * u;
  }
  const t0 = time_s[0];
  interval = Number.NaN;
  let j = 0;
  for (let k = 0; k < n; k++) {
    const q = time_s[k] - delay_s;
    if (q <= t0) {
      out[k] = 0;
      if (delayDerivative !== null) delayDerivative[k] = 0;
      continue;
    }
    while (j + 1 < n && time_s[j + 1] < q) j++;
    while (j > 0 && time_s[j] >= q) j--;
    const offset = q - time_s[j];
    if (!(Math.abs(offset - interval) <= 1e-12)) {
      o = holdUpdate(cache, a0, a1, a2, offset);
      interval = offset;
    }
    const s = 3 * j;
    const x1 = x[s];
    const x2 = x[s + 1];
    const x3 = x[s + 2];
    const u = input[j];
    const y1 = e[o + 4] * x1 + e[o + 5] * x2 + e[o + 6] * x3 + e[o + 13] * u;
    const y2 = e[o + 7] * x1 + e[o + 8] * x2 + e[o + 9] * x3 + e[o + 14] * u;
    const y3 = e[o + 10] * x1 + e[o + 11] * x2 + e[o + 12] * x3 + e[o + 15] * u;
    out[k] = b0 * y1 + b1 * y2 + b2 * y3;
    if (delayDerivative !== null) {
      // ẋ = A x + B u at t_k − θ; y grows with θ as −C·ẋ.
      delayDerivative[k] = -(b0 * y2 + b1 * y3 + b2 * (u - a0 * y1 - a1 * y2 - a2 * y3));
    }
  }
  return out;
}
