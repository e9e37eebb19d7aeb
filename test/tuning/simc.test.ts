import { describe, expect, it } from 'vitest';
import { simc } from '../../src/tuning/simc.js';
import { reduceByHalfRule } from '../../src/tuning/half-rule.js';
import type { DesignModel } from '../../src/tuning/types.js';

describe('simc (Skogestad 2003)', () => {
  it('FOPDT K=2, τ1=10 s, θ=2 s, τc=θ: Kc = τ1/(K(τc+θ)) = 1.25, τI = min(τ1, 4(τc+θ)) = 10 s, PI', () => {
    // Source: Skogestad 2003, SIMC PI rule for FOPDT, evaluated by hand.
    const result = simc({ integrators: 0, gain: 2, lags_s: [10], deadTime_s: 2 }, {});
    expect(result.controllerType).toBe('PI');
    expect(result.ruleForm).toEqual({ form: 'series', gain: 1.25, integralTime_s: 10, derivativeTime_s: 0 });
    expect(result.gains).toEqual({ kp: 1.25, ki: 0.125, kd: 0 });
  });

  it('a lag-dominant FOPDT takes τI = 4(τc+θ): τ1 = 40 s, θ = 1 s → τI = 8 s', () => {
    // Source: Skogestad 2003, τI = min(τ1, 4(τc + θ)).
    const result = simc({ integrators: 0, gain: 1, lags_s: [40], deadTime_s: 1 }, {});
    expect(result.ruleForm.integralTime_s).toBe(8);
    expect(result.ruleForm.gain).toBe(20);
  });

  it('second order τ1=10 s, τ2=3 s: series PID with τD = τ2, converted to parallel by Kc′ = Kc(1+τD/τI), Ti = τI+τD, Td = τIτD/(τI+τD)', () => {
    // Source: Skogestad 2003 second-order rule; series → ideal from docs/domain.md §4 (textbook conversion).
    const result = simc({ integrators: 0, gain: 2, lags_s: [10, 3], deadTime_s: 2 }, {});
    expect(result.ruleForm).toEqual({ form: 'series', gain: 1.25, integralTime_s: 10, derivativeTime_s: 3 });
    const kcIdeal = 1.25 * (1 + 3 / 10);
    expect(result.gains.kp).toBeCloseTo(kcIdeal, 12);
    expect(result.gains.ki).toBeCloseTo(kcIdeal / 13, 12);
    expect(result.gains.kd).toBeCloseTo(kcIdeal * (30 / 13), 12);
  });

  it("integrating k'=1, θ=1 s: Kc = 1/(k'(τc+θ)) = 0.5, τI = 4(τc+θ) = 8 s", () => {
    // Source: Skogestad 2003, integrating process rule.
    const result = simc({ integrators: 1, gain: 1, lags_s: [], deadTime_s: 1 }, {});
    expect(result.ruleForm).toEqual({ form: 'series', gain: 0.5, integralTime_s: 8, derivativeTime_s: 0 });
    expect(result.gains).toEqual({ kp: 0.5, ki: 0.0625, kd: 0 });
  });

  it('integrating with a lag, PID: τD = τ2; PI: the lag goes to the delay by the half rule', () => {
    // Source: Skogestad 2003 (integrating process with lag: τD = τ2; half rule for PI).
    const model: DesignModel = { integrators: 1, gain: 1, lags_s: [0.4], deadTime_s: 1 };
    expect(simc(model, {}).ruleForm).toEqual({ form: 'series', gain: 0.5, integralTime_s: 8, derivativeTime_s: 0.4 });
    const pi = simc(model, { controllerType: 'PI' });
    expect(pi.designModel.deadTime_s).toBeCloseTo(1.2, 14);
    expect(pi.ruleForm.gain).toBeCloseTo(1 / 2.4, 14);
  });

  it("double integrating k''=1, θ=1 s: Kc = 1/(4k''(τc+θ)²) = 1/16, τI = τD = 8 s, parallel kp = 1/8, ki = 1/128, kd = 1/2", () => {
    // Source: Skogestad 2003, double integrating process rule; series → ideal: Kc′ = 2Kc, Ti = 16 s, Td = 4 s.
    const result = simc({ integrators: 2, gain: 1, lags_s: [], deadTime_s: 1 }, {});
    expect(result.ruleForm).toEqual({ form: 'series', gain: 1 / 16, integralTime_s: 8, derivativeTime_s: 8 });
    expect(result.gains.kp).toBeCloseTo(1 / 8, 14);
    expect(result.gains.ki).toBeCloseTo(1 / 128, 14);
    expect(result.gains.kd).toBeCloseTo(1 / 2, 14);
  });

  it('a given τc is used as is and a negative plant gain flips every gain', () => {
    const result = simc({ integrators: 2, gain: -4, lags_s: [], deadTime_s: 0.5 }, { simcClosedLoopTimeConstant_s: 1.5 });
    // Kc = 1/(4·(−4)·2²) = −1/64, τI = τD = 8 s
    expect(result.ruleForm.gain).toBeCloseTo(-1 / 64, 14);
    expect(result.gains.kp).toBeLessThan(0);
    expect(result.gains.ki).toBeLessThan(0);
    expect(result.gains.kd).toBeLessThan(0);
  });

  it('refuses P-only and PI on a double integrator, naming why', () => {
    expect(() => simc({ integrators: 0, gain: 1, lags_s: [1], deadTime_s: 1 }, { controllerType: 'P' })).toThrow(/PI and PID settings only/);
    expect(() => simc({ integrators: 2, gain: 1, lags_s: [], deadTime_s: 1 }, { controllerType: 'PI' })).toThrow(/derivative action/);
  });
});

describe('reduceByHalfRule (Skogestad 2003 half rule)', () => {
  it('lags 12, 3, 0.5 s and θ = 1 s to FOPDT: τ1 = 12 + 3/2, θ = 1 + 3/2 + 0.5', () => {
    // Source: Skogestad 2003, half rule: half the largest neglected lag to the smallest retained lag, half to the delay, smaller lags in full.
    const reduction = reduceByHalfRule({ integrators: 0, gain: 1, lags_s: [3, 12, 0.5], deadTime_s: 1 }, 1);
    expect(reduction.model.lags_s).toEqual([13.5]);
    expect(reduction.model.deadTime_s).toBe(3);
  });

  it('to second order: τ2 = 3 + 0.5/2, θ = 1 + 0.25', () => {
    const reduction = reduceByHalfRule({ integrators: 0, gain: 1, lags_s: [12, 3, 0.5], deadTime_s: 1 }, 2);
    expect(reduction.model.lags_s).toEqual([12, 3.25]);
    expect(reduction.model.deadTime_s).toBe(1.25);
  });

  it('a double integrator keeps no lag: θ = θ0 + τ/2 for the largest lag plus the others in full', () => {
    const reduction = reduceByHalfRule({ integrators: 2, gain: 1, lags_s: [0.2, 0.1], deadTime_s: 0.05 }, 0);
    expect(reduction.model.lags_s).toEqual([]);
    expect(reduction.model.deadTime_s).toBeCloseTo(0.25, 14);
  });
});
