/**
 * Compass search on the box [0, 1]^k, to find a worse point near the worst one sampled: the derivative-free
 * pattern search along ± each coordinate (Kolda, Lewis & Torczon 2003, "Optimization by direct search: new
 * perspectives on some classical and modern methods", SIAM Review 45(3), §1.1 "compass search"; for bounds,
 * Lewis & Torczon 1999, SIAM J. Optim. 9(4)). Here it maximises. A trial point is projected onto the box
 * (a coordinate past an end is set to that end), so the search reaches the faces and corners where worst
 * cases usually lie. Opportunistic polling in a fixed order (+e₀, −e₀, +e₁, …): the first better point is
 * taken and the step kept; a poll with no better point halves the step. Deterministic.
 */

export const COMPASS_SEARCH_DEFAULTS = {
  /** First step, as a fraction of each dimension's range. */
  initialStep: 0.25,
  /** The search ends when the step falls below this (1/16 of each range: three step sizes). */
  minimumStep: 1 / 16,
} as const;

export interface CompassSearchInput {
  readonly start: readonly number[];
  readonly startValue: number;
  /** The function to maximise at a point of [0, 1]^k (the caller caches and counts its evaluations). */
  readonly objective: (point: readonly number[]) => number;
  /** True when no further evaluation may be made (the caller's budget). */
  readonly exhausted: () => boolean;
  readonly initialStep?: number;
  readonly minimumStep?: number;
}

export interface CompassSearchResult {
  readonly point: readonly number[];
  readonly value: number;
}

/** Maximise `objective` from `start` by compass search (see the module comment). Stops at +Infinity: nothing is worse. */
export function compassSearch(input: CompassSearchInput): CompassSearchResult {
  let point = [...input.start];
  let value = input.startValue;
  let step = input.initialStep ?? COMPASS_SEARCH_DEFAULTS.initialStep;
  const minimumStep = input.minimumStep ?? COMPASS_SEARCH_DEFAULTS.minimumStep;
  while (step >= minimumStep && value !== Infinity) {
    let moved = false;
    for (let i = 0; i < point.length && !moved; i++) {
      for (const direction of [1, -1]) {
        const coordinate = Math.min(1, Math.max(0, point[i] + direction * step));
        if (coordinate === point[i]) continue;
        if (input.exhausted()) return { point, value };
        const trial = [...point];
        trial[i] = coordinate;
        const trialValue = input.objective(trial);
        if (trialValue > value) {
          point = trial;
          value = trialValue;
          moved = true;
          break;
        }
      }
    }
    if (!moved) step /= 2;
  }
  return { point, value };
}
