/**
 * Bounded work: loops with absurd but schema-shaped numbers (a minutes-long latency, a microsecond
 * sample time, a 1e308 kg vehicle) end within a second — with a result, or a typed error that names
 * the cause — instead of running for minutes or filling the memory.
 */
import { describe, expect, it } from 'vitest';
import { isSpeedbandError } from '../../src/core/errors.js';
import { planFromJson } from '../../src/schedule/plan-file.js';
import { validateVehicle } from '../../src/vehicle/load.js';
import { analyseLoop } from '../../src/verify/index.js';

const yawLoop = { plant: { numerator: [2.4], denominator: [0.12, 1], delay_s: 0.07 }, pid: { kp: 0.35, ki: 2.5, kd: 0.01 } };

/** Runs f, returning its result or the error it threw, and how long it took (ms). */
function timed<T>(f: () => T): { value: T | null; error: unknown; elapsed_ms: number } {
  const start = performance.now();
  try {
    const value = f();
    return { value, error: null, elapsed_ms: performance.now() - start };
  } catch (error) {
    return { value: null, error, elapsed_ms: performance.now() - start };
  }
}

describe('bounded loop analysis', () => {
  it('a 100 s latency at 10 ms sampling (10,000 samples of delay) is decided unstable within a second', () => {
    const run = timed(() => analyseLoop({ ...yawLoop, sampleTime_s: 0.01, latency_s: 100 }));
    expect(run.error).toBeNull();
    expect(run.value!.verdict).toBe('unstable');
    expect(run.value!.analysis!.decidedBy).toBe('sampled-data argument principle');
    expect(run.elapsed_ms).toBeLessThan(1000);
  });

  it('a 1e6 s latency stops at once with verify.analysisTooLarge naming the delay and the sample time', () => {
    const run = timed(() => analyseLoop({ ...yawLoop, sampleTime_s: 0.01, latency_s: 1e6 }));
    expect(isSpeedbandError(run.error) && run.error.code).toBe('verify.analysisTooLarge');
    expect(String((run.error as Error).message)).toMatch(/samples of 0\.01 s.*computationLatency_s/);
    expect(run.elapsed_ms).toBeLessThan(1000);
  });

  it('a 1 µs sample time (60,000 samples of delay) ends within a second', () => {
    const run = timed(() => analyseLoop({ ...yawLoop, sampleTime_s: 1e-6, latency_s: 0 }));
    expect(run.elapsed_ms).toBeLessThan(1000);
    if (run.error !== null) expect(isSpeedbandError(run.error) && run.error.code).toBe('verify.analysisTooLarge');
    else expect(['stable', 'unstable', 'marginal']).toContain(run.value!.verdict);
  });

  it('a continuous loop whose delay turns the phase thousands of times where the gain matters stops with a clear error', () => {
    // |L| ≥ 1 up to ≈ 100 rad/s with a 1,000 s delay: ≈ 16,000 phase wraps where the gain still matters.
    const run = timed(() => analyseLoop({ plant: { numerator: [100], denominator: [1, 1], delay_s: 1000 }, pid: { kp: 1, ki: 0, kd: 0 } }));
    expect(run.elapsed_ms).toBeLessThan(1000);
    expect(isSpeedbandError(run.error) && run.error.code).toBe('verify.analysisTooLarge');
    expect(String((run.error as Error).message)).toMatch(/turns its phase \d+ times/);
  });
});

describe('plausibility ranges of the inputs, checked before any work', () => {
  it('a plan with a microsecond sample time, a 100 s latency or a derivative filter of 1e6 is refused naming the field', () => {
    for (const [controller, field] of [
      [{ sampleTime_s: 1e-6 }, 'sampleTime_s'],
      [{ computationLatency_s: 100 }, 'computationLatency_s'],
      [{ derivativeFilter: 1e6 }, 'derivativeFilter'],
    ] as const) {
      const run = timed(() => planFromJson({ controller }));
      expect(isSpeedbandError(run.error) && run.error.code).toBe('plan.invalid');
      expect(String((run.error as Error).message)).toContain(`controller.${field}`);
      expect((run.error as { location?: { jsonPath?: string } }).location?.jsonPath).toBe(`/controller/${field}`);
    }
  });

  it('a vehicle of 1e308 kg or 1e308 kg·m² is refused naming the field', () => {
    const vehicle = {
      name: 'test',
      mass_kg: 3400,
      yawInertia_kgm2: 11000,
      cgToFrontAxle_m: 1.75,
      cgToRearAxle_m: 1.85,
      steeringRatio: 18,
      maxSteerAngle_rad: 0.6,
      maxSteerRate_radps: 0.5,
    };
    for (const field of ['mass_kg', 'yawInertia_kgm2'] as const) {
      const run = timed(() => validateVehicle({ ...vehicle, [field]: 1e308 }, 'vehicle.json'));
      expect(isSpeedbandError(run.error) && run.error.code).toBe('vehicle.outOfRange');
      expect(String((run.error as Error).message)).toContain(field);
    }
  });
});
