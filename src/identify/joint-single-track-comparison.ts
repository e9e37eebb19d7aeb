import type { SingleTrackParameters } from '../vehicle/types.js';
import { steadyStateYawGain_perS } from '../vehicle/single-track.js';
import type { SpeedModel } from './aggregate.js';
import type { StackedSteps } from './joint-single-track-model.js';

/**
 * The joint single-track model held against each speed's FOPDT model: steady yaw gain and the RMS
 * residual over that speed's steps, with a warning where the joint model explains a speed poorly.
 */

/** The joint model against one speed's FOPDT: steady yaw gain and residuals over that speed's steps. */
export interface SpeedComparison {
  readonly speed_mps: number;
  readonly fopdtGain: number;
  readonly singleTrackGain: number;
  /** (single-track − FOPDT)/|FOPDT| × 100, %. */
  readonly difference_pct: number;
  /** RMS residual of the joint model over this speed's steps, and of the per-step FOPDT fits, rad/s. */
  readonly singleTrackRmse_radps: number;
  readonly fopdtRmse_radps: number;
}

/** When the joint model warns about a speed. */
export interface ComparisonThresholds {
  /** Steady yaw gains further apart than this, %. */
  readonly mismatchWarning_pct: number;
  /** An RMS residual above this multiple of the per-step FOPDT fits' (which have 4 parameters per step). */
  readonly rmseWarningFactor: number;
}

/** Sum of squared residuals and sample count of one step. */
interface StepSquares {
  readonly sum: number;
  readonly count: number;
}

function stepKey(file: string, stepIndex: number): string {
  return `${file}\u0000${stepIndex}`;
}

/** Squared residuals of the joint model per step, keyed by file and step index. */
function stepResidualSquares(stacked: StackedSteps, prediction: Float64Array): Map<string, StepSquares> {
  const { steps, signals, data } = stacked;
  const squares = new Map<string, StepSquares>();
  let at = 0;
  steps.forEach((step, i) => {
    const length = signals[i].time_s.length;
    let sum = 0;
    for (let k = at; k < at + length; k++) sum += (data[k] - prediction[k]) ** 2;
    squares.set(stepKey(step.file, step.stepIndex), { sum, count: length });
    at += length;
  });
  return squares;
}

/** The joint model at one speed, and the warnings it earns there. */
function compareAtSpeed(
  params: SingleTrackParameters,
  speed: SpeedModel,
  squares: ReadonlyMap<string, StepSquares>,
  thresholds: ComparisonThresholds,
): { readonly comparison: SpeedComparison; readonly warnings: readonly string[] } {
  const { mismatchWarning_pct, rmseWarningFactor } = thresholds;
  const s = speed;
  const singleTrackGain = steadyStateYawGain_perS(params, s.speed_mps);
  const difference_pct = (100 * (singleTrackGain - s.model.gain)) / Math.abs(s.model.gain);
  let sum = 0;
  let count = 0;
  for (const key of s.steps ?? []) {
    const entry = squares.get(stepKey(key.file, key.stepIndex));
    if (entry !== undefined) {
      sum += entry.sum;
      count += entry.count;
    }
  }
  const singleTrackRmse_radps = count > 0 ? Math.sqrt(sum / count) : Number.NaN;
  const where = `at ${s.speed_mps.toFixed(2)} m/s the joint single-track model`;
  const warnings: string[] = [];
  if (Math.abs(difference_pct) > mismatchWarning_pct) {
    warnings.push(
      `${where}'s steady yaw gain ${singleTrackGain.toFixed(3)} 1/s misses the measured ${s.model.gain.toFixed(3)} 1/s by ${difference_pct.toFixed(1)} % ` +
        `(threshold ${mismatchWarning_pct} %) — the linear single-track model does not explain this speed: check for tyre saturation (large steps), load or surface changes`,
    );
  }
  if (singleTrackRmse_radps > rmseWarningFactor * s.fopdtRmse_radps) {
    warnings.push(
      `${where} leaves an RMS yaw-rate residual of ${singleTrackRmse_radps.toExponential(2)} rad/s, more than ${rmseWarningFactor}× the per-step FOPDT fits' ` +
        `${s.fopdtRmse_radps.toExponential(2)} rad/s — its dynamics do not match this speed: check the vehicle file's mass, inertia and axle positions`,
    );
  }
  const comparison = {
    speed_mps: s.speed_mps,
    fopdtGain: s.model.gain,
    singleTrackGain,
    difference_pct,
    singleTrackRmse_radps,
    fopdtRmse_radps: s.fopdtRmse_radps,
  };
  return { comparison, warnings };
}

/** The joint model (its parameters and stacked prediction) against every speed's FOPDT model, in the order of `speeds`. */
export function compareWithSpeeds(input: {
  readonly params: SingleTrackParameters;
  readonly stacked: StackedSteps;
  /** The joint model's prediction of every step, stacked as stacked.data. */
  readonly prediction: Float64Array;
  readonly speeds: readonly SpeedModel[];
  readonly thresholds: ComparisonThresholds;
}): { readonly comparison: readonly SpeedComparison[]; readonly warnings: readonly string[] } {
  const { params, stacked, prediction, speeds, thresholds } = input;
  const squares = stepResidualSquares(stacked, prediction);
  const each = speeds.map((speed) => compareAtSpeed(params, speed, squares, thresholds));
  return { comparison: each.map((e) => e.comparison), warnings: each.flatMap((e) => e.warnings) };
}
