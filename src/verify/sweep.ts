/**
 * One loop swept over frequency: its roots classified (origin, right half-plane, other
 * axis poles), the band and grid, and the crossings found on it.
 */
import { analysisRoots } from './small-roots.js';
import type { Complex } from '../lti/types.js';
import { findGainCrossovers, findPhaseCrossovers, type GainCrossover, type PhaseCrossover } from './crossings.js';
import { ANALYSIS_DEFAULTS } from './defaults.js';
import { frequencyBand, sampleLoop, type LoopGrid } from './frequency-grid.js';
import { compileLoopResponse, type CompiledLoopResponse } from './loop-response.js';
import { axisToleranceOf, classifyPoles } from './pole-counts.js';
import type { SampledPlant } from './sampled-plant.js';
import type { OpenLoop } from './types.js';

export interface Sweep {
  readonly compiled: CompiledLoopResponse;
  readonly grid: LoopGrid;
  readonly band: { readonly low_radps: number; readonly high_radps: number };
  readonly gainCrossovers: readonly GainCrossover[];
  readonly phaseCrossovers: readonly PhaseCrossover[];
  readonly originPoles: number;
  readonly rightHalfPlanePoles: number;
  readonly otherAxisPoles: number;
  /** The continuous poles of N/D (rad/s), snapped to the axis and origin as classified. */
  readonly poles: readonly Complex[];
}

/** Remove common factors s from N and D (exact zeros at the constant end). */
export function cancelCommonIntegrators(numerator: readonly number[], denominator: readonly number[]): { numerator: number[]; denominator: number[] } {
  let n = numerator.length;
  let d = denominator.length;
  while (n > 1 && d > 1 && numerator[n - 1] === 0 && denominator[d - 1] === 0) {
    n--;
    d--;
  }
  return { numerator: numerator.slice(0, n), denominator: denominator.slice(0, d) };
}

/** Which crossings a sweep looks for: the negative-real-axis (phase) crossings always, the gain crossovers when asked. */
export type SweepCrossings = 'gainAndPhase' | 'phaseOnly';

/** The loop N(s)/D(s)·e^(−θs), under a discrete controller or not, to sweep. */
export interface SweepRequest {
  /** Coefficients of N and D, highest power first. */
  readonly numerator: readonly number[];
  readonly denominator: readonly number[];
  /** θ, s. */
  readonly delay_s: number;
  /** The discrete controller closing the loop, or null for a continuous loop. */
  readonly discreteController: OpenLoop['discreteController'] | null;
  /** The zero-order-hold equivalent of N/D·e^(−θs) at the controller's sample time (with a discrete controller), or null. */
  readonly sampledPlant: SampledPlant | null;
  readonly crossings: SweepCrossings;
}

/**
 * Roots of N and D (|Re| ≤ 1e−9·max(1, largest |root|) is on the axis), the band and grid,
 * gain crossovers (with `crossings: 'gainAndPhase'`) and the negative-real-axis crossings that
 * can matter. With a discrete controller and `sampledPlant` the loop is swept exactly on
 * C(e^(jωTs))·G(e^(jωTs)) up to π/Ts.
 */
export function sweepLoop(request: SweepRequest): Sweep {
  const { numerator, denominator, delay_s, discreteController: discrete, sampledPlant } = request;
  const zeros: Complex[] = numerator.length > 1 && numerator.some((c) => c !== 0) ? analysisRoots(numerator) : [];
  const poles: Complex[] = denominator.length > 1 ? analysisRoots(denominator) : [];
  const axisTolerance = axisToleranceOf([...zeros, ...poles]);
  const classified = classifyPoles(poles, axisTolerance);
  const { originPoles, rightHalfPlanePoles, otherAxisPoles } = classified;
  const extraFrequencies: number[] = [];
  for (const r of [...zeros, ...poles]) {
    // Lightly damped roots: make sure the grid sees their resonance or notch.
    if (r.im > Math.abs(r.re)) extraFrequencies.push(r.im - Math.abs(r.re), r.im, r.im + Math.abs(r.re));
  }
  const compiled = compileLoopResponse({
    numerator,
    denominator,
    delay_s,
    roots: { zeros, poles, axisTolerance },
    discreteController: discrete ?? null,
    sampledPlant,
  });
  const band = frequencyBand(
    compiled,
    { originPoles, properness: numerator.length < denominator.length ? 'strictlyProper' : 'proper' },
    ANALYSIS_DEFAULTS.grid,
  );
  const grid = sampleLoop(compiled, band, extraFrequencies, ANALYSIS_DEFAULTS.grid);
  return {
    compiled,
    grid,
    band,
    gainCrossovers: request.crossings === 'gainAndPhase' ? findGainCrossovers(compiled, grid, ANALYSIS_DEFAULTS.frequencyRelativeTolerance) : [],
    phaseCrossovers: findPhaseCrossovers(compiled, grid, {
      relativeTolerance: ANALYSIS_DEFAULTS.frequencyRelativeTolerance,
      refineAbove: ANALYSIS_DEFAULTS.refineAbove,
      refineLargestBelow: ANALYSIS_DEFAULTS.refineLargestBelow,
      maximumPhaseWraps: ANALYSIS_DEFAULTS.bounds.maximumPhaseWraps,
    }),
    originPoles,
    rightHalfPlanePoles,
    otherAxisPoles,
    poles: classified.poles,
  };
}
