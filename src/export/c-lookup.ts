/**
 * The C text of the lookup function of the header (c-header.ts): the same computation as
 * src/schedule/interpolate.ts, plus what firmware must do with a speed that is not a number.
 * A NaN or infinite speed returns a status the caller must check: LOOKUP_FALLBACK with the fallback
 * gains (only when the export proved one breakpoint's gains, held constant, pass the dense check over
 * the whole range) or LOOKUP_NO_GAINS with the gains left untouched. The test `x - x == 0.0` is false
 * exactly for NaN and ±infinity in IEEE 754 arithmetic (it needs no library call; like any NaN test it
 * does not survive -ffinite-math-only / -ffast-math).
 */

export interface LookupTextInput {
  readonly prefix: string;
  readonly upper: string;
  readonly cubic: boolean;
  /** Expression of a stored value in C, e.g. `prefix_kp[k]` or a Q-format conversion. */
  readonly gainValue: (name: LookupField, index: string) => string;
  /** Index of the fallback breakpoint, or null for none. */
  readonly fallbackBreakpoint: number | null;
}

/** Status codes of the lookup and their meaning (also the documented macros of the header). */
export const LOOKUP_STATUS = {
  OK: { value: 0, meaning: 'a finite speed: *gains hold the scheduled gains' },
  FALLBACK: { value: 1, meaning: 'the speed is NaN or infinite: *gains hold the fallback gains (see FALLBACK_BREAKPOINT)' },
  NO_GAINS: { value: 2, meaning: 'the speed is NaN or infinite and no fallback gains are proven, or gains is a null pointer: *gains are not written' },
} as const;

/** The fields of the gains struct, in order: the PID gains, the set-point weights, the feed-forward gain and its lead time. */
export const LOOKUP_FIELDS = ['kp', 'ki', 'kd', 'setpoint_weight_p', 'setpoint_weight_d', 'feed_forward', 'feed_forward_lead_time_s'] as const;
export type LookupField = (typeof LOOKUP_FIELDS)[number];
const NAMES = LOOKUP_FIELDS;

/** The segment (interpolation on one interval) and lookup functions, as C99 text. */
export function lookupFunctionsText(input: LookupTextInput): string {
  const { prefix, upper, cubic, gainValue, fallbackBreakpoint } = input;
  const row = (index: string): string => NAMES.map((name) => `    gains->${name} = ${gainValue(name, index)};`).join('\n');
  const segment = (name: (typeof NAMES)[number]): string =>
    cubic
      ? `  gains->${name} = ${prefix}_segment(${gainValue(name, 'k')}, ${gainValue(name, 'k + 1')}, ${prefix}_${name}_slope[k], ${prefix}_${name}_slope[k + 1], t, h);`
      : `  gains->${name} = ${prefix}_segment(${gainValue(name, 'k')}, ${gainValue(name, 'k + 1')}, t);`;
  return [
    cubic
      ? [
          '/* Cubic Hermite on one interval, kept between its end values. t in [0, 1), h = interval width in m/s. */',
          `static inline double ${prefix}_segment(double y0, double y1, double m0, double m1, double t, double h)`,
          '{',
          '  double t2 = t * t;',
          '  double t3 = t2 * t;',
          '  double y = (2.0 * t3 - 3.0 * t2 + 1.0) * y0 + (t3 - 2.0 * t2 + t) * h * m0 + (-2.0 * t3 + 3.0 * t2) * y1 + (t3 - t2) * h * m1;',
        ].join('\n')
      : [
          '/* Linear interpolation on one interval, kept between its end values. t in [0, 1). */',
          `static inline double ${prefix}_segment(double y0, double y1, double t)`,
          '{',
          '  double y = y0 + t * (y1 - y0);',
        ].join('\n'),
    '  double low = y0 < y1 ? y0 : y1;',
    '  double high = y0 < y1 ? y1 : y0;',
    '  return y < low ? low : (y > high ? high : y);',
    '}',
    '',
    '/*',
    ' * Gains at a speed, m/s, written to *gains. Returns a status the caller must check:',
    ` *   ${upper}_LOOKUP_OK        ${LOOKUP_STATUS.OK.meaning};`,
    ` *   ${upper}_LOOKUP_FALLBACK  ${LOOKUP_STATUS.FALLBACK.meaning};`,
    ` *   ${upper}_LOOKUP_NO_GAINS  ${LOOKUP_STATUS.NO_GAINS.meaning}.`,
    ' * Below the low-speed floor the floor speed is used; outside the table the end values are held;',
    ' * exact table values at breakpoints. A NaN test needs IEEE 754 semantics: no -ffast-math.',
    ' */',
    `static inline int ${prefix}_lookup(double speed_mps, ${prefix}_gains *gains)`,
    '{',
    '  double v;',
    '  int low = 0;',
    `  int high = ${upper}_BREAKPOINTS - 1;`,
    '  int k;',
    '  double h;',
    '  double t;',
    '  if (gains == 0) {',
    `    return ${upper}_LOOKUP_NO_GAINS;`,
    '  }',
    '  if (!(speed_mps - speed_mps == 0.0)) {',
    ...(fallbackBreakpoint === null ? [`    return ${upper}_LOOKUP_NO_GAINS;`] : [row(`${upper}_FALLBACK_BREAKPOINT`), `    return ${upper}_LOOKUP_FALLBACK;`]),
    '  }',
    `  v = speed_mps < ${upper}_LOW_SPEED_FLOOR_MPS ? ${upper}_LOW_SPEED_FLOOR_MPS : speed_mps;`,
    ...breakpointSearchText({ speeds: `${prefix}_speed_mps`, upper, row }),
    `  h = ${prefix}_speed_mps[k + 1] - ${prefix}_speed_mps[k];`,
    `  t = (v - ${prefix}_speed_mps[k]) / h;`,
    ...NAMES.map(segment),
    `  return ${upper}_LOOKUP_OK;`,
    '}',
  ].join('\n');
}

/**
 * The C lines, shared by the floating-point and the integer lookup, that hold the end values outside the table and
 * find the interval k of `v` by bisection (returning the table values at a breakpoint exactly). `speeds` names the
 * array of breakpoint speeds; `row(index)` writes the values of one breakpoint into *gains.
 */
export function breakpointSearchText(input: { readonly speeds: string; readonly upper: string; readonly row: (index: string) => string }): string[] {
  const { speeds, upper, row } = input;
  return [
    `  if (!(v > ${speeds}[0])) {`,
    row('0'),
    `    return ${upper}_LOOKUP_OK;`,
    '  }',
    `  if (v >= ${speeds}[${upper}_BREAKPOINTS - 1]) {`,
    row(`${upper}_BREAKPOINTS - 1`),
    `    return ${upper}_LOOKUP_OK;`,
    '  }',
    '  while (high - low > 1) {',
    '    int middle = (low + high) / 2;',
    `    if (${speeds}[middle] <= v) {`,
    '      low = middle;',
    '    } else {',
    '      high = middle;',
    '    }',
    '  }',
    '  k = low;',
    `  if (v == ${speeds}[k]) {`,
    row('k'),
    `    return ${upper}_LOOKUP_OK;`,
    '  }',
  ];
}
