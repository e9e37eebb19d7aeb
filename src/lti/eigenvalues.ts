/**
 * Eigenvalues of a real square matrix with a bound on their rounding error, on Float64Array
 * (no allocation per iteration; ml-matrix's general decomposition also forms eigenvectors and
 * costs ~10× more at the sizes here).
 *
 * 1. Balancing by powers of two (Parlett & Reinsch 1969; EISPACK `balanc`): an exact similarity.
 * 2. Householder reduction to upper Hessenberg form H (Golub & Van Loan, Matrix Computations,
 *    4th ed., Alg. 7.4.2): an orthogonal similarity.
 * 3. Francis double-shift QR on H (Wilkinson & Reinsch 1971, EISPACK `hqr`; Press et al.,
 *    Numerical Recipes, 2nd ed., §11.6).
 * Steps 2–3 are backward stable: the computed eigenvalues are exact for H + E with
 * ‖E‖₂ ≲ c·N·u·‖H‖_F (Golub & Van Loan §7.5.6). First-order perturbation theory then bounds
 * each eigenvalue's error by κ(λ)·‖E‖₂, κ(λ) = ‖x‖·‖y‖/|yᴴx| with x, y its right and left
 * eigenvectors (Wilkinson, The Algebraic Eigenvalue Problem, 1965, §2.8; Golub & Van Loan
 * §7.2.2). `eigenvalueErrorBound` computes κ by inverse iteration on H (O(N²) per eigenvalue).
 */

/** Unit roundoff of IEEE double precision, 2⁻⁵³. */
export const UNIT_ROUNDOFF = 2 ** -53;

/** The balanced Hessenberg form of a matrix and its eigenvalues. */
export interface EigenvalueResult {
  /** Real and imaginary parts, in the order the QR iteration deflated them (conjugate pairs adjacent). */
  readonly re: Float64Array;
  readonly im: Float64Array;
  /** Upper Hessenberg matrix (row-major N×N) orthogonally similar to the balanced matrix. */
  readonly hessenberg: Float64Array;
  /** Frobenius norm of `hessenberg`. */
  readonly norm: number;
  /** False when the QR iteration needed more than 30 sweeps for one eigenvalue (then re/im are NaN from there on). */
  readonly converged: boolean;
}

/**
 * Eigenvalues of the N×N matrix `matrix` (row-major, length N², not modified). Real eigenvalues
 * have im exactly 0; complex ones come in adjacent conjugate pairs.
 */
export function eigenvalues(matrix: Float64Array, size: number): EigenvalueResult {
  const a = Float64Array.from(matrix);
  balance(a, size);
  reduceToHessenberg(a, size);
  const hessenberg = Float64Array.from(a);
  let norm = 0;
  for (let i = 0; i < a.length; i++) norm += a[i] * a[i];
  const re = new Float64Array(size);
  const im = new Float64Array(size);
  const converged = hessenbergQr(a, size, re, im);
  return { re, im, hessenberg, norm: Math.sqrt(norm), converged };
}

/** Balance in place by powers of two until no row/column norm pair shrinks by 5 % (EISPACK balanc; at most 100 sweeps). */
function balance(a: Float64Array, n: number): void {
  const radix = 2;
  const radixSquared = radix * radix;
  let done = false;
  for (let sweep = 0; sweep < 100 && !done; sweep++) {
    done = true;
    for (let i = 0; i < n; i++) {
      let c = 0;
      let r = 0;
      for (let j = 0; j < n; j++) {
        if (j === i) continue;
        c += Math.abs(a[j * n + i]);
        r += Math.abs(a[i * n + j]);
      }
      if (c === 0 || r === 0) continue;
      let g = r / radix;
      let f = 1;
      const s = c + r;
      while (c < g) {
        f *= radix;
        c *= radixSquared;
      }
      g = r * radix;
      while (c > g) {
        f /= radix;
        c /= radixSquared;
      }
      if ((c + r) / f < 0.95 * s) {
        done = false;
        const inverse = 1 / f;
        for (let j = 0; j < n; j++) a[i * n + j] *= inverse;
        for (let j = 0; j < n; j++) a[j * n + i] *= f;
      }
    }
  }
}

/** Householder reduction to upper Hessenberg form in place (Golub & Van Loan Alg. 7.4.2). */
function reduceToHessenberg(a: Float64Array, n: number): void {
  const v = new Float64Array(n);
  for (let k = 0; k < n - 2; k++) {
    let scale = 0;
    for (let i = k + 1; i < n; i++) scale += Math.abs(a[i * n + k]);
    if (scale === 0) continue;
    let h = 0;
    for (let i = k + 1; i < n; i++) {
      v[i] = a[i * n + k] / scale;
      h += v[i] * v[i];
    }
    const g = v[k + 1] >= 0 ? -Math.sqrt(h) : Math.sqrt(h);
    h -= v[k + 1] * g;
    v[k + 1] -= g;
    // Left: rows k+1… of columns k… ; P = I − v·vᵀ/h.
    for (let j = k; j < n; j++) {
      let f = 0;
      for (let i = k + 1; i < n; i++) f += v[i] * a[i * n + j];
      f /= h;
      for (let i = k + 1; i < n; i++) a[i * n + j] -= f * v[i];
    }
    // Right: columns k+1… of every row.
    for (let i = 0; i < n; i++) {
      let f = 0;
      for (let j = k + 1; j < n; j++) f += v[j] * a[i * n + j];
      f /= h;
      for (let j = k + 1; j < n; j++) a[i * n + j] -= f * v[j];
    }
    a[(k + 1) * n + k] = scale * g;
    for (let i = k + 2; i < n; i++) a[i * n + k] = 0;
  }
}

/**
 * Eigenvalues of an upper Hessenberg matrix by the Francis double-shift QR iteration with
 * exceptional shifts after 10 and 20 sweeps (EISPACK hqr as in Numerical Recipes §11.6);
 * destroys `a`. Returns false when an eigenvalue took more than 30 sweeps.
 */
function hessenbergQr(a: Float64Array, n: number, wr: Float64Array, wi: Float64Array): boolean {
  let anorm = 0;
  for (let i = 0; i < n; i++) for (let j = Math.max(i - 1, 0); j < n; j++) anorm += Math.abs(a[i * n + j]);
  let nn = n - 1;
  let t = 0;
  let p = 0;
  let q = 0;
  let r = 0;
  let s = 0;
  let w = 0;
  let x = 0;
  let y = 0;
  let z = 0;
  while (nn >= 0) {
    let its = 0;
    let l: number;
    do {
      for (l = nn; l >= 1; l--) {
        s = Math.abs(a[(l - 1) * n + (l - 1)]) + Math.abs(a[l * n + l]);
        if (s === 0) s = anorm;
        if (Math.abs(a[l * n + (l - 1)]) + s === s) {
          a[l * n + l - 1] = 0;
          break;
        }
      }
      x = a[nn * n + nn];
      if (l === nn) {
        wr[nn] = x + t;
        wi[nn] = 0;
        nn--;
      } else {
        y = a[(nn - 1) * n + (nn - 1)];
        w = a[nn * n + (nn - 1)] * a[(nn - 1) * n + nn];
        if (l === nn - 1) {
          p = 0.5 * (y - x);
          q = p * p + w;
          z = Math.sqrt(Math.abs(q));
          x += t;
          if (q >= 0) {
            z = p + (p >= 0 ? Math.abs(z) : -Math.abs(z));
            wr[nn - 1] = wr[nn] = x + z;
            if (z !== 0) wr[nn] = x - w / z;
            wi[nn - 1] = wi[nn] = 0;
          } else {
            wr[nn - 1] = wr[nn] = x + p;
            wi[nn - 1] = -z;
            wi[nn] = z;
          }
          nn -= 2;
        } else {
          if (its === 30) {
            for (let i = 0; i <= nn; i++) wr[i] = wi[i] = Number.NaN;
            return false;
          }
          if (its === 10 || its === 20) {
            t += x;
            for (let i = 0; i <= nn; i++) a[i * n + i] -= x;
            s = Math.abs(a[nn * n + (nn - 1)]) + Math.abs(a[(nn - 1) * n + (nn - 2)]);
            y = x = 0.75 * s;
            w = -0.4375 * s * s;
          }
          its++;
          let m: number;
          for (m = nn - 2; m >= l; m--) {
            z = a[m * n + m];
            r = x - z;
            s = y - z;
            p = (r * s - w) / a[(m + 1) * n + m] + a[m * n + (m + 1)];
            q = a[(m + 1) * n + (m + 1)] - z - r - s;
            r = a[(m + 2) * n + (m + 1)];
            s = Math.abs(p) + Math.abs(q) + Math.abs(r);
            p /= s;
            q /= s;
            r /= s;
            if (m === l) break;
            const u = Math.abs(a[m * n + (m - 1)]) * (Math.abs(q) + Math.abs(r));
            const v = Math.abs(p) * (Math.abs(a[(m - 1) * n + (m - 1)]) + Math.abs(z) + Math.abs(a[(m + 1) * n + (m + 1)]));
            if (u + v === v) break;
          }
          for (let i = m + 2; i <= nn; i++) {
            a[i * n + i - 2] = 0;
            if (i !== m + 2) a[i * n + i - 3] = 0;
          }
          for (let k = m; k <= nn - 1; k++) {
            if (k !== m) {
              p = a[k * n + (k - 1)];
              q = a[(k + 1) * n + (k - 1)];
              r = k !== nn - 1 ? a[(k + 2) * n + (k - 1)] : 0;
              x = Math.abs(p) + Math.abs(q) + Math.abs(r);
              if (x !== 0) {
                p /= x;
                q /= x;
                r /= x;
              }
            }
            const root = Math.sqrt(p * p + q * q + r * r);
            s = p >= 0 ? root : -root;
            if (s !== 0) {
              if (k === m) {
                if (l !== m) a[k * n + k - 1] = -a[k * n + (k - 1)];
              } else a[k * n + k - 1] = -s * x;
              p += s;
              x = p / s;
              y = q / s;
              z = r / s;
              q /= p;
              r /= p;
              for (let j = k; j <= nn; j++) {
                p = a[k * n + j] + q * a[(k + 1) * n + j];
                if (k !== nn - 1) {
                  p += r * a[(k + 2) * n + j];
                  a[(k + 2) * n + j] -= p * z;
                }
                a[(k + 1) * n + j] -= p * y;
                a[k * n + j] -= p * x;
              }
              const last = nn < k + 3 ? nn : k + 3;
              for (let i = l; i <= last; i++) {
                p = x * a[i * n + k] + y * a[i * n + (k + 1)];
                if (k !== nn - 1) {
                  p += z * a[i * n + (k + 2)];
                  a[i * n + k + 2] -= p * r;
                }
                a[i * n + k + 1] -= p * q;
                a[i * n + k] -= p;
              }
            }
          }
        }
      }
    } while (l < nn - 1);
  }
  return true;
}

/**
 * The condition number κ(λ) = ‖x‖·‖y‖/|yᴴx| of the eigenvalue λ = re + j·im of the upper Hessenberg
 * matrix H = result.hessenberg (row-major N×N, N = size), its right and left eigenvectors found by two
 * steps of inverse iteration on H − λI (Gaussian elimination with partial pivoting between adjacent
 * rows, O(N²); an exactly zero pivot is replaced by u·‖H‖_F, with ‖H‖_F = result.norm).
 * Infinity when the vectors are orthogonal to rounding (a defective eigenvalue).
 */
export function eigenvalueCondition(
  result: Pick<EigenvalueResult, 'hessenberg' | 'norm'>,
  size: number,
  eigenvalue: { readonly re: number; readonly im: number },
): number {
  const { hessenberg, norm } = result;
  const { re, im } = eigenvalue;
  const n = size;
  const { ur, ui, swapped, lr, li, xr, xi, wr, wi } = scratchFor(n);
  // LU of H − λI (complex), Hessenberg: eliminate the single subdiagonal entry of each column.
  ur.set(hessenberg);
  ui.fill(0);
  swapped.fill(0);
  for (let i = 0; i < n; i++) {
    ur[i * n + i] -= re;
    ui[i * n + i] -= im;
  }
  const tiny = UNIT_ROUNDOFF * Math.max(norm, Number.MIN_VALUE);
  for (let k = 0; k < n - 1; k++) {
    const d2 = ur[k * n + k] ** 2 + ui[k * n + k] ** 2;
    const s2 = ur[(k + 1) * n + k] ** 2 + ui[(k + 1) * n + k] ** 2;
    if (s2 > d2) {
      swapped[k] = 1;
      for (let j = k; j < n; j++) {
        const tr = ur[k * n + j];
        const ti = ui[k * n + j];
        ur[k * n + j] = ur[(k + 1) * n + j];
        ui[k * n + j] = ui[(k + 1) * n + j];
        ur[(k + 1) * n + j] = tr;
        ui[(k + 1) * n + j] = ti;
      }
    }
    let pr = ur[k * n + k];
    const pi = ui[k * n + k];
    if (pr === 0 && pi === 0) {
      pr = tiny;
      ur[k * n + k] = tiny;
    }
    const pd = pr * pr + pi * pi;
    const xr = ur[(k + 1) * n + k];
    const xi = ui[(k + 1) * n + k];
    const fr = (xr * pr + xi * pi) / pd;
    const fi = (xi * pr - xr * pi) / pd;
    lr[k] = fr;
    li[k] = fi;
    for (let j = k; j < n; j++) {
      const yr = ur[k * n + j];
      const yi = ui[k * n + j];
      ur[(k + 1) * n + j] -= fr * yr - fi * yi;
      ui[(k + 1) * n + j] -= fr * yi + fi * yr;
    }
  }
  for (let k = 0; k < n; k++) if (ur[k * n + k] === 0 && ui[k * n + k] === 0) ur[k * n + k] = tiny;

  // Right vector: solve (H − λI)x = b twice, b = 1 then the normalised x.
  xr.fill(1);
  xi.fill(0);
  for (let step = 0; step < 2; step++) {
    // Forward: apply the row swaps and eliminations to b.
    for (let k = 0; k < n - 1; k++) {
      if (swapped[k]) {
        const tr = xr[k];
        xr[k] = xr[k + 1];
        xr[k + 1] = tr;
        const ti = xi[k];
        xi[k] = xi[k + 1];
        xi[k + 1] = ti;
      }
      xr[k + 1] -= lr[k] * xr[k] - li[k] * xi[k];
      xi[k + 1] -= lr[k] * xi[k] + li[k] * xr[k];
    }
    backSubstitute(ur, ui, n, xr, xi);
    normalise(xr, xi);
  }
  // Left vector w with (H − λI)ᵀ w = c (then y = conj(w)): Uᵀ solve, then the eliminations transposed in reverse.
  wr.fill(1);
  wi.fill(0);
  for (let step = 0; step < 2; step++) {
    for (let i = 0; i < n; i++) {
      let sr = wr[i];
      let si = wi[i];
      for (let k = 0; k < i; k++) {
        const ar = ur[k * n + i];
        const ai = ui[k * n + i];
        sr -= ar * wr[k] - ai * wi[k];
        si -= ar * wi[k] + ai * wr[k];
      }
      const pr = ur[i * n + i];
      const pi = ui[i * n + i];
      const pd = pr * pr + pi * pi;
      wr[i] = (sr * pr + si * pi) / pd;
      wi[i] = (si * pr - sr * pi) / pd;
    }
    for (let k = n - 2; k >= 0; k--) {
      wr[k] -= lr[k] * wr[k + 1] - li[k] * wi[k + 1];
      wi[k] -= lr[k] * wi[k + 1] + li[k] * wr[k + 1];
      if (swapped[k]) {
        const tr = wr[k];
        wr[k] = wr[k + 1];
        wr[k + 1] = tr;
        const ti = wi[k];
        wi[k] = wi[k + 1];
        wi[k + 1] = ti;
      }
    }
    normalise(wr, wi);
  }
  // yᴴx = wᵀx (y = conj(w)); both vectors have unit norm.
  let dr = 0;
  let di = 0;
  for (let i = 0; i < n; i++) {
    dr += wr[i] * xr[i] - wi[i] * xi[i];
    di += wr[i] * xi[i] + wi[i] * xr[i];
  }
  const overlap = Math.hypot(dr, di);
  return overlap === 0 || !Number.isFinite(overlap) ? Infinity : 1 / overlap;
}

interface ConditionScratch {
  readonly ur: Float64Array;
  readonly ui: Float64Array;
  readonly swapped: Uint8Array;
  readonly lr: Float64Array;
  readonly li: Float64Array;
  readonly xr: Float64Array;
  readonly xi: Float64Array;
  readonly wr: Float64Array;
  readonly wi: Float64Array;
}
const scratchBySize = new Map<number, ConditionScratch>();
/** Work arrays of one size, reused across calls (the functions here are synchronous). */
function scratchFor(n: number): ConditionScratch {
  let scratch = scratchBySize.get(n);
  if (scratch === undefined) {
    const vector = (): Float64Array => new Float64Array(n);
    scratch = {
      ur: new Float64Array(n * n),
      ui: new Float64Array(n * n),
      swapped: new Uint8Array(n),
      lr: vector(),
      li: vector(),
      xr: vector(),
      xi: vector(),
      wr: vector(),
      wi: vector(),
    };
    if (scratchBySize.size > 16) scratchBySize.clear();
    scratchBySize.set(n, scratch);
  }
  return scratch;
}

function backSubstitute(ur: Float64Array, ui: Float64Array, n: number, xr: Float64Array, xi: Float64Array): void {
  for (let i = n - 1; i >= 0; i--) {
    let sr = xr[i];
    let si = xi[i];
    for (let j = i + 1; j < n; j++) {
      const ar = ur[i * n + j];
      const ai = ui[i * n + j];
      sr -= ar * xr[j] - ai * xi[j];
      si -= ar * xi[j] + ai * xr[j];
    }
    const pr = ur[i * n + i];
    const pi = ui[i * n + i];
    const pd = pr * pr + pi * pi;
    xr[i] = (sr * pr + si * pi) / pd;
    xi[i] = (si * pr - sr * pi) / pd;
  }
}

function normalise(xr: Float64Array, xi: Float64Array): void {
  let largest = 0;
  for (let i = 0; i < xr.length; i++) largest = Math.max(largest, Math.abs(xr[i]), Math.abs(xi[i]));
  if (largest === 0 || !Number.isFinite(largest)) return;
  let sum = 0;
  for (let i = 0; i < xr.length; i++) {
    xr[i] /= largest;
    xi[i] /= largest;
    sum += xr[i] * xr[i] + xi[i] * xi[i];
  }
  const length = Math.sqrt(sum);
  for (let i = 0; i < xr.length; i++) {
    xr[i] /= length;
    xi[i] /= length;
  }
}

/**
 * First-order error bound of a computed eigenvalue: κ(λ)·η with η = 100·N·u·‖H‖_F, a generous
 * multiple of the backward error of the reduction and QR iteration (and of forming the matrix
 * from exactly rounded data); see the module comment. Units of the eigenvalue.
 */
export function eigenvalueErrorBound(result: EigenvalueResult, size: number, index: number): number {
  const condition = eigenvalueCondition(result, size, { re: result.re[index], im: result.im[index] });
  return condition * backwardError(result, size);
}

/** η = 100·N·u·‖H‖_F: the size of the perturbation the computed eigenvalues are exact for. */
export function backwardError(result: EigenvalueResult, size: number): number {
  return 100 * size * UNIT_ROUNDOFF * result.norm;
}
