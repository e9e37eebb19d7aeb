import { ljungBox, type WhitenessTest } from './statistics.js';

/** How well a fitted model explains one step. Data units are the output's (rad/s for yaw rate). */
export interface FitQuality {
  /** Root-mean-square residual, output units. */
  readonly rmse: number;
  /** RMSE divided by the range (max − min) of the measured output, dimensionless. */
  readonly nrmse: number;
  /** Coefficient of determination 1 − SSR/SST. */
  readonly r2: number;
  readonly samples: number;
  readonly whiteness: WhitenessTest;
  /**
   * Bayesian information criterion n·ln(SSR/n) + p·ln(n) (Schwarz 1978) and Akaike's
   * n·ln(SSR/n) + 2p (Akaike 1974), Gaussian likelihood up to a constant; lower is better.
   */
  readonly bic: number;
  readonly aic: number;
}

/** Residuals data − prediction. */
export function residualsOf(data: Float64Array, prediction: Float64Array): Float64Array {
  const r = new Float64Array(data.length);
  for (let i = 0; i < data.length; i++) r[i] = data[i] - prediction[i];
  return r;
}

/** Fit quality of a prediction with `parameterCount` fitted parameters (formulas in the field comments). */
export function fitQuality(data: Float64Array, prediction: Float64Array, parameterCount: number): FitQuality {
  const n = data.length;
  const residuals = residualsOf(data, prediction);
  let ssr = 0;
  let mean = 0;
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i < n; i++) {
    ssr += residuals[i] * residuals[i];
    mean += data[i];
    lo = Math.min(lo, data[i]);
    hi = Math.max(hi, data[i]);
  }
  mean /= n;
  let sst = 0;
  for (let i = 0; i < n; i++) sst += (data[i] - mean) ** 2;
  const rmse = Math.sqrt(ssr / n);
  const logLikelihoodTerm = n * Math.log(Math.max(ssr, Number.MIN_VALUE) / n);
  return {
    rmse,
    nrmse: hi > lo ? rmse / (hi - lo) : Infinity,
    r2: sst > 0 ? 1 - ssr / sst : 0,
    samples: n,
    whiteness: ljungBox(residuals),
    bic: logLikelihoodTerm + parameterCount * Math.log(n),
    aic: logLikelihoodTerm + 2 * parameterCount,
  };
}
