/**
 * The fixed-point lookup in integers only, for firmware without floating point: the computation the
 * C header's integer lookup performs (c-integer-lookup.ts), reproduced bit for bit here (BigInt) so that
 * the export's dense check judges exactly the gains the firmware will compute.
 *
 * Speed is an int32 in units of 2^−16 m/s (SPEED_FRACTIONAL_BITS). Each column — kp, ki, kd and, in a header
 * with the step function, the set-point weights, feed-forward gain and lead time — has its own Q format
 * (value = stored integer / 2^F). On an interval [s_k, s_k+1) of width h (same units as speed):
 *   t   = ((v − s_k)·2^24) / h                       (Q24, truncated: C99 integer division)
 *   linear:   acc = y0·2^24 + t·(y1 − y0)
 *   cubic:    t2 = t·t >> 24, t3 = t2·t >> 24,
 *             acc = y0·2^24 + (3·t2 − 2·t3)·(y1 − y0) + (t3 − 2·t2 + t)·d0 + (t3 − t2)·d1
 *             with d0 = round(h·m_k·2^F), d1 = round(h·m_k+1·2^F) the Hermite slope terms of the exact table
 *   y   = acc / 2^24 rounded half away from zero, then kept between y0 and y1.
 * Cubic Hermite in the form y0 + h01·(y1 − y0) + h10·h·m0 + h11·h·m1 (h00 + h01 = 1; Fritsch & Carlson 1980
 * slopes). Every intermediate stays below 2^58 in magnitude: int64 in C, exact here.
 */
import type { PidGains } from '../controller/types.js';

/** Speed units of the integer lookup: 2^−16 m/s in an int32 (±32 767 m/s). */
export const SPEED_FRACTIONAL_BITS = 16;
/** Fractional bits of the interpolation weight t and the Hermite basis. */
export const WEIGHT_FRACTIONAL_BITS = 24;

type GainName = 'kp' | 'ki' | 'kd';

/** Everything the integer lookup holds (the header's const arrays), as integers: one column per name, in order. */
export interface IntegerTable<Name extends string = GainName> {
  readonly cubic: boolean;
  /** Breakpoint speeds in units of 2^−16 m/s, strictly increasing. */
  readonly speeds: readonly bigint[];
  /** The low-speed floor in the same units. */
  readonly floor: bigint;
  /** Fractional bits of each column. */
  readonly fractionalBits: Readonly<Record<Name, number>>;
  /** Stored values per breakpoint, per column (the gains first). */
  readonly gains: Readonly<Record<Name, readonly bigint[]>>;
  /** Cubic: slope terms per interval k, d0 = round(h_k·m_k·2^F) and d1 = round(h_k·m_k+1·2^F); empty when linear. */
  readonly slopeTerms: Readonly<Record<Name, { readonly d0: readonly bigint[]; readonly d1: readonly bigint[] }>>;
}

/** round(x) half away from zero, as a BigInt (x a finite double). */
export function roundToInteger(x: number): bigint {
  return BigInt(Math.sign(x) * Math.round(Math.abs(x)));
}

/** C99's truncating division of a by a positive b, rounded half away from zero: (a ± b/2) / b. */
function divideRounded(a: bigint, b: bigint): bigint {
  const half = b / 2n;
  return a >= 0n ? (a + half) / b : -((-a + half) / b);
}

const ONE = 1n << BigInt(WEIGHT_FRACTIONAL_BITS);
const WEIGHT_SHIFT = BigInt(WEIGHT_FRACTIONAL_BITS);

/** The stored values of every column at a speed (units of 2^−16 m/s), exactly as the C integer lookup computes them. */
export function integerLookup<Name extends string>(table: IntegerTable<Name>, speed: bigint): Record<Name, bigint> {
  const { speeds } = table;
  const last = speeds.length - 1;
  const names = Object.keys(table.gains) as Name[];
  const row = (k: number): Record<Name, bigint> => Object.fromEntries(names.map((name) => [name, table.gains[name][k]])) as Record<Name, bigint>;
  const v = speed < table.floor ? table.floor : speed;
  if (!(v > speeds[0])) return row(0);
  if (v >= speeds[last]) return row(last);
  let low = 0;
  let high = last;
  while (high - low > 1) {
    const middle = Math.floor((low + high) / 2);
    if (speeds[middle] <= v) low = middle;
    else high = middle;
  }
  const k = low;
  if (v === speeds[k]) return row(k);
  const t = ((v - speeds[k]) << WEIGHT_SHIFT) / (speeds[k + 1] - speeds[k]);
  const t2 = (t * t) >> WEIGHT_SHIFT;
  const t3 = (t2 * t) >> WEIGHT_SHIFT;
  const result = {} as Record<Name, bigint>;
  for (const name of names) {
    const y0 = table.gains[name][k];
    const y1 = table.gains[name][k + 1];
    const acc = table.cubic
      ? y0 * ONE + (3n * t2 - 2n * t3) * (y1 - y0) + (t3 - 2n * t2 + t) * table.slopeTerms[name].d0[k] + (t3 - t2) * table.slopeTerms[name].d1[k]
      : y0 * ONE + t * (y1 - y0);
    const y = divideRounded(acc, ONE);
    const [lowest, highest] = y0 < y1 ? [y0, y1] : [y1, y0];
    result[name] = y < lowest ? lowest : y > highest ? highest : y;
  }
  return result;
}

/** The speed a firmware passes, in units of 2^−16 m/s: round(v·2^16), saturated to int32. */
export function speedToInteger(speed_mps: number): bigint {
  const scaled = roundToInteger(Math.max(-(2 ** 31), Math.min(2 ** 31 - 1, speed_mps * 2 ** SPEED_FRACTIONAL_BITS)));
  return scaled;
}

/** The gains (values, SI) the firmware's integer lookup gives at a speed in m/s. */
export function makeIntegerGainLookup(table: IntegerTable<string>): (speed_mps: number) => PidGains {
  return (speed_mps) => {
    const stored = integerLookup(table, speedToInteger(speed_mps));
    return {
      kp: Number(stored.kp) / 2 ** table.fractionalBits.kp,
      ki: Number(stored.ki) / 2 ** table.fractionalBits.ki,
      kd: Number(stored.kd) / 2 ** table.fractionalBits.kd,
    };
  };
}
