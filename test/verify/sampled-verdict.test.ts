/**
 * The exact verdict of a sampled loop (plant with delay, zero-order hold, discrete PID)
 * against independent python computations:
 * - a fine-step Runge–Kutta simulation of the continuous plant with the firmware's PID
 *   difference equation and the hold (the audit cases: divergence or decay);
 * - on 160 random loops, numpy.roots of the closed-loop characteristic polynomial built from
 *   scipy.signal.cont2discrete (zoh) with the delay split into whole samples and a fractional
 *   part by the modified z-transform (Franklin, Powell & Workman, Digital Control of Dynamic
 *   Systems, 3rd ed., §4.3.4), the controller C(z) derived in python from the continuous PID by
 *   the substitution s = (z − 1)/(T·z) (backward Euler) or s = (2/T)(z − 1)/(z + 1) (Tustin).
 * One python call per test.
 */
import { describe, expect, it } from 'vitest';
import { runPython } from '../helpers/python.js';
import { PYTHON_SAMPLED_LOOP, randomSampledLoops, type SampledCase } from './sampled-loop-cases.js';
import { analyseLoop, type LoopDescription } from '../../src/verify/index.js';
import { splitDelay } from '../../src/verify/sampled-verdict.js';
import { allRootsInside, largestRootMagnitude } from '../../src/verify/unit-circle-roots.js';

/** Fine-step simulation: RK4 on the continuous plant (step h dividing Ts and the fractional delay), discrete PID, hold. */
const SIMULATE = `
import json, sys
import numpy as np
from scipy import signal
data = json.load(sys.stdin)
out = []
for c in data:
    A, B, C, D = signal.tf2ss(c['num'], c['den'])
    A = np.array(A, float); B = np.array(B, float).ravel(); C = np.array(C, float).ravel(); D = float(np.array(D).ravel()[0])
    T = c['Ts']; theta = c['theta']; kp, ki, kd, N = c['kp'], c['ki'], c['kd'], c['N']
    h = c['h']; sub = int(round(T / h)); steps = int(round(c['duration'] / T))
    Tf = kd / (kp * N)
    if c['method'] == 'tustin':
        wc = wp = T / 2; p = (2*Tf - T) / (2*Tf + T); g = 2*kd / (2*Tf + T)
    else:
        wc = T; wp = 0.0; p = Tf / (Tf + T); g = kd / (Tf + T)
    # held inputs u[k] from t = kT; u(t - theta) read from the history (0 before the start)
    us = []
    def held(t):
        k = int(np.floor((t - theta) / T + 1e-9))
        return us[k] if 0 <= k < len(us) else 0.0
    x = np.zeros(len(B)); I = 0.0; Dk = 0.0; e_prev = 0.0; kie_prev = 0.0; r = 1.0
    errors = []
    f = lambda x, u: A @ x + B * u
    for k in range(steps):
        t = k * T
        y = C @ x + D * held(t - 1e-12)
        e = r - y
        I = I + wc * ki * e + wp * kie_prev
        Dk = p * Dk + g * (e - e_prev)
        us.append(kp * e + I + Dk)
        e_prev = e; kie_prev = ki * e
        errors.append(abs(e))
        for j in range(sub):
            tj = t + j * h
            u = held(tj + 0.5 * h)  # constant over the substep: h divides T and the fractional delay
            k1 = f(x, u); k2 = f(x + 0.5*h*k1, u); k3 = f(x + 0.5*h*k2, u); k4 = f(x + h*k3, u)
            x = x + h / 6 * (k1 + 2*k2 + 2*k3 + k4)
        if not np.all(np.isfinite(x)) or np.max(np.abs(x)) > 1e12:
            break
    errors = np.array(errors)
    n = len(errors); q = max(n // 6, 1)
    out.append({'early': float(np.max(errors[q:2*q])), 'late': float(np.max(errors[-q:])), 'samples': n})
print(json.dumps(out))
`;

interface SimulatedCase extends SampledCase {
  readonly h: number;
  readonly duration: number;
}

const descriptionOf = (c: SimulatedCase): LoopDescription => ({
  plant: { numerator: c.num, denominator: c.den, delay_s: c.theta },
  pid: { kp: c.kp, ki: c.ki, kd: c.kd, derivativeFilter: c.N },
  sampleTime_s: c.Ts,
  discretisation: c.method,
});

describe('sampled-data verdict of a discrete PID with a zero-order hold', () => {
  it('splitDelay(θ, Ts) gives θ = ℓ·Ts + m with 0 ≤ m < Ts, whole samples snapped', () => {
    expect(splitDelay(0.141, 0.05).wholeSamples).toBe(2);
    expect(splitDelay(0.141, 0.05).fraction_s).toBeCloseTo(0.041, 12);
    // 0.03/0.01 is 2.9999999999999996 in binary: three whole samples, no fraction.
    expect(splitDelay(0.03, 0.01)).toEqual({ wholeSamples: 3, fraction_s: 0 });
    expect(splitDelay(0, 0.01)).toEqual({ wholeSamples: 0, fraction_s: 0 });
  });

  it('the audited loops that the Ts/2 approximation called stable are not stable, and a fine-step simulation diverges; a gentler loop decays', () => {
    const cases: SimulatedCase[] = [
      // Audit case 1 (simulated error grows ≈ 36× over 100 s): K 3.61, τ 0.12 s, θ 0.141 s, Tustin at 50 ms; exact max |z| = 1.0022 (audit figure).
      { num: [3.61], den: [0.12, 1], theta: 0.141, Ts: 0.05, kp: 0.3065, ki: 1.2602, kd: 0.0186, N: 10, method: 'tustin', h: 0.001, duration: 120 },
      // Audit case 2: 1/(0.3s + 1), θ 0.03 s, Tustin at 10 ms, kp 8, kd 0.2 (no integral).
      { num: [1], den: [0.3, 1], theta: 0.03, Ts: 0.01, kp: 8, ki: 0, kd: 0.2, N: 10, method: 'tustin', h: 0.0005, duration: 6 },
      // Case 1 with half the gains: stable.
      { num: [3.61], den: [0.12, 1], theta: 0.141, Ts: 0.05, kp: 0.15, ki: 0.6, kd: 0.009, N: 10, method: 'tustin', h: 0.001, duration: 12 },
    ];
    const simulated = runPython<Array<{ early: number; late: number }>>(SIMULATE, cases);
    const ours = cases.map((c) => analyseLoop(descriptionOf(c)));

    // Source: audit of the Ts/2 approximation (exact sampled-data poles, max |z| = 1.0022).
    expect(ours[0].analysis?.sampledDataLargestPoleMagnitude).toBeCloseTo(1.0022, 4);
    for (const index of [0, 1]) {
      expect({ index, stable: ours[index].stable }).toEqual({ index, stable: false });
      // Both exact tests agree: the sampled loop's poles and the Nyquist count on its pulse frequency response.
      expect(ours[index].verdict).toBe('unstable');
      expect(ours[index].analysis?.sampledDataEncirclementVerdict).toBe('unstable');
      expect(ours[index].analysis?.sampledDataVerdict).toBe('unstable');
      // Gain margins do not apply to a loop that is not stable.
      expect(ours[index].upperGainMargin_dB).toBeNull();
      expect(ours[index].lowerGainMargin_dB).toBeNull();
      // Independent: the simulated error grows by more than 3× between the second and the last sixth of the run.
      expect(simulated[index].late / simulated[index].early).toBeGreaterThan(3);
    }
    expect(ours[2].verdict).toBe('stable');
    expect(ours[2].analysis?.sampledDataVerdict).toBe('stable');
    expect(ours[2].analysis!.sampledDataLargestPoleMagnitude!).toBeLessThan(1);
    expect(simulated[2].late / simulated[2].early).toBeLessThan(1e-3);
  });

  it('on 160 random loops the sampled-data verdict, largest |z| and the Nyquist count of poles outside the unit circle equal numpy roots of the modified-z-transform closed loop', () => {
    const cases = randomSampledLoops(20261201, 160, 6, [0.1, 3]);
    const reference = runPython<Array<[number, number]>>(
      `${PYTHON_SAMPLED_LOOP}
for c in data:
    plant_num, plant_den, _ = zoh_plant(c)
    cn, cd, _, _, _ = discrete_pid(c)
    char = padd(pmul(cd, plant_den), pmul(cn, plant_num))
    char = np.trim_zeros(np.real_if_close(char), 'f')
    roots = np.abs(np.roots(char))
    out.append([float(np.max(roots)), int(np.sum(roots > 1))])
print(json.dumps(out))
`,
      cases,
    );
    let stable = 0;
    let compared = 0;
    cases.forEach((c, index) => {
      const ours = analyseLoop({ plant: { numerator: c.num, denominator: c.den, delay_s: c.theta }, pid: { kp: c.kp, ki: c.ki, kd: c.kd, derivativeFilter: c.N }, sampleTime_s: c.Ts, discretisation: c.method });
      const [largest, outside] = reference[index];
      if (Math.abs(largest - 1) < 1e-5) return; // too close to the unit circle for either to decide
      compared++;
      if (largest < 1) stable++;
      const expected = largest < 1 ? 'stable' : 'unstable';
      expect({ index, verdict: ours.analysis?.sampledDataVerdict }).toEqual({ index, verdict: expected });
      expect({ index, largest: ours.analysis!.sampledDataLargestPoleMagnitude! }).toEqual({ index, largest: expect.closeTo(largest, 6) as number });
      // The Nyquist count on the exact pulse frequency response finds as many closed-loop poles outside the unit circle.
      expect({ index, outside: ours.analysis?.sampledDataClosedLoopOutsidePoles }).toEqual({ index, outside });
      expect({ index, verdict: ours.verdict }).toEqual({ index, verdict: expected });
    });
    expect(compared).toBeGreaterThanOrEqual(150);
    // Both kinds are well represented.
    expect(stable).toBeGreaterThan(40);
    expect(compared - stable).toBeGreaterThan(40);
  });
});

describe('Schur–Cohn test of where polynomial roots lie', () => {
  it('allRootsInside and largestRootMagnitude agree with polynomials built from known roots', () => {
    // (z − 0.5)(z + 0.9) = z² + 0.4z − 0.45: roots 0.5 and −0.9 (worked by hand).
    expect(allRootsInside([1, 0.4, -0.45], 1)).toBe(true);
    expect(allRootsInside([1, 0.4, -0.45], 0.89)).toBe(false);
    expect(largestRootMagnitude([1, 0.4, -0.45], 1e-12)).toBeCloseTo(0.9, 10);
    // z² − 1.2z + 0.85: complex pair 0.6 ± 0.7j, |z| = √0.85 (worked by hand).
    expect(largestRootMagnitude([1, -1.2, 0.85], 1e-12)).toBeCloseTo(Math.sqrt(0.85), 10);
    // (z − 1.1)(z − 0.2): one root outside the unit circle.
    expect(allRootsInside([1, -1.3, 0.22], 1)).toBe(false);
    expect(largestRootMagnitude([1, -1.3, 0.22], 1e-12)).toBeCloseTo(1.1, 10);
    // z³: every root at 0.
    expect(largestRootMagnitude([1, 0, 0, 0], 1e-12)).toBe(0);
  });
});
