/**
 * Stability from the closed-loop poles: roots of D(s)·Dp(s) + N(s)·Np(s), the delay
 * replaced by a Padé approximant Np/Dp whose order is chosen by `padeOrderFor` from
 * ω·θ over the band where the loop gain matters (docs/domain.md §5b: a first-order Padé
 * puts the limit of k·e^(−θs)/s at kθ = 2 instead of π/2). The approximant is
 * all-pass, so |L| is exact on the axis and only frequencies where |L| is near 1 can
 * move a closed-loop pole across it: the band is where |L| ≥ a threshold.
 */
import { PADE_DEFAULTS, padeApproximant, padeOrderFor } from '../lti/pade.js';
import { addPolynomials, multiplyPolynomials } from '../lti/polynomial.js';
import { polynomialRoots } from '../lti/roots.js';

export interface PoleVerdict {
  /** 'marginal' when the rightmost pole is within tolerance of the imaginary axis. */
  readonly verdict: 'stable' | 'unstable' | 'marginal';
  /** Largest real part of the closed-loop poles, 1/s. */
  readonly largestRealPart: number;
  readonly padeOrder: number;
  /** False when the band needed more than the largest Padé order (the order was capped). */
  readonly padeWithinBound: boolean;
}

const orderCache = new Map<number, number>();

/** Beyond this ω·θ (rad) every order up to the maximum misses the 1° bound: one cache entry serves them all. */
const LARGEST_KEY = 64;

/** padeOrderFor on x = ω·θ rounded up to a quarter (memoised; rounding up only raises the order). */
function orderFor(normalisedFrequency: number): { order: number; withinBound: boolean } {
  const key = Math.min(Math.ceil(normalisedFrequency * 4) / 4, LARGEST_KEY);
  const cached = orderCache.get(key);
  if (cached !== undefined) return { order: cached, withinBound: cached <= PADE_DEFAULTS.maximumOrder };
  let order: number;
  try {
    order = padeOrderFor(1, key);
  } catch {
    order = PADE_DEFAULTS.maximumOrder + 1; // marker: capped below
  }
  orderCache.set(key, order);
  return { order, withinBound: order <= PADE_DEFAULTS.maximumOrder };
}

/**
 * Closed-loop poles of 1 + N/D·e^(−θs) = 0 with a Padé approximant good to 1° of phase
 * up to bandFrequency_radps. A pole with |Re| ≤ relativeTolerance·max|pole| counts as
 * on the axis ('marginal'), so a pole nudged from 0 to +1e−14 by arithmetic flips nothing.
 */
export function closedLoopPoleVerdict(
  numerator: readonly number[],
  denominator: readonly number[],
  delay_s: number,
  bandFrequency_radps: number,
  relativeTolerance: number,
): PoleVerdict {
  if (delay_s === 0) return poleVerdictWithOrder(numerator, denominator, 0, 0, true, relativeTolerance);
  const chosen = orderFor(delay_s * bandFrequency_radps);
  return poleVerdictWithOrder(numerator, denominator, delay_s, Math.max(1, Math.min(chosen.order, PADE_DEFAULTS.maximumOrder)), chosen.withinBound, relativeTolerance);
}

/** As closedLoopPoleVerdict with a given Padé order (≥ 1 with a delay; ignored without one). */
export function closedLoopPoleVerdictAtOrder(numerator: readonly number[], denominator: readonly number[], delay_s: number, order: number, relativeTolerance: number): PoleVerdict {
  return poleVerdictWithOrder(numerator, denominator, delay_s, delay_s === 0 ? 0 : order, true, relativeTolerance);
}

function poleVerdictWithOrder(
  numerator: readonly number[],
  denominator: readonly number[],
  delay_s: number,
  padeOrder: number,
  padeWithinBound: boolean,
  relativeTolerance: number,
): PoleVerdict {
  let characteristic: number[];
  if (delay_s > 0) {
    const pade = padeApproximant(delay_s, padeOrder);
    characteristic = addPolynomials(multiplyPolynomials(denominator, pade.denominator), multiplyPolynomials(numerator, pade.numerator));
  } else {
    characteristic = addPolynomials([...denominator], [...numerator]);
  }
  if (characteristic.length <= 1) {
    return { verdict: characteristic[0] === 0 ? 'marginal' : 'stable', largestRealPart: -Infinity, padeOrder, padeWithinBound };
  }
  const poles = polynomialRoots(characteristic);
  let largestRealPart = -Infinity;
  let scale = 0;
  for (const pole of poles) {
    largestRealPart = Math.max(largestRealPart, pole.re);
    scale = Math.max(scale, Math.hypot(pole.re, pole.im));
  }
  const tolerance = relativeTolerance * scale;
  const verdict = largestRealPart > tolerance ? 'unstable' : largestRealPart >= -tolerance ? 'marginal' : 'stable';
  return { verdict, largestRealPart, padeOrder, padeWithinBound };
}
