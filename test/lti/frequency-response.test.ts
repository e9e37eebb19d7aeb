import { describe, expect, it } from 'vitest';
import { makeRandom } from '../../src/core/random.js';
import { frequencyResponse, logarithmicFrequencies, responseMagnitude } from '../../src/lti/frequency-response.js';
import { evaluateTransferFunction, transferFunction } from '../../src/lti/transfer-function.js';
import type { TransferFunction } from '../../src/lti/types.js';
import { runPythonSingleThread as runPython } from './python-single-thread.js';

describe('frequencyResponse(g, ω)', () => {
  it('agrees with scipy.signal.freqs times e^(−jωθ) to 1e-9 relative on 250 seeded random systems with delay', () => {
    // Source: scipy.signal.freqs (polynomial evaluation at s = jω), delay factor numpy.exp(-1j*w*theta).
    const random = makeRandom(4242);
    const systems: TransferFunction[] = [];
    for (let k = 0; k < 250; k++) {
      const denominatorDegree = 1 + (k % 8);
      const numeratorDegree = Math.floor(random.uniform() * (denominatorDegree + 1));
      const denominator = Array.from({ length: denominatorDegree + 1 }, () => 0.1 + 5 * random.uniform());
      const numerator = Array.from({ length: numeratorDegree + 1 }, () => random.normal() * 3);
      systems.push(transferFunction(numerator, denominator, random.uniform() < 0.2 ? 0 : 0.5 * random.uniform()));
    }
    const grid = logarithmicFrequencies(1e-2, 1e3, 60);
    const reference = runPython<{ re: number[]; im: number[] }[]>(
      `
import sys, json, numpy as np
from scipy import signal
data = json.load(sys.stdin)
w = np.array(data["w"])
out = []
for sys_ in data["systems"]:
    _, h = signal.freqs(sys_["numerator"], sys_["denominator"], worN=w)
    h = h * np.exp(-1j * w * sys_["delay_s"])
    out.append({"re": h.real.tolist(), "im": h.imag.tolist()})
print(json.dumps(out))
`,
      { w: Array.from(grid), systems },
    );
    let worst = 0;
    systems.forEach((g, k) => {
      const ours = frequencyResponse(g, grid);
      for (let i = 0; i < grid.length; i++) {
        const dRe = ours.real[i] - reference[k].re[i];
        const dIm = ours.imaginary[i] - reference[k].im[i];
        worst = Math.max(worst, Math.hypot(dRe, dIm) / Math.hypot(reference[k].re[i], reference[k].im[i]));
      }
    });
    expect(worst).toBeLessThan(1e-9);
  });

  it('matches evaluateTransferFunction point by point and copies the grid', () => {
    const g = transferFunction([1, 2], [1, 0.4, 9, 0], 0.08);
    const grid = new Float64Array([0.1, 1, 2.9, 3, 50]);
    const response = frequencyResponse(g, grid);
    grid[0] = 99;
    expect(response.frequency_radps[0]).toBe(0.1);
    for (let i = 0; i < grid.length; i++) {
      const single = evaluateTransferFunction(g, response.frequency_radps[i]);
      expect(response.real[i]).toBeCloseTo(single.re, 12);
      expect(response.imaginary[i]).toBeCloseTo(single.im, 12);
    }
    // Source: a pure delay has unit magnitude at every frequency (textbook).
    expect(Array.from(responseMagnitude(frequencyResponse(transferFunction([1], [1], 0.3), grid))).every((m) => Math.abs(m - 1) < 1e-15)).toBe(true);
  });
});

describe('logarithmicFrequencies(low, high, count)', () => {
  it('includes both ends exactly with a constant ratio between neighbours', () => {
    const grid = logarithmicFrequencies(0.01, 100, 5);
    expect(grid[0]).toBe(0.01);
    expect(grid[4]).toBe(100);
    expect(grid[2]).toBeCloseTo(1, 14);
    for (let i = 1; i < 5; i++) expect(grid[i] / grid[i - 1]).toBeCloseTo(10, 10);
  });

  it('refuses low ≤ 0, high ≤ low and count < 2', () => {
    expect(() => logarithmicFrequencies(0, 1, 10)).toThrow(/expected 0 < low < high/);
    expect(() => logarithmicFrequencies(2, 1, 10)).toThrow(/expected 0 < low < high/);
    expect(() => logarithmicFrequencies(1, 2, 1)).toThrow(/count ≥ 2/);
  });
});
