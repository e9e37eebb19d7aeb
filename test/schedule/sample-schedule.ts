/**
 * A synthetic schedule for tests (invented data, labelled as such): the constructed integrator
 * loop of integrator-loop.ts, tuned at four breakpoints, refined and checked.
 */
import { sha256Hex } from '../../src/core/files.js';
import { denseCheck } from '../../src/schedule/dense-check.js';
import { checkGrid } from '../../src/schedule/grid.js';
import { makeGainLookup } from '../../src/schedule/interpolate.js';
import { resolvePlan, type PartialPlan } from '../../src/schedule/plan.js';
import { numericAcceptanceLimits } from '../../src/schedule/acceptance-limits.js';
import { assembleSchedule, type BreakpointExtras } from '../../src/schedule/schedule-file.js';
import type { ScheduleFile } from '../../src/schedule/schedule-types.js';
import type { GainTable } from '../../src/schedule/types.js';
import { idealGains, integratorLoopMargins } from './integrator-loop.js';

/**
 * Set-point weights and feed-forward for a fixture table, distinct at every breakpoint so that a lookup of
 * them is tested (synthetic numbers); no time-domain figures (the fixtures' loops are synthetic).
 */
export function fixtureExtras(speeds_mps: readonly number[]): BreakpointExtras[] {
  return speeds_mps.map((v, k) => ({
    // Within [0, 1] for any number of breakpoints (the schema's range).
    setpointWeightProportional: 0.5 + 0.5 * (1 - 1 / (k + 1)),
    setpointWeightDerivative: k % 2 === 0 ? 0 : 0.1,
    feedForward: 3.6 + 0.005 * v * v,
    feedForwardLeadTime_s: 0.2 - 2 / (v + 1),
    timeDomain: null,
    timeDomainFailures: [],
  }));
}

export function sampleSchedule(overrides: PartialPlan = {}): ScheduleFile {
  const plan = resolvePlan({
    loop: { kind: 'path', preview_m: 4, referencePoint: 'front-axle' },
    speeds: { minimum_mps: 1, maximum_mps: 16, lowSpeedFloor_mps: 2 },
    breakpoints: { speeds_mps: [2, 3, 4.5, 7, 10, 16] },
    acceptance: { delayMarginRoom_s: 0.02 },
    ...overrides,
  });
  const speeds = [2, 3, 4.5, 7, 10, 16];
  // Gains with all three terms, of different sizes, as a real schedule has (synthetic numbers).
  const table: GainTable = {
    speeds_mps: speeds,
    gains: speeds.map((v) => ({ kp: idealGains(v).kp, ki: idealGains(v).kp * 0.3, kd: v === 16 ? 3e-7 : idealGains(v).kp * 0.05 })),
  };
  const check = denseCheck({
    grid: checkGrid(speeds, plan.speeds, plan.check.gridSpeeds),
    gainsAt: makeGainLookup(table, { interpolation: plan.interpolation, lowSpeedFloor_mps: plan.speeds.lowSpeedFloor_mps }),
    analyse: integratorLoopMargins,
    thresholds: numericAcceptanceLimits(plan).thresholds,
  });
  return assembleSchedule({
    vehicle: { name: 'parcel-van (synthetic)', file: '/somewhere/vehicles/parcel-van/vehicle.json', sha256: sha256Hex('synthetic vehicle') },
    plan,
    table,
    check,
    integratorClamp_rad: 0.6,
    maxSteerRate_radps: 0.5,
    breakpointExtras: fixtureExtras(speeds),
    inputs: [
      { file: '/data/logs/van-5mps.csv', sha256: sha256Hex('log 5'), role: 'log' },
      { file: 'plan.json', sha256: sha256Hex('plan'), role: 'plan' },
    ],
    modelSummary: { kind: 'synthetic integrator with delay', deadTime_s: 0.1 },
    modelDescription: 'synthetic test loop v²·e^(−0.1 s)/s (test data only)',
    ruleCitation: 'synthetic: kθ = π/6 at every breakpoint',
  });
}
