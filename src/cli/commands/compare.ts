import { COMPARE_DEFAULTS as HELP_DEFAULTS } from '../../compare/defaults.js';
import { SpeedbandError } from '../../core/errors.js';
import type { Argv } from 'yargs';
import { defineCommand, type OptionsOf } from '../command.js';
import { EXIT, type CommandIo } from '../io.js';
import { quoted } from '../../core/quote.js';

function threshold(args: Args, option: keyof Args & string): number | undefined {
  const value = args[option];
  if (value === undefined) return undefined;
  if (typeof value !== 'number' || !Number.isFinite(value) || value < 0) {
    throw new SpeedbandError('cli.badNumber', `--${option} is ${quoted(String(value))} — expected a number ≥ 0`, { details: { option } });
  }
  return value;
}

export const command = defineCommand({
  command: 'compare <old> <new>',
  describe:
    'Compare two schedule.json files after a vehicle change (load, tyres, actuator, firmware rate): gain changes per speed, margins, model drift, settings; exit 1 when something moved past a threshold',
  builder,
  epilogue:
    'First, the key fact of a refit: the OLD gains (with their own loop, controller and limits) densely checked on the vehicle model the NEW schedule records, ' +
    "at the new schedule's check speeds — do they still hold on the changed vehicle, and where not (flagged when they fail). " +
    'Speeds compared: the breakpoints of both schedules within their common range; where a speed is a breakpoint of only one, ' +
    "the other schedule's gains come from its own lookup and its margins are interpolated linearly between its breakpoints. " +
    'A changed loop kind, preview, controller form, sample time or discretisation makes the gains not comparable one by one (said, and flagged). ' +
    'Model drift (cornering stiffnesses, actuator lag and delay, understeer gradient) needs both schedules built from a joint single-track fit. ' +
    'When the new schedule records variations (its plan\'s "variations"), the old and the new gains are also searched for their worst case over that set on the new schedule\'s model at each compared speed; under its robust acceptance the old gains are flagged where they break their limits.',
  exitCodes: [
    [0, 'nothing flagged'],
    [1, 'something moved past a threshold, or the old gains fail on the new vehicle model (flagged): use it to stop a CI pipeline'],
    [2, 'bad input: unreadable, invalid or checksum-failed file, bad option'],
  ],
  examples: [
    ['speedband compare schedule-before.json schedule-after.json', 'Table of gains and margins old → new per speed, model drift, flags; exit 1 when flagged'],
    ['speedband compare old.json new.json --markdown > review.md', 'A Markdown change review with a flag list'],
    ['speedband compare old.json new.json --gain-change-pct 10 --phase-margin-drop-deg 5 --json', 'Tighter limits, JSON output for a CI job'],
  ],
  run: async (args, io) => run(args, io),
});

function builder(yargs: Argv) {
  return yargs
    .positional('old', {
      type: 'string',
      demandOption: true,
      describe: 'The schedule in use (schedule.json written by speedband; schema and checksum are verified)',
    })
    .positional('new', { type: 'string', demandOption: true, describe: 'The schedule built after the change' })
    .option('gain-change-pct', {
      type: 'number',
      describe: `Flag a gain whose change |new − old|/|old| reaches this, % (default ${HELP_DEFAULTS.gainChange_pct}). A gain that was 0 has no percentage: any change from 0 is flagged`,
    })
    .option('gain-margin-drop-dB', {
      type: 'number',
      describe: `Flag an upper gain margin that decreases by this or more, and a lower gain margin (conditionally stable loops) that moves this much closer to 0 dB, dB (default ${HELP_DEFAULTS.gainMarginDrop_dB})`,
    })
    .option('phase-margin-drop-deg', {
      type: 'number',
      describe: `Flag a phase margin that decreases by this or more, degrees (default ${HELP_DEFAULTS.phaseMarginDrop_deg})`,
    })
    .option('speed-tolerance-mps', {
      type: 'number',
      describe: `Breakpoints of the two schedules closer than this are the same speed (builds place breakpoints at measured test speeds), m/s (default ${HELP_DEFAULTS.speedTolerance_mps})`,
    })
    .option('nominal-only', {
      type: 'boolean',
      default: false,
      describe: 'Skip the worst case of the old and new gains over the variations the new schedule records (about a hundred loop analyses per compared speed)',
    })
    .option('json', {
      type: 'boolean',
      default: false,
      describe: 'Print the comparison as JSON (every compared speed, margin, model parameter and flag) for machines',
    })
    .option('markdown', {
      type: 'boolean',
      default: false,
      describe:
        'Print a Markdown report for a change review: whether the old gains hold on the new vehicle, summary, table of gains and margins, model drift, flag list',
    });
}

type Args = OptionsOf<typeof builder>;

async function run(args: Args, io: CommandIo): Promise<number> {
  if (args.json && args.markdown) {
    throw new SpeedbandError('cli.optionConflict', '--json and --markdown both given — choose one output: --json for machines, --markdown for a change review');
  }
  const thresholds = {
    gainChange_pct: threshold(args, 'gain-change-pct'),
    gainMarginDrop_dB: threshold(args, 'gain-margin-drop-dB'),
    phaseMarginDrop_deg: threshold(args, 'phase-margin-drop-deg'),
    speedTolerance_mps: threshold(args, 'speed-tolerance-mps'),
  };
  const given = Object.fromEntries(Object.entries(thresholds).filter(([, value]) => value !== undefined));
  const { readSchedule } = await import('../../schedule/schedule-file.js');
  const { compareSchedules, comparisonText, comparisonMarkdown, resolveThresholds, withVariations } = await import('../../compare/index.js');
  const { oldGainsOnNewVehicle } = await import('../../pipeline/baseline.js');
  const oldName = args.old;
  const newName = args.new;
  resolveThresholds(given); // a bad threshold is bad input before the dense check runs
  const oldSchedule = readSchedule(oldName);
  const newSchedule = readSchedule(newName);
  const nominal = compareSchedules(oldSchedule, newSchedule, given, oldGainsOnNewVehicle(oldSchedule, newSchedule).summary);
  // The old gains over the new vehicle's variations (when the new schedule records them): the robust check's machinery.
  const comparison =
    newSchedule.variations === undefined || args['nominal-only']
      ? nominal
      : withVariations(nominal, (await import('../../pipeline/variations-comparison.js')).compareOverVariations(oldSchedule, newSchedule, nominal.speeds));
  if (args.json) io.stdout(`${JSON.stringify({ files: { old: oldName, new: newName }, ...comparison }, null, 2)}\n`);
  else if (args.markdown) io.stdout(comparisonMarkdown(comparison, oldName, newName));
  else io.stdout(comparisonText(comparison, oldName, newName));
  return comparison.flags.length === 0 ? EXIT.ok : EXIT.failed;
}
