/**
 * The integral's part of the fixed-point command bound (fixed-point-bound.ts) where the controller equation is not
 * Lipschitz in its state: conditional integration (a decision) and back-calculation (a feedback of the integral
 * through the limit), and the tracking factor T/Tt as the integer step computes it.
 */
import { SpeedbandError } from '../core/errors.js';
import { around, ball, fromRange, high, hull, low, plus, times, widen, type Ball } from './error-ball.js';
import { ACCUMULATOR_FRACTIONAL_BITS, type IntegerStepPlan } from './integer-step-plan.js';

const half = (bits: number): number => 2 ** -(bits + 1);

/**
 * The integral after conditional integration (and whether the integer step may decide otherwise), both outcomes where it may, each
 * narrowed by the condition that leads to it (the others: F + P + D). With an increment > 0 the increment is kept
 * only if others + trial ≤ limit, so the kept value is at most limit − others; it is dropped only if
 * others + trial > limit, and trial − dropped ≤ increment, so the dropped value exceeds limit − others − increment
 * (mirrored for an increment < 0). Without the narrowing a run that rides the limit would add an increment every
 * sample; with it the two stay within about one increment of each other, as the law itself does.
 */
export function conditionalIntegration(input: {
  readonly trial: Ball;
  readonly dropped: Ball;
  readonly increment: Ball;
  readonly others: Ball;
  readonly unlimited: Ball;
  readonly limit: number;
  readonly m: number;
}): { readonly integral: Ball; readonly undecided: boolean } {
  const { trial, dropped, increment, others, unlimited: v, limit } = input;
  const mayDrop = (high(v) > limit && high(increment) > 0) || (low(v) < -limit && low(increment) < 0);
  const mayKeep = (low(v) <= limit && high(v) >= -limit) || (high(v) > limit && low(increment) <= 0) || (low(v) < -limit && high(increment) >= 0);
  const ranges: [number, number][] = [];
  if (mayKeep) {
    const top = low(increment) > 0 ? Math.min(high(trial), limit - low(others)) : high(trial);
    const bottom = high(increment) < 0 ? Math.max(low(trial), -limit - high(others)) : low(trial);
    if (bottom <= top) ranges.push([bottom, top]);
  }
  if (mayDrop) {
    const bottom = low(increment) > 0 ? Math.max(low(dropped), limit - high(others) - high(increment)) : low(dropped);
    const top = high(increment) < 0 ? Math.min(high(dropped), -limit - low(others) - low(increment)) : high(dropped);
    if (bottom <= top) ranges.push([bottom, top]);
  }
  if (ranges.length === 0) throw new SpeedbandError('internal', 'conditional integration has no outcome');
  return { integral: fromRange(input.m, Math.min(...ranges.map(([a]) => a)), Math.max(...ranges.map(([, b]) => b))), undecided: ranges.length === 2 };
}

/** [lowest, highest] T/Tt as the integer step computes it: T·|ki|/|kp| when kd = 0, else the floor of √(T²·|ki|/|kd|); both where kd may be 0. */
export function trackingRange(
  kp: Ball,
  kd: Ball,
  context: { readonly plan: IntegerStepPlan; readonly sampleTime: number; readonly kdUnit: number; readonly integralGain: Ball },
): [number, number] {
  const { plan, sampleTime, kdUnit, integralGain } = context;
  const unit = 2 ** -plan.trackingBits;
  const kiT = [Math.max(0, Math.abs(integralGain.m) - integralGain.r), Math.abs(integralGain.m) + integralGain.r];
  const ranges: [number, number][] = [];
  if (low(kd) <= 0 && high(kd) >= 0) {
    const kpLow = Math.abs(kp.m) - kp.r;
    ranges.push([kiT[0] / (Math.abs(kp.m) + kp.r) - unit / 2, kpLow > 0 ? kiT[1] / kpLow + unit / 2 : plan.largestTracking + unit]);
  }
  if (kd.m !== 0 || kd.r > 0) {
    const squareRounding = half(2 * plan.trackingBits);
    const kiTT = [Math.max(0, kiT[0] * sampleTime - half(plan.integralGainBits)), kiT[1] * sampleTime + half(plan.integralGainBits)];
    const kdRange = [Math.max(kdUnit, Math.abs(kd.m) - kd.r), Math.abs(kd.m) + kd.r];
    ranges.push([Math.sqrt(Math.max(0, kiTT[0] / kdRange[1] - squareRounding)) - unit, Math.sqrt(kiTT[1] / kdRange[0] + squareRounding)]);
  }
  const lowest = Math.max(0, Math.min(...ranges.map(([a]) => a)));
  const highest = Math.min(Math.max(...ranges.map(([, b]) => b)), plan.largestTracking + unit);
  return [lowest, highest];
}

/**
 * I + part + (T/Tt)·(u' − v') before the integrator clamp, with back-calculation: v' = others' + I of the previous
 * sample, u' its clamp to the command limit. Taken as one function of I, the previous others and c = T/Tt,
 * ψ = I + c·(clamp(others + I) − others − I), it is nondecreasing in I (slope 1 − c·s, s ∈ {0, 1}) and nonincreasing
 * in the others when c ≤ 1, and linear in c: bounded at the corners, so the integral's error does not grow while
 * the command is limited (the tracking pulls both toward the limit). With c > 1 the terms are bounded one by one.
 */
export function backCalculationSum(input: {
  readonly integral: Ball;
  readonly previousOthers: Ball;
  readonly previousSaturation: Ball;
  readonly part: Ball;
  /** [lowest, highest] T/Tt of the integer step (0 included when it may skip the term). */
  readonly tracking: readonly [number, number];
  readonly limit: number;
  readonly termExact: number;
  readonly m: number;
}): Ball {
  const { integral, previousOthers, part, tracking, limit } = input;
  const [cLow, cHigh] = tracking;
  const rounding = 2 ** -(ACCUMULATOR_FRACTIONAL_BITS + 1);
  if (cHigh <= 1) {
    const psi = (i: number, others: number, c: number): number => {
      const v = others + i;
      return i + c * ((v > limit ? limit : v < -limit ? -limit : v) - v);
    };
    const lowest = Math.min(psi(low(integral), high(previousOthers), cLow), psi(low(integral), high(previousOthers), cHigh)) - rounding;
    const highest = Math.max(psi(high(integral), low(previousOthers), cLow), psi(high(integral), low(previousOthers), cHigh)) + rounding;
    return fromRange(input.m, lowest + low(part), highest + high(part));
  }
  const tracked = widen(times(fromRange(0.5 * (cLow + cHigh), cLow, cHigh), input.previousSaturation), rounding);
  return around(plus(plus(integral, part), hull(input.termExact, tracked, ball(0))), input.m);
}
