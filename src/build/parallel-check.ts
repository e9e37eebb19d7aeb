/**
 * The dense check of a large grid on every core: the speeds are cut into chunks that the main thread
 * and worker threads (check-worker.ts) take from one queue, each analysing its chunk exactly as the
 * sequential check does. Every speed is analysed on its own (no state between speeds), so the points,
 * their order and every figure are identical to `denseCheck` — only faster where a second core is free.
 * Worker start-up (≈ 0.1–0.3 s of module loading) pays only for large grids: below
 * PARALLEL_CHECK_DEFAULTS.minimumSpeeds the check runs on the main thread alone.
 */
import { availableParallelism } from 'node:os';
import { Worker } from 'node:worker_threads';
import type { ControllerSettings, PidGains } from '../controller/types.js';
import { SpeedbandError } from '../core/errors.js';
import type { LoopSpecification } from '../loops/types.js';
import { denseCheck, judgeMargins, worstMargins } from '../schedule/dense-check.js';
import type { AcceptanceThresholds, CheckPoint, DenseCheckResult, GainsAtSpeed, ProgressCallback } from '../schedule/types.js';
import type { CheckModel } from './check-model.js';
import type { CheckChunk, CheckChunkAnswer, CheckWorkerData } from './check-worker.js';
import { makeLoopAnalysis } from './loop-analysis.js';

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
  readonly thresholds: AcceptanceThresholds;
  readonly grid: ArrayLike<number>;
  readonly gainsAt: GainsAtSpeed;
  /** Worker threads besides the main thread (default: the available parallelism − 1, at most 7; 0 = sequential). */
  readonly workers?: number;
  readonly onProgress?: ProgressCallback;
}

/**
 * The script a worker runs: the built .js beside this module; from the TypeScript sources (tests, benches under
 * tsx, a development dependency) a small module that registers tsx's loader in the worker first.
 */
function workerScript(): URL {
  const here = import.meta.url;
  if (!here.endsWith('.ts')) return new URL('./check-worker.js', here);
  const loader = import.meta.resolve('tsx/esm/api');
  const source = `import { register } from ${JSON.stringify(loader)}; register(); await import(${JSON.stringify(new URL('./check-worker.ts', here).href)});`;
  return new URL(`data:text/javascript,${encodeURIComponent(source)}`);
}

/** The dense check of `grid` with the analysis of `model`, on the main thread and worker threads; see the module comment. */
export async function denseCheckOnAllCores(input: ParallelCheckInput): Promise<DenseCheckResult> {
  const total = input.grid.length;
  const workers = Math.min(input.workers ?? Math.max(0, availableParallelism() - 1), PARALLEL_CHECK_DEFAULTS.maximumWorkers);
  const analyse = makeLoopAnalysis(input.model, input.loop, input.controller);
  if (workers === 0 || total < PARALLEL_CHECK_DEFAULTS.minimumSpeeds) {
    return denseCheck({ grid: input.grid, gainsAt: input.gainsAt, analyse, thresholds: input.thresholds, ...(input.onProgress === undefined ? {} : { onProgress: input.onProgress }) });
  }
  const points = new Array<CheckPoint>(total);
  const starts: number[] = [];
  for (let start = 0; start < total; start += PARALLEL_CHECK_DEFAULTS.chunkSpeeds) starts.push(start);
  const chunkAt = (start: number): CheckChunk => {
    const speeds_mps: number[] = [];
    const gains: PidGains[] = [];
    for (let i = start; i < Math.min(start + PARALLEL_CHECK_DEFAULTS.chunkSpeeds, total); i++) {
      speeds_mps.push(input.grid[i]);
      gains.push(input.gainsAt(input.grid[i]));
    }
    return { start, speeds_mps, gains };
  };
  let done = 0;
  let failure: Error | null = null;
  const report = (count: number): void => {
    done += count;
    input.onProgress?.({ stage: 'check', done, total });
  };

  const script = workerScript();
  const workerData: CheckWorkerData = { summary: input.model.summary, description: input.model.description, loop: input.loop, controller: input.controller, thresholds: input.thresholds };
  const running = Array.from({ length: workers }, () => {
    const worker = new Worker(script, { workerData });
    return new Promise<void>((resolve) => {
      const next = (): void => {
        const start = failure === null ? starts.shift() : undefined;
        if (start === undefined) {
          void worker.terminate().then(() => resolve());
          return;
        }
        worker.postMessage(chunkAt(start));
      };
      worker.on('online', next);
      worker.on('message', (answer: CheckChunkAnswer) => {
        if ('error' in answer) {
          failure ??= new SpeedbandError(answer.error.code, answer.error.message, { details: (answer.error.details ?? {}) as Record<string, unknown> });
        } else {
          answer.points.forEach((point, i) => (points[answer.start + i] = point));
          report(answer.points.length);
        }
        next();
      });
      worker.on('error', (error) => {
        failure ??= error;
        resolve();
      });
    });
  });

  // The main thread takes chunks from the same queue, yielding between chunks so the workers are fed.
  while (failure === null) {
    const start = starts.shift();
    if (start === undefined) break;
    const chunk = chunkAt(start);
    try {
      chunk.speeds_mps.forEach((speed_mps, i) => {
        const margins = analyse(speed_mps, chunk.gains[i]);
        points[start + i] = { speed_mps, gains: chunk.gains[i], margins, failures: judgeMargins(margins, input.thresholds) };
      });
    } catch (error) {
      failure ??= error instanceof Error ? error : new Error(String(error));
    }
    report(chunk.speeds_mps.length);
    await new Promise<void>((resolve) => setImmediate(resolve));
  }
  await Promise.all(running);
  if (failure !== null) throw failure;
  const failedCount = points.reduce((count, point) => count + (point.failures.length > 0 ? 1 : 0), 0);
  return { passed: failedCount === 0, points, failedCount, worst: worstMargins(points) };
}
