/**
 * The schedule file's `variations` section: the set of vehicles the schedule was checked on besides the
 * nominal model, how the worst case was searched, and what it found — the worst figures over the grid and
 * at each breakpoint with the combination behind each, the failing speeds, and the weakest parameter.
 * Its own top-level section (schema: schedule-variations-schema.ts), covered by the checksum like every field.
 */
import { searchMethodWords } from '../robust/worst-case.js';
import type { RobustCheckResult, RobustFigure, RobustSearchSettings, RobustWorstValue, VariationSet, WorstFigure, InstabilityFound } from '../robust/types.js';
import type { WeakestParameter } from '../robust/weakest-parameter.js';
import { failingSpeeds, type FailingSpeed } from './dense-check.js';

export interface ScheduleVariationsBreakpoint {
  readonly speed_mps: number;
  readonly instability: InstabilityFound | null;
  readonly worst: Readonly<Record<RobustFigure, WorstFigure | null>>;
  readonly weakest: WeakestParameter | null;
}

export interface ScheduleVariations {
  /** robust: the schedule passes only when the worst case passes too; nominal: reported beside the nominal check. */
  readonly acceptance: 'robust' | 'nominal';
  /** Whether the worst case over the set meets the acceptance limits at every grid speed. */
  readonly passed: boolean;
  readonly set: VariationSet;
  readonly search: RobustSearchSettings & { readonly method: string };
  readonly gridSize: number;
  readonly failedSpeeds: number;
  /** Grid speeds where the set holds a loop that is not stable. */
  readonly unstableSpeeds: number;
  /** Loop analyses the whole check took. */
  readonly loopAnalyses: number;
  readonly worst: Readonly<Record<RobustFigure, RobustWorstValue | null>>;
  /** The first failing speeds (at most `listed`), with what failed and the combination. */
  readonly failures: readonly FailingSpeed[];
  readonly breakpoints: readonly ScheduleVariationsBreakpoint[];
  /** Over the whole grid: the figure nearest its limit and the parameter behind it (src/robust/weakest-parameter.ts). */
  readonly weakest: WeakestParameter | null;
}

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

/** Whether a schedule's status may be 'passed': its nominal check passed and, under robust acceptance, its worst case too. */
export function acceptancePassed(nominalPassed: boolean, variations: Pick<ScheduleVariations, 'acceptance' | 'passed'> | undefined): boolean {
  return nominalPassed && (variations === undefined || variations.acceptance === 'nominal' || variations.passed);
}
