/**
 * For `compare`: both schedules' gains in the worst case over the variation set the NEW schedule records, on the
 * model it records, at the compared speeds — the machinery of the robust check (worstCaseMarginsAt), each schedule
 * with its own lookup, loop, controller and limits. The old gains over the new vehicle as it will really be.
 */
import { robustCheckPoint } from '../robust/robust-check.js';
import type { VariationsAtSpeed, VariationsComparison, WorstCaseSide } from '../compare/types.js';
import { scheduleLookup } from '../schedule/schedule-lookup.js';
import type { ScheduleFile } from '../schedule/schedule-types.js';
import type { CheckModel } from './check-model.js';
import { recordedCheckModel, scheduleLoopAndController } from './recheck-schedule.js';
import { makeRobustAnalysis } from './robust-analysis.js';

/** A compared speed: where each schedule is read (within the comparison's speed tolerance). */
export interface ComparedSpeeds {
  readonly speed_mps: number;
  readonly oldSpeed_mps: number;
  readonly newSpeed_mps: number;
}

/** Both gains over the new schedule's set at `speeds` (see the module comment); `model` defaults to the one the new schedule records. */
export function compareOverVariations(old: ScheduleFile, next: ScheduleFile, speeds: readonly ComparedSpeeds[], model?: CheckModel): VariationsComparison {
  const variations = next.variations;
  if (variations === undefined) return { available: false, reason: 'the new schedule records no variations (its plan gave none)' };
  const checkModel = model ?? recordedCheckModel(next);
  if (checkModel === null) return { available: false, reason: 'the new schedule records no model speedband can rebuild' };
  if (checkModel.kind !== variations.set.model)
    return { available: false, reason: `the new schedule's variations vary the ${variations.set.model} model, not the ${checkModel.kind} model` };
  const { method: _method, ...search } = variations.search;
  const side = (schedule: ScheduleFile) => {
    const { loop, controller } = scheduleLoopAndController(schedule);
    return {
      lookup: scheduleLookup(schedule),
      thresholds: schedule.check.thresholds,
      analyse: makeRobustAnalysis({ model: checkModel, loop, controller, set: variations.set, search }),
    };
  };
  const before = side(old);
  const after = side(next);
  const at = (s: ReturnType<typeof side>, speed_mps: number, readAt_mps: number): WorstCaseSide => {
    const point = robustCheckPoint(speed_mps, s.lookup(readAt_mps), s.analyse, s.thresholds);
    return { instability: point.instability, worst: point.worst, failures: point.failures.map((failure) => failure.message) };
  };
  const rows = speeds.map(
    (row): VariationsAtSpeed => ({
      speed_mps: row.speed_mps,
      old: at(before, row.newSpeed_mps, row.oldSpeed_mps),
      new: at(after, row.newSpeed_mps, row.newSpeed_mps),
    }),
  );
  return { available: true, acceptance: variations.acceptance, set: variations.set, model: checkModel.description, speeds: rows };
}
