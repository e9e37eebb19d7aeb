/**
 * The schedule file's `variations` section: the set of vehicles the schedule was checked on besides the
 * nominal model, how the worst case was searched, and what it found — the worst figures over the grid and
 * at each breakpoint with the combination behind each, the failing speeds, and the weakest parameter.
 * Its own top-level section (schema: schedule-variations-schema.ts), covered by the checksum like every field;
 * src/robust/schedule-record.ts makes it from a robust check.
 */
import type { FailingSpeed } from './dense-check.js';
import type {
  InstabilityFound,
  RobustFigure,
  RobustSearchSettings,
  RobustTimeDomain,
  RobustWorstValue,
  VariationSet,
  WeakestParameter,
  WorstFigure,
} from './variation-types.js';

export interface ScheduleVariationsBreakpoint {
  readonly speed_mps: number;
  readonly instability: InstabilityFound | null;
  readonly worst: Readonly<Record<RobustFigure, WorstFigure | null>>;
  /** The worst time-domain figures there; null when not simulated (the set holds an unstable loop there, or other gains than the schedule's were checked: a baseline). */
  readonly timeDomain: RobustTimeDomain | null;
  readonly weakest: WeakestParameter | null;
}

export interface ScheduleVariations {
  /** robust: the schedule passes only when the worst case passes too; nominal: reported beside the nominal check. */
  readonly acceptance: 'robust' | 'nominal';
  /** Whether the worst case over the set meets the acceptance limits at every grid speed, the time-domain limits at every breakpoint. */
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

/**
 * Whether a schedule's status may be 'passed': its nominal check (`nominal.passed`) passed and, under robust acceptance,
 * its worst case over the variations too.
 */
export function acceptancePassed(nominal: { readonly passed: boolean }, variations: Pick<ScheduleVariations, 'acceptance' | 'passed'> | undefined): boolean {
  return nominal.passed && (variations === undefined || variations.acceptance === 'nominal' || variations.passed);
}
