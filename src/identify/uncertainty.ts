import { effectiveSampleSize, studentT975 } from './statistics.js';

/**
 * Parameter uncertainty from the Jacobian at the optimum (linearised least squares,
 * e.g. Seber & Wild 1989, Nonlinear Regression, §2.1):
 *   Cov(p) = σ²(JᵀJ)⁻¹,  σ² = SSR/(n − p),
 * 95 % interval p ± t_0.975,ν·SE. Residual autocorrelation makes n samples worth fewer
 * independent ones; the covariance is inflated by n/n_eff with the AR(1) effective sample
 * size (statistics.ts) and ν = n_eff − p, so the intervals do not claim a coverage the
 * data cannot give.
 */

export interface ParameterUncertainty {
  readonly standardErrors: readonly number[];
  /** Covariance matrix (row-major p×p), inflated for autocorrelation like the standard errors. */
  readonly covariance: readonly number[];
  /** 95 % intervals per parameter, same order as the parameters. */
  readonly lower95: readonly number[];
  readonly upper95: readonly number[];
  /** Residual variance σ² = SSR/(n − p), data units². */
  readonly residualVariance: number;
  readonly effectiveSamples: number;
  /** False when JᵀJ is singular (a parameter is not identifiable from this data). */
  readonly identifiable: boolean;
}

/**
 * Central-difference Jacobian of the model at `parameters`, column-major (n × p): column i
 * is ∂prediction/∂p_i with step relativeStep·max(|p_i|, scale_i).
 */
export function numericalJacobian(
  model: (parameters: readonly number[]) => Float64Array,
  parameters: readonly number[],
  scale: readonly number[],
  relativeStep = 1e-5,
): { readonly columns: readonly Float64Array[] } {
  const columns: Float64Array[] = [];
  for (let i = 0; i < parameters.length; i++) {
    const h = relativeStep * Math.max(Math.abs(parameters[i]), scale[i]);
    const up = parameters.slice();
    const down = parameters.slice();
    up[i] += h;
    down[i] -= h;
    const yUp = model(up);
    const yDown = model(down);
    const column = new Float64Array(yUp.length);
    for (let k = 0; k < column.length; k++) column[k] = (yUp[k] - yDown[k]) / (2 * h);
    columns.push(column);
  }
  return { columns };
}

/** Inverse of a small symmetric positive-definite matrix (row-major p×p) by Gauss–Jordan with pivoting; null when singular. */
export function invertSmall(matrix: readonly number[], p: number): number[] | null {
  const a = matrix.slice();
  const inv: number[] = Array.from({ length: p * p }, (_, i) => (Math.floor(i / p) === i % p ? 1 : 0));
  let largest = 0;
  for (let i = 0; i < p; i++) largest = Math.max(largest, Math.abs(a[i * p + i]));
  for (let c = 0; c < p; c++) {
    let pivot = c;
    for (let r = c + 1; r < p; r++) if (Math.abs(a[r * p + c]) > Math.abs(a[pivot * p + c])) pivot = r;
    if (!(Math.abs(a[pivot * p + c]) > 1e-13 * largest)) return null;
    for (let k = 0; k < p; k++) {
      [a[c * p + k], a[pivot * p + k]] = [a[pivot * p + k], a[c * p + k]];
      [inv[c * p + k], inv[pivot * p + k]] = [inv[pivot * p + k], inv[c * p + k]];
    }
    const d = a[c * p + c];
    for (let k = 0; k < p; k++) {
      a[c * p + k] /= d;
      inv[c * p + k] /= d;
    }
    for (let r = 0; r < p; r++) {
      if (r === c) continue;
      const f = a[r * p + c];
      if (f === 0) continue;
      for (let k = 0; k < p; k++) {
        a[r * p + k] -= f * a[c * p + k];
        inv[r * p + k] -= f * inv[c * p + k];
      }
    }
  }
  return inv;
}

/** Standard errors and 95 % intervals from Jacobian columns, SSR and the residual lag-1 autocorrelation (formulas in the file comment). */
export function parameterUncertainty(
  parameters: readonly number[],
  columns: readonly Float64Array[],
  ssr: number,
  lag1Autocorrelation: number,
): ParameterUncertainty {
  const p = parameters.length;
  const n = columns[0]?.length ?? 0;
  const jtj: number[] = new Array(p * p).fill(0);
  for (let r = 0; r < p; r++) {
    for (let c = r; c < p; c++) {
      let sum = 0;
      const a = columns[r];
      const b = columns[c];
      for (let k = 0; k < n; k++) sum += a[k] * b[k];
      jtj[r * p + c] = sum;
      jtj[c * p + r] = sum;
    }
  }
  const residualVariance = ssr / Math.max(1, n - p);
  const effectiveSamples = effectiveSampleSize(n, lag1Autocorrelation, p);
  const inflation = n / effectiveSamples;
  const t = studentT975(effectiveSamples - p);
  const inverse = invertSmall(jtj, p);
  const standardErrors = parameters.map((_, i) => (inverse === null ? Infinity : Math.sqrt(Math.max(0, inverse[i * p + i] * residualVariance * inflation))));
  const covariance = inverse === null ? new Array<number>(p * p).fill(Infinity) : inverse.map((v) => v * residualVariance * inflation);
  return {
    standardErrors,
    covariance,
    lower95: parameters.map((v, i) => v - t * standardErrors[i]),
    upper95: parameters.map((v, i) => v + t * standardErrors[i]),
    residualVariance,
    effectiveSamples,
    identifiable: inverse !== null && standardErrors.every(Number.isFinite),
  };
}
