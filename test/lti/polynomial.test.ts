import { describe, expect, it } from 'vitest';
import {
  addPolynomials,
  differentiatePolynomial,
  evaluatePolynomial,
  multiplyPolynomials,
  polynomialDegree,
  scalePolynomial,
  trimPolynomial,
} from '../../src/lti/polynomial.js';

describe('polynomial arithmetic (coefficients highest power first)', () => {
  it('trimPolynomial drops leading zeros and keeps the zero polynomial as [0]', () => {
    expect(trimPolynomial([0, 0, 1, 2])).toEqual([1, 2]);
    expect(trimPolynomial([0, 0])).toEqual([0]);
    expect(trimPolynomial([])).toEqual([0]);
    expect(trimPolynomial([3, 0])).toEqual([3, 0]);
  });

  it('addPolynomials aligns at the constant term and cancels leading terms', () => {
    expect(addPolynomials([1, 2, 3], [4, 5])).toEqual([1, 6, 8]);
    expect(addPolynomials([1, 2], [-1, 5])).toEqual([7]);
  });

  it('multiplyPolynomials expands (s+1)(s+2)(s+3)(s²+2s+5) = s⁵+8s⁴+28s³+58s²+67s+30', () => {
    // Source: hand expansion (textbook algebra): (s³+6s²+11s+6)(s²+2s+5).
    const cubic = multiplyPolynomials(multiplyPolynomials([1, 1], [1, 2]), [1, 3]);
    expect(cubic).toEqual([1, 6, 11, 6]);
    expect(multiplyPolynomials(cubic, [1, 2, 5])).toEqual([1, 8, 28, 58, 67, 30]);
  });

  it('scalePolynomial by 0 gives the zero polynomial; differentiatePolynomial follows d/ds s^n = n s^(n−1)', () => {
    expect(scalePolynomial([1, 2], 0)).toEqual([0]);
    expect(scalePolynomial([1, -2], -3)).toEqual([-3, 6]);
    expect(differentiatePolynomial([1, 8, 28, 58, 67, 30])).toEqual([5, 32, 84, 116, 67]);
    expect(differentiatePolynomial([7])).toEqual([0]);
    expect(polynomialDegree([0, 0, 2, 1, 0])).toBe(2);
  });

  it('evaluatePolynomial at s = −1 + 2j is zero for s² + 2s + 5 and matches hand arithmetic for s³ at j', () => {
    // Source: roots of s² + 2s + 5 are −1 ± 2j (quadratic formula); j³ = −j.
    const atRoot = evaluatePolynomial([1, 2, 5], -1, 2);
    expect(atRoot.re).toBe(0);
    expect(atRoot.im).toBe(0);
    expect(evaluatePolynomial([1, 0, 0, 0], 0, 1)).toEqual({ re: 0, im: -1 });
    expect(evaluatePolynomial([2, 3], 4, 0)).toEqual({ re: 11, im: 0 });
  });
});
