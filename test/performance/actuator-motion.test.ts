import { describe, expect, it } from 'vitest';
import { actuatorPiecesInto, PIECE_FIELDS, PIECE_FREE, PIECE_TRACK } from '../../src/performance/actuator-motion.js';

/** The pieces as records, for reading. */
function pieces(angle: number, target: number, duration_s: number, lag_s: number, rate_radps: number) {
  const out = new Float64Array(2 * PIECE_FIELDS);
  const count = actuatorPiecesInto(angle, target, duration_s, lag_s, rate_radps, out);
  return Array.from({ length: count }, (_, i) => {
    const at = i * PIECE_FIELDS;
    return {
      kind: out[at] === PIECE_TRACK ? 'track' : out[at] === PIECE_FREE ? 'free' : 'unknown',
      duration_s: out[at + 1],
      input: out[at + 2],
      startAngle: out[at + 3],
      atRateLimit: out[at + 4] === 1,
    };
  });
}

describe('actuatorPiecesInto: a rate-limited first-order actuator with the command held', () => {
  // Source: common practice — δ̇ = clamp((c − δ)/τa, ±R) ramps at R until |c − δ| = τa·R, then decays exponentially
  // (the switch where the unlimited rate (c − δ)/τa falls to R).
  it('ramps at the rate limit, then tracks from where |c − δ| = τa·R: switch time (|c − δ0| − τa·R)/R', () => {
    const [ramp, track] = pieces(0, 0.1, 0.5, 0.05, 0.5);
    expect(ramp).toEqual({ kind: 'free', duration_s: (0.1 - 0.025) / 0.5, input: 0.5, startAngle: Number.NaN, atRateLimit: true });
    expect(track).toMatchObject({ kind: 'track', input: 0.1, startAngle: 0.1 - 0.025, atRateLimit: false });
    expect(track.duration_s).toBeCloseTo(0.5 - 0.15, 15);
  });

  it('tracks through the whole stretch within the band, ramps through it beyond the switch, and moves down as up', () => {
    expect(pieces(0, 0.01, 0.01, 0.05, 0.5)).toEqual([{ kind: 'track', duration_s: 0.01, input: 0.01, startAngle: Number.NaN, atRateLimit: false }]);
    expect(pieces(0, -1, 0.01, 0.05, 0.5)).toEqual([{ kind: 'free', duration_s: 0.01, input: -0.5, startAngle: Number.NaN, atRateLimit: true }]);
    const [ramp, track] = pieces(0.3, 0.2, 0.2, 0.05, 0.5);
    expect(ramp.input).toBe(-0.5);
    expect(ramp.duration_s).toBeCloseTo((0.1 - 0.025) / 0.5, 15);
    expect(track).toMatchObject({ kind: 'track', input: 0.2, startAngle: 0.2 + 0.025, atRateLimit: false });
  });

  it('without a lag: ramps to the command and holds it (set exactly there); an infinite rate jumps to it; nothing for no time', () => {
    const [ramp, hold] = pieces(0, 0.1, 0.5, 0, 0.5);
    expect(ramp).toEqual({ kind: 'free', duration_s: 0.2, input: 0.5, startAngle: Number.NaN, atRateLimit: true });
    expect(hold).toEqual({ kind: 'free', duration_s: 0.3, input: 0, startAngle: 0.1, atRateLimit: false });
    expect(pieces(0, 0.1, 0.5, 0, Number.POSITIVE_INFINITY)).toEqual([{ kind: 'free', duration_s: 0.5, input: 0, startAngle: 0.1, atRateLimit: false }]);
    expect(pieces(0.1, 0.1, 0.5, 0, 0.5)).toEqual([{ kind: 'free', duration_s: 0.5, input: 0, startAngle: Number.NaN, atRateLimit: false }]);
    expect(pieces(0, 0.1, 0, 0.05, 0.5)).toEqual([]);
  });
});
