import { describe, expect, it } from 'vitest';
import { degreesToRadians } from '../../src/core/units.js';
import { parseSteerLog } from '../../src/log/read.js';
import { findStepTests, SEGMENT_DEFAULTS } from '../../src/log/segment.js';
import { syntheticCsv, syntheticLog, type FopdtPlant, type Stage } from './synthetic-log.js';

const PLANT: FopdtPlant = { gain_perS: 2.5, timeConstant_s: 0.3, deadTime_s: 0.1 };
const deg = degreesToRadians;

/** Left/right × two amplitudes, returning to zero between: the usual test pattern (8 steps). */
const PATTERN: readonly Stage[] = [
  { level_rad: 0, hold_s: 3 },
  { level_rad: deg(1), hold_s: 4.5 },
  { level_rad: 0, hold_s: 3 },
  { level_rad: deg(-1), hold_s: 4.5 },
  { level_rad: 0, hold_s: 3 },
  { level_rad: deg(2), hold_s: 4.5 },
  { level_rad: 0, hold_s: 3 },
  { level_rad: deg(-2), hold_s: 4.5 },
  { level_rad: 0, hold_s: 3 },
];

function search(stages: readonly Stage[], extra: Partial<Parameters<typeof syntheticLog>[0]> = {}, options = {}) {
  const synthetic = syntheticLog({ plant: PLANT, stages, yawNoise_radps: 0.002, speedNoise_mps: 0.02, seed: 3, ...extra });
  const log = parseSteerLog(syntheticCsv(synthetic), 'synthetic.csv');
  return { synthetic, log, ...findStepTests(log, options) };
}

describe('findStepTests(log) on the usual left/right × two-amplitude pattern', () => {
  const { synthetic, steps, rejected } = search(PATTERN);

  it('finds every step including the returns to zero, in time order, with signed amplitude and direction', () => {
    expect(rejected).toEqual([]);
    expect(steps).toHaveLength(8);
    expect(steps.map((step) => step.stepIndex)).toEqual([0, 1, 2, 3, 4, 5, 6, 7]);
    expect(steps.map((step) => step.direction)).toEqual(['left', 'right', 'right', 'left', 'left', 'right', 'right', 'left']);
    const amplitudes_deg = [1, -1, -1, 1, 2, -2, -2, 2];
    steps.forEach((step, k) => {
      expect(step.amplitude_rad).toBeCloseTo(deg(amplitudes_deg[k]), 6);
      // The onset is the last sample before the ramp: within one sample period of the true ramp start.
      expect(Math.abs(step.onset_s - synthetic.onsets_s[k])).toBeLessThanOrEqual(0.01 + 1e-9);
      expect(step.speed_mps).toBeCloseTo(10, 1);
    });
  });

  it('gives each step a window with ≥ 0.5 s of pre-step samples at the old level and the whole hold', () => {
    for (const step of steps) {
      const pre_s = step.time_s[step.preStepSamples - 1] - step.time_s[0];
      expect(pre_s).toBeGreaterThanOrEqual(SEGMENT_DEFAULTS.minPreStep_s);
      expect(step.time_s[0]).toBe(0);
      const level = step.steerCommand_rad[0];
      for (let i = 0; i < step.preStepSamples; i += 1) expect(step.steerCommand_rad[i]).toBeCloseTo(level, 9);
      expect(Math.abs(step.steerCommand_rad[step.preStepSamples] - level)).toBeGreaterThan(0);
      // The hold runs to the next onset (or the end of the log): 0.15 s ramp + 3 or 4.5 s.
      const hold_s = step.time_s[step.time_s.length - 1] - step.time_s[step.preStepSamples - 1];
      expect(hold_s).toBeGreaterThan(3.1);
      expect(step.yawRate_radps).toHaveLength(step.time_s.length);
    }
  });

  it('measures the plant gain K on every step (steady yaw rate change / command change)', () => {
    for (const step of steps) expect(step.metrics.steadyYawGain_perS).toBeCloseTo(PLANT.gain_perS, 1);
  });
});

describe('findStepTests(log) accepts what it should', () => {
  it('a noisy command (σ 0.02°) and noisy yaw rate (σ 0.1°/s): still all 8 steps, amplitudes within 0.01°', () => {
    const { steps, rejected } = search(PATTERN, { commandNoise_rad: deg(0.02), yawNoise_radps: deg(0.1), seed: 9 });
    expect(rejected).toEqual([]);
    expect(steps).toHaveLength(8);
    const amplitudes_deg = [1, -1, -1, 1, 2, -2, -2, 2];
    steps.forEach((step, k) => expect(Math.abs(step.amplitude_rad - deg(amplitudes_deg[k]))).toBeLessThan(deg(0.01)));
  });

  it('a long log with many manoeuvres, speed changes between them and a time gap', () => {
    const stages: Stage[] = [{ level_rad: 0, hold_s: 3, speed_mps: 5 }];
    for (const speed_mps of [5, 8, 12]) {
      for (const amplitude of [1.5, -1.5]) {
        stages.push({ level_rad: deg(amplitude), hold_s: 4, speed_mps });
        stages.push({ level_rad: 0, hold_s: 3, speed_mps });
      }
      stages.push({ level_rad: 0, hold_s: 3, speed_mps: speed_mps + 1 }); // speed change while steering held at zero
    }
    const synthetic = syntheticLog({ plant: PLANT, stages, yawNoise_radps: 0.002, seed: 5 });
    const csv = syntheticCsv(synthetic).split('\n');
    // Remove 1 s of samples while the steering is held at zero and the speed changes: a logger dropout becomes a split.
    const dropFrom = csv.findIndex((line) => line.startsWith('36.000'));
    csv.splice(dropFrom, 100);
    const log = parseSteerLog(csv.join('\n'), 'long.csv');
    expect(log.segments).toHaveLength(2);
    const { steps, rejected } = findStepTests(log);
    expect(rejected).toEqual([]);
    expect(steps).toHaveLength(12);
    expect(new Set(steps.map((step) => step.segmentIndex))).toEqual(new Set([0, 1]));
    expect(steps.map((step) => Math.round(step.speed_mps))).toEqual([5, 5, 5, 5, 8, 8, 8, 8, 12, 12, 12, 12]);
  });
});

describe('findStepTests(log) rejects candidates with a reason the user can act on', () => {
  it('a hold shorter than the minimum → holdTooShort', () => {
    const { steps, rejected } = search([
      { level_rad: 0, hold_s: 3 },
      { level_rad: deg(2), hold_s: 1 },
      { level_rad: 0, hold_s: 4 },
    ]);
    expect(rejected[0].reasonCode).toBe('holdTooShort');
    expect(rejected[0].reason).toMatch(/held 1\.\d\d s \(need ≥ 1\.5 s/);
    // The return to zero starts while the yaw rate is still rising (τ = 0.3 s, 1 s after the step): its starting level is unknown.
    expect(rejected[1].reasonCode).toBe('noPreStepWindow');
    expect(rejected[1].reason).toMatch(/yaw rate was still changing before the step/);
    expect(steps).toHaveLength(0);
  });

  it('a return to zero after a too-short hold is still accepted when the yaw rate had settled (fast plant)', () => {
    const fast: FopdtPlant = { gain_perS: 2.5, timeConstant_s: 0.05, deadTime_s: 0.02 };
    const { steps, rejected } = search(
      [
        { level_rad: 0, hold_s: 3 },
        { level_rad: deg(2), hold_s: 1.3 },
        { level_rad: 0, hold_s: 4 },
      ],
      { plant: fast },
    );
    // Held 0.15 + 1.3 = 1.45 s < 1.5 s; the pre-step window of the return starts 0.45 s after the step, when e^(−(0.45 − 0.02)/0.05) ≈ 2e-4 of the transient is left.
    expect(rejected.map((r) => r.reasonCode)).toEqual(['holdTooShort']);
    expect(steps).toHaveLength(1);
    expect(steps[0].amplitude_rad).toBeCloseTo(deg(-2), 6);
  });

  it('a step right after a very short hold → noPreStepWindow', () => {
    const { rejected } = search([
      { level_rad: 0, hold_s: 3 },
      { level_rad: deg(2), hold_s: 0.4 },
      { level_rad: deg(-2), hold_s: 4 },
    ]);
    expect(rejected.map((r) => r.reasonCode)).toEqual(['holdTooShort', 'noPreStepWindow']);
    expect(rejected[1].reason).toMatch(/held only 0\.\d\d s before the step/);
  });

  it('speed changing during the hold → speedNotConstant, quoting the speed range', () => {
    const { rejected, steps } = search(
      [
        { level_rad: 0, hold_s: 3 },
        { level_rad: deg(2), hold_s: 4 },
        { level_rad: 0, hold_s: 3 },
      ],
      { speedRamp: { stage: 1, to_mps: 13 } },
    );
    expect(rejected.map((r) => r.reasonCode)).toContain('speedNotConstant');
    expect(rejected.find((r) => r.reasonCode === 'speedNotConstant')?.reason).toMatch(
      /speed varied by 1\.\d\d m\/s \(\d+\.\d\d–11\.\d\d\) within 1\.5 s of the step/,
    );
    expect(steps.length).toBeLessThan(2);
  });

  it('a slow steering movement between levels → steerNotHeld', () => {
    const { rejected, steps } = search([
      { level_rad: 0, hold_s: 3 },
      { level_rad: deg(3), hold_s: 4, ramp_s: 2 },
    ]);
    expect(steps).toHaveLength(0);
    expect(rejected.map((r) => r.reasonCode)).toEqual(['steerNotHeld']);
  });

  it('a command at the vehicle actuator limit → actuatorAtLimit (only when the limit is known)', () => {
    const stages = [
      { level_rad: 0, hold_s: 3 },
      { level_rad: deg(20), hold_s: 4 },
      { level_rad: 0, hold_s: 3 },
    ];
    const limited = search(stages, {}, { maxSteerAngle_rad: deg(20) });
    expect(limited.rejected.map((r) => r.reasonCode)).toEqual(['actuatorAtLimit']);
    expect(limited.rejected[0].reason).toMatch(/20\.00°/);
    expect(search(stages).rejected).toEqual([]);
  });

  it('a step too small against the yaw-rate noise → tooSmallAgainstNoise, advising a larger amplitude', () => {
    const { rejected } = search(
      [
        { level_rad: 0, hold_s: 3 },
        { level_rad: deg(0.3), hold_s: 4 },
        { level_rad: 0, hold_s: 3 },
      ],
      {
        yawNoise_radps: deg(0.4),
      },
    );
    expect(rejected.map((r) => r.reasonCode)).toEqual(['tooSmallAgainstNoise', 'tooSmallAgainstNoise']);
    // Yaw change 2.5 × 0.3° = 0.75°/s against 0.4°/s noise: 5σ needs ≈ 0.8°, advised as the next 1-2-5 value, 1°.
    expect(rejected[0].reason).toMatch(/amplitude 0\.30°.*noise 0\.\d\d°\/s.*repeat with ≥ 1\.00°/);
  });
});

describe('findStepTests(log, options) validates its options', () => {
  it('rejects a non-positive, non-finite or out-of-range option with log.badOption naming it', () => {
    const { log } = search(PATTERN);
    for (const options of [{ minHold_s: -1 }, { maxRamp_s: Number.NaN }, { speedToleranceFraction: 2 }, { maxSteerAngle_rad: 0 }]) {
      expect(() => findStepTests(log, options)).toThrow(
        expect.objectContaining({ code: 'log.badOption', message: expect.stringContaining(Object.keys(options)[0]) }),
      );
    }
    expect(findStepTests(log, { speedToleranceAbsolute_mps: 0, speedToleranceFraction: 0.5 }).steps).toHaveLength(8);
  });
});
