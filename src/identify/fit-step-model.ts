import { fitLeastSquares, LEAST_SQUARES_DEFAULTS, sumOfSquares, type StopReason } from './least-squares.js';
import { fitQuality, type FitQuality } from './fit-quality.js';
import { meanOf, type StepSignals } from './step-signals.js';
import { numericalJacobian, parameterUncertainty, type ParameterUncertainty } from './uncertainty.js';

/**
 * Shared machinery of every per-step fit: an output bias (the yaw-rate sensor offset)
 * either taken from the pre-step window or fitted as one more parameter, Levenberg–
 * Marquardt from the most promising of several starts (least-squares.ts), the best result by
 * sum of squares (a converged one preferred), then intervals and quality at the optimum.
 */

/** A start is refined too when its initial sum of squares is within this factor of the best start's. */
const START_SSR_FACTOR = 3;

/** How the output offset is found: mean of the pre-step window, or fitted with the model. */
export type BiasMode = 'preStep' | 'fitted';

export interface StepModelDefinition {
  /** Names of the model parameters (without the bias), e.g. ['gain', 'timeConstant_s', 'deadTime_s']. */
  readonly names: readonly string[];
  /** Response to signals.input without bias; must stay finite slightly outside the bounds. */
  readonly simulate: (parameters: readonly number[]) => Float64Array;
  readonly starts: readonly (readonly number[])[];
  /** Most Levenberg–Marquardt runs (from the best-ranked starts). */
  readonly maxRuns: number;
  readonly scale: readonly number[];
  readonly lower: readonly number[];
  readonly upper: readonly number[];
}

export interface StepModelFit {
  /** Parameter names, the model's then 'bias' when fitted. */
  readonly names: readonly string[];
  readonly parameters: readonly number[];
  /** Output offset, output units (fitted or pre-step mean). */
  readonly bias: number;
  readonly ssr: number;
  readonly stopReason: StopReason;
  readonly iterations: number;
  readonly uncertainty: ParameterUncertainty;
  readonly quality: FitQuality;
  /** Model prediction including bias at every sample. */
  readonly prediction: Float64Array;
  /** Starts given and Levenberg–Marquardt runs made from them. */
  readonly startsGiven: number;
  readonly runs: number;
}

/** Fit a step model from several starts and return the best with its uncertainty and quality. */
export function fitStepModel(signals: StepSignals, definition: StepModelDefinition, biasMode: BiasMode, maxIterations = LEAST_SQUARES_DEFAULTS.maxIterations): StepModelFit {
  const { output, preStepSamples } = signals;
  const preStepBias = meanOf(output, 0, Math.max(1, preStepSamples));
  const fitted = biasMode === 'fitted';
  const p = definition.names.length;
  let outputRange = 0;
  for (let i = 0; i < output.length; i++) outputRange = Math.max(outputRange, Math.abs(output[i] - preStepBias));
  const residualScale = Math.max(outputRange, 1e-9);
  const model = (parameters: readonly number[]): Float64Array => {
    const response = definition.simulate(parameters.slice(0, p));
    const bias = fitted ? parameters[p] : preStepBias;
    for (let i = 0; i < response.length; i++) response[i] += bias;
    return response;
  };
  const scale = fitted ? [...definition.scale, residualScale] : definition.scale;
  const lower = fitted ? [...definition.lower, -Infinity] : definition.lower;
  const upper = fitted ? [...definition.upper, Infinity] : definition.upper;
  let best: { parameters: readonly number[]; ssr: number; stopReason: StopReason; iterations: number } | null = null;
  // Starts ranked by their initial sum of squares; Levenberg–Marquardt runs from the best and from
  // any other within START_SSR_FACTOR of it (a distinct basin worth exploring), at most maxRuns.
  const ranked = definition.starts
    .map((start) => {
      const initial = fitted ? [...start, preStepBias] : [...start];
      const ssr = sumOfSquares(output, model(initial));
      return { initial, ssr: Number.isNaN(ssr) ? Infinity : ssr };
    })
    .sort((a, b) => a.ssr - b.ssr);
  const runs = ranked.filter((r, i) => i === 0 || r.ssr <= START_SSR_FACTOR * ranked[0].ssr).slice(0, Math.max(1, definition.maxRuns));
  for (const { initial } of runs) {
    const result = fitLeastSquares(
      { data: output, model, initial, scale, lower, upper, residualScale },
      { ...LEAST_SQUARES_DEFAULTS, maxIterations },
    );
    if (Number.isNaN(result.ssr)) continue;
    const rank = (stop: StopReason): number => (stop === 'converged' ? 0 : 1);
    if (best === null || rank(result.stopReason) < rank(best.stopReason) || (rank(result.stopReason) === rank(best.stopReason) && result.ssr < best.ssr)) {
      best = result;
    }
  }
  if (best === null) {
    const initial = fitted ? [...definition.starts[0], preStepBias] : [...definition.starts[0]];
    best = { parameters: initial, ssr: Number.NaN, stopReason: 'nonFinite', iterations: 0 };
  }
  const prediction = model(best.parameters);
  const totalParameters = best.parameters.length;
  const quality = fitQuality(output, prediction, totalParameters);
  const jacobian = numericalJacobian(model, best.parameters, scale);
  const uncertainty = parameterUncertainty(best.parameters, jacobian.columns, best.ssr, quality.whiteness.lag1Autocorrelation);
  return {
    names: fitted ? [...definition.names, 'bias'] : definition.names,
    parameters: best.parameters,
    bias: fitted ? best.parameters[p] : preStepBias,
    ssr: best.ssr,
    stopReason: best.stopReason,
    iterations: best.iterations,
    uncertainty,
    quality,
    prediction,
    startsGiven: definition.starts.length,
    runs: runs.length,
  };
}
