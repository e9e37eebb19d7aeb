/**
 * The exact verdict of a sampled loop (plant with delay, zero-order hold, discrete PID)
 * against independent python computations:
 * - a fine-step Runge–Kutta simulation of the continuous plant with the firmware's PID
 *   difference equation and the hold (the audit cases: divergence or decay);
 * - on 320 random loops, numpy.linalg.eigvals of the closed-loop state matrix built in python: the
 *   plant's zero-order hold by scipy.linalg.expm of the augmented matrix with the delay split into
 *   whole samples and a fractional part (the modified z-transform; Franklin, Powell & Workman, Digital
 *   Control of Dynamic Systems, 3rd ed., §4.3.4), the controller C(z) derived in python from the
 *   continuous PID by the substitution s = (z − 1)/(T·z) (backward Euler) or s = (2/T)(z − 1)/(z + 1)
 *   (Tustin) and realised by scipy.signal.tf2ss;
 * - the delay margin against a scan of that closed loop with added delay, refined by bisection.
 */
import { describe, expect, it } from 'vitest';
import { runPython } from '../helpers/python.js';
import { PYTHON_SAMPLED_LOOP, randomSampledLoops, type SampledCase } from './sampled-loop-cases.js';
import { analyseLoop, type LoopDescription } from '../../src/verify/index.js';
import { splitDelay } from '../../src/verify/sampled-verdict.js';

/**
 * Fine-step simulation: RK4 on the continuous plant (step h dividing Ts and the fractional delay), discrete PID, hold.
 * The held input is constant over each RK4 step, so one step of the linear plant is the fixed map x ← P·x + Q·u
 * (P, Q: the RK4 step applied to the unit states and to a unit input); a run of r steps under one input is
 * x ← P^r·x + (P^(r−1) + … + I)·Q·u, the same steps composed.
 */
const SIMULATE = `
import json, sys, math
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
    f = lambda x, u: A @ x + B * u
    def rk4(x, u):
        k1 = f(x, u); k2 = f(x + 0.5*h*k1, u); k3 = f(x + 0.5*h*k2, u); k4 = f(x + h*k3, u)
        return x + h / 6 * (k1 + 2*k2 + 2*k3 + k4)
    n = len(B)
    P = np.column_stack([rk4(e, 0.0) for e in np.eye(n)]); Q = rk4(np.zeros(n), 1.0)
    powers = [np.eye(n)]; sums = [np.zeros(n)]
    for r in range(sub):
        sums.append(P @ sums[-1] + Q); powers.append(P @ powers[-1])
    # held inputs u[k] from t = kT; u(t - theta) read from the history (0 before the start)
    us = []
    def held_index(t):
        return math.floor((t - theta) / T + 1e-9)
    def held(t):
        k = held_index(t)
        return us[k] if 0 <= k < len(us) else 0.0
    x = np.zeros(n); I = 0.0; Dk = 0.0; e_prev = 0.0; kie_prev = 0.0; r = 1.0
    errors = []
    for k in range(steps):
        t = k * T
        y = C @ x + D * held(t - 1e-12)
        e = r - y
        I = I + wc * ki * e + wp * kie_prev
        Dk = p * Dk + g * (e - e_prev)
        us.append(kp * e + I + Dk)
        e_prev = e; kie_prev = ki * e
        errors.append(abs(e))
        # the substeps, each under the input in force at its middle (h divides T and the fractional delay), in runs of one input
        indices = [held_index(t + j * h + 0.5 * h) for j in range(sub)]
        j = 0
        while j < sub:
            run = 1
            while j + run < sub and indices[j + run] == indices[j]:
                run += 1
            u = us[indices[j]] if 0 <= indices[j] < len(us) else 0.0
            x = powers[run] @ x + sums[run] * u
            j += run
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

  it('on 320 seeded random sampled loops — general ones, slow integral poles within 1e-4 of z = 1, |L(e^(jπ))| > 1, and loops placed within 1e-6…1e-4 of the stability boundary — the verdict and largest |z| equal numpy eigenvalues of the closed-loop state matrix built independently in python, and the Nyquist count agrees', () => {
    const general = randomSampledLoops(20261201, 160, 6, [0.1, 3]);
    // Integral times of 50–5,000 s at 5–100 ms samples: the slow closed-loop pole sits 1e-6…1e-3 inside z = 1,
    // where a root test on the characteristic polynomial loses it (the integrators' coefficients cancel).
    const slowIntegral = randomSampledLoops(20261203, 60, 3, [50, 5000]);
    // Tustin with a fast derivative filter: the controller's gain near the Nyquist frequency exceeds 1.
    const fastDerivative = randomSampledLoops(20261204, 50, 3, [0.3, 3]).map((c) => ({
      ...c,
      method: 'tustin' as const,
      N: 200,
      kd: c.kd === 0 ? c.kp * 0.1 : c.kd,
    }));
    const nearBoundarySeeds = randomSampledLoops(20261205, 72, 2, [0.3, 3]);
    // Python places each of these at |z| = 1 ± δ (δ log-uniform in 1e-6…1e-4) by scaling the whole controller.
    const placed = runPython<Array<{ factor: number; largest: number } | null>>(
      `${PYTHON_SAMPLED_LOOP}
for i, c in enumerate(data):
    delta = 10 ** (-6 + 2 * ((i * 0.6180339887) % 1)); side = 1 if i % 2 == 0 else -1
    if largest_pole(c) >= 1: out.append(None); continue
    low, high = 1.0, None
    for k in range(14):
        g = 2.0 ** (k + 1)
        if largest_pole(c, 0.0, g) >= 1: high = g; break
        low = g
    if high is None: out.append(None); continue
    target = 1 + side * delta
    for _ in range(52):
        mid = 0.5 * (low + high)
        if largest_pole(c, 0.0, mid) < target: low = mid
        else: high = mid
    g = low if side < 0 else high
    out.append({'factor': g, 'largest': largest_pole(c, 0.0, g)})
print(json.dumps(out))
`,
      nearBoundarySeeds,
    );
    const nearBoundary = nearBoundarySeeds.flatMap((c, i) => {
      const p = placed[i];
      return p === null ? [] : [{ ...c, kp: c.kp * p.factor, ki: c.ki * p.factor, kd: c.kd * p.factor }];
    });
    const cases = [...general, ...slowIntegral, ...fastDerivative, ...nearBoundary];
    const reference = runPython<Array<{ largest: number; nyquistGain: number }>>(
      `${PYTHON_SAMPLED_LOOP}
for c in data:
    pn, pd, ell = zoh_plant(c)
    cn, cd, _, _, _ = discrete_pid(c)
    L = np.polyval(cn, -1.0) / np.polyval(cd, -1.0) * np.polyval(pn, -1.0) / np.polyval(pd, -1.0)
    out.append({'largest': largest_pole(c), 'nyquistGain': float(abs(L))})
print(json.dumps(out))
`,
      cases,
    );
    let stable = 0;
    let withinOneE4 = 0;
    let nyquistAboveOne = 0;
    cases.forEach((c, index) => {
      const ours = analyseLoop(descriptionOf({ ...c, h: 0, duration: 0 }));
      const { largest, nyquistGain } = reference[index];
      const expected = largest < 1 ? 'stable' : 'unstable';
      if (largest < 1) stable++;
      if (Math.abs(largest - 1) < 1e-4) withinOneE4++;
      if (nyquistGain > 1) nyquistAboveOne++;
      // Source: numpy.linalg.eigvals of the closed-loop state matrix (python, scipy.linalg.expm zero-order hold).
      const pole = ours.analysis!.sampledDataDecidingPole!;
      expect({ index, largest: ours.analysis!.sampledDataLargestPoleMagnitude! }).toEqual({ index, largest: expect.closeTo(largest, 8) as number });
      expect({ index, verdict: ours.verdict }).toEqual({ index, verdict: expected });
      // The rounding bound is far below the distance to the circle (≥ 1e-6 here).
      expect(pole.errorBound).toBeLessThan(Math.abs(largest - 1) / 10);
      // The independent Nyquist count on the exact pulse frequency response agrees.
      expect({ index, agrees: ours.analysis!.crossCheckAgrees }).toEqual({ index, agrees: true });
    });
    expect(nearBoundary.length).toBeGreaterThanOrEqual(36);
    expect(withinOneE4).toBeGreaterThanOrEqual(80);
    expect(nyquistAboveOne).toBeGreaterThanOrEqual(10);
    // Both kinds are well represented.
    expect(stable).toBeGreaterThan(100);
    expect(cases.length - stable).toBeGreaterThan(60);
  });

  it('the delay margin of a sampled loop equals the smallest added delay that destabilises the exact sampled loop (a scan and bisection in python), within 1 %, and never exceeds it', () => {
    const candidates = [
      ...randomSampledLoops(20261206, 160, 3, [0.3, 3]),
      ...randomSampledLoops(20261207, 80, 3, [0.3, 3]).map((c) => ({ ...c, method: 'tustin' as const, N: 200, kd: c.kd === 0 ? c.kp * 0.1 : c.kd })),
    ];
    const analysed = candidates.map((c) => ({ c, ours: analyseLoop(descriptionOf({ ...c, h: 0, duration: 0 })) }));
    // Margins up to 50 samples keep the reference's closed-loop matrices small (one state per sample of delay).
    const stableOnes = analysed.filter(({ c, ours }) => ours.verdict === 'stable' && ours.delayMargin_s !== null && ours.delayMargin_s <= 50 * c.Ts);
    const exact = runPython<Array<number | null>>(
      `${PYTHON_SAMPLED_LOOP}
for c in data:
    T = c['Ts']; hi = c['scanTo']
    points = sorted(set([k * T / 8 for k in range(1, 17) if k * T / 8 < hi] + list(np.linspace(0, hi, 41)[1:])))
    previous = 0.0; found = None
    for d in points:
        if largest_pole(c, d) >= 1:
            low, high = previous, d
            for _ in range(30):
                mid = 0.5 * (low + high)
                if largest_pole(c, mid) < 1: low = mid
                else: high = mid
            found = low; break
        previous = d
    out.append(found)
print(json.dumps(out))
`,
      stableOnes.map(({ c, ours }) => ({ ...c, scanTo: ours.delayMargin_s! * 1.1 + 2 * c.Ts })),
    );
    let shortened = 0;
    stableOnes.forEach(({ ours }, index) => {
      const reference = exact[index];
      // Source: python scan of the exact closed loop with added delay (numpy eigenvalues), refined by bisection.
      expect({ index, found: reference !== null }).toEqual({ index, found: true });
      expect({ index, ratio: ours.delayMargin_s! / reference! }).toEqual({ index, ratio: expect.closeTo(1, 2) as number });
      expect(ours.delayMargin_s!).toBeLessThanOrEqual(reference! * 1.001 + 1e-12);
      if (ours.analysis!.delayMarginNote!.includes('shortened')) shortened++;
    });
    expect(stableOnes.length).toBeGreaterThanOrEqual(60);
    // Some loops are destabilised by less delay than their gain crossovers suggest (|L| ≥ 1 near π/Ts).
    expect(shortened).toBeGreaterThan(0);
  });

  it('a delay margin the crossovers overstate: crossovers promise 1.8 s, the exact sampled loop is unstable with about 1.1 samples added and stable again at 2', () => {
    // Source: python (numpy eigenvalues of the closed loop with added delay). A fast lag 1/(0.05 s + 1) behind half a
    // sample of delay, a Tustin PID with a fast derivative filter (N = 100) at 10 ms: the fraction of a sample moves the
    // zero-order-hold equivalent's sampling zero towards z = −1, where the derivative's gain is high.
    const c: SampledCase = { num: [1], den: [0.05, 1], theta: 0.005, Ts: 0.01, kp: 0.5, ki: 1, kd: 0.025, N: 100, method: 'tustin' };
    const ours = analyseLoop(descriptionOf({ ...c, h: 0, duration: 0 }));
    const reference = runPython<{ nominal: number; exact: number; twoSamples: number }>(
      `${PYTHON_SAMPLED_LOOP}
c = data
low, high = 0.0, 0.0125
for _ in range(40):
    mid = 0.5 * (low + high)
    if largest_pole(c, mid) < 1: low = mid
    else: high = mid
print(json.dumps({'nominal': largest_pole(c), 'exact': low, 'twoSamples': largest_pole(c, 0.02)}))
`,
      c,
    );
    expect(reference.nominal).toBeLessThan(1);
    expect(reference.twoSamples).toBeLessThan(1);
    expect(ours.verdict).toBe('stable');
    const crossovers = ours.analysis!.gainCrossovers.map(
      (g) => ((g.phaseMargin_deg > 0 ? g.phaseMargin_deg : g.phaseMargin_deg + 360) * Math.PI) / 180 / g.frequency_radps,
    );
    expect(Math.min(...crossovers)).toBeGreaterThan(1);
    expect(ours.delayMargin_s! / reference.exact).toBeCloseTo(1, 2);
    expect(ours.delayMargin_s!).toBeLessThanOrEqual(reference.exact * 1.001);
    expect(ours.analysis!.delayMarginNote).toContain('shortened');
  });
});
