import { describe, expect, it } from 'vitest';
import type { ControllerSettings } from '../../src/controller/types.js';
import { SpeedbandError } from '../../src/core/errors.js';
import { decibelsToRatio } from '../../src/core/units.js';
import type { FopdtModel } from '../../src/identify/types.js';
import { designModelFromSingleTrack } from '../../src/tuning/design-model.js';
import { tuneOperatingPoint, type OperatingPointRequest } from '../../src/tuning/operating-point.js';
import { fopdtByTwoPoints } from '../../src/tuning/two-point.js';
import type { SingleTrackParameters } from '../../src/vehicle/types.js';

const controller: ControllerSettings = { derivativeFilter: 10, sampleTime_s: 0.02, discretisation: 'backward-euler', computationLatency_s: 0 };
const unfiltered: ControllerSettings = { ...controller, derivativeFilter: Number.POSITIVE_INFINITY };
// Invented demo vehicle (synthetic numbers).
const van: SingleTrackParameters = {
  mass_kg: 3200,
  yawInertia_kgm2: 5200,
  cgToFrontAxle_m: 1.5,
  cgToRearAxle_m: 1.9,
  frontCorneringStiffness_NPerRad: 90000,
  rearCorneringStiffness_NPerRad: 110000,
  actuatorLag_s: 0.08,
  actuatorDelay_s: 0.04,
};

function lumped(model: FopdtModel, loop: OperatingPointRequest['loop'], rule: string, settings = controller): ReturnType<typeof tuneOperatingPoint> {
  return tuneOperatingPoint({ loop, speed_mps: 5, model: { kind: 'lumped', yawRate: model }, rule, ruleParameters: {}, controller: settings });
}

describe('tuneOperatingPoint: SIMC loops with known margins (τc = θ, margins on the full loop)', () => {
  it('yaw-rate loop, FOPDT with τ ≤ 8θ: L = e^(−θs)/(2θs), GM = π, PM = 90° − 0.5 rad, Ms ≈ 1.59', () => {
    // θ = 0.09 s identified + Ts/2 = 0.01 s; τ = 0.3 s ≤ 8θ.
    const tuned = lumped({ kind: 'fopdt', gain: 2, timeConstant_s: 0.3, deadTime_s: 0.09 }, { kind: 'yaw-rate' }, 'simc');
    // Source: closed form of L = e^(−θs)/(2θs); Skogestad 2003 (GM 3.14, PM 61.4°, Ms 1.59 — table values from memory).
    expect(decibelsToRatio(tuned.margins.upperGainMargin_dB!)).toBeCloseTo(Math.PI, 6);
    expect(tuned.margins.phaseMargin_deg).toBeCloseTo(90 - (0.5 * 180) / Math.PI, 6);
    expect(tuned.margins.phaseMarginFrequency_radps).toBeCloseTo(1 / (2 * 0.1), 6);
    expect(tuned.margins.sensitivityPeak).toBeCloseTo(1.59, 2);
    expect(tuned.margins.lowerGainMargin_dB).toBeNull();
  });

  it("heading loop from a delay-only yaw model: integrating k'e^(−θs)/s, GM ≈ 2.96, PM ≈ 46.9°, Ms ≈ 1.70", () => {
    const tuned = lumped({ kind: 'fopdt', gain: 2, timeConstant_s: 0, deadTime_s: 0.09 }, { kind: 'heading' }, 'simc');
    // Source: Skogestad 2003, SIMC integrating process at τc = θ (table values from memory; docs/domain.md §4 recomputation).
    expect(decibelsToRatio(tuned.margins.upperGainMargin_dB!)).toBeCloseTo(2.96, 2);
    expect(tuned.margins.phaseMargin_deg).toBeCloseTo(46.9, 1);
    expect(tuned.margins.sensitivityPeak).toBeCloseTo(1.7, 2);
  });

  it("path loop, no preview: double-integrating k''e^(−θs)/s², unfiltered PID: PM ≈ 33°, upper GM ≈ 2.76, lower GM ≈ 0.165, Ms ≈ 1.96", () => {
    const tuned = lumped({ kind: 'fopdt', gain: 2, timeConstant_s: 0, deadTime_s: 0.09 }, { kind: 'path' }, 'simc', unfiltered);
    // Source: docs/domain.md §4, recomputed for Skogestad 2003 double-integrating rule at τc = θ (from memory).
    expect(tuned.design.model).toEqual({ integrators: 2, gain: 10, lags_s: [], deadTime_s: expect.closeTo(0.1, 14) });
    expect(tuned.margins.stable).toBe(true);
    expect(tuned.margins.phaseMargin_deg).toBeCloseTo(33, 0);
    expect(decibelsToRatio(tuned.margins.upperGainMargin_dB!)).toBeCloseTo(2.76, 2);
    expect(decibelsToRatio(tuned.margins.lowerGainMargin_dB!)).toBeCloseTo(0.165, 3);
    expect(tuned.margins.sensitivityPeak).toBeCloseTo(1.96, 2);
    // A derivative filter N = 10 costs roughly another 11° (docs/domain.md §4, recomputed there).
    const filtered = lumped({ kind: 'fopdt', gain: 2, timeConstant_s: 0, deadTime_s: 0.09 }, { kind: 'path' }, 'simc');
    expect(tuned.margins.phaseMargin_deg! - filtered.margins.phaseMargin_deg!).toBeGreaterThan(8);
    expect(tuned.margins.phaseMargin_deg! - filtered.margins.phaseMargin_deg!).toBeLessThan(14);
  });
});

describe('tuneOperatingPoint: sampling', () => {
  it('warns when the crossover exceeds a tenth of the sampling frequency (common practice: sample ≥ 10× the crossover)', () => {
    const fast = tuneOperatingPoint({
      loop: { kind: 'yaw-rate' },
      speed_mps: 5,
      model: { kind: 'lumped', yawRate: { kind: 'fopdt', gain: 2, timeConstant_s: 0.12, deadTime_s: 0 } },
      rule: 'imc-pid',
      ruleParameters: {},
      controller,
    });
    // θ = Ts/2 = 0.01 s only, λ = θ: crossover near 1/(λ + θ/2)·... far above 2π/Ts/10 = 31 rad/s.
    expect(fast.margins.phaseMarginFrequency_radps!).toBeGreaterThan(0.1 * ((2 * Math.PI) / controller.sampleTime_s));
    expect(fast.warnings.join()).toMatch(/a tenth of the sampling frequency/);
    const slow = lumped({ kind: 'fopdt', gain: 2, timeConstant_s: 0.3, deadTime_s: 0.09 }, { kind: 'yaw-rate' }, 'simc');
    expect(slow.warnings).toEqual([]);
  });
});

describe('tuneOperatingPoint: applicability and signs', () => {
  it('Ziegler–Nichols for a path loop is tuning.ruleNotApplicable naming the rules that apply (SIMC refuses this lead: T0 = 0.5 s within its band)', () => {
    try {
      lumped({ kind: 'fopdt', gain: 2, timeConstant_s: 0.2, deadTime_s: 0.09 }, { kind: 'path', preview_m: 3 }, 'ziegler-nichols-ultimate');
      throw new Error('expected a refusal');
    } catch (error) {
      expect(error).toBeInstanceOf(SpeedbandError);
      expect((error as SpeedbandError).code).toBe('tuning.ruleNotApplicable');
      expect((error as SpeedbandError).message).toMatch(/no finite ultimate gain.*rules that apply: damping-target, migo/);
    }
  });

  it('a negative plant gain gives negative gains and the same margins (docs/domain.md §5b)', () => {
    for (const [kind, rule] of [
      ['yaw-rate', 'imc-pid'],
      ['heading', 'ziegler-nichols-step'],
      ['path', 'damping-target'],
    ] as const) {
      const positive = lumped({ kind: 'fopdt', gain: 2, timeConstant_s: 0.2, deadTime_s: 0.09 }, { kind, preview_m: 2 }, rule);
      const negative = lumped({ kind: 'fopdt', gain: -2, timeConstant_s: 0.2, deadTime_s: 0.09 }, { kind, preview_m: 2 }, rule);
      expect(negative.gains.kp).toBeCloseTo(-positive.gains.kp, 10);
      expect(negative.gains.ki).toBeCloseTo(-positive.gains.ki, 10);
      expect(negative.gains.kd).toBeCloseTo(-positive.gains.kd, 10);
      expect(negative.margins.stable).toBe(positive.margins.stable);
      expect(negative.margins.phaseMargin_deg).toBeCloseTo(positive.margins.phaseMargin_deg!, 6);
      expect(negative.margins.sensitivityPeak).toBeCloseTo(positive.margins.sensitivityPeak, 6);
    }
  });
});

describe('design models from lumped second-order models', () => {
  it('an overdamped second-order yaw model keeps both lags and SIMC gives the series PID with τD = τ2 (Skogestad 2003)', () => {
    // ζ = 1.25, ωn = 2 rad/s: τ1,2 = (ζ ± √(ζ² − 1))/ωn = 1 s and 0.25 s (textbook factorisation).
    const tuned = tuneOperatingPoint({
      loop: { kind: 'yaw-rate' },
      speed_mps: 5,
      model: {
        kind: 'lumped',
        yawRate: { kind: 'second-order', gain: 2, naturalFrequency_radps: 2, dampingRatio: 1.25, zeroTimeConstant_s: 0, deadTime_s: 0.09 },
      },
      rule: 'simc',
      ruleParameters: {},
      controller,
    });
    expect(tuned.design.model.lags_s).toEqual([1, 0.25]);
    // θ = 0.09 + Ts/2 = 0.1 s, τc = θ: Kc = τ1/(K(τc + θ)) = 1/(2·0.2) = 2.5, τI = min(1, 0.8) = 0.8 s, τD = 0.25 s.
    expect(tuned.derivation.ruleForm).toEqual({
      form: 'series',
      gain: expect.closeTo(2.5, 12),
      integralTime_s: expect.closeTo(0.8, 12),
      derivativeTime_s: 0.25,
    });
    expect(tuned.margins.stable).toBe(true);
  });
});

describe('design models from the single-track model', () => {
  it("Smith's two-point method returns a FOPDT exactly: t28 = θ + τ/3, t63 = θ + τ (Smith 1972)", () => {
    const found = fopdtByTwoPoints({ numerator: [3 / 0.4], denominator: [1, 1 / 0.4], delay_s: 0.15 });
    expect(found.gain).toBeCloseTo(3, 12);
    expect(found.timeConstant_s).toBeCloseTo(0.4, 3);
    expect(found.deadTime_s).toBeCloseTo(0.15, 3);
  });

  it('keeps the steady yaw gain vx/(L + Ku·vx²) and gives k″ = K·vx for the path loop (Gillespie 1992)', () => {
    const speed = 12;
    const L = van.cgToFrontAxle_m + van.cgToRearAxle_m;
    const understeer =
      (van.mass_kg / L) * (van.cgToRearAxle_m / van.frontCorneringStiffness_NPerRad - van.cgToFrontAxle_m / van.rearCorneringStiffness_NPerRad);
    const yawGain = speed / (L + understeer * speed * speed);
    const design = designModelFromSingleTrack({ kind: 'path', parameters: van, speed_mps: speed, controllerDelay_s: 0.01 });
    expect(design.yawRateGain_perS).toBeCloseTo(yawGain, 10);
    expect(design.model.gain).toBeCloseTo(yawGain * speed, 9);
    expect(design.model.integrators).toBe(2);
    expect(design.yawRateSource).toBe('two-point');
    // Lead of the exact path plant: T0 = (vy/r + d)/vx with the steady sideslip vy/r = b − m·a·vx²/(Cr·L)
    // (Rajamani 2012 §3.3, steady-state cornering — from memory; here d = 0).
    const sideslipPerYawRate_m = van.cgToRearAxle_m - (van.mass_kg * van.cgToFrontAxle_m * speed * speed) / (van.rearCorneringStiffness_NPerRad * L);
    expect(design.model.leadTimeConstant_s).toBeCloseTo(sideslipPerYawRate_m / speed, 10);
    // The delay of the FOPDT covers at least part of the actuator delay, and the controller delay is added on top.
    expect(design.model.deadTime_s).toBeGreaterThan(0.01);
  });

  it('tunes a heading loop on the single-track model and reports stable margins on the full loop', () => {
    const tuned = tuneOperatingPoint({
      loop: { kind: 'heading' },
      speed_mps: 10,
      model: { kind: 'single-track', parameters: van },
      rule: 'simc',
      ruleParameters: {},
      controller,
    });
    expect(tuned.margins.stable).toBe(true);
    expect(tuned.margins.phaseMargin_deg).toBeGreaterThan(30);
    expect(tuned.loop.plant.delay_s).toBeCloseTo(0.04 + 0.01, 14);
  });

  it('refuses an oversteering vehicle above its critical speed with tuning.unstablePlant', () => {
    const oversteer = { ...van, cgToFrontAxle_m: 2.2, cgToRearAxle_m: 1.2 };
    // K = (m/L)(b/Cf − a/Cr) < 0; critical speed √(−L/K) (Gillespie 1992).
    const L = 3.4;
    const K = (oversteer.mass_kg / L) * (1.2 / 90000 - 2.2 / 110000);
    const critical = Math.sqrt(-L / K);
    expect(() => designModelFromSingleTrack({ kind: 'yaw-rate', parameters: oversteer, speed_mps: critical * 1.2, controllerDelay_s: 0.01 })).toThrow(
      /not in the left half plane/,
    );
    expect(() => designModelFromSingleTrack({ kind: 'yaw-rate', parameters: oversteer, speed_mps: critical * 0.8, controllerDelay_s: 0.01 })).not.toThrow();
  });
});
