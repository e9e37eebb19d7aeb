/**
 * The figures of the robust check and which way each gets worse: a larger lower gain margin (closer to
 * 0 dB), a smaller upper gain margin, phase margin or delay margin, a larger Ms or Mt. A figure a loop
 * does not have (null: no such crossing, the margin is unbounded) is the best it can be.
 */
import type { LoopMargins } from '../verify/types.js';
import type { RobustFigure } from './types.js';

export interface FigureDefinition {
  readonly name: RobustFigure;
  /** 'larger': a larger value is worse. */
  readonly worse: 'larger' | 'smaller';
  /** In words and with its unit, for messages. */
  readonly words: string;
  readonly unit: string;
}

/** Every figure, in the order the search treats them and the outputs list them. */
export const ROBUST_FIGURES: readonly FigureDefinition[] = [
  { name: 'phaseMargin_deg', worse: 'smaller', words: 'phase margin', unit: '°' },
  { name: 'upperGainMargin_dB', worse: 'smaller', words: 'upper gain margin', unit: 'dB' },
  { name: 'lowerGainMargin_dB', worse: 'larger', words: 'lower gain margin', unit: 'dB' },
  { name: 'delayMargin_s', worse: 'smaller', words: 'delay margin', unit: 's' },
  { name: 'sensitivityPeak', worse: 'larger', words: 'peak sensitivity Ms', unit: '' },
  { name: 'complementarySensitivityPeak', worse: 'larger', words: 'peak complementary sensitivity Mt', unit: '' },
];

/** The figure's value on a loop, or null when the loop has none (or it is not finite). */
export function figureValue(margins: Pick<LoopMargins, RobustFigure>, figure: RobustFigure): number | null {
  const value = margins[figure];
  return value === null || !Number.isFinite(value) ? null : value;
}

/**
 * How bad a figure is, as one number to maximise: the value itself where larger is worse, its negative
 * where smaller is worse, −Infinity where the loop has no such figure.
 */
export function badness(value: number | null, definition: FigureDefinition): number {
  if (value === null) return -Infinity;
  return definition.worse === 'larger' ? value : -value;
}
