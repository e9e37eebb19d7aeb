import { describe, expect, it } from 'vitest';
import { makeRandom } from '../../src/core/random.js';
import { matrixExponential } from '../../src/lti/matrix-exponential.js';
import { runPython } from '../helpers/python.js';

describe('matrixExponential(A)', () => {
  it('gives the rotation matrix for a skew-symmetric generator', () => {
    // Source: textbook identity e^([[0, −θ], [θ, 0]]) = [[cos θ, −sin θ], [sin θ, cos θ]].
    for (const theta of [0.1, 1, 7.5]) {
      const e = matrixExponential([
        [0, -theta],
        [theta, 0],
      ]);
      expect(e[0][0]).toBeCloseTo(Math.cos(theta), 13);
      expect(e[0][1]).toBeCloseTo(-Math.sin(theta), 13);
      expect(e[1][0]).toBeCloseTo(Math.sin(theta), 13);
      expect(e[1][1]).toBeCloseTo(Math.cos(theta), 13);
    }
  });

  it('sums the finite series of a nilpotent matrix exactly', () => {
    // Source: textbook — N³ = 0 for a strictly upper-triangular 3×3, so e^N = I + N + N²/2.
    const e = matrixExponential([
      [0, 2, 3],
      [0, 0, 4],
      [0, 0, 0],
    ]);
    expect(e).toEqual([
      [1, 2, 3 + (2 * 4) / 2],
      [0, 1, 4],
      [0, 0, 1],
    ]);
  });

  it('agrees with scipy.linalg.expm on seeded random matrices of size 1–8 and norms up to 500', () => {
    const random = makeRandom(20261201);
    const matrices: number[][][] = [];
    for (let index = 0; index < 60; index += 1) {
      const n = 1 + (index % 8);
      const scale = Math.pow(10, -2 + 4.7 * random.uniform());
      const m = Array.from({ length: n }, () => Array.from({ length: n }, () => scale * random.normal()));
      // keep the spectrum in the left half plane for large norms, as a stable system's A·h is
      if (scale > 5) for (let i = 0; i < n; i += 1) m[i][i] -= scale * n;
      matrices.push(m);
    }
    // Source: scipy.linalg.expm (reference library, Al-Mohy & Higham 2009 algorithm).
    const reference = runPython<number[][][]>(
      'import json, sys\nimport numpy as np\nfrom scipy.linalg import expm\nd = json.load(sys.stdin)\nprint(json.dumps([expm(np.array(m)).tolist() for m in d]))',
      matrices,
    );
    matrices.forEach((m, index) => {
      const ours = matrixExponential(m);
      const theirs = reference[index];
      const size = Math.max(...theirs.flat().map(Math.abs));
      for (let i = 0; i < m.length; i += 1)
        for (let j = 0; j < m.length; j += 1) expect(Math.abs(ours[i][j] - theirs[i][j])).toBeLessThan(1e-11 * Math.max(size, 1e-300));
    });
  });

  it('refuses a non-square matrix', () => {
    expect(() => matrixExponential([[1, 2]])).toThrow(RangeError);
  });
});
