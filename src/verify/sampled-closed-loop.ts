/**
 * The closed-loop state matrix of a sampled-data loop: the plant's zero-order-hold equivalent with
 * its fractional delay (sampled-plant.ts), the register of past controller outputs that carries the
 * whole samples of delay, and the discrete controller C(z) in observable canonical form (direct
 * form II transposed; Åström & Wittenmark, Computer-Controlled Systems, 3rd ed., §2.5). Unity
 * negative feedback, e[k] = −y[k]:
 *
 *   x[k+1] = Φ·x[k] + Γ0·u[k−ℓ] + Γ1·u[k−ℓ−1]          plant (n states)
 *   wᵢ[k]  = u[k−i],  i = 1 … ℓ+1                        register (ℓ+1 states; ℓ when u[k−ℓ−1] is unused)
 *   u[k]   = ξ₁[k] + b₀·e[k]
 *   ξᵢ[k+1] = ξᵢ₊₁[k] − aᵢ·ξ₁[k] + (bᵢ − aᵢ·b₀)·e[k]      controller (q states), C(z) = Σbᵢz⁻ⁱ / Σaᵢz⁻ⁱ
 *   e[k]   = −(C·x[k] + D·w_(ℓ+1)[k])
 *
 * Its eigenvalues are the closed-loop poles in z. Building the matrix from Φ keeps the slow poles
 * near z = 1 as accurate as Φ itself; the characteristic polynomial would lose them to rounding
 * (its coefficients cancel there).
 */
import { controllerInDelays, type SampledPlant } from './sampled-plant.js';

/** The closed-loop state matrix, row-major, and its order N = n + ℓ + 1 + q. */
export interface SampledClosedLoopMatrix {
  readonly matrix: Float64Array;
  readonly size: number;
}

/**
 * Length of the delay register: ℓ + 1 past outputs, or ℓ when the oldest one reaches neither the plant (Γ1 = 0: a
 * whole number of samples of delay) nor the measurement (D = 0) — it would only add an eigenvalue at 0.
 */
function registerLengthOf(plant: SampledPlant): number {
  const oldestUsed = plant.feedthrough !== 0 || plant.inputGainPrevious.some((value) => value !== 0);
  return plant.wholeSampleDelay + (oldestUsed ? 1 : 0);
}

/** Order of the closed-loop state (plant + delay register + controller) without building it. */
export function sampledClosedLoopOrder(
  plant: SampledPlant,
  controller: { readonly numerator: readonly number[]; readonly denominator: readonly number[] },
): number {
  return plant.inputGainCurrent.length + registerLengthOf(plant) + Math.max(controller.denominator.length, controller.numerator.length) - 1;
}

/**
 * The closed-loop state matrix of `plant` (from `sampledPlant`) under C(z) (coefficients in powers
 * of z, highest first; throws `verify.invalidController` when non-causal), see the module comment.
 */
export function sampledClosedLoopMatrix(
  plant: SampledPlant,
  controller: { readonly numerator: readonly number[]; readonly denominator: readonly number[] },
): SampledClosedLoopMatrix {
  const { b, a } = controllerInDelays(controller);
  const n = plant.inputGainCurrent.length;
  const ell = plant.wholeSampleDelay;
  const registerLength = registerLengthOf(plant);
  const oldestUsed = registerLength > ell;
  const q = a.length - 1;
  const size = n + registerLength + q;
  const register = n; // w₁ at index n, wᵢ at n + i − 1
  const control = n + registerLength; // ξ₁ at this index
  const matrix = new Float64Array(size * size);
  // e = −(C·x + D·w_(ℓ+1)) and u = ξ₁ + b₀·e as rows over the state.
  const errorRow = new Float64Array(size);
  for (let j = 0; j < n; j++) errorRow[j] = -plant.outputVector[j];
  if (oldestUsed) errorRow[register + ell] -= plant.feedthrough;
  const outputRow = new Float64Array(size);
  for (let j = 0; j < size; j++) outputRow[j] = b[0] * errorRow[j];
  if (q > 0) outputRow[control] += 1;

  const addRow = (row: number, vector: Float64Array, factor: number): void => {
    if (factor === 0) return;
    for (let j = 0; j < size; j++) matrix[row * size + j] += factor * vector[j];
  };
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) matrix[i * size + j] = plant.transition[i][j];
    if (ell === 0) addRow(i, outputRow, plant.inputGainCurrent[i]);
    else matrix[i * size + register + ell - 1] += plant.inputGainCurrent[i];
    if (oldestUsed) matrix[i * size + register + ell] += plant.inputGainPrevious[i];
  }
  if (registerLength > 0) addRow(register, outputRow, 1);
  for (let i = 1; i < registerLength; i++) matrix[(register + i) * size + register + i - 1] = 1;
  for (let i = 0; i < q; i++) {
    const row = control + i;
    if (i + 1 < q) matrix[row * size + control + i + 1] = 1;
    matrix[row * size + control] -= a[i + 1];
    addRow(row, errorRow, b[i + 1] - a[i + 1] * b[0]);
  }
  return { matrix, size };
}
