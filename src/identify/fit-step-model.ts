import { fitLeastSquares, LEAST_SQUARES_DEFAULTS, sumOfSquares, type StopReason } from './least-squares.js';
import { fitQuality, type FitQuality } from './fit-quality.js';
import { meanOf, type StepSignals } from './step-signals.js';
import { numericalJacobian, parameterUncertainty, type ParameterUncertainty } from './uncertainty.js';
import { projectGainAndBias, projectOrthogonal } from './variable-projection.js';

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
  /**
   * Optional exact derivatives of `simulate`: column i is ∂response/∂parameter_i (model parameters
   * only; the bias column is added here). Without it the fitter uses finite differences.
   */
  readonly sensitivities?: (parameters: readonly number[]) => readonly Float64Array[];
  /**
   * The response is proportional to parameter 0, a gain (which must be unbounded): gain and bias are
   * then solved exactly at every point and Levenberg–Marquardt searches the other parameters only
   * (variable projection, variable-projection.ts).
   */
  readonly linearInGain?: boolean;
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
export function fitStepModel(
  signals: StepSignals,
  definition: StepModelDefinition,
  biasMode: BiasMode,
  maxIterations = LEAST_SQUARES_DEFAULTS.maxIterations,
): StepModelFit {
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
  const search =
    definition.linearInGain === true ? projectedSearch(definition, output, fitted ? null : preStepBias) : fullSearch(definition, model, fitted, scale);
  let best: { parameters: readonly number[]; ssr: number; stopReason: StopReason; iterations: number } | null = null;
  // Starts ranked by their initial sum of squares; Levenberg–Marquardt runs from the best and from
  // any other within START_SSR_FACTOR of it (a distinct basin worth exploring), at most maxRuns.
  const ranked = definition.starts
    .map((start) => {
      const initial = search.initial(start, preStepBias);
      const ssr = sumOfSquares(output, search.model(initial));
      return { initial, ssr: Number.isNaN(ssr) ? Infinity : ssr };
    })
    .sort((a, b) => a.ssr - b.ssr);
  const runs = ranked.filter((r, i) => i === 0 || r.ssr <= START_SSR_FACTOR * ranked[0].ssr).slice(0, Math.max(1, definition.maxRuns));
  for (const { initial } of runs) {
    const result = fitLeastSquares(
      {
        data: output,
        model: search.model,
        initial,
        scale: search.scale,
        lower: search.lower,
        upper: search.upper,
        residualScale,
        ...(search.jacobian === undefined ? {} : { jacobian: search.jacobian }),
      },
      { ...LEAST_SQUARES_DEFAULTS, maxIterations },
    );
    if (Number.isNaN(result.ssr)) continue;
    const rank = (stop: StopReason): number => (stop === 'converged' ? 0 : 1);
    if (best === null || rank(result.stopReason) < rank(best.stopReason) || (rank(result.stopReason) === rank(best.stopReason) && result.ssr < best.ssr)) {
      best = { ...result, parameters: search.full(result.parameters) };
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

/**
 * What Levenberg–Marquardt searches: its parameters' scales and bounds, its model and optional exact
 * Jacobian, and the full parameter vector (model parameters, then the bias when fitted) of a point.
 */
interface Search {
  readonly scale: readonly number[];
  readonly lower: readonly number[];
  readonly upper: readonly number[];
  readonly initial: (start: readonly number[], preStepBias: number) => number[];
  readonly model: (parameters: readonly number[]) => Float64Array;
  readonly jacobian?: (parameters: readonly number[]) => readonly Float64Array[];
  readonly full: (parameters: readonly number[]) => readonly number[];
}

/** Every parameter searched, the bias among them when fitted. */
function fullSearch(
  definition: StepModelDefinition,
  model: (parameters: readonly number[]) => Float64Array,
  fitted: boolean,
  scale: readonly number[],
): Search {
  const p = definition.names.length;
  const { sensitivities } = definition;
  let ones: Float64Array | null = null;
  return {
    scale,
    lower: fitted ? [...definition.lower, -Infinity] : definition.lower,
    upper: fitted ? [...definition.upper, Infinity] : definition.upper,
    initial: (start, preStepBias) => (fitted ? [...start, preStepBias] : [...start]),
    model,
    ...(sensitivities === undefined
      ? {}
      : {
          jacobian: (parameters: readonly number[]): readonly Float64Array[] => {
            const columns = sensitivities(parameters.slice(0, p));
            if (!fitted) return columns;
            ones ??= new Float64Array(columns[0].length).fill(1);
            return [...columns, ones];
          },
        }),
    full: (parameters) => parameters,
  };
}

/**
 * Gain and bias solved exactly at every point (variable-projection.ts): the search runs on the
 * other parameters. `fixedBias` null: the bias is fitted.
 */
function projectedSearch(definition: StepModelDefinition, output: Float64Array, fixedBias: number | null): Search {
  if (definition.lower[0] !== -Infinity || definition.upper[0] !== Infinity) {
    throw new Error('fitStepModel: a model linear in its gain needs the gain unbounded');
  }
  const withUnitGain = (rest: readonly number[]): number[] => [1, ...rest];
  const { sensitivities } = definition;
  const scratch: Float64Array[] = [];
  return {
    scale: definition.scale.slice(1),
    lower: definition.lower.slice(1),
    upper: definition.upper.slice(1),
    initial: (start) => start.slice(1),
    model: (rest) => {
      const unit = definition.simulate(withUnitGain(rest));
      const { gain, bias } = projectGainAndBias(output, unit, fixedBias);
      const prediction = new Float64Array(unit.length);
      for (let i = 0; i < unit.length; i++) prediction[i] = gain * unit[i] + bias;
      return prediction;
    },
    ...(sensitivities === undefined
      ? {}
      : {
          jacobian: (rest: readonly number[]): readonly Float64Array[] => {
            // Column 0 of the sensitivities at unit gain is the unit response itself.
            const columns = sensitivities(withUnitGain(rest));
            const unit = columns[0];
            const { gain } = projectGainAndBias(output, unit, fixedBias);
            // The adapter reads the columns before asking again: the buffers are reused.
            const kaufman: Float64Array[] = [];
            for (let k = 1; k < columns.length; k++) {
              if (scratch.length < k) scratch.push(new Float64Array(unit.length));
              const column = scratch[k - 1];
              for (let i = 0; i < unit.length; i++) column[i] = gain * columns[k][i];
              kaufman.push(projectOrthogonal(column, unit, fixedBias === null ? 'slopeAndOffset' : 'slopeOnly'));
            }
            return kaufman;
          },
        }),
    full: (rest) => {
      const { gain, bias } = projectGainAndBias(output, definition.simulate(withUnitGain(rest)), fixedBias);
      return fixedBias === null ? [gain, ...rest, bias] : [gain, ...rest];
    },
  };
}
