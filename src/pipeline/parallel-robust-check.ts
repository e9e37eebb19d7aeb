/**
 * The robust check (src/robust/robust-check.ts) of a grid on every core: a speed's search costs about a
 * hundred loop analyses, so even a 200-speed grid is worth worker threads. Chunks of consecutive speeds go
 * to the main thread and the workers from one queue (work-queue.ts); every speed's search is independent of
 * the others (its samples come from the set's seed, not from a shared stream), so the points and figures
 * are those of the check on one thread whatever the number of threads.
 */
import type { OverSpeed } from '../core/by-speed.js';
import type { ControllerSettings } from '../controller/types.js';
import type { LoopSpecification } from '../loops/types.js';
import { robustCheck, robustCheckPoint, robustCheckResult } from '../robust/robust-check.js';
import type { RobustCheckPoint, RobustCheckResult, RobustSearchSettings, VariationSet } from '../robust/types.js';
import type { AcceptanceThresholds, GainsAtSpeed, ProgressCallback } from '../schedule/types.js';
import type { CheckModel } from './check-model.js';
import type { CheckChunk, WorkerData } from './check-worker.js';
import { checkChunks, workerCount } from './parallel-check.js';
import { makeRobustAnalysis } from './robust-analysis.js';
import { runOnAllCores } from './work-queue.js';

export const PARALLEL_ROBUST_DEFAULTS = {
  /** Grids smaller than this run on the main thread alone (a worker's start-up, ≈ 0.1–0.3 s, costs as much as 5–15 speeds). */
  minimumSpeeds: 32,
  /** Speeds per chunk of the shared queue (small: the threads finish together). */
  chunkSpeeds: 4,
} as const;

export interface ParallelRobustCheckInput {
  readonly model: CheckModel;
  readonly loop: LoopSpecification;
  readonly controller: ControllerSettings;
  readonly thresholds: OverSpeed<AcceptanceThresholds>;
  readonly set: VariationSet;
  readonly search: RobustSearchSettings;
  readonly grid: ArrayLike<number>;
  readonly gainsAt: GainsAtSpeed;
  /** Worker threads besides the main thread (default: the available parallelism − 1, at most 7; 0 = the main thread only). */
  readonly workers?: number;
  readonly onProgress?: ProgressCallback;
}

/** The robust check of `grid` on the main thread and worker threads; see the module comment. */
export async function robustCheckOnAllCores(input: ParallelRobustCheckInput): Promise<RobustCheckResult> {
  const total = input.grid.length;
  const workers = workerCount(input.workers);
  const analyse = makeRobustAnalysis({ model: input.model, loop: input.loop, controller: input.controller, set: input.set, search: input.search });
  if (workers === 0 || total < PARALLEL_ROBUST_DEFAULTS.minimumSpeeds) {
    return robustCheck({
      grid: input.grid,
      gainsAt: input.gainsAt,
      analyse,
      thresholds: input.thresholds,
      ...(input.onProgress === undefined ? {} : { onProgress: input.onProgress }),
    });
  }
  const points = new Array<RobustCheckPoint>(total);
  let done = 0;
  const workerData: WorkerData = {
    task: 'robust',
    summary: input.model.summary,
    description: input.model.description,
    loop: input.loop,
    controller: input.controller,
    thresholds: input.thresholds,
    set: input.set,
    search: input.search,
  };
  await runOnAllCores<CheckChunk, RobustCheckPoint>({
    chunks: checkChunks(input.grid, input.gainsAt, PARALLEL_ROBUST_DEFAULTS.chunkSpeeds),
    workers,
    workerData,
    onMain: (chunk) => chunk.speeds_mps.map((speed_mps, i) => robustCheckPoint(speed_mps, chunk.gains[i], analyse, input.thresholds)),
    onDone: (chunk, items) => {
      items.forEach((point, i) => (points[chunk.start + i] = point));
      done += items.length;
      input.onProgress?.({ stage: 'check', done, total, note: 'over the variations' });
    },
  });
  return robustCheckResult(points);
}
