import { SpeedbandError } from '../../core/errors.js';
import type { Argv } from 'yargs';
import { defineCommand, type OptionsOf } from '../command.js';
import { EXIT, type CommandIo } from '../io.js';
import { withLogColumnOptions } from '../log-columns.js';
import { SAFETY_EPILOGUE } from '../../core/safety.js';

function builder(yargs: Argv) {
  return withLogColumnOptions(yargs)
    .usage(
      [
        'speedband simulate SCHEDULE --vehicle V [--models M | --logs LOG… | --nominal] [--scenario NAME…] [--speed-mps V…] [--out traces.csv]',
        '',
        'Scenarios (default: every one that applies to the loop, at low, middle and top speed):',
        '  small-step: a reference step meant to stay in the linear range',
        '  large-step: a reference step through the steering limits (heading 0.2 rad, path 1 m)',
        '  initial-offset: start 0.5 m beside the path (path loop) or 0.05 rad off its heading (heading loop)',
        '  misalignment: a constant 0.01 rad road-wheel misalignment',
        '  side-force: a lateral force step of 5 % of the weight at the centre of gravity (crosswind-like)',
        '  lane-change, curve-entry: path manoeuvres with the feed-forward on',
        '  speed-ramp-in-curve, braking-in-curve: 1 m/s² up and 2 m/s² down through the whole range (run once)',
        '',
        'Figures per run: peak and final error (loop unit), overshoot, settling time and distance (to 2 % of a step, or 5 % of the peak error), peak steering angle and rate, time at each limit, peak lateral acceleration, and any sustained oscillation (limit cycle) in the last 40 % of the run.',
        '',
        'Model: the one the schedule records (default), --models/--logs (the joint single-track fit) or --nominal. Exact at the samples at constant speed; where the speed changes, fourth-order Runge-Kutta with its step halved until no figure moves by 0.1 %. Exit 0 done, 2 bad input.',
      ].join('\n'),
    )
    .positional('schedule', { type: 'string', demandOption: true, describe: 'schedule.json written by speedband build' })
    .option('vehicle', {
      type: 'string',
      demandOption: true,
      describe: 'Vehicle file (vehicle.json) or its folder: steering limits, and the nominal model for --nominal',
    })
    .option('models', { type: 'string', describe: 'Simulate on this identification (models.json)' })
    .option('logs', { type: 'array', string: true, describe: 'Simulate on a fresh identification from these step-test logs' })
    .option('nominal', { type: 'boolean', default: false, describe: "Simulate on the vehicle file's nominal cornering stiffnesses and actuator" })
    .option('scenario', { type: 'array', string: true, describe: 'Scenario names (see above); default all that apply' })
    .option('speed-mps', {
      type: 'array',
      number: true,
      describe: "Speeds for the per-speed scenarios, m/s; default: low, middle and top of the schedule's range",
    })
    .option('lane-change-width-m', { type: 'number', describe: 'Lane change: sideways distance, m (default 3.5)' })
    .option('lane-change-length-m', { type: 'number', describe: 'Lane change: distance travelled while changing lane, m (default max(4 s of travel, 20 m))' })
    .option('acceleration-mps2', {
      type: 'number',
      describe:
        "speed-ramp-in-curve: acceleration through the range, m/s² (default: the schedule's plan, check.rampAcceleration_mps2 — the vehicle file's serviceAcceleration_mps2, else 1)",
    })
    .option('deceleration-mps2', {
      type: 'number',
      describe:
        "braking-in-curve: deceleration through the range, m/s² (default: the schedule's plan, check.brakingDeceleration_mps2 — the vehicle file's serviceDeceleration_mps2, else 2)",
    })
    .option('out', {
      type: 'string',
      describe: "Write the traces as CSV (time_s, speed_mps, reference/measurement/error in the loop's unit, command_rad, steerAngle_rad, …)",
    })
    .option('force', { type: 'boolean', default: false, describe: 'Replace an existing --out file whose content differs' })
    .option('json', { type: 'boolean', default: false, describe: 'Print the metrics as JSON' });
}

type Args = OptionsOf<typeof builder>;

/**
 * `speedband simulate`: drive a schedule through the scenarios of a test day as the firmware runs it
 * (src/pipeline/simulate-schedule.ts) and print what each run shows; the traces go to --out as CSV.
 */
async function run(args: Args, io: CommandIo): Promise<number> {
  const schedulePath = args.schedule;
  const out = args.out;
  const { checkOutputPaths } = await import('../../core/output-paths.js');
  const { resolveVehiclePath, loadVehicle } = await import('../../vehicle/load.js');
  const { SCENARIO_NAMES, SCENARIO_DESCRIPTIONS } = await import('../../performance/scenario-catalogue.js');
  if (out !== undefined) {
    const { modelInputPaths } = await import('../check-model-args.js');
    checkOutputPaths([{ path: out, option: '--out' }], [{ path: schedulePath, role: 'schedule' }, ...(await modelInputPaths(args))]);
  }
  const names = args.scenario ?? [];
  for (const name of names) {
    if (!(SCENARIO_NAMES as readonly string[]).includes(name)) {
      const { closestName } = await import('../../core/closest-name.js');
      const near = closestName(name, SCENARIO_NAMES);
      throw new SpeedbandError(
        'cli.invalidOption',
        `--scenario ${name} is not a scenario speedband knows${near === null ? '' : ` — did you mean ${near}?`} Give one or more of: ${SCENARIO_NAMES.join(', ')}`,
      );
    }
  }
  const speeds = args['speed-mps'] ?? [];
  for (const speed of speeds) {
    if (!(Number.isFinite(speed) && speed > 0))
      throw new SpeedbandError('cli.invalidOption', `--speed-mps ${String(speed)} is not a forward speed — give speeds above 0 m/s`);
  }
  const sizes: Record<string, number> = {};
  for (const [option, field] of [
    ['lane-change-width-m', 'laneChangeWidth_m'],
    ['lane-change-length-m', 'laneChangeLength_m'],
    ['acceleration-mps2', 'acceleration_mps2'],
    ['deceleration-mps2', 'deceleration_mps2'],
  ] as const) {
    const value = args[option];
    if (value === undefined) continue;
    if (!(Number.isFinite(value) && value > 0)) throw new SpeedbandError('cli.invalidOption', `--${option} is ${String(value)} — give a positive number`);
    sizes[field] = value;
  }
  const { readSchedule } = await import('../../schedule/schedule-file.js');
  const { simulateSchedule, scenarioSpeeds, scenarioParameters, scheduleSpeedChanges } = await import('../../pipeline/simulate-schedule.js');
  const { checkModelFromArgs } = await import('../check-model-args.js');
  const schedule = readSchedule(schedulePath);
  const vehicle = loadVehicle(resolveVehiclePath(args.vehicle));
  const notes: string[] = [];
  let model = null;
  if (args.nominal !== true) {
    const found = await checkModelFromArgs(args, schedule, schedulePath, io);
    model = found.model;
    notes.push(...found.notes.filter((note) => !note.startsWith('note: checking on the model recorded')));
    if (model.summary.kind !== 'single-track')
      notes.push(
        "note: the model is a set of per-speed yaw-rate models; the scenarios need the single-track model — simulating on the vehicle file's nominal values",
      );
  }
  const { parameters, description } = scenarioParameters(model, vehicle);
  const scenarios = names.length > 0 ? (names as (typeof SCENARIO_NAMES)[number][]) : SCENARIO_NAMES;
  const runs = simulateSchedule({
    schedule,
    parameters,
    steeringLimits: { maxSteerAngle_rad: vehicle.maxSteerAngle_rad, maxSteerRate_radps: vehicle.maxSteerRate_radps },
    scenarios,
    speeds: speeds.length > 0 ? speeds : scenarioSpeeds(schedule, { withBreakpoints: false }),
    // The speed changes the schedule was judged at (its plan), unless given here.
    sizes: { ...scheduleSpeedChanges(schedule), ...sizes },
  });
  let outcome: string | null = null;
  if (out !== undefined) {
    const { tracesCsv } = await import('../../performance/traces-csv.js');
    const { writeFileAtomic } = await import('../../core/files.js');
    outcome = writeFileAtomic(
      out,
      tracesCsv(
        schedule.loop.kind,
        runs.map((r) => ({ scenario: r.scenario.name, startSpeed_mps: r.speed_mps, traces: r.traces })),
      ),
      { force: args.force },
    );
  }
  const unconverged = runs.filter((r) => !r.converged);
  if (args.json) {
    io.stdout(
      `${JSON.stringify(
        {
          schedule: schedulePath,
          loop: schedule.loop.kind,
          model: description,
          traces: out ?? null,
          runs: runs.map((r) => ({
            scenario: r.scenario.name,
            speed_mps: r.speed_mps,
            integrator: { ...r.traces.integrator, converged: r.converged },
            ...r.metrics,
          })),
          notes,
        },
        null,
        2,
      )}\n`,
    );
    return EXIT.ok;
  }
  const { scenarioTable } = await import('../../pipeline/scenario-report.js');
  let text = `${schedulePath}: ${schedule.loop.kind} loop, model: ${description}\n${notes.map((note) => `${note}\n`).join('')}`;
  text += `${scenarioTable(schedule.loop.kind, runs).join('\n')}\n`;
  for (const name of new Set(runs.map((r) => r.scenario.name))) text += `  ${name}: ${SCENARIO_DESCRIPTIONS[name]}\n`;
  if (unconverged.length > 0)
    text += `note: halving the Runge–Kutta step still moved a metric by more than 0.1 % in ${unconverged.map((r) => r.scenario.name).join(', ')}\n`;
  if (out !== undefined) text += `${outcome === 'written' ? 'Wrote' : 'Unchanged'} ${out}: ${runs.length} runs, one row per controller sample\n`;
  text += `${SAFETY_EPILOGUE}\n`;
  io.stdout(text);
  return EXIT.ok;
}

export const command = defineCommand({
  command: 'simulate <schedule>',
  describe:
    "Drive a schedule through the manoeuvres of a test day as the firmware runs it — lookup, 2-DOF PID with anti-windup and feed-forward, latency, the actuator's delay, lag, rate and angle limits, the single-track vehicle at the speed of the moment — and print what each run shows (errors, overshoot, settling, steering at its limits, lateral acceleration, sustained oscillation). Exit 0 done, 2 bad input",
  exitCodes: [
    [0, 'every run was simulated and its figures printed (the figures are judged by build and check, not here)'],
    [2, 'bad input: unreadable or edited schedule, vehicle, models or logs, an unknown scenario, a bad speed or size, an output path'],
  ],
  builder,
  examples: [
    [
      'speedband simulate schedule.json --vehicle vehicles/parcel-van --out traces.csv',
      'Every scenario at low, middle and top speed, on the model the schedule records',
    ],
    ['speedband simulate schedule.json --vehicle van.json --scenario large-step --speed-mps 3 6', 'One scenario at two speeds'],
    [
      'speedband simulate schedule.json --vehicle van-after-change.json --nominal --scenario braking-in-curve',
      'The schedule on a changed vehicle, braking through the range',
    ],
    [
      'speedband simulate schedule.json --vehicle van.json --scenario lane-change --lane-change-width-m 3 --lane-change-length-m 40 --speed-mps 10',
      'Your own lane change',
    ],
  ],
  run,
});
