/**
 * The dense check point by point, for the report's margin and gain plots: a schedule file keeps only its
 * worst figures and first failures, so the check is re-run on the model the schedule records (the same
 * grid, gains, loop, controller and limits: `recheckSchedule`) — or taken as the build just ran it.
 */
import { recheckSchedule, recordedCheckModel } from '../pipeline/recheck-schedule.js';
import { failingIntervals, failingIntervalWords } from '../schedule/failing-intervals.js';
import type { ScheduleFile } from '../schedule/schedule-types.js';
import type { DenseCheckResult, WorstMargins } from '../schedule/types.js';
import type { LoopMargins } from '../verify/types.js';
import type { PointMargins, ReportCheck } from './types.js';

/** The figures the report plots of a loop's margins. */
export function pointMargins(margins: LoopMargins): PointMargins {
  return {
    verdict: margins.verdict,
    lowerGainMargin_dB: margins.lowerGainMargin_dB,
    upperGainMargin_dB: margins.upperGainMargin_dB,
    phaseMargin_deg: margins.phaseMargin_deg,
    delayMargin_s: margins.delayMargin_s,
    sensitivityPeak: margins.sensitivityPeak,
    complementarySensitivityPeak: margins.complementarySensitivityPeak,
  };
}

/** A dense check as the report keeps it. */
export function reportCheck(check: DenseCheckResult, description: string): ReportCheck {
  return {
    description,
    passed: check.passed,
    points: check.points.map((point) => ({
      speed_mps: point.speed_mps,
      gains: point.gains,
      margins: pointMargins(point.margins),
      failures: point.failures.map((failure) => failure.criterion),
    })),
    failingIntervals: failingIntervals(check.points).map(failingIntervalWords),
  };
}

/** The schedule's own dense check, re-run on the model it records; null when it records none speedband can rebuild. */
export function rerunScheduleCheck(schedule: ScheduleFile): DenseCheckResult | null {
  const model = recordedCheckModel(schedule);
  return model === null ? null : recheckSchedule({ schedule, model });
}

const sameWorst = (a: WorstMargins, b: WorstMargins): boolean =>
  (Object.keys(a) as (keyof WorstMargins)[]).every((name) => {
    const [p, q] = [a[name], b[name]];
    return p === null || q === null ? p === q : p.value === q.value && p.speed_mps === q.speed_mps;
  });

/** Whether a check reproduces what the schedule file records: status, failure count, grid size and every worst figure with its speed, exactly. */
export function reproducesRecordedCheck(schedule: ScheduleFile, check: DenseCheckResult): boolean {
  return (
    check.passed === schedule.check.passed &&
    check.failedCount === schedule.check.failedSpeeds &&
    check.points.length === schedule.check.gridSize &&
    sameWorst(check.worst, schedule.check.worst)
  );
}
