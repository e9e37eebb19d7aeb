/**
 * Roots of real polynomials: companion-matrix eigenvalues (the method numpy.roots
 * uses) by the balanced Hessenberg QR iteration of ./eigenvalues.ts, then each root
 * polished by Newton's method on the original polynomial.
 * mathjs `polynomialRoot` stops at cubics and loses roots of badly scaled
 * polynomials (docs/domain.md §5b); closed-loop polynomials here are degree 4–8.
 */
import { EigenvalueDecomposition, Matrix } from 'ml-matrix';
import { SpeedbandError } from '../core/errors.js';
import { eigenvalues } from './eigenvalues.js';
import { differentiatePolynomial, evaluatePolynomial, trimPolynomial } from './polynomial.js';
import type { Complex } from './types.js';

const DEFAULTS = {
  /** Newton polishing steps per root (each accepted only if it lowers |p|). */
  polishSteps: 8,
} as const;

/**
 * All complex roots of p (coefficients highest power first), with multiplicity.
 * - Leading zeros are dropped; trailing zero coefficients give exact roots at 0.
 * - Real roots have im exactly 0; complex roots come in exact conjugate pairs.
 * - Sorted by real part, then imaginary part (ascending): deterministic.
 * Throws `lti.zeroPolynomial` for the zero polynomial or non-finite coefficients.
 */
export function polynomialRoots(p: readonly number[]): Complex[] {
  const trimmed = trimPolynomial(p);
  if (trimmed.some((c) => !Number.isFinite(c))) {
    throw new SpeedbandError(
      'lti.nonFiniteCoefficient',
      `polynomial coefficients must be finite numbers, found [${trimmed.join(', ')}] — check the model that produced them`,
      {
        details: { coefficients: trimmed },
      },
    );
  }
  if (trimmed.length === 1 && trimmed[0] === 0) {
    throw new SpeedbandError('lti.zeroPolynomial', 'the zero polynomial has no defined roots — expected at least one non-zero coefficient', {
      details: { coefficients: [...p] },
    });
  }
  let end = trimmed.length;
  while (end > 1 && trimmed[end - 1] === 0) end--;
  const zeroCount = trimmed.length - end;
  const core = trimmed.slice(0, end);
  const roots: Complex[] = [];
  for (let i = 0; i < zeroCount; i++) roots.push({ re: 0, im: 0 });
  const degree = core.length - 1;
  if (degree === 1) {
    roots.push({ re: -core[1] / core[0], im: 0 });
  } else if (degree >= 2) {
    roots.push(...companionRoots(core));
  }
  return roots.sort(compareRoots);
}

function compareRoots(a: Complex, b: Complex): number {
  return a.re - b.re || a.im - b.im;
}

function companionRoots(core: readonly number[]): Complex[] {
  const n = core.length - 1;
  const lead = core[0];
  // Upper Hessenberg companion matrix: first row −p_(j+1)/p_0, ones on the subdiagonal.
  const companion = new Float64Array(n * n);
  for (let j = 0; j < n; j++) companion[j] = -core[j + 1] / lead;
  for (let i = 1; i < n; i++) companion[i * n + i - 1] = 1;
  const found = eigenvalues(companion, n);
  const { re: realParts, im: imaginaryParts } = found.converged ? found : fallbackEigenvalues(companion, n);
  const derivative = differentiatePolynomial(core);
  const roots: Complex[] = [];
  for (let k = 0; k < n; k++) {
    const im = imaginaryParts[k];
    if (im < 0) continue; // added below as the conjugate of its partner
    const polished = polishRoot(core, derivative, realParts[k], im);
    if (im === 0) {
      roots.push({ re: polished.re, im: 0 });
    } else {
      roots.push(polished, { re: polished.re, im: -polished.im });
    }
  }
  return roots;
}

/** ml-matrix's decomposition (EISPACK hqr2 with eigenvectors) for the rare matrix our QR iteration leaves unconverged. */
function fallbackEigenvalues(matrix: Float64Array, n: number): { re: readonly number[]; im: readonly number[] } {
  const rows = Array.from({ length: n }, (_, i) => Array.from(matrix.subarray(i * n, (i + 1) * n)));
  const decomposition = new EigenvalueDecomposition(new Matrix(rows), { assumeSymmetric: false });
  return { re: decomposition.realEigenvalues, im: decomposition.imaginaryEigenvalues };
}

/**
 * Newton's method z ← z − p(z)/p'(z) on the original polynomial; a real start stays
 * real. A step is kept only if it lowers |p(z)|, so a multiple root is never made worse.
 * `dp` is differentiatePolynomial(p).
 */
export function polishRoot(p: readonly number[], dp: readonly number[], re: number, im: number): Complex {
  let zRe = re;
  let zIm = im;
  let value = evaluatePolynomial(p, zRe, zIm);
  let size = Math.hypot(value.re, value.im);
  for (let step = 0; step < DEFAULTS.polishSteps && size > 0; step++) {
    const slope = evaluatePolynomial(dp, zRe, zIm);
    const slopeSize2 = slope.re * slope.re + slope.im * slope.im;
    if (slopeSize2 === 0) break;
    const deltaRe = (value.re * slope.re + value.im * slope.im) / slopeSize2;
    const deltaIm = im === 0 ? 0 : (value.im * slope.re - value.re * slope.im) / slopeSize2;
    const nextRe = zRe - deltaRe;
    const nextIm = zIm - deltaIm;
    const nextValue = evaluatePolynomial(p, nextRe, nextIm);
    const nextSize = Math.hypot(nextValue.re, nextValue.im);
    if (!(nextSize < size)) break;
    zRe = nextRe;
    zIm = nextIm;
    value = nextValue;
    size = nextSize;
  }
  return { re: zRe, im: zIm };
}
