import { beforeAll, describe, expect, it } from 'vitest';
import { runPython } from '../helpers/python.js';
import { loopPlantFromLumped } from '../../src/loops/build.js';
import { pidTransferFunction } from '../../src/controller/pid.js';
import type { ControllerSettings, PidGains } from '../../src/controller/types.js';
import { dampingTarget } from '../../src/tuning/damping-target.js';
import { loopMargins, tuneOperatingPoint } from '../../src/tuning/operating-point.js';
import { proportionalGainRange } from '../../src/tuning/proportional-range.js';
import type { FopdtModel } from '../../src/identify/types.js';

const controller: ControllerSettings = { derivativeFilter: 10, sampleTime_s: 0.02, discretisation: 'backward-euler', computationLatency_s: 0.01 };
// Synthetic per-speed yaw-rate model of an invented delivery vehicle at 6 m/s.
const yawRate: FopdtModel = { kind: 'fopdt', gain: 1.8, timeConstant_s: 0.15, deadTime_s: 0.08 };
const speed_mps = 6;

/**
 * All python cross-checks of this file in one call (one scipy start-up). Tasks:
 * - 'stable': closed-loop characteristic polynomial Dc·Dg·q + Nc·Ng·p with the delay replaced by a
 *   6th-order Padé approximant p/q (scipy.interpolate.pade), stable iff every numpy root has Re < 0;
 * - 'biasFinal': final value of e = b·G/(1 + C·G)/s (steering bias at the plant input), scipy.signal.step;
 * - 'roots': largest |imaginary part| and the spread of the first two numpy roots of a polynomial.
 */
const CROSS_CHECKS = `
import json, sys, math, numpy as np
from scipy import signal
from scipy.interpolate import pade
def pade6(theta):
    p, q = pade([(-theta)**k/math.factorial(k) for k in range(13)], 6)
    return p.coeffs, q.coeffs
out = []
for c in json.load(sys.stdin):
    if c['task'] == 'stable':
        p, q = pade6(c['delay'])
        char = np.polyadd(np.polymul(np.polymul(c['cden'], c['gden']), q), np.polymul(np.polymul(c['cnum'], c['gnum']), p))
        out.append(bool(np.max(np.roots(char).real) < 0))
    elif c['task'] == 'biasFinal':
        p, q = pade6(c['delay'])
        gnum = np.polymul(c['gnum'], p); gden = np.polymul(c['gden'], q)
        num = np.polymul(gnum, c['cden'])
        den = np.polyadd(np.polymul(gden, c['cden']), np.polymul(gnum, c['cnum']))
        t = np.linspace(0, 400, 8001)
        _, y = signal.step(signal.lti(num, den), T=t)
        out.append(c['bias'] * float(y[-1]))
    else:
        r = np.roots(c['polynomial'])
        out.append({'imaginary': float(np.max(np.abs(r.imag))), 'spread': float(abs(r[0] - r[1]))})
print(json.dumps(out))
`;

type Plant = { readonly numerator: readonly number[]; readonly denominator: readonly number[]; readonly delay_s: number };

function loopTask(task: 'stable' | 'biasFinal', gains: PidGains, plant: Plant, bias = 0): Record<string, unknown> {
  const c = pidTransferFunction(gains, controller.derivativeFilter);
  return { task, cnum: c.numerator, cden: c.denominator, gnum: plant.numerator, gden: plant.denominator, delay: plant.delay_s, bias };
}

// Everything the tests below compare, built first so that python runs once.
const pathNoPreview = loopPlantFromLumped({ specification: { kind: 'path', preview_m: 0 }, model: yawRate, speed_mps, controller });
const pathPreview = loopPlantFromLumped({ specification: { kind: 'path', preview_m: 6 }, model: yawRate, speed_mps, controller });
const previewRange = proportionalGainRange(pathPreview);
const previewProbes = previewRange?.highestGain ? [0.01, 0.5, 0.97, 1.03, 3].map((m) => m * previewRange.highestGain!) : [];
const noPreviewGains = [1e-4, 1e-3, 1e-2, 0.1, 1, 10];
const pathPid = tuneOperatingPoint({
  loop: { kind: 'path' },
  speed_mps,
  model: { kind: 'lumped', yawRate },
  rule: 'damping-target',
  ruleParameters: {},
  controller,
}).gains;
const pathPd = { ...pathPid, ki: 0 };
const bias_rad = 0.01;
const heading = tuneOperatingPoint({ loop: { kind: 'heading' }, speed_mps, model: { kind: 'lumped', yawRate }, rule: 'simc', ruleParameters: {}, controller });
const excessiveIntegral = { ...heading.gains, ki: heading.gains.ki * 100 };
// PD on k''/s² (textbook second-order placement): ζ = 0.5 target, kd = 2ζωn/k'', kp = ωn²/k''.
const pdGain = 4;
const pdOmega = 2;
const pdKp = (pdOmega * pdOmega) / pdGain;
const pdKdTarget = (2 * 0.5 * pdOmega) / pdGain;
const pdCritical = 2 * Math.sqrt(pdKp / pdGain);
const pdMultipliers = [1, 1.5, 1.9, pdCritical / pdKdTarget, 2.1, 3, 10];
const placed = dampingTarget(
  { integrators: 2, gain: 1, lags_s: [], deadTime_s: 0.05 },
  { dampingRatio: 0.5, naturalFrequency_radps: 1 },
  { speed_mps: 1 },
).gains;

const tasks: Record<string, unknown>[] = [
  ...noPreviewGains.map((kp) => loopTask('stable', { kp, ki: 0, kd: 0 }, pathNoPreview.plant)),
  ...previewProbes.map((kp) => loopTask('stable', { kp, ki: 0, kd: 0 }, pathPreview.plant)),
  loopTask('biasFinal', pathPd, pathNoPreview.plant, bias_rad),
  loopTask('biasFinal', pathPid, pathNoPreview.plant, bias_rad),
  ...pdMultipliers.map((m) => ({ task: 'roots', polynomial: [1, pdGain * pdKdTarget * m, pdGain * pdKp] })),
  ...[1, 10].map((m) => ({ task: 'roots', polynomial: [1, placed.kd * m, placed.kp, placed.ki] })),
  loopTask('stable', heading.gains, heading.loop.plant),
  loopTask('stable', excessiveIntegral, heading.loop.plant),
];
let results: unknown[] = [];
beforeAll(() => {
  results = runPython<unknown[]>(CROSS_CHECKS, tasks);
});
function take(from: number, count: number): unknown[] {
  return results.slice(from, from + count);
}
const at = {
  noPreview: 0,
  preview: noPreviewGains.length,
  bias: noPreviewGains.length + 5,
  pdRoots: noPreviewGains.length + 7,
  pidRoots: noPreviewGains.length + 7 + 7,
  integral: noPreviewGains.length + 7 + 7 + 2,
};

describe('closed-loop facts of the trade on the path loop', () => {
  it('zero preview: no P-only gain stabilises the path loop, and proportionalGainRange says so (common practice, docs/domain.md §3)', () => {
    expect(proportionalGainRange(pathNoPreview)).toBeNull();
    expect(take(at.noPreview, noPreviewGains.length)).toEqual(noPreviewGains.map(() => false));
  });

  it('a preview distance makes P-only stabilisable: the range found is stable inside and unstable outside (numpy Padé roots)', () => {
    expect(previewRange).not.toBeNull();
    expect(previewRange!.lowestGain).toBe(0);
    expect(previewRange!.highestGain).toBeGreaterThan(0);
    expect(take(at.preview, 5)).toEqual([true, true, true, false, false]);
  });

  it('with a constant steering bias a PD loop settles with an offset b/kp and a PID removes it (final value theorem; scipy.signal.step with Padé delay)', () => {
    const [pd, pid] = take(at.bias, 2) as number[];
    expect(pd).toBeCloseTo(bias_rad / pathPd.kp, 4);
    expect(Math.abs(pid)).toBeLessThan(1e-3 * (bias_rad / pathPd.kp));
  });

  it("PD on k''/s²: raising kd past the damping target turns complex poles real, with a double pole (critical damping) at kd = 2√(kp/k'') (numpy.roots)", () => {
    const roots = take(at.pdRoots, pdMultipliers.length) as { imaginary: number; spread: number }[];
    expect(roots.slice(0, 3).every((r) => r.imaginary > 1e-3)).toBe(true);
    expect(roots[3].spread).toBeLessThan(1e-6);
    expect(roots.slice(4).every((r) => r.imaginary === 0)).toBe(true);
  });

  it('with the integral pole of the damping target (ratio 5), a very large kd makes the slow pair complex again — the fact above holds for PD (numpy.roots)', () => {
    const roots = take(at.pidRoots, 2) as { imaginary: number }[];
    expect(roots[0].imaginary).toBeGreaterThan(0.5);
    expect(roots[1].imaginary).toBeGreaterThan(0.05);
  });

  it('an integral gain far above the rule value destabilises the loop (analysis and numpy Padé roots agree)', () => {
    expect(heading.margins.stable).toBe(true);
    expect(loopMargins(heading.loop, excessiveIntegral, controller.derivativeFilter).stable).toBe(false);
    expect(take(at.integral, 2)).toEqual([true, false]);
  });
});
