import { SpeedbandError } from '../../core/errors.js';
import type { CommandModule } from '../command.js';
import { EXIT, type CommandIo } from '../io.js';
import { checkModelFromArgs } from '../check-model-args.js';
import { withLogColumnOptions } from '../log-columns.js';

/**
 * `speedband check`: re-verify a schedule independently of how it was made — schema and
 * checksum (a hand edit is caught), then the dense check of its own gains, lookup, loop and
 * controller on a vehicle model: identified afresh from logs, read from models.json, or the
 * model the schedule records.
 */
/** Most check speeds (bounded work: a fraction of a millisecond each, 20,000 speeds in seconds); the same bound as a plan's check.gridSpeeds. */
const MAX_GRID_SPEEDS = 100_000;

async function run(args: Record<string, unknown>, io: CommandIo): Promise<number> {
  const { readSchedule } = await import('../../schedule/schedule-file.js');
  const { recheckSchedule } = await import('../../build/recheck-schedule.js');
  const { formatRecheck } = await import('../../build/schedule-report.js');
  const { formatScenarioCheck } = await import('../../build/scenario-report.js');
  const schedulePath = String(args.schedule);
  const schedule = readSchedule(schedulePath);
  const { model, notes } = await checkModelFromArgs(args, schedule, schedulePath, io);
  const gridSpeeds = args['grid-speeds'] === undefined ? undefined : Number(args['grid-speeds']);
  if (gridSpeeds !== undefined && !(Number.isInteger(gridSpeeds) && gridSpeeds >= 2 && gridSpeeds <= MAX_GRID_SPEEDS)) {
    throw new SpeedbandError('cli.invalidOption', `--grid-speeds is ${String(args['grid-speeds'])} — give a whole number of speeds from 2 to ${MAX_GRID_SPEEDS}`);
  }
  const result = recheckSchedule({ schedule, model, ...(gridSpeeds === undefined ? {} : { gridSpeeds }) });
  const scenarios = await checkScenarios(args, schedule, model);
  const passed = result.passed && (scenarios.check?.passed ?? true);
  notes.push(...scenarios.notes);

  if (args.json === true) {
    io.stdout(
      `${JSON.stringify(
        {
          file: schedulePath,
          checksum: 'verified',
          passed,
          model: { kind: model.kind, description: model.description },
          gridSize: result.points.length,
          failedSpeeds: result.failedCount,
          worst: result.worst,
          failing: result.points.filter((p) => p.failures.length > 0).map((p) => ({ speed_mps: p.speed_mps, failures: p.failures.map((f) => f.message) })),
          scenarios: scenarios.check,
          notes,
        },
        null,
        2,
      )}\n`,
    );
  } else {
    io.stdout(
      `${schedulePath}: schema valid, checksum ${schedule.checksum.value.slice(0, 16)}… verified\n` +
        notes.map((note) => `${note}\n`).join('') +
        formatRecheck(`model: ${model.description}`, result, schedule, model.kind) +
        (scenarios.check === null ? '' : formatScenarioCheck(scenarios.check, schedule.loop.kind)),
    );
  }
  return passed ? EXIT.ok : EXIT.failed;
}

/** The schedule's scenarios on the check model, with the limits the schedule records (none when it records none). */
async function checkScenarios(
  args: Record<string, unknown>,
  schedule: import('../../schedule/schedule-types.js').ScheduleFile,
  model: import('../../build/check-model.js').CheckModel,
): Promise<{ check: import('../../schedule/schedule-types.js').ScheduleScenarioCheck | null; notes: string[] }> {
  const recorded = schedule.check.scenarios;
  if (recorded === undefined) return { check: null, notes: [] };
  if (model.summary.kind !== 'single-track') return { check: null, notes: ['note: the scenarios need the single-track model; not run on per-speed yaw-rate models'] };
  const { loadVehicle, resolveVehiclePath } = await import('../../vehicle/load.js');
  const { judgeScheduleScenarios, scenarioParameters } = await import('../../build/simulate-schedule.js');
  const vehicle = loadVehicle(resolveVehiclePath(String(args.vehicle)));
  const { parameters, description } = scenarioParameters(model, vehicle);
  const check = judgeScheduleScenarios({
    schedule,
    parameters,
    steeringLimits: { maxSteerAngle_rad: vehicle.maxSteerAngle_rad, maxSteerRate_radps: vehicle.maxSteerRate_radps },
    limits: recorded.limits,
    model: description,
  });
  return { check, notes: [] };
}

export const command: CommandModule = {
  command: 'check <schedule>',
  describe: 'Re-verify a schedule.json: schema, checksum (hand edits are refused), stability margins of its own gains at every speed of its range, and (when the schedule records them) its scenarios driven as firmware runs them (see speedband simulate). Exit 0 passed, 1 failed, 2 bad input',
  builder: (yargs) =>
    withLogColumnOptions(yargs)
      .positional('schedule', { type: 'string', describe: 'schedule.json written by speedband build' })
      .option('vehicle', { type: 'string', demandOption: true, describe: 'Vehicle file (vehicle.json) or its folder: mass, inertia and geometry' })
      .option('models', { type: 'string', describe: 'Check on this identification (models.json)' })
      .option('logs', { type: 'array', string: true, describe: 'Check on a fresh identification from these step-test logs' })
      .option('grid-speeds', { type: 'number', describe: 'Evenly spaced check speeds across the range (breakpoints and midpoints are added); default: the schedule\'s own' })
      .option('json', { type: 'boolean', default: false, describe: 'Print the result as JSON' }),
  examples: [
    ['speedband check schedule.json --vehicle vehicles/parcel-van', 'On the model recorded in the schedule'],
    ['speedband check schedule.json --vehicle van.json --logs todays-logs/*.csv', 'On a fresh identification from new logs'],
    ['speedband check schedule.json --vehicle van.json --models models.json --grid-speeds 2000', 'A denser check'],
  ],
  run,
};
