/**
 * Comparison thresholds, in one place (our choices, in line with common practice for a change
 * review): a gain moving ±15 %, a gain margin losing 3 dB (a factor √2 of loop gain), a phase
 * margin losing 10°. A gain term that appears from 0 is flagged whatever its size. Breakpoints (and
 * low-speed floors) within 0.05 m/s are the same speed: builds place breakpoints at measured test
 * speeds, which move by millimetres per second between test days, far below any breakpoint spacing.
 */
import { SpeedbandError } from '../core/errors.js';
import type { CompareThresholds } from './types.js';

export const COMPARE_DEFAULTS: CompareThresholds = {
  gainChange_pct: 15,
  gainChangeFromZero: 0,
  gainMarginDrop_dB: 3,
  phaseMarginDrop_deg: 10,
  speedTolerance_mps: 0.05,
};

/**
 * Fill defaults and check every threshold is a finite number ≥ 0 (`compare.invalidThreshold`,
 * naming the threshold and the value found).
 */
export function resolveThresholds(given: Partial<CompareThresholds> = {}): CompareThresholds {
  const thresholds: CompareThresholds = { ...COMPARE_DEFAULTS, ...given };
  for (const [name, value] of Object.entries(thresholds)) {
    if (typeof value !== 'number' || !Number.isFinite(value) || value < 0) {
      throw new SpeedbandError(
        'compare.invalidThreshold',
        `threshold ${name} is ${String(value)} — give a finite number ≥ 0 (default ${String(COMPARE_DEFAULTS[name as keyof CompareThresholds])})`,
        {
          details: { threshold: name, value },
        },
      );
    }
  }
  return thresholds;
}
