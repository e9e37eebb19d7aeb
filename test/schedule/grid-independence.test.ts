/**
 * The verdict and margins at a speed do not depend on which other speeds are checked with it: the
 * dense check analyses each speed on its own (no state carried between speeds), so the check of a
 * schedule cannot pass at one grid density and fail at another for the same speed.
 */
import fc from 'fast-check';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { makeLoopAnalysis } from '../../src/pipeline/loop-analysis.js';
import type { CheckModel } from '../../src/pipeline/check-model.js';
import { denseCheck } from '../../src/schedule/dense-check.js';
import { THRESHOLD_DEFAULTS } from '../../src/schedule/dense-check.js';
import { singleTrackParametersFromVehicle } from '../../src/vehicle/single-track.js';
import { loadVehicle } from '../../src/vehicle/load.js';
import type { LoopSpecification } from '../../src/loops/types.js';

const van = singleTrackParametersFromVehicle(loadVehicle(join('vehicles', 'parcel-van')));
const model: CheckModel = {
  kind: 'single-track',
  description: 'parcel van, nominal single-track model (synthetic)',
  summary: { kind: 'single-track', understeerGradient_radPerMps2: 0, ...van },
  modelAt: () => ({ kind: 'single-track', parameters: van }),
};
const controller = { derivativeFilter: 10, sampleTime_s: 0.01, discretisation: 'backward-euler' as const, computationLatency_s: 0.01 };
const loops: LoopSpecification[] = [
  { kind: 'yaw-rate' },
  { kind: 'heading' },
  { kind: 'path', preview_m: 2, referencePoint: 'front-axle' },
  { kind: 'path', preview_m: 5, referencePoint: 'cg' },
];
/** Gains that scale with speed like a schedule's (a path loop's fall as 1/v), times a random factor. */
const gainsFor = (kind: LoopSpecification['kind'], factor: number) => (speed_mps: number) => {
  if (kind === 'yaw-rate') return { kp: (0.05 * factor * 10) / speed_mps, ki: (0.8 * factor * 10) / speed_mps, kd: 0 };
  if (kind === 'heading') return { kp: (0.4 * factor * 10) / speed_mps, ki: (0.05 * factor * 10) / speed_mps, kd: (0.05 * factor * 10) / speed_mps };
  return { kp: (0.08 * factor) / speed_mps, ki: (0.002 * factor) / speed_mps, kd: (0.3 * factor) / speed_mps };
};

describe('grid independence of the dense check (property)', () => {
  it('the verdict and every margin at a speed are the same when that speed is checked alone or inside any grid', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: loops.length - 1 }),
        fc.double({ min: 0.3, max: 3, noNaN: true }),
        fc.double({ min: 2, max: 25, noNaN: true }),
        fc.array(fc.double({ min: 2, max: 25, noNaN: true }), { minLength: 1, maxLength: 12 }),
        fc.integer({ min: 0, max: 12 }),
        (loopIndex, factor, speed, others, position) => {
          const loop = loops[loopIndex];
          const analyse = makeLoopAnalysis(model, loop, controller);
          const gainsAt = gainsFor(loop.kind, factor);
          const alone = denseCheck({ grid: [speed], gainsAt, analyse, thresholds: THRESHOLD_DEFAULTS }).points[0];
          const grid = [...others];
          grid.splice(Math.min(position, grid.length), 0, speed);
          const inside = denseCheck({ grid, gainsAt, analyse, thresholds: THRESHOLD_DEFAULTS }).points.find((point) => point.speed_mps === speed)!;
          expect(inside.margins).toEqual(alone.margins);
          expect(inside.failures).toEqual(alone.failures);
        },
      ),
      { numRuns: 40, seed: 20261205 },
    );
  });
});
