import { describe, expect, it } from 'vitest';
import { makeRandom } from '../../src/core/random.js';
import { multiplyPolynomials } from '../../src/lti/polynomial.js';
import { controllableCanonicalForm } from '../../src/lti/state-space.js';
import { inputResponse, stepResponse } from '../../src/lti/time-response.js';
import { transferFunction } from '../../src/lti/transfer-function.js';
import type { TransferFunction } from '../../src/lti/types.js';
import { runPythonSingleThread as runPython } from './python-single-thread.js';

/** A seeded stable system: real poles and complex pairs in the left half-plane, proper numerator. */
function randomStableSystem(random: ReturnType<typeof makeRandom>, degree: number, delay_s: number): TransferFunction {
  let denominator = [1];
  let remaining = degree;
  while (remaining > 0) {
    if (remaining >= 2 && random.uniform() < 0.5) {
      const re = -(0.2 + 5 * random.uniform());
      const im = 0.5 + 8 * random.uniform();
      denominator = multiplyPolynomials(denominator, [1, -2 * re, re * re + im * im]);
      remaining -= 2;
    } else {
      denominator = multiplyPolynomials(denominator, [1, 0.1 + 10 * random.uniform()]);
      remaining -= 1;
    }
  }
  const numeratorDegree = Math.floor(random.uniform() * (degree + 1));
  const numerator = Array.from({ length: numeratorDegree + 1 }, () => random.normal() * 4);
  return transferFunction(numerator, denominator, delay_s);
}

describe('controllableCanonicalForm(g)', () => {
  it('is the same realisation as scipy.signal.tf2ss', () => {
    // Source: scipy.signal.tf2ss (controller canonical form).
    const systems = [transferFunction([2, 3, 1], [4, 2, 8, 5]), transferFunction([1, 2, 3], [1, 4, 5]), transferFunction([7], [2, 1])];
    const reference = runPython<{ A: number[][]; B: number[][]; C: number[][]; D: number[][] }[]>(
      `
import sys, json
from scipy import signal
out = []
for s in json.load(sys.stdin):
    A, B, C, D = signal.tf2ss(s["numerator"], s["denominator"])
    out.append({"A": A.tolist(), "B": B.tolist(), "C": C.tolist(), "D": D.tolist()})
print(json.dumps(out))
`,
      systems,
    );
    systems.forEach((g, k) => {
      const model = controllableCanonicalForm(g);
      model.stateMatrix.forEach((row, i) => row.forEach((v, j) => expect(v).toBeCloseTo(reference[k].A[i][j], 14)));
      model.inputVector.forEach((v, i) => expect(v).toBeCloseTo(reference[k].B[i][0], 14));
      model.outputVector.forEach((v, i) => expect(v).toBeCloseTo(reference[k].C[0][i], 14));
      expect(model.feedthrough).toBeCloseTo(reference[k].D[0][0], 14);
    });
  });

  it('refuses an improper transfer function with lti.improperTransferFunction', () => {
    expect(() => controllableCanonicalForm(transferFunction([1, 0, 0], [1, 1]))).toThrow(/proper/);
  });
});

describe('stepResponse(g, t)', () => {
  it('gives K(1 − e^(−(t−θ)/τ)) after the delay for a first-order lag, including a fractional-sample delay', () => {
    // Source: textbook FOPDT step response (e.g. Seborg et al., Process Dynamics and Control, ch. 6).
    const K = -1.7;
    const tau = 0.35;
    const theta = 0.123; // 12.3 samples of 0.01 s
    const time = Float64Array.from({ length: 301 }, (_, k) => k * 0.01);
    const { output } = stepResponse(transferFunction([K], [tau, 1], theta), time);
    for (let k = 0; k < time.length; k++) {
      const expected = time[k] < theta ? 0 : K * (1 - Math.exp(-(time[k] - theta) / tau));
      expect(Math.abs(output[k] - expected)).toBeLessThan(1e-12);
    }
  });

  it('agrees with the exact step response from scipy.linalg.expm on 40 seeded random systems with delay (1e-9 relative to the peak)', () => {
    // Source: y(t) = C·[expm([[A, B], [0, 0]]·(t − θ))]_(0:n, n) + D for t ≥ θ, scipy.signal.tf2ss + scipy.linalg.expm.
    const random = makeRandom(808);
    const time = Float64Array.from({ length: 200 }, (_, k) => 0.5 + k * 0.025);
    const systems = Array.from({ length: 40 }, (_, k) => randomStableSystem(random, 1 + (k % 6), k % 4 === 0 ? 0 : 0.6 * random.uniform()));
    const reference = runPython<number[][]>(
      `
import sys, json, numpy as np
from scipy import signal, linalg
data = json.load(sys.stdin)
t = np.array(data["t"])
out = []
for s in data["systems"]:
    A, B, C, D = signal.tf2ss(s["numerator"], s["denominator"])
    n = A.shape[0]
    tau = t - t[0] - s["delay_s"]
    M = np.zeros((len(t), n + 1, n + 1))
    M[:, :n, :n] = A[None, :, :] * tau[:, None, None]
    M[:, :n, n] = B[None, :, 0] * tau[:, None]
    x = linalg.expm(M)[:, :n, n]  # batched over the time points
    y = np.where(tau < 0, 0.0, x @ C[0] + D[0, 0])
    out.append(y.tolist())
print(json.dumps(out))
`,
      { t: Array.from(time), systems },
    );
    systems.forEach((g, k) => {
      const { output } = stepResponse(g, time);
      const peak = Math.max(...reference[k].map(Math.abs));
      for (let i = 0; i < time.length; i++) {
        // at the exact switching instant both sides may legitimately show the feed-through; compare away from it
        if (Math.abs(time[i] - time[0] - g.delay_s) < 1e-9) continue;
        expect(Math.abs(output[i] - reference[k][i])).toBeLessThan(1e-9 * peak);
      }
    });
  });
});

describe('inputResponse(g, t, u)', () => {
  it('agrees with scipy.signal.lsim (zero-order hold) for random inputs and a fractional-sample delay (1e-9 relative)', () => {
    // Source: scipy.signal.lsim(interp=False) on a grid 10× finer where the delay is a whole number of fine
    // samples: the held input is upsampled, shifted by the delay and simulated; every 10th sample compared.
    const random = makeRandom(77);
    const step = 0.02;
    const count = 200;
    const time = Float64Array.from({ length: count }, (_, k) => k * step);
    const cases = Array.from({ length: 12 }, (_, k) => {
      const delaySamplesFine = Math.floor(random.uniform() * 60); // 0..59 fine samples (0..0.118 s)
      const g = randomStableSystem(random, 1 + (k % 5), (delaySamplesFine * step) / 10);
      const u = Array.from({ length: count }, () => (random.uniform() < 0.8 ? random.normal() : 0));
      return { g, u, delaySamplesFine };
    });
    const reference = runPython<number[][]>(
      `
import sys, json, numpy as np
from scipy import signal
data = json.load(sys.stdin)
fine = 10
out = []
for c in data["cases"]:
    u = np.repeat(np.array(c["u"]), fine)
    shift = c["delaySamplesFine"]
    u = np.concatenate([np.zeros(shift), u])[: len(u)]
    t = np.arange(len(u)) * data["step"] / fine
    _, y, _ = signal.lsim((c["g"]["numerator"], c["g"]["denominator"]), u, t, interp=False)
    out.append(y[::fine].tolist())
print(json.dumps(out))
`,
      { step, cases },
    );
    cases.forEach(({ g, u }, k) => {
      const { output } = inputResponse(g, time, u);
      const peak = Math.max(...reference[k].map(Math.abs));
      for (let i = 0; i < count; i++) expect(Math.abs(output[i] - reference[k][i])).toBeLessThan(1e-9 * peak);
    });
  });

  it('is linear and time-invariant: delaying by whole samples shifts the output, doubling the input doubles it', () => {
    const g = transferFunction([1, 3], [1, 2, 10]);
    const time = Float64Array.from({ length: 100 }, (_, k) => k * 0.05);
    const u = Float64Array.from({ length: 100 }, (_, k) => Math.sin(k * 0.3));
    const base = inputResponse(g, time, u).output;
    const delayed = inputResponse(transferFunction([1, 3], [1, 2, 10], 0.25), time, u).output;
    for (let k = 5; k < 100; k++) expect(delayed[k]).toBeCloseTo(base[k - 5], 12);
    const doubled = inputResponse(
      g,
      time,
      u.map((x) => 2 * x),
    ).output;
    for (let k = 0; k < 100; k++) expect(doubled[k]).toBeCloseTo(2 * base[k], 12);
  });

  it('refuses a grid that does not increase and an input of the wrong length', () => {
    const g = transferFunction([1], [1, 1]);
    expect(() => stepResponse(g, new Float64Array([0, 0.1, 0.1]))).toThrow(/strictly increasing/);
    expect(() => inputResponse(g, new Float64Array([0, 0.1]), [1])).toThrow(/one input value per time/);
  });
});
