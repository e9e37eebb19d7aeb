/**
 * Variable projection for step responses that are linear in their gain and output bias,
 * y ≈ K·x(α) + b, where x is the unit-gain response and α the remaining (nonlinear) parameters
 * (Golub & Pereyra 1973, "The differentiation of pseudo-inverses and nonlinear least squares
 * problems whose variables separate"). For fixed α the best K and b solve a 2×2 linear least-squares
 * problem; the fit then searches α alone. The Jacobian of the projected residual is taken in
 * Kaufman's form (Kaufman 1975, BIT 15): ∂ŷ/∂α_k ≈ P⊥·K·∂x/∂α_k, P⊥ the projection orthogonal to
 * span{x, 1} (span{x} with a fixed bias). It drops a term orthogonal to the residual, so the gradient
 * Jᵀr — and hence every stationary point — is exact.
 */

/** Best gain and bias for a unit-gain response, and the sum of squares left. */
export interface LinearPart {
  readonly gain: number;
  /** The fitted bias, or the fixed one. Output units. */
  readonly bias: number;
  readonly ssr: number;
}

/** What a least-squares line through the origin-shifted data has: a slope and an offset, or a slope only (offset 0). */
export type LineTerms = 'slopeAndOffset' | 'slopeOnly';

/** Least-squares line v − shift ≈ slope·x + offset (offset 0 with 'slopeOnly'). */
function fitLine(v: Float64Array, x: Float64Array, shift: number, terms: LineTerms): { slope: number; offset: number } {
  const n = v.length;
  let sx = 0;
  let sv = 0;
  let sxx = 0;
  let sxv = 0;
  for (let i = 0; i < n; i++) {
    const y = v[i] - shift;
    sx += x[i];
    sv += y;
    sxx += x[i] * x[i];
    sxv += x[i] * y;
  }
  if (terms === 'slopeOnly') return { slope: sxx !== 0 ? sxv / sxx : 0, offset: 0 };
  const det = n * sxx - sx * sx;
  const slope = det !== 0 ? (n * sxv - sx * sv) / det : 0;
  return { slope, offset: (sv - slope * sx) / n };
}

/** Best K (and b, unless `fixedBias` is given) for y ≈ K·x + b by linear least squares. */
export function projectGainAndBias(output: Float64Array, x: Float64Array, fixedBias: number | null): LinearPart {
  const shift = fixedBias ?? 0;
  const { slope: gain, offset } = fitLine(output, x, shift, fixedBias === null ? 'slopeAndOffset' : 'slopeOnly');
  let ssr = 0;
  for (let i = 0; i < output.length; i++) {
    const r = output[i] - shift - gain * x[i] - offset;
    ssr += r * r;
  }
  return { gain, bias: fixedBias === null ? offset : fixedBias, ssr };
}

/** v ← P⊥·v in place: v minus its least-squares fit by span{x, 1} ('slopeAndOffset': a fitted bias) or span{x} ('slopeOnly'). */
export function projectOrthogonal(v: Float64Array, x: Float64Array, terms: LineTerms): Float64Array {
  const { slope, offset } = fitLine(v, x, 0, terms);
  for (let i = 0; i < v.length; i++) v[i] -= slope * x[i] + offset;
  return v;
}
