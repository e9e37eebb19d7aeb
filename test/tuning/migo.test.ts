import { describe, expect, it } from 'vitest';
import { migo } from '../../src/tuning/migo.js';
import { applyRule } from '../../src/tuning/registry.js';
import { analyseLoop } from '../../src/verify/analyse-loop.js';
import type { ControllerSettings } from '../../src/controller/types.js';
import type { DesignModel } from '../../src/tuning/types.js';
import { runPython } from '../helpers/python.js';

const controller: ControllerSettings = { derivativeFilter: 10, sampleTime_s: 0.01, discretisation: 'backward-euler', computationLatency_s: 0 };
const plant = { numerator: [1], denominator: [1, 1], delay_s: 0.3 };
const design: DesignModel = { integrators: 0, gain: 1, lags_s: [1], deadTime_s: 0.3 + 0.005 };

/**
 * The same problem solved independently in python: the plant's zero-order-hold pulse transfer function
 * (scipy.signal.cont2discrete, 30 samples of delay), the backward-Euler PI kp + ki·Ts·z/(z − 1), the peaks of
 * |S| and |T| on 20,000 frequencies up to π/Ts, stability from numpy.roots of the closed-loop polynomial;
 * for each kp the largest ki by bisection, the best kp by scipy.optimize.minimize_scalar (bounded).
 */
const SCIPY_MIGO = `
import json, sys, numpy as np
from scipy import signal, optimize
d = json.load(sys.stdin)
Ts, M = d['Ts'], d['M']
num, den, _ = signal.cont2discrete(([1.0], [1.0, 1.0]), Ts, method='zoh')
num = np.trim_zeros(np.ravel(num), 'f'); den = np.ravel(den)
delay = np.zeros(31); delay[0] = 1.0   # z^30 in the denominator
gden = np.polymul(den, delay)
w = np.logspace(-3, np.log10(np.pi / Ts * 0.9999), 20000)
z = np.exp(1j * w * Ts)
G = np.polyval(num, z) / np.polyval(gden, z)
def ok(kp, ki):
    C = kp + ki * Ts * z / (z - 1)
    L = C * G
    if np.max(np.abs(1 / (1 + L))) > M or np.max(np.abs(L / (1 + L))) > M: return False
    cnum = np.array([kp + ki * Ts, -kp]); cden = np.array([1.0, -1.0])
    char = np.polyadd(np.polymul(cden, gden), np.polymul(cnum, num))
    return bool(np.max(np.abs(np.roots(char))) < 1)
def kimax(kp):
    lo = 1e-4
    if not ok(kp, lo): return 0.0
    hi = lo * 2
    while ok(kp, hi): lo, hi = hi, hi * 2
    for _ in range(40):
        mid = 0.5 * (lo + hi)
        if ok(kp, mid): lo = mid
        else: hi = mid
    return lo
kps = np.linspace(0.05, 2.0, 40)
best = kps[int(np.argmax([kimax(k) for k in kps]))]
res = optimize.minimize_scalar(lambda k: -kimax(k), bounds=(max(0.01, best - 0.1), best + 0.1), method='bounded', options={'xatol': 1e-4})
print(json.dumps({'kp': float(res.x), 'ki': float(-res.fun)}))
`;

describe('migo(model, parameters, { fullLoop }) — maximum ki with Ms ≤ M and Mt ≤ M on the sampled loop', () => {
  it('finds the optimum of an independent scipy optimisation of the same problem (FOPDT K = 1, T = 1 s, L = 0.3 s, PI, M = 1.4)', () => {
    const reference = runPython<{ kp: number; ki: number }>(SCIPY_MIGO, { Ts: controller.sampleTime_s, M: 1.4 });
    const ours = migo(design, { controllerType: 'PI', sensitivityPeakTarget: 1.4 }, { speed_mps: 5, fullLoop: { plant, controller } });
    expect(ours.gains.kd).toBe(0);
    // ki: the optimum itself, within 1 %; kp: the optimum is flat along kp, within 5 %.
    expect(Math.abs(ours.gains.ki / reference.ki - 1)).toBeLessThan(0.01);
    expect(Math.abs(ours.gains.kp / reference.kp - 1)).toBeLessThan(0.05);
  });

  it('keeps both peaks within the bound on the exact analysis of the loop (src/verify), for PI and PID and two bounds', () => {
    for (const controllerType of ['PI', 'PID'] as const) {
      for (const target of [1.4, 1.8]) {
        const ours = migo(design, { controllerType, sensitivityPeakTarget: target }, { speed_mps: 5, fullLoop: { plant, controller } });
        const margins = analyseLoop({
          plant,
          pid: { ...ours.gains, derivativeFilter: controller.derivativeFilter },
          sampleTime_s: controller.sampleTime_s,
          discretisation: controller.discretisation,
        });
        expect(margins.verdict).toBe('stable');
        expect(margins.sensitivityPeak).toBeLessThanOrEqual(target * 1.005);
        expect(margins.complementarySensitivityPeak).toBeLessThanOrEqual(target * 1.005);
        if (controllerType === 'PID') expect(4 * ours.gains.ki * ours.gains.kd).toBeLessThanOrEqual(ours.gains.kp * ours.gains.kp * (1 + 1e-9));
      }
    }
  });

  it('with phaseMarginTarget_deg also keeps the phase margin (a larger bound M then no longer costs phase margin)', () => {
    const free = migo(design, { controllerType: 'PID', sensitivityPeakTarget: 2 }, { speed_mps: 5, fullLoop: { plant, controller } });
    const held = migo(
      design,
      { controllerType: 'PID', sensitivityPeakTarget: 2, phaseMarginTarget_deg: 55 },
      { speed_mps: 5, fullLoop: { plant, controller } },
    );
    const margins = (gains: typeof free.gains) =>
      analyseLoop({
        plant,
        pid: { ...gains, derivativeFilter: controller.derivativeFilter },
        sampleTime_s: controller.sampleTime_s,
        discretisation: controller.discretisation,
      });
    expect(margins(free.gains).phaseMargin_deg as number).toBeLessThan(55);
    expect(margins(held.gains).phaseMargin_deg as number).toBeGreaterThanOrEqual(54.5);
    expect(held.gains.ki).toBeLessThan(free.gains.ki);
  });

  it('refuses without the full loop, and where no PI keeps the bound (a PI cannot stabilise a delayed double integrator), saying why', () => {
    expect(() => applyRule('migo', design, {}, { speed_mps: 5 })).toThrow(
      expect.objectContaining({ code: 'tuning.ruleNotApplicable', message: expect.stringMatching(/full loop/) }),
    );
    const doubleIntegrator = { numerator: [1], denominator: [1, 0, 0], delay_s: 0.1 };
    const model: DesignModel = { integrators: 2, gain: 1, lags_s: [], deadTime_s: 0.105 };
    expect(() => migo(model, { controllerType: 'PI', sensitivityPeakTarget: 2 }, { speed_mps: 5, fullLoop: { plant: doubleIntegrator, controller } })).toThrow(
      expect.objectContaining({ code: 'tuning.ruleNotApplicable', message: expect.stringMatching(/no PI setting keeps both sensitivity peaks within M = 2/) }),
    );
  });
});
