/**
 * A record that may depend on speed: the same at every speed, or a function of speed (m/s) — e.g. the
 * acceptance limits, which a plan may write as expressions of speed (src/schedule/acceptance-limits.ts).
 * A function crosses no thread boundary: code that posts work to a worker resolves it at each speed first.
 */
export type BySpeed<T extends object> = T | ((speed_mps: number) => T);

/** The record at a speed (m/s). */
export function atSpeed<T extends object>(value: BySpeed<T>, speed_mps: number): T {
  return typeof value === 'function' ? value(speed_mps) : value;
}
