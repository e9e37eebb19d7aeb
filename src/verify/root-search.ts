/**
 * Scalar searches on a bracket, used to refine crossings and peaks found on a
 * frequency grid (never read them off the grid).
 */

/**
 * A root of f in [a, b] where f(a) and f(b) differ in sign, by Brent's method
 * (Brent 1973, "Algorithms for Minimization without Derivatives", ch. 4: inverse
 * quadratic interpolation with bisection safeguard). Stops when the bracket is
 * narrower than tolerance·max(|x|, tiny) or f is exactly 0. Units are the caller's.
 * If the signs do not differ, returns the end with the smaller |f|.
 */
export function bracketedRoot(f: (x: number) => number, a: number, b: number, relativeTolerance: number): number {
  let fa = f(a);
  let fb = f(b);
  if (fa === 0) return a;
  if (fb === 0) return b;
  if (fa > 0 === fb > 0) return Math.abs(fa) < Math.abs(fb) ? a : b;
  let c = a;
  let fc = fa;
  let d = b - a;
  let e = d;
  for (let iteration = 0; iteration < 200; iteration++) {
    if (fb > 0 === fc > 0) {
      c = a;
      fc = fa;
      d = b - a;
      e = d;
    }
    if (Math.abs(fc) < Math.abs(fb)) {
      a = b;
      b = c;
      c = a;
      fa = fb;
      fb = fc;
      fc = fa;
    }
    const tolerance = 2 * Number.EPSILON * Math.abs(b) + 0.5 * relativeTolerance * Math.max(Math.abs(b), 1e-300);
    const half = 0.5 * (c - b);
    if (Math.abs(half) <= tolerance || fb === 0) return b;
    if (Math.abs(e) >= tolerance && Math.abs(fa) > Math.abs(fb)) {
      let p: number;
      let q: number;
      const s = fb / fa;
      if (a === c) {
        p = 2 * half * s;
        q = 1 - s;
      } else {
        const qq = fa / fc;
        const r = fb / fc;
        p = s * (2 * half * qq * (qq - r) - (b - a) * (r - 1));
        q = (qq - 1) * (r - 1) * (s - 1);
      }
      if (p > 0) q = -q;
      else p = -p;
      if (2 * p < Math.min(3 * half * q - Math.abs(tolerance * q), Math.abs(e * q))) {
        e = d;
        d = p / q;
      } else {
        d = half;
        e = d;
      }
    } else {
      d = half;
      e = d;
    }
    a = b;
    fa = fb;
    b += Math.abs(d) > tolerance ? d : half > 0 ? tolerance : -tolerance;
    fb = f(b);
  }
  return b;
}

/**
 * The maximum of a unimodal g on [a, b] by golden-section search (Kiefer 1953;
 * Press et al., Numerical Recipes §10.2), to a bracket width of
 * `tolerance` (absolute, in the units of x). Returns the argument and the value there.
 */
export function goldenSectionMaximum(g: (x: number) => number, a: number, b: number, tolerance: number): { readonly argument: number; readonly value: number } {
  const ratio = (Math.sqrt(5) - 1) / 2;
  let x1 = b - ratio * (b - a);
  let x2 = a + ratio * (b - a);
  let g1 = g(x1);
  let g2 = g(x2);
  for (let iteration = 0; iteration < 200 && Math.abs(b - a) > tolerance; iteration++) {
    if (g1 >= g2) {
      b = x2;
      x2 = x1;
      g2 = g1;
      x1 = b - ratio * (b - a);
      g1 = g(x1);
    } else {
      a = x1;
      x1 = x2;
      g1 = g2;
      x2 = a + ratio * (b - a);
      g2 = g(x2);
    }
  }
  return g1 >= g2 ? { argument: x1, value: g1 } : { argument: x2, value: g2 };
}
