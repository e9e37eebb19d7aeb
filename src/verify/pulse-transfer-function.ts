/**
 * The pulse transfer function of a sampled plant (sampled-plant.ts), by the Faddeev–LeVerrier
 * recursion (no root finding).
 */
import { multiplyMatrices, type SampledPlant } from './sampled-plant.js';

/**
 * The pulse transfer function of a sampled plant, G(z) = B(z)/(A(z)·z^(ℓ+1)) with
 * B(z) = C·adj(zI − Φ)·(Γ0·z + Γ1) + D·det(zI − Φ) and A(z) = det(zI − Φ) (monic, its roots
 * the eigenvalues e^(pᵢ·Ts) of Φ), both degree n, coefficients in powers of z highest first
 * (dimensionless); det and adj by the Faddeev–LeVerrier recursion.
 */
export function pulseTransferFunction(plant: SampledPlant): { readonly numerator: number[]; readonly denominator: number[] } {
  const n = plant.inputGainCurrent.length;
  const { characteristic, adjugate } = faddeevLeVerrier(plant.transition);
  const numerator = new Array<number>(n + 1).fill(0);
  adjugate.forEach((term, k) => {
    // term multiplies z^(n−1−k): Γ0·z lands on z^(n−k), Γ1 on z^(n−1−k).
    numerator[k] += quadratic(plant.outputVector, term, plant.inputGainCurrent);
    numerator[k + 1] += quadratic(plant.outputVector, term, plant.inputGainPrevious);
  });
  for (let i = 0; i <= n; i++) numerator[i] += plant.feedthrough * characteristic[i];
  return { numerator, denominator: characteristic };
}

/**
 * det(zI − M) = z^n + c1·z^(n−1) + … + cn (returned highest first, with the leading 1) and
 * adj(zI − M) = Σ_k N_k·z^(n−1−k) by the Faddeev–LeVerrier recursion: N_0 = I,
 * c_k = −tr(M·N_(k−1))/k, N_k = M·N_(k−1) + c_k·I (Gantmacher, The Theory of Matrices, §IV.4).
 * For the small plant orders here (n ≤ 6) it is accurate to rounding.
 */
function faddeevLeVerrier(matrix: readonly (readonly number[])[]): { characteristic: number[]; adjugate: number[][][] } {
  const n = matrix.length;
  const characteristic = [1];
  const adjugate: number[][][] = [];
  let term: number[][] = Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => (i === j ? 1 : 0)));
  for (let k = 1; k <= n; k++) {
    adjugate.push(term);
    const product = multiplyMatrices(matrix, term);
    let trace = 0;
    for (let i = 0; i < n; i++) trace += product[i][i];
    const coefficient = -trace / k;
    characteristic.push(coefficient);
    for (let i = 0; i < n; i++) product[i][i] += coefficient;
    term = product;
  }
  return { characteristic, adjugate };
}

/** cᵀ·M·g for a row vector c, a square matrix M and a column vector g. */
function quadratic(row: readonly number[], matrix: readonly (readonly number[])[], column: readonly number[]): number {
  let sum = 0;
  for (let i = 0; i < row.length; i++) {
    let inner = 0;
    for (let j = 0; j < column.length; j++) inner += matrix[i][j] * column[j];
    sum += row[i] * inner;
  }
  return sum;
}
