import { SpeedbandError } from '../../core/errors.js';
import type { AnalyseLoop } from '../../schedule/types.js';
import type { ScheduleFile } from '../../schedule/schedule-types.js';
import type { Argv } from 'yargs';
import { C_HEADER_DEFAULTS } from '../../export/c-header.js';
import { defineCommand, type CommandModule, type OptionsOf } from '../command.js';
import { EXIT, type CommandIo } from '../io.js';
import { SAFETY_EPILOGUE } from '../../core/safety.js';

/** What the export command needs beyond the schedule file. */
export interface ExportDependencies {
  /**
   * The loop analysis to re-check a schedule's gains with (null: none available); absent: the model the
   * schedule records (src/pipeline/export-check.ts). Tests pass constructed loops.
   */
  readonly analyseFor?: (schedule: ScheduleFile) => AnalyseLoop | null;
}

const FORMATS = ['c', 'csv', 'json'] as const;
type Format = (typeof FORMATS)[number];

const shown = (value: number): string => value.toPrecision(3);

function builder(yargs: Argv) {
  return yargs
    .positional('schedule', { type: 'string', demandOption: true, describe: 'schedule.json written by speedband (its checksum must match)' })
    .option('format', {
      type: 'string',
      choices: FORMATS,
      demandOption: true,
      describe:
        'c: C99 header with const tables and a static inline lookup (IEEE 754 double, clamped, same interpolation as the schedule); csv: one row per breakpoint, units in the header; json: the canonical schedule file',
    })
    .option('out', { type: 'string', describe: 'File to write (atomically); without it the export goes to standard output' })
    .option('q-format', {
      type: 'string',
      describe:
        'C only: gains as fixed-point integers, an integer-only lookup and controller step function (no floating point; speed in units of 2^-16 m/s, signals in 2^-24 of their units). QI.F or I.F (I integer bits including the sign, F fractional bits, I + F = 16 or 32: Q16.16, 16.16, Q4.12) for every gain, or auto: per gain, the 32-bit format with the most fractional bits its values need. Prints the error per gain; the dense check is re-run on what the integer lookup computes',
    })
    .option('prefix', {
      type: 'string',
      default: C_HEADER_DEFAULTS.prefix,
      describe: 'C only: prefix of every identifier; the include guard is its upper case',
    })
    .option('allow-failing', {
      type: 'boolean',
      default: false,
      describe:
        'Export a schedule whose dense check fails (or cannot be re-run), for review only: the C header then starts with #error unless <PREFIX>_ALLOW_FAILING_SCHEDULE is defined',
    })
    .option('force', { type: 'boolean', default: false, describe: 'Replace an existing --out file whose content differs (never the schedule itself)' })
    .option('json', {
      type: 'boolean',
      default: false,
      describe: 'With --out: print a JSON summary (file, format, checksum, quantisation errors) instead of text',
    });
}

type Args = OptionsOf<typeof builder>;

/** The `export` command, with its dependencies given (the default export has no quantised re-check). */
export function makeExportCommand(dependencies: ExportDependencies): CommandModule<Args> {
  return defineCommand({
    command: 'export <schedule>',
    describe:
      'Write a verified schedule.json as a C99 header for firmware, a CSV for spreadsheets, or canonical JSON; the schema and checksum are verified and the dense check of the exported gains is re-run first',
    builder,
    exitCodes: [
      [0, 'written (or printed); the exported gains passed the re-run dense check'],
      [1, 'not written: the schedule failed its check or the exported (quantised) gains fail it — or written with --allow-failing, for review only'],
      [2, 'bad input: unreadable, invalid or edited schedule (checksum), bad option, a gain that does not fit the Q format'],
    ],
    examples: [
      [
        'speedband export schedule.json --format c --out firmware/steer_schedule.h',
        'C99 header with the lookup, units, controller equation, checksum and cautions',
      ],
      [
        'speedband export schedule.json --format c --q-format Q16.16 --out steer_schedule_q16.h',
        'Gains as Q16.16 int32_t with an integer-only lookup and step function; prints the error per gain',
      ],
      ['speedband export schedule.json --format c --q-format auto --out steer_schedule_fixed.h', 'Each gain in the 32-bit Q format that fits its range best'],
      ['speedband export schedule.json --format csv > gains.csv', 'Breakpoints, gains and margins for a spreadsheet'],
    ],
    run: async (args, io) => run(args, io, dependencies),
  });
}

async function run(args: Args, io: CommandIo, dependencies: ExportDependencies): Promise<number> {
  const format: Format = args.format;
  const schedulePath = args.schedule;
  const out = args.out;
  const qFormat = args['q-format'];
  const allowFailing = args['allow-failing'];
  if (qFormat !== undefined && format !== 'c') {
    throw new SpeedbandError('cli.optionNotApplicable', `--q-format applies to --format c only (got --format ${format}) — drop --q-format or export C`);
  }
  if (args.json && out === undefined) {
    throw new SpeedbandError('cli.optionNotApplicable', '--json prints a summary of a written file: give --out FILE too');
  }
  if (out !== undefined)
    (await import('../../core/output-paths.js')).checkOutputPaths([{ path: out, option: '--out' }], [{ path: schedulePath, role: 'schedule' }]);
  const { readSchedule } = await import('../../schedule/schedule-file.js');
  const { scheduleTable, scheduleLookupSettings } = await import('../../schedule/schedule-lookup.js');
  const exportCheck = await import('../../pipeline/export-check.js');
  const schedule = readSchedule(schedulePath);
  if (schedule.status === 'failed' && !allowFailing) {
    const failed =
      schedule.check.passed && schedule.variations !== undefined
        ? `its worst case over the variations failed (${schedule.variations.failedSpeeds} of ${schedule.variations.gridSize} speeds, robust acceptance)`
        : `the schedule's dense check failed (${schedule.check.failedSpeeds} of ${schedule.check.gridSize} speeds)`;
    io.stderr(`speedband: ${schedulePath}: ${failed} — it is not exported for firmware; fix the schedule, or pass --allow-failing to export it for review\n`);
    return EXIT.failed;
  }
  const analyse = (dependencies.analyseFor ?? exportCheck.recordedLoopAnalysis)(schedule);
  if (analyse === null && !allowFailing) {
    throw new SpeedbandError(
      'export.noModel',
      'the schedule records no vehicle model speedband can rebuild, so the gains cannot be re-checked before export — rebuild it with speedband build, ' +
        'or pass --allow-failing to export it for review (a C header then stops the build with #error)',
      { location: { file: schedulePath, jsonPath: '/provenance/model' } },
    );
  }

  const notes: string[] = [];
  const fixedPointModule = qFormat === undefined ? undefined : await import('../../export/fixed-point.js');
  const fixedPoint = qFormat === undefined ? undefined : fixedPointModule!.parseFixedPointRequest(qFormat);
  const quantisation =
    fixedPoint === undefined ? undefined : fixedPointModule!.quantiseTable(scheduleTable(schedule), fixedPoint, scheduleLookupSettings(schedule));
  const table = quantisation?.table ?? scheduleTable(schedule);
  // The fixed-point header interpolates in integers: the check judges exactly what that lookup computes.
  const check = analyse === null ? null : exportCheck.checkExportedTable(schedule, table, analyse, quantisation?.lookup);
  if (quantisation !== undefined) {
    notes.push(
      `Fixed point${fixedPoint === 'auto' ? ' (auto: per gain, the 32-bit format with the most fractional bits its values need)' : ''}, integer-only lookup, speed in units of 2^-16 m/s:`,
    );
    for (const name of ['kp', 'ki', 'kd'] as const) {
      const error = quantisation.errors[name];
      const format = quantisation.formats[name];
      notes.push(
        `  ${name}: ${fixedPointModule!.formatName(format)} (int${format.wordBits}_t), at breakpoints max error ${shown(error.maxAbsolute)} (bound 2^-${format.fractionalBits + 1}, ${schedule.units[name]}), ` +
          `max relative ${shown(100 * error.maxRelative)} %; between breakpoints max ${shown(error.maxAbsoluteInterpolated)}`,
      );
    }
  }
  const what = quantisation === undefined ? 'the gains' : 'the quantised gains';
  if (check === null) {
    notes.push(`  The exported gains were NOT re-checked: the schedule records no vehicle model speedband can rebuild (exported for review only).`);
  } else {
    notes.push(
      check.passed
        ? `  Dense check with ${what}: passed at all ${check.points.length} speeds (model recorded in the schedule).`
        : `  Dense check with ${what}: FAILED at ${check.failedCount} of ${check.points.length} speeds${quantisation === undefined ? '' : ' — use more fractional bits'}.`,
    );
  }
  if (check !== null && !check.passed && !allowFailing) {
    const why =
      quantisation !== undefined
        ? 'the quantised schedule fails the dense check'
        : 'the schedule says its check passed, but its gains fail a fresh dense check on the model it records — the file does not hold what it states ' +
          '(edited and re-checksummed?); run speedband check for the details, or speedband reverify after a deliberate edit';
    io.stderr(`${notes.join('\n')}\nspeedband: nothing written — ${why} (pass --allow-failing to write it for review)\n`);
    return EXIT.failed;
  }
  const passed = schedule.status === 'passed' && check !== null && check.passed;

  let text: string;
  let fallback: import('../../export/c-header.js').FallbackGains | null = null;
  let stepPlan: import('../../export/integer-step-plan.js').IntegerStepPlan | undefined;
  if (format === 'c') {
    const { exportC } = await import('../../export/c-header.js');
    fallback = analyse === null ? null : exportCheck.findFallbackGains(schedule, table, analyse);
    const upper = args.prefix.toUpperCase();
    notes.push(
      quantisation !== undefined
        ? `  The integer lookup takes the speed as an integer, never NaN: no fallback status; ${upper}_FALLBACK_BREAKPOINT is ${fallback === null ? "-1 (no breakpoint's gains pass held constant over the whole range)" : `${fallback.breakpoint} (${fallback.speed_mps} m/s), gains that pass held constant over the whole range, for a speed-sensor fault`}.`
        : fallback === null
          ? `  NaN or infinite speed: no breakpoint's gains, held constant, pass the dense check over the whole range — the C lookup returns ${upper}_LOOKUP_NO_GAINS (the caller must hand over or stop).`
          : `  NaN or infinite speed: the C lookup returns ${upper}_LOOKUP_FALLBACK with the gains of breakpoint ${fallback.breakpoint} (${fallback.speed_mps} m/s), which pass the dense check held constant over the whole range.`,
    );
    const headerCheck =
      check === null
        ? {
            passed: false,
            gridSize: schedule.check.gridSize,
            failedSpeeds: schedule.check.failedSpeeds,
            worst: schedule.check.worst,
            source: 'NOT re-checked at export: no model to rebuild',
          }
        : {
            passed,
            gridSize: check.points.length,
            failedSpeeds: check.failedCount,
            worst: check.worst,
            source: 're-checked at export on the model the schedule records',
          };
    const exported = exportC(schedule, { prefix: args.prefix, check: headerCheck, fallback, ...(fixedPoint === undefined ? {} : { fixedPoint }) });
    text = exported.text;
    stepPlan = exported.stepPlan;
    if (exported.stepPlan !== undefined && exported.quantisation !== undefined) {
      const bounds = exported.quantisation.lookupErrorBounds;
      const ranges = exported.stepPlan.ranges;
      notes.push(
        `  Controller step function in integers (${args.prefix}_step): reference, measurement, feed-forward input and command as int32 in units of 2^-24 (any int32 input, +-128 units); ` +
          `no overflow for any of them (largest term ${shown(Math.max(...Object.values(ranges)))} rad of the +-2^28 rad its int64 accumulator holds at 2^-32 rad).`,
        `  Its command stays within the quantisation error bound the header states (against the floating-point step); looked-up values within kp ${shown(bounds.kp ?? Number.NaN)}, ` +
          `ki ${shown(bounds.ki ?? Number.NaN)}, kd ${shown(bounds.kd ?? Number.NaN)}, feed-forward ${shown(bounds.feed_forward ?? Number.NaN)} at any speed.`,
      );
    }
  } else if (format === 'csv') {
    text = (await import('../../export/csv.js')).exportCsv(schedule);
  } else {
    text = (await import('../../export/json.js')).exportJson(schedule);
  }

  if (out === undefined) {
    io.stdout(text);
    io.stderr(`${notes.join('\n')}\n`);
    return passed ? EXIT.ok : EXIT.failed;
  }
  const { writeFileAtomic } = await import('../../core/files.js');
  const outcome = writeFileAtomic(out, text, { force: args.force });
  if (args.json) {
    io.stdout(
      `${JSON.stringify(
        {
          file: out,
          format,
          outcome,
          status: schedule.status,
          checksum: schedule.checksum.value,
          breakpoints: schedule.breakpoints.length,
          check:
            check === null
              ? null
              : {
                  passed: check.passed,
                  gridSize: check.points.length,
                  failedSpeeds: check.failedCount,
                  failures: (await import('../../schedule/dense-check.js')).failingSpeeds(check.points),
                  worst: check.worst,
                },
          fallback,
          quantisation:
            quantisation === undefined
              ? null
              : {
                  formats: quantisation.formats,
                  resolutionBound: quantisation.resolutionBound,
                  resolutionBounds: quantisation.resolutionBounds,
                  errors: quantisation.errors,
                  recheckPassed: check === null ? null : check.passed,
                  ...(stepPlan === undefined ? {} : { stepRanges_rad: stepPlan.ranges }),
                },
        },
        null,
        2,
      )}\n`,
    );
  } else {
    io.stdout(
      `${outcome === 'written' ? 'Wrote' : 'Unchanged'} ${out}: ${format === 'c' ? 'C99 header' : format.toUpperCase()}, ${schedule.breakpoints.length} breakpoints, ` +
        `${schedule.interpolation.method} interpolation, status ${schedule.status}, checksum ${schedule.checksum.value.slice(0, 16)}…\n` +
        `${notes.join('\n')}\n` +
        `${SAFETY_EPILOGUE}\n`,
    );
  }
  return passed ? EXIT.ok : EXIT.failed;
}

export const command = makeExportCommand({});
