/** The gain table and lookup a schedule file describes. */
import { makeGainLookup } from './interpolate.js';
import type { ScheduleFile } from './schedule-types.js';
import type { GainTable, GainsAtSpeed, LookupSettings } from './types.js';

/** Breakpoint speeds (m/s) and gains of a schedule. */
export function scheduleTable(schedule: Pick<ScheduleFile, 'breakpoints'>): GainTable {
  return {
    speeds_mps: schedule.breakpoints.map((row) => row.speed_mps),
    gains: schedule.breakpoints.map(({ kp, ki, kd }) => ({ kp, ki, kd })),
  };
}

/** Interpolation settings of a schedule. */
export function scheduleLookupSettings(schedule: Pick<ScheduleFile, 'interpolation'>): LookupSettings {
  return { interpolation: schedule.interpolation.method, lowSpeedFloor_mps: schedule.interpolation.lowSpeedFloor_mps };
}

/** The lookup firmware should compute for this schedule: (speed_mps) → gains (see interpolate.ts). */
export function scheduleLookup(schedule: Pick<ScheduleFile, 'breakpoints' | 'interpolation'>): GainsAtSpeed {
  return makeGainLookup(scheduleTable(schedule), scheduleLookupSettings(schedule));
}
