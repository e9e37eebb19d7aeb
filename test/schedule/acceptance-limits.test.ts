import { describe, expect, it } from 'vitest';
import { atSpeed, valueAtSpeed, type SpeedTable } from '../../src/core/by-speed.js';
import { judgeScenarioRun } from '../../src/performance/scenario-limits.js';
import { acceptanceLimits, compileAcceptanceExpressions, limitSampleSpeeds, numericAcceptanceLimits } from '../../src/schedule/acceptance-limits.js';
import { ACCEPTANCE_DEFAULTS, resolvePlan, type PartialPlan } from '../../src/schedule/plan.js';

const PHASE = 'max(35, 50 - speed_mps)';
/** The same expression in plain JavaScript: the reference for the table the plan's expression becomes. */
const phase = (speed_mps: number): number => Math.max(35, 50 - speed_mps);

const plan = (partial: PartialPlan) => resolvePlan({ speeds: { minimum_mps: 1, maximum_mps: 20 }, ...partial });

describe('acceptanceLimits(plan): the limits as every check reads them', () => {
  it('keeps a number a number and a table as written, and makes an expression a table of its values at the check speeds', async () => {
    const table = { speeds_mps: [1, 20], values: [1.6, 2] };
    const limits = await acceptanceLimits(plan({ acceptance: { minimumPhaseMargin_deg: PHASE, maximumSensitivityPeak: table, minimumUpperGainMargin_dB: 8 } }));
    expect(limits.thresholds.minimumUpperGainMargin_dB).toBe(8);
    expect(limits.thresholds.maximumSensitivityPeak).toEqual(table);
    expect(limits.thresholds.maximumLowerGainMargin_dB).toBe(ACCEPTANCE_DEFAULTS.maximumLowerGainMargin_dB);
    const resolved = limits.thresholds.minimumPhaseMargin_deg as SpeedTable;
    const speeds = limitSampleSpeeds(plan({}));
    expect(resolved.speeds_mps).toEqual(speeds);
    // The check speeds: the dense check's grid before refinement (breakpoints, midpoints, 200 even speeds).
    expect(speeds.length).toBeGreaterThanOrEqual(200);
    for (let k = 0; k < speeds.length; k++) expect(resolved.values[k]).toBe(phase(speeds[k]));
    // Read at any speed: the expression's value at the check speeds, linear between them (the kink at 15 m/s
    // lies between two check speeds: linear there, never below the expression's lower bound).
    expect(atSpeed(limits.thresholds, 4).minimumPhaseMargin_deg).toBeCloseTo(46, 12);
    expect(atSpeed(limits.thresholds, 19.5).minimumPhaseMargin_deg).toBe(35);
    expect(atSpeed(limits.thresholds, 10.5).maximumSensitivityPeak).toBeCloseTo(1.8, 12);
  });

  it('adds the latency and half a sample to the delay-margin room at every speed (docs/domain.md §5)', async () => {
    const controller = { sampleTime_s: 0.02, computationLatency_s: 0.005 };
    const limits = await acceptanceLimits(plan({ controller, acceptance: { delayMarginRoom_s: 'speed_mps / 1000' } }));
    for (const speed of [1, 7.3, 20]) expect(atSpeed(limits.thresholds, speed).minimumDelayMargin_s).toBeCloseTo(0.005 + 0.01 + speed / 1000, 12);
    expect(numericAcceptanceLimits(plan({ controller })).thresholds.minimumDelayMargin_s).toBeCloseTo(0.005 + 0.01 + 0.02, 15);
  });

  it("takes the speed-change limit in the loop's unit and the time-domain limits from the same section", async () => {
    const limits = await acceptanceLimits(
      plan({ loop: { kind: 'heading' }, acceptance: { maximumSpeedChangeError_rad: '0.01 * speed_mps', maximumOvershoot_pct: 10 } }),
    );
    expect(valueAtSpeed(limits.scenarios.maximumSpeedChangeError, 5)).toBeCloseTo(0.05, 12);
    expect(limits.scenarios.maximumOvershoot_pct).toBe(10);
    expect(limits.timeDomain.maximumOvershoot_pct).toBe(10);
  });

  it('refuses an expression outside the restricted scope before evaluating it, naming the field and the character', async () => {
    const written: PartialPlan = { acceptance: { minimumPhaseMargin_deg: 'max(35, 50 - speed)' } };
    await expect(compileAcceptanceExpressions(written, 'plan.json')).rejects.toMatchObject({
      code: 'plan.invalid',
      location: { file: 'plan.json', jsonPath: '/acceptance/minimumPhaseMargin_deg' },
      message: expect.stringMatching(/unknown name "speed" .*at character 14/),
    });
    await expect(compileAcceptanceExpressions({ acceptance: { maximumSensitivityPeak: 'import("fs")' } })).rejects.toMatchObject({ code: 'plan.invalid' });
  });

  it("refuses a value outside the limit's range at a check speed, naming the speed and the value", async () => {
    // A phase margin limit above 180° and a sensitivity-peak limit under 1 mean nothing (the plan schema's ranges).
    await expect(acceptanceLimits(plan({ acceptance: { minimumPhaseMargin_deg: '10 * speed_mps' } }), 'plan.json')).rejects.toMatchObject({
      code: 'plan.invalid',
      location: { jsonPath: '/acceptance/minimumPhaseMargin_deg' },
      message: expect.stringContaining('a number from 0° to 180°'),
    });
    // 2.5 − v/10 < 1 above 15 m/s: the first check speed past it is named, with the value there.
    const firstPast = limitSampleSpeeds(plan({})).find((speed) => speed > 15)!;
    await expect(acceptanceLimits(plan({ acceptance: { maximumSensitivityPeak: '2.5 - speed_mps / 10' } }))).rejects.toMatchObject({
      message: expect.stringContaining(`gives ${Number((2.5 - firstPast / 10).toPrecision(6))} at ${Number(firstPast.toPrecision(6))} m/s`),
    });
    expect(() => numericAcceptanceLimits(plan({ acceptance: { maximumSensitivityPeak: '2' } }))).toThrow(/expression/);
  });
});

describe('judgeScenarioRun with a speed-change limit that varies with speed', () => {
  const calm = {
    peakError: 0.25,
    finalError: 0,
    overshoot_pct: 0,
    settlingTime_s: 1,
    settlingDistance_m: 5,
    peakSteerAngle_rad: 0.1,
    peakSteerRate_radps: 0.1,
    timeAtAngleLimit_s: 0,
    timeAtRateLimit_s: 0,
    peakLateralAcceleration_mps2: 1,
    limitCycle: null,
  };
  const limits = { ...ACCEPTANCE_DEFAULTS, maximumSpeedChangeError: { speeds_mps: [1, 20], values: [0.4, 0.2] } };
  // A constructed braking run: 20 → 1 m/s, the error 0.25 m everywhere. The limit 0.4 − (v − 1)·0.2/19 m is
  // 0.25 m at v = 15.25 m/s: the samples above that speed break it, those below keep it.
  const speeds = Float64Array.from({ length: 39 }, (_, k) => 20 - k * 0.5);
  const traces = { speed_mps: speeds, error: new Float64Array(speeds.length).fill(0.25) };

  it('holds each sample to the limit at its own speed and names where it broke', () => {
    const failures = judgeScenarioRun({ scenario: 'braking-in-curve', speed_mps: 20, metrics: calm, traces, judgedFrom: 0 }, limits, 'path');
    expect(failures).toHaveLength(1);
    expect(failures[0].message).toBe('braking-in-curve at 20.00 m/s: error 0.25 m at 20.00 m/s while the speed changes, needs ≤ 0.2 m there');
    // Judged from the first sample below 15.25 m/s on, the run keeps the limit.
    const from = speeds.findIndex((speed) => speed < 15.25);
    expect(judgeScenarioRun({ scenario: 'braking-in-curve', speed_mps: 20, metrics: calm, traces, judgedFrom: from }, limits, 'path')).toEqual([]);
    expect(judgeScenarioRun({ scenario: 'braking-in-curve', speed_mps: 20, metrics: calm, traces, judgedFrom: from - 1 }, limits, 'path')).toHaveLength(1);
  });

  it('reads the per-speed limits of frozen-speed scenarios at the run speed', () => {
    const recovery = { ...ACCEPTANCE_DEFAULTS, maximumSpeedChangeError: 0.3, maximumRecoveryTime_s: { speeds_mps: [2, 10], values: [4, 12] } };
    const slow = { ...calm, settlingTime_s: 8 };
    expect(judgeScenarioRun({ scenario: 'misalignment', speed_mps: 10, metrics: slow }, recovery, 'path')).toEqual([]);
    expect(judgeScenarioRun({ scenario: 'misalignment', speed_mps: 5, metrics: slow }, recovery, 'path')[0].message).toBe(
      'misalignment at 5.00 m/s: removed to 5 % in 8 s, needs ≤ 7 s',
    );
  });
});
