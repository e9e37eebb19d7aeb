import { describe, expect, it } from 'vitest';
import { polynomialRoots } from '../../src/lti/roots.js';
import { analysisRoots } from '../../src/verify/small-roots.js';

describe('analysisRoots(p) closed form for degree ≤ 2', () => {
  it.each([
    // Source: derived by expanding the factors.
    ['(s + 1)(s + 2)', [1, 3, 2], [{ re: -2, im: 0 }, { re: -1, im: 0 }]],
    ['s² + 2s + 5 = (s + 1)² + 4', [1, 2, 5], [{ re: -1, im: -2 }, { re: -1, im: 2 }]],
    ['s(s + 3)', [1, 3, 0], [{ re: -3, im: 0 }, { re: 0, im: 0 }]],
    ['2(s − 0.5)', [2, -1], [{ re: 0.5, im: 0 }]],
    ['(1 − z⁻¹)(1 − 0.6z⁻¹) in z: z² − 1.6z + 0.6', [1, -1.6, 0.6], [{ re: 0.6, im: 0 }, { re: 1, im: 0 }]],
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
