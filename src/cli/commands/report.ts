import { SpeedbandError } from '../../core/errors.js';
import { quoted } from '../../core/quote.js';
import type { Argv } from 'yargs';
import { defineCommand, type OptionsOf } from '../command.js';
import { EXIT, type CommandIo } from '../io.js';
import { reportWords } from '../../pipeline/build-summary.js';
import { logColumnsFromArgs, optionalInputs, withLogColumnOptions } from '../log-columns.js';

/** --response-speed-mps values as numbers; anything else is bad input. */
export function responseSpeedsFromArgs(args: { readonly 'response-speed-mps'?: readonly (string | number)[] }): number[] | undefined {
  const given = args['response-speed-mps'];
  if (given === undefined) return undefined;
  return given.map((value) => {
    const speed = typeof value === 'number' ? value : String(value).trim() === '' ? Number.NaN : Number(value);
    if (!Number.isFinite(speed) || speed <= 0)
      throw new SpeedbandError('cli.badNumber', `--response-speed-mps is ${quoted(String(value))} — expected a speed > 0 in m/s inside the schedule's range`);
    return speed;
  });
}

function builder(yargs: Argv) {
  return withLogColumnOptions(yargs)
    .positional('schedule', { type: 'string', demandOption: true, describe: 'schedule.json written by speedband build (schema and checksum are verified)' })
    .option('out', {
      type: 'string',
      demandOption: true,
      describe: 'report.html to write (atomically; no network, fonts or scripts needed to read it; prints on A4 and Letter)',
    })
    .option('models', {
      type: 'string',
      describe:
        'The identification the schedule was built from (models.json; checked by the SHA-256 of its vehicle file and logs): adds the identified parameters against speed with their intervals and the single-track prediction',
    })
    .option('logs', {
      type: 'array',
      string: true,
      describe:
        'The logs of that identification (files or folders; each checked by SHA-256 against models.json): adds the fits over the measured steps with residuals. Needs --models',
    })
    .option('baseline', {
      type: 'string',
      describe: "A previous schedule.json: the report leads with whether ITS gains still hold on this schedule's vehicle model, and draws old against new",
    })
    .option('response-speed-mps', {
      type: 'array',
      string: true,
      describe: 'Speeds of the Bode and Nyquist plots, m/s (repeatable; default: the lowest and highest breakpoint and the speed of the smallest phase margin)',
    })
    .option('force', { type: 'boolean', default: false, describe: 'Replace an existing report whose content differs' })
    .option('json', { type: 'boolean', default: false, describe: "Print what was written as JSON (file, outcome, bytes, sections, the old gains' verdict)" });
}

type Args = OptionsOf<typeof builder>;

/**
 * `speedband report`: one self-contained HTML file of a schedule for sign-off and review — plots of the gains
 * and margins against speed, the open loop at chosen speeds, with --models the identified models, with --logs
 * the fits over the measured steps, with --baseline the old gains on the new vehicle.
 */
async function run(args: Args, io: CommandIo): Promise<number> {
  const { checkOutputPaths } = await import('../../core/output-paths.js');
  const { expandLogPaths } = await import('../../identify/identify-from-logs.js');
  const schedulePath = args.schedule;
  const out = args.out;
  const logPaths = args.logs ?? [];
  const responseSpeeds_mps = responseSpeedsFromArgs(args);
  checkOutputPaths(
    [{ path: out, option: '--out' }],
    [
      { path: schedulePath, role: 'schedule' },
      ...(logPaths.length === 0 ? [] : expandLogPaths(logPaths)).map((path) => ({ path, role: 'log' })),
      ...optionalInputs(args, [
        ['models', 'models file'],
        ['baseline', 'baseline schedule'],
        ['log-profile', 'log profile'],
      ]),
    ],
  );
  const { readSchedule } = await import('../../schedule/schedule-file.js');
  const { readModels } = await import('../../identify/models-file.js');
  const { gatherReportData } = await import('../../report/report-data.js');
  const { writeReport } = await import('../../report/write-report.js');
  const schedule = readSchedule(schedulePath);
  const baselinePath = args.baseline;
  const modelsPath = args.models;
  const columns = await logColumnsFromArgs(args);
  const data = gatherReportData({
    schedule,
    scheduleFile: schedulePath,
    ...(modelsPath === undefined ? {} : { models: { file: modelsPath, content: readModels(modelsPath) } }),
    ...(logPaths.length === 0 ? {} : { logs: { paths: logPaths, ...(columns === undefined ? {} : { readOptions: { columns } }) } }),
    ...(baselinePath === undefined ? {} : { baseline: { file: baselinePath, schedule: readSchedule(baselinePath) } }),
    ...(responseSpeeds_mps === undefined ? {} : { responseSpeeds_mps }),
  });
  const { outcome, bytes, sections } = await writeReport(out, data, { force: args.force });
  if (args.json) {
    const oldGains = data.baseline?.oldGainsOnNewVehicle ?? null;
    io.stdout(`${JSON.stringify({ file: out, outcome, bytes, sections, scheduleStatus: schedule.status, oldGainsOnNewVehicle: oldGains }, null, 2)}\n`);
  } else {
    const lead = data.baseline === null ? '' : `${data.baseline.lead}\n`;
    io.stdout(`${lead}${reportWords(out, outcome, bytes, sections)}`);
  }
  return EXIT.ok;
}

export const command = defineCommand({
  command: 'report <schedule>',
  describe:
    'Write one self-contained HTML report of a schedule for sign-off and review: gains and margins against speed, time-domain figures and closed-loop responses, Bode and Nyquist plots, identified models and step fits, the old gains on a changed vehicle',
  builder,
  epilogue:
    'The margins are drawn from the dense check re-run on the model the schedule records (the same grid, gains, loop, controller and limits); the tables hold the numbers of schedule.json itself, ' +
    'each exact in a <data value> element. The same inputs give a byte-identical report. It is a record for review, not a verification: check and export decide.',
  exitCodes: [
    [0, "the report was written (or was already there, identical) — whatever the schedule's status: the report says it"],
    [
      2,
      'bad input: unreadable, invalid or edited schedule, models of another build, a log not in models.json, a speed outside the range, an output path that is an input (nothing written)',
    ],
  ],
  examples: [
    ['speedband report schedule.json --out report.html', 'Gains, margins and the open loop from the schedule alone'],
    [
      'speedband report schedule.json --models models.json --logs vehicles/parcel-van/logs --out report.html',
      'With the identification and the fits over the measured steps',
    ],
    [
      'speedband report new-schedule.json --baseline old-schedule.json --out change-review.html',
      'After a vehicle change: do the old gains still hold, and where not?',
    ],
  ],
  run,
});
