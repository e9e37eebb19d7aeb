/**
 * The identification fits over the measured steps, for the report: each step of models.json found again in
 * its log (matched by the log's SHA-256 and the step's onset), its FOPDT fit simulated over the same window
 * exactly as the fit computed it (command relative to its pre-step mean, the fit's hold and bias), and the
 * residual. Drawn on one scale per speed: yaw rate per command change (1/s), so that steps left and right
 * and of both amplitudes lie on one curve.
 */
import { SpeedbandError } from '../core/errors.js';
import { readFileBytes, sha256Hex } from '../core/files.js';
import { IDENTIFY_DEFAULTS } from '../identify/defaults.js';
import { expandLogPaths } from '../identify/identify-from-logs.js';
import type { ModelsFile, TestRecord } from '../identify/models-schema.js';
import { simulateFopdt, type CommandHold } from '../identify/simulate-fopdt.js';
import { relativeToPreStep, truncateStep } from '../identify/step-signals.js';
import { readSteerLog, type ReadLogOptions } from '../log/read.js';
import { findStepTests } from '../log/segment.js';
import type { StepTest } from '../log/types.js';
import type { StepTrace, StepTracesAtSpeed } from './types.js';

/** Points per drawn trace at most (every k-th sample); the RMSE is computed over every sample. */
export const TRACE_POINTS = 160;
/** Onsets within this of each other are the same step, s. */
const ONSET_TOLERANCE_S = 1e-6;
/** Drawn from this long before the onset, s. */
const BEFORE_ONSET_S = 0.5;

/** The logs given, each by its SHA-256 among the inputs of models.json; one that is not there is refused. */
function logsByHash(models: ModelsFile, modelsFile: string, paths: readonly string[]): Map<string, string> {
  const known = new Set(models.inputs.map((entry) => entry.sha256));
  const byHash = new Map<string, string>();
  for (const path of expandLogPaths(paths)) {
    const sha256 = sha256Hex(readFileBytes(path));
    if (!known.has(sha256)) {
      throw new SpeedbandError(
        'report.logNotInModels',
        `this log is not one of the logs ${modelsFile} was identified from (its SHA-256 ${sha256.slice(0, 16)}… is not among the models file's inputs) — give the logs of that identification, or leave --logs out to draw the report without the step fits`,
        { location: { file: path } },
      );
    }
    byHash.set(sha256, path);
  }
  return byHash;
}

/** Every k-th index of [from, to), the last one included. */
function strided(from: number, to: number, points: number): number[] {
  const stride = Math.max(1, Math.ceil((to - from) / points));
  const indices: number[] = [];
  for (let i = from; i < to; i += stride) indices.push(i);
  if (indices[indices.length - 1] !== to - 1) indices.push(to - 1);
  return indices;
}

/** One step's trace: measured and fitted on the per-command scale, and the residual. */
export function stepTrace(step: StepTest, test: TestRecord, hold: CommandHold): StepTrace {
  const { gain, timeConstant_s, deadTime_s, bias_radps } = test.fopdt;
  const input = relativeToPreStep(step.steerCommand_rad, step.preStepSamples);
  const fit = simulateFopdt({ time_s: step.time_s, input, gain, timeConstant_s, deadTime_s, hold });
  const n = step.time_s.length;
  let sum = 0;
  for (let i = 0; i < n; i++) sum += (step.yawRate_radps[i] - fit[i] - bias_radps) ** 2;
  const onsetTime_s = step.time_s[Math.max(0, step.preStepSamples - 1)];
  let first = 0;
  while (first < n - 1 && step.time_s[first] < onsetTime_s - BEFORE_ONSET_S) first++;
  const indices = strided(first, n, TRACE_POINTS);
  const amplitude = step.amplitude_rad;
  return {
    file: test.file,
    stepIndex: test.stepIndex,
    direction: test.direction,
    amplitude_rad: amplitude,
    time_s: indices.map((i) => step.time_s[i] - onsetTime_s),
    measuredPerCommand_perS: indices.map((i) => (step.yawRate_radps[i] - bias_radps) / amplitude),
    fitPerCommand_perS: indices.map((i) => fit[i] / amplitude),
    residual_radps: indices.map((i) => step.yawRate_radps[i] - fit[i] - bias_radps),
    rmse_radps: Math.sqrt(sum / n),
    r2: test.fopdt.r2,
  };
}

export interface StepTraceInput {
  readonly models: ModelsFile;
  /** How the user named models.json (in messages). */
  readonly modelsFile: string;
  readonly logPaths: readonly string[];
  readonly readOptions?: ReadLogOptions;
}

/** The traces of every used step whose log was given, grouped by the speeds of models.json. */
export function stepTraces(input: StepTraceInput): StepTracesAtSpeed[] {
  const { models } = input;
  const byHash = logsByHash(models, input.modelsFile, input.logPaths);
  const hashOfFile = new Map(models.inputs.map((entry) => [entry.file, entry.sha256]));
  const hold = (models.options.hold as CommandHold | undefined) ?? IDENTIFY_DEFAULTS.hold;
  const maxHold_s = typeof models.options.maxHold_s === 'number' ? models.options.maxHold_s : IDENTIFY_DEFAULTS.maxHold_s;
  const stepsOfLog = new Map<string, StepTest[]>();
  const stepsIn = (path: string): StepTest[] => {
    let steps = stepsOfLog.get(path);
    if (steps === undefined) {
      steps = findStepTests(readSteerLog(path, input.readOptions)).steps.map((step) => truncateStep(step, maxHold_s));
      stepsOfLog.set(path, steps);
    }
    return steps;
  };
  const testsByKey = new Map(models.tests.map((test) => [`${test.file}\u0000${test.stepIndex}`, test]));
  return models.speeds.map((speed) => {
    const steps: StepTrace[] = [];
    let missing = 0;
    for (const key of speed.steps) {
      const test = testsByKey.get(`${key.file}\u0000${key.stepIndex}`);
      const sha256 = hashOfFile.get(key.file);
      const path = sha256 === undefined ? undefined : byHash.get(sha256);
      const step =
        test === undefined || path === undefined
          ? undefined
          : stepsIn(path).find((candidate) => Math.abs(candidate.onset_s - test.onset_s) <= ONSET_TOLERANCE_S);
      if (test === undefined || step === undefined) missing++;
      else steps.push(stepTrace(step, test, hold));
    }
    return { speed_mps: speed.speed_mps, steps, missing };
  });
}
