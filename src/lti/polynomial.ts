/**
 * Real polynomials as plain coefficient arrays, highest power first
 * (p = [p0, p1, …, pn] means p0·s^n + p1·s^(n−1) + … + pn — the order scipy.signal
 * and most control texts use). The zero polynomial is [0].
 */
import type { Complex } from './types.js';

/** Drop leading (highest-power) zero coefficients; the zero polynomial stays [0]. */
export function trimPolynomial(p: readonly number[]): number[] {
  let first = 0;
  while (first < p.length - 1 && p[first] === 0) first++;
  return p.length === 0 ? [0] : p.slice(first);
}

/** Sum a + b (coefficients aligned at the constant term), trimmed. */
export function addPolynomials(a: readonly number[], b: readonly number[]): number[] {
  const length = Math.max(a.length, b.length);
  const sum = new Array<number>(length).fill(0);
  for (let i = 0; i < a.length; i++) sum[length - a.length + i] += a[i];
  for (let i = 0; i < b.length; i++) sum[length - b.length + i] += b[i];
  return trimPolynomial(sum);
}

/** Product a·b (discrete convolution of the coefficients), trimmed. */
export function multiplyPolynomials(a: readonly number[], b: readonly number[]): number[] {
  if (a.length === 0 || b.length === 0) return [0];
  const product = new Array<number>(a.length + b.length - 1).fill(0);
  for (let i = 0; i < a.length; i++) {
    for (let j = 0; j < b.length; j++) product[i + j] += a[i] * b[j];
  }
  return trimPolynomial(product);
}

/** k·p, trimmed (k = 0 gives [0]). */
export function scalePolynomial(p: readonly number[], k: number): number[] {
  return trimPolynomial(p.map((c) => c * k));
}

/** dp/ds; the derivative of a constant is [0]. */
export function differentiatePolynomial(p: readonly number[]): number[] {
  const n = p.length - 1;
  if (n <= 0) return [0];
  const derivative = new Array<number>(n);
  for (let i = 0; i < n; i++) derivative[i] = p[i] * (n - i);
  return trimPolynomial(derivative);
}

/**
 * p(s) at the complex point s = re + j·im by Horner's rule in plain numbers
 * (no allocation beyond the result).
 */
export function evaluatePolynomial(p: readonly number[], re: number, im: number): Complex {
  let accRe = 0;
  let accIm = 0;
  for (let i = 0; i < p.length; i++) {
    const nextRe = accRe * re - accIm * im + p[i];
    accIm = accRe * im + accIm * re;
    accRe = nextRe;
  }
  return { re: accRe, im: accIm };
}

/** Degree of p after trimming (the zero polynomial has degree 0 here). */
export function polynomialDegree(p: readonly number[]): number {
  return trimPolynomial(p).length - 1;
}
