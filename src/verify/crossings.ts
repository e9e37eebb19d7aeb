/**
 * Gain crossovers (|L| = 1) and phase crossovers (∠L = −180°·(2k + 1)) of a loop:
 * bracketed on the grid, refined by Brent's method on log|L| and on the continuous
 * phase + 180°·(2k + 1) — never read off the grid.
 */
import type { LoopGrid } from './frequency-grid.js';
import { evaluateLoopResponse, newLoopPoint, type CompiledLoopResponse } from './loop-response.js';
import { bracketedRoot } from './root-search.js';

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
 * Every crossing of the negative real axis by L(jω) in the grid's band, in order of
 * frequency. Crossings whose grid estimate of |L| is at least `refineAbove`, and the
 * `refineLargestBelow` largest of the others, are refined; the rest keep a grid
 * estimate (they are far inside the unit circle and decide neither a margin nor the
 * encirclement count).
 */
export function findPhaseCrossovers(
  loop: CompiledLoopResponse,
  grid: LoopGrid,
  settings: { readonly relativeTolerance: number; readonly refineAbove: number; readonly refineLargestBelow: number },
): PhaseCrossover[] {
  const { frequency_radps: w, magnitude, phase_rad: phase } = grid;
  interface Candidate {
    readonly interval: number;
    readonly level: number;
    readonly direction: 1 | -1;
    readonly estimate: number;
    readonly estimateFrequency: number;
  }
  const candidates: Candidate[] = [];
  for (let i = 0; i + 1 < w.length; i++) {
    const a = phase[i];
    const b = phase[i + 1];
    if (a === b) continue;
    const low = Math.min(a, b);
    const high = Math.max(a, b);
    const kFirst = Math.floor((low / Math.PI - 1) / 2) + 1;
    const kLast = Math.floor((high / Math.PI - 1) / 2);
    for (let k = kFirst; k <= kLast; k++) {
      const level = (2 * k + 1) * Math.PI;
      const t = (level - a) / (b - a);
      const estimate = Math.exp(Math.log(magnitude[i]) * (1 - t) + Math.log(magnitude[i + 1]) * t);
      candidates.push({ interval: i, level, direction: b > a ? 1 : -1, estimate, estimateFrequency: w[i] + t * (w[i + 1] - w[i]) });
    }
  }
  const refine = new Uint8Array(candidates.length);
  const below: number[] = [];
  candidates.forEach((c, index) => {
    if (c.estimate >= settings.refineAbove) refine[index] = 1;
    else below.push(index);
  });
  below.sort((x, y) => candidates[y].estimate - candidates[x].estimate);
  for (const index of below.slice(0, settings.refineLargestBelow)) refine[index] = 1;

  const point = newLoopPoint();
  return candidates.map((c, index): PhaseCrossover => {
    if (refine[index] === 0) {
      return { frequency_radps: c.estimateFrequency, magnitude: c.estimate, level_rad: c.level, direction: c.direction, refined: false };
    }
    const offset = (x: number): number => {
      evaluateLoopResponse(loop, x, point);
      return point.phase_rad - c.level;
    };
    const frequency = bracketedRoot(offset, w[c.interval], w[c.interval + 1], settings.relativeTolerance);
    evaluateLoopResponse(loop, frequency, point);
    return { frequency_radps: frequency, magnitude: point.magnitude, level_rad: c.level, direction: c.direction, refined: true };
  });
}
