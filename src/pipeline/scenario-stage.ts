/**
 * The scenario stage of a build: the scenario check of the schedule (simulate-schedule.ts) and its speed-change
 * certificate (speed-change-certificate.ts). The speed changes through the range — the two range scenarios and the
 * certificate's bisection over the rate, every run integrated by Runge–Kutta — do not depend on the per-speed runs,
 * so they go to a helper thread (scenario-worker.ts) when one was started, while the main thread runs the per-speed
 * scenarios. The results are put together in the order the check has on one thread: every figure, failure and the
 * certificate are the same — only sooner where a second core is free. The helper is started at the beginning of a
 * build (startScenarioHelper), so that loading it overlaps the tuning and the dense check; if it fails in any way,
 * the main thread does its part.
 */
import { availableParallelism } from 'node:os';
import { Worker } from 'node:worker_threads';
import type { ScheduleScenarioCheck, SpeedChangeCertificate } from '../schedule/schedule-types.js';
import { scenarioCheckOf, scenarioCheckRuns, scheduleScenarioController, type JudgedRun, type ScenarioCheckInput } from './simulate-schedule.js';
import { speedChangeCertificate } from './speed-change-certificate.js';
import { runningFromSources, workerScript } from './work-queue.js';

/** The helper's part: the speed changes through the range (plain data, sent to the helper thread). */
export type RangeJob = Omit<ScenarioCheckInput, 'stopAtRest'>;

export interface RangeResult {
  readonly range: readonly JudgedRun[];
  readonly speedChange: SpeedChangeCertificate;
}

/** The speed-change certificate of a schedule on the model `parameters`, with the schedule's lookup and range. */
export function scheduleSpeedChangeCertificate(input: RangeJob): SpeedChangeCertificate {
  const { schedule, parameters, steeringLimits } = input;
  return speedChangeCertificate({
    vehicle: { parameters, ...steeringLimits },
    controller: scheduleScenarioController(schedule),
    context: { loop: schedule.loop.kind, parameters, maxSteerAngle_rad: steeringLimits.maxSteerAngle_rad, range: schedule.check.range },
    limits: input.limits,
  });
}

/** The range scenarios' judged runs and the certificate (what the helper thread computes). */
export function rangeWork(job: RangeJob): RangeResult {
  return { range: scenarioCheckRuns(job, 'range').before, speedChange: scheduleSpeedChangeCertificate(job) };
}

/** A helper thread for one scenario stage; close() it when the build is done (also after an error). */
export interface ScenarioHelper {
  /** The range part on the helper thread; rejects if the thread fails. */
  readonly run: (job: RangeJob) => Promise<RangeResult>;
  readonly close: () => void;
}

/**
 * Start a helper thread, or null where it cannot pay: one core only, or running from the TypeScript sources (the
 * thread would compile them first) unless `fromSources` is 'allowed' (tests).
 */
export function startScenarioHelper(options: { readonly fromSources?: 'allowed' | 'refused' } = {}): ScenarioHelper | null {
  if (availableParallelism() < 2) return null;
  if (runningFromSources() && options.fromSources !== 'allowed') return null;
  let worker: Worker;
  try {
    worker = new Worker(workerScript('scenario-worker'));
  } catch {
    return null;
  }
  // An idle helper never keeps the process alive; one with a job does, until it answers.
  worker.unref();
  let failure: Error | null = null;
  let pending: { resolve: (result: RangeResult) => void; reject: (error: Error) => void } | null = null;
  const settle = (): void => {
    pending = null;
    worker.unref();
  };
  const fail = (error: Error): void => {
    failure ??= error;
    pending?.reject(failure);
    settle();
  };
  worker.on('error', fail);
  worker.on('exit', (code) => fail(new Error(`the scenario helper thread stopped (exit code ${code})`)));
  worker.on('message', (answer: { readonly result: RangeResult } | { readonly error: string }) => {
    if ('result' in answer) pending?.resolve(answer.result);
    else pending?.reject(new Error(answer.error));
    settle();
  });
  return {
    run: (job) =>
      new Promise<RangeResult>((resolve, reject) => {
        if (failure !== null) return reject(failure);
        pending = { resolve, reject };
        worker.ref();
        worker.postMessage(job);
      }),
    close: () => {
      fail(new Error('the scenario helper thread was closed'));
      worker.removeAllListeners();
      void worker.terminate();
    },
  };
}

/** The scenario check and the speed-change certificate of a schedule, the range part on `helper` when given (see the module comment). */
export async function scenarioStage(
  input: ScenarioCheckInput,
  helper: ScenarioHelper | null,
): Promise<{ readonly scenarioCheck: ScheduleScenarioCheck; readonly speedChange: SpeedChangeCertificate }> {
  const { stopAtRest: _stop, ...job } = input;
  // A helper that fails (it could not start, it stopped): the main thread computes its part, to the same numbers.
  const remote = helper === null ? null : helper.run(job).catch(() => null);
  const perSpeed = scenarioCheckRuns(input, 'per-speed');
  const range = (await remote) ?? rangeWork(job);
  return { scenarioCheck: scenarioCheckOf(input, [...perSpeed.before, ...range.range, ...perSpeed.after]), speedChange: range.speedChange };
}
