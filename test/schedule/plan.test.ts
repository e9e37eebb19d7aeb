import { mkdtempSync, writeFileSync } from 'node:fs';
import { numericAcceptanceLimits } from '../../src/schedule/acceptance-limits.js';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { RULE_NAMES } from '../../src/tuning/registry.js';
import { PLAN_SCHEMA } from '../../src/schedule/plan-schema.js';
import { defaultPlanFile } from '../../src/schedule/default-plan.js';
import { PLAN_DEFAULTS, planBreakpoints, planSpeedChanges, resolvePlan } from '../../src/schedule/plan.js';
import { planFromJson, readPlan } from '../../src/schedule/plan-file.js';
import { makeRuleParameterLookup } from '../../src/schedule/rule-parameters.js';

describe('resolvePlan(partial)', () => {
  it('an empty plan is the defaults, with common-practice acceptance limits', () => {
    const plan = resolvePlan({});
    expect(plan).toEqual(PLAN_DEFAULTS);
    // Source: common practice (docs/domain.md §5; Åström & Hägglund for Ms): GM ≥ 6 dB both ways, PM ≥ 45°, Ms ≤ 2.
    expect(plan.acceptance.maximumLowerGainMargin_dB).toBe(-6);
    expect(plan.acceptance.minimumUpperGainMargin_dB).toBe(6);
    expect(plan.acceptance.minimumPhaseMargin_deg).toBe(45);
    expect(plan.acceptance.maximumSensitivityPeak).toBe(2);
    expect(plan.check.gridSpeeds).toBeGreaterThanOrEqual(200);
  });

  it('takes the speed range from the test speeds when the plan gives none', () => {
    const plan = resolvePlan({}, { testSpeeds_mps: [4, 12, 8] });
    expect(plan.speeds).toEqual({ minimum_mps: 4, maximum_mps: 12, lowSpeedFloor_mps: 4 });
  });

  it('keeps a low-speed floor the plan sets, and otherwise puts it at the bottom of the range', () => {
    expect(resolvePlan({ speeds: { lowSpeedFloor_mps: 2 } }, { testSpeeds_mps: [0.5, 3] }).speeds.lowSpeedFloor_mps).toBe(2);
    expect(resolvePlan({}, { testSpeeds_mps: [0.5, 3] }).speeds.lowSpeedFloor_mps).toBe(0.5);
  });

  it("takes the vehicle file's sample time when the plan gives none, with one sample of computation latency", () => {
    const fromVehicle = resolvePlan({}, { vehicleSampleTime_s: 0.05 });
    expect(fromVehicle.controller.sampleTime_s).toBe(0.05);
    expect(fromVehicle.controller.computationLatency_s).toBe(0.05);
    const fromPlan = resolvePlan({ controller: { sampleTime_s: 0.02, computationLatency_s: 0.001 } }, { vehicleSampleTime_s: 0.05 });
    expect(fromPlan.controller.sampleTime_s).toBe(0.02);
    expect(fromPlan.controller.computationLatency_s).toBe(0.001);
  });

  it("judges the speed changes at the vehicle file's service rates where it states them, else 1 and 2 m/s²; a plan's own rates win", () => {
    // Source: our defaults (src/performance/defaults.ts SIMULATION_DEFAULTS: ≈ 0.1 g ramp, ≈ 0.2 g braking).
    const ours = resolvePlan({});
    expect([ours.check.rampAcceleration_mps2, ours.check.brakingDeceleration_mps2]).toEqual([1, 2]);
    const gentle = resolvePlan({}, { vehicleServiceDeceleration_mps2: 1 });
    expect([gentle.check.rampAcceleration_mps2, gentle.check.brakingDeceleration_mps2]).toEqual([1, 1]);
    const both = resolvePlan({}, { vehicleServiceAcceleration_mps2: 0.5, vehicleServiceDeceleration_mps2: 1.5 });
    expect(planSpeedChanges(both)).toEqual({ acceleration_mps2: 0.5, deceleration_mps2: 1.5 });
    const planSays = resolvePlan({ check: { brakingDeceleration_mps2: 3 } }, { vehicleServiceDeceleration_mps2: 1 });
    expect(planSays.check.brakingDeceleration_mps2).toBe(3);
    // The default plan written out leaves them to the vehicle file, as no plan does.
    const written = resolvePlan(defaultPlanFile(), { vehicleServiceDeceleration_mps2: 1 });
    expect(written.check.brakingDeceleration_mps2).toBe(1);
    expect(written.check).toEqual(gentle.check);
    // A plan recorded before the plan had these fields: the rates such a schedule was built with.
    expect(planSpeedChanges({ check: { gridSpeeds: 200 } })).toEqual({ acceleration_mps2: 1, deceleration_mps2: 2 });
  });

  it('required delay margin is latency plus half a sample (zero-order hold) plus room', () => {
    // Source: docs/domain.md §5 — a zero-order hold adds about Ts/2 of delay; delay margin above the latency with room (common practice).
    const plan = resolvePlan({ controller: { sampleTime_s: 0.02, computationLatency_s: 0.004 }, acceptance: { delayMarginRoom_s: 0.03 } });
    expect(numericAcceptanceLimits(plan).thresholds.minimumDelayMargin_s).toBeCloseTo(0.004 + 0.01 + 0.03, 15);
  });
});

describe('planBreakpoints(plan)', () => {
  it('geometric spacing has a constant ratio between neighbours and exact ends', () => {
    // Source: definition of a geometric sequence, v_i = v0·r^i.
    const speeds = planBreakpoints(resolvePlan({ speeds: { minimum_mps: 1, maximum_mps: 16, lowSpeedFloor_mps: 1 }, breakpoints: { count: 5 } }));
    expect(speeds[0]).toBe(1);
    expect(speeds[4]).toBe(16);
    speeds.forEach((speed, i) => expect(speed).toBeCloseTo(2 ** i, 12));
  });

  it('linear spacing starts at the low-speed floor when it lies above the range minimum', () => {
    const speeds = planBreakpoints(
      resolvePlan({ speeds: { minimum_mps: 1, maximum_mps: 11, lowSpeedFloor_mps: 3 }, breakpoints: { count: 5, spacing: 'linear' } }),
    );
    expect(speeds).toEqual([3, 5, 7, 9, 11]);
  });

  it('explicit breakpoints are kept as written', () => {
    expect(planBreakpoints(resolvePlan({ breakpoints: { speeds_mps: [2, 5, 9] } }))).toEqual([2, 5, 9]);
  });
});

describe('plan file validation', () => {
  it('names exactly the tuning rules the tuning stage registers', () => {
    expect([...PLAN_SCHEMA.properties.rule.properties.name.enum].sort()).toEqual([...RULE_NAMES].sort());
  });

  it('rejects a mistyped field with its JSON path', () => {
    expect(() => planFromJson({ loop: { kind: 'lateral' } })).toThrow(
      expect.objectContaining({ code: 'plan.invalid', location: expect.objectContaining({ jsonPath: '/loop/kind' }) }),
    );
    expect(() => planFromJson({ controller: { sampleTime_s: -1 } })).toThrow(
      expect.objectContaining({ location: expect.objectContaining({ jsonPath: '/controller/sampleTime_s' }) }),
    );
    expect(() => planFromJson({ check: { gridSize: 300 } })).toThrow(/unknown field "gridSize"/);
  });

  it('rejects unsorted breakpoints and speed tables with the offending index', () => {
    expect(() => planFromJson({ breakpoints: { speeds_mps: [2, 8, 5] } })).toThrow(
      expect.objectContaining({ location: expect.objectContaining({ jsonPath: '/breakpoints/speeds_mps/2' }) }),
    );
    expect(() => planFromJson({ rule: { name: 'damping-target', parameters: { settlingDistance_m: { speeds_mps: [5, 2], values: [10, 20] } } } })).toThrow(
      expect.objectContaining({ location: expect.objectContaining({ jsonPath: '/rule/parameters/settlingDistance_m/speeds_mps/1' }) }),
    );
  });

  it('readPlan reads a file; speed-varying rule parameters interpolate linearly and hold beyond their ends', async () => {
    const folder = mkdtempSync(join(tmpdir(), 'speedband-plan-'));
    const path = join(folder, 'plan.json');
    writeFileSync(
      path,
      JSON.stringify({
        loop: { kind: 'path', preview_m: 3 },
        rule: { name: 'damping-target', parameters: { dampingRatio: 1, settlingDistance_m: { speeds_mps: [2, 10], values: [8, 40] } } },
      }),
    );
    const plan = readPlan(path);
    // A preview distance given: no preview time unless given too.
    expect(plan.loop).toEqual({ kind: 'path', preview_m: 3, previewTime_s: 0, referencePoint: 'front-axle' });
    const ruleParametersAt = await makeRuleParameterLookup(plan.rule.parameters);
    expect(ruleParametersAt(6)).toEqual({ dampingRatio: 1, settlingDistance_m: 24 });
    expect(ruleParametersAt(1).settlingDistance_m).toBe(8);
    expect(ruleParametersAt(30).settlingDistance_m).toBe(40);
  });
});

describe('defaults per loop kind', () => {
  it("a plan naming no rule takes the loop kind's default rule and search; a path loop without a preview takes 0.5 m + 0.3 s × speed", () => {
    expect(resolvePlan({}).rule).toEqual({ name: 'simc', parameters: {}, tuneFor: 'rule-parameters', searchOn: 'nominal' });
    expect(resolvePlan({ loop: { kind: 'heading' } }).rule).toEqual({ name: 'simc', parameters: {}, tuneFor: 'fastest-passing', searchOn: 'nominal' });
    const path = resolvePlan({ loop: { kind: 'path' } });
    expect(path.rule).toEqual({ name: 'migo', parameters: {}, tuneFor: 'fastest-passing', searchOn: 'nominal' });
    expect(path.loop).toEqual({ kind: 'path', preview_m: 0.5, previewTime_s: 0.3, referencePoint: 'front-axle' });
    // A rule named: as given, no search unless asked for.
    expect(resolvePlan({ loop: { kind: 'path' }, rule: { name: 'damping-target' } }).rule.tuneFor).toBe('rule-parameters');
    expect(resolvePlan({ rule: { name: 'imc-pid', tuneFor: 'fastest-passing' } }).rule.tuneFor).toBe('fastest-passing');
  });

  it('the new acceptance limits have their documented defaults', () => {
    // Overshoot ≤ 25 % (common practice); 15 s, 0.5 m, 0.3 m (our targets); Mt ≤ 2 (see PLAN_DEFAULTS).
    expect(resolvePlan({}).acceptance).toMatchObject({
      maximumComplementarySensitivityPeak: 2,
      maximumOvershoot_pct: 25,
      maximumRecoveryTime_s: 15,
      maximumLaneChangeError_m: 0.5,
      maximumCurveEntryError_m: 0.3,
    });
    expect(resolvePlan({}).controller.antiWindup).toBe('conditional-integration');
  });
});
