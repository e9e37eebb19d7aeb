import { mkdtempSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { parseSteerLog } from '../../src/log/read.js';
import { criticalSpeed_mps, singleTrackParametersFromVehicle } from '../../src/vehicle/single-track.js';
import { planSteps, sampleCommand, stepAmplitudes, STEP_PLAN_DEFAULTS } from '../../src/vehicle/step-plan.js';
import { generateTestLog, TEST_LOG_DEFAULTS, testLogFileName, writeTestLogs } from '../../src/vehicle/test-logs.js';
import type { Vehicle } from '../../src/vehicle/types.js';

/** An invented understeering van for the tests. */
const VAN: Vehicle = {
  name: 'test-van',
  mass_kg: 3000,
  yawInertia_kgm2: 9000,
  cgToFrontAxle_m: 1.6,
  cgToRearAxle_m: 1.8,
  steeringRatio: 18,
  maxSteerAngle_rad: 0.6,
  maxSteerRate_radps: 0.5,
  actuatorLag_s: 0.08,
  actuatorDelay_s: 0.05,
  frontCorneringStiffness_NPerRad: 110_000,
  rearCorneringStiffness_NPerRad: 160_000,
};

/** Column `name` of a CSV text as numbers. */
function column(csv: string, name: string): number[] {
  const [header, ...rows] = csv.trimEnd().split('\n');
  const index = header.split(',').indexOf(name);
  return rows.map((row) => Number(row.split(',')[index]));
}

describe('generateTestLog(vehicle, speed_mps, options)', () => {
  it('is byte-identical for the same seed and differs for another seed', () => {
    const first = generateTestLog(VAN, 10, { seed: 7 });
    const again = generateTestLog(VAN, 10, { seed: 7 });
    const other = generateTestLog(VAN, 10, { seed: 8 });
    expect(again.csv).toBe(first.csv);
    expect(other.csv).not.toBe(first.csv);
  });

  it('writes the default column format with a plain header the log reader accepts', () => {
    const log = generateTestLog(VAN, 8);
    expect(log.csv.split('\n')[0]).toBe('time_s,speed_mps,steer_cmd_rad,steer_angle_rad,yaw_rate_radps,lat_accel_mps2');
    const read = parseSteerLog(log.csv, log.fileName);
    expect(read.rowCount).toBe(log.sampleCount);
    expect(read.segments).toHaveLength(1);
    // Source: the requested sample rate, 50 Hz → 0.02 s.
    expect(read.samplePeriod_s).toBeCloseTo(1 / TEST_LOG_DEFAULTS.sampleRate_hz, 12);
  });

  it('labels the file synthetic in its name, zero-padded so files sort by speed', () => {
    expect(testLogFileName(7.5)).toBe('synthetic-steps-07.50mps.csv');
    expect([testLogFileName(25), testLogFileName(2), testLogFileName(12.5)].sort()).toEqual([
      'synthetic-steps-02.00mps.csv',
      'synthetic-steps-12.50mps.csv',
      'synthetic-steps-25.00mps.csv',
    ]);
  });

  it('without noise, settles at the steady-state yaw gain vx/(L + K vx²) times each amplitude', () => {
    for (const speed of [3, 10, 20]) {
      const log = generateTestLog(VAN, speed, { noiseScale: 0 });
      const time = column(log.csv, 'time_s');
      const yaw = column(log.csv, 'yaw_rate_radps');
      // Source: Gillespie 1992 §6, K = (m/L)(b/Cf − a/Cr), r/δ = vx/(L + K vx²).
      const L = 3.4;
      const K = (3000 / L) * (1.8 / 110_000 - 1.6 / 160_000);
      const gain = speed / (L + K * speed * speed);
      for (const step of log.steps) {
        const endOfHold = step.onset_s + step.ramp_s + step.hold_s - 0.1;
        const k = time.findIndex((t) => t >= endOfHold);
        expect(Math.abs(yaw[k] - gain * step.to_rad)).toBeLessThan(2e-5); // 5-decimal rounding plus a settled tail
      }
    }
  });

  it('stays in the linear tyre range: |lateral acceleration| well under 4 m/s² at every speed (noise-free)', () => {
    // Source: common practice (docs/domain.md §6) — step tests stay well under ~4 m/s².
    for (const speed of [2, 5, 10, 15, 20, 25, 30]) {
      const ay = column(generateTestLog(VAN, speed, { noiseScale: 0 }).csv, 'lat_accel_mps2');
      expect(Math.max(...ay.map(Math.abs))).toBeLessThan(2.5);
    }
  });

  it('adds yaw-rate noise of the stated σ and one constant bias within the stated bound', () => {
    const clean = column(generateTestLog(VAN, 12, { noiseScale: 0 }).csv, 'yaw_rate_radps');
    const noisy = generateTestLog(VAN, 12, { seed: 3 });
    const residual = column(noisy.csv, 'yaw_rate_radps').map((value, k) => value - clean[k]);
    const mean = residual.reduce((sum, value) => sum + value, 0) / residual.length;
    const sigma = Math.sqrt(residual.reduce((sum, value) => sum + (value - mean) ** 2, 0) / (residual.length - 1));
    expect(Math.abs(mean - noisy.yawRateBias_radps)).toBeLessThan(1e-4); // σ/√n ≈ 2.5e-5
    expect(Math.abs(noisy.yawRateBias_radps)).toBeLessThanOrEqual(TEST_LOG_DEFAULTS.yawRateBiasMax_radps);
    expect(sigma / TEST_LOG_DEFAULTS.yawRateNoise_radps).toBeGreaterThan(0.9);
    expect(sigma / TEST_LOG_DEFAULTS.yawRateNoise_radps).toBeLessThan(1.1);
  });

  it('the command is the plan: steps left and right at two amplitudes with returns to zero', () => {
    const log = generateTestLog(VAN, 10, { noiseScale: 0 });
    expect(log.steps.map((step) => Math.sign(step.to_rad - step.from_rad))).toEqual([1, -1, -1, 1, 1, -1, -1, 1]);
    expect(log.steps.filter((step) => step.to_rad === 0)).toHaveLength(4);
    const command = column(log.csv, 'steer_cmd_rad');
    expect(Math.max(...command)).toBeCloseTo(log.amplitudes.large_rad, 5);
    expect(Math.min(...command)).toBeCloseTo(-log.amplitudes.large_rad, 5);
  });

  it('refuses a speed above an oversteering vehicle’s critical speed', () => {
    const oversteer: Vehicle = { ...VAN, cgToFrontAxle_m: 2.2, cgToRearAxle_m: 1.2, rearCorneringStiffness_NPerRad: 60_000 };
    const critical = criticalSpeed_mps(singleTrackParametersFromVehicle(oversteer))!;
    expect(() => generateTestLog(oversteer, critical * 0.9)).not.toThrow();
    expect(() => generateTestLog(oversteer, critical * 1.1)).toThrow(expect.objectContaining({ code: 'testLogs.unstableSpeed' }));
  });

  it('refuses a given amplitude at or beyond the steer angle limit', () => {
    expect(() => generateTestLog(VAN, 5, { amplitudes_rad: [0.7, 0.1] })).toThrow(expect.objectContaining({ code: 'testLogs.badAmplitude' }));
  });
});

describe('stepAmplitudes(params, limits, speed_mps)', () => {
  const params = singleTrackParametersFromVehicle(VAN);
  const limits = { maxSteerAngle_rad: VAN.maxSteerAngle_rad, maxSteerRate_radps: VAN.maxSteerRate_radps };
  it('aims at the target lateral acceleration where no actuator limit is smaller, and never above it', () => {
    for (const speed of [1, 2, 4, 8, 16, 32]) {
      const amplitudes = stepAmplitudes(params, limits, speed);
      expect(amplitudes.steadyLateralAcceleration_mps2).toBeLessThanOrEqual(STEP_PLAN_DEFAULTS.targetLateralAcceleration_mps2 + 1e-12);
      expect(amplitudes.large_rad).toBeLessThanOrEqual(0.5 * VAN.maxSteerAngle_rad);
      expect(amplitudes.small_rad).toBeCloseTo(amplitudes.large_rad / 2, 3);
      if (amplitudes.limitedBy === 'lateralAcceleration') {
        // rounding down to 0.05° loses at most that fraction of the amplitude
        const lost = (0.05 * Math.PI) / 180 / amplitudes.large_rad;
        expect(amplitudes.steadyLateralAcceleration_mps2).toBeGreaterThan(STEP_PLAN_DEFAULTS.targetLateralAcceleration_mps2 * (1 - lost) - 1e-12);
      }
    }
    expect(stepAmplitudes(params, limits, 1).limitedBy).toBe('rateLimit');
    expect(stepAmplitudes(params, limits, 16).limitedBy).toBe('lateralAcceleration');
  });
});

describe('planSteps and sampleCommand', () => {
  it('ramps at no more than 80 % of the rate limit, within the fast-ramp range', () => {
    for (const rate of [0.2, 0.5, 5]) {
      for (const step of planSteps([0.1, 0.05], rate)) {
        const change = Math.abs(step.to_rad - step.from_rad);
        expect(step.ramp_s).toBeGreaterThanOrEqual(STEP_PLAN_DEFAULTS.ramp_s);
        expect(step.ramp_s).toBeLessThanOrEqual(STEP_PLAN_DEFAULTS.maxRamp_s);
        if (step.ramp_s < STEP_PLAN_DEFAULTS.maxRamp_s) expect(change / step.ramp_s).toBeLessThanOrEqual(0.8 * rate + 1e-12);
      }
    }
  });

  it('samples held levels exactly and ramps linearly between them', () => {
    const steps = planSteps([0.1], 10);
    const time = Float64Array.from([0, 1.99, 2, 2.075, 2.15, 4, 6.65, 6.725, 6.8, 9.7]);
    const command = sampleCommand(steps, time);
    expect(Array.from(command).map((value) => Number(value.toFixed(12)))).toEqual([0, 0, 0, 0.05, 0.1, 0.1, 0.1, 0.05, 0, 0]);
  });
});

describe('writeTestLogs({ vehicle: vehicle, speeds_mps: speeds, outDir: outDir, generation: options, force: force })', () => {
  it('writes one log per speed and a README that says the data are invented', () => {
    const dir = mkdtempSync(join(tmpdir(), 'speedband-logs-'));
    const result = writeTestLogs({ vehicle: VAN, speeds_mps: [4, 12], outDir: dir, generation: { seed: 5 }, force: false });
    expect(readdirSync(dir).sort()).toEqual(['README.md', 'synthetic-steps-04.00mps.csv', 'synthetic-steps-12.00mps.csv']);
    expect(result.files.every((file) => file.outcome === 'written')).toBe(true);
    const readme = readFileSync(join(dir, 'README.md'), 'utf8');
    expect(readme).toMatch(/Invented demo data/);
    expect(readme).toMatch(/--speeds 4,12 --seed 5/);
    // the same call again changes nothing
    expect(
      writeTestLogs({ vehicle: VAN, speeds_mps: [4, 12], outDir: dir, generation: { seed: 5 }, force: false }).files.every(
        (file) => file.outcome === 'unchanged',
      ),
    ).toBe(true);
  });

  it('refuses to replace different files without force, before writing any', () => {
    const dir = mkdtempSync(join(tmpdir(), 'speedband-logs-'));
    writeFileSync(join(dir, 'synthetic-steps-12.00mps.csv'), 'someone else’s data\n');
    expect(() => writeTestLogs({ vehicle: VAN, speeds_mps: [4, 12], outDir: dir, force: false })).toThrow(expect.objectContaining({ code: 'output.exists' }));
    expect(readdirSync(dir)).toEqual(['synthetic-steps-12.00mps.csv']);
    writeTestLogs({ vehicle: VAN, speeds_mps: [4, 12], outDir: dir, force: true });
    expect(readFileSync(join(dir, 'synthetic-steps-12.00mps.csv'), 'utf8')).toMatch(/^time_s,/);
  });

  it('refuses an empty, non-positive or repeated speed list', () => {
    const dir = mkdtempSync(join(tmpdir(), 'speedband-logs-'));
    const badSpeeds = expect.objectContaining({ code: 'testLogs.badSpeeds' });
    expect(() => writeTestLogs({ vehicle: VAN, speeds_mps: [], outDir: dir, force: false })).toThrow(badSpeeds);
    expect(() => writeTestLogs({ vehicle: VAN, speeds_mps: [0, 5], outDir: dir, force: false })).toThrow(badSpeeds);
    expect(() => writeTestLogs({ vehicle: VAN, speeds_mps: [5, 5.001], outDir: dir, force: false })).toThrow(badSpeeds);
  });
});
