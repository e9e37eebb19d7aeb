import { describe, expect, it } from 'vitest';
import { derivativeFilterTime_s, pidTransferFunction } from '../../src/controller/pid.js';
import { isSpeedbandError } from '../../src/core/errors.js';
import { frequencyResponse, logarithmicFrequencies } from '../../src/lti/frequency-response.js';
import { transferFunctionPoles } from '../../src/lti/transfer-function.js';
import { runPythonSingleThread as runPython } from '../lti/python-single-thread.js';

describe('derivativeFilterTime_s(gains, N)', () => {
  it('is Td/N with Td = kd/kp, not kd/N', () => {
    // Source: docs/domain.md §5b; Åström & Hägglund (2006) §3.3: Tf = Td/N. kp = 2, kd = 1 → Td = 0.5 s, N = 10 → 0.05 s.
    expect(derivativeFilterTime_s({ kp: 2, ki: 1, kd: 1 }, 10)).toBeCloseTo(0.05, 15);
    expect(derivativeFilterTime_s({ kp: -2, ki: -1, kd: -1 }, 10)).toBeCloseTo(0.05, 15);
    expect(derivativeFilterTime_s({ kp: 2, ki: 1, kd: 1 }, Number.POSITIVE_INFINITY)).toBe(0);
    expect(derivativeFilterTime_s({ kp: 2, ki: 1, kd: 0 }, 10)).toBe(0);
  });

  it('falls back to √(kd/ki)/N when kp = 0 and refuses a pure derivative, N ≤ 0 and mixed signs', () => {
    expect(derivativeFilterTime_s({ kp: 0, ki: 4, kd: 1 }, 5)).toBeCloseTo(0.1, 15);
    const code = (work: () => unknown): string | undefined => {
      try {
        work();
      } catch (error) {
        return isSpeedbandError(error) ? error.code : 'other';
      }
      return undefined;
    };
    expect(code(() => derivativeFilterTime_s({ kp: 0, ki: 0, kd: 1 }, 10))).toBe('controller.derivativeFilterUndefined');
    expect(code(() => derivativeFilterTime_s({ kp: 1, ki: 0, kd: 1 }, 0))).toBe('controller.invalidSettings');
    expect(code(() => derivativeFilterTime_s({ kp: 1, ki: 0, kd: -1 }, 10))).toBe('controller.mixedSigns');
  });
});

describe('pidTransferFunction(gains, N)', () => {
  it('equals kp + ki/(jω) + kd·jω/(1 + Tf·jω) evaluated by numpy, for filtered, unfiltered, PI, PD and negative controllers', () => {
    // Source: the parallel PID with filtered derivative (Åström & Hägglund 2006, eq. 3.15), evaluated term by term in numpy.
    const cases = [
      { gains: { kp: 2, ki: 1.5, kd: 0.4 }, N: 10 },
      { gains: { kp: 2, ki: 1.5, kd: 0.4 }, N: Number.POSITIVE_INFINITY },
      { gains: { kp: 0.7, ki: 0.2, kd: 0 }, N: 10 },
      { gains: { kp: 0.7, ki: 0, kd: 0.05 }, N: 8 },
      { gains: { kp: -1.3, ki: -0.4, kd: -0.2 }, N: 12 },
    ];
    const grid = logarithmicFrequencies(1e-2, 1e3, 50);
    const reference = runPython<{ re: number[]; im: number[] }[]>(
      `
import sys, json, numpy as np
data = json.load(sys.stdin)
w = np.array(data["w"])
s = 1j * w
out = []
for c in data["cases"]:
    kp, ki, kd, N = c["kp"], c["ki"], c["kd"], c["N"]
    tf = 0.0 if (kd == 0 or N is None) else (kd / kp) / N
    h = kp + ki / s + kd * s / (1 + tf * s)
    out.append({"re": h.real.tolist(), "im": h.imag.tolist()})
print(json.dumps(out))
`,
      { w: Array.from(grid), cases: cases.map((c) => ({ ...c.gains, N: Number.isFinite(c.N) ? c.N : null })) },
    );
    cases.forEach((c, k) => {
      const response = frequencyResponse(pidTransferFunction(c.gains, c.N), grid);
      for (let i = 0; i < grid.length; i++) {
        const error = Math.hypot(response.real[i] - reference[k].re[i], response.imaginary[i] - reference[k].im[i]);
        expect(error).toBeLessThanOrEqual(1e-12 * Math.hypot(reference[k].re[i], reference[k].im[i]));
      }
    });
  });

  it('has poles at 0 and −1/Tf, and no pole at 0 without integral action', () => {
    const poles = transferFunctionPoles(pidTransferFunction({ kp: 2, ki: 1, kd: 1 }, 10));
    expect(poles.map((p) => p.re)).toEqual([-20, 0]);
    expect(transferFunctionPoles(pidTransferFunction({ kp: 2, ki: 0, kd: 1 }, 10)).map((p) => p.re)).toEqual([-20]);
    expect(pidTransferFunction({ kp: 2, ki: 0, kd: 0 }, 10)).toEqual({ numerator: [2], denominator: [1], delay_s: 0 });
  });
});
