/**
 * The change of one gain or one margin between two schedules, and whether it is past a threshold.
 * Gains: change = new − old (gain's unit), change_pct = 100·(new − old)/old; with old = 0 the
 * percentage is null and the absolute change decides (flagged when |new − old| > gainChangeFromZero).
 * Margins (null = no such crossing = unbounded, as in the schedule file):
 * - upper gain margin and phase margin are flagged when they decrease by the threshold or more;
 * - the lower gain margin (negative dB: how much the gain may be reduced) is flagged when it moves
 *   the threshold or more closer to 0 dB, i.e. |old| − |new| ≥ threshold;
 * - a crossing that appears (null → number) is a loss of an unbounded margin and is flagged;
 *   one that disappears (number → null) is not.
 */
import type { CompareThresholds, GainChange, MarginChange } from './types.js';

/**
 * "Reaches the threshold" allows for binary rounding: 1 → 1.15 computes as 14.999999999999996 %
 * and must count as 15 %. A value within this relative distance below the threshold counts as reaching it.
 */
export const THRESHOLD_ROUNDING = 1e-9;

/** value ≥ threshold up to rounding; a threshold of 0 flags any change (value > 0), never no change. */
const reaches = (value: number, threshold: number): boolean => (threshold > 0 ? value >= threshold * (1 - THRESHOLD_ROUNDING) : value > 0);

/** One gain in the old and the new schedule at the same speed (gainChange). */
export interface GainPair {
  /** The old schedule's gain, in the gain's unit. */
  readonly old: number;
  /** The new schedule's gain, in the same unit. */
  readonly new: number;
  /** False when a loop or controller setting changed (compare/settings.ts): the gains are not comparable one by one. */
  readonly comparable: boolean;
  /** The flagging thresholds (COMPARE_DEFAULTS or the user's). */
  readonly thresholds: CompareThresholds;
}

/** Change of one gain; `comparable` false (settings differ) gives null changes and no flag. */
export function gainChange(pair: GainPair): GainChange {
  const { old, new: next, comparable, thresholds } = pair;
  if (!comparable) return { old, new: next, change: null, change_pct: null, flagged: false };
  const change = next - old;
  if (old === 0) return { old, new: next, change, change_pct: null, flagged: Math.abs(change) > thresholds.gainChangeFromZero };
  const change_pct = (100 * change) / old;
  return { old, new: next, change, change_pct, flagged: reaches(Math.abs(change_pct), thresholds.gainChange_pct) };
}

/** How a margin is judged: 'decrease' (upper gain margin, phase margin), 'towardZero' (lower gain margin), 'none' (informative). */
export type MarginSense = 'decrease' | 'towardZero' | 'none';

/** Loss of a margin, in its unit (positive = worse); null when either is null. */
export function marginLoss(old: number | null, next: number | null, sense: MarginSense): number | null {
  if (old === null || next === null || sense === 'none') return null;
  return sense === 'decrease' ? old - next : Math.abs(old) - Math.abs(next);
}

/** Change of one margin, flagged when the loss ≥ `drop` or a crossing appears (see the file comment). */
export function marginChange(old: number | null, next: number | null, sense: MarginSense, drop: number): MarginChange {
  const change = old !== null && next !== null ? next - old : null;
  if (sense === 'none') return { old, new: next, change, flagged: false };
  const loss = marginLoss(old, next, sense);
  const appeared = old === null && next !== null;
  return { old, new: next, change, flagged: appeared || (loss !== null && reaches(loss, drop)) };
}

/** The drop threshold for a margin name (dB for gain margins, degrees for the phase margin). */
export function marginDrop(name: 'lowerGainMargin_dB' | 'upperGainMargin_dB' | 'phaseMargin_deg', thresholds: CompareThresholds): number {
  return name === 'phaseMargin_deg' ? thresholds.phaseMarginDrop_deg : thresholds.gainMarginDrop_dB;
}
