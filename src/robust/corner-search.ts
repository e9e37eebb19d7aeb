/**
 * The corners of the box the worst-case search checks (worst-case.ts). Up to ALL_CORNERS_UP_TO_DIMENSIONS
 * dimensions: every corner. Beyond, where 2^k corners would cost more than the samples: a one-at-a-time screening
 * (each dimension to either end, the others nominal) tells for each figure which end of each dimension is worse;
 * from the corner made of those ends, a coordinate search over the corners (flip one dimension to its other end,
 * move to the worst neighbour, until none is worse) catches interactions that reverse a dimension's effect there.
 */
import { ROBUST_FIGURES, type FigureDefinition } from './figures.js';
import { ALL_CORNERS_UP_TO_DIMENSIONS, allCorners, axisEnds } from './search-points.js';

/**
 * Check the corners (see the module comment). `badnessAt` analyses a point (the caller caches) and says how bad it
 * is for a figure (+Infinity: not stable); `unstable` says whether an unstable point has been found (the search stops).
 */
export function checkCorners(
  k: number,
  nominalPoint: readonly number[],
  badnessAt: (point: readonly number[], definition: FigureDefinition) => number,
  unstable: () => boolean,
): void {
  if (k <= ALL_CORNERS_UP_TO_DIMENSIONS) {
    for (const corner of allCorners(k)) badnessAt(corner, ROBUST_FIGURES[0]);
    return;
  }
  const ends = axisEnds(nominalPoint);
  for (const definition of ROBUST_FIGURES) {
    const bad = (point: readonly number[]): number => badnessAt(point, definition);
    let corner: number[] = Array.from({ length: k }, (_, i) => (bad(ends[2 * i]) > bad(ends[2 * i + 1]) ? 0 : 1));
    let current = bad(corner);
    for (let round = 0; round < k && !unstable() && current !== -Infinity; round++) {
      let best: { corner: number[]; value: number } | null = null;
      for (let i = 0; i < k; i++) {
        const neighbour = [...corner];
        neighbour[i] = 1 - neighbour[i];
        const value = bad(neighbour);
        if (value > current && (best === null || value > best.value)) best = { corner: neighbour, value };
      }
      if (best === null) break;
      corner = best.corner;
      current = best.value;
    }
    if (unstable()) return;
  }
}

/** How the search runs at each speed for a set of `dimensions` varied parameters, in words (recorded in the schedule). */
export function searchMethodWords(dimensions: number): string {
  const corners =
    dimensions <= ALL_CORNERS_UP_TO_DIMENSIONS
      ? `every corner of the box (${2 ** dimensions})`
      : `the corners picked by a one-at-a-time screening of each parameter, then a coordinate search over the corners from the worst one of each figure`;
  return (
    `at each check speed: the nominal vehicle, ${corners}, the seeded samples inside the box, then a compass search (Kolda, Lewis & Torczon 2003) ` +
    'from the worst point of each figure within the analysis budget; each worst point kept is analysed in full (delay margin confirmed by the exact verdict)'
  );
}
