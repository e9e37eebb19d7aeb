/**
 * Both gain margins of conditionally stable loops against a brute-force gain sweep:
 * numpy.roots of the closed loop 1 + k·L = 0 with a [10/10] Padé approximant of the
 * delay (closed-form Padé coefficients), k on a log grid, each stability change then
 * bisected in k. Independent of the crossing search in src/verify/.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { runPython } from '../helpers/python.js';
import { decibelsToRatio } from '../../src/core/units.js';
import { analyseOpenLoop, openLoopOf, type OpenLoop } from '../../src/verify/index.js';

/** The brute force bisects k to 1e-9; margins must agree within 0.1 %. */
const SWEEP_TOLERANCE = 1e-3;

// Source: Skogestad 2003, SIMC for k''e^(−θs)/s² at τc = θ: series Kc = 1/(4k''(τc + θ)²), τI = τD = 4(τc + θ).
const simcDoubleIntegrator = (kSecond: number, theta: number, derivativeFilter: number): OpenLoop =>
  openLoopOf({
    plant: { numerator: [kSecond], denominator: [1, 0, 0], delay_s: theta },
    pid: { kp: 1 / (4 * kSecond * (2 * theta) ** 2), ki: 8 * theta, kd: 8 * theta, form: 'series', derivativeFilter },
  });

const loops: Record<string, OpenLoop> = {
  'SIMC PID, unfiltered, k″ = 1, θ = 1 s': simcDoubleIntegrator(1, 1, Infinity),
  'SIMC PID, N = 10, k″ = 1, θ = 1 s': simcDoubleIntegrator(1, 1, 10),
  'SIMC PID, N = 10, k″ = 3, θ = 0.2 s': simcDoubleIntegrator(3, 0.2, 10),
  // A path-like loop: yaw lag and a preview zero, (s + 0.3)/(s²(0.3s + 1)) under PI (synthetic numbers).
  'PI on a double integrator with a lead zero, θ = 0.15 s': openLoopOf({
    plant: { numerator: [1, 0.3], denominator: [0.3, 1, 0, 0], delay_s: 0.15 },
    pid: { kp: 1, ki: 0.03, kd: 0 },
  }),
  // An oversteering car at 30 m/s (open-loop unstable yaw rate, synthetic numbers: m = 1500 kg, Iz = 2500 kg·m²,
  // a = 1.6 m, b = 1.0 m, Cf = 80 kN/rad, Cr = 60 kN/rad; docs/domain.md §3) under a PI yaw-rate loop.
  'PI yaw-rate loop on an oversteering car above its critical speed, θ = 0.05 s': openLoopOf({
    plant: { numerator: [51.2, 110.93333333333334], denominator: [1, 6.641777777777778, -17.58577777777778], delay_s: 0.05 },
    pid: { kp: 0.2, ki: 0.4, kd: 0 },
  }),
};

interface Sweep {
  changes: number[];
}

const SCRIPT = String.raw`
import json, sys, math, warnings
import numpy as np
warnings.simplefilter('ignore')
d = json.load(sys.stdin)
def pade(theta, n):
    c = [math.factorial(2 * n - k) * math.factorial(n) / (math.factorial(2 * n) * math.factorial(k) * math.factorial(n - k)) * theta ** k for k in range(n + 1)]
    return np.array([ck * (-1) ** k for k, ck in enumerate(c)][::-1]), np.array(c[::-1])
out = []
for loop in d:
    pn, pd = pade(loop['delay_s'], 10)
    num, den = np.polymul(loop['numerator'], pn), np.polymul(loop['denominator'], pd)
    stable = lambda k: bool(np.max(np.roots(np.polyadd(den, k * num)).real) < 0)
    ks = np.logspace(-3, 2, 1001)
    flags = [stable(k) for k in ks]
    changes = []
    for i in range(len(ks) - 1):
        if flags[i] != flags[i + 1]:
            a, b = ks[i], ks[i + 1]
            while b / a - 1 > 1e-9:
                m = math.sqrt(a * b)
                if stable(m) == flags[i]: a = m
                else: b = m
            changes.append(math.sqrt(a * b))
    out.append({'changes': changes})
print(json.dumps(out))
`;

let sweeps: Sweep[];
beforeAll(() => {
  sweeps = runPython<Sweep[]>(SCRIPT, Object.values(loops));
});

describe('gain margins against a brute-force gain sweep of the closed-loop poles', () => {
  it.each(Object.keys(loops).map((name, index) => [name, index] as const))(
    '%s: the lower and upper gain margins are the nearest stability changes',
    (name, index) => {
      const margins = analyseOpenLoop(loops[name]);
      const changes = sweeps[index].changes;
      expect(margins.stable).toBe(true);
      const below = changes.filter((k) => k < 1);
      const above = changes.filter((k) => k > 1);
      // A conditionally stable loop: destabilised by reducing the gain and by raising it.
      expect(below.length).toBeGreaterThan(0);
      expect(above.length).toBeGreaterThan(0);
      expect(Math.abs(decibelsToRatio(margins.lowerGainMargin_dB!) / Math.max(...below) - 1)).toBeLessThan(SWEEP_TOLERANCE);
      expect(Math.abs(decibelsToRatio(margins.upperGainMargin_dB!) / Math.min(...above) - 1)).toBeLessThan(SWEEP_TOLERANCE);
      expect(margins.lowerGainMargin_dB as number).toBeLessThan(0);
      expect(margins.upperGainMargin_dB as number).toBeGreaterThan(0);
    },
  );
});
