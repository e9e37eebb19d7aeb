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
  const n = table.speeds_mps.length;
  if (interpolation === 'linear') return { kp: new Float64Array(n), ki: new Float64Array(n), kd: new Float64Array(n) };
  const column = (name: (typeof GAIN_NAMES)[number]): Float64Array =>
    monotoneCubicSlopes(
      table.speeds_mps,
      table.gains.map((row) => row[name]),
    );
  return { kp: column('kp'), ki: column('ki'), kd: column('kd') };
}

/**
 * Build the schedule's lookup: `(speed_mps) → PidGains`. Speeds in m/s; gains as in the table
 * (parallel PID, units of the loop). See the file comment for the interpolation and clamping rules.
 * A non-finite speed is a `schedule.speedNotFinite` error. `givenSlopes` (gain per m/s) replace the
 * Fritsch–Carlson slopes for 'monotone-cubic' — the fixed-point export keeps the exact table's slopes.
 */
export function makeGainLookup(table: GainTable, settings: Partial<LookupSettings> = {}, givenSlopes?: GainSlopes): GainsAtSpeed {
  validateGainTable(table);
  const { interpolation, lowSpeedFloor_mps } = { ...LOOKUP_DEFAULTS, ...settings };
  const speeds = Float64Array.from(table.speeds_mps);
  const n = speeds.length;
  const values = {
    kp: Float64Array.from(table.gains, (row) => row.kp),
    ki: Float64Array.from(table.gains, (row) => row.ki),
    kd: Float64Array.from(table.gains, (row) => row.kd),
  };
  const slopes = givenSlopes ?? gainSlopes(table, interpolation);
  const cubic = interpolation === 'monotone-cubic';

  const one = (y: Float64Array, m: Float64Array, k: number, t: number, h: number): number => {
    const y0 = y[k];
    const y1 = y[k + 1];
    const raw = cubic ? hermiteValue({ t, h, y0, y1, m0: m[k], m1: m[k + 1] }) : y0 + t * (y1 - y0);
    const low = y0 < y1 ? y0 : y1;
    const high = y0 < y1 ? y1 : y0;
    return raw < low ? low : raw > high ? high : raw;
  };

  return (speed_mps: number): PidGains => {
    if (!Number.isFinite(speed_mps)) {
      throw new SpeedbandError('schedule.speedNotFinite', `the lookup was asked for the gains at speed ${speed_mps} — give a finite speed in m/s`);
    }
    const speed = speed_mps < lowSpeedFloor_mps ? lowSpeedFloor_mps : speed_mps;
    if (speed <= speeds[0]) return { kp: values.kp[0], ki: values.ki[0], kd: values.kd[0] };
    if (speed >= speeds[n - 1]) return { kp: values.kp[n - 1], ki: values.ki[n - 1], kd: values.kd[n - 1] };
    let low = 0;
    let high = n - 1;
    while (high - low > 1) {
      const middle = (low + high) >> 1;
      if (speeds[middle] <= speed) low = middle;
      else high = middle;
    }
    if (speed === speeds[low]) return { kp: values.kp[low], ki: values.ki[low], kd: values.kd[low] };
    const h = speeds[low + 1] - speeds[low];
    const t = (speed - speeds[low]) / h;
    return {
      kp: one(values.kp, slopes.kp, low, t, h),
      ki: one(values.ki, slopes.ki, low, t, h),
      kd: one(values.kd, slopes.kd, low, t, h),
    };
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
  // Three columns at a time through the gain lookup: the same arithmetic, one implementation.
  const lookups = [] as { readonly names: Name[]; readonly lookup: GainsAtSpeed }[];
  for (let i = 0; i < names.length; i += 3) {
    const group = names.slice(i, i + 3);
    const column = (j: number): readonly number[] => (group[j] === undefined ? speeds_mps.map(() => 0) : columns[group[j]]);
    const table: GainTable = { speeds_mps, gains: speeds_mps.map((_, k) => ({ kp: column(0)[k], ki: column(1)[k], kd: column(2)[k] })) };
    lookups.push({ names: group, lookup: makeGainLookup(table, settings) });
  }
  return (speed_mps) => {
    const result = {} as Record<Name, number>;
    for (const { names: group, lookup } of lookups) {
      const values = lookup(speed_mps);
      const ordered = [values.kp, values.ki, values.kd];
      group.forEach((name, j) => {
        result[name] = ordered[j];
      });
    }
    return result;
  };
}
