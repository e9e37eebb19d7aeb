/**
 * A bound, at every speed, on |integer lookup − exact lookup| for one column of a quantised table (the lookup of
 * integer-lookup.ts against src/schedule/interpolate.ts), in the column's units. Derivation, term by term:
 * - each stored value and each Hermite slope term h·m is rounded to ε = 2^−(F+1) (definition of the Q format);
 *   the end values reach the result through the convex weights h00 + h01 = 1 (ε), the slope terms through the
 *   Hermite slope weights |h10|, |h11| ≤ 4/27 (2·(4/27)·ε), and the final rounding adds ε: ε·(2 + 8/27);
 * - the weight t is truncated to 2^−24 and t², t³ again: at most 7·2^−24 on each Hermite weight, times
 *   |Δy| + h·(|m0| + |m1|) on the interval (the linear lookup: 2^−24·|Δy|);
 * - the speed, the breakpoint speeds and so the interval width are rounded to 2^−17 m/s: the argument moves by at
 *   most 2^−15 m/s, times the steepest slope of the interpolant, 3·max(|m0|, |m1|, |Δy|/h) for a monotone cubic
 *   (Fritsch & Carlson 1980, the α² + β² ≤ 9 circle) and |Δy|/h for linear;
 * - both lookups keep the result between the interval's end values (1-Lipschitz: adds nothing).
 * A column with one value at every breakpoint is looked up exactly as stored: its bound is that value's rounding.
 */
import { WEIGHT_FRACTIONAL_BITS } from './integer-lookup.js';

/** What the bound of one column needs: the exact table column, its Hermite slopes and its stored integers. */
export interface LookupErrorInput {
  readonly speeds_mps: readonly number[];
  readonly values: readonly number[];
  /** Slopes of the exact lookup (value per m/s); zeros for linear interpolation. */
  readonly slopes: ArrayLike<number>;
  readonly cubic: boolean;
  readonly fractionalBits: number;
  readonly stored: readonly bigint[];
}

/** The largest |integer lookup − exact lookup| of the column at any speed (see the file comment). */
export function lookupErrorBound(input: LookupErrorInput): number {
  const { speeds_mps: speeds, values, slopes, fractionalBits, stored } = input;
  const scale = 2 ** fractionalBits;
  const storingError = Math.max(...values.map((value, k) => Math.abs(Number(stored[k]) / scale - value)));
  if (values.every((value) => value === values[0]) && stored.every((value) => value === stored[0])) return storingError;
  const epsilon = 2 ** -(fractionalBits + 1);
  let largest = 0;
  let steepest = 0;
  for (let k = 0; k + 1 < speeds.length; k += 1) {
    const h = speeds[k + 1] - speeds[k];
    const dy = Math.abs(values[k + 1] - values[k]);
    const m0 = input.cubic ? Math.abs(slopes[k]) : 0;
    const m1 = input.cubic ? Math.abs(slopes[k + 1]) : 0;
    largest = Math.max(largest, dy + h * (m0 + m1));
    steepest = Math.max(steepest, input.cubic ? 3 * Math.max(m0, m1, dy / h) : dy / h);
  }
  return Math.max(storingError, epsilon * (2 + 8 / 27) + 7 * 2 ** -WEIGHT_FRACTIONAL_BITS * largest + steepest * 2 ** -15);
}
