/**
 * The exact stability verdict of a sampled-data loop: a continuous plant
 * G(s) = N(s)/D(s)·e^(−θs) driven through a zero-order hold by a discrete controller C(z)
 * at sample time Ts, unity negative feedback. The plant is discretised exactly with
 * the matrix exponential, the delay split as θ = ℓ·Ts + m (0 ≤ m < Ts) — the
 * zero-order-hold equivalent with a fractional delay, i.e. the modified z-transform
 * (Franklin, Powell & Workman, Digital Control of Dynamic Systems, 3rd ed., §4.3.4
 * "systems with delay"; Åström & Wittenmark, Computer-Controlled Systems, 3rd ed., §2.3):
 *
 *   x[k+1] = Φ·x[k] + Γ0·u[k−ℓ] + Γ1·u[k−ℓ−1]
 *   Φ = e^(A·Ts),  Γ0 = ∫₀^(Ts−m) e^(Aσ)dσ·B,  Γ1 = e^(A(Ts−m))·∫₀^m e^(Aσ)dσ·B
 *   y[k] = C·x[k] + D·u[k−ℓ−1]
 *
 * (A, B, C, D) is the controllable canonical realisation of N/D. The sample y[k] is taken
 * at the instant kTs just before the new output u[k] takes effect (left limit), so a
 * biproper plant without delay forms no algebraic loop. The past inputs
 * u[k−1] … u[k−ℓ−1] are a shift register and u[k] = C(z)·e[k], e[k] = −y[k]. The
 * closed-loop poles (the eigenvalues of the closed-loop state matrix of plant, register
 * and controller, size n + ℓ + 1 + deg C) are the roots of its characteristic polynomial
 *   a(z)·det(zI − Φ)·z^(ℓ+1) + b(z)·[C·adj(zI − Φ)·(Γ0·z + Γ1) + D·det(zI − Φ)]
 * with C(z) = b(z)/a(z); det and adj come from the Faddeev–LeVerrier recursion. Where they
 * lie is decided by the Schur–Cohn test (`unit-circle-roots.ts`, O(N²), no root finding: a
 * general eigenvalue routine costs ~0.16 ms at N = 16, too slow for a dense check of 2,000
 * speeds). The loop is stable iff every pole has |z| < 1 − tolerance; a pole within the
 * tolerance of the unit circle is 'marginal' (on the boundary: not stable).
 */
import { addPolynomials, multiplyPolynomials } from '../lti/polynomial.js';
import { controllerInDelays, multiplyMatrices, sampledPlant, type SampledPlant } from './sampled-plant.js';
import { allRootsInside, largestRootMagnitude } from './unit-circle-roots.js';

export { splitDelay } from './sampled-plant.js';

/** A plant under a discrete controller, as the firmware runs it. */
export interface SampledLoop {
  /** Continuous plant N(s)/D(s)·e^(−θs), coefficients highest power first; delay_s = θ (s) includes the computation latency. */
  readonly plant: { readonly numerator: readonly number[]; readonly denominator: readonly number[]; readonly delay_s: number };
  /** C(z) coefficients in powers of z, highest first (for equal lengths these are the z⁻¹ coefficients from z⁰ on). */
  readonly controller: { readonly numerator: readonly number[]; readonly denominator: readonly number[] };
  readonly sampleTime_s: number;
}

/** The sampled-data verdict and what it rests on. */
export interface SampledVerdict {
  /** 'stable': every closed-loop eigenvalue |z| < 1 − tolerance; 'marginal': the largest within the tolerance of 1. */
  readonly verdict: 'stable' | 'unstable' | 'marginal';
  /** Largest closed-loop eigenvalue magnitude |z| (dimensionless). */
  readonly largestPoleMagnitude: number;
  /** ℓ: whole samples of delay. */
  readonly wholeSampleDelay: number;
  /** m: the fractional part of the delay, s (0 ≤ m < Ts). */
  readonly fractionalDelay_s: number;
  /** Size of the closed-loop state (plant + delay register + controller). */
  readonly closedLoopOrder: number;
}

/**
 * The exact closed-loop verdict of a plant (with delay θ, s) under a discrete controller
 * C(z) at sample time Ts (s) with a zero-order hold; see the module comment for the
 * model. `tolerance` (dimensionless) is the distance below |z| = 1 a pole needs to count
 * as stable. Throws `verify.invalidController` for a non-causal C(z) and
 * `lti.improperTransferFunction` for an improper plant.
 */
export function sampledLoopVerdict(loop: SampledLoop, tolerance: number): SampledVerdict {
  return sampledVerdictOf(sampledPlant(loop.plant, loop.sampleTime_s), loop.controller, tolerance);
}

/** As sampledLoopVerdict, for a plant already sampled by `sampledPlant` (and its `pulseTransferFunction`, when already built). */
export function sampledVerdictOf(
  plant: SampledPlant,
  controller: SampledLoop['controller'],
  tolerance: number,
  pulse: { readonly numerator: readonly number[]; readonly denominator: readonly number[] } = pulseTransferFunction(plant),
): SampledVerdict {
  const { numerator: plantNumerator, denominator: characteristic } = pulse;
  const plantDenominator = characteristic.concat(new Array<number>(plant.wholeSampleDelay + 1).fill(0));

  // 1 + C(z)·G(z) = 0 ⇔ a(z)·den(z) + b(z)·num(z) = 0 with C = b/a in powers of z (equal lengths).
  const { b, a } = controllerInDelays(controller);
  const closedLoop = addPolynomials(multiplyPolynomials(a, plantDenominator), multiplyPolynomials(b, plantNumerator));
  const lead = closedLoop[0];
  const monic = closedLoop.map((value) => value / lead);
  const finite = monic.every(Number.isFinite);
  const largest = finite ? largestRootMagnitude(monic, RADIUS_RELATIVE_TOLERANCE) : Infinity;
  const verdict = !finite ? 'unstable' : allRootsInside(monic, 1 - tolerance) ? 'stable' : allRootsInside(monic, 1 + tolerance) ? 'marginal' : 'unstable';
  return { verdict, largestPoleMagnitude: largest, wholeSampleDelay: plant.wholeSampleDelay, fractionalDelay_s: plant.fractionalDelay_s, closedLoopOrder: monic.length - 1 };
}

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

/** Relative width to which the largest |z| is bisected. */
const RADIUS_RELATIVE_TOLERANCE = 1e-9;

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
