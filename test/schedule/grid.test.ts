import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { checkGrid } from '../../src/schedule/grid.js';

describe('checkGrid(breakpoints, range, density)', () => {
  it('has at least density speeds, every breakpoint and midpoint, sorted and unique', () => {
    // Source: docs/domain.md §5 — the dense check must include breakpoints and the speeds between them.
    fc.assert(
      fc.property(
        fc.uniqueArray(fc.double({ min: 0.5, max: 30, noNaN: true }), { minLength: 1, maxLength: 12 }),
        fc.integer({ min: 2, max: 500 }),
        (breakpoints, density) => {
          const grid = Array.from(checkGrid(breakpoints, { minimum_mps: 0.5, maximum_mps: 30 }, density));
          expect(grid.length).toBeGreaterThanOrEqual(density);
          expect(
            grid.findIndex((speed, i) => i > 0 && !(speed > grid[i - 1])),
            'first speed not above the one before',
          ).toBe(-1);
          const sorted = [...breakpoints].sort((a, b) => a - b);
          const members = new Set(grid);
          for (const speed of sorted) expect(members.has(speed)).toBe(true);
          for (let k = 1; k < sorted.length; k += 1) expect(members.has((sorted[k - 1] + sorted[k]) / 2)).toBe(true);
          expect(grid[0]).toBe(0.5);
          expect(grid[grid.length - 1]).toBe(30);
        },
      ),
    );
  });

  it('rejects an empty range and a density below 2 with typed errors', () => {
    expect(() => checkGrid([1], { minimum_mps: 5, maximum_mps: 5 }, 200)).toThrow(expect.objectContaining({ code: 'schedule.rangeInvalid' }));
    expect(() => checkGrid([1], { minimum_mps: 1, maximum_mps: 5 }, 1)).toThrow(expect.objectContaining({ code: 'schedule.densityInvalid' }));
  });
});
