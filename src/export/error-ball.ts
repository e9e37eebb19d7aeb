/**
 * Balls (midpoint, radius) for bounding the distance between two computations of one quantity: the midpoint is
 * the floating-point controller's value, the radius bounds how far the integer controller's value can be from it.
 * Sums add radii; products use |a·b − a'·b'| ≤ |a|·rb + |b|·ra + ra·rb; monotone functions are bounded by their
 * values at the ends. Evaluated in double: the radii carry a relative round-off of about 1e−16 (negligible).
 */
import { clamp } from '../core/clamp.js';

export interface Ball {
  /** The floating-point controller's value. */
  readonly m: number;
  /** A bound on |integer value − m|. */
  readonly r: number;
}

export const ball = (m: number, r = 0): Ball => ({ m, r });
export const plus = (a: Ball, b: Ball): Ball => ({ m: a.m + b.m, r: a.r + b.r });
export const minus = (a: Ball, b: Ball): Ball => ({ m: a.m - b.m, r: a.r + b.r });
export const times = (a: Ball, b: Ball): Ball => ({ m: a.m * b.m, r: Math.abs(a.m) * b.r + Math.abs(b.m) * a.r + a.r * b.r });
/** One more rounding (or any further error) of at most `error`. */
export const widen = (a: Ball, error: number): Ball => ({ m: a.m, r: a.r + error });
/** The same set of values described around another midpoint (the floating-point value computed its own way). */
export const around = (a: Ball, m: number): Ball => ({ m, r: a.r + Math.abs(a.m - m) });
export const low = (a: Ball): number => a.m - a.r;
export const high = (a: Ball): number => a.m + a.r;
/** The ball around m holding [lowest, highest]. */
export const fromRange = (m: number, lowest: number, highest: number): Ball => ({ m, r: Math.max(0, highest - m, m - lowest) });
/** The ball around m holding every value of every ball given (one of several outcomes). */
export const hull = (m: number, ...balls: readonly Ball[]): Ball => ({ m, r: Math.max(0, ...balls.map((b) => Math.abs(b.m - m) + b.r)) });

/** clamp(x, lowest, highest), monotone in all three: bounded by the clamps of the ends (lowest ≤ highest throughout). */
export function clampBall(x: Ball, lowest: Ball, highest: Ball, m: number): Ball {
  return fromRange(m, clamp(low(x), low(lowest), low(highest)), clamp(high(x), high(lowest), high(highest)));
}
