import { describe, expect, it } from 'vitest';
import { polynomialRoots } from '../../src/lti/roots.js';
import { analysisRoots } from '../../src/verify/small-roots.js';
import { runPython } from '../helpers/python.js';

describe('analysisRoots(p) closed form for degree ≤ 2', () => {
  it.each([
    // Source: derived by expanding the factors.
    [
      '(s + 1)(s + 2)',
      [1, 3, 2],
      [
        { re: -2, im: 0 },
        { re: -1, im: 0 },
      ],
    ],
    [
      's² + 2s + 5 = (s + 1)² + 4',
      [1, 2, 5],
      [
        { re: -1, im: -2 },
        { re: -1, im: 2 },
      ],
    ],
    [
      's(s + 3)',
      [1, 3, 0],
      [
        { re: -3, im: 0 },
        { re: 0, im: 0 },
      ],
    ],
    ['2(s − 0.5)', [2, -1], [{ re: 0.5, im: 0 }]],
    [
      '(1 − z⁻¹)(1 − 0.6z⁻¹) in z: z² − 1.6z + 0.6',
      [1, -1.6, 0.6],
      [
        { re: 0.6, im: 0 },
        { re: 1, im: 0 },
      ],
    ],
  ])('%s', (_name, p, expected) => {
    const roots = analysisRoots(p);
    expect(roots).toHaveLength(expected.length);
    roots.forEach((r, i) => {
      expect(r.re).toBeCloseTo(expected[i].re, 12);
      expect(r.im).toBeCloseTo(expected[i].im, 12);
    });
  });

  it('keeps both roots of a badly scaled quadratic (no cancellation): 1e−8·s² + s + 1', () => {
    // Source: derived — roots ≈ −1 − 1e−8 and −1e8 + 1 (product 1e8, sum −1e8).
    const [large, small] = analysisRoots([1e-8, 1, 1]);
    expect(small.re / -1.00000001 - 1).toBeLessThan(1e-12);
    expect(large.re * small.re).toBeCloseTo(1e8, 0);
  });

  it('agrees with polynomialRoots on random quadratics', () => {
    for (let i = 0; i < 200; i++) {
      const p = [Math.sin(i) + 1.5, Math.cos(3 * i) * 4, Math.sin(7 * i) * 3];
      const ours = analysisRoots(p);
      const reference = polynomialRoots(p);
      ours.forEach((r, k) => {
        expect(Math.hypot(r.re - reference[k].re, r.im - reference[k].im)).toBeLessThan(1e-9 * Math.max(1, Math.hypot(r.re, r.im)));
      });
    }
  });
});

describe('analysisRoots(p) closed form for cubics', () => {
  it.each([
    // Source: derived by expanding the factors.
    [
      '(s + 1)(s + 2)(s + 3)',
      [1, 6, 11, 6],
      [
        { re: -3, im: 0 },
        { re: -2, im: 0 },
        { re: -1, im: 0 },
      ],
    ],
    [
      '(s + 2)(s² + 1)',
      [1, 2, 1, 2],
      [
        { re: -2, im: 0 },
        { re: 0, im: -1 },
        { re: 0, im: 1 },
      ],
    ],
    [
      '(s + 10)(s² + 2s + 5)',
      [1, 12, 25, 50],
      [
        { re: -10, im: 0 },
        { re: -1, im: -2 },
        { re: -1, im: 2 },
      ],
    ],
    [
      's(s + 1)(s + 4)',
      [1, 5, 4, 0],
      [
        { re: -4, im: 0 },
        { re: -1, im: 0 },
        { re: 0, im: 0 },
      ],
    ],
    [
      '(s − 1)²(s + 2): a double root',
      [1, 0, -3, 2],
      [
        { re: -2, im: 0 },
        { re: 1, im: 0 },
        { re: 1, im: 0 },
      ],
    ],
  ])('%s', (_name, p, expected) => {
    const roots = analysisRoots(p);
    expect(roots).toHaveLength(3);
    roots.forEach((r, i) => {
      expect(r.re).toBeCloseTo(expected[i].re, 7);
      expect(r.im).toBeCloseTo(expected[i].im, 7);
    });
  });

  it('a triple root (s + 1)³ comes back as three roots at −1 (to the 1e−5 a triple root allows)', () => {
    // Source: derived; a triple root moves by ε^(1/3) under a perturbation ε of the coefficients.
    for (const r of analysisRoots([1, 3, 3, 1])) expect(Math.hypot(r.re + 1, r.im)).toBeLessThan(1e-5);
  });

  it('agrees with numpy.roots on 300 random and badly scaled cubics, complex pairs exactly conjugate', () => {
    // Source: numpy.roots (companion-matrix eigenvalues, LAPACK)
    const cubics = Array.from({ length: 300 }, (_, i) => {
      const scale = Math.pow(10, (i % 7) - 3);
      return [
        Math.sin(i) + 1.5 * Math.sign(Math.sin(i) + 0.1),
        Math.cos(3 * i) * 40 * scale,
        Math.sin(7 * i) * 300 * scale * scale,
        Math.cos(11 * i) * 900 * scale * scale * scale,
      ];
    });
    const reference = runPython<{ re: number; im: number }[][]>(
      `import json, sys, numpy as np
out = []
for p in json.load(sys.stdin):
    r = np.roots(p)
    r = sorted(r, key=lambda z: (z.real, z.imag))
    out.append([{'re': float(z.real), 'im': float(z.imag)} for z in r])
print(json.dumps(out))`,
      cubics,
    );
    cubics.forEach((p, i) => {
      const ours = analysisRoots(p);
      const largest = Math.max(...reference[i].map((z) => Math.hypot(z.re, z.im)));
      const unmatched = [...reference[i]];
      for (const root of ours) {
        const k = unmatched.reduce(
          (best, z, j) => (Math.hypot(z.re - root.re, z.im - root.im) < Math.hypot(unmatched[best].re - root.re, unmatched[best].im - root.im) ? j : best),
          0,
        );
        expect(Math.hypot(unmatched[k].re - root.re, unmatched[k].im - root.im)).toBeLessThan(1e-8 * largest);
        unmatched.splice(k, 1);
      }
      const complex = ours.filter((z) => z.im !== 0);
      if (complex.length === 2) {
        expect(complex[0].re).toBe(complex[1].re);
        expect(complex[0].im).toBe(-complex[1].im);
      }
    });
  });
});
