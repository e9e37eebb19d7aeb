import { beforeAll, describe, expect, it } from 'vitest';
import { runPython } from '../helpers/python.js';
import { reactionCurve, zieglerNicholsStep } from '../../src/tuning/ziegler-nichols-step.js';
import { zieglerNicholsUltimate } from '../../src/tuning/ziegler-nichols-ultimate.js';
import { ultimatePoint } from '../../src/tuning/ultimate-gain.js';
import type { DesignModel } from '../../src/tuning/types.js';

const fopdt: DesignModel = { integrators: 0, gain: 2, lags_s: [10], deadTime_s: 2 };
const secondOrderModels: DesignModel[] = [
  { integrators: 0, gain: 1.5, lags_s: [4, 1], deadTime_s: 0.5 },
  { integrators: 0, gain: -0.7, lags_s: [2, 2], deadTime_s: 0 },
  { integrators: 0, gain: 3, lags_s: [10, 0.3], deadTime_s: 1 },
];
const fopdtModels = [
  { gain: 2, tau: 10, theta: 2 },
  { gain: 0.5, tau: 0.3, theta: 0.05 },
  { gain: 7, tau: 1, theta: 4 },
];
/**
 * Both python cross-checks in one call:
 * - tangents: scipy.signal.step on a fine grid, tangent at the maximum slope, L = θ + t* − y(t*)/R;
 * - ultimate: scipy.optimize.brentq on atan(ωτ) + ωθ = π; Ku = √(1 + (ωτ)²)/K, Pu = 2π/ω.
 */
let references: { tangents: { slope: number; deadTime: number }[]; ultimate: { ku: number; pu: number }[] } = { tangents: [], ultimate: [] };
beforeAll(() => {
  references = runPython(
    `
import json, sys, math, numpy as np
from scipy import signal
from scipy.optimize import brentq
d = json.load(sys.stdin)
tangents = []
for m in d['secondOrder']:
    t1, t2 = m['lags_s']
    t = np.linspace(0, 20*t1, 20001)
    _, y = signal.step(signal.lti([m['gain']], np.polymul([t1, 1], [t2, 1])), T=t)
    dy = np.gradient(y, t)
    i = np.argmax(np.abs(dy))
    tangents.append({'slope': dy[i], 'deadTime': m['deadTime_s'] + t[i] - y[i]/dy[i]})
ultimate = []
for m in d['fopdt']:
    w = brentq(lambda w: math.atan(w*m['tau']) + w*m['theta'] - math.pi, 1e-9, math.pi/m['theta'], xtol=1e-15)
    ultimate.append({'ku': math.hypot(1, w*m['tau'])/m['gain'], 'pu': 2*math.pi/w})
print(json.dumps({'tangents': tangents, 'ultimate': ultimate}))
`,
    { secondOrder: secondOrderModels, fopdt: fopdtModels },
  );
});

describe('Ziegler–Nichols step-response method', () => {
  // Source: Ziegler & Nichols 1942, reaction-curve table; for FOPDT a = Kθ/τ = 2·2/10 = 0.4, L = θ = 2 s.
  const rows = [
    { controllerType: 'P', kc: 1 / 0.4, ti: null, td: 0 },
    { controllerType: 'PI', kc: 0.9 / 0.4, ti: 3.3 * 2, td: 0 },
    { controllerType: 'PID', kc: 1.2 / 0.4, ti: 2 * 2, td: 2 / 2 },
  ] as const;
  for (const row of rows) {
    it(`zieglerNicholsStep gives the 1942 ${row.controllerType} row for K=2, τ=10 s, θ=2 s`, () => {
      const result = zieglerNicholsStep(fopdt, { controllerType: row.controllerType });
      expect(result.ruleForm.form).toBe('ideal');
      expect(result.ruleForm.gain).toBeCloseTo(row.kc, 12);
      expect(result.ruleForm.integralTime_s).toEqual(row.ti === null ? null : expect.closeTo(row.ti, 12));
      expect(result.ruleForm.derivativeTime_s).toBeCloseTo(row.td, 12);
      expect(result.intermediate.a).toBeCloseTo(0.4, 12);
      // Ideal → parallel: kp = Kc, ki = Kc/Ti, kd = Kc·Td (docs/domain.md §4)
      expect(result.gains.kp).toBeCloseTo(row.kc, 12);
      expect(result.gains.ki).toBeCloseTo(row.ti === null ? 0 : row.kc / row.ti, 12);
      expect(result.gains.kd).toBeCloseTo(row.kc * row.td, 12);
    });
  }

  it('reactionCurve of a second-order model matches the tangent at the inflection of scipy.signal.step', () => {
    secondOrderModels.forEach((model, index) => {
      const curve = reactionCurve(model);
      expect(curve.maximumSlope).toBeCloseTo(references.tangents[index].slope, 5);
      expect(curve.apparentDeadTime_s).toBeCloseTo(references.tangents[index].deadTime, 3);
    });
  });

  it("reactionCurve of k'e^(−θs)/(s(τs+1)) is the ramp asymptote: R = k', L = θ + τ", () => {
    // Source: textbook step response of an integrator with lag, y = k'(t − τ(1 − e^(−t/τ))) after θ.
    const curve = reactionCurve({ integrators: 1, gain: 0.8, lags_s: [0.3], deadTime_s: 0.1 });
    expect(curve.maximumSlope).toBe(0.8);
    expect(curve.apparentDeadTime_s).toBeCloseTo(0.4, 14);
  });

  it('refuses a double integrator and says why', () => {
    expect(() => zieglerNicholsStep({ integrators: 2, gain: 1, lags_s: [], deadTime_s: 0.1 }, {})).toThrow(/no finite maximum slope/);
  });
});

describe('Ziegler–Nichols ultimate-gain method', () => {
  it('ultimatePoint of FOPDT models matches scipy brentq on the −180° phase crossing', () => {
    fopdtModels.forEach((m, index) => {
      const point = ultimatePoint({ integrators: 0, gain: m.gain, lags_s: [m.tau], deadTime_s: m.theta });
      expect(point).not.toBeNull();
      expect(point!.ultimateGain).toBeCloseTo(references.ultimate[index].ku, 9);
      expect(point!.ultimatePeriod_s).toBeCloseTo(references.ultimate[index].pu, 9);
    });
  });

  it("ultimatePoint of k'e^(−θs)/s is Ku = π/(2k'θ), Pu = 4θ", () => {
    // Source: closed form — phase −π/2 − ωθ = −π at ω = π/(2θ), |G| = k'/ω.
    const point = ultimatePoint({ integrators: 1, gain: 0.5, lags_s: [], deadTime_s: 0.2 })!;
    expect(point.ultimateGain).toBeCloseTo(Math.PI / (2 * 0.5 * 0.2), 10);
    expect(point.ultimatePeriod_s).toBeCloseTo(0.8, 12);
  });

  it('1/(s+1)³: Ku = 8, Pu = 2π/√3 and the 1942 PID row Kc = 4.8, Ti = Pu/2, Td = Pu/8', () => {
    // Source: textbook worked example (Åström & Hägglund, PID Controllers, 1995 — from memory);
    // closed form: 3·atan(ω) = π at ω = √3, |G| = 1/(1 + 3)^(3/2) = 1/8.
    const model: DesignModel = { integrators: 0, gain: 1, lags_s: [1, 1, 1], deadTime_s: 0 };
    const result = zieglerNicholsUltimate(model, { controllerType: 'PID' });
    const pu = (2 * Math.PI) / Math.sqrt(3);
    expect(result.intermediate.ultimateGain_Ku).toBeCloseTo(8, 10);
    expect(result.intermediate.ultimatePeriod_Pu_s).toBeCloseTo(pu, 10);
    expect(result.ruleForm.gain).toBeCloseTo(4.8, 10);
    expect(result.ruleForm.integralTime_s).toBeCloseTo(pu / 2, 10);
    expect(result.ruleForm.derivativeTime_s).toBeCloseTo(pu / 8, 10);
  });

  it('P and PI rows: 0.5·Ku and 0.45·Ku with Ti = Pu/1.2 (Ziegler & Nichols 1942)', () => {
    const model: DesignModel = { integrators: 0, gain: 1, lags_s: [1, 1, 1], deadTime_s: 0 };
    const pu = (2 * Math.PI) / Math.sqrt(3);
    expect(zieglerNicholsUltimate(model, { controllerType: 'P' }).gains).toEqual({ kp: expect.closeTo(4, 10), ki: 0, kd: 0 });
    const pi = zieglerNicholsUltimate(model, { controllerType: 'PI' });
    expect(pi.ruleForm.gain).toBeCloseTo(3.6, 10);
    expect(pi.ruleForm.integralTime_s).toBeCloseTo(pu / 1.2, 10);
  });

  it('refuses a double integrator and a delay-free first-order plant (no finite ultimate gain)', () => {
    expect(() => zieglerNicholsUltimate({ integrators: 2, gain: 1, lags_s: [], deadTime_s: 0.1 }, {})).toThrow(/no finite ultimate gain/);
    expect(() => zieglerNicholsUltimate({ integrators: 0, gain: 1, lags_s: [2], deadTime_s: 0 }, {})).toThrow(/never reaches −180°/);
  });

  it('a negative plant gain gives the same gains with a negative sign (docs/domain.md §5b, common practice)', () => {
    const positive = zieglerNicholsUltimate(fopdt, {});
    const negative = zieglerNicholsUltimate({ ...fopdt, gain: -2 }, {});
    expect(negative.gains.kp).toBeCloseTo(-positive.gains.kp, 12);
    expect(negative.gains.ki).toBeCloseTo(-positive.gains.ki, 12);
    expect(negative.gains.kd).toBeCloseTo(-positive.gains.kd, 12);
    expect(negative.intermediate.ultimatePeriod_Pu_s).toBeCloseTo(positive.intermediate.ultimatePeriod_Pu_s, 12);
    expect(zieglerNicholsStep({ ...fopdt, gain: -2 }, {}).gains.kp).toBeCloseTo(-3, 12);
  });
});
