/**
 * The C99 text of the fixed-point header's tables and lookup: integers only (int16_t/int32_t tables,
 * int64_t intermediates, no floating point), computing exactly what integer-lookup.ts computes (the
 * formulas are in its file comment) for every column of the table: kp, ki, kd, then the set-point weights,
 * the feed-forward gain and its lead time. An integer speed is never NaN: the lookup returns LOOKUP_OK, or
 * LOOKUP_NO_GAINS for a null pointer.
 */
import { breakpointSearchText, LOOKUP_STATUS, type LookupField } from './c-lookup.js';
import { SPEED_FRACTIONAL_BITS, WEIGHT_FRACTIONAL_BITS } from './integer-lookup.js';
import type { FixedPointFormat, QuantisedTable } from './fixed-point.js';

const integers = (values: readonly bigint[]): string => values.map(String).join(', ');

/** Macros, typedef, tables and the lookup of a fixed-point header. */
export function integerLookupText(input: {
  readonly prefix: string;
  readonly upper: string;
  readonly quantisation: QuantisedTable;
  readonly unitsComment: string;
}): string[] {
  const { prefix, upper, quantisation } = input;
  const { integer } = quantisation;
  const cubic = integer.cubic;
  const names = Object.keys(integer.gains) as LookupField[];
  const formats: Partial<Record<LookupField, FixedPointFormat>> = { ...quantisation.formats, ...quantisation.extraFormats };
  const wordType = (name: LookupField): string => `int${formats[name]?.wordBits ?? 32}_t`;
  const row = (index: string): string => names.map((name) => `    gains->${name} = ${prefix}_${name}[${index}];`).join('\n');
  // One entry per breakpoint (the last is 0): a table of one breakpoint still has arrays of length one.
  const terms = (values: readonly bigint[]): bigint[] => [...values, 0n];
  const interpolate = (name: LookupField): string =>
    cubic
      ? `  gains->${name} = ${prefix}_segment(${prefix}_${name}[k], ${prefix}_${name}[k + 1], ${prefix}_${name}_slope_term0[k], ${prefix}_${name}_slope_term1[k], t, t2, t3);`
      : `  gains->${name} = ${prefix}_segment(${prefix}_${name}[k], ${prefix}_${name}[k + 1], t);`;
  return [
    `#define ${upper}_SPEED_FRACTIONAL_BITS ${SPEED_FRACTIONAL_BITS}`,
    ...names.map((name) => `#define ${upper}_${name.toUpperCase()}_FRACTIONAL_BITS ${integer.fractionalBits[name]}`),
    `#define ${upper}_LOW_SPEED_FLOOR_Q16 ${String(integer.floor)}`,
    '',
    `/* Scheduled values at one speed (${input.unitsComment}${names.length > 3 ? '; set-point weights b and c; feed_forward; feed_forward_lead_time_s in s' : ''}), each an integer in its own Q format: value = integer / 2^<NAME>_FRACTIONAL_BITS. */`,
    `typedef struct ${prefix}_gains {`,
    ...names.map((name) => `  int32_t ${name};`),
    `} ${prefix}_gains;`,
    '',
    `/* Breakpoint speeds in units of 2^-${SPEED_FRACTIONAL_BITS} m/s, strictly increasing. */`,
    `static const int32_t ${prefix}_speed_q16[${upper}_BREAKPOINTS] = { ${integers(integer.speeds)} };`,
    ...names.map((name) => `static const ${wordType(name)} ${prefix}_${name}[${upper}_BREAKPOINTS] = { ${integers(integer.gains[name])} };`),
    ...(cubic
      ? [
          "/* Hermite slope terms of interval k (Fritsch & Carlson 1980): width times the slope at its start (term0) and end (term1), in the gain's Q format. */",
          ...names.flatMap((name) => [
            `static const int32_t ${prefix}_${name}_slope_term0[${upper}_BREAKPOINTS] = { ${integers(terms(integer.slopeTerms[name].d0))} };`,
            `static const int32_t ${prefix}_${name}_slope_term1[${upper}_BREAKPOINTS] = { ${integers(terms(integer.slopeTerms[name].d1))} };`,
          ]),
        ]
      : []),
    '',
    cubic
      ? [
          `/* Cubic Hermite on one interval in integers: t, t2 = t^2, t3 = t^3 in units of 2^-${WEIGHT_FRACTIONAL_BITS}, rounded half away from zero, kept between the end values. */`,
          `static inline int32_t ${prefix}_segment(int32_t y0, int32_t y1, int32_t m0, int32_t m1, int64_t t, int64_t t2, int64_t t3)`,
          '{',
          `  const int64_t one = (int64_t)1 << ${WEIGHT_FRACTIONAL_BITS};`,
          '  int64_t acc = (int64_t)y0 * one + (3 * t2 - 2 * t3) * ((int64_t)y1 - y0) + (t3 - 2 * t2 + t) * m0 + (t3 - t2) * m1;',
        ].join('\n')
      : [
          `/* Linear interpolation on one interval in integers: t in units of 2^-${WEIGHT_FRACTIONAL_BITS}, rounded half away from zero, kept between the end values. */`,
          `static inline int32_t ${prefix}_segment(int32_t y0, int32_t y1, int64_t t)`,
          '{',
          `  const int64_t one = (int64_t)1 << ${WEIGHT_FRACTIONAL_BITS};`,
          '  int64_t acc = (int64_t)y0 * one + t * ((int64_t)y1 - y0);',
        ].join('\n'),
    '  int64_t y = acc >= 0 ? (acc + one / 2) / one : -((-acc + one / 2) / one);',
    '  int32_t low = y0 < y1 ? y0 : y1;',
    '  int32_t high = y0 < y1 ? y1 : y0;',
    '  return y < low ? low : (y > high ? high : (int32_t)y);',
    '}',
    '',
    '/*',
    ` * Gains at a speed given in units of 2^-${SPEED_FRACTIONAL_BITS} m/s (round(v * 65536)), written to *gains. Integer arithmetic only.`,
    ` * Returns ${upper}_LOOKUP_OK, or ${upper}_LOOKUP_NO_GAINS (${LOOKUP_STATUS.NO_GAINS.value}) for a null pointer (*gains not written).`,
    ' * Below the low-speed floor the floor speed is used; outside the table the end values are held;',
    ` * exact table values at breakpoints. ${upper}_FALLBACK_BREAKPOINT names gains the firmware may use on a speed-sensor fault.`,
    ' */',
    `static inline int ${prefix}_lookup(int32_t speed_q16, ${prefix}_gains *gains)`,
    '{',
    '  int32_t v;',
    '  int low = 0;',
    `  int high = ${upper}_BREAKPOINTS - 1;`,
    '  int k;',
    '  int64_t t;',
    ...(cubic ? ['  int64_t t2;', '  int64_t t3;'] : []),
    '  if (gains == 0) {',
    `    return ${upper}_LOOKUP_NO_GAINS;`,
    '  }',
    `  v = speed_q16 < ${upper}_LOW_SPEED_FLOOR_Q16 ? ${upper}_LOW_SPEED_FLOOR_Q16 : speed_q16;`,
    ...breakpointSearchText({ speeds: `${prefix}_speed_q16`, upper, row }),
    `  t = (((int64_t)v - ${prefix}_speed_q16[k]) << ${WEIGHT_FRACTIONAL_BITS}) / ((int64_t)${prefix}_speed_q16[k + 1] - ${prefix}_speed_q16[k]);`,
    ...(cubic ? [`  t2 = (t * t) >> ${WEIGHT_FRACTIONAL_BITS};`, `  t3 = (t2 * t) >> ${WEIGHT_FRACTIONAL_BITS};`] : []),
    ...names.map(interpolate),
    `  return ${upper}_LOOKUP_OK;`,
    '}',
  ];
}
