/**
 * The steering actuator with its limits over a stretch of time with the (delayed, angle-limited) command c
 * held: a first-order position loop whose rate is limited, δ̇ = clamp((c − δ)/τa, ±δ̇max). With c held the
 * actuator ramps at ±δ̇max until |c − δ| = τa·δ̇max and then approaches c exponentially; the switching
 * instant is known in closed form, so the stretch splits into pieces each of which is linear
 * ('free': δ̇ = w, a fixed rate; 'track': δ̇ = (w − δ)/τa) and can be integrated exactly. Without a lag
 * (τa = 0) the wheel ramps at the rate limit to c and stays there (an infinite rate limit: jumps to it).
 * Used by the limited loop (limited-loop-simulation.ts) and the scenario simulator (scenario-simulation.ts).
 */

export interface ActuatorPiece {
  readonly kind: 'free' | 'track';
  readonly duration_s: number;
  /** 'free': the wheel's rate, rad/s; 'track': the angle approached, rad. */
  readonly input: number;
  /** Set the wheel angle to this before the piece (where the closed form puts it; removes rounding at a switch). */
  readonly startAngle?: number;
  /** True when the wheel moves at its rate limit through this piece. */
  readonly atRateLimit: boolean;
}

/** Receives one piece (the fields of ActuatorPiece; `startAngle` NaN when the angle is not set). */
export type ActuatorPieceVisitor = (kind: 'free' | 'track', duration_s: number, input: number, startAngle: number, atRateLimit: boolean) => void;

/**
 * Visit the pieces of `duration_s` seconds with the command `target` held, from wheel angle `angle` (rad), in order
 * (no allocation: the simulators' inner loop).
 */
export function visitActuatorPieces(angle: number, target: number, duration_s: number, lag_s: number, rate_radps: number, visit: ActuatorPieceVisitor): void {
  if (duration_s <= 0) return;
  const error = target - angle;
  const direction = Math.sign(error);
  if (lag_s > 0) {
    const band = rate_radps * lag_s;
    if (!(Math.abs(error) > band)) {
      visit('track', duration_s, target, Number.NaN, false);
      return;
    }
    const ramp = (Math.abs(error) - band) / rate_radps;
    if (ramp >= duration_s) {
      visit('free', duration_s, direction * rate_radps, Number.NaN, true);
      return;
    }
    visit('free', ramp, direction * rate_radps, Number.NaN, true);
    visit('track', duration_s - ramp, target, target - direction * band, false);
    return;
  }
  if (error !== 0 && !Number.isFinite(rate_radps)) {
    visit('free', duration_s, 0, target, false);
    return;
  }
  if (error === 0) {
    visit('free', duration_s, 0, Number.NaN, false);
    return;
  }
  const ramp = Math.abs(error) / rate_radps;
  if (ramp >= duration_s) {
    visit('free', duration_s, direction * rate_radps, Number.NaN, true);
    return;
  }
  visit('free', ramp, direction * rate_radps, Number.NaN, true);
  visit('free', duration_s - ramp, 0, target, false);
}

/** A stretch of time with a command held, and the actuator that follows it (actuatorPieces). */
export interface ActuatorStretch {
  /** The wheel angle at the start, rad. */
  readonly angle: number;
  /** The (delayed, angle-limited) command held through the stretch, rad. */
  readonly target: number;
  /** Length of the stretch, s. */
  readonly duration_s: number;
  /** The actuator's lag τa, s (0: none). */
  readonly lag_s: number;
  /** The actuator's rate limit, rad/s (Infinity: none). */
  readonly rate_radps: number;
}

/** The pieces of `duration_s` seconds with the command `target` held, from wheel angle `angle` (rad), as records. */
export function actuatorPieces(stretch: ActuatorStretch): ActuatorPiece[] {
  const { angle, target, duration_s, lag_s, rate_radps } = stretch;
  const pieces: ActuatorPiece[] = [];
  visitActuatorPieces(angle, target, duration_s, lag_s, rate_radps, (kind, duration, input, startAngle, atRateLimit) => {
    pieces.push({ kind, duration_s: duration, input, ...(Number.isNaN(startAngle) ? {} : { startAngle }), atRateLimit });
  });
  return pieces;
}
