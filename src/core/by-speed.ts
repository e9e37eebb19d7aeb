/**
 * Records whose numbers may vary with speed: each number of the record is one number at every speed or a
 * table over speed (linear between its speeds, the end values held beyond them). Plain data, so it crosses
 * to worker threads as it is; read at a speed with atSpeed. The acceptance limits are such records
 * (src/schedule/acceptance-limits.ts: a plan's expressions of speed become tables at the check speeds).
 */

/** A value per speed: linear between the given speeds (m/s, strictly increasing), the end values held beyond them. */
export interface SpeedTable {
  readonly speeds_mps: readonly number[];
  readonly values: readonly number[];
}

/** A number that is the same at every speed, or a table over speed. */
export type NumberOverSpeed = number | SpeedTable;

/** The record T with each number allowed to vary with speed. */
export type OverSpeed<T> = { readonly [K in keyof T]: T[K] extends number ? NumberOverSpeed : T[K] };

/** A number or speed table at a speed (m/s): a table is linear between its speeds, its end values held beyond them. */
export function valueAtSpeed(value: NumberOverSpeed, speed_mps: number): number {
  if (typeof value === 'number') return value;
  const { speeds_mps: speeds, values } = value;
  if (speed_mps <= speeds[0]) return values[0];
  const last = speeds.length - 1;
  if (speed_mps >= speeds[last]) return values[last];
  let low = 0;
  let high = last;
  while (high - low > 1) {
    const middle = (low + high) >> 1;
    if (speeds[middle] <= speed_mps) low = middle;
    else high = middle;
  }
  const t = (speed_mps - speeds[low]) / (speeds[high] - speeds[low]);
  return values[low] + t * (values[high] - values[low]);
}

/** True when some number of the record varies with speed. */
export function variesWithSpeed<T extends object>(record: OverSpeed<T>): boolean {
  return Object.values(record).some((value) => typeof value === 'object' && value !== null && 'speeds_mps' in value);
}

/** The record at a speed (m/s); a record with no table is returned as it is. */
export function atSpeed<T extends object>(record: OverSpeed<T>, speed_mps: number): T {
  let resolved: Record<string, unknown> | null = null;
  for (const [key, value] of Object.entries(record)) {
    if (typeof value === 'object' && value !== null && 'speeds_mps' in value) {
      resolved ??= { ...record };
      resolved[key] = valueAtSpeed(value as SpeedTable, speed_mps);
    }
  }
  return (resolved ?? record) as T;
}

/** The number or table with `change` applied to each value. */
export function mapOverSpeed(value: NumberOverSpeed, change: (value: number) => number): NumberOverSpeed {
  return typeof value === 'number' ? change(value) : { speeds_mps: value.speeds_mps, values: value.values.map(change) };
}

/**
 * A limit in words: the number as `shown` writes it (default: 4 significant digits), or a table's range
 * "35–49 (varies with speed)" — for summaries; the value at a speed is valueAtSpeed.
 */
export function overSpeedText(value: NumberOverSpeed, shown: (value: number) => string = (v) => String(Number(v.toPrecision(4)))): string {
  if (typeof value === 'number') return shown(value);
  const low = Math.min(...value.values);
  const high = Math.max(...value.values);
  return low === high ? shown(low) : `${shown(low)}–${shown(high)} (varies with speed)`;
}
