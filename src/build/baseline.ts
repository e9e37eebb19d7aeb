/**
 * After a vehicle change: the OLD schedule's gains (with its own loop, controller and limits)
 * checked on the NEW vehicle model at exactly the speeds of the new schedule's dense check,
 * so that the two can be read side by side — "are my current gains still safe, and where not?"
 */
import type { PidGains } from '../controller/types.js';
import type { BreakpointMargins, ScheduleFile } from '../schedule/schedule-types.js';
import type { DenseCheckResult } from '../schedule/types.js';
import type { LoopMargins } from '../verify/types.js';
import type { BuildResult } from './build-schedule.js';
import { recheckSchedule } from './recheck-schedule.js';

export interface BaselineRow {
  readonly speed_mps: number;
  readonly newGains: PidGains;
  readonly newMargins: BreakpointMargins;
  readonly oldGains: PidGains;
  readonly oldMargins: LoopMargins;
  /** Acceptance limits the old gains break at this speed, in words (empty: within the limits). */
  readonly oldFailures: readonly string[];
}

export interface BaselineCheck {
  /** The old gains' dense check on the new model, on the new schedule's grid. */
  readonly check: DenseCheckResult;
  /** One row per breakpoint of the new schedule. */
  readonly rows: readonly BaselineRow[];
}

/** Check `baseline`'s gains on the model of `build`, at the speeds of the new schedule's dense check. */
export function checkBaseline(baseline: ScheduleFile, build: BuildResult): BaselineCheck {
  const grid = build.refinement.check.points.map((point) => point.speed_mps);
  const check = recheckSchedule({ schedule: baseline, model: build.checkModel, grid });
  const bySpeed = new Map(check.points.map((point) => [point.speed_mps, point]));
  const rows = build.schedule.breakpoints.map((breakpoint): BaselineRow => {
    const old = bySpeed.get(breakpoint.speed_mps);
    if (old === undefined) throw new Error(`internal: breakpoint ${breakpoint.speed_mps} m/s missing from the baseline grid`);
    return {
      speed_mps: breakpoint.speed_mps,
      newGains: { kp: breakpoint.kp, ki: breakpoint.ki, kd: breakpoint.kd },
      newMargins: breakpoint.margins,
      oldGains: old.gains,
      oldMargins: old.margins,
      oldFailures: old.failures.map((failure) => failure.message),
    };
  });
  return { check, rows };
}
