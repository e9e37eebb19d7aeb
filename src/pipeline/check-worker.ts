/**
 * A worker thread of the parallel checks (work-queue.ts): it rebuilds the check's analysis from plain data
 * (the check model's summary, the loop, the controller and, for the robust check, the variation set) and
 * analyses the chunks of speeds it is sent, one at a time, answering each with its points in order — the
 * dense check's (parallel-check.ts) or the robust check's (parallel-robust-check.ts).
 */
import { atSpeed, type OverSpeed } from '../core/by-speed.js';
import { parentPort, workerData } from 'node:worker_threads';
import type { ControllerSettings, PidGains } from '../controller/types.js';
import type { ErrorCode } from '../core/error-codes.js';
import { isSpeedbandError } from '../core/errors.js';
import type { LoopSpecification } from '../loops/types.js';
import { robustCheckPoint } from '../robust/robust-check.js';
import type { RobustSearchSettings, VariationSet } from '../robust/types.js';
import { judgeMargins } from '../schedule/dense-check.js';
import type { AcceptanceThresholds } from '../schedule/types.js';
import { checkModelFromSummary, type CheckModelSummary } from './check-model.js';
import { makeLoopAnalysis } from './loop-analysis.js';
import { makeRobustAnalysis } from './robust-analysis.js';

/** What the worker is started with: the check to run and everything its analysis needs. */
export type WorkerData = {
  readonly summary: CheckModelSummary;
  readonly description: string;
  readonly loop: LoopSpecification;
  readonly controller: ControllerSettings;
  readonly thresholds: OverSpeed<AcceptanceThresholds>;
} & ({ readonly task: 'dense' } | { readonly task: 'robust'; readonly set: VariationSet; readonly search: RobustSearchSettings });

/** One chunk of work: consecutive grid speeds from `start`, with the gains to check at each. */
export interface CheckChunk {
  readonly start: number;
  readonly speeds_mps: readonly number[];
  readonly gains: readonly PidGains[];
}

/** A chunk's answer: its points in order, or the error met. */
export type WorkerAnswer<Item> =
  | { readonly items: readonly Item[] }
  | { readonly error: { readonly code: ErrorCode; readonly message: string; readonly details?: unknown } };

const data = workerData as WorkerData;
const model = checkModelFromSummary(data.summary, data.description);
const analyseChunk =
  data.task === 'dense'
    ? (() => {
        const analyse = makeLoopAnalysis(model, data.loop, data.controller);
        return (chunk: CheckChunk) =>
          chunk.speeds_mps.map((speed_mps, i) => {
            const margins = analyse(speed_mps, chunk.gains[i]);
            return { speed_mps, gains: chunk.gains[i], margins, failures: judgeMargins(margins, atSpeed(data.thresholds, speed_mps)) };
          });
      })()
    : (() => {
        const analyse = makeRobustAnalysis({ model, loop: data.loop, controller: data.controller, set: data.set, search: data.search });
        return (chunk: CheckChunk) => chunk.speeds_mps.map((speed_mps, i) => robustCheckPoint(speed_mps, chunk.gains[i], analyse, data.thresholds));
      })();

parentPort?.on('message', (chunk: CheckChunk) => {
  try {
    parentPort?.postMessage({ items: analyseChunk(chunk) } satisfies WorkerAnswer<unknown>);
  } catch (error) {
    const code = isSpeedbandError(error) ? error.code : 'internal';
    parentPort?.postMessage({
      error: { code, message: error instanceof Error ? error.message : String(error), details: isSpeedbandError(error) ? error.details : undefined },
    } satisfies WorkerAnswer<unknown>);
  }
});
