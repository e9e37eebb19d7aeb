/**
 * From a plan to a checked gain table: tune at the plan's breakpoints, then check densely and refine.
 * The tuning and the loop analysis are callbacks (the build passes tuneOperatingPoint and the
 * src/verify analysis on the chosen model), so this stays pure and testable on constructed loops.
 */
import type { PidGains } from '../controller/types.js';
import { planBreakpoints, planThresholds, type Plan } from './plan.js';
import { refineBreakpoints, type RefineResult } from './refine.js';
import type { AnalyseLoop, ProgressCallback } from './types.js';

export interface ScheduleGainsInput {
  readonly plan: Plan;
  /** Gains of the plan's rule at a speed, m/s (e.g. tuneOperatingPoint with the parameters of makeRuleParameterLookup at that speed). */
  readonly tuneAt: (speed_mps: number) => PidGains;
  readonly analyse: AnalyseLoop;
  readonly onProgress?: ProgressCallback;
}

/**
 * Tune at planBreakpoints(plan), then refineBreakpoints over the plan's speed range with its grid
 * density, interpolation, low-speed floor, thresholds (planThresholds) and insertion limit.
 * The result's `check` is the dense check of the final table (pass it to assembleSchedule).
 */
export function scheduleGains(input: ScheduleGainsInput): RefineResult {
  const { plan, tuneAt, analyse, onProgress } = input;
  const speeds = planBreakpoints(plan);
  return refineBreakpoints({
    table: { speeds_mps: speeds, gains: speeds.map((speed) => tuneAt(speed)) },
    range: plan.speeds,
    density: plan.check.gridSpeeds,
    lookup: { interpolation: plan.interpolation, lowSpeedFloor_mps: plan.speeds.lowSpeedFloor_mps },
    tuneAt,
    analyse,
    thresholds: planThresholds(plan),
    maxInsertions: plan.check.maxInsertedBreakpoints,
    ...(onProgress === undefined ? {} : { onProgress }),
  });
}
