/** The gain table and lookup a schedule file describes. */
import type { FirmwareGains, FirmwareSettings } from '../controller/firmware-step.js';
import { makeColumnsLookup, makeColumnsRowLookup, makeGainLookup } from './interpolate.js';
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

/** What the firmware's controller takes from a schedule at a measured speed. */
export interface ScheduledController {
  readonly gains: FirmwareGains;
  readonly feedForwardLeadTime_s: number;
}

/**
 * The schedule as the firmware runs it: the controller settings it states (the command and F + I clamped to
 * its integrator clamp, the steer-angle limit) and the lookup of every scheduled number at a speed.
 */
export function scheduleFirmware(schedule: Pick<ScheduleFile, 'breakpoints' | 'interpolation' | 'controller'>): {
  settings: FirmwareSettings;
  at: (speed_mps: number) => ScheduledController;
} {
  // The gains' lookup and the extras' in one (the same arithmetic as scheduleLookup and scheduleExtrasLookup: one
  // search for the interval, each column interpolated on its own), called once per sample by the scenario simulator.
  const rows = schedule.breakpoints;
  const lookup = makeColumnsRowLookup(
    rows.map((row) => row.speed_mps),
    [
      rows.map((row) => row.kp),
      rows.map((row) => row.ki),
      rows.map((row) => row.kd),
      rows.map((row) => row.setpointWeightProportional),
      rows.map((row) => row.setpointWeightDerivative),
      rows.map((row) => row.feedForward),
      rows.map((row) => row.feedForwardLeadTime_s),
    ],
    scheduleLookupSettings(schedule),
  );
  const out = new Float64Array(7);
  const c = schedule.controller;
  return {
    settings: {
      derivativeFilter: c.derivativeFilter,
      sampleTime_s: c.sampleTime_s,
      discretisation: c.discretisation,
      computationLatency_s: c.computationLatency_s,
      antiWindup: c.antiWindup,
      commandLimit_rad: c.integratorClamp_rad,
      integratorClamp_rad: c.integratorClamp_rad,
    },
    at: (speed_mps) => {
      lookup(speed_mps, out);
      return {
        gains: {
          kp: out[0],
          ki: out[1],
          kd: out[2],
          setpointWeightProportional: out[3],
          setpointWeightDerivative: out[4],
          feedForward: out[5],
        },
        feedForwardLeadTime_s: out[6],
      };
    },
  };
}
