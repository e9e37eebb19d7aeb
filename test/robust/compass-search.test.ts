import { describe, expect, it } from 'vitest';
import { COMPASS_SEARCH_DEFAULTS, compassSearch } from '../../src/robust/compass-search.js';

/** Runs a compass search on `f` from `start` and counts its evaluations. */
function run(f: (point: readonly number[]) => number, start: number[], budget = Infinity) {
  let calls = 0;
  const result = compassSearch({
    start,
    startValue: f(start),
    objective: (point) => {
      calls += 1;
      return f(point);
    },
    exhausted: () => calls >= budget,
  });
  return { ...result, calls };
}

describe('compassSearch(…) on the box [0, 1]^k', () => {
  it('climbs a concave quadratic to within its last step of the maximum at (0.3, 0.7)', () => {
    // Source: the maximum of −(x − 0.3)² − (y − 0.7)² is at (0.3, 0.7) (calculus); compass search stops within its
    // last step (Kolda, Lewis & Torczon 2003, SIAM Review 45(3), §1.1: the step bounds the distance to a stationary point).
    const { point } = run(([x, y]) => -((x - 0.3) ** 2) - (y - 0.7) ** 2, [1, 0]);
    expect(Math.abs(point[0] - 0.3)).toBeLessThanOrEqual(COMPASS_SEARCH_DEFAULTS.minimumStep);
    expect(Math.abs(point[1] - 0.7)).toBeLessThanOrEqual(COMPASS_SEARCH_DEFAULTS.minimumStep);
  });

  it('reaches the far corner of a linear function through the box faces (trial points are projected onto the box)', () => {
    // Source: a linear function on a box is largest at a corner (common practice, linear programming).
    const { point, value } = run(([x, y, z]) => x - 2 * y + 0.5 * z, [0.5, 0.5, 0.5]);
    expect(point).toEqual([1, 0, 1]);
    expect(value).toBe(1.5);
  });

  it('never returns a worse point than the start, stops at the budget, and gives the same path every time', () => {
    const f = ([x, y]: readonly number[]) => Math.sin(9 * x) * Math.cos(7 * y);
    const first = run(f, [0.4, 0.4], 5);
    expect(first.calls).toBe(5);
    expect(first.value).toBeGreaterThanOrEqual(f([0.4, 0.4]));
    expect(run(f, [0.4, 0.4], 5)).toEqual(first);
  });

  it('stops at once on +Infinity (an unstable loop: nothing is worse)', () => {
    const { calls, value } = run(([x]) => (x > 0.6 ? Infinity : x), [0.5]);
    expect(value).toBe(Infinity);
    expect(calls).toBe(1);
  });
});
