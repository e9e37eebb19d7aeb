/**
 * The worst case over the new vehicle's variations in a comparison: the old gains (and the new) over the set the
 * new schedule records, computed by src/pipeline/variations-comparison.ts. Pure: adds the section and, under the new
 * schedule's robust acceptance, a flag at each speed where the old gains break their limits in the worst case.
 */
import { shownSpeed } from './format.js';
import type { ComparisonFlag, ScheduleComparison, VariationsComparison } from './types.js';

/** The comparison with its `overVariations` section and flags. */
export function withVariations(comparison: ScheduleComparison, variations: VariationsComparison): ScheduleComparison {
  const flags: ComparisonFlag[] = [];
  if (variations.available && variations.acceptance === 'robust') {
    for (const row of variations.speeds) {
      if (row.old.failures.length === 0) continue;
      flags.push({
        kind: 'oldGainsFailOverVariations',
        speed_mps: row.speed_mps,
        quantity: 'worst case',
        message: `the old gains at ${shownSpeed(row.speed_mps)} m/s in the worst case over the new vehicle's variations: ${row.old.failures.join('; ')}`,
      });
    }
  }
  return { ...comparison, overVariations: variations, flags: [...comparison.flags, ...flags] };
}
