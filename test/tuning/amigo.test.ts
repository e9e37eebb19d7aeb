import { describe, expect, it } from 'vitest';
import { amigo } from '../../src/tuning/amigo.js';
import { applyRule } from '../../src/tuning/registry.js';
import type { DesignModel } from '../../src/tuning/types.js';

const fopdt = (gain: number, lag: number, delay: number): DesignModel => ({ integrators: 0, gain, lags_s: [lag], deadTime_s: delay });

describe('amigo(model) — Åström & Hägglund 2004 AMIGO formulas', () => {
  it('PI on K = 1, T = 0.5 s, L = 0.3 s: Kc = 0.342708, Ti = 0.468806 s', () => {
    // Source: Modelica Buildings Library (LBNL), Buildings.Controls.OBC.Utilities.PIDWithAutotuning.AutoTuner.AMIGO,
    // reference results of Validation.PI at time 0 (kp = 1, T = 0.5, L = 0.3): k = 0.3427083, Ti = 0.4688060 —
    // an independent implementation of the 2004 formulas (L given there as the float 0.300000011920929).
    const result = amigo(fopdt(1, 0.5, 0.300000011920929), { controllerType: 'PI' });
    expect(result.ruleForm.gain).toBeCloseTo(0.3427083194255829, 7);
    expect(result.ruleForm.integralTime_s).toBeCloseTo(0.4688059687614441, 7);
    expect(result.gains.ki).toBeCloseTo(0.3427083194255829 / 0.4688059687614441, 6);
  });

  it('PID on K = 1, T = 0.5 s, L = 0.3 s: Kc = 0.95, Ti = 0.445714 s, Td = 0.127119 s', () => {
    // Source: Modelica Buildings Library (LBNL), AMIGO Validation.PID reference results at time 0: k = 0.95, Ti = 0.4457143, Td = 0.1271186.
    const result = amigo(fopdt(1, 0.5, 0.3), { controllerType: 'PID' });
    expect(result.ruleForm.gain).toBeCloseTo(0.95, 7);
    expect(result.ruleForm.integralTime_s).toBeCloseTo(0.4457142949104309, 6);
    expect(result.ruleForm.derivativeTime_s).toBeCloseTo(0.1271186470985413, 6);
  });

  it('scales the gain with 1/K and keeps the sign of a negative plant gain', () => {
    const positive = amigo(fopdt(2, 0.8, 0.2), { controllerType: 'PID' });
    const negative = amigo(fopdt(-2, 0.8, 0.2), { controllerType: 'PID' });
    expect(negative.gains.kp).toBeCloseTo(-positive.gains.kp, 14);
    expect(negative.gains.ki).toBeCloseTo(-positive.gains.ki, 14);
    expect(amigo(fopdt(4, 0.8, 0.2), { controllerType: 'PID' }).gains.kp).toBeCloseTo(positive.gains.kp / 2, 14);
  });

  it("on an integrating process k'·e^(−Ls)/s gives the limits of the FOPDT formulas as T → ∞ with K/T = k'", () => {
    // The FOPDT formulas with K = k'·T: K·Kc → 0.35·T/L (PI), 0.45·T/L (PID); Ti → 13.35·L (PI), 8·L (PID); Td → 0.5·L.
    const k = 0.7;
    const L = 0.25;
    const T = 1e6;
    for (const controllerType of ['PI', 'PID'] as const) {
      const integrating = amigo({ integrators: 1, gain: k, lags_s: [], deadTime_s: L }, { controllerType });
      const limit = amigo(fopdt(k * T, T, L), { controllerType });
      expect(integrating.ruleForm.gain / limit.ruleForm.gain).toBeCloseTo(1, 4);
      expect((integrating.ruleForm.integralTime_s as number) / (limit.ruleForm.integralTime_s as number)).toBeCloseTo(1, 4);
      expect(integrating.ruleForm.derivativeTime_s).toBeCloseTo(limit.ruleForm.derivativeTime_s, 6);
    }
  });

  it('refuses a double integrator (a path loop) and names the rules that apply', () => {
    const path: DesignModel = { integrators: 2, gain: 10, lags_s: [0.1], deadTime_s: 0.1 };
    expect(() => applyRule('amigo', path, {}, { speed_mps: 5 })).toThrow(
      expect.objectContaining({
        code: 'tuning.ruleNotApplicable',
        message: expect.stringMatching(/monotone step responses[\s\S]*rules that apply: .*damping-target/),
      }),
    );
  });
});
