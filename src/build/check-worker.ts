/**
 * A worker thread of the parallel dense check (parallel-check.ts): it rebuilds the check's loop
 * analysis from plain data (the check model's summary, the loop and the controller) and analyses the
 * chunks of speeds it is sent, one at a time, answering each with its check points in order.
 */
import { parentPort, workerData } from 'node:worker_threads';
import type { ControllerSettings, PidGains } from '../controller/types.js';
import type { ErrorCode } from '../core/error-codes.js';
import { isSpeedbandError } from '../core/errors.js';
import type { LoopSpecification } from '../loops/types.js';
import { judgeMargins } from '../schedule/dense-check.js';
import type { AcceptanceThresholds, CheckPoint } from '../schedule/types.js';
import { checkModelFromSummary, type CheckModelSummary } from './check-model.js';
import { makeLoopAnalysis } from './loop-analysis.js';

/** What the worker is started with. */
export interface CheckWorkerData {
  readonly summary: CheckModelSummary;
  readonly description: string;
  readonly loop: LoopSpecification;
  readonly controller: ControllerSettings;
  readonly thresholds: AcceptanceThresholds;
}

/** One chunk of work and its answer. */
export interface CheckChunk {
  readonly start: number;
  readonly speeds_mps: readonly number[];
  readonly gains: readonly PidGains[];
}
export type CheckChunkAnswer =
  | { readonly start: number; readonly points: readonly CheckPoint[] }
  | { readonly start: number; readonly error: { readonly code: ErrorCode; readonly message: string; readonly details?: unknown } };

const data = workerData as CheckWorkerData;
const analyse = makeLoopAnalysis(checkModelFromSummary(data.summary, data.description), data.loop, data.controller);

parentPort?.on('message', (chunk: CheckChunk) => {
  try {
    const points = chunk.speeds_mps.map((speed_mps, i) => {
      const margins = analyse(speed_mps, chunk.gains[i]);
      return { speed_mps, gains: chunk.gains[i], margins, failures: judgeMargins(margins, data.thresholds) };
    });
    parentPort?.postMessage({ start: chunk.start, points } satisfies CheckChunkAnswer);
  } catch (error) {
    const code = isSpeedbandError(error) ? error.code : 'internal';
    parentPort?.postMessage({ start: chunk.start, error: { code, message: error instanceof Error ? error.message : String(error), details: isSpeedbandError(error) ? error.details : undefined } } satisfies CheckChunkAnswer);
  }
});
