/**
 * The speeds of the dense ("frozen speed") check, docs/domain.md §5: interpolation can break
 * margins that hold at every breakpoint, so the check runs between them too.
 */
import { SpeedbandError } from '../core/errors.js';
import type { SpeedRange } from './types.js';

/**
 * Check speeds, m/s: `density` evenly spaced speeds from range.minimum_mps to range.maximum_mps
 * (both ends exact), plus every breakpoint and every midpoint between neighbouring breakpoints
 * (so at least `density` speeds), sorted increasing, each speed once.
 * Breakpoints outside the range are still included (the table is checked where it is defined).
 */
export function checkGrid(breakpoints_mps: readonly number[], range: SpeedRange, density: number): Float64Array {
  const { minimum_mps: minimum, maximum_mps: maximum } = range;
  if (!Number.isFinite(minimum) || !Number.isFinite(maximum) || !(maximum > minimum)) {
    throw new SpeedbandError(
      'schedule.rangeInvalid',
      `the check range is ${minimum} to ${maximum} m/s — give finite speeds with the maximum above the minimum`,
      { details: { minimum_mps: minimum, maximum_mps: maximum } },
    );
  }
  if (!Number.isInteger(density) || density < 2) {
    throw new SpeedbandError('schedule.densityInvalid', `the check density is ${density} — give a whole number of speeds, at least 2 (default 200)`);
  }
  const speeds: number[] = [];
  const step = (maximum - minimum) / (density - 1);
  for (let i = 0; i < density - 1; i += 1) speeds.push(minimum + i * step);
  speeds.push(maximum);
  const sortedBreakpoints = [...breakpoints_mps].sort((a, b) => a - b);
  for (let k = 0; k < sortedBreakpoints.length; k += 1) {
    const speed = sortedBreakpoints[k];
    if (!Number.isFinite(speed)) {
      throw new SpeedbandError('schedule.tableInvalid', `breakpoint speed ${speed} is not a finite number of m/s`);
    }
    speeds.push(speed);
    if (k > 0) speeds.push((sortedBreakpoints[k - 1] + speed) / 2);
  }
  speeds.sort((a, b) => a - b);
  const unique: number[] = [];
  for (const speed of speeds) if (unique.length === 0 || speed !== unique[unique.length - 1]) unique.push(speed);
  return Float64Array.from(unique);
}
