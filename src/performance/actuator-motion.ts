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

/** The pieces of `duration_s` seconds with the command `target` held, from wheel angle `angle` (rad). */
export function actuatorPieces(angle: number, target: number, duration_s: number, lag_s: number, rate_radps: number): ActuatorPiece[] {
  if (duration_s <= 0) return [];
  const error = target - angle;
  const direction = Math.sign(error);
  if (lag_s > 0) {
    const band = rate_radps * lag_s;
    if (!(Math.abs(error) > band)) return [{ kind: 'track', duration_s, input: target, atRateLimit: false }];
    const ramp = (Math.abs(error) - band) / rate_radps;
    if (ramp >= duration_s) return [{ kind: 'free', duration_s, input: direction * rate_radps, atRateLimit: true }];
    return [
      { kind: 'free', duration_s: ramp, input: direction * rate_radps, atRateLimit: true },
      { kind: 'track', duration_s: duration_s - ramp, input: target, startAngle: target - direction * band, atRateLimit: false },
    ];
  }
  if (error !== 0 && !Number.isFinite(rate_radps)) return [{ kind: 'free', duration_s, input: 0, startAngle: target, atRateLimit: false }];
  if (error === 0) return [{ kind: 'free', duration_s, input: 0, atRateLimit: false }];
  const ramp = Math.abs(error) / rate_radps;
  if (ramp >= duration_s) return [{ kind: 'free', duration_s, input: direction * rate_radps, atRateLimit: true }];
  return [
    { kind: 'free', duration_s: ramp, input: direction * rate_radps, atRateLimit: true },
    { kind: 'free', duration_s: duration_s - ramp, input: 0, startAngle: target, atRateLimit: false },
  ];
}
