import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { degreesToRadians } from '../../src/core/units.js';
import { parseSteerLog } from '../../src/log/read.js';
import { findStepTests } from '../../src/log/segment.js';
import { syntheticCsv, syntheticLog, type Stage } from './synthetic-log.js';

const deg = degreesToRadians;

describe('findStepTests on random step sequences (fast-check)', () => {
  it('finds exactly the commanded steps, in order, with their signed amplitudes, whenever each is ≥ 1°, held ≥ 3 s and ramped within 0.3 s', () => {
    // Plant K = 2.5 1/s, τ = 0.3 s, θ = 0.1 s. The pre-step window starts ≥ 2 s after the previous step, when that step's transient
    // is below e^(−1.9/0.3) ≈ 0.2 % of it — under 3 % of the next step's response even for a 16° step followed by a 1° one
    // (the 5 % drift limit); a 1° step changes the yaw rate by 0.044 rad/s, 25× the largest noise σ drawn here (0.1°/s).
    const stageArbitrary = fc.record({
      level_deg: fc.double({ min: -8, max: 8, noNaN: true }),
      hold_s: fc.double({ min: 3, max: 5, noNaN: true }),
      ramp_s: fc.double({ min: 0.05, max: 0.3, noNaN: true }),
    });
    const scenario = fc.record({
      stages: fc.array(stageArbitrary, { minLength: 1, maxLength: 6 }),
      noise_degps: fc.double({ min: 0, max: 0.1, noNaN: true }),
      seed: fc.integer({ min: 1, max: 1_000_000 }),
      speed_mps: fc.double({ min: 1, max: 30, noNaN: true }),
    });
    fc.assert(
      fc.property(scenario, ({ stages, noise_degps, seed, speed_mps }) => {
        // Consecutive levels at least 1° apart.
        const levels: number[] = [0];
        for (const stage of stages) {
          const previous = levels[levels.length - 1];
          levels.push(Math.abs(stage.level_deg - previous) < 1 ? previous + (stage.level_deg >= previous ? 1 : -1) : stage.level_deg);
        }
        const sequence: Stage[] = [
          { level_rad: 0, hold_s: 3, speed_mps },
          ...stages.map((stage, k) => ({ level_rad: deg(levels[k + 1]), hold_s: stage.hold_s, ramp_s: stage.ramp_s, speed_mps })),
        ];
        const synthetic = syntheticLog({
          plant: { gain_perS: 2.5, timeConstant_s: 0.3, deadTime_s: 0.1 },
          stages: sequence,
          yawNoise_radps: deg(noise_degps),
          speedNoise_mps: 0.01,
          seed,
        });
        const { steps, rejected } = findStepTests(parseSteerLog(syntheticCsv(synthetic), 'random.csv'));
        expect(rejected).toEqual([]);
        expect(steps).toHaveLength(stages.length);
        steps.forEach((step, k) => {
          expect(Math.abs(step.amplitude_rad - deg(levels[k + 1] - levels[k]))).toBeLessThan(deg(0.01));
          expect(Math.abs(step.onset_s - synthetic.onsets_s[k])).toBeLessThanOrEqual(0.01 + 1e-9);
        });
      }),
      { numRuns: 60, seed: 424242 },
    );
  });
});
