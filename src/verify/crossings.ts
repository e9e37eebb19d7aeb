/**
 * Gain crossovers (|L| = 1) and phase crossovers (∠L = −180°·(2k + 1)) of a loop:
 * bracketed on the grid, refined by Brent's method on log|L| and on the continuous
 * phase + 180°·(2k + 1) — never read off the grid.
 */
import type { LoopGrid } from './frequency-grid.js';
import { evaluateLoopResponse, newLoopPoint, type CompiledLoopResponse } from './loop-response.js';
import { bracketedRoot } from './root-search.js';
import { tooManyPhaseWraps } from './analysis-bounds.js';

export interface GainCrossover {
  readonly frequency_radps: number;
  /** Continuous phase of L there, rad. */
  readonly phase_rad: number;
}

export interface PhaseCrossover {
  readonly frequency_radps: number;
  /** |L| at the crossing (the critical gain is 1/|L|). */
  readonly magnitude: number;
  /** The level crossed, rad: π·(2k + 1). */
  readonly level_rad: number;
  /** +1 when the phase increases through the level (L passes the negative real axis downwards), −1 otherwise. */
  readonly direction: 1 | -1;
  /** Whether the crossing was refined by root search (otherwise `magnitude` is a grid estimate). */
  readonly refined: boolean;
}

/** Every ω in the grid's band where |L(jω)| = 1, refined to relativeTolerance in ω. */
export function findGainCrossovers(loop: CompiledLoopResponse, grid: LoopGrid, relativeTolerance: number): GainCrossover[] {
  const point = newLoopPoint();
  const logMagnitude = (w: number): number => {
    evaluateLoopResponse(loop, w, point);
    return Math.log(point.magnitude);
  };
  const found: GainCrossover[] = [];
  const { frequency_radps: w, magnitude } = grid;
  for (let i = 0; i + 1 < w.length; i++) {
    if (magnitude[i] >= 1 === magnitude[i + 1] >= 1) continue;
    const frequency = bracketedRoot(logMagnitude, w[i], w[i + 1], relativeTolerance);
    evaluateLoopResponse(loop, frequency, point);
    found.push({ frequency_radps: frequency, phase_rad: point.phase_rad });
  }
  return found;
}

/**
 * The crossings of the negative real axis by L(jω) in the grid's band that can matter,
 * refined, in order of frequency: every one whose grid estimate of |L| is at least
 * `refineAbove`, and the `refineLargestBelow` largest of the others. The rest lie far
 * inside the unit circle and decide neither a margin nor the encirclement count (with a
 * delay there are thousands of them at high frequency, so they are not even stored).
 */
export function findPhaseCrossovers(
  loop: CompiledLoopResponse,
  grid: LoopGrid,
  settings: { readonly relativeTolerance: number; readonly refineAbove: number; readonly refineLargestBelow: number; readonly maximumPhaseWraps: number },
): PhaseCrossover[] {
  const { frequency_radps: w, magnitude, phase_rad: phase } = grid;
  const point = newLoopPoint();
  const found: PhaseCrossover[] = [];
  const refine = (interval: number, level: number, direction: 1 | -1): void => {
    const offset = (x: number): number => {
      evaluateLoopResponse(loop, x, point);
      return point.phase_rad - level;
    };
    const frequency = bracketedRoot(offset, w[interval], w[interval + 1], settings.relativeTolerance);
    evaluateLoopResponse(loop, frequency, point);
    found.push({ frequency_radps: frequency, magnitude: point.magnitude, level_rad: level, direction, refined: true });
  };
  // The largest few below the threshold, kept in small parallel arrays (no allocation per crossing).
  const keep = settings.refineLargestBelow;
  const keptEstimate = new Float64Array(keep).fill(-1);
  const keptInterval = new Int32Array(keep);
  const keptLevel = new Float64Array(keep);
  const keptDirection = new Int8Array(keep);
  let keptMinimum = -1;
  let examined = 0;
  for (let i = 0; i + 1 < w.length; i++) {
    const a = phase[i];
    const b = phase[i + 1];
    if (a === b) continue;
    const low = Math.min(a, b);
    const high = Math.max(a, b);
    const kFirst = Math.floor((low / Math.PI - 1) / 2) + 1;
    const kLast = Math.floor((high / Math.PI - 1) / 2);
    if (kLast < kFirst) continue;
    // No crossing inside can beat the ones kept: the estimate never exceeds the larger end.
    const larger = Math.max(magnitude[i], magnitude[i + 1]);
    if (larger < settings.refineAbove && keep > 0 && larger <= keptMinimum) continue;
    const logA = Math.log(magnitude[i]);
    const logB = Math.log(magnitude[i + 1]);
    const direction = b > a ? 1 : -1;
    examined += kLast - kFirst + 1;
    if (examined > settings.maximumPhaseWraps)
      throw tooManyPhaseWraps(loop.delay_s + (loop.discrete?.sampleTime_s ?? 0), w[i + 1], Math.abs(phase[i + 1] - phase[0]) / (2 * Math.PI));
    for (let k = kFirst; k <= kLast; k++) {
      const level = (2 * k + 1) * Math.PI;
      const t = (level - a) / (b - a);
      const estimate = Math.exp(logA * (1 - t) + logB * t);
      if (estimate >= settings.refineAbove) {
        refine(i, level, direction);
        continue;
      }
      let smallest = 0;
      for (let j = 1; j < keep; j++) if (keptEstimate[j] < keptEstimate[smallest]) smallest = j;
      if (keep > 0 && estimate > keptEstimate[smallest]) {
        keptEstimate[smallest] = estimate;
        keptInterval[smallest] = i;
        keptLevel[smallest] = level;
        keptDirection[smallest] = direction;
        keptMinimum = keptEstimate[0];
        for (let j = 1; j < keep; j++) keptMinimum = Math.min(keptMinimum, keptEstimate[j]);
      }
    }
  }
  for (let j = 0; j < keep; j++) if (keptEstimate[j] >= 0) refine(keptInterval[j], keptLevel[j], keptDirection[j] > 0 ? 1 : -1);
  return found.sort((x, y) => x.frequency_radps - y.frequency_radps);
}
