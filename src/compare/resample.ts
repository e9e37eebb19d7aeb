/**
 * Where two schedules are compared: the union of their breakpoint speeds within the common
 * breakpoint range, and each schedule's values there.
 * - Gains: the schedule's own lookup (src/schedule/schedule-lookup.ts: its interpolation method,
 *   exact at breakpoints), so a compared speed shows what that schedule's firmware would use.
 * - Margins: proven only at breakpoints; between them they are read by linear interpolation of the
 *   two neighbouring breakpoints' margins (an estimate, not a check). A null margin means "no such
 *   crossing" (unbounded); between two nulls it stays null, between a null and a number the number
 *   is taken (the crossing is assumed present with the only known margin — the cautious reading).
 */
import type { BreakpointMargins, ScheduleFile } from '../schedule/schedule-types.js';

/** The common range of two sets of breakpoint speeds (m/s), or null when they do not overlap. */
export function commonSpeedRange(oldSpeeds: readonly number[], newSpeeds: readonly number[]): { minimum_mps: number; maximum_mps: number } | null {
  const minimum_mps = Math.max(oldSpeeds[0], newSpeeds[0]);
  const maximum_mps = Math.min(oldSpeeds[oldSpeeds.length - 1], newSpeeds[newSpeeds.length - 1]);
  return minimum_mps <= maximum_mps ? { minimum_mps, maximum_mps } : null;
}

/** Sorted union (exact equality removes duplicates) of both speed lists inside [minimum, maximum], m/s. */
export function comparedSpeeds(oldSpeeds: readonly number[], newSpeeds: readonly number[], range: { minimum_mps: number; maximum_mps: number }): number[] {
  const inside = [...oldSpeeds, ...newSpeeds].filter((speed) => speed >= range.minimum_mps && speed <= range.maximum_mps);
  return [...new Set(inside)].sort((a, b) => a - b);
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
