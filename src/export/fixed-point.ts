/**
 * Fixed-point (Q-format) gains for firmware without floating point. Format I.F: a signed
 * two's-complement word of I + F bits (I integer bits including the sign bit, F fractional bits);
 * stored integer q = round(x·2^F) (round half away from zero), represented value q/2^F,
 * quantisation error at most 2^−(F+1) per value inside the range [−2^(I−1), 2^(I−1) − 2^−F].
 * The Hermite slopes stay those of the exact table (kept in double), so between breakpoints the
 * quantised lookup is h00·q0 + h01·q1 + (exact slope terms) with h00 + h01 = 1, h00, h01 ≥ 0: its
 * error is also at most 2^−(F+1), and the clamp to the neighbouring values cannot enlarge it.
 */
import type { PidGains } from '../controller/types.js';
import { SpeedbandError } from '../core/errors.js';
import { gainSlopes, makeGainLookup, type GainSlopes } from '../schedule/interpolate.js';
import type { GainTable, LookupSettings } from '../schedule/types.js';
import { quoted } from '../core/quote.js';

export interface FixedPointFormat {
  readonly fractionalBits: number;
  /** Total word size: 16 or 32 bits (int16_t, int32_t). */
  readonly wordBits: 16 | 32;
}

/** Maximum quantisation error of one gain: at the breakpoints, and over the interpolated lookup. */
export interface GainQuantisationError {
  readonly maxAbsolute: number;
  /** Largest |error|/|value| over breakpoints with a non-zero value (0 when all values are 0). */
  readonly maxRelative: number;
  /** Largest |lookup(quantised) − lookup(exact)| found on 1,001 speeds across the table (bounded by 2^−(F+1)). */
  readonly maxAbsoluteInterpolated: number;
}

export interface QuantisedTable {
  readonly format: FixedPointFormat;
  /** The stored integers per gain. */
  readonly raw: { readonly kp: readonly number[]; readonly ki: readonly number[]; readonly kd: readonly number[] };
  /** The values the integers represent (q/2^F), as a gain table. */
  readonly table: GainTable;
  readonly errors: { readonly kp: GainQuantisationError; readonly ki: GainQuantisationError; readonly kd: GainQuantisationError };
  /** Bound on the error at and between breakpoints, 2^−(F+1). */
  readonly resolutionBound: number;
  /** Hermite slopes of the exact table, gain per m/s (used with the quantised values). */
  readonly slopes: GainSlopes;
}

/** Parse "I.F" (e.g. "16.16", "8.24") into a format; I + F must be 16 or 32. */
export function parseQFormat(text: string): FixedPointFormat {
  const match = /^(\d+)\.(\d+)$/.exec(text.trim());
  const integerBits = match ? Number(match[1]) : Number.NaN;
  const fractionalBits = match ? Number(match[2]) : Number.NaN;
  const wordBits = integerBits + fractionalBits;
  if (!match || integerBits < 1 || (wordBits !== 16 && wordBits !== 32)) {
    throw new SpeedbandError(
      'export.qFormatInvalid',
      `Q format ${quoted(text)} is not I.F with I ≥ 1 integer bits (sign included) and I + F = 16 or 32 — e.g. 16.16 or 4.12`,
      { details: { given: text } },
    );
  }
  return { fractionalBits, wordBits: wordBits as 16 | 32 };
}

const NAMES = ['kp', 'ki', 'kd'] as const;
const INTERPOLATED_SPEEDS = 1000;

/** Quantise a gain table; `export.fixedPointOverflow` when a gain does not fit the word. */
export function quantiseTable(table: GainTable, format: FixedPointFormat, lookup: LookupSettings): QuantisedTable {
  const scale = 2 ** format.fractionalBits;
  const lowest = -(2 ** (format.wordBits - 1));
  const highest = 2 ** (format.wordBits - 1) - 1;
  const raw = { kp: [] as number[], ki: [] as number[], kd: [] as number[] };
  table.gains.forEach((gains, k) => {
    for (const name of NAMES) {
      const value = gains[name];
      const q = Math.sign(value) * Math.round(Math.abs(value) * scale);
      if (q < lowest || q > highest) {
        throw new SpeedbandError(
          'export.fixedPointOverflow',
          `${name} = ${value} at ${table.speeds_mps[k]} m/s does not fit Q${format.wordBits - format.fractionalBits}.${format.fractionalBits} ` +
            `(range ${lowest / scale} to ${highest / scale}) — use fewer fractional bits or a 32-bit word`,
          { details: { gain: name, value, speed_mps: table.speeds_mps[k] } },
        );
      }
      raw[name].push(q === 0 ? 0 : q);
    }
  });
  const quantised: GainTable = {
    speeds_mps: table.speeds_mps,
    gains: table.gains.map((_, k): PidGains => ({ kp: raw.kp[k] / scale, ki: raw.ki[k] / scale, kd: raw.kd[k] / scale })),
  };
  const slopes = gainSlopes(table, lookup.interpolation);
  const exactLookup = makeGainLookup(table, lookup, slopes);
  const quantisedLookup = makeGainLookup(quantised, lookup, slopes);
  const first = table.speeds_mps[0];
  const last = table.speeds_mps[table.speeds_mps.length - 1];
  const error = (name: (typeof NAMES)[number]): GainQuantisationError => {
    let maxAbsolute = 0;
    let maxRelative = 0;
    table.gains.forEach((gains, k) => {
      const difference = Math.abs(quantised.gains[k][name] - gains[name]);
      maxAbsolute = Math.max(maxAbsolute, difference);
      if (gains[name] !== 0) maxRelative = Math.max(maxRelative, difference / Math.abs(gains[name]));
    });
    let maxAbsoluteInterpolated = maxAbsolute;
    for (let i = 0; i <= INTERPOLATED_SPEEDS; i += 1) {
      const speed = first + ((last - first) * i) / INTERPOLATED_SPEEDS;
      maxAbsoluteInterpolated = Math.max(maxAbsoluteInterpolated, Math.abs(quantisedLookup(speed)[name] - exactLookup(speed)[name]));
    }
    return { maxAbsolute, maxRelative, maxAbsoluteInterpolated };
  };
  return {
    format,
    raw,
    table: quantised,
    errors: { kp: error('kp'), ki: error('ki'), kd: error('kd') },
    resolutionBound: 2 ** -(format.fractionalBits + 1),
    slopes,
  };
}
