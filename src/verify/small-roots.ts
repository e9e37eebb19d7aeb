/**
 * Roots for the loop analysis: a closed form for degree ≤ 2 (the discrete PID's factors
 * and most PID numerators — an eigenvalue decomposition there costs more than the rest
 * of a frequency sweep), `polynomialRoots` (balanced companion matrix) otherwise.
 */
import { trimPolynomial } from '../lti/polynomial.js';
import { polynomialRoots } from '../lti/roots.js';
import type { Complex } from '../lti/types.js';

/**
 * Roots of p (highest power first), sorted by real then imaginary part like
 * polynomialRoots. Quadratic a·s² + b·s + c by the cancellation-free form
 * q = −(b + sign(b)·√(b² − 4ac))/2, roots q/a and c/q (Press et al., Numerical
 * Recipes §5.6); complex pairs −b/(2a) ± j·√(4ac − b²)/(2a).
 */
export function analysisRoots(p: readonly number[]): Complex[] {
  const q = trimPolynomial(p);
  if (q.length > 3) return polynomialRoots(q);
  if (q.length <= 1) return [];
  if (q.length === 2) return [{ re: -q[1] / q[0], im: 0 }];
  const [a, b, c] = q;
  if (c === 0) return [{ re: -b / a, im: 0 }, { re: 0, im: 0 }].sort(byRealThenImaginary);
  const discriminant = b * b - 4 * a * c;
  if (discriminant >= 0) {
    const half = -(b + (b >= 0 ? 1 : -1) * Math.sqrt(discriminant)) / 2;
    return [{ re: half / a, im: 0 }, { re: c / half, im: 0 }].sort(byRealThenImaginary);
  }
  const re = -b / (2 * a);
  const im = Math.abs(Math.sqrt(-discriminant) / (2 * a));
  return [{ re, im: -im }, { re, im }];
}

function byRealThenImaginary(x: Complex, y: Complex): number {
  return x.re - y.re || x.im - y.im;
}
