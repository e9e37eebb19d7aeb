/**
 * Breakpoint refinement: where the dense check fails between breakpoints, tune a new
 * breakpoint there, re-check, and say where and why. Bounded by a maximum number of insertions.
 * Pure: tuning and loop analysis are function arguments.
 */
import { atSpeed, type OverSpeed } from '../core/by-speed.js';
import type { PidGains } from '../controller/types.js';
import { denseCheck, judgeMargins } from './dense-check.js';
import { checkGrid } from './grid.js';
import { makeGainLookup } from './interpolate.js';
import type {
  AcceptanceThresholds,
  AnalyseLoop,
  CheckFailure,
  CheckPoint,
  DenseCheckResult,
  GainTable,
  LookupSettings,
  ProgressCallback,
  SpeedRange,
} from './types.js';

export interface RefineInput {
  readonly table: GainTable;
  readonly range: SpeedRange;
  /** Evenly spaced check speeds across the range (checkGrid adds breakpoints and midpoints). */
  readonly density: number;
  readonly lookup: LookupSettings;
  /** Gains the tuning rule gives at a speed (m/s), e.g. tuneOperatingPoint at that speed. */
  readonly tuneAt: (speed_mps: number) => PidGains;
  readonly analyse: AnalyseLoop;
  readonly thresholds: OverSpeed<AcceptanceThresholds>;
  /** Most breakpoints refinement may add in all. */
  readonly maxInsertions: number;
  readonly onProgress?: ProgressCallback;
}

/** One inserted breakpoint: where, in which round, which interval failed and why. */
export interface BreakpointInsertion {
  readonly speed_mps: number;
  /** 1-based refinement round. */
  readonly round: number;
  /** Neighbouring breakpoints of the failing interval, m/s (null: beyond the table's end). */
  readonly below_mps: number | null;
  readonly above_mps: number | null;
  /** Grid speeds in the interval that failed. */
  readonly failingSpeeds: number;
  readonly failures: readonly CheckFailure[];
  readonly reason: string;
}

/** A failing speed refinement cannot fix, and why. */
export interface UnfixableFailure {
  readonly speed_mps: number;
  readonly failures: readonly CheckFailure[];
  readonly reason: string;
}

export type RefineStop = 'passed' | 'insertionLimit' | 'notFixableByInsertion';

export interface RefineResult {
  readonly passed: boolean;
  readonly stoppedBecause: RefineStop;
  /** Final table, breakpoints in increasing speed. */
  readonly table: GainTable;
  /** Per final breakpoint: true when refinement inserted it. */
  readonly insertedByRefinement: readonly boolean[];
  readonly insertions: readonly BreakpointInsertion[];
  readonly unfixable: readonly UnfixableFailure[];
  /** Dense check of the final table. */
  readonly check: DenseCheckResult;
}

export const REFINE_DEFAULTS = { maxInsertions: 8 } as const;

/** How far a point is past its limits, for choosing where in an interval to insert (instability ranks first). */
function severity(failures: readonly CheckFailure[]): number {
  let total = 0;
  for (const failure of failures) {
    if (failure.criterion === 'stability' || failure.value === null || failure.limit === null) return Number.POSITIVE_INFINITY;
    const scale = Math.max(Math.abs(failure.limit), 1e-12);
    total += Math.abs(failure.value - failure.limit) / scale;
  }
  return total;
}

const shown = (speed: number): string => String(Number(speed.toPrecision(4)));

/** Identity of the interval below breakpoint `index` (its neighbouring breakpoint speeds). */
const intervalKey = (speeds: readonly number[], index: number): string => `${speeds[index - 1] ?? '-'}|${speeds[index] ?? '+'}`;

/**
 * Refine: check the table on checkGrid(breakpoints, range, density); for each interval between
 * neighbouring breakpoints (or beyond an end) with failing speeds, insert one breakpoint at its
 * most severe failing speed (instability first, then the summed relative excess over the limits),
 * with gains from `tuneAt`; repeat until the check passes, `maxInsertions` is used up, or every
 * failure sits at a breakpoint or below the low-speed floor (insertion cannot change those gains).
 * A candidate whose own tuned gains fail at its speed is not inserted (the rule itself fails there):
 * it is reported in `unfixable` and its interval is not tried again.
 */
export function refineBreakpoints(input: RefineInput): RefineResult {
  const { range, density, lookup, tuneAt, analyse, thresholds, maxInsertions, onProgress } = input;
  let speeds = [...input.table.speeds_mps];
  let gains = [...input.table.gains];
  let inserted = speeds.map(() => false);
  const insertions: BreakpointInsertion[] = [];
  /** Candidates whose own tuned gains fail: inserting cannot help; their intervals are not tried again. */
  const rejected: UnfixableFailure[] = [];
  const hopelessIntervals = new Set<string>();
  let round = 0;

  for (;;) {
    const table: GainTable = { speeds_mps: speeds, gains };
    const check = denseCheck({
      grid: checkGrid(speeds, range, density),
      gainsAt: makeGainLookup(table, lookup),
      analyse,
      thresholds,
      ...(onProgress === undefined ? {} : { onProgress }),
    });
    const result = (passed: boolean, stoppedBecause: RefineStop, unfixable: UnfixableFailure[]): RefineResult => ({
      passed,
      stoppedBecause,
      table,
      insertedByRefinement: inserted,
      insertions,
      unfixable,
      check,
    });
    if (check.passed) return result(true, 'passed', [...rejected]);

    round += 1;
    const unfixable: UnfixableFailure[] = [];
    const byInterval = new Map<number, CheckPoint[]>();
    const breakpointSet = new Set(speeds);
    for (const point of check.points) {
      if (point.failures.length === 0) continue;
      if (breakpointSet.has(point.speed_mps)) {
        unfixable.push({
          speed_mps: point.speed_mps,
          failures: point.failures,
          reason: `fails at a breakpoint: the rule's own gains at ${shown(point.speed_mps)} m/s break the limits — change the rule or its parameters`,
        });
        continue;
      }
      if (point.speed_mps < lookup.lowSpeedFloor_mps && point.speed_mps < speeds[0]) {
        unfixable.push({
          speed_mps: point.speed_mps,
          failures: point.failures,
          reason: `below the low-speed floor ${shown(lookup.lowSpeedFloor_mps)} m/s, where the floor's gains are used — lower the floor or raise the range minimum`,
        });
        continue;
      }
      const interval = speeds.filter((speed) => speed < point.speed_mps).length;
      if (hopelessIntervals.has(intervalKey(speeds, interval))) continue;
      const list = byInterval.get(interval) ?? [];
      list.push(point);
      byInterval.set(interval, list);
    }
    const remaining = maxInsertions - insertions.length;
    if (byInterval.size === 0) return result(false, 'notFixableByInsertion', [...unfixable, ...rejected]);
    if (remaining <= 0) return result(false, 'insertionLimit', [...unfixable, ...rejected]);

    const chosen: BreakpointInsertion[] = [];
    for (const interval of [...byInterval.keys()].sort((a, b) => a - b).slice(0, remaining)) {
      const failing = byInterval.get(interval) ?? [];
      let worst = failing[0];
      for (const point of failing) if (severity(point.failures) > severity(worst.failures)) worst = point;
      const below_mps = interval > 0 ? speeds[interval - 1] : null;
      const above_mps = interval < speeds.length ? speeds[interval] : null;
      const between = `${below_mps === null ? 'below the first breakpoint' : `${shown(below_mps)}`}${
        above_mps === null ? ' and above (beyond the last breakpoint)' : ` to ${shown(above_mps)} m/s`
      }`;
      chosen.push({
        speed_mps: worst.speed_mps,
        round,
        below_mps,
        above_mps,
        failingSpeeds: failing.length,
        failures: worst.failures,
        reason: `${failing.length} check speed(s) between ${between} failed; worst at ${shown(worst.speed_mps)} m/s (${worst.failures
          .map((failure) => failure.message)
          .join('; ')}) — breakpoint inserted there`,
      });
    }
    const intervalsBefore = speeds;
    for (const insertion of chosen) {
      const tuned = tuneAt(insertion.speed_mps);
      const own = judgeMargins(analyse(insertion.speed_mps, tuned), atSpeed(thresholds, insertion.speed_mps));
      if (own.length > 0) {
        hopelessIntervals.add(intervalKey(intervalsBefore, intervalsBefore.filter((speed) => speed < insertion.speed_mps).length));
        rejected.push({
          speed_mps: insertion.speed_mps,
          failures: own,
          reason: `the rule's own gains at ${shown(insertion.speed_mps)} m/s fail too (${own
            .map((failure) => failure.message)
            .join('; ')}) — a breakpoint there cannot fix the interval; change the rule or its parameters`,
        });
        continue;
      }
      const at = speeds.filter((speed) => speed < insertion.speed_mps).length;
      speeds = [...speeds.slice(0, at), insertion.speed_mps, ...speeds.slice(at)];
      gains = [...gains.slice(0, at), tuned, ...gains.slice(at)];
      inserted = [...inserted.slice(0, at), true, ...inserted.slice(at)];
      insertions.push(insertion);
      onProgress?.({ stage: 'refine', done: insertions.length, total: maxInsertions, note: insertion.reason });
    }
  }
}
