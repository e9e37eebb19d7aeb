/**
 * After a vehicle change: the OLD schedule's gains (with its own loop, controller and limits)
 * checked on the NEW vehicle model at exactly the speeds of the new schedule's dense check,
 * so that the two can be read side by side — "are my current gains still safe, and where not?" — and,
 * when the new plan gives variations, over the new vehicle's whole set.
 */
import type { OldGainsOnNewVehicle } from '../compare/types.js';
import type { PidGains } from '../controller/types.js';
import { quoted } from '../core/quote.js';
import { failingIntervals } from '../schedule/failing-intervals.js';
import { checkGrid } from '../schedule/grid.js';
import type { BreakpointMargins, ScheduleFile } from '../schedule/schedule-types.js';
import type { DenseCheckResult } from '../schedule/types.js';
import type { LoopMargins } from '../verify/types.js';
import type { BuildResult } from './build-schedule.js';
import { recheckSchedule, recordedCheckModel, scheduleLoopAndController } from './recheck-schedule.js';
import { robustScheduleCheck, type RobustScheduleCheck } from './robust-schedule-check.js';
import type { RobustCheckPoint } from '../robust/types.js';
import { scheduleLookup } from '../schedule/schedule-lookup.js';

export interface BaselineRow {
  readonly speed_mps: number;
  readonly newGains: PidGains;
  readonly newMargins: BreakpointMargins;
  readonly oldGains: PidGains;
  readonly oldMargins: LoopMargins;
  /** Acceptance limits the old gains break at this speed, in words (empty: within the limits). */
  readonly oldFailures: readonly string[];
  /** With the new plan's variations: the old gains' worst case over the new vehicle's set at this speed (null without). */
  readonly oldWorstCase: RobustCheckPoint | null;
}

export interface BaselineCheck {
  /** The old gains' dense check on the new model, on the new schedule's grid. */
  readonly check: DenseCheckResult;
  /** With the new plan's variations: the old gains' worst case over the new vehicle's set, on the same grid (null without). */
  readonly overVariations: RobustScheduleCheck | null;
  /** One row per breakpoint of the new schedule. */
  readonly rows: readonly BaselineRow[];
}

/**
 * Check `baseline`'s gains on the model of `build`, at the speeds of the new schedule's dense check; when the new
 * plan gives variations, also their worst case over the new vehicle's set (the same machinery as the new schedule's
 * robust check, with the old schedule's own loop, controller and limits). `workers` as robustCheckOnAllCores.
 */
export async function checkBaseline(baseline: ScheduleFile, build: BuildResult, workers?: number): Promise<BaselineCheck> {
  const grid = build.refinement.check.points.map((point) => point.speed_mps);
  const check = recheckSchedule({ schedule: baseline, model: build.checkModel, grid });
  const bySpeed = new Map(check.points.map((point) => [point.speed_mps, point]));
  const overVariations = build.robust === undefined ? null : await oldGainsOverSet(baseline, build, grid, workers);
  const robustBySpeed = new Map((overVariations?.check.points ?? []).map((point) => [point.speed_mps, point]));
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
      oldWorstCase: robustBySpeed.get(breakpoint.speed_mps) ?? null,
    };
  });
  return { check, overVariations, rows };
}

/** The old schedule's gains over the new build's variation set, on its model and grid. */
async function oldGainsOverSet(baseline: ScheduleFile, build: BuildResult, grid: readonly number[], workers?: number): Promise<RobustScheduleCheck> {
  const record = build.robust!.record;
  const { loop, controller } = scheduleLoopAndController(baseline);
  const { method: _method, ...search } = record.search;
  return robustScheduleCheck({
    acceptance: record.acceptance,
    model: build.checkModel,
    loop,
    controller,
    set: record.set,
    search,
    thresholds: baseline.check.thresholds,
    grid,
    gainsAt: scheduleLookup(baseline),
    breakpointSpeeds: build.schedule.breakpoints.map((row) => row.speed_mps),
    ...(workers === undefined ? {} : { workers }),
  });
}

/** The old gains' check as the comparison records it (`OldGainsOnNewVehicle`): verdict, where it fails, worst figures. */
export function summariseOldGainsCheck(check: DenseCheckResult, baseline: ScheduleFile, modelDescription: string): OldGainsOnNewVehicle {
  const speeds = check.points.map((point) => point.speed_mps);
  return {
    available: true,
    passed: check.passed,
    model: modelDescription,
    range: { minimum_mps: speeds[0], maximum_mps: speeds[speeds.length - 1] },
    gridSize: check.points.length,
    failedSpeeds: check.failedCount,
    failingIntervals: failingIntervals(check.points),
    thresholds: baseline.check.thresholds,
    worst: check.worst,
  };
}

/**
 * The old schedule's gains checked on the model the NEW schedule records (its provenance), at the speeds of the
 * new schedule's dense check — what `build --baseline` checks, from two schedule files alone (`speedband compare`,
 * the report). `check` is null when the new schedule records no model speedband can rebuild.
 */
export function oldGainsOnNewVehicle(
  old: ScheduleFile,
  next: ScheduleFile,
): { readonly summary: OldGainsOnNewVehicle; readonly check: DenseCheckResult | null } {
  const model = recordedCheckModel(next);
  if (model === null) {
    return {
      summary: {
        available: false,
        reason: `the new schedule records no vehicle model speedband can rebuild (its provenance.model kind is ${quoted(String(next.provenance.model.kind ?? 'missing'))})`,
      },
      check: null,
    };
  }
  const grid = checkGrid(
    next.breakpoints.map((breakpoint) => breakpoint.speed_mps),
    next.check.range,
    next.check.gridSpeeds,
  );
  const check = recheckSchedule({ schedule: old, model, grid });
  return { summary: summariseOldGainsCheck(check, old, next.check.model.description), check };
}
