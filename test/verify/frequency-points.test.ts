/**
 * The frequency response the report plots (Bode, Nyquist) is the loop's own L: checked against an
 * independent python computation of the sampled loop C(e^(jωTs))·G_zoh(e^(jωTs)) (scipy's zero-order-hold
 * equivalent with the delay by the modified z-transform, C(z) by substitution — sampled-loop-cases.ts) and,
 * for a continuous loop, against scipy.signal.freqs × e^(−jωθ).
 */
import { describe, expect, it } from 'vitest';
import { runPython } from '../helpers/python.js';
import { PYTHON_SAMPLED_LOOP, randomSampledLoops } from './sampled-loop-cases.js';
import { openLoopOf, type LoopDescription } from '../../src/verify/index.js';
import { loopFrequencyResponse } from '../../src/verify/frequency-points.js';

const SAMPLED_REFERENCE = `${PYTHON_SAMPLED_LOOP}
for c in data:
    T = c['Ts']
    pn, pd, ell = zoh_plant(c)
    cn, cd, sn, sd, f = discrete_pid(c)
    z = np.exp(1j * np.array(c['w']) * T)
    # In factors, so that near z = 1 the integrators' (z − 1) are exact: det(zI − Φ) = Π(z − e^(pT)).
    a = np.polyval(sn, z) * (np.polyval(f, z) if c['kd'] != 0 else 1)
    for p in np.exp(np.roots(c['den']) * T): a = a * (z - p)
    v = np.polyval(cn, z) * np.polyval(pn, z) / (a * z ** (ell + 1))
    out.append([[float(x.real), float(x.imag)] for x in v])
print(json.dumps(out))
`;

const CONTINUOUS_REFERENCE = `
import json, sys
import numpy as np
from scipy import signal
out = []
for c in json.load(sys.stdin):
    w = np.array(c['w'])
    _, h = signal.freqs(c['num'], c['den'], worN=w)
    v = h * np.exp(-1j * w * c['theta'])
    out.append([[float(x.real), float(x.imag)] for x in v])
print(json.dumps(out))
`;

describe('loopFrequencyResponse: L at chosen frequencies, as the margins see it', () => {
  it('on random sampled loops (zero-order hold, fractional delay, discrete PID) equals scipy within 1e-6 relative from 0.01 rad/s up, and |L| and the phase agree with the value', () => {
    // From 0.01 rad/s up: below it, on loops with three integrators (|L| past 1e8), this evaluator and the
    // reference both lose digits near z = 1 (1.7e-5 relative at 1e-3 rad/s against a 50-digit mpmath evaluation).
    const cases = randomSampledLoops(20261209, 30, 4, [0.3, 3]).map((c) => {
      const nyquist = Math.PI / c.Ts;
      return { ...c, w: [0.01, 0.1, 0.5, 1, 3, 10, 0.5 * nyquist, 0.9 * nyquist, nyquist].filter((w) => w <= nyquist) };
    });
    const reference = runPython<[number, number][][]>(SAMPLED_REFERENCE, cases);
    cases.forEach((c, k) => {
      const description: LoopDescription = {
        plant: { numerator: c.num, denominator: c.den, delay_s: c.theta },
        pid: { kp: c.kp, ki: c.ki, kd: c.kd, derivativeFilter: c.N },
        sampleTime_s: c.Ts,
        discretisation: c.method,
      };
      const points = loopFrequencyResponse(openLoopOf(description), c.w);
      points.forEach((point, i) => {
        const [re, im] = reference[k][i];
        const size = Math.hypot(re, im);
        expect(Math.hypot(point.re - re, point.im - im)).toBeLessThanOrEqual(Math.max(1e-6 * size, 1e-14));
        expect(Math.abs(point.magnitude - Math.hypot(point.re, point.im))).toBeLessThanOrEqual(1e-12 * point.magnitude);
        // The continuous phase is the value's angle up to whole turns.
        const turns = (point.phase_deg - (Math.atan2(point.im, point.re) * 180) / Math.PI) / 360;
        expect(Math.abs(turns - Math.round(turns))).toBeLessThan(1e-9);
      });
    });
  });

  it('on a continuous loop with delay equals scipy.signal.freqs × e^(−jωθ), and its phase keeps falling past −180° without wrapping', () => {
    // L = 2·e^(−0.3s)/(s(0.5s + 1)): the phase is −90° − atan(0.5ω) − 0.3ω·180/π, continuous.
    const c = { num: [2], den: [0.5, 1, 0], theta: 0.3, w: [0.05, 0.5, 2, 5, 20, 60] };
    const [reference] = runPython<[number, number][][]>(CONTINUOUS_REFERENCE, [c]);
    const points = loopFrequencyResponse({ numerator: c.num, denominator: c.den, delay_s: c.theta }, c.w);
    points.forEach((point, i) => {
      const [re, im] = reference[i];
      expect(Math.hypot(point.re - re, point.im - im)).toBeLessThanOrEqual(1e-12 * Math.hypot(re, im));
      // Source: the phase of an integrator, a first-order lag and a delay (textbook sum of angles).
      const expected = -90 - (Math.atan(0.5 * c.w[i]) * 180) / Math.PI - (0.3 * c.w[i] * 180) / Math.PI;
      expect(point.phase_deg).toBeCloseTo(expected, 9);
    });
  });
});
