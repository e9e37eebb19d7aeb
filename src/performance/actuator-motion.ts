/**
 * The steering actuator with its limits over a stretch of time with the (delayed, angle-limited) command c
 * held: a first-order position loop whose rate is limited, δ̇ = clamp((c − δ)/τa, ±δ̇max). With c held the
 * actuator ramps at ±δ̇max until |c − δ| = τa·δ̇max and then approaches c exponentially; the switching
 * instant is known in closed form, so the stretch splits into pieces each of which is linear
 * ('free': δ̇ = w, a fixed rate; 'track': δ̇ = (w − δ)/τa) and can be integrated exactly. Without a lag
 * (τa = 0) the wheel ramps at the rate limit to c and stays there (an infinite rate limit: jumps to it).
 * Used by the limited loop (limited-loop-simulation.ts) and the scenario simulator (scenario-plant.ts).
 */

/**
 * The pieces, as numbers for the simulators' inner loops (no allocation, no callback): piece i occupies
 * PIECE_FIELDS entries from i·PIECE_FIELDS — its kind (PIECE_FREE: δ̇ = w, a fixed rate; PIECE_TRACK:
 * δ̇ = (w − δ)/τa), its duration (s), its input w ('free': the wheel's rate, rad/s; 'track': the angle approached,
 * rad), the angle to set the wheel to before it (where the closed form puts it, removing rounding at a switch; NaN:
 * none) and 1 when the wheel moves at its rate limit through it (else 0). At most two pieces.
 */
export const PIECE_FIELDS = 5;
export const PIECE_FREE = 0;
export const PIECE_TRACK = 1;

function setPiece(out: Float64Array, index: number, kind: number, duration_s: number, input: number, startAngle: number, atRateLimit: boolean): number {
  const at = index * PIECE_FIELDS;
  out[at] = kind;
  out[at + 1] = duration_s;
  out[at + 2] = input;
  out[at + 3] = startAngle;
  out[at + 4] = atRateLimit ? 1 : 0;
  return index + 1;
}

/**
 * Write the pieces of `duration_s` seconds with the command `target` held, from wheel angle `angle` (rad), in order
 * into `out` (at least 2·PIECE_FIELDS long); returns how many (0, 1 or 2).
 */
export function actuatorPiecesInto(angle: number, target: number, duration_s: number, lag_s: number, rate_radps: number, out: Float64Array): number {
  if (duration_s <= 0) return 0;
  const error = target - angle;
  const direction = Math.sign(error);
  if (lag_s > 0) {
    const band = rate_radps * lag_s;
    if (!(Math.abs(error) > band)) return setPiece(out, 0, PIECE_TRACK, duration_s, target, Number.NaN, false);
    const ramp = (Math.abs(error) - band) / rate_radps;
    if (ramp >= duration_s) return setPiece(out, 0, PIECE_FREE, duration_s, direction * rate_radps, Number.NaN, true);
    setPiece(out, 0, PIECE_FREE, ramp, direction * rate_radps, Number.NaN, true);
    return setPiece(out, 1, PIECE_TRACK, duration_s - ramp, target, target - direction * band, false);
  }
  if (error !== 0 && !Number.isFinite(rate_radps)) return setPiece(out, 0, PIECE_FREE, duration_s, 0, target, false);
  if (error === 0) return setPiece(out, 0, PIECE_FREE, duration_s, 0, Number.NaN, false);
  const ramp = Math.abs(error) / rate_radps;
  if (ramp >= duration_s) return setPiece(out, 0, PIECE_FREE, duration_s, direction * rate_radps, Number.NaN, true);
  setPiece(out, 0, PIECE_FREE, ramp, direction * rate_radps, Number.NaN, true);
  return setPiece(out, 1, PIECE_FREE, duration_s - ramp, 0, target, false);
}
