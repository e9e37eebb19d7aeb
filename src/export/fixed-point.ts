/**
 * Fixed-point (Q-format) gains for firmware without floating point. Format I.F: a signed
 * two's-complement word of I + F bits (I integer bits including the sign bit, F fractional bits);
 * stored integer q = round(x·2^F) (round half away from zero), represented value q/2^F, error at most
 * 2^−(F+1) per stored value inside [−2^(I−1), 2^(I−1) − 2^−F]. One format for all gains ("Q16.16",
 * "16.16"), or `auto`: per gain, the 32-bit format with the most fractional bits that holds the gain's
 * values and slope terms (the set-point weights, feed-forward gain and lead time always so). The lookup
 * between breakpoints is integer arithmetic (integer-lookup.ts); the export re-checks exactly what it computes.
 */
import type { PidGains } from '../controller/types.js';
import { SpeedbandError } from '../core/errors.js';
import { quoted } from '../core/quote.js';
import { gainSlopes, makeGainLookup } from '../schedule/interpolate.js';
import type { GainTable, LookupSettings } from '../schedule/types.js';
import { monotoneCubicSlopes } from '../schedule/monotone-cubic.js';
import { LOOKUP_FIELDS, type LookupField } from './c-lookup.js';
import { makeIntegerGainLookup, roundToInteger, SPEED_FRACTIONAL_BITS, type IntegerTable } from './integer-lookup.js';
import { lookupErrorBound } from './lookup-error-bound.js';

export interface FixedPointFormat {
  readonly fractionalBits: number;
  /** Total word size: 16 or 32 bits (int16_t, int32_t). */
  readonly wordBits: 16 | 32;
}

/** What the user asked for: one format for every gain, or `auto` (per gain, from its range, 32-bit words). */
export type FixedPointRequest = FixedPointFormat | 'auto';

const NAMES = ['kp', 'ki', 'kd'] as const;
type GainName = (typeof NAMES)[number];

/** Maximum quantisation error of one gain: at the breakpoints, and over the interpolated lookup. */
export interface GainQuantisationError {
  readonly maxAbsolute: number;
  /** Largest |error|/|value| over breakpoints with a non-zero value (0 when all values are 0). */
  readonly maxRelative: number;
  /** Largest |integer lookup − exact lookup| found on 1,001 speeds across the table. */
  readonly maxAbsoluteInterpolated: number;
}

export interface QuantisedTable {
  /** The format of each gain. */
  readonly formats: Readonly<Record<GainName, FixedPointFormat>>;
  /** The stored integers per gain. */
  readonly raw: { readonly kp: readonly number[]; readonly ki: readonly number[]; readonly kd: readonly number[] };
  /** The values the integers represent at the breakpoints (q/2^F), as a gain table. */
  readonly table: GainTable;
  readonly errors: Readonly<Record<GainName, GainQuantisationError>>;
  /** Bound on the error of a stored value, 2^−(F+1), per gain; `resolutionBound` is the largest. */
  readonly resolutionBounds: Readonly<Record<GainName, number>>;
  readonly resolutionBound: number;
  /** Per column: the largest |integer lookup − exact lookup| at any speed, derived (lookup-error-bound.ts). */
  readonly lookupErrorBounds: Readonly<Partial<Record<LookupField, number>>>;
  /** With extras: the format of each extra column (32-bit, the most fractional bits its values need). */
  readonly extraFormats?: Readonly<Record<ExtraColumn, FixedPointFormat>>;
  /** The integers the C lookup holds (speeds in 2^−16 m/s, slope terms), the gains first, then any extras. */
  readonly integer: IntegerTable<string>;
  /** The gains the firmware's integer lookup computes at a speed (m/s): what the export re-checks. */
  readonly lookup: (speed_mps: number) => PidGains;
}

/**
 * Parse a format: "I.F" or "QI.F" (e.g. "16.16", "Q16.16", "q8.24"; I + F = 16 or 32, I ≥ 1), or "auto".
 * Throws `export.qFormatInvalid`.
 */
export function parseFixedPointRequest(text: string): FixedPointRequest {
  if (text.trim().toLowerCase() === 'auto') return 'auto';
  return parseQFormat(text);
}

/** Parse "I.F" or "QI.F" into a format; I + F must be 16 or 32 (see parseFixedPointRequest). */
export function parseQFormat(text: string): FixedPointFormat {
  const match = /^[Qq]?(\d+)\.(\d+)$/.exec(text.trim());
  const integerBits = match ? Number(match[1]) : Number.NaN;
  const fractionalBits = match ? Number(match[2]) : Number.NaN;
  const wordBits = integerBits + fractionalBits;
  if (!match || integerBits < 1 || (wordBits !== 16 && wordBits !== 32)) {
    throw new SpeedbandError(
      'export.qFormatInvalid',
      `Q format ${quoted(text)} is not I.F (or QI.F) with I ≥ 1 integer bits (sign included) and I + F = 16 or 32 — e.g. Q16.16, 16.16 or Q4.12, or auto (per gain, from its range)`,
      { details: { given: text } },
    );
  }
  return { fractionalBits, wordBits: wordBits as 16 | 32 };
}

/** The 32-bit format with the most fractional bits that holds every magnitude given (at least one integer bit, the sign). */
function formatFor(magnitudes: readonly number[]): FixedPointFormat {
  const largest = Math.max(0, ...magnitudes);
  for (let fractionalBits = 31; fractionalBits >= 0; fractionalBits -= 1) {
    if (Math.round(largest * 2 ** fractionalBits) <= 2 ** 31 - 1) return { fractionalBits, wordBits: 32 };
  }
  return { fractionalBits: 0, wordBits: 32 };
}

const INTERPOLATED_SPEEDS = 1000;

/** The columns of the integer lookup beside the gains: set-point weights, feed-forward gain and its lead time. */
export type ExtraColumn = Exclude<LookupField, GainName>;
const EXTRA_NAMES = LOOKUP_FIELDS.filter((name): name is ExtraColumn => !(NAMES as readonly string[]).includes(name));

/**
 * Quantise a gain table for the integer lookup; with `extras` (the schedule's set-point weights, feed-forward gain
 * and lead time per breakpoint) those columns too, each in the 32-bit format with the most fractional bits its
 * values need. `export.fixedPointOverflow` when a value (or, for a monotone cubic, a slope term h·m, stored in
 * 32 bits) does not fit its format.
 */
export function quantiseTable(
  table: GainTable,
  request: FixedPointRequest,
  lookup: LookupSettings,
  extras?: Readonly<Record<ExtraColumn, readonly number[]>>,
): QuantisedTable {
  const cubic = lookup.interpolation === 'monotone-cubic';
  const speeds = table.speeds_mps;
  const n = speeds.length;
  const columns = {
    ...Object.fromEntries(NAMES.map((name) => [name, table.gains.map((row) => row[name])])),
    ...(extras ?? {}),
  } as Record<LookupField, readonly number[]>;
  const names = Object.keys(columns) as LookupField[];
  const gainSlopeValues = gainSlopes(table, lookup.interpolation);
  const slopes = (name: LookupField): ArrayLike<number> =>
    isGain(name) ? gainSlopeValues[name] : cubic ? monotoneCubicSlopes(speeds, columns[name]) : new Float64Array(n);
  const width = (k: number): number => speeds[k + 1] - speeds[k];
  const slopeTerms = (name: LookupField): { d0: number[]; d1: number[] } => ({
    d0: cubic ? Array.from({ length: n - 1 }, (_, k) => width(k) * slopes(name)[k]) : [],
    d1: cubic ? Array.from({ length: n - 1 }, (_, k) => width(k) * slopes(name)[k + 1]) : [],
  });
  const formats = Object.fromEntries(
    names.map((name) => {
      const terms = slopeTerms(name);
      const magnitudes = [...columns[name].map(Math.abs), ...terms.d0.map(Math.abs), ...terms.d1.map(Math.abs)];
      return [name, request === 'auto' || !isGain(name) ? formatFor(magnitudes) : request];
    }),
  ) as Record<LookupField, FixedPointFormat>;
  const stored = (name: LookupField, value: number, words: number, what: string): bigint => {
    const { fractionalBits, wordBits } = formats[name];
    const q = roundToInteger(value * 2 ** fractionalBits);
    const limit = 2n ** BigInt(words - 1);
    if (q < -limit || q > limit - 1n) {
      const scale = 2 ** fractionalBits;
      throw new SpeedbandError(
        'export.fixedPointOverflow',
        `${what} = ${value} does not fit Q${wordBits - fractionalBits}.${fractionalBits}${words === wordBits ? '' : ` in ${words} bits`} ` +
          `(range ${Number(-limit) / scale} to ${Number(limit - 1n) / scale}) — use fewer fractional bits, a 32-bit word, or --q-format auto`,
        { details: { gain: name, value } },
      );
    }
    return q;
  };
  const values = Object.fromEntries(
    names.map((name) => [name, columns[name].map((value, k) => stored(name, value, formats[name].wordBits, `${name} at ${speeds[k]} m/s`))]),
  ) as Record<LookupField, bigint[]>;
  const integer: IntegerTable<string> = {
    cubic,
    speeds: speeds.map((speed) => roundToInteger(speed * 2 ** SPEED_FRACTIONAL_BITS)),
    floor: roundToInteger(lookup.lowSpeedFloor_mps * 2 ** SPEED_FRACTIONAL_BITS),
    fractionalBits: Object.fromEntries(names.map((name) => [name, formats[name].fractionalBits])),
    gains: values,
    slopeTerms: Object.fromEntries(
      names.map((name) => {
        const terms = slopeTerms(name);
        const term = (value: number, k: number): bigint => stored(name, value, 32, `${name} slope term between ${speeds[k]} and ${speeds[k + 1]} m/s`);
        return [name, { d0: terms.d0.map(term), d1: terms.d1.map(term) }];
      }),
    ),
  };
  const quantised: GainTable = {
    speeds_mps: speeds,
    gains: table.gains.map(
      (_, k): PidGains => ({
        kp: Number(values.kp[k]) / 2 ** formats.kp.fractionalBits,
        ki: Number(values.ki[k]) / 2 ** formats.ki.fractionalBits,
        kd: Number(values.kd[k]) / 2 ** formats.kd.fractionalBits,
      }),
    ),
  };
  const integerLookup = makeIntegerGainLookup(integer);
  const exactLookup = makeGainLookup(table, lookup, gainSlopeValues);
  const [first, last] = [speeds[0], speeds[n - 1]];
  const grid = Array.from({ length: INTERPOLATED_SPEEDS + 1 }, (_, i) => first + ((last - first) * i) / INTERPOLATED_SPEEDS);
  const fromInteger = grid.map(integerLookup);
  const fromExact = grid.map(exactLookup);
  const error = (name: GainName): GainQuantisationError => {
    let maxAbsolute = 0;
    let maxRelative = 0;
    table.gains.forEach((row, k) => {
      const difference = Math.abs(quantised.gains[k][name] - row[name]);
      maxAbsolute = Math.max(maxAbsolute, difference);
      if (row[name] !== 0) maxRelative = Math.max(maxRelative, difference / Math.abs(row[name]));
    });
    const maxAbsoluteInterpolated = grid.reduce((worst, _, i) => Math.max(worst, Math.abs(fromInteger[i][name] - fromExact[i][name])), maxAbsolute);
    return { maxAbsolute, maxRelative, maxAbsoluteInterpolated };
  };
  const resolutionBounds = { kp: 2 ** -(formats.kp.fractionalBits + 1), ki: 2 ** -(formats.ki.fractionalBits + 1), kd: 2 ** -(formats.kd.fractionalBits + 1) };
  return {
    formats: { kp: formats.kp, ki: formats.ki, kd: formats.kd },
    raw: { kp: values.kp.map(Number), ki: values.ki.map(Number), kd: values.kd.map(Number) },
    table: quantised,
    errors: { kp: error('kp'), ki: error('ki'), kd: error('kd') },
    resolutionBounds,
    resolutionBound: Math.max(resolutionBounds.kp, resolutionBounds.ki, resolutionBounds.kd),
    lookupErrorBounds: Object.fromEntries(
      names.map((name) => [
        name,
        lookupErrorBound({
          speeds_mps: speeds,
          values: columns[name],
          slopes: slopes(name),
          cubic,
          fractionalBits: formats[name].fractionalBits,
          stored: values[name],
        }),
      ]),
    ) as Partial<Record<LookupField, number>>,
    ...(extras === undefined
      ? {}
      : { extraFormats: Object.fromEntries(EXTRA_NAMES.map((name) => [name, formats[name]])) as Record<ExtraColumn, FixedPointFormat> }),
    integer,
    lookup: integerLookup,
  };
}

const isGain = (name: LookupField): name is GainName => (NAMES as readonly string[]).includes(name);

/** "Q16.16" for a format. */
export const formatName = (format: FixedPointFormat): string => `Q${format.wordBits - format.fractionalBits}.${format.fractionalBits}`;
