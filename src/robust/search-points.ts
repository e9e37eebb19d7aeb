/**
 * Points of the box in normalised coordinates u ∈ [0, 1]^k (0: the dimension's minimum, 1: its maximum):
 * its corners and seeded samples inside it. Deterministic: the same k, count and seed give the same points.
 */
import { makeRandom } from '../core/random.js';

/** Up to this many dimensions every corner is checked; beyond, a screening and a search over the corners (worst-case.ts). */
export const ALL_CORNERS_UP_TO_DIMENSIONS = 4;

/** Every corner of [0, 1]^k, in binary order (dimension 0 the lowest bit). */
export function allCorners(k: number): number[][] {
  const corners: number[][] = [];
  for (let bits = 0; bits < 2 ** k; bits++) corners.push(Array.from({ length: k }, (_, i) => (bits >> i) & 1));
  return corners;
}

/** The 2k points with one coordinate at an end of its range and the others at `centre` (one-at-a-time screening). */
export function axisEnds(centre: readonly number[]): number[][] {
  const points: number[][] = [];
  centre.forEach((_, i) => {
    for (const end of [0, 1]) {
      const point = [...centre];
      point[i] = end;
      points.push(point);
    }
  });
  return points;
}

/** `count` seeded points uniformly inside [0, 1]^k (src/core/random.ts, mulberry32). */
export function seededSamples(k: number, count: number, seed: number): number[][] {
  const random = makeRandom(seed);
  return Array.from({ length: count }, () => Array.from({ length: k }, () => random.uniform()));
}

/** A key that names a point exactly (for the cache of analysed points). */
export function pointKey(point: readonly number[]): string {
  return point.join(',');
}
