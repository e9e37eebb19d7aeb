/**
 * Independent chunks of work done by the main thread and worker threads (check-worker.ts) taking them from
 * one queue: the dense check of a large grid (parallel-check.ts) and the robust check (parallel-robust-check.ts).
 * Each chunk's answer is the same whichever thread did it, so the results, their order and every figure are
 * those of doing the chunks in order on one thread — only faster where another core is free. A typed error
 * met by any thread reaches the caller as that error; the queue then stops handing out chunks.
 */
import { Worker } from 'node:worker_threads';
import { SpeedbandError } from '../core/errors.js';
import type { WorkerAnswer } from './check-worker.js';

/**
 * The script a worker runs: the built .js of `name` (a module of this folder, e.g. 'check-worker') beside this module;
 * from the TypeScript sources (tests, benches under tsx, a development dependency) a small module that registers
 * tsx's loader in the worker first.
 */
export function workerScript(name = 'check-worker'): URL {
  const here = import.meta.url;
  if (!here.endsWith('.ts')) return new URL(`./${name}.js`, here);
  const loader = import.meta.resolve('tsx/esm/api');
  const source = `import { register } from ${JSON.stringify(loader)}; register(); await import(${JSON.stringify(new URL(`./${name}.ts`, here).href)});`;
  return new URL(`data:text/javascript,${encodeURIComponent(source)}`);
}

/** True when this module runs from the TypeScript sources (a worker would first compile them: slow to start). */
export function runningFromSources(): boolean {
  return import.meta.url.endsWith('.ts');
}

export interface WorkQueueInput<Chunk, Item> {
  readonly chunks: readonly Chunk[];
  /** Worker threads besides the main thread (0: the main thread does every chunk). */
  readonly workers: number;
  /** What each worker is started with (check-worker.ts WorkerData). */
  readonly workerData: unknown;
  /** The main thread's share: the items of one chunk, as a worker would answer them. */
  readonly onMain: (chunk: Chunk) => readonly Item[];
  /** Each chunk's items as they arrive, from whichever thread. */
  readonly onDone: (chunk: Chunk, items: readonly Item[]) => void;
}

/** Do every chunk on the main thread and `workers` worker threads; see the module comment. */
export async function runOnAllCores<Chunk, Item>(input: WorkQueueInput<Chunk, Item>): Promise<void> {
  const queue = [...input.chunks];
  let failure: Error | null = null;
  const running = Array.from({ length: input.workers }, () => {
    const worker = new Worker(workerScript(), { workerData: input.workerData });
    return new Promise<void>((resolve) => {
      let current: Chunk | undefined;
      const next = (): void => {
        current = failure === null ? queue.shift() : undefined;
        if (current === undefined) {
          void worker.terminate().then(() => resolve());
          return;
        }
        worker.postMessage(current);
      };
      worker.on('online', next);
      worker.on('message', (answer: WorkerAnswer<Item>) => {
        if ('error' in answer) {
          failure ??= new SpeedbandError(answer.error.code, answer.error.message, { details: (answer.error.details ?? {}) as Record<string, unknown> });
        } else if (current !== undefined) {
          input.onDone(current, answer.items);
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
    const chunk = queue.shift();
    if (chunk === undefined) break;
    try {
      input.onDone(chunk, input.onMain(chunk));
    } catch (error) {
      failure ??= error instanceof Error ? error : new Error(String(error));
    }
    await new Promise<void>((resolve) => setImmediate(resolve));
  }
  await Promise.all(running);
  if (failure !== null) throw failure;
}
