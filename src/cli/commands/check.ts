import { SpeedbandError } from '../../core/errors.js';
import type { Argv } from 'yargs';
import { defineCommand, type OptionsOf } from '../command.js';
import { EXIT, type CommandIo } from '../io.js';
import { checkModelFromArgs } from '../check-model-args.js';
import { withLogColumnOptions } from '../log-columns.js';
import type { ScheduleFile } from '../../schedule/schedule-types.js';
import type { ScheduleVariations } from '../../schedule/schedule-variations.js';
import type { DenseCheckResult } from '../../schedule/types.js';

/**
 * `speedband check`: re-verify a schedule independently of how it was made — schema and
 * checksum (a hand edit is caught), then the dense check of its own gains, lookup, loop and
 * controller on a vehicle model: identified afresh from logs, read from models.json, or the
 * model the schedule records — and, when it records variations, their worst case on that model.
 */
/** Most check speeds (bounded work: a fraction of a millisecond each, 20,000 speeds in seconds); the same bound as a plan's check.gridSpeeds. */
const MAX_GRID_SPEEDS = 100_000;

function builder(yargs: Argv) {
  return withLogColumnOptions(yargs)
    .positional('schedule', { type: 'string', demandOption: true, describe: 'schedule.json written by speedband build' })
    .option('vehicle', { type: 'string', demandOption: true, describe: 'Vehicle file (vehicle.json) or its folder: mass, inertia and geometry' })
    .option('models', { type: 'string', describe: 'Check on this identification (models.json)' })
    .option('logs', { type: 'array', string: true, describe: 'Check on a fresh identification from these step-test logs' })
    .option('grid-speeds', {
      type: 'number',
      describe:
        "Evenly spaced check speeds across the range (breakpoints and midpoints are added); default: the schedule's own. The worst case over the variations always runs on the schedule's own grid",
    })
    .option('nominal-only', {
      type: 'boolean',
      default: false,
      describe:
        'Skip the worst case over the variations the schedule records (it takes about a hundred loop analyses per speed); the exit code then speaks of the nominal check only',
    })
    .option('json', { type: 'boolean', default: false, describe: 'Print the result as JSON' });
}

type Args = OptionsOf<typeof builder>;

async function run(args: Args, io: CommandIo): Promise<number> {
  const { readSchedule } = await import('../../schedule/schedule-file.js');
  const { recheckScheduleOnAllCores } = await import('../../pipeline/recheck-schedule.js');
  const { formatRecheck } = await import('../../pipeline/schedule-report.js');
  const { formatScenarioCheck } = await import('../../pipeline/scenario-report.js');
  const { scheduleSpeedChanges } = await import('../../pipeline/simulate-schedule.js');
  const schedulePath = args.schedule;
  const schedule = readSchedule(schedulePath);
  const { model, notes } = await checkModelFromArgs(args, schedule, schedulePath, io);
  const gridSpeeds = args['grid-speeds'];
  if (gridSpeeds !== undefined && !(Number.isInteger(gridSpeeds) && gridSpeeds >= 2 && gridSpeeds <= MAX_GRID_SPEEDS)) {
    throw new SpeedbandError('cli.invalidOption', `--grid-speeds is ${String(gridSpeeds)} — give a whole number of speeds from 2 to ${MAX_GRID_SPEEDS}`);
  }
  const result = await recheckScheduleOnAllCores({ schedule, model, ...(gridSpeeds === undefined ? {} : { gridSpeeds }) });
  // The worst case over the variations the schedule records, on its own grid (it costs ~100 analyses a speed).
  const robust =
    schedule.variations === undefined || args['nominal-only']
      ? null
      : await (await import('../../pipeline/robust-recheck.js')).recheckOverVariations({
          schedule,
          model,
          onProgress: (event) => event.done === event.total && io.progress(`worst case over the variations: ${event.total} speeds\n`),
        });
  const { acceptancePassed } = await import('../../schedule/schedule-variations.js');
  const scenarios = await checkScenarios(args, schedule, model);
  notes.push(...scenarios.notes);
  const passed = acceptancePassed(result, robust?.record) && (scenarios.check?.passed ?? true);

  if (args.json) {
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
          failures: (await import('../../schedule/dense-check.js')).failingSpeeds(result.points),
          overallPassed: passed,
          variations: robust?.record ?? null,
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
        (scenarios.check === null ? '' : formatScenarioCheck(scenarios.check, schedule.loop.kind, scheduleSpeedChanges(schedule))) +
        (robust === null
          ? schedule.variations === undefined
            ? ''
            : '\nWorst case over the variations: not checked (--nominal-only)\n'
          : `\n${await robustText(robust.record, result, schedule)}`) +
        (schedule.variations === undefined
          ? ''
          : `\n${passed ? 'PASSED' : 'FAILED'} (${robust === null ? 'nominal check only' : `${schedule.variations.acceptance} acceptance`})\n`),
    );
  }
  return passed ? EXIT.ok : EXIT.failed;
}

/** The worst-case report beside this check's nominal margins at the breakpoints. */
async function robustText(record: ScheduleVariations, result: DenseCheckResult, schedule: ScheduleFile): Promise<string> {
  const { formatVariations, nominalAtBreakpoints } = await import('../../pipeline/robust-report.js');
  return formatVariations(
    record,
    nominalAtBreakpoints(
      result,
      schedule.breakpoints.map((row) => row.speed_mps),
    ),
    schedule.check.thresholds,
  );
}

/** The schedule's scenarios on the check model, with the limits the schedule records (none when it records none). */
async function checkScenarios(
  args: Args,
  schedule: import('../../schedule/schedule-types.js').ScheduleFile,
  model: import('../../pipeline/check-model.js').CheckModel,
): Promise<{ check: import('../../schedule/schedule-types.js').ScheduleScenarioCheck | null; notes: string[] }> {
  const recorded = schedule.check.scenarios;
  if (recorded === undefined) return { check: null, notes: [] };
  if (model.summary.kind !== 'single-track')
    return { check: null, notes: ['note: the scenarios need the single-track model; not run on per-speed yaw-rate models'] };
  const { loadVehicle, resolveVehiclePath } = await import('../../vehicle/load.js');
  const { judgeScheduleScenarios, scenarioParameters, scheduleSpeedChanges } = await import('../../pipeline/simulate-schedule.js');
  const vehicle = loadVehicle(resolveVehiclePath(args.vehicle));
  const { parameters, description } = scenarioParameters(model, vehicle);
  const check = judgeScheduleScenarios({
    schedule,
    parameters,
    steeringLimits: { maxSteerAngle_rad: vehicle.maxSteerAngle_rad, maxSteerRate_radps: vehicle.maxSteerRate_radps },
    limits: recorded.limits,
    model: description,
    sizes: scheduleSpeedChanges(schedule),
  });
  return { check, notes: [] };
}

export const command = defineCommand({
  command: 'check <schedule>',
  describe:
    'Re-verify a schedule.json: schema, checksum (hand edits are refused), stability margins of its own gains at every speed of its range, and (when the schedule records them) its scenarios driven as firmware runs them (see speedband simulate). Exit 0 passed, 1 failed, 2 bad input',
  builder,
  exitCodes: [
    [0, "the schedule's gains pass the dense check at every speed (and, when it records variations under robust acceptance, their worst case too)"],
    [1, 'they fail at one or more speeds (listed), on the nominal model or in the worst case over the variations'],
    [2, 'bad input: unreadable, invalid or edited schedule (checksum), vehicle, models or logs'],
  ],
  examples: [
    ['speedband check schedule.json --vehicle vehicles/parcel-van', 'On the model recorded in the schedule'],
    ['speedband check schedule.json --vehicle van.json --logs todays-logs/*.csv', 'On a fresh identification from new logs'],
    ['speedband check schedule.json --vehicle van.json --models models.json --grid-speeds 2000', 'A denser check'],
  ],
  run,
});
