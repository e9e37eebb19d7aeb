import { SpeedbandError } from '../core/errors.js';
import { quoted } from '../core/quote.js';
import type { CheckModel } from '../pipeline/check-model.js';
import type { ScheduleFile } from '../schedule/schedule-types.js';
import type { CommandIo } from './io.js';
import { logColumnsFromArgs, optionalInputs, type LogColumnArgs } from './log-columns.js';

/** The model options check, reverify and simulate share, as yargs gives them. */
export interface ModelArgs extends LogColumnArgs {
  readonly vehicle: string;
  readonly logs?: readonly string[];
  readonly models?: string;
}

/**
 * The vehicle model `check` and `reverify` run the dense check on: a fresh identification from --logs,
 * a models file (--models), or the model the schedule records — with notes on what was used and on a
 * vehicle file that differs from the one the schedule was built with.
 */
export async function checkModelFromArgs(
  args: ModelArgs,
  schedule: ScheduleFile,
  schedulePath: string,
  io: CommandIo,
): Promise<{ model: CheckModel; notes: string[]; recorded: boolean }> {
  const { loadVehicle, resolveVehiclePath } = await import('../vehicle/load.js');
  const { checkModelFromModels } = await import('../pipeline/check-model.js');
  const { recordedCheckModel } = await import('../pipeline/recheck-schedule.js');
  const { sha256Hex, readFileBytes } = await import('../core/files.js');
  const vehicleFile = resolveVehiclePath(args.vehicle);
  const vehicle = loadVehicle(vehicleFile);
  const notes: string[] = [];
  if (sha256Hex(readFileBytes(vehicleFile)) !== schedule.vehicle.sha256) {
    notes.push(
      `note: ${vehicleFile} differs from the vehicle file the schedule was built with (${quoted(schedule.vehicle.file)}) — checking against the file given`,
    );
  }
  if (vehicle.name !== schedule.vehicle.name) {
    notes.push(`note: the schedule was built for vehicle ${quoted(schedule.vehicle.name)}, the vehicle file given is ${quoted(vehicle.name)}`);
  }
  const logPaths = args.logs ?? [];
  const modelsPath = args.models;
  if (logPaths.length > 0 && modelsPath !== undefined) {
    throw new SpeedbandError('cli.conflictingOptions', '--logs and --models both give the vehicle model — use one');
  }
  if (modelsPath !== undefined || logPaths.length > 0) {
    const columns = await logColumnsFromArgs(args);
    const models =
      modelsPath !== undefined
        ? (await import('../identify/models-file.js')).readModels(modelsPath)
        : (await import('../identify/identify-from-logs.js')).identifyFromLogs({
            vehicle: vehicleFile,
            logPaths,
            progress: io.progress,
            ...(columns === undefined ? {} : { readOptions: { columns } }),
          });
    return { model: checkModelFromModels(models, vehicle, schedule.check.model.kind), notes, recorded: false };
  }
  const model = recordedCheckModel(schedule);
  if (model === null) {
    throw new SpeedbandError(
      'check.noModel',
      'the schedule records no vehicle model speedband can rebuild — give the model with --models models.json or --logs FILE…',
      { location: { file: schedulePath, jsonPath: '/provenance/model' } },
    );
  }
  notes.push('note: checking on the model recorded in the schedule; give --logs or --models to check on fresh data');
  return { model, notes, recorded: true };
}

/** The input files of the model options (--vehicle, --logs, --models, --log-profile), for the output-path check. */
export async function modelInputPaths(args: ModelArgs): Promise<{ path: string; role: string }[]> {
  const { resolveVehiclePath } = await import('../vehicle/load.js');
  const { expandLogPaths } = await import('../identify/identify-from-logs.js');
  const logPaths = args.logs ?? [];
  return [
    { path: resolveVehiclePath(args.vehicle), role: 'vehicle file' },
    ...(logPaths.length === 0 ? [] : expandLogPaths(logPaths)).map((path) => ({ path, role: 'log' })),
    ...optionalInputs(args, [
      ['models', 'models file'],
      ['log-profile', 'log profile'],
    ]),
  ];
}
