import { describe, expect, it } from 'vitest';
import { ACCEPTANCE_DEFAULTS, resolvePlan } from '../../src/schedule/plan.js';
import { numericAcceptanceLimits } from '../../src/schedule/acceptance-limits.js';
import { judgeScenarioRun } from '../../src/performance/scenario-limits.js';
import type { ScenarioMetrics } from '../../src/performance/scenario-metrics.js';
import { rampScenario } from '../../src/performance/scenario-catalogue.js';
import { runScenario } from '../../src/performance/scenario-run.js';
import { speedChangeCertificate, CERTIFICATE_SEARCH } from '../../src/pipeline/speed-change-certificate.js';
import { constantController, LINEAR_SETTINGS, VAN, vanVehicle } from './scenario-helpers.js';

const calm: ScenarioMetrics = {
  peakError: 0.01,
  finalError: 0,
  overshoot_pct: 5,
  settlingTime_s: 2,
  settlingDistance_m: 20,
  peakSteerAngle_rad: 0.05,
  peakSteerRate_radps: 0.1,
  timeAtAngleLimit_s: 0,
  timeAtRateLimit_s: 0,
  peakLateralAcceleration_mps2: 1,
  limitCycle: null,
};
const limits = { ...ACCEPTANCE_DEFAULTS, maximumSpeedChangeError: 0.05 };

describe('judgeScenarioRun', () => {
  it('passes a calm run and names speed, scenario and metric of every limit broken', () => {
    expect(judgeScenarioRun({ scenario: 'small-step', speed_mps: 5, metrics: calm }, limits, 'heading')).toEqual([]);
    const failures = judgeScenarioRun(
      { scenario: 'large-step', speed_mps: 3, metrics: { ...calm, overshoot_pct: 40, settlingTime_s: null, limitCycle: { amplitude: 0.05, period_s: 2.4 } } },
      limits,
      'heading',
    );
    expect(failures.map((f) => [f.speed_mps, f.scenario, f.metric])).toEqual([
      [3, 'large-step', 'limitCycle'],
      [3, 'large-step', 'overshoot_pct'],
      [3, 'large-step', 'settlingTime_s'],
    ]);
    expect(failures[0].message).toBe('large-step at 3.00 m/s: sustained oscillation ±0.05 rad, period 2.4 s (a limit cycle)');
  });

  it('judges recoveries against the recovery limit, the lane change (path loop only) and the error while the speed changes', () => {
    expect(judgeScenarioRun({ scenario: 'misalignment', speed_mps: 2, metrics: { ...calm, settlingTime_s: 16 } }, limits, 'path')[0].message).toBe(
      'misalignment at 2.00 m/s: removed to 5 % in 16 s, needs ≤ 15 s',
    );
    expect(judgeScenarioRun({ scenario: 'lane-change', speed_mps: 9, metrics: { ...calm, peakError: 0.6 } }, limits, 'path').map((f) => f.metric)).toEqual([
      'peakError',
    ]);
    expect(judgeScenarioRun({ scenario: 'lane-change', speed_mps: 9, metrics: { ...calm, peakError: 0.6 } }, limits, 'heading')).toEqual([]);
    expect(judgeScenarioRun({ scenario: 'braking-in-curve', speed_mps: 25, metrics: { ...calm, peakError: 0.06 } }, limits, 'heading')[0].message).toBe(
      'braking-in-curve at 25.00 m/s: error 0.06 rad while the speed changes, needs ≤ 0.05 rad',
    );
  });

  it("takes the speed-change limit of the plan in the loop's unit", () => {
    expect(numericAcceptanceLimits(resolvePlan({ loop: { kind: 'path' } })).scenarios.maximumSpeedChangeError).toBe(0.3);
    expect(
      numericAcceptanceLimits(resolvePlan({ loop: { kind: 'heading' }, acceptance: { maximumSpeedChangeError_rad: 0.02 } })).scenarios.maximumSpeedChangeError,
    ).toBe(0.02);
    expect(numericAcceptanceLimits(resolvePlan({})).scenarios.maximumSpeedChangeError).toBe(0.05);
  });
});

describe('speedChangeCertificate', () => {
  it('certifies a rate that passes while a rate one bisection step above it fails (heading loop, tight error limit)', () => {
    const controller = constantController(
      { kind: 'heading' },
      { kp: 2.2, ki: 2, kd: 0.29, feedForward: 0.45 },
      { ...LINEAR_SETTINGS, commandLimit_rad: 0.6, integratorClamp_rad: 0.6 },
      0.25,
    );
    const vehicle = vanVehicle({ maxSteerAngle_rad: 0.6, maxSteerRate_radps: 0.5 });
    const context = { loop: 'heading' as const, parameters: VAN, maxSteerAngle_rad: 0.6, range: { minimum_mps: 4, maximum_mps: 16 } };
    const tight = { ...limits, maximumSpeedChangeError: 0.004 };
    const certificate = speedChangeCertificate({ vehicle, controller, context, limits: tight });
    const rate = certificate.maximumAcceleration_mps2!;
    expect(rate).toBeGreaterThan(CERTIFICATE_SEARCH.lowest_mps2);
    expect(rate).toBeLessThan(CERTIFICATE_SEARCH.highest_mps2);
    const errorAt = (acceleration: number): number =>
      runScenario({
        vehicle,
        controller,
        scenario: rampScenario('speed-ramp-in-curve', context, { initial_mps: 4, final_mps: 16, changeStart_s: 11, acceleration_mps2: acceleration }),
      }).metrics.peakError;
    const step = Math.pow(CERTIFICATE_SEARCH.highest_mps2 / CERTIFICATE_SEARCH.lowest_mps2, 1 / 2 ** CERTIFICATE_SEARCH.steps);
    expect(errorAt(rate)).toBeLessThanOrEqual(0.004);
    expect(errorAt(rate * step * 1.0001)).toBeGreaterThan(0.004);
    expect(certificate.statement).toMatch(/m\/s² of acceleration/);
  });
});
