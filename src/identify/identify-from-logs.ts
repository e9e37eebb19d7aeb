import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { SpeedbandError } from '../core/errors.js';
import { readFileBytes, sha256Hex } from '../core/files.js';
import { readSteerLog, type ReadLogOptions } from '../log/read.js';
import { findStepTests } from '../log/segment.js';
import type { LogChannelSource, RejectedStep, StepTest } from '../log/types.js';
import { channelObservations } from './channel-observations.js';
import { requireConsistentChannels } from './channel-scales.js';
import { loadVehicle, resolveVehiclePath } from '../vehicle/load.js';
import type { Vehicle } from '../vehicle/types.js';
import { VERSION } from '../version.js';
import { identifyActuator, type ActuatorIdentification } from './actuator.js';
import { aggregateSpeed, groupBySpeed } from './aggregate.js';
import { IDENTIFY_DEFAULTS, type IdentifyOptions } from './defaults.js';
import { identifyStep, type StepIdentification } from './identify-step.js';
import { truncateStep } from './step-signals.js';
import { fitSingleTrack, type SingleTrackFit } from './joint-single-track.js';
import { refusedTestRecord, speedRecord, testRecord } from './models-records.js';
import { MODELS_FORMAT, MODELS_FORMAT_VERSION, type ModelsFile, type SingleTrackRecord } from './models-schema.js';

/** Input of identifyFromLogs: the vehicle file, the logs, identification options and how to read the logs. */
export interface IdentifyFromLogsInput {
  /** Vehicle file, or a folder holding vehicle.json. */
  readonly vehicle: string;
  /** CSV step-test logs, one or more per speed; a folder stands for the .csv files in it (sorted by name). */
  readonly logPaths: readonly string[];
  readonly options?: Partial<IdentifyOptions>;
  /** How to read the logs (column names and units). */
  readonly readOptions?: ReadLogOptions;
  /** Progress lines for long runs (the CLI passes io.progress). */
  readonly progress?: (text: string) => void;
  /**
   * Check the logs against the vehicle's kinematics before fitting (default true): a channel off by a
   * factor (km/h read as m/s, a steering-wheel angle as road-wheel) is `identify.channelScale`.
   */
  readonly checkChannels?: boolean;
}

/**
 * The single entry point of identification: read the vehicle and the logs, find the
 * steps, fit each (FOPDT, second order with and without zero, BIC choice, quality gate),
 * combine per speed (inverse-variance), identify the actuator where the steer angle is
 * logged, fit the joint single-track model, and return the models file (not written).
 * Deterministic: same inputs and options → identical result.
 * Throws `identify.noSteps` when no step is found and `identify.tooFewSpeeds` when fewer
 * than two speeds have a usable step, listing the dropped steps and why.
 */
export function identifyFromLogs(input: IdentifyFromLogsInput): ModelsFile {
  const options: IdentifyOptions = { ...IDENTIFY_DEFAULTS, ...input.options };
  const progress = input.progress ?? (() => {});
  const vehicleFile = resolveVehiclePath(input.vehicle);
  const vehicle = loadVehicle(vehicleFile);

  const inputs = canonicalLogOrder(expandLogPaths(input.logPaths));
  const logPaths = inputs.map((entry) => entry.file);
  const { steps, rejected, channels } = readSteps(logPaths, vehicle, { readOptions: input.readOptions, maxHold_s: options.maxHold_s });
  if (steps.length === 0) {
    throw new SpeedbandError(
      'identify.noSteps',
      `no step-steer event was found in ${logPaths.length} log(s)${describeRejected(rejected)} — log open-loop steps held until the yaw rate settles`,
      {
        location: { file: logPaths[0] },
        details: { rejected: rejected.length },
      },
    );
  }

  if (input.checkChannels !== false) {
    const wheelbase_m = vehicle.cgToFrontAxle_m + vehicle.cgToRearAxle_m;
    requireConsistentChannels(channelObservations(steps, wheelbase_m), channels, { wheelbase_m, steeringRatio: vehicle.steeringRatio }, logPaths.length);
  }

  const identified: StepIdentification[] = [];
  steps.forEach((step, i) => {
    if (i % 10 === 0) progress(`identify: fitting step ${i + 1} of ${steps.length}\n`);
    identified.push(identifyStep(step, options));
  });
  const used = identified.filter((s) => s.refusal === null);
  const refused = identified.filter((s) => s.refusal !== null);
  const groups = groupBySpeed(used, options.speedTolerance_mps, options.speedToleranceFraction);
  if (groups.length < 2) {
    const dropped = refused.map((s) => `${s.file} step ${s.stepIndex} at ${s.speed_mps.toFixed(2)} m/s: ${s.refusal?.reason}`);
    throw new SpeedbandError(
      'identify.tooFewSpeeds',
      `usable steps were found at ${groups.length} speed(s) (${groups.map((g) => `${g[0].speed_mps.toFixed(2)} m/s`).join(', ') || 'none'}); ` +
        `a speed schedule needs at least two — log steps at more speeds${dropped.length > 0 ? `. Dropped steps:\n  ${dropped.join('\n  ')}` : ''}${describeRejected(rejected)}`,
      { location: { file: logPaths[0] }, details: { speeds: groups.length, refused: refused.length, rejected: rejected.length } },
    );
  }
  const speeds = groups.map((g) => aggregateSpeed(g, options));
  progress('identify: steering actuator\n');
  const actuator = identifyActuator(steps, options.hold);
  const usedSteps = steps.filter((_, i) => identified[i].refusal === null);
  let singleTrack: SingleTrackRecord | null = null;
  let singleTrackRefusal: { reasonCode: string; reason: string } | null = null;
  const warnings = speeds.flatMap((s) => s.warnings);
  if (options.jointFit) {
    progress('identify: joint single-track fit\n');
    const joint = fitSingleTrack({ vehicle, steps: usedSteps, speeds, actuator, mismatchWarning_pct: options.jointMismatchWarning_pct });
    if ('reasonCode' in joint) {
      singleTrackRefusal = joint;
    } else {
      warnings.push(...joint.warnings);
      singleTrack = singleTrackRecord(joint);
    }
  } else {
    singleTrackRefusal = { reasonCode: 'notRequested', reason: 'the joint single-track fit was switched off' };
  }
  const byStep = (a: StepIdentification, b: StepIdentification): number => a.file.localeCompare(b.file) || a.stepIndex - b.stepIndex;
  return {
    format: MODELS_FORMAT,
    formatVersion: MODELS_FORMAT_VERSION,
    tool: { name: 'speedband', version: VERSION },
    vehicle: { name: vehicle.name, file: vehicleFile, sha256: sha256Hex(readFileSync(vehicleFile)) },
    inputs,
    options: { ...options },
    criterion: 'BIC',
    tests: [...used].sort(byStep).map(testRecord),
    refusedTests: [...refused].sort(byStep).map(refusedTestRecord),
    rejectedSteps: rejected.map((r) => ({ file: r.file, onset_s: r.onset_s, reasonCode: r.reasonCode, reason: r.reason })),
    speeds: speeds.map(speedRecord),
    actuator: actuator === null ? null : actuatorRecord(actuator),
    singleTrack,
    singleTrackRefusal,
    warnings,
  };
}

/** Every log read and searched for steps (each truncated to maxHold_s), in the order given; the channels are the first log's. */
function readSteps(
  logPaths: readonly string[],
  vehicle: Vehicle,
  reading: { readonly readOptions: ReadLogOptions | undefined; readonly maxHold_s: number },
): { steps: StepTest[]; rejected: RejectedStep[]; channels: readonly LogChannelSource[] } {
  const steps: StepTest[] = [];
  const rejected: RejectedStep[] = [];
  let channels: readonly LogChannelSource[] = [];
  for (const file of logPaths) {
    const log = readSteerLog(file, { steeringRatio: vehicle.steeringRatio, ...reading.readOptions });
    if (channels.length === 0) channels = log.channels ?? [];
    const search = findStepTests(log, { maxSteerAngle_rad: vehicle.maxSteerAngle_rad });
    steps.push(...search.steps.map((step) => truncateStep(step, reading.maxHold_s)));
    rejected.push(...search.rejected);
  }
  return { steps, rejected, channels };
}

/** The joint single-track fit as the models file records it. */
function singleTrackRecord(joint: SingleTrackFit): SingleTrackRecord {
  return {
    frontCorneringStiffness_NPerRad: joint.parameters.frontCorneringStiffness_NPerRad,
    rearCorneringStiffness_NPerRad: joint.parameters.rearCorneringStiffness_NPerRad,
    actuatorLag_s: joint.parameters.actuatorLag_s,
    actuatorDelay_s: joint.parameters.actuatorDelay_s,
    understeerGradient_radPerMps2: joint.understeerGradient_radPerMps2,
    ci95: joint.ci95,
    characteristicSpeed_mps: joint.characteristicSpeed_mps,
    criticalSpeed_mps: joint.criticalSpeed_mps,
    r2: joint.r2,
    rmse: joint.rmse,
    stepCount: joint.stepCount,
    stopReason: joint.stopReason,
    comparison: joint.comparison,
  };
}

/** The identified actuator as the models file records it. */
function actuatorRecord(actuator: ActuatorIdentification): NonNullable<ModelsFile['actuator']> {
  return {
    gain: actuator.gain.value,
    lag_s: actuator.lag_s.value,
    delay_s: actuator.delay_s.value,
    ci95: { gain: actuator.gain.ci95, lag_s: actuator.lag_s.ci95, delay_s: actuator.delay_s.ci95 },
    stepCount: actuator.stepCount,
  };
}

/** Paths as given, with each folder replaced by the .csv files in it, sorted by name; throws `identify.noLogs` when none remain. */
export function expandLogPaths(paths: readonly string[]): string[] {
  const files: string[] = [];
  for (const path of paths) {
    let isFolder = false;
    try {
      isFolder = statSync(path).isDirectory();
    } catch {
      isFolder = false; // a missing file is reported by the log reader, with its name
    }
    if (isFolder) {
      files.push(
        ...readdirSync(path)
          .filter((name) => name.toLowerCase().endsWith('.csv'))
          .sort()
          .map((name) => join(path, name)),
      );
    } else {
      files.push(path);
    }
  }
  if (files.length === 0) {
    throw new SpeedbandError('identify.noLogs', `no CSV log found in ${paths.join(', ') || '(no path given)'} — give log files or folders holding .csv logs`, {
      ...(paths[0] === undefined ? {} : { location: { file: paths[0] } }),
    });
  }
  return files;
}

/**
 * The logs in a canonical order — by the SHA-256 of their content, then by path — so that the same set
 * of logs given in any order identifies the same models, bit for bit (the fits add up floating-point
 * numbers in log order). The same content given twice (a file named twice, or a copy) would count its
 * steps twice: refused with `identify.duplicateLog`, naming both paths.
 */
export function canonicalLogOrder(paths: readonly string[]): { file: string; sha256: string }[] {
  const hashed = paths.map((file) => ({ file, sha256: sha256Hex(readFileBytes(file)) }));
  hashed.sort((a, b) => (a.sha256 < b.sha256 ? -1 : a.sha256 > b.sha256 ? 1 : a.file < b.file ? -1 : a.file > b.file ? 1 : 0));
  for (let k = 1; k < hashed.length; k += 1) {
    if (hashed[k].sha256 !== hashed[k - 1].sha256) continue;
    const [first, second] = [hashed[k - 1].file, hashed[k].file];
    throw new SpeedbandError(
      'identify.duplicateLog',
      `${first} and ${second} have the same content (SHA-256 ${hashed[k].sha256.slice(0, 16)}…)${first === second ? ': the same file was given twice' : ''} — ` +
        'a log given twice counts its steps twice and changes the schedule; give each log once',
      { location: { file: second }, details: { files: [first, second], sha256: hashed[k].sha256 } },
    );
  }
  return hashed;
}

function describeRejected(rejected: readonly RejectedStep[]): string {
  if (rejected.length === 0) return '';
  const shown = rejected.slice(0, 10).map((r) => `${r.file} at ${r.onset_s.toFixed(2)} s: ${r.reason}`);
  return `. Candidates rejected by segmentation (${rejected.length}):\n  ${shown.join('\n  ')}${rejected.length > 10 ? '\n  …' : ''}`;
}
