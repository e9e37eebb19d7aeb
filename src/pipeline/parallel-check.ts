/**
 * The dense check of a large grid on every core: the speeds are cut into chunks that the main thread
 * and worker threads (check-worker.ts) take from one queue (work-queue.ts), each analysing its chunk exactly
 * as the sequential check does. Every speed is analysed on its own (no state between speeds), so the points,
 * their order and every figure are identical to `denseCheck` — only faster where a second core is free.
 * Worker start-up (≈ 0.1–0.3 s of module loading) pays only for large grids: below
 * PARALLEL_CHECK_DEFAULTS.minimumSpeeds the check runs on the main thread alone.
 */
import { atSpeed, type OverSpeed } from '../core/by-speed.js';
import { availableParallelism } from 'node:os';
import type { ControllerSettings, PidGains } from '../controller/types.js';
import type { LoopSpecification } from '../loops/types.js';
import { denseCheck, judgeMargins, worstMargins } from '../schedule/dense-check.js';
import type { AcceptanceThresholds, CheckPoint, DenseCheckResult, GainsAtSpeed, ProgressCallback } from '../schedule/types.js';
import type { CheckModel } from './check-model.js';
import type { CheckChunk, WorkerData } from './check-worker.js';
import { makeLoopAnalysis } from './loop-analysis.js';
import { runOnAllCores, runningFromSources } from './work-queue.js';

export const PARALLEL_CHECK_DEFAULTS = {
  /** Grids smaller than this run on the main thread alone (worker start-up would cost more than it saves). */
  minimumSpeeds: 3000,
  /** Speeds per chunk of the shared queue. */
  chunkSpeeds: 250,
  /** Most worker threads (besides the main thread). */
  maximumWorkers: 7,
} as const;

export interface ParallelCheckInput {
  readonly model: CheckModel;
  readonly loop: LoopSpecification;
  readonly controller: ControllerSettings;
  readonly thresholds: OverSpeed<AcceptanceThresholds>;
  readonly grid: ArrayLike<number>;
  readonly gainsAt: GainsAtSpeed;
  /** Worker threads besides the main thread (default: the available parallelism − 1, at most 7; 0 = sequential). */
  readonly workers?: number;
  readonly onProgress?: ProgressCallback;
}

/** The speeds of `grid` in chunks of `size`, with the gains to check at each (plain data a worker can be sent). */
export function checkChunks(grid: ArrayLike<number>, gainsAt: GainsAtSpeed, size: number): CheckChunk[] {
  const chunks: CheckChunk[] = [];
  for (let start = 0; start < grid.length; start += size) {
    const speeds_mps: number[] = [];
    const gains: PidGains[] = [];
    for (let i = start; i < Math.min(start + size, grid.length); i++) {
      speeds_mps.push(grid[i]);
      gains.push(gainsAt(grid[i]));
    }
    chunks.push({ start, speeds_mps, gains });
  }
  return chunks;
}

/**
 * Worker threads for a check: the caller's number, else the available parallelism − 1, at most
 * PARALLEL_CHECK_DEFAULTS.maximumWorkers. From the TypeScript sources (tests, benches) none unless asked for: each
 * worker would first compile the whole check (seconds of a core), more than a test's check takes on one thread.
 */
export function workerCount(requested: number | undefined): number {
  const unrequested = runningFromSources() ? 0 : Math.max(0, availableParallelism() - 1);
  return Math.min(requested ?? unrequested, PARALLEL_CHECK_DEFAULTS.maximumWorkers);
}

/** The dense check of `grid` with the analysis of `model`, on the main thread and worker threads; see the module comment. */
export async function denseCheckOnAllCores(input: ParallelCheckInput): Promise<DenseCheckResult> {
  const total = input.grid.length;
  const workers = workerCount(input.workers);
  const analyse = makeLoopAnalysis(input.model, input.loop, input.controller);
  if (workers === 0 || total < PARALLEL_CHECK_DEFAULTS.minimumSpeeds) {
    return denseCheck({
      grid: input.grid,
      gainsAt: input.gainsAt,
      analyse,
      thresholds: input.thresholds,
      ...(input.onProgress === undefined ? {} : { onProgress: input.onProgress }),
    });
  }
  const points = new Array<CheckPoint>(total);
  let done = 0;
  const workerData: WorkerData = {
    task: 'dense',
    summary: input.model.summary,
    description: input.model.description,
    loop: input.loop,
    controller: input.controller,
    thresholds: input.thresholds,
  };
  await runOnAllCores<CheckChunk, CheckPoint>({
    chunks: checkChunks(input.grid, input.gainsAt, PARALLEL_CHECK_DEFAULTS.chunkSpeeds),
    workers,
    workerData,
    onMain: (chunk) =>
      chunk.speeds_mps.map((speed_mps, i) => {
        const margins = analyse(speed_mps, chunk.gains[i]);
        return { speed_mps, gains: chunk.gains[i], margins, failures: judgeMargins(margins, atSpeed(input.thresholds, speed_mps)) };
      }),
    onDone: (chunk, items) => {
      items.forEach((point, i) => (points[chunk.start + i] = point));
      done += items.length;
      input.onProgress?.({ stage: 'check', done, total });
    },
  });
  const failedCount = points.reduce((count, point) => count + (point.failures.length > 0 ? 1 : 0), 0);
  return { passed: failedCount === 0, points, failedCount, worst: worstMargins(points) };
}
