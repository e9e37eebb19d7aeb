import { SpeedbandError } from '../../core/errors.js';
import type { QuantisedRecheck } from '../../export/recheck.js';
import type { CommandModule } from '../command.js';
import { EXIT, type CommandIo } from '../io.js';
import { SAFETY_EPILOGUE } from '../safety.js';

/** What the export command needs beyond the schedule file. */
export interface ExportDependencies {
  /** Re-checks a quantised table against the schedule's loop model; absent: the model recorded in the schedule (src/build/quantised-recheck.ts). */
  readonly recheck?: QuantisedRecheck;
}

type Format = 'c' | 'csv' | 'json';
const FORMATS: readonly Format[] = ['c', 'csv', 'json'];

const shown = (value: number): string => value.toPrecision(3);

/** The `export` command, with its dependencies given (the default export has no quantised re-check). */
export function makeExportCommand(dependencies: ExportDependencies): CommandModule {
  return {
    command: 'export <schedule>',
    describe: 'Write a verified schedule.json as a C99 header for firmware, a CSV for spreadsheets, or canonical JSON; the schema and checksum are verified first',
    builder: (yargs) =>
      yargs
        .positional('schedule', { type: 'string', describe: 'schedule.json written by speedband (its checksum must match)' })
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
            'C only: store gains as fixed-point I.F (I integer bits including sign, F fractional bits, I + F = 16 or 32, e.g. 16.16); prints the quantisation error per gain (bound 2^-(F+1))',
        })
        .option('prefix', { type: 'string', default: 'speedband_schedule', describe: 'C only: prefix of every identifier; the include guard is its upper case' })
        .option('allow-failing', { type: 'boolean', default: false, describe: 'Export a schedule whose dense check failed (status "failed"), e.g. for review' })
        .option('force', { type: 'boolean', default: false, describe: 'Replace an existing --out file whose content differs' })
        .option('json', { type: 'boolean', default: false, describe: 'With --out: print a JSON summary (file, format, checksum, quantisation errors) instead of text' }),
    examples: [
      ['speedband export schedule.json --format c --out firmware/steer_schedule.h', 'C99 header with the lookup, units, controller equation, checksum and cautions'],
      ['speedband export schedule.json --format c --q-format 16.16 --out steer_schedule_q16.h', 'Gains as Q16.16 int32_t; prints the quantisation error per gain'],
      ['speedband export schedule.json --format csv > gains.csv', 'Breakpoints, gains and margins for a spreadsheet'],
    ],
    run: async (args, io) => run(args, io, dependencies),
  };
}

async function run(args: Record<string, unknown>, io: CommandIo, dependencies: ExportDependencies): Promise<number> {
  const { readSchedule } = await import('../../schedule/schedule-file.js');
  const format = String(args.format) as Format;
  const out = args.out === undefined ? undefined : String(args.out);
  const qFormat = args['q-format'] === undefined ? undefined : String(args['q-format']);
  if (qFormat !== undefined && format !== 'c') {
    throw new SpeedbandError('cli.optionNotApplicable', `--q-format applies to --format c only (got --format ${format}) — drop --q-format or export C`);
  }
  if (args.json === true && out === undefined) {
    throw new SpeedbandError('cli.optionNotApplicable', '--json prints a summary of a written file: give --out FILE too');
  }
  const schedule = readSchedule(String(args.schedule));
  if (schedule.status === 'failed' && args['allow-failing'] !== true) {
    io.stderr(
      `speedband: ${String(args.schedule)}: the schedule's dense check failed (${schedule.check.failedSpeeds} of ${schedule.check.gridSize} speeds) — ` +
        'it is not exported for firmware; fix the schedule, or pass --allow-failing to export it for review\n',
    );
    return EXIT.failed;
  }

  const notes: string[] = [];
  let text: string;
  let quantisation: import('../../export/fixed-point.js').QuantisedTable | undefined;
  let recheckPassed: boolean | null = null;
  if (format === 'c') {
    const { exportC } = await import('../../export/c-header.js');
    const { parseQFormat } = await import('../../export/fixed-point.js');
    const fixedPoint = qFormat === undefined ? undefined : parseQFormat(qFormat);
    const exported = exportC(schedule, { prefix: String(args.prefix), ...(fixedPoint === undefined ? {} : { fixedPoint }) });
    text = exported.text;
    quantisation = exported.quantisation;
  } else if (format === 'csv') {
    text = (await import('../../export/csv.js')).exportCsv(schedule);
  } else {
    text = (await import('../../export/json.js')).exportJson(schedule);
  }

  if (quantisation !== undefined) {
    const { fractionalBits, wordBits } = quantisation.format;
    notes.push(`Q${wordBits - fractionalBits}.${fractionalBits} gains (int${wordBits}_t), error bound 2^-${fractionalBits + 1} = ${shown(quantisation.resolutionBound)}:`);
    for (const name of ['kp', 'ki', 'kd'] as const) {
      const error = quantisation.errors[name];
      notes.push(`  ${name}: max absolute error ${shown(error.maxAbsolute)} (${schedule.units[name]}), max relative ${shown(100 * error.maxRelative)} %`);
    }
    const recheck = dependencies.recheck ?? (await import('../../build/quantised-recheck.js')).recheckWithRecordedModel;
    const result = recheck(schedule, quantisation.table);
    if (result === null) {
      notes.push('  The quantised gains were not re-checked: the schedule records no vehicle model speedband can rebuild; the error bound above is what changed.');
    } else {
      recheckPassed = result.passed;
      notes.push(
        result.passed
          ? `  Dense check with the quantised gains: passed at all ${result.points.length} speeds.`
          : `  Dense check with the quantised gains: FAILED at ${result.failedCount} of ${result.points.length} speeds — use more fractional bits.`,
      );
    }
  }

  if (recheckPassed === false && args['allow-failing'] !== true) {
    io.stderr(`${notes.join('\n')}\nspeedband: nothing written — the quantised schedule fails the dense check (pass --allow-failing to write it for review)\n`);
    return EXIT.failed;
  }

  if (out === undefined) {
    io.stdout(text);
    if (notes.length > 0) io.stderr(`${notes.join('\n')}\n`);
    return EXIT.ok;
  }
  const { writeFileAtomic } = await import('../../core/files.js');
  const outcome = writeFileAtomic(out, text, args.force === true);
  if (args.json === true) {
    io.stdout(
      `${JSON.stringify(
        {
          file: out,
          format,
          outcome,
          status: schedule.status,
          checksum: schedule.checksum.value,
          breakpoints: schedule.breakpoints.length,
          quantisation:
            quantisation === undefined
              ? null
              : { format: quantisation.format, resolutionBound: quantisation.resolutionBound, errors: quantisation.errors, recheckPassed },
        },
        null,
        2,
      )}\n`,
    );
  } else {
    io.stdout(
      `${outcome === 'written' ? 'Wrote' : 'Unchanged'} ${out}: ${format === 'c' ? 'C99 header' : format.toUpperCase()}, ${schedule.breakpoints.length} breakpoints, ` +
        `${schedule.interpolation.method} interpolation, status ${schedule.status}, checksum ${schedule.checksum.value.slice(0, 16)}…\n` +
        (notes.length > 0 ? `${notes.join('\n')}\n` : '') +
        `${SAFETY_EPILOGUE}\n`,
    );
  }
  return recheckPassed === false ? EXIT.failed : EXIT.ok;
}

export const command: CommandModule = makeExportCommand({});
