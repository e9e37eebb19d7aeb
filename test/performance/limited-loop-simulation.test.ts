/**
 * The step through the steering limits (simulateLimitedLoop) stopped early for a search: with `stopAboveOutput` the run is
 * the whole run's beginning, to the bit, up to and including the first sample above the bound, and the whole run when no
 * sample exceeds it — so a search that asks only whether a bound is kept decides as the whole run would.
 */
import { describe, expect, it } from 'vitest';
import { type LimitedLoopInput, simulateLimitedLoop } from '../../src/performance/limited-loop-simulation.js';

// A heading-like loop (an integrator behind a second-order vehicle), the actuator rate-limited on a 0.2 rad step (our case).
const INPUT: LimitedLoopInput = {
  vehicle: { numerator: [2, 5], denominator: [1, 6, 10, 0], delay_s: 0 },
  actuator: { lag_s: 0.08, delay_s: 0.065 },
  maxSteerAngle_rad: 0.6,
  maxSteerRate_radps: 0.5,
  gains: { kp: 1.2, ki: 0.3, kd: 0.05, setpointWeightProportional: 1, setpointWeightDerivative: 0, feedForward: 0 },
  settings: {
    sampleTime_s: 0.01,
    derivativeFilter: 10,
    discretisation: 'backward-euler',
    computationLatency_s: 0.01,
    antiWindup: 'conditional-integration',
    commandLimit_rad: 0.6,
    integratorClamp_rad: 0.6,
  },
  reference: new Float64Array(2000).fill(0.2),
};

const sameBits = (a: Float64Array, b: Float64Array): boolean => a.length === b.length && a.every((value, k) => Object.is(value, b[k]));

describe('simulateLimitedLoop stopped above a bound', () => {
  it('ends at the first sample above the bound, with the whole run to the bit until there', () => {
    const whole = simulateLimitedLoop(INPUT);
    const bound = 0.2 * 1.1;
    const first = whole.output.findIndex((y) => y > bound);
    // The premise: this loop overshoots the step by more than 10 % (about 26 %), and not at once.
    expect(first).toBeGreaterThan(10);
    const stopped = simulateLimitedLoop({ ...INPUT, stopAboveOutput: bound });
    expect(stopped.output.length).toBe(first + 1);
    expect(sameBits(stopped.output, whole.output.subarray(0, first + 1))).toBe(true);
    expect(sameBits(stopped.steerAngle, whole.steerAngle.subarray(0, first + 1))).toBe(true);
    expect(sameBits(stopped.command, whole.command.subarray(0, first))).toBe(true);
  });

  it('is the whole run when no sample exceeds the bound', () => {
    const whole = simulateLimitedLoop(INPUT);
    const stopped = simulateLimitedLoop({ ...INPUT, stopAboveOutput: 0.2 * 1.3 });
    for (const key of ['output', 'error', 'command', 'steerAngle'] as const) expect(sameBits(stopped[key], whole[key]), key).toBe(true);
  });
});
