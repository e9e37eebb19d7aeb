/**
 * Re-run the dense check with quantised gains, so a fixed-point export is proven like the table it
 * came from. The loop analysis is supplied by the caller (the build assembles it from the model the
 * schedule records); grid, range, thresholds and interpolation come from the schedule itself.
 */
import { denseCheck } from '../schedule/dense-check.js';
import { checkGrid } from '../schedule/grid.js';
import { makeGainLookup } from '../schedule/interpolate.js';
import { scheduleLookupSettings } from '../schedule/schedule-lookup.js';
import type { ScheduleFile } from '../schedule/schedule-types.js';
import type { PidGains } from '../controller/types.js';
import type { AnalyseLoop, DenseCheckResult, GainTable, ProgressCallback } from '../schedule/types.js';

/** The hook the export command calls: re-check a schedule with a quantised table; null when there is no model to check against. */
export type QuantisedRecheck = (schedule: ScheduleFile, quantised: GainTable) => DenseCheckResult | null;

export interface RecheckInput {
  readonly schedule: ScheduleFile;
  /** The table the firmware will really use (e.g. QuantisedTable.table). */
  readonly quantised: GainTable;
  readonly analyse: AnalyseLoop;
  /** The export's own lookup between breakpoints (default: the schedule's interpolation of `quantised`). */
  readonly gainsAt?: (speed_mps: number) => PidGains;
  readonly onProgress?: ProgressCallback;
}

/** Dense check of the quantised table on the schedule's own grid (checkGrid of its breakpoints, range and density) and thresholds. */
export function recheckQuantised(input: RecheckInput): DenseCheckResult {
  const { schedule, quantised, analyse, onProgress } = input;
  return denseCheck({
    grid: checkGrid(quantised.speeds_mps, schedule.check.range, schedule.check.gridSpeeds),
    gainsAt: input.gainsAt ?? makeGainLookup(quantised, scheduleLookupSettings(schedule)),
    analyse,
    thresholds: schedule.check.thresholds,
    onProgress,
  });
}

/** Build the export command's hook from a loop analysis: (schedule) → analyse for that schedule's model. */
export function makeQuantisedRecheck(analyseFor: (schedule: ScheduleFile) => AnalyseLoop): QuantisedRecheck {
  return (schedule, quantised) => recheckQuantised({ schedule, quantised, analyse: analyseFor(schedule) });
}
