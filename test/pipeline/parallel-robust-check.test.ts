/**
 * The robust check on every core gives exactly the points of the check on one thread: each speed's search is
 * independent of the others and of the thread that runs it.
 */
import { describe, expect, it } from 'vitest';
import { PARALLEL_ROBUST_DEFAULTS, robustCheckOnAllCores } from '../../src/pipeline/parallel-robust-check.js';
import { makeRobustAnalysis } from '../../src/pipeline/robust-analysis.js';
import { robustCheck } from '../../src/robust/robust-check.js';
import { THRESHOLD_DEFAULTS } from '../../src/schedule/dense-check.js';
import { vanContext, vanGains } from '../robust/van-loop.js';

const context = vanContext({ mass_pct: 10, rearCorneringStiffness_pct: 15, addedLatency_s: 0.01 }, { samples: 6, localSearchEvaluations: 6 });
const count = PARALLEL_ROBUST_DEFAULTS.minimumSpeeds + 4;
const grid = Array.from({ length: count }, (_, i) => 2 + (23 * i) / (count - 1));
const tuned = new Map(grid.map((speed) => [speed, vanGains(speed)]));
const gainsAt = (speed_mps: number) => tuned.get(speed_mps) ?? vanGains(speed_mps);

describe('robustCheckOnAllCores', () => {
  it('with a worker thread gives the same points, failures and worst figures as the check on the main thread', async () => {
    const sequential = robustCheck({ grid, gainsAt, analyse: makeRobustAnalysis(context), thresholds: THRESHOLD_DEFAULTS });
    const parallel = await robustCheckOnAllCores({ ...context, thresholds: THRESHOLD_DEFAULTS, grid, gainsAt, workers: 1 });
    expect(parallel.points).toEqual(sequential.points);
    expect(parallel.worst).toEqual(sequential.worst);
    expect(parallel.failedCount).toBe(sequential.failedCount);
    expect(parallel.evaluations).toBe(sequential.evaluations);
    // The van's SIMC gains lose phase margin at high speed once the rear tyres soften: some speeds fail, named.
    expect(sequential.failedCount).toBeGreaterThan(0);
    expect(sequential.worst.phaseMargin_deg!.combination.rearCorneringStiffness_NPerRad).toBeLessThan(1);
  });
});
