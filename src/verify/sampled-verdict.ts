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
 * u[k−1] … u[k−ℓ−1] are a shift register and u[k] = C(z)·e[k], e[k] = −y[k].
 *
 * The closed-loop poles are the eigenvalues of the closed-loop state matrix of plant, register
 * and controller (`sampled-closed-loop.ts`, order N = n + ℓ + 1 + deg C), computed by a
 * backward-stable QR iteration with a first-order bound on each eigenvalue's rounding error
 * (src/lti/eigenvalues.ts). The loop is 'stable' when every pole has |z| plus its bound below 1,
 * 'unstable' when some pole has |z| minus its bound above 1, and 'marginal' — on the boundary
 * within the numbers' own precision, named with its pole — otherwise. The characteristic
 * polynomial is not used to decide: with poles at z = 1 (integrators) its coefficients cancel
 * and a root test on it (Schur–Cohn, Jury) loses the slow closed-loop poles to rounding. Past
 * `ANALYSIS_DEFAULTS.sampledEigenvalueMaximumOrder` (a delay register of hundreds of samples)
 * the argument principle on the exact pulse frequency response decides (`sampled-nyquist.ts`).
 */
import { backwardError, eigenvalueCondition, eigenvalues } from '../lti/eigenvalues.js';
import { ANALYSIS_DEFAULTS } from './defaults.js';
import { sampledClosedLoopMatrix, sampledClosedLoopOrder } from './sampled-closed-loop.js';
import { sampledPlant, type SampledPlant } from './sampled-plant.js';
import { sampledNyquistCount } from './sampled-nyquist.js';
import type { PlantPoles } from './pole-counts.js';
import { plantPoleCounts } from './pole-counts.js';

export { splitDelay } from './sampled-plant.js';
export { pulseTransferFunction } from './pulse-transfer-function.js';

/** A plant under a discrete controller, as the firmware runs it. */
export interface SampledLoop {
  /** Continuous plant N(s)/D(s)·e^(−θs), coefficients highest power first; delay_s = θ (s) includes the computation latency. */
  readonly plant: { readonly numerator: readonly number[]; readonly denominator: readonly number[]; readonly delay_s: number };
  /** C(z) coefficients in powers of z, highest first (for equal lengths these are the z⁻¹ coefficients from z⁰ on). */
  readonly controller: { readonly numerator: readonly number[]; readonly denominator: readonly number[] };
  readonly sampleTime_s: number;
}

/** One closed-loop pole in z with the bound of its rounding error. */
export interface ClosedLoopPole {
  readonly re: number;
  readonly im: number;
  /** |z|, dimensionless. */
  readonly magnitude: number;
  /** First-order bound of the error of |z| from rounding (κ(λ)·η, see src/lti/eigenvalues.ts); 0 when not computed. */
  readonly errorBound: number;
}

/** The sampled-data verdict and what it rests on. */
export interface SampledVerdict {
  /**
   * 'stable': every closed-loop pole has |z| + its error bound < 1; 'unstable': some pole has
   * |z| − its bound > 1; 'marginal': the deciding pole lies within its bound of the unit circle.
   */
  readonly verdict: 'stable' | 'unstable' | 'marginal';
  /** How the verdict was reached: the eigenvalues of the closed-loop state matrix, or (for a very long delay register) the argument principle on the exact pulse frequency response. */
  readonly method: 'eigenvalues' | 'argument principle';
  /** Largest closed-loop pole magnitude |z| (dimensionless); null when decided by the argument principle. */
  readonly largestPoleMagnitude: number | null;
  /** The pole that decides: the largest |z| (upper member of a pair); null when decided by the argument principle. */
  readonly decidingPole: ClosedLoopPole | null;
  /** Time constant of the slowest closed-loop pole, −Ts/ln|z|, s; null when that pole is not inside the unit circle or not known. */
  readonly slowestTimeConstant_s: number | null;
  /**
   * Largest |z| of the closed-loop poles at high frequency (|arg z| ≥ π/2); null when not known. Such a pole near
   * the circle (a Tustin derivative filter's pole near z = −1, say) is moved by a fraction of a sample of delay.
   */
  readonly highFrequencyPoleMagnitude: number | null;
  /** Why the verdict is marginal (the pole, its distance from the circle and its bound), or how it was reached when not by eigenvalues. */
  readonly note: string | null;
  /** ℓ: whole samples of delay. */
  readonly wholeSampleDelay: number;
  /** m: the fractional part of the delay, s (0 ≤ m < Ts). */
  readonly fractionalDelay_s: number;
  /** Size of the closed-loop state (plant + delay register + controller). */
  readonly closedLoopOrder: number;
}

/**
 * The exact closed-loop verdict of a plant (with delay θ, s) under a discrete controller C(z) at
 * sample time Ts (s) with a zero-order hold; see the module comment. Throws
 * `verify.invalidController` for a non-causal C(z) and `lti.improperTransferFunction` for an
 * improper plant.
 */
export function sampledLoopVerdict(loop: SampledLoop): SampledVerdict {
  return sampledVerdictOf({
    plant: sampledPlant(loop.plant, loop.sampleTime_s),
    controller: loop.controller,
    sampleTime_s: loop.sampleTime_s,
    plantPoles: plantPoleCounts(loop.plant.denominator),
  });
}

/**
 * As sampledLoopVerdict, for a plant already sampled by `sampledPlant`; `plantPoles` (the continuous
 * plant's origin, right-half-plane and other axis poles) serve the argument-principle fallback, which
 * decides past `maximumEigenvalueOrder`.
 */
export function sampledVerdictOf(loop: {
  readonly plant: SampledPlant;
  readonly controller: SampledLoop['controller'];
  readonly sampleTime_s: number;
  readonly plantPoles: PlantPoles;
  /** Closed-loop orders up to this are decided by eigenvalues; default ANALYSIS_DEFAULTS.sampledEigenvalueMaximumOrder. */
  readonly maximumEigenvalueOrder?: number;
}): SampledVerdict {
  const { plant, controller, sampleTime_s, plantPoles } = loop;
  const maximumEigenvalueOrder = loop.maximumEigenvalueOrder ?? ANALYSIS_DEFAULTS.sampledEigenvalueMaximumOrder;
  const common = {
    wholeSampleDelay: plant.wholeSampleDelay,
    fractionalDelay_s: plant.fractionalDelay_s,
    closedLoopOrder: sampledClosedLoopOrder(plant, controller),
  };
  if (common.closedLoopOrder <= maximumEigenvalueOrder) {
    const { matrix, size } = sampledClosedLoopMatrix(plant, controller);
    const finite = matrix.every(Number.isFinite);
    const result = finite ? eigenvalues(matrix, size) : null;
    if (result?.converged) return { ...common, ...judgePoles(result, size, sampleTime_s) };
  }
  // A very long delay register (or a QR iteration that did not converge): the argument principle decides.
  const count = sampledNyquistCount(plant, controller, plantPoles);
  const verdict = count.verdict === 'stable' || count.verdict === 'unstable' || count.verdict === 'marginal' ? count.verdict : 'marginal';
  const why =
    common.closedLoopOrder > maximumEigenvalueOrder
      ? `the closed-loop order ${common.closedLoopOrder} exceeds ${maximumEigenvalueOrder}`
      : 'the eigenvalue iteration did not converge';
  return {
    ...common,
    verdict,
    method: 'argument principle',
    largestPoleMagnitude: null,
    decidingPole: null,
    slowestTimeConstant_s: null,
    highFrequencyPoleMagnitude: null,
    note: `decided by the Nyquist count on the exact pulse frequency response: ${why}${count.reason === null ? '' : ` (${count.reason})`}`,
  };
}

/**
 * Poles farther than this from the unit circle need no condition number: their rounding bound would
 * have to exceed it, i.e. κ > 1e−3/η ≈ 1e8 — an eigenvalue that ill-conditioned is a defective
 * cluster, which sits at the circle in these loops (the integrators at z = 1), not in the interior.
 */
const CONDITION_WITHIN = 1e-3;

function judgePoles(
  result: ReturnType<typeof eigenvalues>,
  size: number,
  sampleTime_s: number,
): Omit<SampledVerdict, 'wholeSampleDelay' | 'fractionalDelay_s' | 'closedLoopOrder'> {
  const eta = backwardError(result, size);
  let largest: ClosedLoopPole | null = null;
  let straddling: ClosedLoopPole | null = null;
  let outside = false;
  let highFrequency = 0;
  for (let i = 0; i < size; i++) {
    const re = result.re[i];
    const im = result.im[i];
    if (im < 0) continue; // the pair's upper member stands for both
    const magnitude = Math.hypot(re, im);
    if (re <= 0) highFrequency = Math.max(highFrequency, magnitude);
    const bound = Math.abs(magnitude - 1) > CONDITION_WITHIN ? 0 : Math.min(eigenvalueCondition(result, size, { re, im }) * eta, Number.MAX_VALUE);
    const pole: ClosedLoopPole = { re, im, magnitude, errorBound: bound };
    if (largest === null || magnitude > largest.magnitude) largest = pole;
    if (magnitude - bound > 1) outside = true;
    else if (magnitude + bound >= 1 && (straddling === null || magnitude > straddling.magnitude)) straddling = pole;
  }
  const deciding = largest as ClosedLoopPole;
  const verdict = outside ? 'unstable' : straddling !== null ? 'marginal' : 'stable';
  const slowest = deciding.magnitude > 0 && deciding.magnitude < 1 ? -sampleTime_s / Math.log(deciding.magnitude) : null;
  const note =
    verdict === 'marginal' && straddling !== null
      ? `the closed-loop pole z = ${formatPole(straddling)} lies ${Math.abs(1 - straddling.magnitude).toExponential(2)} ${straddling.magnitude < 1 ? 'inside' : 'outside'} the unit circle, within its rounding bound ${straddling.errorBound.toExponential(2)}: on the stability boundary`
      : null;
  return {
    verdict,
    method: 'eigenvalues',
    largestPoleMagnitude: deciding.magnitude,
    decidingPole: deciding,
    slowestTimeConstant_s: slowest,
    highFrequencyPoleMagnitude: highFrequency,
    note,
  };
}

const formatPole = (pole: ClosedLoopPole): string => (pole.im === 0 ? pole.re.toPrecision(9) : `${pole.re.toPrecision(9)} ± ${pole.im.toPrecision(9)}j`);
