/**
 * The schedule file's `variations` section (src/schedule/schedule-variations.ts) from a robust check of the final
 * table: the set, how it was searched, the worst figures over the grid and at each breakpoint, the failing speeds
 * and the weakest parameter.
 */
import { failingSpeeds } from '../schedule/dense-check.js';
import type { ScheduleVariations, ScheduleVariationsBreakpoint } from '../schedule/schedule-variations.js';
import type { RobustCheckResult, RobustSearchSettings, VariationSet, WeakestParameter } from './types.js';
import { searchMethodWords } from './corner-search.js';

export interface VariationsRecordInput {
  readonly acceptance: 'robust' | 'nominal';
  readonly set: VariationSet;
  readonly search: RobustSearchSettings;
  readonly check: RobustCheckResult;
  readonly breakpointSpeeds: readonly number[];
  /** The weakest parameter at each breakpoint (same order) and over the grid. */
  readonly weakestAtBreakpoints: readonly (WeakestParameter | null)[];
  readonly weakest: WeakestParameter | null;
  readonly listed: number;
}

/** The section from the robust check of the final table (its grid must hold every breakpoint). */
export function variationsRecord(input: VariationsRecordInput): ScheduleVariations {
  const { check } = input;
  const breakpoints = input.breakpointSpeeds.map((speed_mps, k): ScheduleVariationsBreakpoint => {
    const point = check.points.find((candidate) => candidate.speed_mps === speed_mps);
    if (point === undefined) throw new Error(`internal: breakpoint ${speed_mps} m/s missing from the robust check's grid`);
    return { speed_mps, instability: point.instability, worst: point.worst, weakest: input.weakestAtBreakpoints[k] ?? null };
  });
  return {
    acceptance: input.acceptance,
    passed: check.passed,
    set: input.set,
    search: { ...input.search, method: searchMethodWords(input.set.dimensions.length) },
    gridSize: check.points.length,
    failedSpeeds: check.failedCount,
    unstableSpeeds: check.unstableCount,
    loopAnalyses: check.evaluations,
    worst: check.worst,
    failures: failingSpeeds(check.points, input.listed),
    breakpoints,
    weakest: input.weakest,
  };
}
