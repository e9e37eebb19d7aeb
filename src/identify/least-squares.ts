import { levenbergMarquardt } from 'ml-levenberg-marquardt';

/**
 * The one adapter around ml-levenberg-marquardt (5.1.0). Every fit in speedband
 * goes through `fitLeastSquares`; nothing else imports the library.
 *
 * What the adapter handles, because the library does not (read in its source,
 * node_modules/ml-levenberg-marquardt/src; each point is pinned by
 * test/identify/least-squares.test.ts):
 * - Documented defaults differ from the code (errorTolerance: docs 10e-3, code 1e-7;
 *   the dampingStepUp/Down docs describe each other). Every option is passed explicitly.
 * - The default finite-difference step is an absolute 0.1 (`gradientDifference`,
 *   a number or an array per parameter; an array of the wrong length is silently
 *   filled with its first element). We fit in scaled parameters (value / scale)
 *   and pass one step per parameter, relative to its current value.
 * - A zero step skips a Jacobian row and shifts the rows below it, so the update of
 *   one parameter lands on another (unless it is the last). We never fix a parameter
 *   that way: callers reparametrise (the model takes only free parameters).
 * - `errorTolerance` is an absolute sum of squares: the loop otherwise runs until the
 *   iteration cap, and the result carries no stop reason — a capped run or a NaN
 *   residual (the loop breaks and returns the best point so far) looks like success.
 *   We pass errorTolerance 0, run the library in short chunks, and decide the stop
 *   reason ourselves: relative change of the sum of squares and of the parameters
 *   between chunks (converged), the iteration cap, or a non-finite residual.
 * - `minValues`/`maxValues` are clamped after each step, but derivative probes
 *   evaluate the model just outside them: models must return finite values there.
 * - `weights` are applied inconsistently (the error uses r²·w², the step uses r²/w²):
 *   we pass weights 1 and scale residuals ourselves (residualScale).
 * - An analytical Jacobian (`jacobianFunction`, 5.1.0) is asked for one point at a time and
 *   negated by the library; a problem that knows its derivatives gives whole columns
 *   (`LeastSquaresProblem.jacobian`, physical units) and the adapter scales them. Without it the
 *   library's forward differences cost one model run per parameter and iteration. A non-finite
 *   Jacobian makes ml-matrix's Cholesky step throw ("not symmetric"): the adapter reports nonFinite.
 */

/**
 * The library's own damping factors (its defaults, read in levenberg_marquardt.ts), passed explicitly,
 * and the limits the adapter keeps the damping within between chunks (our choice).
 */
export const LEVENBERG_MARQUARDT_DAMPING = {
  /** Damping × this after a step that raised the sum of squares (the library's default). */
  stepUp: 11,
  /** Damping ÷ this after a step that lowered it (the library's default). */
  stepDown: 9,
  minimum: 1e-7,
  /** Damping at this size means no step helps any more: the fit counts as converged. */
  maximum: 1e7,
} as const;
const { stepUp: DAMPING_STEP_UP, stepDown: DAMPING_STEP_DOWN, minimum: MIN_DAMPING, maximum: MAX_DAMPING } = LEVENBERG_MARQUARDT_DAMPING;

export type StopReason = 'converged' | 'iterationCap' | 'nonFinite';

export interface LeastSquaresProblem {
  /** Measured values to fit. */
  readonly data: Float64Array;
  /** Model predictions for a full parameter vector (physical units); same length as data. Must return finite values for parameters slightly outside the bounds. */
  readonly model: (parameters: readonly number[]) => Float64Array;
  readonly initial: readonly number[];
  /** Typical magnitude of each parameter (> 0): the fit works on value/scale. */
  readonly scale: readonly number[];
  /** Lower and upper bounds per parameter (physical units); ±Infinity for none. */
  readonly lower: readonly number[];
  readonly upper: readonly number[];
  /** Typical residual magnitude (> 0), to keep the damping meaningful. */
  readonly residualScale: number;
  /**
   * Optional exact derivatives: column i is ∂model/∂p_i at `parameters` (physical units), each as
   * long as data. Used instead of finite differences; the columns are read before the next call
   * (buffers may be reused).
   */
  readonly jacobian?: (parameters: readonly number[]) => readonly Float64Array[];
}

export interface LeastSquaresOptions {
  /** Total iteration cap over all chunks. */
  readonly maxIterations: number;
  /** Library iterations per chunk between stop checks. */
  readonly chunkIterations: number;
  /** Converged when the sum of squares changes by less than this fraction between chunks… */
  readonly relativeSsrTolerance: number;
  /** …or every scaled parameter moves by less than this (relative to max(|p|, 1)). */
  readonly relativeParameterTolerance: number;
  /** Use central differences for the library's Jacobian (2p model runs per iteration) instead of forward (p runs). */
  readonly centralDifference: boolean;
  /** Finite-difference step, relative to max(|scaled parameter|, 1). */
  readonly relativeDifferenceStep: number;
  /** Initial Levenberg–Marquardt damping (in scaled units). */
  readonly damping: number;
}

export const LEAST_SQUARES_DEFAULTS: LeastSquaresOptions = {
  maxIterations: 200,
  chunkIterations: 2,
  relativeSsrTolerance: 1e-7,
  relativeParameterTolerance: 1e-7,
  centralDifference: false,
  relativeDifferenceStep: 1e-7,
  damping: 1e-2,
};

export interface LeastSquaresResult {
  /** Best parameters found, physical units. */
  readonly parameters: readonly number[];
  /** Sum of squared residuals (data − model), physical units². */
  readonly ssr: number;
  readonly iterations: number;
  readonly stopReason: StopReason;
}

/** Sum of squares of data − prediction; NaN when any prediction is not finite. */
export function sumOfSquares(data: Float64Array, prediction: Float64Array): number {
  let total = 0;
  for (let i = 0; i < data.length; i++) {
    const r = data[i] - prediction[i];
    total += r * r;
  }
  return Number.isFinite(total) ? total : Number.NaN;
}

/**
 * Minimise Σ (data − model(p))² with ml-levenberg-marquardt under bounds, and say why it stopped.
 * Never reports a capped or non-finite run as converged.
 */
export function fitLeastSquares(problem: LeastSquaresProblem, options: LeastSquaresOptions = LEAST_SQUARES_DEFAULTS): LeastSquaresResult {
  const { data, model, scale, residualScale } = problem;
  const p = problem.initial.length;
  const toPhysical = (scaled: readonly number[]): number[] => scaled.map((v, i) => v * scale[i]);
  // Note: callers' models must be pure (same parameters → same prediction); predictions are reused.
  const index = Array.from({ length: data.length }, (_, i) => i);
  const scaledData = Array.from(data, (v) => v / residualScale);
  let nonFiniteSeen = false;
  // The library evaluates the model at the same parameters twice per iteration (error after the
  // update, then the next step's residuals): remember the last two evaluations.
  const memo: { key: number[]; prediction: Float64Array }[] = [];
  const evaluate = (scaled: readonly number[]): Float64Array => {
    for (const entry of memo) if (entry.key.every((v, i) => v === scaled[i])) return entry.prediction;
    const prediction = model(toPhysical(scaled));
    memo.unshift({ key: scaled.slice(), prediction });
    if (memo.length > 2) memo.pop();
    return prediction;
  };
  const parameterized = (scaled: number[]): ((x: number) => number) => {
    const prediction = evaluate(scaled);
    return (x: number) => {
      const value = prediction[x] / residualScale;
      if (!Number.isFinite(value)) nonFiniteSeen = true;
      return value;
    };
  };
  // ∂(model/residualScale)/∂(p_i/scale_i) = column_i·scale_i/residualScale, one point at a time.
  const { jacobian } = problem;
  const partials = new Array<number>(p).fill(0);
  const jacobianFunction =
    jacobian === undefined
      ? undefined
      : (scaled: number[]): ((x: number) => number[]) => {
          const columns = jacobian(toPhysical(scaled));
          return (x: number) => {
            for (let i = 0; i < p; i++) {
              const value = (columns[i][x] * scale[i]) / residualScale;
              if (!Number.isFinite(value)) nonFiniteSeen = true;
              partials[i] = value;
            }
            return partials;
          };
        };
  const minValues = problem.lower.map((v, i) => v / scale[i]);
  const maxValues = problem.upper.map((v, i) => v / scale[i]);
  let current = problem.initial.map((v, i) => Math.min(Math.max(v / scale[i], minValues[i]), maxValues[i]));
  let ssr = sumOfSquares(data, evaluate(current));
  if (Number.isNaN(ssr)) return { parameters: toPhysical(current), ssr, iterations: 0, stopReason: 'nonFinite' };
  let iterations = 0;
  // The library restarts its damping at every call and reports none back: carry an estimate.
  // A chunk that improves lowers it; one that cannot improve raises it as the library would
  // have over the chunk (×11 per iteration). Without improvement even at the library's
  // largest damping (1e7: a tiny gradient step), the point is a minimum to working precision.
  let damping = options.damping;
  while (iterations < options.maxIterations) {
    const chunk = Math.min(options.chunkIterations, options.maxIterations - iterations);
    nonFiniteSeen = false;
    let result: ReturnType<typeof levenbergMarquardt>;
    try {
      result = levenbergMarquardt({ x: index, y: scaledData }, parameterized, {
        initialValues: current,
        weights: 1,
        damping,
        dampingStepUp: DAMPING_STEP_UP,
        dampingStepDown: DAMPING_STEP_DOWN,
        improvementThreshold: 1e-3,
        maxIterations: chunk,
        errorTolerance: 0,
        centralDifference: options.centralDifference,
        gradientDifference: current.map((v) => options.relativeDifferenceStep * Math.max(Math.abs(v), 1)),
        minValues,
        maxValues,
        ...(jacobianFunction === undefined ? {} : { jacobianFunction }),
      });
    } catch (error) {
      // A non-finite Jacobian reaches ml-matrix's Cholesky step, which throws ("not symmetric": NaN ≠ NaN).
      if (nonFiniteSeen) return { parameters: toPhysical(current), ssr, iterations, stopReason: 'nonFinite' };
      throw error;
    }
    iterations += result.iterations;
    const next = result.parameterValues;
    const nextSsr = sumOfSquares(data, evaluate(next));
    if (Number.isNaN(nextSsr) || (nonFiniteSeen && result.iterations < chunk)) {
      return { parameters: toPhysical(current), ssr, iterations, stopReason: 'nonFinite' };
    }
    if (nextSsr < ssr) {
      const ssrChange = ssr - nextSsr;
      let parameterChange = 0;
      for (let i = 0; i < p; i++) parameterChange = Math.max(parameterChange, Math.abs(next[i] - current[i]) / Math.max(Math.abs(current[i]), 1));
      current = next;
      ssr = nextSsr;
      damping = Math.max(damping / DAMPING_STEP_DOWN, MIN_DAMPING);
      if (ssr === 0 || ssrChange <= options.relativeSsrTolerance * ssr || parameterChange <= options.relativeParameterTolerance) {
        return { parameters: toPhysical(current), ssr, iterations, stopReason: 'converged' };
      }
    } else {
      if (ssr === 0 || damping >= MAX_DAMPING) return { parameters: toPhysical(current), ssr, iterations, stopReason: 'converged' };
      damping = Math.min(damping * Math.pow(DAMPING_STEP_UP, chunk), MAX_DAMPING);
    }
  }
  return { parameters: toPhysical(current), ssr, iterations, stopReason: 'iterationCap' };
}
