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
 * u[k−1] … u[k−ℓ−1] are a shift register; the controller is realised in transposed
 * direct form from its z⁻¹ coefficients; u[k] = C(z)·e[k], e[k] = −y[k]. The loop is
 * stable iff every eigenvalue of the closed-loop matrix has |z| < 1 − tolerance; one
 * within the tolerance of the unit circle is 'marginal' (on the boundary: not stable).
 */
import { EigenvalueDecomposition, Matrix } from 'ml-matrix';
import { SpeedbandError } from '../core/errors.js';
import { controllableCanonicalForm } from '../lti/state-space.js';
import { zeroOrderHoldDiscretisation } from '../lti/time-response.js';
import { transferFunction } from '../lti/transfer-function.js';

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

/** Relative rounding under which a delay counts as a whole number of samples. */
const WHOLE_SAMPLE_TOLERANCE = 1e-9;

/** θ = ℓ·Ts + m with 0 ≤ m < Ts, a remainder within rounding of 0 or Ts snapped to a whole sample. */
export function splitDelay(delay_s: number, sampleTime_s: number): { wholeSamples: number; fraction_s: number } {
  const ratio = delay_s / sampleTime_s;
  const nearest = Math.round(ratio);
  if (Math.abs(ratio - nearest) <= WHOLE_SAMPLE_TOLERANCE * Math.max(1, ratio)) return { wholeSamples: nearest, fraction_s: 0 };
  const wholeSamples = Math.floor(ratio);
  return { wholeSamples, fraction_s: delay_s - wholeSamples * sampleTime_s };
}

/** Controller C(z) as b(z⁻¹)/a(z⁻¹) with a[0] = 1, both of length q + 1. Throws for a non-causal C(z). */
function controllerInDelays(controller: SampledLoop['controller']): { b: number[]; a: number[] } {
  const { numerator, denominator } = controller;
  if (numerator.length > denominator.length || denominator[0] === 0) {
    throw new SpeedbandError(
      'verify.invalidController',
      `the discrete controller has numerator degree ${numerator.length - 1} above denominator degree ${denominator.length - 1} in z (or a zero leading denominator coefficient): it would need future errors — give C(z) coefficients in powers of z, highest first, with a non-zero leading denominator coefficient`,
      { location: { jsonPath: 'discreteController' }, details: { numerator: [...numerator], denominator: [...denominator] } },
    );
  }
  const lead = denominator[0];
  const a = denominator.map((c) => c / lead);
  const b = new Array<number>(denominator.length - numerator.length).fill(0).concat(numerator.map((c) => c / lead));
  return { b, a };
}

/**
 * The exact closed-loop verdict of a plant (with delay θ, s) under a discrete controller
 * C(z) at sample time Ts (s) with a zero-order hold; see the module comment for the
 * model. `tolerance` (dimensionless) is the distance below |z| = 1 a pole needs to count
 * as stable. Throws `verify.invalidController` for a non-causal C(z) and
 * `lti.improperTransferFunction` for an improper plant.
 */
export function sampledLoopVerdict(loop: SampledLoop, tolerance: number): SampledVerdict {
  const ts = loop.sampleTime_s;
  const model = controllableCanonicalForm(transferFunction(loop.plant.numerator, loop.plant.denominator, 0));
  const n = model.inputVector.length;
  const { wholeSamples: ell, fraction_s: m } = splitDelay(loop.plant.delay_s, ts);
  const late = zeroOrderHoldDiscretisation(model, ts - m); // Φ(Ts − m), Γ0
  const early = zeroOrderHoldDiscretisation(model, m); // Φ(m), ∫₀^m e^(Aσ)dσ·B
  const transition = multiplyMatrices(late.transition, early.transition);
  const gamma0 = late.inputGain;
  const gamma1 = late.transition.map((row) => row.reduce((sum, value, j) => sum + value * early.inputGain[j], 0));

  const { b, a } = controllerInDelays(loop.controller);
  const q = a.length - 1;
  const registerLength = ell + 1; // u[k−1] … u[k−ℓ−1]
  const size = n + registerLength + q;
  const reg = (i: number): number => n + i - 1; // index of u[k−i], i = 1 … ℓ+1
  const ctl = (i: number): number => n + registerLength + i; // controller state i = 0 … q−1

  // e[k] = −y[k] = −(C·x + D·u[k−ℓ−1]) as a row over the closed-loop state.
  const error = new Float64Array(size);
  for (let j = 0; j < n; j++) error[j] = -model.outputVector[j];
  error[reg(registerLength)] -= model.feedthrough;
  // u[k] = s1[k] + b0·e[k] (transposed direct form).
  const input = new Float64Array(size);
  for (let j = 0; j < size; j++) input[j] = b[0] * error[j];
  if (q > 0) input[ctl(0)] += 1;

  const matrix: number[][] = Array.from({ length: size }, () => new Array<number>(size).fill(0));
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) matrix[i][j] = transition[i][j];
    // Γ0·u[k−ℓ]: the current output when ℓ = 0, else the register.
    if (ell === 0) for (let j = 0; j < size; j++) matrix[i][j] += gamma0[i] * input[j];
    else matrix[i][reg(ell)] += gamma0[i];
    matrix[i][reg(registerLength)] += gamma1[i];
  }
  for (let j = 0; j < size; j++) matrix[reg(1)][j] = input[j];
  for (let i = 2; i <= registerLength; i++) matrix[reg(i)][reg(i - 1)] = 1;
  // s_i[k+1] = s_(i+1)[k] + b_i·e[k] − a_i·u[k], i = 1 … q (s_(q+1) = 0).
  for (let i = 1; i <= q; i++) {
    const row = matrix[ctl(i - 1)];
    for (let j = 0; j < size; j++) row[j] = b[i] * error[j] - a[i] * input[j];
    if (i < q) row[ctl(i)] += 1;
  }

  const decomposition = new EigenvalueDecomposition(new Matrix(matrix), { assumeSymmetric: false });
  const re = decomposition.realEigenvalues;
  const im = decomposition.imaginaryEigenvalues;
  let largest = 0;
  for (let i = 0; i < re.length; i++) largest = Math.max(largest, Math.hypot(re[i], im[i]));
  const verdict = !Number.isFinite(largest) ? 'unstable' : largest < 1 - tolerance ? 'stable' : largest <= 1 + tolerance ? 'marginal' : 'unstable';
  return { verdict, largestPoleMagnitude: largest, wholeSampleDelay: ell, fractionalDelay_s: m, closedLoopOrder: size };
}

function multiplyMatrices(left: readonly (readonly number[])[], right: readonly (readonly number[])[]): number[][] {
  return left.map((row) => right[0].map((_, j) => row.reduce((sum, value, k) => sum + value * right[k][j], 0)));
}
