import { READ_DEFAULTS, readSteerLog } from '../../log/read.js';
import { SEGMENT_DEFAULTS } from '../../log/segment.js';
import { inspectLog, type LogInspection } from '../../log/inspect.js';
import { formatInspection, formatInspectionSummary } from '../../log/inspection-text.js';
import { describeError, isSpeedbandError } from '../../core/errors.js';
import { defineCommand } from '../command.js';
import { EXIT } from '../io.js';
import { logColumnsFromArgs, withLogColumnOptions } from '../log-columns.js';

export const command = defineCommand({
  command: 'inspect <logs..>',
  describe: 'Read step-steer test logs: channels, sampling, splits, the steps found with ISO 7401-style metrics, and why a candidate step was rejected',
  builder: (yargs) =>
    withLogColumnOptions(yargs)
      .positional('logs', { type: 'string', array: true, describe: 'CSV log files (header line, then one row per sample)' })
      .option('vehicle', {
        type: 'string',
        describe:
          'Vehicle file (vehicle.json) or a folder holding one: gives the steering ratio for steering-wheel columns and the steer-angle limit for the actuator-limit check',
      })
      .option('steering-ratio', {
        type: 'number',
        describe: "Steering-wheel angle per road-wheel angle, for steering-wheel columns (default: the vehicle file's steeringRatio)",
      })
      .option('min-hold-s', { type: 'number', default: SEGMENT_DEFAULTS.minHold_s, describe: 'Shortest hold after a step that is accepted, s' })
      .option('speed-tolerance-mps', {
        type: 'number',
        default: SEGMENT_DEFAULTS.speedToleranceAbsolute_mps,
        describe: `Speed spread (max − min) allowed during a hold, m/s; ${100 * SEGMENT_DEFAULTS.speedToleranceFraction} % of the speed is allowed when larger`,
      })
      .option('gap-factor', {
        type: 'number',
        default: READ_DEFAULTS.gapFactor,
        describe: 'A time step longer than this many median sample periods splits the log',
      })
      .option('json', { type: 'boolean', default: false, describe: 'Print JSON (one object per log, SI units) instead of tables' }),
  epilogue:
    'Metrics (in the spirit of ISO 7401): steady yaw gain = steady yaw-rate change / command change (1/s); ' +
    'response time = 50 % of the steer input to 90 % of the steady yaw rate (s); peak time = 50 % of the steer input to the yaw-rate peak (s); ' +
    'overshoot = (peak − steady)/steady (%).',
  exitCodes: [
    [0, 'every log was read and has a usable step'],
    [1, 'a log has no usable step (the others are still reported)'],
    [2, 'a log cannot be read (the others are still reported)'],
  ],
  examples: [
    ['speedband inspect vehicles/parcel-van/logs/*.csv', 'Every demo log of the parcel van: steps, metrics, rejections'],
    [
      'speedband inspect run7.csv --vehicle vehicles/parcel-van --column steer_cmd_rad=SWA:steering-wheel-deg --column speed_mps=v:km/h',
      'A logger that records the steering-wheel angle in degrees and speed in km/h',
    ],
    ['speedband inspect run7.csv --log-profile logger.json --json', 'Column names and units from a profile file, machine-readable output'],
  ],
  run: async (args, io) => {
    const vehicle = args.vehicle === undefined ? undefined : (await import('../../vehicle/load.js')).loadVehicle(args.vehicle);
    const columns = await logColumnsFromArgs(args);
    const steeringRatio = args['steering-ratio'] ?? vehicle?.steeringRatio;
    const segmentOptions = {
      minHold_s: args['min-hold-s'],
      speedToleranceAbsolute_mps: args['speed-tolerance-mps'],
      ...(vehicle === undefined ? {} : { maxSteerAngle_rad: vehicle.maxSteerAngle_rad }),
    };

    let exitCode: number = EXIT.ok;
    const reports: unknown[] = [];
    const inspections: LogInspection[] = [];
    for (const file of args.logs ?? []) {
      try {
        const log = readSteerLog(file, { columns, steeringRatio, gapFactor: args['gap-factor'] });
        const inspection = inspectLog(log, segmentOptions);
        if (inspection.steps.length === 0 && exitCode === EXIT.ok) exitCode = EXIT.failed;
        inspections.push(inspection);
        if (args.json) reports.push(inspection);
        else io.stdout(`${formatInspection(inspection)}\n`);
      } catch (error) {
        if (!isSpeedbandError(error)) throw error;
        exitCode = EXIT.badInput;
        io.stderr(`speedband: ${describeError(error)}\n`);
        if (args.json) reports.push({ file, error: { code: error.code, message: error.message, location: error.location } });
      }
    }
    if (args.json) io.stdout(`${JSON.stringify(reports, null, 2)}\n`);
    else if (inspections.length > 1) io.stdout(formatInspectionSummary(inspections));
    return exitCode;
  },
});
