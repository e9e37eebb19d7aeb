import { SpeedbandError } from '../../core/errors.js';
import type { BuildSummaryInput, WrittenReport } from '../../pipeline/build-summary.js';
import type { Argv } from 'yargs';
import { defineCommand, type OptionsOf } from '../command.js';
import { EXIT, type CommandIo } from '../io.js';
import { logColumnsFromArgs, optionalInputs, withLogColumnOptions } from '../log-columns.js';

function builder(yargs: Argv) {
  return withLogColumnOptions(yargs)
    .option('vehicle', { type: 'string', demandOption: true, describe: 'Vehicle file (vehicle.json) or its folder' })
    .option('logs', {
      type: 'array',
      string: true,
      describe: 'Step-test logs (CSV, columns time_s, speed_mps, steer_cmd_rad, yaw_rate_radps …) at two or more speeds',
    })
    .option('models', { type: 'string', describe: 'Reuse an identification (models.json from `speedband identify`) instead of --logs' })
    .option('plan', {
      type: 'string',
      describe:
        'Plan file (JSON): loop, rule and parameters, breakpoints, speed range, interpolation, controller, acceptance limits. A rule parameter is a number, a table over speed {"speeds_mps": [...], "values": [...]}, or an expression in speed_mps such as "max(15, 1.2 * speed_mps)" (arithmetic, comparisons, a ? b : c, maths functions; its values at the breakpoints are recorded in the schedule). Default: yaw-rate loop, SIMC with τc = θ, 6 geometric breakpoints over the test speeds, monotone cubic, 100 Hz backward-Euler PID, GM ≥ 6 dB, PM ≥ 45°, Ms ≤ 2. A "variations" section (load, tyres, actuator, latency, the identification\'s intervals) adds the worst case over that set at every check speed, required to pass unless it says "acceptance": "nominal", and a fastest-passing search then aims at it (rule.searchOn; docs/plan.md)',
    })
    .option('out', { type: 'string', demandOption: true, describe: 'schedule.json to write (atomically)' })
    .option('models-out', {
      type: 'string',
      describe:
        'Also write the identification as models.json (FOPDT and joint single-track fits; the per-step second-order fits, which a schedule does not use, are left out: run identify for them)',
    })
    .option('baseline', {
      type: 'string',
      describe:
        "A previous schedule.json: also check ITS gains on the NEW vehicle model (are the current gains still safe after the change, and where not?) — and, when the plan gives variations, over the new vehicle's whole set",
    })
    .option('report', {
      type: 'string',
      describe:
        'Also write the HTML report of the schedule (see speedband report --help): fits over the steps, gains and margins against speed, Bode and Nyquist plots, with --baseline the old gains on the new vehicle. Written with the schedule',
    })
    .option('response-speed-mps', {
      type: 'array',
      string: true,
      describe:
        'With --report: speeds of the Bode and Nyquist plots, m/s (default: the lowest and highest breakpoint and the speed of the smallest phase margin)',
    })
    .option('allow-other-vehicle', {
      type: 'boolean',
      default: false,
      describe:
        "With --models: accept models identified with another vehicle file than --vehicle (refused otherwise: their stiffnesses were fitted with that file's mass, inertia and geometry)",
    })
    .option('allow-failing', {
      type: 'boolean',
      default: false,
      describe: 'Write a schedule that fails its dense check, marked "failed" (export refuses it unless told otherwise)',
    })
    .option('force', { type: 'boolean', default: false, describe: 'Replace existing output files whose content differs' })
    .option('json', { type: 'boolean', default: false, describe: 'Print the result as JSON (breakpoints, margins, derivations, check, baseline)' });
}

type Args = OptionsOf<typeof builder>;

/**
 * `speedband build`: logs + vehicle (+ plan) → identified models → gains per breakpoint →
 * interpolated table → dense check with the discrete controller → refinement → schedule.json.
 * With --baseline, also checks the OLD schedule's gains on the NEW vehicle model.
 */
async function run(args: Args, io: CommandIo): Promise<number> {
  const { buildSchedule } = await import('../../pipeline/build-schedule.js');
  const { writeSchedule, readSchedule } = await import('../../schedule/schedule-file.js');
  const { readModels, writeModels } = await import('../../identify/models-file.js');
  const { buildExitReasons, buildSummaryJson, buildSummaryText } = await import('../../pipeline/build-summary.js');

  const logPaths = args.logs ?? [];
  const modelsIn = args.models;
  if (logPaths.length === 0 && modelsIn === undefined) {
    throw new SpeedbandError('cli.missingInput', 'give the step-test logs with --logs FILE… (or an identification already done with --models models.json)');
  }
  if (logPaths.length > 0 && modelsIn !== undefined) {
    throw new SpeedbandError(
      'cli.conflictingOptions',
      '--logs and --models both give the vehicle model — use one: --logs to identify afresh, --models to reuse models.json',
    );
  }
  const { out, report: reportOut } = args;
  const modelsOut = args['models-out'];
  const { responseSpeedsFromArgs } = await import('./report.js');
  const responseSpeeds_mps = responseSpeedsFromArgs(args);
  // Outputs checked against every input and each other before any work (never replaced, not even with --force).
  const { checkOutputPaths } = await import('../../core/output-paths.js');
  const { resolveVehiclePath, loadVehicle } = await import('../../vehicle/load.js');
  const { expandLogPaths } = await import('../../identify/identify-from-logs.js');
  checkOutputPaths(
    [
      { path: out, option: '--out' },
      ...(modelsOut === undefined ? [] : [{ path: modelsOut, option: '--models-out' }]),
      ...(reportOut === undefined ? [] : [{ path: reportOut, option: '--report' }]),
    ],
    [
      { path: resolveVehiclePath(args.vehicle), role: 'vehicle file' },
      ...(logPaths.length === 0 ? [] : expandLogPaths(logPaths)).map((path) => ({ path, role: 'log' })),
      ...optionalInputs(args, [
        ['models', 'models file'],
        ['plan', 'plan file'],
        ['baseline', 'baseline schedule'],
        ['log-profile', 'log profile'],
      ]),
    ],
  );
  // Read the baseline first: a bad baseline is bad input, found before minutes of work.
  const baselineFile = args.baseline;
  const baselineSchedule = baselineFile === undefined ? undefined : readSchedule(baselineFile);
  const columns = await logColumnsFromArgs(args);
  const result = await buildSchedule({
    vehicle: args.vehicle,
    logPaths,
    ...(columns === undefined ? {} : { readOptions: { columns } }),
    ...(modelsIn === undefined ? {} : { models: readModels(modelsIn) }),
    ...(args.plan === undefined ? {} : { planFile: args.plan }),
    allowOtherVehicle: args['allow-other-vehicle'],
    progress: io.progress,
  });
  const { schedule } = result;
  const written = schedule.status === 'passed' || args['allow-failing'];
  const outcome = written ? writeSchedule(out, schedule, { force: args.force }) : null;
  if (modelsOut !== undefined) writeModels(modelsOut, result.models, { force: args.force });
  const baselineCheck = baselineSchedule === undefined ? undefined : await (await import('../../pipeline/baseline.js')).checkBaseline(baselineSchedule, result);
  const baseline =
    baselineFile === undefined || baselineSchedule === undefined || baselineCheck === undefined
      ? undefined
      : { file: baselineFile, schedule: baselineSchedule, check: baselineCheck };

  // The report goes with the schedule: written when the schedule is.
  let report: WrittenReport | null = null;
  if (reportOut !== undefined && written) {
    const { gatherReportData } = await import('../../report/report-data.js');
    const { writeReport } = await import('../../report/write-report.js');
    const steeringRatio = loadVehicle(resolveVehiclePath(args.vehicle)).steeringRatio;
    const data = gatherReportData({
      // The schedule as written (its fields in file order), so that `report` on the same files gives the same bytes.
      schedule: readSchedule(out),
      scheduleFile: out,
      check: result.refinement.check,
      models: { file: modelsOut ?? modelsIn ?? 'models identified by this build', content: result.models },
      ...(logPaths.length === 0 ? {} : { logs: { paths: logPaths, readOptions: { steeringRatio, ...(columns === undefined ? {} : { columns }) } } }),
      ...(baseline === undefined ? {} : { baseline: { file: baseline.file, schedule: baseline.schedule, check: baseline.check.check } }),
      ...(responseSpeeds_mps === undefined ? {} : { responseSpeeds_mps }),
    });
    report = { file: reportOut, ...(await writeReport(reportOut, data, { force: args.force })) };
  }

  const summary: BuildSummaryInput = {
    result,
    out,
    written,
    outcome,
    ...(modelsOut === undefined ? {} : { modelsOut }),
    ...(baseline === undefined ? {} : { baseline }),
    ...(reportOut === undefined ? {} : { reportOut }),
    report,
  };
  io.stdout(args.json ? `${JSON.stringify(buildSummaryJson(summary), null, 2)}\n` : buildSummaryText(summary));
  return buildExitReasons(summary).length === 0 ? EXIT.ok : EXIT.failed;
}

export const command = defineCommand({
  command: 'build',
  describe:
    'Build a speed schedule: identify the vehicle from step-steer logs, tune each breakpoint by a published rule, interpolate, check stability at every speed of the range with the discrete controller, drive it through the scenarios of speedband simulate (plan check.scenarios, default on) with a speed-change certificate, write schedule.json',
  builder,
  exitCodes: [
    [0, 'the schedule passed its dense check and was written (with --baseline: and the old gains still pass on the new vehicle model)'],
    [
      1,
      "the schedule failed its dense check or, under the plan's robust acceptance, the worst case over its variations (written only with --allow-failing, marked failed); or with --baseline the OLD gains fail on the new vehicle model or over its variations (the new schedule, when it passed, was written) — the output says which",
    ],
    [2, 'bad input: logs, vehicle, plan, models, baseline or options (nothing written)'],
  ],
  examples: [
    [
      'speedband build --vehicle parcel-van --logs vehicles/parcel-van/logs --out schedule.json',
      'Default plan (yaw-rate loop, SIMC) on the bundled demo van and its logs',
    ],
    ['speedband build --vehicle van.json --logs logs/*.csv --plan path-plan.json --out schedule.json', 'The loop, rule and limits from a plan file'],
    [
      'speedband build --vehicle van.json --logs new-logs/*.csv --baseline old-schedule.json --out new-schedule.json',
      'After a vehicle change: new schedule, and are the old gains still safe?',
    ],
    [
      'speedband build --vehicle van.json --logs logs/*.csv --plan robust-plan.json --out schedule.json',
      'With "variations" in the plan: nominal and worst case side by side, the weakest parameter named',
    ],
    [
      'speedband build --vehicle parcel-van --logs vehicles/parcel-van/logs --out schedule.json --report report.html',
      'The schedule and its HTML report for sign-off',
    ],
  ],
  run,
});
