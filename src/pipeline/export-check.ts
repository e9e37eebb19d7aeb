/**
 * What `export` proves before it writes: the dense check of the gains the export holds (exact or
 * quantised) on the model the schedule records — a schedule whose checksum was recomputed after an
 * edit is caught here — and the fallback gains for a NaN or infinite speed in the C lookup: the gains
 * of the highest-speed breakpoint that, held constant, pass the same dense check over the whole range
 * (its grid, range and thresholds), or none.
 */
import { atSpeed } from '../core/by-speed.js';
import { recheckQuantised } from '../export/recheck.js';
import { judgeMargins } from '../schedule/dense-check.js';
import { checkGrid } from '../schedule/grid.js';
import type { FallbackGains } from '../export/c-header.js';
import type { ScheduleFile } from '../schedule/schedule-types.js';
import type { AnalyseLoop, DenseCheckResult, GainTable } from '../schedule/types.js';
import type { LoopMargins } from '../verify/types.js';
import type { PidGains } from '../controller/types.js';
import { makeLoopAnalysis } from './loop-analysis.js';
import { recordedCheckModel, scheduleLoopAndController } from './recheck-schedule.js';

/** The loop analysis of a schedule on the model it records, or null when it records none speedband can rebuild. */
export function recordedLoopAnalysis(schedule: ScheduleFile): AnalyseLoop | null {
  const model = recordedCheckModel(schedule);
  if (model === null) return null;
  const { loop, controller } = scheduleLoopAndController(schedule);
  return makeLoopAnalysis(model, loop, controller);
}

/**
 * Dense check of `table` (the gains an export holds) on the schedule's grid, range and thresholds;
 * `gainsAt`: the export's own lookup between breakpoints (the integer lookup of a fixed-point header).
 */
export function checkExportedTable(
  schedule: ScheduleFile,
  table: GainTable,
  analyse: AnalyseLoop,
  gainsAt?: (speed_mps: number) => PidGains,
): DenseCheckResult {
  return recheckQuantised({ schedule, quantised: table, analyse, ...(gainsAt === undefined ? {} : { gainsAt }) });
}

/** The fallback gains (see the file comment), tried from the highest breakpoint down; null when none passes. */
export function findFallbackGains(schedule: ScheduleFile, table: GainTable, analyse: AnalyseLoop): FallbackGains | null {
  const grid = checkGrid(table.speeds_mps, schedule.check.range, schedule.check.gridSpeeds);
  const { thresholds } = schedule.check;
  for (let k = table.speeds_mps.length - 1; k >= 0; k -= 1) {
    const gains = table.gains[k];
    // Screen first, stopping at the first failing speed; a candidate that passes everywhere is then summed up from the same analyses.
    const analysed = new Map<number, LoopMargins>();
    const fails = Array.from(grid).some((speed_mps) => {
      const margins = analyse(speed_mps, gains);
      analysed.set(speed_mps, margins);
      return judgeMargins(margins, atSpeed(thresholds, speed_mps)).length > 0;
    });
    if (fails) continue;
    const constant: GainTable = { speeds_mps: table.speeds_mps, gains: table.speeds_mps.map(() => gains) };
    const result = recheckQuantised({ schedule, quantised: constant, analyse: (speed_mps, at) => analysed.get(speed_mps) ?? analyse(speed_mps, at) });
    if (result.passed) return { breakpoint: k, speed_mps: table.speeds_mps[k], gridSize: result.points.length, worst: result.worst };
  }
  return null;
}
