/**
 * A value limited to [low, high] (low ≤ high), compared as written: the clamp of the firmware's controller equation
 * (src/controller/firmware-step.ts) and of the bounds carried through it (src/export/error-ball.ts), one definition
 * so that the two cannot differ. A NaN value passes through.
 */
export function clamp(value: number, low: number, high: number): number {
  return value > high ? high : value < low ? low : value;
}
