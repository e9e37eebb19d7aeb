/**
 * Gain lookup: build once from a table, evaluate many times (factory style).
 *
 * Choices, written down (docs/domain.md §7):
 * - Between breakpoints each gain (kp, ki, kd) is interpolated on its own, either linearly or
 *   by monotone piecewise cubic Hermite (Fritsch & Carlson 1980, see monotone-cubic.ts).
 * - At a breakpoint the table value is returned exactly.
 * - Outside the table the end values are held (clamp, no extrapolation).
 * - Below the low-speed floor the gains at the floor speed are used: the lookup speed is
 *   max(speed, floor), then clamped to the table.
 * - The result is also kept within the two neighbouring table values, which guards the
 *   last bit of rounding; mathematically both methods already stay inside.
 * The C export (src/export/c-header.ts) computes the same thing.
 */
import type { PidGains } from '../controller/types.js';
import { SpeedbandError } from '../core/errors.js';
import { hermiteValue, monotoneCubicSlopes } from './monotone-cubic.js';
import type { GainTable, GainsAtSpeed, LookupSettings } from './types.js';

export const LOOKUP_DEFAULTS: LookupSettings = { interpolation: 'monotone-cubic', lowSpeedFloor_mps: 0 };

const GAIN_NAMES = ['kp', 'ki', 'kd'] as const;

/** Throw `schedule.tableInvalid` unless speeds are finite and strictly increasing and every gain is finite. */
export function validateGainTable(table: GainTable): void {
  const { speeds_mps: speeds, gains } = table;
  if (speeds.length === 0) {
    throw new SpeedbandError('schedule.tableInvalid', 'the gain table has no breakpoints — give at least one speed with gains');
  }
  if (gains.length !== speeds.length) {
    throw new SpeedbandError('schedule.tableInvalid', `the gain table has ${speeds.length} speeds but ${gains.length} gain rows — give one row per speed`);
  }
  for (let k = 0; k < speeds.length; k += 1) {
    if (!Number.isFinite(speeds[k])) {
      throw new SpeedbandError('schedule.tableInvalid', `breakpoint ${k} speed is ${speeds[k]} — speeds must be finite numbers in m/s`, {
        location: { jsonPath: `/breakpoints/${k}/speed_mps` },
      });
    }
    if (k > 0 && !(speeds[k] > speeds[k - 1])) {
      throw new SpeedbandError(
        'schedule.tableInvalid',
        `breakpoint speeds must increase strictly: ${speeds[k - 1]} then ${speeds[k]} m/s at breakpoint ${k} — sort them and remove duplicates`,
        { location: { jsonPath: `/breakpoints/${k}/speed_mps` } },
      );
    }
    for (const name of GAIN_NAMES) {
      if (!Number.isFinite(gains[k][name])) {
        throw new SpeedbandError('schedule.tableInvalid', `breakpoint ${k} ${name} is ${gains[k][name]} — gains must be finite numbers`, {
          location: { jsonPath: `/breakpoints/${k}/${name}` },
        });
      }
    }
  }
}

/** Per-gain Hermite slopes of a table (gain per m/s), as stored in the C export; zeros for linear. */
export interface GainSlopes {
  readonly kp: Float64Array;
  readonly ki: Float64Array;
  readonly kd: Float64Array;
}

/** Slopes the lookup uses for each gain: Fritsch–Carlson for 'monotone-cubic', unused (zero) for 'linear'. */
export function gainSlopes(table: GainTable, interpolation: LookupSettings['interpolation']): GainSlopes {
  const column = (name: (typeof GAIN_NAMES)[number]): Float64Array =>
    columnSlopes(
      table.speeds_mps,
      table.gains.map((row) => row[name]),
      interpolation,
    );
  return { kp: column('kp'), ki: column('ki'), kd: column('kd') };
}

/** Hermite slopes of one column (per m/s): Fritsch–Carlson for 'monotone-cubic', zeros (unused) for 'linear'. */
export function columnSlopes(speeds_mps: ArrayLike<number>, column: ArrayLike<number>, interpolation: LookupSettings['interpolation']): Float64Array {
  return interpolation === 'linear' ? new Float64Array(speeds_mps.length) : monotoneCubicSlopes(speeds_mps, column);
}

/**
 * The lookup of several columns at once (one search for the interval, no allocation): `(speed_mps, out)` writes
 * column j's value at the speed into out[j]. `slopes[j]` are column j's Hermite slopes (gain per m/s; zeros or
 * unused for 'linear'). The rules of the file comment; a non-finite speed is a `schedule.speedNotFinite` error.
 * Every lookup of this file is this one function, so gains, set-point weights and feed-forward interpolate alike.
 */
export function makeRowLookup(
  speeds_mps: ArrayLike<number>,
  columns: readonly ArrayLike<number>[],
  slopes: readonly ArrayLike<number>[],
  settings: Partial<LookupSettings> = {},
): (speed_mps: number, out: Float64Array) => void {
  const { interpolation, lowSpeedFloor_mps } = { ...LOOKUP_DEFAULTS, ...settings };
  const speeds = Float64Array.from(speeds_mps);
  const n = speeds.length;
  const width = columns.length;
  const values = columns.map((column) => Float64Array.from(column));
  const gradients = slopes.map((column) => Float64Array.from(column));
  const cubic = interpolation === 'monotone-cubic';
  const row = (k: number, out: Float64Array): void => {
    for (let j = 0; j < width; j++) out[j] = values[j][k];
  };
  return (speed_mps, out) => {
    if (!Number.isFinite(speed_mps)) {
      throw new SpeedbandError('schedule.speedNotFinite', `the lookup was asked for the gains at speed ${speed_mps} — give a finite speed in m/s`);
    }
    const speed = speed_mps < lowSpeedFloor_mps ? lowSpeedFloor_mps : speed_mps;
    if (speed <= speeds[0]) return row(0, out);
    if (speed >= speeds[n - 1]) return row(n - 1, out);
    let low = 0;
    let high = n - 1;
    while (high - low > 1) {
      const middle = (low + high) >> 1;
      if (speeds[middle] <= speed) low = middle;
      else high = middle;
    }
    if (speed === speeds[low]) return row(low, out);
    const h = speeds[low + 1] - speeds[low];
    const t = (speed - speeds[low]) / h;
    for (let j = 0; j < width; j++) {
      const y0 = values[j][low];
      const y1 = values[j][low + 1];
      const raw = cubic ? hermiteValue({ t, h, y0, y1, m0: gradients[j][low], m1: gradients[j][low + 1] }) : y0 + t * (y1 - y0);
      const lowest = y0 < y1 ? y0 : y1;
      const highest = y0 < y1 ? y1 : y0;
      out[j] = raw < lowest ? lowest : raw > highest ? highest : raw;
    }
  };
}

/**
 * Build the schedule's lookup: `(speed_mps) → PidGains`. Speeds in m/s; gains as in the table
 * (parallel PID, units of the loop). See the file comment for the interpolation and clamping rules.
 * A non-finite speed is a `schedule.speedNotFinite` error. `givenSlopes` (gain per m/s) replace the
 * Fritsch–Carlson slopes for 'monotone-cubic' — the fixed-point export keeps the exact table's slopes.
 */
export function makeGainLookup(table: GainTable, settings: Partial<LookupSettings> = {}, givenSlopes?: GainSlopes): GainsAtSpeed {
  validateGainTable(table);
  const slopes = givenSlopes ?? gainSlopes(table, { ...LOOKUP_DEFAULTS, ...settings }.interpolation);
  const lookup = makeRowLookup(
    table.speeds_mps,
    GAIN_NAMES.map((name) => table.gains.map((row) => row[name])),
    [slopes.kp, slopes.ki, slopes.kd],
    settings,
  );
  const out = new Float64Array(GAIN_NAMES.length);
  return (speed_mps: number): PidGains => {
    lookup(speed_mps, out);
    return { kp: out[0], ki: out[1], kd: out[2] };
  };
}

/**
 * Any columns of a table interpolated exactly as the gains are (same method, clamp, floor, kept between
 * neighbours): `(speed_mps) → { name: value }`. The schedule's set-point weights and feed-forward use it;
 * the C export computes the same (Fritsch–Carlson slopes per column for 'monotone-cubic').
 */
export function makeColumnsLookup<Name extends string>(
  speeds_mps: readonly number[],
  columns: Readonly<Record<Name, readonly number[]>>,
  settings: Partial<LookupSettings> = {},
): (speed_mps: number) => Record<Name, number> {
  const names = Object.keys(columns) as Name[];
  const lookup = makeColumnsRowLookup(
    speeds_mps,
    names.map((name) => columns[name]),
    settings,
  );
  const out = new Float64Array(names.length);
  return (speed_mps) => {
    lookup(speed_mps, out);
    const result = {} as Record<Name, number>;
    names.forEach((name, j) => {
      result[name] = out[j];
    });
    return result;
  };
}

/** makeRowLookup of columns given as numbers, each checked as a gain column is (finite values, strictly increasing speeds), with its Fritsch–Carlson slopes. */
export function makeColumnsRowLookup(
  speeds_mps: readonly number[],
  columns: readonly (readonly number[])[],
  settings: Partial<LookupSettings> = {},
): (speed_mps: number, out: Float64Array) => void {
  const interpolation = { ...LOOKUP_DEFAULTS, ...settings }.interpolation;
  for (const column of columns) validateGainTable({ speeds_mps, gains: column.map((value) => ({ kp: value, ki: 0, kd: 0 })) });
  return makeRowLookup(
    speeds_mps,
    columns,
    columns.map((column) => columnSlopes(speeds_mps, column, interpolation)),
    settings,
  );
}
