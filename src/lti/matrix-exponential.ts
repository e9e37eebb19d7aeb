/**
 * The matrix exponential e^A by scaling and squaring with a diagonal [6/6] Padé
 * approximant (Moler & Van Loan 2003, "Nineteen dubious ways…", method 3;
 * Golub & Van Loan, Matrix Computations, alg. 11.3.1): scale A by 2^−s so that
 * ‖A/2^s‖₁ ≤ 1/2, where the [6/6] truncation error is below 1e−16 relative,
 * evaluate N(X)/D(X), then square s times. Plain numbers; sized for the small
 * (2–8 state) systems of this program, e.g. exact zero-order-hold discretisation:
 * e^([[A, B], [0, 0]]·h) = [[Φ, Γ], [0, I]] with Φ = e^(Ah), Γ = ∫₀ʰ e^(Aτ) dτ B.
 */

const PADE_ORDER = 6;
/** ‖X‖₁ bound after scaling (Golub & Van Loan alg. 11.3.1 with q = 6 gives error ≲ 1e−16 at 1/2). */
const SCALED_NORM_BOUND = 0.5;

/** Padé [q/q] coefficients of e^x: c_k = (2q − k)! q! / ((2q)! k! (q − k)!). */
const PADE_COEFFICIENTS: readonly number[] = (() => {
  const c = [1];
  for (let k = 1; k <= PADE_ORDER; k += 1) c.push((c[k - 1] * (PADE_ORDER - k + 1)) / (k * (2 * PADE_ORDER - k + 1)));
  return c;
})();

type Square = Float64Array; // row-major n×n

/** out = x·y (out distinct from both). */
function multiplyInto(out: Square, x: Square, y: Square, n: number): void {
  out.fill(0);
  for (let i = 0; i < n; i += 1) {
    for (let k = 0; k < n; k += 1) {
      const xik = x[i * n + k];
      if (xik === 0) continue;
      for (let j = 0; j < n; j += 1) out[i * n + j] += xik * y[k * n + j];
    }
  }
}

/** Solve D·X = N in place (D and N overwritten; X left in N) by Gaussian elimination with partial pivoting. */
function solveInPlace(a: Square, b: Square, n: number): void {
  for (let column = 0; column < n; column += 1) {
    let pivot = column;
    for (let row = column + 1; row < n; row += 1) if (Math.abs(a[row * n + column]) > Math.abs(a[pivot * n + column])) pivot = row;
    if (pivot !== column) {
      for (let j = 0; j < n; j += 1) {
        const ta = a[column * n + j];
        a[column * n + j] = a[pivot * n + j];
        a[pivot * n + j] = ta;
        const tb = b[column * n + j];
        b[column * n + j] = b[pivot * n + j];
        b[pivot * n + j] = tb;
      }
    }
    const diagonal = a[column * n + column];
    for (let row = column + 1; row < n; row += 1) {
      const factor = a[row * n + column] / diagonal;
      if (factor === 0) continue;
      for (let j = column; j < n; j += 1) a[row * n + j] -= factor * a[column * n + j];
      for (let j = 0; j < n; j += 1) b[row * n + j] -= factor * b[column * n + j];
    }
  }
  for (let row = n - 1; row >= 0; row -= 1) {
    for (let j = 0; j < n; j += 1) {
      let sum = b[row * n + j];
      for (let k = row + 1; k < n; k += 1) sum -= a[row * n + k] * b[k * n + j];
      b[row * n + j] = sum / a[row * n + row];
    }
  }
}

/**
 * e^X for a square matrix X given row-major in a Float64Array of n² entries (not modified); the result is a new
 * array in the same layout. Dimensionless: for ẋ = Ax pass A·h. Throws a RangeError for non-finite entries.
 */
export function matrixExponentialOf(matrix: Float64Array, n: number): Float64Array {
  const x = new Float64Array(n * n);
  let norm = 0;
  for (let j = 0; j < n; j += 1) {
    let columnSum = 0;
    for (let i = 0; i < n; i += 1) {
      const value = matrix[i * n + j];
      if (!Number.isFinite(value)) throw new RangeError(`matrixExponential needs finite entries, found ${value} at (${i}, ${j})`);
      columnSum += Math.abs(value);
    }
    norm = Math.max(norm, columnSum);
  }
  const squarings = norm > SCALED_NORM_BOUND ? Math.ceil(Math.log2(norm / SCALED_NORM_BOUND)) : 0;
  const scale = Math.pow(2, -squarings);
  for (let k = 0; k < n * n; k += 1) x[k] = matrix[k] * scale;

  // N = Σ c_k X^k, D = Σ (−1)^k c_k X^k
  const numerator = new Float64Array(n * n);
  const denominator = new Float64Array(n * n);
  for (let i = 0; i < n; i += 1) {
    numerator[i * n + i] = 1;
    denominator[i * n + i] = 1;
  }
  let power = Float64Array.from(x);
  let spare = new Float64Array(n * n);
  for (let k = 1; k <= PADE_ORDER; k += 1) {
    if (k > 1) {
      multiplyInto(spare, power, x, n);
      [power, spare] = [spare, power];
    }
    const c = PADE_COEFFICIENTS[k];
    const sign = k % 2 === 0 ? 1 : -1;
    for (let m = 0; m < n * n; m += 1) {
      numerator[m] += c * power[m];
      denominator[m] += sign * c * power[m];
    }
  }
  solveInPlace(denominator, numerator, n);
  let result = numerator;
  for (let k = 0; k < squarings; k += 1) {
    multiplyInto(spare, result, result, n);
    [result, spare] = [spare, result];
  }
  return result;
}

/**
 * e^A for a square matrix A (rows of plain numbers). Dimensionless: for a
 * continuous system ẋ = Ax pass A·h (h in s) to get the transition over h.
 * Throws a RangeError for a non-square or non-finite matrix (a programming error, not user input).
 */
export function matrixExponential(matrix: readonly (readonly number[])[]): number[][] {
  const n = matrix.length;
  const flat = new Float64Array(n * n);
  for (let i = 0; i < n; i += 1) {
    if (matrix[i].length !== n) throw new RangeError(`matrixExponential needs a square matrix, row ${i} has ${matrix[i].length} entries for ${n} rows`);
    for (let j = 0; j < n; j += 1) flat[i * n + j] = matrix[i][j];
  }
  const result = matrixExponentialOf(flat, n);
  const rows: number[][] = [];
  for (let i = 0; i < n; i += 1) rows.push(Array.from(result.subarray(i * n, i * n + n)));
  return rows;
}
