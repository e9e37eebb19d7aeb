/**
 * Where two schedules are compared: the union of their breakpoint speeds within the common
 * breakpoint range (breakpoints closer than a tolerance matched), and each schedule's values there.
 * - Gains: the schedule's own lookup (src/schedule/schedule-lookup.ts: its interpolation method,
 *   exact at breakpoints), so a compared speed shows what that schedule's firmware would use.
 * - Margins: proven only at breakpoints; between them they are read by linear interpolation of the
 *   two neighbouring breakpoints' margins (an estimate, not a check). A null margin means "no such
 *   crossing" (unbounded); between two nulls it stays null, between a null and a number the number
 *   is taken (the crossing is assumed present with the only known margin — the cautious reading).
 */
import type { BreakpointMargins, ScheduleFile } from '../schedule/schedule-types.js';

/** One compared speed and where each schedule is read, m/s (the two differ only for matched breakpoints). */
export interface ComparedPoint {
  readonly speed_mps: number;
  readonly oldSpeed_mps: number;
  readonly newSpeed_mps: number;
}

export interface SpeedMatch {
  /** First and last compared speed, m/s; null when the breakpoint ranges do not overlap. */
  readonly commonRange: { readonly minimum_mps: number; readonly maximum_mps: number } | null;
  readonly points: readonly ComparedPoint[];
  /** Breakpoints outside the common range, m/s. */
  readonly notCompared: { readonly old_mps: readonly number[]; readonly new_mps: readonly number[] };
}

/**
 * The speeds two schedules are compared at: the union of both breakpoint lists (each strictly
 * increasing, m/s) inside the common breakpoint range. Two breakpoints, one from each list, within
 * `tolerance_mps` of each other are one compared speed (the old one's), each schedule read at its own
 * breakpoint — breakpoints placed at measured test speeds differ by millimetres per second between
 * builds. The common range is widened by the tolerance at both ends for the same reason.
 */
export function matchSpeeds(oldSpeeds: readonly number[], newSpeeds: readonly number[], tolerance_mps: number): SpeedMatch {
  const low = Math.max(oldSpeeds[0], newSpeeds[0]) - tolerance_mps;
  const high = Math.min(oldSpeeds[oldSpeeds.length - 1], newSpeeds[newSpeeds.length - 1]) + tolerance_mps;
  const inside = (speed: number) => speed >= low && speed <= high;
  if (!(low <= high)) return { commonRange: null, points: [], notCompared: { old_mps: [...oldSpeeds], new_mps: [...newSpeeds] } };
  const olds = oldSpeeds.filter(inside);
  const news = newSpeeds.filter(inside);
  const points: ComparedPoint[] = [];
  let i = 0;
  let j = 0;
  while (i < olds.length || j < news.length) {
    const o = i < olds.length ? olds[i] : Number.POSITIVE_INFINITY;
    const n = j < news.length ? news[j] : Number.POSITIVE_INFINITY;
    if (Math.abs(o - n) <= tolerance_mps) {
      points.push({ speed_mps: o, oldSpeed_mps: o, newSpeed_mps: n });
      i += 1;
      j += 1;
    } else if (o < n) {
      points.push({ speed_mps: o, oldSpeed_mps: o, newSpeed_mps: o });
      i += 1;
    } else {
      points.push({ speed_mps: n, oldSpeed_mps: n, newSpeed_mps: n });
      j += 1;
    }
  }
  return {
    commonRange: points.length === 0 ? null : { minimum_mps: points[0].speed_mps, maximum_mps: points[points.length - 1].speed_mps },
    points,
    notCompared: { old_mps: oldSpeeds.filter((speed) => !inside(speed)), new_mps: newSpeeds.filter((speed) => !inside(speed)) },
  };
}

export type MarginName = 'lowerGainMargin_dB' | 'upperGainMargin_dB' | 'phaseMargin_deg' | 'delayMargin_s' | 'sensitivityPeak';

/** Margins of a schedule at a speed inside its breakpoint range: exact at a breakpoint, else as the file comment says. */
export interface MarginsAtSpeed {
  readonly atBreakpoint: boolean;
  readonly stable: boolean;
  readonly value: (name: MarginName) => number | null;
}

const linear = (x0: number, y0: number | null, x1: number, y1: number | null, x: number): number | null => {
  if (y0 === null) return y1;
  if (y1 === null) return y0;
  return y0 + ((x - x0) / (x1 - x0)) * (y1 - y0);
};

/**
 * Margins of `schedule` at `speed_mps` (m/s, within its first and last breakpoint). `stable` between
 * breakpoints is true only when both neighbours are stable.
 */
export function marginsAtSpeed(schedule: Pick<ScheduleFile, 'breakpoints'>, speed_mps: number): MarginsAtSpeed {
  const rows = schedule.breakpoints;
  const exact = rows.find((row) => row.speed_mps === speed_mps);
  if (exact !== undefined) {
    return { atBreakpoint: true, stable: exact.margins.stable, value: (name) => exact.margins[name] };
  }
  let upper = rows.findIndex((row) => row.speed_mps > speed_mps);
  if (upper <= 0) upper = upper === 0 ? 1 : rows.length - 1;
  const low = rows[upper - 1];
  const high = rows[upper];
  const margins = (row: { readonly margins: BreakpointMargins }, name: MarginName): number | null => row.margins[name];
  return {
    atBreakpoint: false,
    stable: low.margins.stable && high.margins.stable,
    value: (name) => linear(low.speed_mps, margins(low, name), high.speed_mps, margins(high, name), speed_mps),
  };
}
