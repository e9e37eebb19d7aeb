/**
 * The helper thread of the scenario stage (scenario-stage.ts): it receives the range part of a schedule's scenario
 * check (plain data) and answers with its judged runs and the speed-change certificate, or the error met.
 */
import { parentPort } from 'node:worker_threads';
import { rangeWork, type RangeJob } from './scenario-stage.js';

parentPort?.on('message', (job: RangeJob) => {
  try {
    parentPort?.postMessage({ result: rangeWork(job) });
  } catch (error) {
    parentPort?.postMessage({ error: error instanceof Error ? error.message : String(error) });
  }
});
