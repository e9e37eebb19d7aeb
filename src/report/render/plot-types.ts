/** What a plot is made of (plot.ts draws it): two axes and marks — data marks and reference guides. */
import type { PaletteColour } from './palette.js';

export interface AxisSpec {
  /** Quantity and unit, e.g. "speed, m/s". */
  readonly label: string;
  readonly scale?: 'linear' | 'log';
  /** A fixed domain; otherwise the data's extent (with `include`), made nice. */
  readonly domain?: readonly [number, number];
  /** Values the domain must include (limits, zero). */
  readonly include?: readonly number[];
}

export interface SeriesStyle {
  readonly colour: PaletteColour | 'grey';
  readonly dash?: 'solid' | 'dash' | 'dot';
  readonly width?: number;
  readonly opacity?: number;
}

export type MarkerShape = 'circle' | 'open-circle' | 'diamond' | 'cross' | 'plus' | 'square';

/** Data marks (class "mark") and guides (class "guide"); `label` names it in the legend and in the description. */
export type Mark =
  | {
      readonly kind: 'line';
      readonly label: string;
      readonly x: readonly number[];
      readonly y: readonly (number | null)[];
      readonly style: SeriesStyle;
      readonly legend?: boolean;
    }
  | {
      readonly kind: 'points';
      readonly label: string;
      readonly x: readonly number[];
      readonly y: readonly (number | null)[];
      readonly style: SeriesStyle;
      readonly shape: MarkerShape;
      readonly size?: number;
      readonly legend?: boolean;
    }
  | {
      readonly kind: 'error-bars';
      readonly label: string;
      readonly x: readonly number[];
      readonly low: readonly (number | null)[];
      readonly high: readonly (number | null)[];
      readonly style: SeriesStyle;
      readonly legend?: boolean;
    }
  | {
      readonly kind: 'band';
      readonly label: string;
      readonly x: readonly number[];
      readonly low: readonly (number | null)[];
      readonly high: readonly (number | null)[];
      readonly style: SeriesStyle;
      readonly legend?: boolean;
    }
  /** A shaded stretch of one axis across the plot (e.g. where a margin breaks its limit). */
  | {
      readonly kind: 'region';
      readonly label: string;
      readonly axis: 'x' | 'y';
      readonly from: number | 'min' | 'max';
      readonly to: number | 'min' | 'max';
      readonly colour: PaletteColour | 'grey';
      readonly legend?: boolean;
    }
  /** A straight reference line at one value of an axis (a limit, 0 dB, −180°). */
  | { readonly kind: 'rule'; readonly label: string; readonly axis: 'x' | 'y'; readonly at: number; readonly style: SeriesStyle; readonly legend?: boolean }
  /** A circle in data units (equal-aspect plots): the unit circle, a sensitivity limit around −1. */
  | {
      readonly kind: 'ring';
      readonly label: string;
      readonly cx: number;
      readonly cy: number;
      readonly r: number;
      readonly style: SeriesStyle;
      readonly fill?: PaletteColour;
      readonly legend?: boolean;
    };

export interface PlotSpec {
  /** The plot's own title (in the SVG <title>; the figure caption names the figure). */
  readonly title: string;
  /** What it shows, in a sentence, for screen readers; the range of each series is added. */
  readonly description: string;
  readonly x: AxisSpec;
  readonly y: AxisSpec;
  readonly marks: readonly Mark[];
  /** Size of the drawing's viewBox (default 560 × 300); text is 12 units high, so a narrower plot keeps it legible side by side. */
  readonly width?: number;
  readonly height?: number;
  /** Same data units per pixel on both axes (Nyquist plots). */
  readonly equalAspect?: boolean;
}
