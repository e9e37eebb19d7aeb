/**
 * The zero-order-hold equivalent of a continuous plant N(s)/D(s)·e^(−θs) sampled at Ts with a
 * fractional delay (modified z-transform; Franklin, Powell & Workman, Digital Control of
 * Dynamic Systems, 3rd ed., §4.3.4; Åström & Wittenmark, Computer-Controlled Systems, §2.3):
 * θ = ℓ·Ts + m (0 ≤ m < Ts),
 *   x[k+1] = Φ·x[k] + Γ0·u[k−ℓ] + Γ1·u[k−ℓ−1],  y[k] = C·x[k] + D·u[k−ℓ−1]
 *   Φ = e^(A·Ts),  Γ0 = ∫₀^(Ts−m) e^(Aσ)dσ·B,  Γ1 = e^(A(Ts−m))·∫₀^m e^(Aσ)dσ·B
 * with (A, B, C, D) the controllable canonical realisation of N/D; y[k] is sampled just
 * before the new output u[k] takes effect. Pulse transfer function
 * G(z) = [C·(zI − Φ)⁻¹·(Γ0·z + Γ1) + D]·z^(−(ℓ+1)).
 */
import { SpeedbandError } from '../core/errors.js';
import { controllableCanonicalForm } from '../lti/state-space.js';
import { zeroOrderHoldDiscretisation } from '../lti/time-response.js';
import { transferFunction } from '../lti/transfer-function.js';

/** The sampled plant as above (all dimensionless per sample except the fraction). */
export interface SampledPlant {
  readonly transition: readonly (readonly number[])[];
  readonly inputGainCurrent: readonly number[];
  readonly inputGainPrevious: readonly number[];
  readonly outputVector: readonly number[];
  readonly feedthrough: number;
  /** ℓ: whole samples of delay. */
  readonly wholeSampleDelay: number;
  /** m: the fractional part of the delay, s (0 ≤ m < Ts). */
  readonly fractionalDelay_s: number;
  /** Ts, s. */
  readonly sampleTime_s: number;
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
export function controllerInDelays(controller: { readonly numerator: readonly number[]; readonly denominator: readonly number[] }): {
  b: number[];
  a: number[];
} {
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
 * The sampled plant of N(s)/D(s)·e^(−θs) (coefficients highest power first, θ = delay_s in s)
 * at sample time Ts (s); see the module comment. Throws `lti.improperTransferFunction` for an
 * improper plant.
 */
export function sampledPlant(
  plant: { readonly numerator: readonly number[]; readonly denominator: readonly number[]; readonly delay_s: number },
  sampleTime_s: number,
): SampledPlant {
  const model = controllableCanonicalForm(transferFunction(plant.numerator, plant.denominator, 0));
  const n = model.inputVector.length;
  const { wholeSamples, fraction_s: m } = splitDelay(plant.delay_s, sampleTime_s);
  const late = zeroOrderHoldDiscretisation(model, sampleTime_s - m); // Φ(Ts − m), Γ0
  const early = m === 0 ? null : zeroOrderHoldDiscretisation(model, m); // Φ(m), ∫₀^m e^(Aσ)dσ·B
  return {
    transition: early === null ? late.transition : multiplyMatrices(late.transition, early.transition),
    inputGainCurrent: late.inputGain,
    inputGainPrevious:
      early === null
        ? new Array<number>(n).fill(0)
        : multiplyMatrices(
            late.transition,
            early.inputGain.map((value) => [value]),
          ).map((row) => row[0]),
    outputVector: model.outputVector,
    feedthrough: model.feedthrough,
    wholeSampleDelay: wholeSamples,
    fractionalDelay_s: m,
    sampleTime_s,
  };
}

/** Product of two matrices (rows of numbers), left n×m times right m×p. */
export function multiplyMatrices(left: readonly (readonly number[])[], right: readonly (readonly number[])[]): number[][] {
  const rows = left.length;
  const inner = right.length;
  const columns = right[0].length;
  const product: number[][] = [];
  for (let i = 0; i < rows; i++) {
    const row = new Array<number>(columns).fill(0);
    const leftRow = left[i];
    for (let k = 0; k < inner; k++) {
      const factor = leftRow[k];
      if (factor === 0) continue;
      const rightRow = right[k];
      for (let j = 0; j < columns; j++) row[j] += factor * rightRow[j];
    }
    product.push(row);
  }
  return product;
}
