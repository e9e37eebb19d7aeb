import { SpeedbandError } from '../../core/errors.js';
import type { CommandModule } from '../command.js';
import { EXIT, type CommandIo } from '../io.js';
import { logColumnsFromArgs, optionalInputs, withLogColumnOptions } from '../log-columns.js';

/**
 * `speedband build`: logs + vehicle (+ plan) → identified models → gains per breakpoint →
 * interpolated table → dense check with the discrete controller → refinement → schedule.json.
 * With --baseline, also checks the OLD schedule's gains on the NEW vehicle model.
 */
async function run(args: Record<string, unknown>, io: CommandIo): Promise<number> {
  const { buildSchedule } = await import('../../build/build-schedule.js');
  const { writeSchedule, readSchedule } = await import('../../schedule/schedule-file.js');
  const { readModels, writeModels } = await import('../../identify/models-file.js');
  const { formatSchedule, formatCautions } = await import('../../build/schedule-report.js');

  const logPaths = ((args.logs as unknown[] | undefined) ?? []).map(String);
  const modelsIn = args.models === undefined ? undefined : String(args.models);
  if (logPaths.length === 0 && modelsIn === undefined) {
    throw new SpeedbandError('cli.missingInput', 'give the step-test logs with --logs FILE… (or an identification already done with --models models.json)');
  }
  if (logPaths.length > 0 && modelsIn !== undefined) {
    throw new SpeedbandError('cli.conflictingOptions', '--logs and --models both give the vehicle model — use one: --logs to identify afresh, --models to reuse models.json');
  }
  const out = String(args.out);
  const modelsOut = args['models-out'] === undefined ? undefined : String(args['models-out']);
  // Outputs checked against every input and each other before any work (never replaced, not even with --force).
  const { checkOutputPaths } = await import('../../core/output-paths.js');
  const { resolveVehiclePath } = await import('../../vehicle/load.js');
  const { expandLogPaths } = await import('../../identify/identify-from-logs.js');
  checkOutputPaths(
    [{ path: out, option: '--out' }, ...(modelsOut === undefined ? [] : [{ path: modelsOut, option: '--models-out' }])],
    [
      { path: resolveVehiclePath(String(args.vehicle)), role: 'vehicle file' },
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
  const baseline = args.baseline === undefined ? undefined : readSchedule(String(args.baseline));
  const columns = await logColumnsFromArgs(args);
  const result = await buildSchedule({
    vehicle: String(args.vehicle),
    logPaths,
    ...(columns === undefined ? {} : { readOptions: { columns } }),
    ...(modelsIn === undefined ? {} : { models: readModels(modelsIn) }),
    ...(args.plan === undefined ? {} : { planFile: String(args.plan) }),
    progress: io.progress,
  });
  const { schedule } = result;
  const passed = schedule.status === 'passed';
  const written = passed || args['allow-failing'] === true;
  const outcome = written ? writeSchedule(out, schedule, args.force === true) : null;
  if (modelsOut !== undefined) writeModels(modelsOut, result.models, args.force === true);

  const baselineCheck = baseline === undefined ? undefined : (await import('../../build/baseline.js')).checkBaseline(baseline, result);
  const baselineResult = baselineCheck?.check;

  if (args.json === true) {
    io.stdout(
      `${JSON.stringify(
        {
          file: written ? out : null,
          outcome,
          status: schedule.status,
          checksum: schedule.checksum.value,
          model: { kind: result.checkModel.kind, description: result.checkModel.description },
          breakpoints: schedule.breakpoints,
          check: schedule.check,
          derivations: result.tuned.map((point, k) => ({
            speed_mps: schedule.breakpoints[k].speed_mps,
            rule: point.derivation.rule,
            citation: point.derivation.citation,
            designModel: point.derivation.designModel,
            intermediate: point.derivation.intermediate,
            warnings: point.derivation.warnings,
          })),
          baseline:
            baselineResult === undefined
              ? null
              : {
                  file: String(args.baseline),
                  passedOnNewModel: baselineResult.passed,
                  failedSpeeds: baselineResult.failedCount,
                  gridSize: baselineResult.points.length,
                  worst: baselineResult.worst,
                  failing: baselineResult.points.filter((p) => p.failures.length > 0).map((p) => ({ speed_mps: p.speed_mps, failures: p.failures.map((f) => f.message) })),
                  atNewBreakpoints: baselineCheck?.rows ?? [],
                },
          cautions: schedule.cautions,
        },
        null,
        2,
      )}\n`,
    );
  } else {
    const warnings = [...new Set(result.tuned.flatMap((point) => point.derivation.warnings))];
    let text = formatSchedule(schedule);
    text += `\n  model: ${result.checkModel.description}\n`;
    if (warnings.length > 0) text += `  rule warnings:\n${warnings.map((warning) => `    - ${warning}`).join('\n')}\n`;
    if (baselineCheck !== undefined && baseline !== undefined) {
      const { formatBaseline } = await import('../../build/schedule-report.js');
      const verdict = baselineCheck.check.passed ? 'still within the limits at every speed' : 'NOT within the limits everywhere';
      text += `\n${formatBaseline(`Baseline ${String(args.baseline)}: its gains on the new vehicle model — ${verdict}`, baselineCheck, baseline, result.checkModel.kind)}`;
    }
    text += '\n';
    if (written) {
      text += `${outcome === 'written' ? 'Wrote' : 'Unchanged'} ${out} (status ${schedule.status}, checksum ${schedule.checksum.value.slice(0, 16)}…)\n`;
    } else {
      text += `Nothing written: the schedule fails its dense check, its time-domain limits or its scenarios (see above). Change the plan (rule parameters, breakpoints, limits) or pass --allow-failing to write it marked failed for review.\n`;
    }
    if (modelsOut !== undefined) text += `Wrote ${modelsOut}\n`;
    text += formatCautions();
    io.stdout(text);
  }
  return passed && (baselineResult === undefined || baselineResult.passed) ? EXIT.ok : EXIT.failed;
}

export const command: CommandModule = {
  command: 'build',
  describe: 'Build a speed schedule: identify the vehicle from step-steer logs, tune each breakpoint by a published rule, interpolate, check stability at every speed of the range with the discrete controller, drive it through the scenarios of speedband simulate (plan check.scenarios, default on) with a speed-change certificate, write schedule.json',
  builder: (yargs) =>
    withLogColumnOptions(yargs)
      .option('vehicle', { type: 'string', demandOption: true, describe: 'Vehicle file (vehicle.json) or its folder' })
      .option('logs', { type: 'array', string: true, describe: 'Step-test logs (CSV, columns time_s, speed_mps, steer_cmd_rad, yaw_rate_radps …) at two or more speeds' })
      .option('models', { type: 'string', describe: 'Reuse an identification (models.json from `speedband identify`) instead of --logs' })
      .option('plan', {
        type: 'string',
        describe:
          'Plan file (JSON): loop, rule and parameters, breakpoints, speed range, interpolation, controller, acceptance limits. A rule parameter is a number, a table over speed {"speeds_mps": [...], "values": [...]}, or an expression in speed_mps such as "max(15, 1.2 * speed_mps)" (arithmetic, comparisons, a ? b : c, maths functions; its values at the breakpoints are recorded in the schedule). Default: yaw-rate loop, SIMC with τc = θ, 6 geometric breakpoints over the test speeds, monotone cubic, 100 Hz backward-Euler PID, GM ≥ 6 dB, PM ≥ 45°, Ms ≤ 2',
      })
      .option('out', { type: 'string', demandOption: true, describe: 'schedule.json to write (atomically)' })
      .option('models-out', { type: 'string', describe: 'Also write the identification as models.json (FOPDT and joint single-track fits; the per-step second-order fits, which a schedule does not use, are left out: run identify for them)' })
      .option('baseline', { type: 'string', describe: 'A previous schedule.json: also check ITS gains on the NEW vehicle model (are the current gains still safe after the change, and where not?)' })
      .option('allow-failing', { type: 'boolean', default: false, describe: 'Write a schedule that fails its dense check, marked "failed" (export refuses it unless told otherwise)' })
      .option('force', { type: 'boolean', default: false, describe: 'Replace existing output files whose content differs' })
      .option('json', { type: 'boolean', default: false, describe: 'Print the result as JSON (breakpoints, margins, derivations, check, baseline)' }),
  examples: [
    ['speedband build --vehicle vehicles/parcel-van --logs vehicles/parcel-van/logs/*.csv --out schedule.json', 'Default plan: yaw-rate loop, SIMC'],
    ['speedband build --vehicle van.json --logs logs/*.csv --plan path-plan.json --out schedule.json', 'The loop, rule and limits from a plan file'],
    ['speedband build --vehicle van.json --logs new-logs/*.csv --baseline old-schedule.json --out new-schedule.json', 'After a vehicle change: new schedule, and are the old gains still safe?'],
  ],
  run,
};
