/** The gain table and lookup a schedule file describes. */
import { makeColumnsLookup, makeGainLookup } from './interpolate.js';
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

/** The values a schedule gives besides the gains, interpolated like them. */
export interface ScheduledExtras {
  readonly setpointWeightProportional: number;
  readonly setpointWeightDerivative: number;
  readonly feedForward: number;
  readonly feedForwardLeadTime_s: number;
}

/** The lookup of set-point weights, feed-forward gain and its lead time at a speed (same interpolation as the gains). */
export function scheduleExtrasLookup(schedule: Pick<ScheduleFile, 'breakpoints' | 'interpolation'>): (speed_mps: number) => ScheduledExtras {
  const rows = schedule.breakpoints;
  return makeColumnsLookup(
    rows.map((row) => row.speed_mps),
    {
      setpointWeightProportional: rows.map((row) => row.setpointWeightProportional),
      setpointWeightDerivative: rows.map((row) => row.setpointWeightDerivative),
      feedForward: rows.map((row) => row.feedForward),
      feedForwardLeadTime_s: rows.map((row) => row.feedForwardLeadTime_s),
    },
    scheduleLookupSettings(schedule),
  );
}
