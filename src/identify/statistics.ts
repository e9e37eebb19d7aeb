/**
 * Small statistics used by the fits: quantiles of Student's t and χ², residual
 * autocorrelation, and the Ljung–Box whiteness statistic. Plain numbers only.
 */

const Z_975 = 1.959963984540054; // standard normal 97.5 % quantile (common practice)

/**
 * Two-sided 95 % quantile of Student's t with ν degrees of freedom (t_0.975,ν), by the
 * Cornish–Fisher expansion of Abramowitz & Stegun 26.7.5 in powers of 1/ν
 * (within 1e−3 of tables for ν ≥ 5; table values for ν ≤ 4; ν < 1 gives Infinity).
 */
export function studentT975(degreesOfFreedom: number): number {
  const v = degreesOfFreedom;
  if (!(v >= 1)) return Infinity;
  if (v === 1) return 12.706204736174707;
  if (v === 2) return 4.302652729749464;
  // Small ν from standard t tables (the expansion below is 4e−3 off at ν = 3).
  if (v === 3) return 3.182446305284263;
  if (v === 4) return 2.776445105197793;
  const z = Z_975;
  const z3 = z ** 3;
  const z5 = z ** 5;
  const z7 = z ** 7;
  const z9 = z ** 9;
  return (
    z +
    (z3 + z) / (4 * v) +
    (5 * z5 + 16 * z3 + 3 * z) / (96 * v * v) +
    (3 * z7 + 19 * z5 + 17 * z3 - 15 * z) / (384 * v ** 3) +
    (79 * z9 + 776 * z7 + 1482 * z5 - 1920 * z3 - 945 * z) / (92160 * v ** 4)
  );
}

/**
 * 95 % quantile of χ² with k degrees of freedom: standard table values for k ≤ 3, else the
 * Wilson–Hilferty cube approximation (Wilson & Hilferty 1931; within 0.4 % for k ≥ 4).
 */
export function chiSquare95(degreesOfFreedom: number): number {
  const k = degreesOfFreedom;
  const table = [3.841458820694124, 5.991464547107979, 7.814727903251179];
  if (Number.isInteger(k) && k >= 1 && k <= 3) return table[k - 1];
  const z = 1.6448536269514722; // standard normal 95 % quantile
  const c = 2 / (9 * k);
  return k * Math.pow(1 - c + z * Math.sqrt(c), 3);
}

/** Sample autocorrelation of x at lags 1..maxLag (mean removed), ρ_k = Σ(x_i x_{i+k})/Σx_i². */
export function autocorrelation(x: Float64Array, maxLag: number): Float64Array {
  const n = x.length;
  let mean = 0;
  for (let i = 0; i < n; i++) mean += x[i];
  mean /= n;
  let denominator = 0;
  for (let i = 0; i < n; i++) denominator += (x[i] - mean) ** 2;
  const rho = new Float64Array(maxLag);
  if (denominator === 0) return rho;
  for (let k = 1; k <= maxLag; k++) {
    let sum = 0;
    for (let i = 0; i + k < n; i++) sum += (x[i] - mean) * (x[i + k] - mean);
    rho[k - 1] = sum / denominator;
  }
  return rho;
}

export interface WhitenessTest {
  /** Lag-1 autocorrelation of the residuals. */
  readonly lag1Autocorrelation: number;
  /** Ljung–Box Q = n(n+2)·Σ_{k=1..h} ρ_k²/(n−k) (Ljung & Box 1978). */
  readonly ljungBoxQ: number;
  readonly lags: number;
  /** χ²_h 95 % critical value; Q above it rejects whiteness at 5 %. */
  readonly criticalValue: number;
  readonly white: boolean;
}

/** Ljung–Box portmanteau test of residual whiteness with h = min(20, n/5) lags (Ljung & Box 1978, Biometrika 65:297). */
export function ljungBox(residuals: Float64Array): WhitenessTest {
  const n = residuals.length;
  const lags = Math.max(1, Math.min(20, Math.floor(n / 5)));
  const rho = autocorrelation(residuals, lags);
  let q = 0;
  for (let k = 1; k <= lags; k++) q += (rho[k - 1] * rho[k - 1]) / (n - k);
  q *= n * (n + 2);
  const criticalValue = chiSquare95(lags);
  return { lag1Autocorrelation: rho[0], ljungBoxQ: q, lags, criticalValue, white: q <= criticalValue };
}

/**
 * Effective number of independent samples for residuals with lag-1 autocorrelation ρ, under an
 * AR(1) model: n_eff = n(1 − ρ)/(1 + ρ) (Bretherton et al. 1999, J. Climate 12:1990; common practice).
 * Clamped to [p + 2, n]; ρ ≤ 0 gives n (no deflation claimed for negative correlation).
 */
export function effectiveSampleSize(n: number, lag1: number, parameterCount: number): number {
  const rho = Math.max(0, Math.min(lag1, 0.999));
  return Math.max(parameterCount + 2, Math.min(n, (n * (1 - rho)) / (1 + rho)));
}
