import { describe, expect, it } from 'vitest';
import { imcPid } from '../../src/tuning/imc-pid.js';
import type { DesignModel } from '../../src/tuning/types.js';

const fopdt: DesignModel = { integrators: 0, gain: 2, lags_s: [10], deadTime_s: 2 };

describe('imcPid (Rivera, Morari & Skogestad 1986, FOPDT with first-order Padé)', () => {
  it('K=2, τ=10 s, θ=2 s, λ=2 s: Kc = (2τ+θ)/(K(2λ+θ)) = 22/12, Ti = τ+θ/2 = 11 s, Td = τθ/(2τ+θ) = 20/22 s', () => {
    // Source: Rivera, Morari & Skogestad 1986, PID row for FOPDT (formulas as in docs/domain.md §4), evaluated by hand.
    const result = imcPid(fopdt, { closedLoopTimeConstant_s: 2 });
    expect(result.ruleForm).toEqual({
      form: 'ideal',
      gain: expect.closeTo(22 / 12, 12),
      integralTime_s: expect.closeTo(11, 12),
      derivativeTime_s: expect.closeTo(20 / 22, 12),
    });
    expect(result.gains.kp).toBeCloseTo(22 / 12, 12);
    expect(result.gains.ki).toBeCloseTo(22 / 12 / 11, 12);
    expect(result.gains.kd).toBeCloseTo((22 / 12) * (20 / 22), 12);
    expect(result.warnings).toEqual([]);
  });

  it('defaults λ to θ and warns when λ < 0.8θ (paper advice, from memory)', () => {
    expect(imcPid(fopdt, {}).intermediate.lambda_s).toBe(2);
    expect(imcPid(fopdt, { closedLoopTimeConstant_s: 1 }).warnings.join()).toMatch(/below 0\.8·θ/);
  });

  it('refuses an integrating plant and a zero λ', () => {
    expect(() => imcPid({ integrators: 1, gain: 1, lags_s: [], deadTime_s: 1 }, {})).toThrow(/first order plus dead time/);
    expect(() => imcPid(fopdt, { closedLoopTimeConstant_s: 0 })).toThrow(/expected a finite number above 0/);
  });

  it('negative plant gain → negative gains of the same size (docs/domain.md §5b)', () => {
    const negative = imcPid({ ...fopdt, gain: -2 }, {}).gains;
    const positive = imcPid(fopdt, {}).gains;
    expect(negative.kp).toBeCloseTo(-positive.kp, 12);
    expect(negative.ki).toBeCloseTo(-positive.ki, 12);
    expect(negative.kd).toBeCloseTo(-positive.kd, 12);
  });
});
