/**
 * Lumped models fitted from steering command (rad) to yaw rate (rad/s), per step
 * and per speed. Gains in (rad/s)/rad = 1/s; times in s.
 */
export interface FopdtModel {
  readonly kind: 'fopdt';
  /** K in K·e^(−θs)/(τs + 1). */
  readonly gain: number;
  readonly timeConstant_s: number;
  readonly deadTime_s: number;
}

/** Second order plus dead time, optionally with a numerator zero: K(βs + 1)e^(−θs)/((τ1 s + 1)(τ2 s + 1)) or K(βs+1)e^(−θs)/(s²/ωn² + 2ζs/ωn + 1). */
export interface SecondOrderModel {
  readonly kind: 'second-order';
  readonly gain: number;
  readonly naturalFrequency_radps: number;
  readonly dampingRatio: number;
  /** Numerator zero time constant β, s (0 when fitted without a zero). */
  readonly zeroTimeConstant_s: number;
  readonly deadTime_s: number;
}

/** A per-speed model of the steer command → yaw rate response: FOPDT or second order plus dead time. */
export type LumpedModel = FopdtModel | SecondOrderModel;
