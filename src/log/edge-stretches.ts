/**
 * Command levels cut short by the edge of a log segment: the start or end of
 * the file, or a time gap that splits it. A held stretch there may be shorter
 * than a plateau (`minPlateau_s`), yet the command moves next to it — a step
 * whose old level or hold was cut off. Segmentation turns it into a rejected
 * candidate instead of losing it.
 */
import type { Plateau, PlateauOptions } from './plateaus.js';

export interface EdgeStretches {
  /** The stretch at the segment's first sample when it is not a plateau and its level differs from the first plateau's; else null. */
  readonly leading: Plateau | null;
  /** The stretch ending at the segment's last sample when it is not a plateau and its level differs from the last plateau's; else null. */
  readonly trailing: Plateau | null;
}

/**
 * Short stretches at either edge of a segment's command (rad) whose level
 * differs by more than `band_rad` from the neighbouring plateau (or from each
 * other when the segment holds no plateau). A stretch is grown from the edge
 * while samples stay within `band_rad` of its running mean (the rule
 * `findPlateaus` uses); the leading one ends at its last sample within
 * `onsetTolerance_rad` of its level (the onset of the step after it).
 */
export function edgeStretches(command_rad: Float64Array, plateaus: readonly Plateau[], options: PlateauOptions): EdgeStretches {
  const n = command_rad.length;
  if (n === 0) return { leading: null, trailing: null };
  const first = plateaus[0];
  const last = plateaus[plateaus.length - 1];
  const differs = (a: number, b: number): boolean => Math.abs(a - b) > options.band_rad;

  let leading: Plateau | null = null;
  if (first === undefined || first.start > 0) {
    const run = grow(command_rad, 0, 1, options.band_rad);
    let end = run.last;
    while (end > 0 && Math.abs(command_rad[end] - run.level_rad) > options.onsetTolerance_rad) end -= 1;
    leading = { start: 0, end, level_rad: run.level_rad };
  }
  let trailing: Plateau | null = null;
  if (last === undefined || differs(command_rad[n - 1], last.level_rad)) {
    const run = grow(command_rad, n - 1, -1, options.band_rad);
    trailing = { start: run.last, end: n - 1, level_rad: run.level_rad };
  }

  if (first !== undefined) {
    if (leading !== null && !differs(leading.level_rad, first.level_rad)) leading = null;
    if (trailing !== null && (!differs(trailing.level_rad, last.level_rad) || trailing.start <= last.end)) trailing = null;
    return { leading, trailing };
  }
  // No plateau at all: a move only when the two edges hold different levels and do not overlap.
  if (leading === null || trailing === null || !differs(leading.level_rad, trailing.level_rad) || trailing.start <= leading.end) {
    return { leading: null, trailing: null };
  }
  return { leading, trailing };
}

/** Grow a stretch from `from` in `direction` (±1) while samples stay within `band_rad` of its running mean; `last` is its far end. */
function grow(command_rad: Float64Array, from: number, direction: 1 | -1, band_rad: number): { last: number; level_rad: number } {
  let sum = command_rad[from];
  let count = 1;
  let i = from + direction;
  while (i >= 0 && i < command_rad.length && Math.abs(command_rad[i] - sum / count) <= band_rad) {
    sum += command_rad[i];
    count += 1;
    i += direction;
  }
  return { last: i - direction, level_rad: sum / count };
}
