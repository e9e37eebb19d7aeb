/**
 * Padé approximants of a pure delay e^(−θs), for closed-loop pole computations
 * (margins and frequency responses use the exact delay instead).
 */
import { SpeedbandError } from '../core/errors.js';
import { polynomialRoots } from './roots.js';
import { seriesConnection, transferFunction } from './transfer-function.js';
import type { Complex, TransferFunction } from './types.js';

export const PADE_DEFAULTS = {
  /** Largest phase error accepted over the band by padeOrderFor, rad (1°). */
  phaseErrorBound_rad: Math.PI / 180,
  /** Highest order padeOrderFor will choose (closed-loop polynomials stay ≤ degree ~20). */
  maximumOrder: 16,
  /** Points on which padeOrderFor samples the phase error over [0, ω·θ]. */
  samples: 256,
} as const;

/**
 * The [n/n] Padé approximant of e^(−θs), θ = delay_s (s), n = order:
 *   numerator   Σ c_k (−θs)^k,  denominator Σ c_k (θs)^k,
 *   c_k = (2n−k)!·n! / ((2n)!·k!·(n−k)!)   (closed form; e.g. Franklin, Powell &
 * Emami-Naeini, Feedback Control of Dynamic Systems, §5.6; order 1 is
 * (1 − θs/2)/(1 + θs/2)). Coefficients highest power first, constant term 1.
 * Computed by the ratio c_k/c_(k−1) = (n−k+1)/((2n−k+1)·k), so no factorial overflows.
 * Throws `lti.invalidPade` for a negative/non-finite delay or an order that is not
 * an integer ≥ 0.
 */
export function padeApproximant(delay_s: number, order: number): { numerator: number[]; denominator: number[] } {
  if (!Number.isFinite(delay_s) || delay_s < 0) {
    throw new SpeedbandError('lti.invalidPade', `Padé approximant of a delay of ${delay_s} s — expected a finite delay ≥ 0 s`, { details: { delay_s, order } });
  }
  if (!Number.isInteger(order) || order < 0) {
    throw new SpeedbandError('lti.invalidPade', `Padé order ${order} — expected an integer ≥ 0 (padeOrderFor chooses one from the frequency band)`, {
      details: { delay_s, order },
    });
  }
  const n = order;
  const coefficients = new Array<number>(n + 1); // c_k times θ^k, ascending k
  coefficients[0] = 1;
  for (let k = 1; k <= n; k++) coefficients[k] = (coefficients[k - 1] * (n - k + 1) * delay_s) / ((2 * n - k + 1) * k);
  const numerator = new Array<number>(n + 1);
  const denominator = new Array<number>(n + 1);
  for (let k = 0; k <= n; k++) {
    denominator[n - k] = coefficients[k];
    numerator[n - k] = k % 2 === 0 ? coefficients[k] : -coefficients[k];
  }
  if (delay_s === 0) return { numerator: [1], denominator: [1] };
  return { numerator, denominator };
}

/** g with its delay replaced by the order-n Padé approximant (delay_s of the result is 0). */
export function replaceDelayWithPade(g: TransferFunction, order: number): TransferFunction {
  const pade = padeApproximant(g.delay_s, order);
  return seriesConnection(transferFunction(g.numerator, g.denominator, 0), transferFunction(pade.numerator, pade.denominator, 0));
}

/**
 * Phase error (rad, ≥ 0) of the order-n Padé approximant against the exact delay,
 * at x = ω·θ (dimensionless, rad). The approximant is all-pass on the imaginary
 * axis with phase −2·Σ_i atan((x − b_i)/(−a_i)) over the roots a_i + j·b_i of its
 * θ = 1 denominator (all in the left half-plane), so the phase is continuous in x
 * without unwrapping; the exact phase is −x.
 */
export function padePhaseError_rad(order: number, normalisedFrequency: number): number {
  return Math.abs(padePhase(padeDenominatorRoots(order), normalisedFrequency) + normalisedFrequency);
}

/**
 * The lowest Padé order whose phase error stays below PADE_DEFAULTS.phaseErrorBound_rad
 * (1°) at every frequency up to maximumFrequency_radps (rad/s) for a delay of
 * delay_s (s). Rule: the error depends only on x = ω·θ and grows with x, so the
 * order is chosen from x_max = ω_max·θ, checked on a grid over [0, x_max]. A first
 * order approximant misplaces stability limits (docs/domain.md §5b): for example it meets
 * the bound only up to x ≈ 0.6, while order 6 holds to x ≈ 7.7 and order 12 to x ≈ 18 (found with this function).
 * Returns 0 for a zero delay. Throws `lti.padeOrderTooHigh` when even
 * PADE_DEFAULTS.maximumOrder is not enough — lower the band or use the exact delay.
 */
export function padeOrderFor(delay_s: number, maximumFrequency_radps: number): number {
  if (!Number.isFinite(delay_s) || delay_s < 0 || !Number.isFinite(maximumFrequency_radps) || maximumFrequency_radps < 0) {
    throw new SpeedbandError(
      'lti.invalidPade',
      `Padé order for delay ${delay_s} s up to ${maximumFrequency_radps} rad/s — expected a finite delay ≥ 0 s and a finite frequency ≥ 0 rad/s`,
      { details: { delay_s, maximumFrequency_radps } },
    );
  }
  const xMax = delay_s * maximumFrequency_radps;
  if (xMax === 0) return 0;
  for (let order = 1; order <= PADE_DEFAULTS.maximumOrder; order++) {
    const roots = padeDenominatorRoots(order);
    // the error grows with x, so the band edge rejects an order at once; the grid then confirms
    let worst = Math.abs(padePhase(roots, xMax) + xMax);
    for (let i = 1; i < PADE_DEFAULTS.samples && worst <= PADE_DEFAULTS.phaseErrorBound_rad; i++) {
      const x = (xMax * i) / PADE_DEFAULTS.samples;
      worst = Math.max(worst, Math.abs(padePhase(roots, x) + x));
    }
    if (worst <= PADE_DEFAULTS.phaseErrorBound_rad) return order;
  }
  throw new SpeedbandError(
    'lti.padeOrderTooHigh',
    `a delay of ${delay_s} s up to ${maximumFrequency_radps} rad/s (ω·θ = ${xMax.toPrecision(4)} rad) needs a Padé order above ${PADE_DEFAULTS.maximumOrder} for a phase error below 1° — analyse with the exact delay (frequency response, Nyquist count) or narrow the band`,
    { details: { delay_s, maximumFrequency_radps, normalisedFrequency: xMax } },
  );
}

/** Roots of the θ = 1 denominators, computed once per order (a constant table, filled on first use). */
const denominatorRootsByOrder: (readonly Complex[] | undefined)[] = [];

function padeDenominatorRoots(order: number): readonly Complex[] {
  if (order === 0) return [];
  let roots = denominatorRootsByOrder[order];
  if (roots === undefined) {
    roots = polynomialRoots(padeApproximant(1, order).denominator);
    denominatorRootsByOrder[order] = roots;
  }
  return roots;
}

function padePhase(roots: readonly Complex[], x: number): number {
  let phase = 0;
  for (const root of roots) phase += Math.atan((x - root.im) / -root.re);
  return -2 * phase;
}
