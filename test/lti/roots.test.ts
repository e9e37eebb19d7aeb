import { describe, expect, it } from 'vitest';
import { makeRandom } from '../../src/core/random.js';
import { isSpeedbandError } from '../../src/core/errors.js';
import { multiplyPolynomials, evaluatePolynomial } from '../../src/lti/polynomial.js';
import { polynomialRoots } from '../../src/lti/roots.js';
import { replaceDelayWithPade } from '../../src/lti/pade.js';
import { seriesConnection, transferFunction, unityFeedback } from '../../src/lti/transfer-function.js';
import type { Complex } from '../../src/lti/types.js';
import { runPythonSingleThread as runPython } from './python-single-thread.js';

/** Largest distance from each expected root to its greedily matched found root, relative to max(1, |expected|). */
function worstMatch(found: readonly Complex[], expected: readonly Complex[]): number {
  expect(found.length).toBe(expected.length);
  const left = [...found];
  let worst = 0;
  for (const e of expected) {
    let best = 0;
    for (let i = 1; i < left.length; i++) {
      if (Math.hypot(left[i].re - e.re, left[i].im - e.im) < Math.hypot(left[best].re - e.re, left[best].im - e.im)) best = i;
    }
    worst = Math.max(worst, Math.hypot(left[best].re - e.re, left[best].im - e.im) / Math.max(1, Math.hypot(e.re, e.im)));
    left.splice(best, 1);
  }
  return worst;
}

const NUMPY_ROOTS = `
import sys, json, numpy as np
data = json.load(sys.stdin)
out = []
for p in data:
    r = np.roots(np.array(p, dtype=float))
    out.append([[float(z.real), float(z.imag)] for z in r])
print(json.dumps(out))
`;

describe('polynomialRoots(p)', () => {
  it('finds −3, −2, −1, −1 ± 2j for (s+1)(s+2)(s+3)(s²+2s+5), sorted by real then imaginary part', () => {
    // Source: the factors themselves (quadratic formula for s² + 2s + 5).
    const roots = polynomialRoots([1, 8, 28, 58, 67, 30]);
    const expected = [
      { re: -3, im: 0 },
      { re: -2, im: 0 },
      { re: -1, im: -2 },
      { re: -1, im: 0 },
      { re: -1, im: 2 },
    ];
    expect(worstMatch(roots, expected)).toBeLessThan(1e-12);
    expect(roots.map((r) => Math.round(r.re))).toEqual([-3, -2, -1, -1, -1]);
    for (let i = 1; i < roots.length; i++) expect(roots[i].re >= roots[i - 1].re - 1e-12).toBe(true);
  });

  it('gives exact conjugate pairs, exactly real roots and exact roots at zero', () => {
    const roots = polynomialRoots([2, 3, 7, 5, 0, 0]);
    expect(roots.filter((r) => r.re === 0 && r.im === 0)).toHaveLength(2);
    for (const r of roots) {
      if (r.im !== 0) expect(roots.some((q) => q.re === r.re && q.im === -r.im)).toBe(true);
    }
    expect(polynomialRoots([1, 0, 0, 0])).toEqual([
      { re: 0, im: 0 },
      { re: 0, im: 0 },
      { re: 0, im: 0 },
    ]);
  });

  it('handles degree 0 and 1 and leading zeros; refuses the zero polynomial with a typed error', () => {
    expect(polynomialRoots([5])).toEqual([]);
    expect(polynomialRoots([0, 0, 2, -4])).toEqual([{ re: 2, im: 0 }]);
    try {
      polynomialRoots([0, 0]);
      expect.unreachable();
    } catch (error) {
      expect(isSpeedbandError(error) && error.code).toBe('lti.zeroPolynomial');
    }
    expect(() => polynomialRoots([1, Number.NaN])).toThrow(/finite/);
  });

  it('agrees with numpy.roots on 300 random polynomials of degree 1–12 (matched as sets)', () => {
    // Source: numpy.roots (companion-matrix eigenvalues, LAPACK).
    const random = makeRandom(2026);
    const polynomials: number[][] = [];
    for (let k = 0; k < 300; k++) {
      const degree = 1 + (k % 12);
      polynomials.push(Array.from({ length: degree + 1 }, (_, i) => (i === 0 ? 0.5 + random.uniform() : random.normal() * 10 ** (2 * random.uniform() - 1))));
    }
    const reference = runPython<number[][][]>(NUMPY_ROOTS, polynomials);
    let worst = 0;
    polynomials.forEach((p, k) => {
      const expected = reference[k].map(([re, im]) => ({ re, im }));
      worst = Math.max(worst, worstMatch(polynomialRoots(p), expected));
    });
    expect(worst).toBeLessThan(1e-7);
  });

  it('recovers known roots spanning 1e-3..1e4 rad/s (coefficients spanning ~1e-6..1e11), each to 1e-9 of its own size, like numpy.roots', () => {
    // Source: roots chosen by hand; coefficients by expansion; numpy.roots as a second opinion.
    const cases: Complex[][] = [
      [
        { re: -1e-3, im: 0 },
        { re: -1, im: 0 },
        { re: -1e3, im: 0 },
        { re: -10, im: 100 },
        { re: -10, im: -100 },
      ],
      [
        { re: -2e-3, im: 1e-2 },
        { re: -2e-3, im: -1e-2 },
        { re: -5, im: 0 },
        { re: -8e3, im: 0 },
        { re: 3e2, im: 0 },
        { re: -40, im: 0 },
      ],
      [
        { re: -1e4, im: 0 },
        { re: -1e4 + 1, im: 0 },
        { re: -0.05, im: 0 },
        { re: -0.3, im: 7 },
        { re: -0.3, im: -7 },
        { re: 0.01, im: 0 },
        { re: -600, im: 0 },
        { re: -2, im: 0 },
      ],
    ];
    const polynomials = cases.map((roots) => {
      let p = [1];
      const used = new Set<Complex>();
      for (const r of roots) {
        if (used.has(r)) continue;
        if (r.im === 0) p = multiplyPolynomials(p, [1, -r.re]);
        else {
          p = multiplyPolynomials(p, [1, -2 * r.re, r.re * r.re + r.im * r.im]);
          used.add(roots.find((q) => q.re === r.re && q.im === -r.im)!);
        }
      }
      return p.map((c) => c * 1e-6); // scale the leading coefficient down to 1e-6
    });
    const reference = runPython<number[][][]>(NUMPY_ROOTS, polynomials);
    polynomials.forEach((p, k) => {
      const found = polynomialRoots(p);
      // relative to each root's own magnitude
      const left = [...found];
      for (const e of cases[k]) {
        const index = left.findIndex((f) => Math.hypot(f.re - e.re, f.im - e.im) <= 1e-9 * Math.hypot(e.re, e.im));
        expect(index, `root ${e.re}+${e.im}j of case ${k}`).toBeGreaterThanOrEqual(0);
        left.splice(index, 1);
      }
      expect(
        worstMatch(
          found,
          reference[k].map(([re, im]) => ({ re, im })),
        ),
      ).toBeLessThan(1e-8);
    });
  });

  it('finds the closed-loop poles of a PID yaw loop with a Padé order 6, 10, 14 delay (coefficients spanning 1 to 1e37) like numpy.roots', () => {
    // Source: numpy.roots on the same characteristic polynomial D + N of the Padé-approximated loop.
    const plant = transferFunction([14.2, 61.5], [1, 8.4, 30.5, 0], 0.08);
    const pid = transferFunction([0.35 * 0.0114 + 0.04, 0.35 + 0.05 * 0.0114, 0.05], [0.0114, 1, 0]); // kp 0.35, ki 0.05, kd 0.04, Tf = Td/10
    const polynomials = [6, 10, 14].map((order) => [...unityFeedback(replaceDelayWithPade(seriesConnection(pid, plant), order)).denominator]);
    const reference = runPython<number[][][]>(NUMPY_ROOTS, polynomials);
    const slowest = polynomials.map((p, k) => {
      const found = polynomialRoots(p);
      expect(
        worstMatch(
          found,
          reference[k].map(([re, im]) => ({ re, im })),
        ),
      ).toBeLessThan(1e-10);
      return found[found.length - 1];
    });
    // property: the slowest closed-loop pole does not depend on the Padé order once the order is adequate
    expect(Math.abs(slowest[1].re - slowest[0].re)).toBeLessThan(1e-9);
    expect(Math.abs(slowest[2].re - slowest[0].re)).toBeLessThan(1e-9);
  });

  it('leaves a small residual |p(r)| ≤ 1e-10 · Σ|p_i||r|^i at every root (backward stable), property over seeded random polynomials', () => {
    const random = makeRandom(99);
    for (let k = 0; k < 200; k++) {
      const degree = 2 + (k % 9);
      const p = Array.from({ length: degree + 1 }, () => random.normal() * 10 ** (4 * random.uniform() - 2));
      for (const r of polynomialRoots(p)) {
        const value = evaluatePolynomial(p, r.re, r.im);
        const size = Math.hypot(r.re, r.im);
        const scale = p.reduce((sum, c, i) => sum + Math.abs(c) * size ** (degree - i), 0);
        expect(Math.hypot(value.re, value.im)).toBeLessThanOrEqual(1e-10 * scale);
      }
    }
  });
});
