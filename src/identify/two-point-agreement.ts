/**
 * Does Smith's two-point estimate (28.3 % / 63.2 % crossings, `two-point.ts`) agree with the fitted
 * FOPDT of the same step? The estimate is the fit's starting guess and an independent plausibility
 * check: on a truly first-order-plus-dead-time response both read the same K, τ, θ; on a second-order
 * or otherwise shaped response they split the response time differently between τ and θ. One step
 * disagreeing is no error; a large share of steps disagreeing hints that the response is not first order.
 */

/** Tolerances of the comparison, in one place. */
export const TWO_POINT_AGREEMENT = {
  /** |K_two-point / K_fit − 1| at most this. */
  gainFraction: 0.1,
  /** |τ_two-point − τ_fit| and |θ_two-point − θ_fit| each at most this fraction of the fit's τ + θ (its response time scale). */
  timeFraction: 0.25,
} as const;

export interface FopdtParameters {
  /** Steady gain K, output per input unit (the sign is compared too). */
  readonly gain: number;
  readonly timeConstant_s: number;
  readonly deadTime_s: number;
}

/**
 * True when the two-point estimate agrees with the fit within `TWO_POINT_AGREEMENT`: gain within 10 %,
 * time constant and dead time each within 25 % of the fit's τ + θ (times in s). Scaling the time
 * tolerance by τ + θ keeps a near-zero dead time from making any difference look large.
 */
export function twoPointAgreesWithFit(twoPoint: FopdtParameters, fit: FopdtParameters, tolerance: typeof TWO_POINT_AGREEMENT = TWO_POINT_AGREEMENT): boolean {
  const scale_s = Math.abs(fit.timeConstant_s) + Math.abs(fit.deadTime_s);
  const gainAgrees = fit.gain !== 0 && Math.abs(twoPoint.gain / fit.gain - 1) <= tolerance.gainFraction;
  const timesAgree =
    Math.abs(twoPoint.timeConstant_s - fit.timeConstant_s) <= tolerance.timeFraction * scale_s &&
    Math.abs(twoPoint.deadTime_s - fit.deadTime_s) <= tolerance.timeFraction * scale_s;
  return gainAgrees && timesAgree;
}

export interface TwoPointTally {
  /** Steps looked at. */
  readonly steps: number;
  /** Steps whose two-point estimate disagrees with the fit. */
  readonly disagreeing: number;
  /** Steps where no estimate was possible (the response never crossed 63.2 %). */
  readonly withoutEstimate: number;
}

/** Count, over step records of a models file, the two-point estimates that disagree with their fits (`agreesWithFit: false`). */
export function tallyTwoPointAgreement(
  tests: readonly { readonly fopdt: { readonly twoPoint: { readonly agreesWithFit?: boolean } | null } }[],
): TwoPointTally {
  let disagreeing = 0;
  let withoutEstimate = 0;
  for (const test of tests) {
    if (test.fopdt.twoPoint === null) withoutEstimate += 1;
    else if (test.fopdt.twoPoint.agreesWithFit === false) disagreeing += 1;
  }
  return { steps: tests.length, disagreeing, withoutEstimate };
}
