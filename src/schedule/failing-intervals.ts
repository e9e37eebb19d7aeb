/**
 * Where a dense check fails, said as speed intervals: consecutive failing grid speeds form one
 * interval, with the acceptance limits broken anywhere in it ("19.8–25.0 m/s: phase margin, peak
 * sensitivity"). What a reviewer asks after a vehicle change — where do the old gains not hold?
 */
import type { CheckCriterion, CheckFailure } from './types.js';

/** Consecutive failing speeds of a check's grid. */
export interface FailingInterval {
  /** First and last failing grid speed of the run, m/s (equal for a single speed). */
  readonly from_mps: number;
  readonly to_mps: number;
  /** Grid speeds in the run. */
  readonly speeds: number;
  /** The limits broken somewhere in the run, in the order of CRITERION_ORDER. */
  readonly criteria: readonly CheckCriterion[];
}

/** The order criteria are listed in, and each one's name in words. */
export const CRITERION_NAMES: Readonly<Record<CheckCriterion, string>> = {
  stability: 'closed-loop stability',
  lowerGainMargin: 'lower gain margin',
  upperGainMargin: 'upper gain margin',
  phaseMargin: 'phase margin',
  delayMargin: 'delay margin',
  sensitivityPeak: 'peak sensitivity',
  complementarySensitivityPeak: 'peak complementary sensitivity',
};
const CRITERION_ORDER = Object.keys(CRITERION_NAMES) as CheckCriterion[];

/** The failing runs of a check's points (in grid order, as the check keeps them). */
export function failingIntervals(points: readonly { readonly speed_mps: number; readonly failures: readonly CheckFailure[] }[]): FailingInterval[] {
  const intervals: FailingInterval[] = [];
  let run: { from_mps: number; to_mps: number; speeds: number; criteria: Set<CheckCriterion> } | null = null;
  for (const point of points) {
    if (point.failures.length === 0) {
      if (run !== null) intervals.push(closed(run));
      run = null;
      continue;
    }
    run ??= { from_mps: point.speed_mps, to_mps: point.speed_mps, speeds: 0, criteria: new Set() };
    run.to_mps = point.speed_mps;
    run.speeds += 1;
    for (const failure of point.failures) run.criteria.add(failure.criterion);
  }
  if (run !== null) intervals.push(closed(run));
  return intervals;
}

function closed(run: { from_mps: number; to_mps: number; speeds: number; criteria: Set<CheckCriterion> }): FailingInterval {
  return { from_mps: run.from_mps, to_mps: run.to_mps, speeds: run.speeds, criteria: CRITERION_ORDER.filter((criterion) => run.criteria.has(criterion)) };
}

/** "19.8–25 m/s (phase margin, peak sensitivity)"; speeds with up to 2 decimals. */
export function failingIntervalWords(interval: FailingInterval): string {
  const speed = (value: number): string => String(Number(value.toFixed(2)));
  const where = interval.from_mps === interval.to_mps ? `${speed(interval.from_mps)} m/s` : `${speed(interval.from_mps)}–${speed(interval.to_mps)} m/s`;
  return `${where} (${interval.criteria.map((criterion) => CRITERION_NAMES[criterion]).join(', ')})`;
}
