/**
 * Schedules for the comparison tests, assembled and checksummed by the schedule module itself
 * (assembleSchedule), never hand-written JSON. Synthetic data: the constructed integrator loop of
 * test/schedule/integrator-loop.ts (G_v(s) = v²·e^(−0.1 s)/s under kp, margins in closed form).
 */
import { sha256Hex } from '../../src/core/files.js';
import { denseCheck } from '../../src/schedule/dense-check.js';
import { checkGrid } from '../../src/schedule/grid.js';
import { makeGainLookup } from '../../src/schedule/interpolate.js';
import { resolvePlan, type PartialPlan } from '../../src/schedule/plan.js';
import { numericAcceptanceLimits } from '../../src/schedule/acceptance-limits.js';
import { assembleSchedule } from '../../src/schedule/schedule-file.js';
import type { ScheduleFile } from '../../src/schedule/schedule-types.js';
import type { GainTable } from '../../src/schedule/types.js';
import type { PidGains } from '../../src/controller/types.js';
import { idealGains, integratorLoopMargins } from '../schedule/integrator-loop.js';
import { fixtureExtras } from '../schedule/sample-schedule.js';

export const FIXTURE_SPEEDS = [2, 3, 4.5, 7, 10, 16] as const;

/** The single-track summary the build writes into provenance.model (names fixed by the build). */
export const SINGLE_TRACK_SUMMARY = {
  kind: 'single-track',
  frontCorneringStiffness_NPerRad: 120000,
  rearCorneringStiffness_NPerRad: 180000,
  actuatorLag_s: 0.08,
  actuatorDelay_s: 0.05,
  understeerGradient_radPerMps2: 0.005378,
} as const;

export interface FixtureOptions {
  readonly speeds?: readonly number[];
  /** Gains at a breakpoint (default: kp of kθ = π/6, ki = 0.3·kp, kd = 0.05·kp — synthetic). */
  readonly gainsAt?: (speed_mps: number, index: number) => PidGains;
  readonly plan?: PartialPlan;
  readonly modelSummary?: Readonly<Record<string, unknown>>;
  readonly vehicleName?: string;
}

export const fixtureGains = (speed_mps: number): PidGains => {
  const kp = idealGains(speed_mps).kp;
  return { kp, ki: 0.3 * kp, kd: 0.05 * kp };
};

/** A schedule with a dense check on the integrator loop, assembled by the schedule module (checksum included). */
export function fixtureSchedule(options: FixtureOptions = {}): ScheduleFile {
  const speeds = [...(options.speeds ?? FIXTURE_SPEEDS)];
  const plan = resolvePlan({
    loop: { kind: 'path', preview_m: 4, referencePoint: 'front-axle' },
    speeds: { minimum_mps: speeds[0], maximum_mps: speeds[speeds.length - 1], lowSpeedFloor_mps: speeds[0] },
    breakpoints: { speeds_mps: speeds },
    acceptance: { delayMarginRoom_s: 0.02 },
    check: { gridSpeeds: 60 },
    ...options.plan,
  });
  const gainsAt = options.gainsAt ?? fixtureGains;
  const table: GainTable = { speeds_mps: speeds, gains: speeds.map((speed, k) => gainsAt(speed, k)) };
  const check = denseCheck({
    grid: checkGrid(speeds, plan.speeds, plan.check.gridSpeeds),
    gainsAt: makeGainLookup(table, { interpolation: plan.interpolation, lowSpeedFloor_mps: plan.speeds.lowSpeedFloor_mps }),
    analyse: integratorLoopMargins,
    thresholds: numericAcceptanceLimits(plan).thresholds,
  });
  return assembleSchedule({
    vehicle: { name: options.vehicleName ?? 'parcel-van (synthetic)', file: 'vehicle.json', sha256: sha256Hex('synthetic vehicle') },
    plan,
    table,
    check,
    integratorClamp_rad: 0.6,
    maxSteerRate_radps: 0.5,
    breakpointExtras: fixtureExtras(speeds),
    inputs: [{ file: 'plan.json', sha256: sha256Hex('plan'), role: 'plan' }],
    modelSummary: options.modelSummary ?? { kind: 'synthetic integrator with delay', deadTime_s: 0.1 },
    modelDescription: 'synthetic test loop v²·e^(−0.1 s)/s (test data only)',
  });
}
