/**
 * Where the roots of a real polynomial lie relative to a circle |z| = ρ, without computing
 * them: the Schur–Cohn test (Schur 1917, Cohn 1922; the Jury table of Åström & Wittenmark,
 * Computer-Controlled Systems, 3rd ed., §3.2, is the same recursion). For
 * p_k(z) = c0·z^k + … + ck with reflection coefficient γ = ck/c0: every root of p_k lies in
 * |z| < 1 iff |γ| < 1 and every root of p_(k−1)(z) = (p_k(z) − γ·z^k·p_k(1/z))/z does.
 * Roots inside |z| < ρ ⇔ roots of p(ρz) inside the unit circle. O(N²) per test.
 */

/**
 * True when every root of p (coefficients highest power first, p[0] ≠ 0) has |z| < radius
 * (radius > 0). `scratch` (length ≥ p.length) avoids an allocation in repeated calls.
 */
export function allRootsInside(p: readonly number[], radius: number, scratch: Float64Array = new Float64Array(p.length)): boolean {
  const degree = p.length - 1;
  const c = scratch;
  // q(z) = p(ρz): coefficient of z^(N−i) scaled by ρ^(N−i).
  let scale = 1;
  for (let i = degree; i >= 0; i--) {
    c[i] = p[i] * scale;
    scale *= radius;
  }
  for (let k = degree; k >= 1; k--) {
    const gamma = c[k] / c[0];
    if (!(Math.abs(gamma) < 1)) return false;
    // In place: d_i = c_i − γ·c_(k−i), i = 0 … k (d_k = 0 is dropped with the degree).
    for (let i = 0, j = k; i <= j; i++, j--) {
      const left = c[i];
      const right = c[j];
      c[i] = left - gamma * right;
      if (i !== j) c[j] = right - gamma * left;
    }
  }
  return true;
}

/**
 * The largest root magnitude max|z| of p (highest power first, p[0] ≠ 0), by bisection on
 * the radius with `allRootsInside`, to a relative width `relativeTolerance`. 0 when every
 * root is at 0. Every root lies inside Cauchy's bound 1 + max|p_i/p_0|.
 */
export function largestRootMagnitude(p: readonly number[], relativeTolerance: number): number {
  if (p.every((value, i) => i === 0 || value === 0)) return 0;
  const scratch = new Float64Array(p.length);
  let bound = 1;
  for (let i = 1; i < p.length; i++) bound = Math.max(bound, 1 + Math.abs(p[i] / p[0]));
  // Bracket around the unit circle first: the loops here have their largest pole near it.
  const insideUnit = allRootsInside(p, 1, scratch);
  let low = insideUnit ? 0 : 1;
  let high = insideUnit ? 1 : bound;
  while (high - low > relativeTolerance * high) {
    const middle = 0.5 * (low + high);
    if (allRootsInside(p, middle, scratch)) high = middle;
    else low = middle;
  }
  return high;
}
