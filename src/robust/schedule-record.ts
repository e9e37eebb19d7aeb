/**
 * The schedule file's `variations` section (src/schedule/schedule-variations.ts) from a robust check of the final
 * table: the set, how it was searched, the worst figures over the grid and at each breakpoint (the margins, and the
 * time-domain figures when they were simulated), the failing speeds and the weakest parameter.
 */
import type { ScheduleVariations, ScheduleVariationsBreakpoint } from '../schedule/schedule-variations.js';
import type { RobustCheckResult, RobustSearchSettings, RobustTimeDomain, VariationSet, WeakestParameter } from './types.js';
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
  /** The worst time-domain figures at each breakpoint (same order; null where not simulated); absent: none simulated. */
  readonly timeDomainAtBreakpoints?: readonly (RobustTimeDomain | null)[];
  readonly listed: number;
}

/** The section from the robust check of the final table (its grid must hold every breakpoint). */
export function variationsRecord(input: VariationsRecordInput): ScheduleVariations {
  const { check } = input;
  const breakpoints = input.breakpointSpeeds.map((speed_mps, k): ScheduleVariationsBreakpoint => {
    const point = check.points.find((candidate) => candidate.speed_mps === speed_mps);
    if (point === undefined) throw new Error(`internal: breakpoint ${speed_mps} m/s missing from the robust check's grid`);
    return {
      speed_mps,
      instability: point.instability,
      worst: point.worst,
      timeDomain: input.timeDomainAtBreakpoints?.[k] ?? null,
      weakest: input.weakestAtBreakpoints[k] ?? null,
    };
  });
  // A speed fails on its margins over the set, or at a breakpoint on the worst time-domain figures there.
  const timeDomainFailures = new Map(breakpoints.map((breakpoint) => [breakpoint.speed_mps, breakpoint.timeDomain?.failures ?? []]));
  const points = check.points.map((point) => ({
    speed_mps: point.speed_mps,
    failures: [...point.failures.map((failure) => failure.message), ...(timeDomainFailures.get(point.speed_mps) ?? [])],
  }));
  const failing = points.filter((point) => point.failures.length > 0);
  return {
    acceptance: input.acceptance,
    passed: failing.length === 0,
    set: input.set,
    search: { ...input.search, method: searchMethodWords(input.set.dimensions.length) },
    gridSize: check.points.length,
    failedSpeeds: failing.length,
    unstableSpeeds: check.unstableCount,
    loopAnalyses: check.evaluations,
    worst: check.worst,
    failures: failing.slice(0, input.listed).map((point) => ({ speed_mps: point.speed_mps, messages: point.failures })),
    breakpoints,
    weakest: input.weakest,
  };
}
