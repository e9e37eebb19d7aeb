import { describe, expect, it } from 'vitest';
import { padeApproximant, padeOrderFor, padePhaseError_rad, replaceDelayWithPade } from '../../src/lti/pade.js';
import { transferFunction, transferFunctionPoles, unityFeedback } from '../../src/lti/transfer-function.js';
import { runPythonSingleThread as runPython } from './python-single-thread.js';

describe('padeApproximant(θ, n)', () => {
  it('matches the textbook Padé table for orders 1–3', () => {
    const theta = 0.3;
    // Source: Padé table of e^(−θs), e.g. Franklin, Powell & Emami-Naeini, Feedback Control of Dynamic Systems, §5.6:
    // order 1 (1 − θs/2)/(1 + θs/2); order 2 (1 − θs/2 + θ²s²/12)/(1 + θs/2 + θ²s²/12);
    // order 3 (1 − θs/2 + θ²s²/10 − θ³s³/120)/(1 + θs/2 + θ²s²/10 + θ³s³/120).
    const table = [
      { order: 1, numerator: [-theta / 2, 1], denominator: [theta / 2, 1] },
      { order: 2, numerator: [theta ** 2 / 12, -theta / 2, 1], denominator: [theta ** 2 / 12, theta / 2, 1] },
      { order: 3, numerator: [-(theta ** 3) / 120, theta ** 2 / 10, -theta / 2, 1], denominator: [theta ** 3 / 120, theta ** 2 / 10, theta / 2, 1] },
    ];
    for (const row of table) {
      const pade = padeApproximant(theta, row.order);
      row.numerator.forEach((c, i) => expect(pade.numerator[i]).toBeCloseTo(c, 15));
      row.denominator.forEach((c, i) => expect(pade.denominator[i]).toBeCloseTo(c, 15));
    }
  });

  it('matches scipy.interpolate.pade on the Taylor series of e^(−θs) for orders 4–10', () => {
    // Source: scipy.interpolate.pade(taylor coefficients of exp(−θs), n) — an independent construction
    // (a linear solve; scipy itself warns it is ill-conditioned at order 10, relative error ~1e-7 there, hence 1e-6).
    const theta = 0.7;
    const orders = [4, 5, 6, 7, 8, 9, 10];
    const reference = runPython<{ p: number[]; q: number[] }[]>(
      `
import sys, json, math
from scipy.interpolate import pade
data = json.load(sys.stdin)
out = []
for n in data["orders"]:
    taylor = [(-data["theta"]) ** k / math.factorial(k) for k in range(2 * n + 1)]
    p, q = pade(taylor, n)
    out.append({"p": [float(c) for c in p.coeffs], "q": [float(c) for c in q.coeffs]})
print(json.dumps(out))
`,
      { theta, orders },
    );
    orders.forEach((order, k) => {
      const ours = padeApproximant(theta, order);
      const q0 = reference[k].q[reference[k].q.length - 1];
      expect(ours.denominator).toHaveLength(order + 1);
      ours.numerator.forEach((c, i) => expect(Math.abs(c - reference[k].p[i] / q0)).toBeLessThan(1e-6 * Math.abs(c)));
      ours.denominator.forEach((c, i) => expect(Math.abs(c - reference[k].q[i] / q0)).toBeLessThan(1e-6 * Math.abs(c)));
    });
  });

  it('agrees with the Taylor series of e^(−θs) through order 2n (definition of the [n/n] approximant), orders 1–14', () => {
    // Source: definition of a Padé approximant: den(s)·e^(−θs) − num(s) = O(s^(2n+1)).
    const theta = 0.45;
    for (let order = 1; order <= 14; order++) {
      const { numerator, denominator } = padeApproximant(theta, order);
      const num = [...numerator].reverse(); // ascending powers
      const den = [...denominator].reverse();
      for (let power = 0; power <= 2 * order + 1; power++) {
        // coefficient of s^power in den(s)·e^(−θs): Σ_j den_j (−θ)^(power−j)/(power−j)!
        let product = 0;
        let term = 1; // (−θ)^m/m! for m = power − j, built from m = 0 upward
        const terms: number[] = [];
        for (let m = 0; m <= power; m++) {
          terms.push(term);
          term *= -theta / (m + 1);
        }
        for (let j = 0; j <= Math.min(power, order); j++) product += den[j] * terms[power - j];
        const residual = product - (power <= order ? num[power] : 0);
        if (power <= 2 * order) expect(Math.abs(residual)).toBeLessThan(1e-15 * Math.max(1, Math.abs(product)) + 1e-17);
        else expect(residual).not.toBe(0); // the first unmatched term: order 2n is the most a [n/n] approximant matches
      }
    }
  });

  it('is 1 for a zero delay and refuses a negative delay or a fractional order', () => {
    expect(padeApproximant(0, 3)).toEqual({ numerator: [1], denominator: [1] });
    expect(() => padeApproximant(-1, 2)).toThrow(/delay ≥ 0/);
    expect(() => padeApproximant(1, 1.5)).toThrow(/integer ≥ 0/);
  });
});

describe('replaceDelayWithPade and the stability limit it implies', () => {
  it('first order puts the limit of k·e^(−θs)/s at kθ = 2, high order near the exact π/2', () => {
    // Source: docs/domain.md §5b and the textbook result: k e^(−θs)/s under unity feedback is stable for kθ < π/2
    // (phase −90° − ωθ reaches −180° at ω = π/(2θ), where |L| = k/ω = 1 gives k = π/(2θ)).
    // With order 1: closed loop θ/2 s² + (1 − kθ/2) s + k, stable for kθ < 2 (Routh).
    const theta = 0.5;
    const stable = (k: number, order: number): boolean =>
      transferFunctionPoles(unityFeedback(replaceDelayWithPade(transferFunction([k], [1, 0], theta), order))).every((p) => p.re < 0);
    expect(stable(1.99 / theta, 1)).toBe(true);
    expect(stable(2.01 / theta, 1)).toBe(false);
    expect(stable((0.995 * Math.PI) / 2 / theta, 8)).toBe(true);
    expect(stable((1.005 * Math.PI) / 2 / theta, 8)).toBe(false);
    expect(replaceDelayWithPade(transferFunction([1], [1, 1], theta), 3).delay_s).toBe(0);
  });
});

describe('padeOrderFor(θ, ω_max)', () => {
  it('picks the lowest order with phase error ≤ 1° over the band, and that order is enough while one less is not', () => {
    for (const x of [0.3, 1, 2.5, 5, 10, 20]) {
      const order = padeOrderFor(0.1, x / 0.1);
      expect(padePhaseError_rad(order, x)).toBeLessThanOrEqual(Math.PI / 180);
      if (order > 1) expect(padePhaseError_rad(order - 1, x)).toBeGreaterThan(Math.PI / 180);
    }
    expect(padeOrderFor(0, 100)).toBe(0);
    expect(padeOrderFor(0.2, 2)).toBe(1); // ω·θ = 0.4: first order error 2·atan(0.2) vs 0.4 → 0.38°
  });

  it('first-order phase error equals x − 2·atan(x/2)', () => {
    // Source: closed form of the first-order approximant's phase, −2·atan(ωθ/2) (all-pass).
    for (const x of [0.1, 0.5, 1, 3]) expect(padePhaseError_rad(1, x)).toBeCloseTo(x - 2 * Math.atan(x / 2), 12);
  });

  it('refuses a band that needs more than the maximum order, with lti.padeOrderTooHigh', () => {
    expect(() => padeOrderFor(1, 100)).toThrow(/exact delay/);
  });
});
