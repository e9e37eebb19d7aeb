/**
 * Colours of the report: the eight-colour palette of Okabe & Ito (2008), "Color Universal Design (CUD):
 * how to make figures and presentations that are friendly to colorblind people" — distinguishable under
 * the common colour-vision deficiencies and in greyscale print. Colour is never the only cue: every series
 * also differs by dash pattern or marker shape, and the legend names it.
 */
export const OKABE_ITO = {
  black: '#000000',
  orange: '#E69F00',
  skyBlue: '#56B4E9',
  bluishGreen: '#009E73',
  yellow: '#F0E442',
  blue: '#0072B2',
  vermillion: '#D55E00',
  reddishPurple: '#CC79A7',
} as const;

export type PaletteColour = keyof typeof OKABE_ITO;

/** Neutral greys for axes, grid and text (not data). */
export const GREYS = { axis: '#444444', grid: '#dddddd', text: '#222222', faint: '#777777' } as const;

/** What each colour means in every plot of the report. */
export const ROLE_COLOURS = {
  schedule: 'blue',
  baseline: 'orange',
  failure: 'vermillion',
  breakpoint: 'black',
  inserted: 'reddishPurple',
  model: 'bluishGreen',
  measured: 'skyBlue',
  fit: 'black',
} as const satisfies Readonly<Record<string, PaletteColour>>;

/** Stroke dash patterns (SVG stroke-dasharray). */
export const DASH_PATTERNS = { solid: '', dash: '7 4', dot: '2 3' } as const;

/** The colour value of a palette colour, or the neutral grey. */
export const colourValue = (colour: PaletteColour | 'grey'): string => (colour === 'grey' ? GREYS.faint : OKABE_ITO[colour]);
