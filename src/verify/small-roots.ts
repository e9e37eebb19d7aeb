/**
 * Roots for the loop analysis: a closed form for degree ≤ 3 (the discrete PID's factors,
 * most PID numerators, the single-track plant with its actuator lag and its pulse numerator —
 * an eigenvalue decomposition there costs more than the rest of a frequency sweep), each cubic
 * root polished by Newton's method like polynomialRoots; `polynomialRoots` (balanced companion
 * matrix) for higher degrees.
 */
import { differentiatePolynomial, trimPolynomial } from '../lti/polynomial.js';
import { polishRoot, polynomialRoots } from '../lti/roots.js';
import type { Complex } from '../lti/types.js';

/**
 * Roots of p (highest power first), sorted by real then imaginary part like
 * polynomialRoots. Quadratic a·s² + b·s + c by the cancellation-free form
 * q = −(b + sign(b)·√(b² − 4ac))/2, roots q/a and c/q (Press et al., Numerical
 * Recipes §5.6); complex pairs −b/(2a) ± j·√(4ac − b²)/(2a).
 */
export function analysisRoots(p: readonly number[]): Complex[] {
  const q = trimPolynomial(p);
  if (q.length === 4 && q.every(Number.isFinite)) return cubicRoots(q);
  if (q.length > 3) return polynomialRoots(q);
  if (q.length <= 1) return [];
  if (q.length === 2) return [{ re: -q[1] / q[0], im: 0 }];
  const [a, b, c] = q;
  if (c === 0)
    return [
      { re: -b / a, im: 0 },
      { re: 0, im: 0 },
    ].sort(byRealThenImaginary);
  const discriminant = b * b - 4 * a * c;
  if (discriminant >= 0) {
    const half = -(b + (b >= 0 ? 1 : -1) * Math.sqrt(discriminant)) / 2;
    return [
      { re: half / a, im: 0 },
      { re: c / half, im: 0 },
    ].sort(byRealThenImaginary);
  }
  const re = -b / (2 * a);
  const im = Math.abs(Math.sqrt(-discriminant) / (2 * a));
  return [
    { re, im: -im },
    { re, im },
  ];
}

/**
 * Roots of a·s³ + b·s² + c·s + d (a ≠ 0) by the closed form of Press et al., Numerical Recipes
 * §5.6: with s³ + A s² + B s + C, Q = (A² − 3B)/9 and R = (2A³ − 9AB + 27C)/54, three real roots
 * −2√Q·cos((θ + 2πk)/3) − A/3 with θ = acos(R/√Q³) when R² < Q³; otherwise one real root
 * (S + T) − A/3 and the pair −(S + T)/2 − A/3 ± j(√3/2)(S − T), S = −sign(R)(|R| + √(R² − Q³))^(1/3),
 * T = Q/S. Each root is then polished by Newton's method on the original cubic; a pair stays conjugate.
 */
function cubicRoots(p: readonly number[]): Complex[] {
  const [a, b, c, d] = p;
  if (d === 0) return [{ re: 0, im: 0 }, ...analysisRoots([a, b, c])].sort(byRealThenImaginary);
  const A = b / a;
  const B = c / a;
  const C = d / a;
  const Q = (A * A - 3 * B) / 9;
  const R = (2 * A * A * A - 9 * A * B + 27 * C) / 54;
  const derivative = differentiatePolynomial(p);
  const shift = A / 3;
  if (R * R < Q * Q * Q) {
    const theta = Math.acos(Math.max(-1, Math.min(1, R / Math.sqrt(Q * Q * Q))));
    const size = -2 * Math.sqrt(Q);
    return [0, 1, -1].map((k) => polishRoot(p, derivative, size * Math.cos((theta + 2 * Math.PI * k) / 3) - shift, 0)).sort(byRealThenImaginary);
  }
  const S = -(R >= 0 ? 1 : -1) * Math.cbrt(Math.abs(R) + Math.sqrt(R * R - Q * Q * Q));
  const T = S === 0 ? 0 : Q / S;
  const real = polishRoot(p, derivative, S + T - shift, 0);
  const imaginary = (Math.sqrt(3) / 2) * (S - T);
  if (imaginary === 0) {
    const double = polishRoot(p, derivative, -(S + T) / 2 - shift, 0);
    return [real, double, { ...double }].sort(byRealThenImaginary);
  }
  const pair = polishRoot(p, derivative, -(S + T) / 2 - shift, Math.abs(imaginary));
  return [real, { re: pair.re, im: -Math.abs(pair.im) }, { re: pair.re, im: Math.abs(pair.im) }].sort(byRealThenImaginary);
}

function byRealThenImaginary(x: Complex, y: Complex): number {
  return x.re - y.re || x.im - y.im;
}
