/**
 * A limit drawn on a plot against speed: the side beyond it shaded and the limit itself dashed — a horizontal
 * rule for one number, a line over speed for a limit that varies with speed (a table,
 * src/schedule/acceptance-limits.ts), whose shading then covers only what is beyond it at every speed.
 */
import { overSpeedText, type NumberOverSpeed } from '../../core/by-speed.js';
import { shownNumber } from './html.js';
import { ROLE_COLOURS } from './palette.js';
import type { Mark } from './plot-types.js';

export interface LimitOnPlot {
  /** The limit where it demands least (the number itself when it does not vary): the edge of the shading. */
  readonly value: number;
  readonly varies: boolean;
  readonly marks: Mark[];
}

export interface LimitToDraw {
  /** The limit: one number, or a table over speed. */
  readonly limit: NumberOverSpeed;
  /** True: figures under the limit break it (margins); false: figures over it do (peaks, errors, times). */
  readonly failsBelow: boolean;
  /** The shaded region's legend, given the edge value and whether the limit varies with speed. */
  readonly regionLabel: (value: number, varies: boolean) => string;
}

export function limitMarks(input: LimitToDraw): LimitOnPlot {
  const { limit, failsBelow, regionLabel } = input;
  const varies = typeof limit !== 'number';
  const value = typeof limit === 'number' ? limit : failsBelow ? Math.min(...limit.values) : Math.max(...limit.values);
  const style = { colour: ROLE_COLOURS.failure, dash: 'dash', width: 1.2 } as const;
  return {
    value,
    varies,
    marks: [
      {
        kind: 'region',
        label: regionLabel(value, varies),
        axis: 'y',
        from: failsBelow ? 'min' : value,
        to: failsBelow ? value : 'max',
        colour: ROLE_COLOURS.failure,
      },
      typeof limit === 'number'
        ? { kind: 'rule', label: 'limit', axis: 'y', at: limit, style }
        : { kind: 'line', label: 'limit (varies with speed)', x: [...limit.speeds_mps], y: [...limit.values], style },
    ],
  };
}

/** A limit in the report's words: the number as the report shows numbers, or its range when it varies with speed. */
export const limitWords = (limit: NumberOverSpeed): string => overSpeedText(limit, (value) => shownNumber(value));
