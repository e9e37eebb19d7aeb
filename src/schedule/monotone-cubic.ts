/**
 * Monotone piecewise cubic Hermite interpolation after Fritsch & Carlson (1980),
 * "Monotone piecewise cubic interpolation", SIAM J. Numer. Anal. 17(2):238–246.
 *
 * Slopes: secants δk = (y[k+1] − y[k])/(x[k+1] − x[k]); interior slope the mean of the
 * neighbouring secants, 0 where they differ in sign or one is 0 (a local extremum stays
 * flat); end slopes the end secants. Then, per interval with δk ≠ 0, α = m[k]/δk,
 * β = m[k+1]/δk; where α² + β² > 9 both are scaled by 3/√(α² + β²) (the paper's circle,
 * a sufficient condition for monotonicity). Intervals with δk = 0 get zero slopes.
 * Each interval is therefore monotone and never leaves [y[k], y[k+1]].
 */
import { SpeedbandError } from '../core/errors.js';

/** Hermite slopes (dy/dx, units of y per unit of x) for monotone cubic interpolation of (x, y); x strictly increasing. */
export function monotoneCubicSlopes(x: ArrayLike<number>, y: ArrayLike<number>): Float64Array {
  const n = x.length;
  if (y.length !== n) {
    throw new SpeedbandError('schedule.tableShape', `${n} speeds but ${y.length} values — give one value per speed`);
  }
  const slopes = new Float64Array(n);
  if (n < 2) return slopes;
  const secants = new Float64Array(n - 1);
  for (let k = 0; k < n - 1; k += 1) secants[k] = (y[k + 1] - y[k]) / (x[k + 1] - x[k]);
  slopes[0] = secants[0];
  slopes[n - 1] = secants[n - 2];
  for (let k = 1; k < n - 1; k += 1) {
    const before = secants[k - 1];
    const after = secants[k];
    slopes[k] = before * after <= 0 ? 0 : (before + after) / 2;
  }
  for (let k = 0; k < n - 1; k += 1) {
    const secant = secants[k];
    if (secant === 0) {
      slopes[k] = 0;
      slopes[k + 1] = 0;
      continue;
    }
    // α² + β² > 9  ⇔  hypot(m[k], m[k+1]) > 3|δk|; written without dividing by δk so tiny secants cannot overflow.
    const radius = Math.hypot(slopes[k], slopes[k + 1]);
    const limit = 3 * Math.abs(secant);
    if (radius > limit) {
      const scale = limit / radius;
      slopes[k] *= scale;
      slopes[k + 1] *= scale;
    }
  }
  return slopes;
}

/** A point on one interval [x0, x1] of a cubic Hermite curve, with the interval's ends (hermiteValue). */
export interface HermitePoint {
  /** Position in the interval, t = (x − x0)/h, 0 … 1. */
  readonly t: number;
  /** Width of the interval, h = x1 − x0 (x's unit). */
  readonly h: number;
  /** Value at x0. */
  readonly y0: number;
  /** Value at x1. */
  readonly y1: number;
  /** Slope at x0 (y's unit per x's unit). */
  readonly m0: number;
  /** Slope at x1. */
  readonly m1: number;
}

/**
 * Cubic Hermite on one interval [x0, x1] with end values y0, y1 and end slopes m0, m1:
 * p(t) = h00·y0 + h10·h·m0 + h01·y1 + h11·h·m1, t = (x − x0)/h, h = x1 − x0,
 * h00 = 2t³ − 3t² + 1, h10 = t³ − 2t² + t, h01 = −2t³ + 3t², h11 = t³ − t².
 * Returns y0 exactly at t = 0.
 */
export function hermiteValue(point: HermitePoint): number {
  const { t, h, y0, y1, m0, m1 } = point;
  const t2 = t * t;
  const t3 = t2 * t;
  return (2 * t3 - 3 * t2 + 1) * y0 + (t3 - 2 * t2 + t) * h * m0 + (-2 * t3 + 3 * t2) * y1 + (t3 - t2) * h * m1;
}
