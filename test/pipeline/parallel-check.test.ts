/**
 * The dense check on every core gives exactly the points of the sequential check: each speed is analysed
 * on its own, so splitting the grid between threads changes nothing but the time.
 */
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { checkModelFromSummary } from '../../src/pipeline/check-model.js';
import { makeLoopAnalysis } from '../../src/pipeline/loop-analysis.js';
import { denseCheckOnAllCores, PARALLEL_CHECK_DEFAULTS } from '../../src/pipeline/parallel-check.js';
import { isSpeedbandError } from '../../src/core/errors.js';
import { denseCheck, THRESHOLD_DEFAULTS } from '../../src/schedule/dense-check.js';
import { loadVehicle } from '../../src/vehicle/load.js';
import { singleTrackParametersFromVehicle, understeerGradient_radPerMps2 } from '../../src/vehicle/single-track.js';

const van = singleTrackParametersFromVehicle(loadVehicle(join('vehicles', 'parcel-van')));
const model = checkModelFromSummary(
  { kind: 'single-track', understeerGradient_radPerMps2: understeerGradient_radPerMps2(van), ...van },
  'parcel van, nominal single-track model (synthetic)',
);
const loop = { kind: 'path' as const, preview_m: 2, referencePoint: 'front-axle' as const };
const controller = { derivativeFilter: 10, sampleTime_s: 0.01, discretisation: 'backward-euler' as const, computationLatency_s: 0.01 };
const gainsAt = (speed_mps: number) => ({ kp: 0.06 / speed_mps, ki: 0.002 / speed_mps, kd: 0.25 / speed_mps });
const count = PARALLEL_CHECK_DEFAULTS.minimumSpeeds + 50;
const grid = Array.from({ length: count }, (_, i) => 2 + (23 * i) / (count - 1));

describe('denseCheckOnAllCores', () => {
  it('with a worker thread gives the same points, failures and worst figures as the sequential dense check', async () => {
    const sequential = denseCheck({ grid, gainsAt, analyse: makeLoopAnalysis(model, loop, controller), thresholds: THRESHOLD_DEFAULTS });
    const events: number[] = [];
    const parallel = await denseCheckOnAllCores({
      model,
      loop,
      controller,
      thresholds: THRESHOLD_DEFAULTS,
      grid,
      gainsAt,
      workers: 1,
      onProgress: (event) => events.push(event.done),
    });
    expect(parallel.points.length).toBe(count);
    expect(parallel.points).toEqual(sequential.points);
    expect(parallel.worst).toEqual(sequential.worst);
    expect(parallel.failedCount).toBe(sequential.failedCount);
    expect(events[events.length - 1]).toBe(count);
  });

  it('a typed error thrown at one speed reaches the caller as that error, whichever thread met it', async () => {
    // 2,000 s of actuator delay: refused before any analysis (check.delayTooLong), on every thread.
    const slow = checkModelFromSummary({ ...model.summary, actuatorDelay_s: 2000 } as typeof model.summary, 'absurd delay');
    const error = await denseCheckOnAllCores({ model: slow, loop, controller, thresholds: THRESHOLD_DEFAULTS, grid, gainsAt, workers: 1 }).catch(
      (e: unknown) => e,
    );
    expect(isSpeedbandError(error) && error.code).toBe('check.delayTooLong');
  });
});
