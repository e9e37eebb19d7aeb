/**
 * The robust half of re-verifying a schedule (`check`, `reverify`): its own gains, over the variation set it
 * records, on a vehicle model (the recorded one or a fresh identification: the set's changes are relative to
 * the model, so they apply to either), on the schedule's own grid and limits.
 */
import { SpeedbandError } from '../core/errors.js';
import { checkGrid } from '../schedule/grid.js';
import { scheduleLookup } from '../schedule/schedule-lookup.js';
import type { ScheduleFile } from '../schedule/schedule-types.js';
import type { GainsAtSpeed, ProgressCallback } from '../schedule/types.js';
import type { CheckModel } from './check-model.js';
import { scheduleLoopAndController } from './recheck-schedule.js';
import { robustScheduleCheck, type RobustScheduleCheck } from './robust-schedule-check.js';
import { breakpointControl } from './robust-time-domain.js';

export interface RobustRecheckInput {
  readonly schedule: ScheduleFile;
  readonly model: CheckModel;
  /** Gains to check instead of the schedule's own lookup. */
  readonly gainsAt?: GainsAtSpeed;
  readonly workers?: number;
  readonly onProgress?: ProgressCallback;
}

/**
 * The worst case of a schedule's gains over the variation set it records, or null when it records none.
 * Throws `check.variationsModelMismatch` when the set was made for another kind of model than `model`.
 */
export async function recheckOverVariations(input: RobustRecheckInput): Promise<RobustScheduleCheck | null> {
  const { schedule, model } = input;
  const variations = schedule.variations;
  if (variations === undefined) return null;
  if (variations.set.model !== model.kind) {
    throw new SpeedbandError(
      'check.variationsModelMismatch',
      `the schedule's variations vary the ${variations.set.model} model, but the check runs on the ${model.kind} model (${model.description}) — check on the model the schedule was built on, or rebuild the schedule`,
      { details: { setModel: variations.set.model, model: model.kind } },
    );
  }
  const { loop, controller } = scheduleLoopAndController(schedule);
  const breakpointSpeeds = schedule.breakpoints.map((row) => row.speed_mps);
  const { method: _method, ...search } = variations.search;
  return robustScheduleCheck({
    acceptance: variations.acceptance,
    model,
    loop,
    controller,
    set: variations.set,
    search,
    thresholds: schedule.check.thresholds,
    grid: checkGrid(breakpointSpeeds, schedule.check.range, schedule.check.gridSpeeds),
    gainsAt: input.gainsAt ?? scheduleLookup(schedule),
    breakpointSpeeds,
    // The time-domain figures over the set need the breakpoints' own set-point weights and feed-forward: the schedule's gains only.
    ...(input.gainsAt !== undefined
      ? {}
      : {
          timeDomain: {
            limits: schedule.check.timeDomain.limits,
            vehicleLimits: schedule.check.timeDomain.steeringLimits,
            antiWindup: schedule.controller.antiWindup,
            breakpoints: schedule.breakpoints.map((row) => breakpointControl(row.speed_mps, row, row)),
          },
        }),
    ...(input.workers === undefined ? {} : { workers: input.workers }),
    ...(input.onProgress === undefined ? {} : { onProgress: input.onProgress }),
  });
}
