import type { Argv } from 'yargs';
import { defineCommand, type OptionsOf } from '../command.js';
import { EXIT, type CommandIo } from '../io.js';
import { checkModelFromArgs, modelInputPaths } from '../check-model-args.js';
import { withLogColumnOptions } from '../log-columns.js';

function builder(yargs: Argv) {
  return withLogColumnOptions(yargs)
    .positional('schedule', { type: 'string', demandOption: true, describe: 'The edited schedule.json' })
    .option('vehicle', { type: 'string', demandOption: true, describe: 'Vehicle file (vehicle.json) or its folder: mass, inertia and geometry' })
    .option('models', { type: 'string', describe: 'Check on this identification (models.json); default: the model the schedule records' })
    .option('logs', { type: 'array', string: true, describe: 'Check on a fresh identification from these step-test logs' })
    .option('out', {
      type: 'string',
      demandOption: true,
      describe: 'Where to write the re-verified schedule (never the edited file itself: inputs are never outputs)',
    })
    .option('force', { type: 'boolean', default: false, describe: 'Replace an existing --out file whose content differs' })
    .option('json', { type: 'boolean', default: false, describe: 'Print the result as JSON' });
}

type Args = OptionsOf<typeof builder>;

/**
 * `speedband reverify`: the supported path for a deliberate hand edit of a schedule. The edited file
 * (its checksum no longer matches, so check and export refuse it) is re-checked densely on a vehicle
 * model; only when that passes is it written to --out with the figures of this check, a record that
 * it was edited by hand and re-verified, and a fresh checksum (src/pipeline/reverify.ts).
 */
async function run(args: Args, io: CommandIo): Promise<number> {
  const schedulePath = args.schedule;
  const out = args.out;
  const { checkOutputPaths } = await import('../../core/output-paths.js');
  checkOutputPaths([{ path: out, option: '--out' }], [{ path: schedulePath, role: 'schedule' }, ...(await modelInputPaths(args))]);
  const { readTextFile } = await import('../../core/files.js');
  const { parseJsonText } = await import('../../core/json-text.js');
  const { parseScheduleUnverified, writeSchedule } = await import('../../schedule/schedule-file.js');
  const { reverifySchedule } = await import('../../pipeline/reverify.js');
  const { formatRecheck, formatCautions } = await import('../../pipeline/schedule-report.js');
  const edited = parseScheduleUnverified(parseJsonText(readTextFile(schedulePath), schedulePath), schedulePath);
  const { model, notes, recorded } = await checkModelFromArgs(args, edited, schedulePath, io);
  const variations =
    edited.variations === undefined ? null : await (await import('../../pipeline/robust-recheck.js')).recheckOverVariations({ schedule: edited, model });
  const result = reverifySchedule(edited, model, { modelRecorded: recorded, variations });
  const outcome = result.schedule === null ? null : writeSchedule(out, result.schedule, { force: args.force });

  if (args.json) {
    io.stdout(
      `${JSON.stringify(
        {
          file: result.schedule === null ? null : out,
          outcome,
          changes: result.changes,
          passed: result.passed,
          nominalPassed: result.check.passed,
          variations: result.variations?.record ?? null,
          timeDomainFailures: result.timeDomainFailures,
          model: { kind: model.kind, description: model.description },
          gridSize: result.check.points.length,
          failedSpeeds: result.check.failedCount,
          failures: (await import('../../schedule/dense-check.js')).failingSpeeds(result.check.points),
          worst: result.check.worst,
          checksum: result.schedule?.checksum.value ?? null,
          notes,
        },
        null,
        2,
      )}\n`,
    );
  } else {
    const changed =
      result.changes.length === 0 ? 'no change against the checksum it carries' : `changed by hand since it was written: ${result.changes.join('; ')}`;
    let text = `${schedulePath}: schema valid; ${changed}\n${notes.map((note) => `${note}\n`).join('')}`;
    text += formatRecheck(`model: ${model.description}`, result.check, edited, model.kind);
    if (result.variations !== null) {
      const { formatVariations, nominalAtBreakpoints } = await import('../../pipeline/robust-report.js');
      const speeds = edited.breakpoints.map((row) => row.speed_mps);
      text += `\n${formatVariations(result.variations.record, nominalAtBreakpoints(result.check, speeds), edited.check.thresholds)}\n`;
    }
    for (const failure of result.timeDomainFailures) text += `  time domain at ${failure.speed_mps.toFixed(2)} m/s: ${failure.messages.join('; ')}\n`;
    const failedWhat = !result.check.passed
      ? 'its dense check'
      : result.timeDomainFailures.length > 0
        ? 'its time-domain limits'
        : 'the worst case over its variations (robust acceptance)';
    text +=
      result.schedule === null
        ? `Nothing written: the edited schedule fails ${failedWhat} (see above). Undo or change the edit; a schedule that fails is never given a fresh checksum.\n`
        : `${outcome === 'written' ? 'Wrote' : 'Unchanged'} ${out}: re-verified, margins and status from this check, provenance records the hand edit, ` +
          `checksum ${result.schedule.checksum.value.slice(0, 16)}…\n`;
    text += formatCautions();
    io.stdout(text);
  }
  return result.passed ? EXIT.ok : EXIT.failed;
}

export const command = defineCommand({
  command: 'reverify <schedule>',
  describe:
    'Re-verify a schedule.json you edited by hand (check and export refuse it: its checksum no longer matches): dense check of its own gains at every speed of its range; only if it passes, write it to --out with the margins of this check, a record of the hand edit and a fresh checksum. Exit 0 passed and written, 1 failed (nothing written), 2 bad input',
  builder,
  exitCodes: [
    [0, 'the edited schedule passed the dense check and was written with a fresh checksum'],
    [1, 'it failed (nothing written)'],
    [2, 'bad input: unreadable or invalid schedule, vehicle, models or logs; an output path'],
  ],
  examples: [
    ['speedband reverify edited.json --vehicle vehicles/parcel-van --out schedule.json', 'Re-verify a hand-tuned schedule on the model it records'],
    ['speedband reverify edited.json --vehicle van.json --models models.json --out schedule.json', 'Re-verify on an identification'],
  ],
  run,
});
