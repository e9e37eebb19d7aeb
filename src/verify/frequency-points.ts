/**
 * The open-loop frequency response L at chosen frequencies, for plots (Bode and Nyquist): the same
 * compiled response the margins are computed on (loop-response.ts) — for a sampled loop the exact
 * pulse response C(e^(jωTs))·G_zoh(e^(jωTs)), for a continuous one L(jω) with its exact delay — with
 * the continuous (unwrapped) phase.
 */
import { compileLoopResponse, evaluateLoopResponse, newLoopPoint } from './loop-response.js';
import { axisToleranceOf } from './pole-counts.js';
import { sampledPlant } from './sampled-plant.js';
import { analysisRoots } from './small-roots.js';
import { cancelCommonIntegrators } from './sweep.js';
import type { OpenLoop } from './types.js';
import { validateOpenLoop } from './validate-loop.js';
import { checkAnalysisBounds } from './analysis-bounds.js';
import { radiansToDegrees } from '../core/units.js';

/** L at one frequency: real and imaginary parts, magnitude, and continuous phase in degrees. */
export interface FrequencyPoint {
  readonly frequency_radps: number;
  readonly re: number;
  readonly im: number;
  readonly magnitude: number;
  readonly phase_deg: number;
}

/**
 * L at each of `frequencies_radps` (> 0, rad/s; for a sampled loop at most π/Ts). The loop is validated
 * and bounded as by analyseOpenLoop (`verify.invalidLoop`, `verify.analysisTooLarge`).
 */
export function loopFrequencyResponse(input: OpenLoop, frequencies_radps: readonly number[]): FrequencyPoint[] {
  const loop = validateOpenLoop(input);
  checkAnalysisBounds(loop);
  const { numerator, denominator } = cancelCommonIntegrators(loop.numerator, loop.denominator);
  const discrete = loop.discreteController ?? null;
  const zeros = numerator.length > 1 && numerator.some((c) => c !== 0) ? analysisRoots(numerator) : [];
  const poles = denominator.length > 1 ? analysisRoots(denominator) : [];
  const plant = discrete === null ? null : sampledPlant({ numerator, denominator, delay_s: loop.delay_s }, discrete.sampleTime_s);
  const compiled = compileLoopResponse({
    numerator,
    denominator,
    delay_s: loop.delay_s,
    roots: { zeros, poles, axisTolerance: axisToleranceOf([...zeros, ...poles]) },
    discreteController: discrete,
    sampledPlant: plant,
  });
  const point = newLoopPoint();
  return frequencies_radps.map((frequency_radps) => {
    evaluateLoopResponse(compiled, frequency_radps, point);
    return { frequency_radps, re: point.re, im: point.im, magnitude: point.magnitude, phase_deg: radiansToDegrees(point.phase_rad) };
  });
}
