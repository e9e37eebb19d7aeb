/**
 * Gather everything the report draws (ReportData) from a schedule and, when given, the identification it
 * was built from, its logs and a previous schedule. Each part is computed only when its inputs are there;
 * the renderer draws the sections whose parts are present.
 */
import { basename } from 'node:path';
import { oldGainsOnNewVehicle, summariseOldGainsCheck } from '../pipeline/baseline.js';
import type { CheckModel } from '../pipeline/check-model.js';
import { recordedCheckModel } from '../pipeline/recheck-schedule.js';
import { compareSchedules } from '../compare/compare-schedules.js';
import { DRIFT_HEADER, SPEED_TABLE_HEADER, WORST_HEADER, driftRows, speedRow, summaryLine, worstRows } from '../compare/comparison-words.js';
import { oldGainsLead, oldGainsModelWords } from '../compare/old-gains-words.js';
import { SpeedbandError } from '../core/errors.js';
import type { ModelsFile } from '../identify/models-schema.js';
import type { ReadLogOptions } from '../log/read.js';
import type { ScheduleFile } from '../schedule/schedule-types.js';
import type { ScheduleVariations } from '../schedule/schedule-variations.js';
import { weakestWords } from '../pipeline/robust-report.js';
import type { DenseCheckResult } from '../schedule/types.js';
import { VERSION } from '../version.js';
import { loopResponseAt, responseSpeeds } from './frequency-responses.js';
import { modelPrediction } from './model-prediction.js';
import { reportCheck, reproducesRecordedCheck, rerunScheduleCheck } from './report-check.js';
import { closedLoopTraces } from './closed-loop-traces.js';
import { oldTimeDomainOnNewVehicle } from './old-time-domain.js';
import { stepTraces } from './step-traces.js';
import type { GainCurve, ReportBaseline, ReportData } from './types.js';
import { checkGrid } from '../schedule/grid.js';
import { scheduleLookup } from '../schedule/schedule-lookup.js';

/** What the report is made from: a schedule, and optionally its identification, logs and a previous schedule. */
export interface ReportInput {
  readonly schedule: ScheduleFile;
  /** How the user named the schedule (its base name is shown). */
  readonly scheduleFile: string;
  /** The schedule's dense check as the build just ran it (else it is re-run on the model the schedule records). */
  readonly check?: DenseCheckResult;
  /** The identification the schedule was built from. */
  readonly models?: { readonly file: string; readonly content: ModelsFile };
  /** The logs of that identification, to draw the fits over the measured steps (needs `models`). */
  readonly logs?: { readonly paths: readonly string[]; readonly readOptions?: ReadLogOptions };
  /** A previous schedule; `check`: its gains' dense check on the new vehicle model when already run (`build --baseline`). */
  readonly baseline?: { readonly file: string; readonly schedule: ScheduleFile; readonly check?: DenseCheckResult };
  /** Speeds of the frequency-response plots (default: lowest and highest breakpoint, smallest phase margin). */
  readonly responseSpeeds_mps?: readonly number[];
}

/** models.json must be the identification the schedule was built from: the same vehicle file and the same logs, by SHA-256. */
export function requireModelsOfSchedule(schedule: ScheduleFile, models: ModelsFile, modelsFile: string): void {
  const mismatch = (what: string): never => {
    throw new SpeedbandError(
      'report.modelsMismatch',
      `${modelsFile} is not the identification this schedule was built from: ${what} — give the models.json of that build (build --models-out, or identify on the same logs)`,
      {
        location: { file: modelsFile },
      },
    );
  };
  if (models.vehicle.sha256 !== schedule.vehicle.sha256)
    mismatch(`its vehicle file (SHA-256 ${models.vehicle.sha256.slice(0, 16)}…) differs from the schedule's (${schedule.vehicle.sha256.slice(0, 16)}…)`);
  const scheduleLogs = schedule.provenance.inputs
    .filter((entry) => entry.role === 'log')
    .map((entry) => entry.sha256)
    .sort();
  const modelLogs = models.inputs.map((entry) => entry.sha256).sort();
  if (scheduleLogs.length !== modelLogs.length || scheduleLogs.some((sha256, k) => sha256 !== modelLogs[k])) {
    mismatch(`its ${modelLogs.length} logs are not the schedule's ${scheduleLogs.length} (compared by SHA-256)`);
  }
}

/** The speeds of a schedule's dense check (breakpoints, midpoints and the evenly spaced grid). */
const checkSpeeds = (schedule: ScheduleFile): number[] =>
  Array.from(
    checkGrid(
      schedule.breakpoints.map((breakpoint) => breakpoint.speed_mps),
      schedule.check.range,
      schedule.check.gridSpeeds,
    ),
  );

/** A schedule's lookup at the given speeds. */
export function gainCurve(schedule: ScheduleFile, speeds_mps: readonly number[]): GainCurve {
  const lookup = scheduleLookup(schedule);
  const gains = speeds_mps.map((speed) => lookup(speed));
  return { speeds_mps: [...speeds_mps], kp: gains.map((g) => g.kp), ki: gains.map((g) => g.ki), kd: gains.map((g) => g.kd) };
}

/** The speed span the parameter plots cover: the schedule's range and every test speed. */
const predictionSpan = (schedule: ScheduleFile, testSpeeds: readonly number[]): [number, number] => [
  Math.min(schedule.check.range.minimum_mps, ...testSpeeds),
  Math.max(schedule.check.range.maximum_mps, ...testSpeeds),
];

function baselineData(
  input: NonNullable<ReportInput['baseline']>,
  schedule: ScheduleFile,
  testSpeeds: readonly number[],
  model: CheckModel | null,
): ReportBaseline {
  const computed = input.check === undefined ? oldGainsOnNewVehicle(input.schedule, schedule) : null;
  const check = input.check ?? computed?.check ?? null;
  const verdict = input.check === undefined ? computed!.summary : summariseOldGainsCheck(input.check, input.schedule, schedule.check.model.description);
  const comparison = compareSchedules(input.schedule, schedule, {}, verdict);
  const oldModel = recordedCheckModel(input.schedule);
  return {
    file: basename(input.file),
    schedule: input.schedule,
    comparison,
    oldGainsOnNewVehicle: verdict,
    check: check === null ? null : reportCheck(check, `the old gains of ${basename(input.file)} on the new vehicle model`),
    timeDomain: check === null || model === null ? null : oldTimeDomainOnNewVehicle(input.schedule, schedule, model, check),
    gainCurve: gainCurve(input.schedule, checkSpeeds(schedule)),
    // Drawn on the parameter plots, which need models.json (its test speeds).
    prediction: oldModel === null || testSpeeds.length === 0 ? null : modelPrediction(oldModel, ...predictionSpan(schedule, testSpeeds)),
    lead: oldGainsLead(verdict),
    leadModel: oldGainsModelWords(verdict),
    summary: summaryLine(comparison),
    speedTable: { header: [...SPEED_TABLE_HEADER], rows: comparison.speeds.map(speedRow) },
    worstTable: { header: [...WORST_HEADER], rows: worstRows(comparison) },
    driftTable: comparison.modelDrift.available ? { header: [...DRIFT_HEADER], rows: driftRows(comparison) } : null,
    driftUnavailable: comparison.modelDrift.available ? null : comparison.modelDrift.reason,
    flags: comparison.flags.map((flag) => flag.message),
  };
}

/** The worst case over the variations in words: its acceptance and verdict, and the weakest parameter. */
function variationsWords(variations: ScheduleVariations): NonNullable<ReportData['variations']> {
  const acceptance =
    variations.acceptance === 'robust' ? 'the schedule must pass it (robust acceptance)' : 'reported beside the nominal check (nominal acceptance)';
  const verdict = variations.passed
    ? `The worst case over the plan's variations keeps the limits at every one of the ${variations.gridSize} check speeds and the time-domain limits at every breakpoint; ${acceptance}.`
    : `The worst case over the plan's variations breaks a limit at ${variations.failedSpeeds} of ${variations.gridSize} check speeds${variations.unstableSpeeds > 0 ? ` (an unstable loop in the set at ${variations.unstableSpeeds})` : ''}; ${acceptance}.`;
  return { verdict, weakest: variations.weakest === null ? null : `Weakest parameter: ${weakestWords(variations.weakest)}.` };
}

/** Everything the report draws, each part only when its inputs are given (the dense check re-run point by point on the model the schedule records, the closed-loop responses, with models.json the fits, with a baseline the old gains on the new vehicle). Throws `report.modelsMismatch`, `report.logsWithoutModels`, `report.logNotInModels`, `report.speedOutOfRange`. */
export function gatherReportData(input: ReportInput): ReportData {
  const { schedule } = input;
  if (input.logs !== undefined && input.models === undefined) {
    throw new SpeedbandError(
      'report.logsWithoutModels',
      'the logs draw the identification fits, which are in models.json — give --models with --logs (or leave --logs out)',
    );
  }
  if (input.models !== undefined) requireModelsOfSchedule(schedule, input.models.content, input.models.file);
  const model = recordedCheckModel(schedule);
  const dense = input.check ?? rerunScheduleCheck(schedule);
  const check = dense === null ? null : reportCheck(dense, `the schedule's gains on ${schedule.check.model.description}`);
  const models = input.models ?? null;
  const testSpeeds = models?.content.speeds.map((speed) => speed.speed_mps) ?? [];
  const chosenSpeeds = responseSpeeds(schedule, check, input.responseSpeeds_mps);
  return {
    toolVersion: VERSION,
    scheduleFile: basename(input.scheduleFile),
    schedule,
    check,
    checkUnavailable:
      dense === null
        ? `the schedule records no vehicle model speedband can rebuild (provenance.model), so its dense check cannot be re-run for the plots`
        : null,
    checkReproduced: dense === null ? null : reproducesRecordedCheck(schedule, dense),
    gainCurve: gainCurve(schedule, checkSpeeds(schedule)),
    frequencyResponses:
      model === null
        ? []
        : chosenSpeeds.map((entry) => ({
            ...entry,
            response: loopResponseAt(schedule, model, entry.speed_mps),
            // The old gains with their own loop and controller, on the new vehicle model.
            old: input.baseline === undefined ? null : loopResponseAt(input.baseline.schedule, model, entry.speed_mps),
          })),
    models: models === null ? null : { file: basename(models.file), content: models.content },
    prediction: model === null || models === null ? null : modelPrediction(model, ...predictionSpan(schedule, testSpeeds)),
    stepTraces:
      input.logs === undefined || models === null
        ? null
        : stepTraces({
            models: models.content,
            modelsFile: models.file,
            logPaths: input.logs.paths,
            ...(input.logs.readOptions === undefined ? {} : { readOptions: input.logs.readOptions }),
          }),
    baseline: input.baseline === undefined ? null : baselineData(input.baseline, schedule, testSpeeds, model),
    closedLoop: model === null ? null : closedLoopTraces(schedule, model, dense),
    variations: schedule.variations === undefined ? null : variationsWords(schedule.variations),
  };
}
