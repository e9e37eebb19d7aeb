/**
 * From a plan to a checked gain table: tune at the plan's breakpoints, then check densely and refine.
 * The tuning and the loop analysis are callbacks (the build passes tuneOperatingPoint and the
 * src/verify analysis on the chosen model), so this stays pure and testable on constructed loops.
 */
import { numericAcceptanceLimits } from './acceptance-limits.js';
import type { PidGains } from '../controller/types.js';
import type { OverSpeed } from '../core/by-speed.js';
import { planBreakpoints, type Plan } from './plan.js';
import { refineBreakpoints, type RefineResult } from './refine.js';
import type { AcceptanceThresholds, AnalyseLoop, ProgressCallback } from './types.js';

export interface ScheduleGainsInput {
  readonly plan: Plan;
  /** Gains of the plan's rule at a speed, m/s (e.g. tuneOperatingPoint with the parameters of makeRuleParameterLookup at that speed). */
  readonly tuneAt: (speed_mps: number) => PidGains;
  readonly analyse: AnalyseLoop;
  /** The plan's frequency-domain limits (acceptance-limits.ts); absent: the plan's, which then holds no expression. */
  readonly thresholds?: OverSpeed<AcceptanceThresholds>;
  readonly onProgress?: ProgressCallback;
}

/**
 * Tune at planBreakpoints(plan), then refineBreakpoints over the plan's speed range with its grid
 * density, interpolation, low-speed floor, thresholds and insertion limit.
 * The result's `check` is the dense check of the final table (pass it to assembleSchedule).
 */
export function scheduleGains(input: ScheduleGainsInput): RefineResult {
  const { plan, tuneAt, analyse, thresholds, onProgress } = input;
  const speeds = planBreakpoints(plan);
  return refineBreakpoints({
    table: { speeds_mps: speeds, gains: speeds.map((speed) => tuneAt(speed)) },
    range: plan.speeds,
    density: plan.check.gridSpeeds,
    lookup: { interpolation: plan.interpolation, lowSpeedFloor_mps: plan.speeds.lowSpeedFloor_mps },
    tuneAt,
    analyse,
    thresholds: thresholds ?? numericAcceptanceLimits(plan).thresholds,
    maxInsertions: plan.check.maxInsertedBreakpoints,
    ...(onProgress === undefined ? {} : { onProgress }),
  });
}
