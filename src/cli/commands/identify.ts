import { SpeedbandError } from '../../core/errors.js';
import { IDENTIFY_DEFAULTS } from '../../identify/defaults.js';
import type { Argv } from 'yargs';
import { defineCommand, type OptionsOf } from '../command.js';
import { EXIT, type CommandIo } from '../io.js';
import { logColumnsFromArgs, optionalInputs, withLogColumnOptions } from '../log-columns.js';

/**
 * `speedband identify`: step-steer logs + vehicle file → models.json (per-step and
 * per-speed FOPDT models with intervals, actuator, joint single-track fit).
 * The library does the work (src/identify/identify-from-logs.ts); this prints it.
 */

const f = (value: number, digits: number): string => value.toFixed(digits);
const plusMinus = (value: number, interval: readonly [number, number], digits: number): string =>
  `${f(value, digits)} ± ${f((interval[1] - interval[0]) / 2, digits)}`;

function builder(yargs: Argv) {
  return withLogColumnOptions(yargs)
    .option('vehicle', {
      type: 'string',
      demandOption: true,
      describe: 'Vehicle file (vehicle.json) or its folder: mass, yaw inertia, axle positions, steering ratio',
    })
    .option('logs', {
      type: 'array',
      string: true,
      demandOption: true,
      describe: 'CSV step-test logs (time_s, speed_mps, steer_cmd_rad, yaw_rate_radps[, steer_angle_rad]), or folders of them; steps at two or more speeds',
    })
    .option('out', { type: 'string', describe: 'models.json to write (atomically; validated against its JSON Schema). Required unless --json is given' })
    .option('speed-tolerance-mps', {
      type: 'number',
      default: IDENTIFY_DEFAULTS.speedTolerance_mps,
      describe: 'Steps whose speeds differ by at most this (m/s) — and by at most --speed-tolerance-fraction of the speed — are one nominal speed',
    })
    .option('speed-tolerance-fraction', {
      type: 'number',
      default: IDENTIFY_DEFAULTS.speedToleranceFraction,
      describe: 'Relative speed tolerance (fraction of the speed) for slow machines tested at speeds close together',
    })
    .option('max-hold-s', {
      type: 'number',
      default: IDENTIFY_DEFAULTS.maxHold_s,
      describe: 'Fit each step over at most this many seconds after its onset (s); longer holds add time, not information',
    })
    .option('min-r2', {
      type: 'number',
      default: IDENTIFY_DEFAULTS.minR2,
      describe: 'Refuse a step whose FOPDT fit explains less than this fraction (R²) of the yaw response',
    })
    .option('bias', {
      type: 'string',
      choices: ['fitted', 'pre-step'],
      default: 'fitted',
      describe: 'Yaw-rate sensor offset per step: fitted with the model, or the mean of the pre-step window',
    })
    .option('command-hold', {
      type: 'string',
      choices: ['zero-order', 'linear'],
      default: 'zero-order',
      describe:
        'How the logged command is taken between samples: held (a rig writing the command at samples) or linearly interpolated (a continuous command sampled by the logger)',
    })
    .option('second-order', {
      type: 'boolean',
      default: IDENTIFY_DEFAULTS.fitSecondOrder,
      describe: 'Also fit second order plus dead time (with and without a zero) per step and choose by BIC',
    })
    .option('joint-fit', {
      type: 'boolean',
      default: IDENTIFY_DEFAULTS.jointFit,
      describe: 'Fit the joint single-track model (Cf, Cr, actuator lag and delay) over all steps',
    })
    .option('force', { type: 'boolean', default: false, describe: 'Replace an existing --out file whose content differs' })
    .option('json', {
      type: 'boolean',
      default: false,
      describe: 'Print a JSON summary (per-speed models, single-track results, dropped steps, warnings) instead of tables; with no --out, nothing is written',
    });
}

type Args = OptionsOf<typeof builder>;

async function run(args: Args, io: CommandIo): Promise<number> {
  const out = args.out;
  if (out === undefined && !args.json) {
    throw new SpeedbandError('cli.missingOption', 'nothing to do: give --out models.json to write the models file, and/or --json to print a summary');
  }
  const { identifyFromLogs, expandLogPaths } = await import('../../identify/identify-from-logs.js');
  if (out !== undefined) {
    const { checkOutputPaths } = await import('../../core/output-paths.js');
    const { resolveVehiclePath } = await import('../../vehicle/load.js');
    checkOutputPaths(
      [{ path: out, option: '--out' }],
      [
        { path: resolveVehiclePath(args.vehicle), role: 'vehicle file' },
        ...expandLogPaths(args.logs).map((path) => ({ path, role: 'log' })),
        ...optionalInputs(args, [['log-profile', 'log profile']]),
      ],
    );
  }
  const { writeModels } = await import('../../identify/models-file.js');
  const { radiansToDegrees } = await import('../../core/units.js');
  const { tallyTwoPointAgreement, TWO_POINT_AGREEMENT } = await import('../../identify/two-point-agreement.js');
  const logPaths = args.logs;
  const columns = await logColumnsFromArgs(args);
  const models = identifyFromLogs({
    vehicle: args.vehicle,
    logPaths,
    options: {
      biasMode: args.bias === 'pre-step' ? 'preStep' : 'fitted',
      hold: args['command-hold'] === 'linear' ? 'linear' : 'zeroOrder',
      speedTolerance_mps: args['speed-tolerance-mps'],
      speedToleranceFraction: args['speed-tolerance-fraction'],
      minR2: args['min-r2'],
      maxHold_s: args['max-hold-s'],
      fitSecondOrder: args['second-order'],
      jointFit: args['joint-fit'],
    },
    ...(columns === undefined ? {} : { readOptions: { columns } }),
    progress: io.progress,
  });
  const outcome = out === undefined ? null : writeModels(out, models, { force: args.force });
  const twoPoint = tallyTwoPointAgreement(models.tests);

  if (args.json) {
    io.stdout(
      `${JSON.stringify(
        {
          file: out ?? null,
          outcome,
          vehicle: models.vehicle.name,
          speeds: models.speeds.map((s) => ({ speed_mps: s.speed_mps, stepCount: s.stepCount, fopdt: s.fopdt })),
          singleTrack: models.singleTrack,
          singleTrackRefusal: models.singleTrackRefusal,
          refusedTests: models.refusedTests.map((t) => ({
            file: t.file,
            stepIndex: t.stepIndex,
            speed_mps: t.speed_mps,
            reasonCode: t.reasonCode,
            reason: t.reason,
          })),
          rejectedSteps: models.rejectedSteps,
          warnings: models.warnings,
          twoPointCheck: { ...twoPoint, tolerance: TWO_POINT_AGREEMENT },
        },
        null,
        2,
      )}\n`,
    );
    return EXIT.ok;
  }

  const lines: string[] = [];
  lines.push(
    `Vehicle ${models.vehicle.name}: ${models.tests.length} steps used, ${models.refusedTests.length} refused, ${models.rejectedSteps.length} candidates rejected by segmentation`,
  );
  lines.push('');
  lines.push('FOPDT per speed, steering command → yaw rate (± = half-width of the 95 % interval)');
  lines.push(
    `${'speed m/s'.padStart(9)}  ${'gain 1/s'.padEnd(17)}  ${'time constant s'.padEnd(17)}  ${'dead time s'.padEnd(17)}  ${'R² (min)'.padStart(8)}  ${'steps used/refused'.padEnd(18)}  models chosen (BIC)`,
  );
  for (const speed of models.speeds) {
    const keys = new Set(speed.steps.map((k) => `${k.file}\u0000${k.stepIndex}`));
    const tests = models.tests.filter((t) => keys.has(`${t.file}\u0000${t.stepIndex}`));
    // Refused steps belong to no group: count those within the speed tolerance.
    const tolerance_mps = Math.min(args['speed-tolerance-mps'], args['speed-tolerance-fraction'] * speed.speed_mps);
    const refused = models.refusedTests.filter((t) => Math.abs(t.speed_mps - speed.speed_mps) <= tolerance_mps).length;
    const minR2 = Math.min(...tests.map((t) => t.fopdt.r2));
    const chosen = new Map<string, number>();
    for (const t of tests) chosen.set(t.chosenModel, (chosen.get(t.chosenModel) ?? 0) + 1);
    const chosenText = [...chosen.entries()]
      .sort((a, b) => a[0].localeCompare(b[0]))
      .map(([k, n]) => `${k} ×${n}`)
      .join(', ');
    lines.push(
      `${f(speed.speed_mps, 2).padStart(9)}  ${plusMinus(speed.fopdt.gain, speed.fopdt.ci95.gain, 4).padEnd(17)}  ${plusMinus(speed.fopdt.timeConstant_s, speed.fopdt.ci95.timeConstant_s, 4).padEnd(17)}  ` +
        `${plusMinus(speed.fopdt.deadTime_s, speed.fopdt.ci95.deadTime_s, 4).padEnd(17)}  ${f(minR2, 4).padStart(8)}  ${`${speed.stepCount}/${refused}`.padEnd(18)}  ${chosenText}`,
    );
  }
  lines.push('');
  if (models.actuator !== null) {
    const a = models.actuator;
    lines.push(
      `Steering actuator (command → measured angle, ${a.stepCount} steps): lag ${plusMinus(a.lag_s, a.ci95.lag_s, 4)} s, delay ${plusMinus(a.delay_s, a.ci95.delay_s, 4)} s, gain ${plusMinus(a.gain, a.ci95.gain, 3)}`,
    );
  } else {
    lines.push('Steering actuator: not identified (no steer_angle_rad column in the logs)');
  }
  const st = models.singleTrack;
  if (st !== null) {
    lines.push(`Joint single-track fit (${st.stepCount} steps, R² ${f(st.r2, 4)}):`);
    lines.push(`  front cornering stiffness  ${plusMinus(st.frontCorneringStiffness_NPerRad, st.ci95.frontCorneringStiffness_NPerRad, 0)} N/rad`);
    lines.push(`  rear cornering stiffness   ${plusMinus(st.rearCorneringStiffness_NPerRad, st.ci95.rearCorneringStiffness_NPerRad, 0)} N/rad`);
    lines.push(`  actuator lag               ${plusMinus(st.actuatorLag_s, st.ci95.actuatorLag_s, 4)} s`);
    lines.push(`  actuator delay             ${plusMinus(st.actuatorDelay_s, st.ci95.actuatorDelay_s, 4)} s`);
    lines.push(
      `  understeer gradient        ${f(radiansToDegrees(st.understeerGradient_radPerMps2), 4)} °/(m/s²) (${st.understeerGradient_radPerMps2.toExponential(3)} rad/(m/s²))` +
        (st.characteristicSpeed_mps !== null ? `, characteristic speed ${f(st.characteristicSpeed_mps, 1)} m/s` : '') +
        (st.criticalSpeed_mps !== null ? `, critical speed ${f(st.criticalSpeed_mps, 1)} m/s (open-loop unstable above)` : ''),
    );
    lines.push('  against the per-speed FOPDT models (steady yaw gain difference; RMS yaw-rate residual, single-track / FOPDT):');
    for (const c of st.comparison) {
      lines.push(
        `    ${f(c.speed_mps, 2).padStart(6)} m/s  ${`${c.difference_pct >= 0 ? '+' : ''}${f(c.difference_pct, 1)} %`.padStart(8)}  ${f(c.singleTrackRmse_radps / c.fopdtRmse_radps, 2)}×`,
      );
    }
  } else {
    lines.push(`Joint single-track fit refused: ${models.singleTrackRefusal?.reason ?? 'no reason recorded'}`);
  }
  if (models.refusedTests.length > 0 || models.rejectedSteps.length > 0) {
    lines.push('');
    lines.push('Dropped steps:');
    for (const t of models.refusedTests)
      lines.push(`  ${t.file} step ${t.stepIndex} (${f(t.speed_mps, 2)} m/s, ${f(radiansToDegrees(t.amplitude_rad), 2)}°): ${t.reason}`);
    for (const r of models.rejectedSteps) lines.push(`  ${r.file} at ${f(r.onset_s, 2)} s: ${r.reason}`);
  }
  if (models.warnings.length > 0) {
    lines.push('');
    lines.push('Warnings:');
    for (const w of models.warnings) lines.push(`  ${w}`);
  }
  if (twoPoint.disagreeing > 0) {
    lines.push('');
    lines.push(
      `Note: Smith's two-point estimate (28.3 %/63.2 % crossings) disagrees with the FOPDT fit on ${twoPoint.disagreeing} of ${twoPoint.steps} steps ` +
        `(gain beyond ${100 * TWO_POINT_AGREEMENT.gainFraction} %, or τ or θ beyond ${100 * TWO_POINT_AGREEMENT.timeFraction} % of the fit's τ + θ; per step in models.json, tests[].fopdt.twoPoint.agreesWithFit). ` +
        'The estimate reads each step as instantaneous at half the command ramp, so a ramp that is not short against the response (τ + θ) makes it disagree by construction; ' +
        'otherwise a large share hints at a response that is not first order — see the models chosen per speed above. The fits use the logged command and are not affected.',
    );
  }
  lines.push('');
  lines.push(`${outcome === 'written' ? 'Wrote' : 'Unchanged'} ${out}`);
  io.stdout(`${lines.join('\n')}\n`);
  return EXIT.ok;
}

export const command = defineCommand({
  command: 'identify',
  describe:
    'Fit models of the steering-to-yaw response from step-steer logs: FOPDT per step and per speed with 95 % intervals, the steering actuator, and a joint single-track model; writes models.json',
  builder,
  exitCodes: [
    [0, 'identified: models written (--out) or printed (--json)'],
    [
      2,
      'bad input: unreadable logs or vehicle, a channel off by a unit factor (checked against the kinematics), no steps, fewer than two usable speeds, an output path',
    ],
  ],
  examples: [
    [
      'speedband identify --vehicle vehicles/parcel-van --logs vehicles/parcel-van/logs --out models.json',
      'Models of the demo van from its synthetic logs (every .csv in the folder)',
    ],
    [
      'speedband identify --vehicle van.json --logs run1.csv run2.csv --out models.json --bias pre-step --json',
      'Offset from the pre-step window; a JSON summary for scripts',
    ],
    [
      'speedband identify --vehicle vehicles/sidewalk-robot --logs vehicles/sidewalk-robot/logs --json',
      'Only the JSON summary on stdout; no models file written',
    ],
  ],
  run,
});
