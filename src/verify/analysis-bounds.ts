/**
 * Bounds on the work of one loop analysis, checked before any: an input the schemas accept (a
 * latency of minutes, a sample time of microseconds) must end in bounded time with an error that
 * names the cause, never run for minutes or fill the memory.
 */
import { SpeedbandError } from '../core/errors.js';
import { ANALYSIS_DEFAULTS } from './defaults.js';
import { splitDelay } from './sampled-plant.js';
import type { OpenLoop } from './types.js';

const format = (value: number): string => String(Number(value.toPrecision(3)));

/** Throws `verify.analysisTooLarge` when the sampled loop's delay register would exceed the bound. */
export function checkAnalysisBounds(loop: OpenLoop): void {
  const discrete = loop.discreteController;
  if (discrete === undefined) return;
  const { wholeSamples } = splitDelay(loop.delay_s, discrete.sampleTime_s);
  const bound = ANALYSIS_DEFAULTS.bounds.maximumWholeSampleDelay;
  if (wholeSamples > bound) {
    throw new SpeedbandError(
      'verify.analysisTooLarge',
      `the loop's delay of ${format(loop.delay_s)} s is ${wholeSamples} samples of ${format(discrete.sampleTime_s)} s — more than the ${bound} the analysis handles; a steering loop's delay (actuator delay + computation latency) is a fraction of a second: check actuatorDelay_s in the vehicle file and computationLatency_s and sampleTime_s in the plan`,
      { details: { delay_s: loop.delay_s, sampleTime_s: discrete.sampleTime_s, wholeSamples, maximumWholeSampleDelay: bound } },
    );
  }
}

/**
 * The error for a loop whose phase wraps more often than the analysis examines: names the delay,
 * the frequency up to which the loop gain matters and the number of wraps.
 */
export function tooManyPhaseWraps(delay_s: number, frequency_radps: number, wraps: number): SpeedbandError {
  return new SpeedbandError(
    'verify.analysisTooLarge',
    `the loop's delay of ${format(delay_s)} s turns its phase ${Math.round(wraps)} times below ${format(frequency_radps)} rad/s, where its gain still matters — more than the ${ANALYSIS_DEFAULTS.bounds.maximumPhaseWraps} crossings the analysis examines; such a loop cannot be stable: check computationLatency_s in the plan and actuatorDelay_s in the vehicle file`,
    { details: { delay_s, frequency_radps, wraps, maximumPhaseWraps: ANALYSIS_DEFAULTS.bounds.maximumPhaseWraps } },
  );
}
