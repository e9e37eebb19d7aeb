/**
 * Re-verify a schedule independently of how it was made: its own table, lookup, loop and
 * controller, checked densely against a vehicle model (a fresh identification, a models file,
 * or the model recorded in the schedule). Hand edits are caught earlier by readSchedule
 * (schema and checksum); this catches gains that no longer hold on the model.
 */
import type { ControllerSettings } from '../controller/types.js';
import type { LoopSpecification } from '../loops/types.js';
import { denseCheck } from '../schedule/dense-check.js';
import { checkGrid } from '../schedule/grid.js';
import { scheduleLookup } from '../schedule/schedule-lookup.js';
import type { ScheduleFile } from '../schedule/schedule-types.js';
import type { DenseCheckResult, GainsAtSpeed, ProgressCallback, SpeedRange } from '../schedule/types.js';
import { checkModelFromSummary, parseCheckModelSummary, type CheckModel } from './check-model.js';
import { makeLoopAnalysis } from './loop-analysis.js';
import { denseCheckOnAllCores } from './parallel-check.js';

/** Input of recheckSchedule: the schedule, and the model to check it on (default: the one it records). */
export interface RecheckInput {
  readonly schedule: ScheduleFile;
  readonly model: CheckModel;
  /** Check speeds across the range (default: the schedule's own grid density). */
  readonly gridSpeeds?: number;
  /** Speed range to check (default: the schedule's own). */
  readonly range?: SpeedRange;
  /** Exact check speeds, m/s (overrides range and gridSpeeds), e.g. another schedule's grid for a side-by-side check. */
  readonly grid?: ArrayLike<number>;
  /** Gains to check instead of the schedule's own lookup (e.g. quantised gains). */
  readonly gainsAt?: GainsAtSpeed;
  readonly onProgress?: ProgressCallback;
}

/** Loop specification and controller settings as the schedule states them. */
export function scheduleLoopAndController(schedule: ScheduleFile): { loop: LoopSpecification; controller: ControllerSettings } {
  return {
    loop: {
      kind: schedule.loop.kind,
      ...(schedule.loop.preview_m === undefined ? {} : { preview_m: schedule.loop.preview_m }),
      ...(schedule.loop.previewTime_s === undefined ? {} : { previewTime_s: schedule.loop.previewTime_s }),
      ...(schedule.loop.referencePoint === undefined ? {} : { referencePoint: schedule.loop.referencePoint }),
    },
    controller: {
      derivativeFilter: schedule.controller.derivativeFilter,
      sampleTime_s: schedule.controller.sampleTime_s,
      discretisation: schedule.controller.discretisation,
      computationLatency_s: schedule.controller.computationLatency_s,
    },
  };
}

/** The model a schedule records in its provenance (what it was built and checked on), or null when it records none speedband can rebuild. */
export function recordedCheckModel(schedule: ScheduleFile): CheckModel | null {
  const summary = parseCheckModelSummary(schedule.provenance.model);
  return summary === null ? null : checkModelFromSummary(summary, `${schedule.check.model.description} (as recorded in the schedule)`);
}

/** The check grid of a recheck: the given speeds, or the schedule's breakpoints and midpoints with evenly spaced speeds over the range. */
function recheckGrid(input: RecheckInput): ArrayLike<number> {
  const { schedule } = input;
  return (
    input.grid ??
    checkGrid(
      schedule.breakpoints.map((breakpoint) => breakpoint.speed_mps),
      input.range ?? schedule.check.range,
      input.gridSpeeds ?? schedule.check.gridSpeeds,
    )
  );
}

/** Dense check of a schedule's gains on a model, with the schedule's thresholds. */
export function recheckSchedule(input: RecheckInput): DenseCheckResult {
  const { loop, controller } = scheduleLoopAndController(input.schedule);
  return denseCheck({
    grid: recheckGrid(input),
    gainsAt: input.gainsAt ?? scheduleLookup(input.schedule),
    analyse: makeLoopAnalysis(input.model, loop, controller),
    thresholds: input.schedule.check.thresholds,
    ...(input.onProgress === undefined ? {} : { onProgress: input.onProgress }),
  });
}

/**
 * As recheckSchedule, on every core for a large grid (parallel-check.ts): the same points and figures.
 * `workers` limits the worker threads (default: the available parallelism − 1; 0 = the main thread only).
 */
export async function recheckScheduleOnAllCores(input: RecheckInput & { readonly workers?: number }): Promise<DenseCheckResult> {
  const { loop, controller } = scheduleLoopAndController(input.schedule);
  return denseCheckOnAllCores({
    model: input.model,
    loop,
    controller,
    thresholds: input.schedule.check.thresholds,
    grid: recheckGrid(input),
    gainsAt: input.gainsAt ?? scheduleLookup(input.schedule),
    ...(input.workers === undefined ? {} : { workers: input.workers }),
    ...(input.onProgress === undefined ? {} : { onProgress: input.onProgress }),
  });
}
