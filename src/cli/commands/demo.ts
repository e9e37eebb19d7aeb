import type { Argv } from 'yargs';
import { defineCommand, type OptionsOf } from '../command.js';
import { EXIT, type CommandIo } from '../io.js';
import { commandPrefix } from '../invocation.js';
import { BUNDLED_VEHICLES, shownPath } from '../../vehicle/bundled.js';
import { join } from 'node:path';

function builder(yargs: Argv) {
  return yargs
    .option('out', { type: 'string', default: 'speedband-demo', describe: 'Folder for models.json, schedule.json, schedule.h and schedule.csv' })
    .option('vehicle', {
      type: 'string',
      default: 'parcel-van',
      describe:
        'Bundled demo vehicle: parcel-van, parcel-van-loaded, vineyard-sprayer or sidewalk-robot (any command takes these names as --vehicle, from any folder)',
    })
    .option('force', { type: 'boolean', default: false, describe: 'Replace existing files in the folder whose content differs' });
}

type Args = OptionsOf<typeof builder>;

/** `speedband demo`: the main job on a bundled demo vehicle, end to end, into one folder. */
async function run(args: Args, io: CommandIo): Promise<number> {
  const { runDemo } = await import('../../pipeline/demo.js');
  const { formatSchedule, formatCautions } = await import('../../pipeline/schedule-report.js');
  const outDir = args.out;
  const vehicle = args.vehicle;
  io.stderr(`speedband demo: building a schedule for the bundled demo vehicle "${vehicle}" (invented data, for demonstration only)…\n`);
  const result = await runDemo({ vehicle, outDir, force: args.force, progress: io.progress });
  const lines: string[] = [];
  lines.push(formatSchedule(result.build.schedule));
  lines.push(`Re-checked independently from the written schedule: ${result.recheck.passed ? 'PASSED' : 'FAILED'} at ${result.recheck.points.length} speeds.`);
  lines.push('', `Everything went to ${outDir}/:`);
  for (const file of result.files)
    lines.push(`  ${file.path.padEnd(Math.max(...result.files.map((f) => f.path.length)))}  ${file.what}${file.outcome === 'unchanged' ? ' (unchanged)' : ''}`);
  // Commands that run where they are printed: the vehicle by its bundled name, the logs by a path from here.
  const speedband = commandPrefix();
  const loadedLogs = shownPath(join(BUNDLED_VEHICLES, 'parcel-van-loaded', 'logs'));
  lines.push(
    '',
    'Next:',
    `  ${speedband} check ${outDir}/schedule.json --vehicle ${vehicle}`,
    `  ${speedband} export ${outDir}/schedule.json --format c --q-format Q16.16 --out ${outDir}/schedule_q16.h`,
    ...(vehicle === 'parcel-van'
      ? [
          '  After a vehicle change (the same van loaded heavier, new rear tyres):',
          `  ${speedband} build --vehicle parcel-van-loaded --logs ${loadedLogs} --baseline ${outDir}/schedule.json --out ${outDir}/loaded-schedule.json`,
          `  ${speedband} compare ${outDir}/schedule.json ${outDir}/loaded-schedule.json`,
        ]
      : []),
    '',
  );
  io.stdout(`${lines.join('\n')}${formatCautions()}`);
  return result.build.schedule.status === 'passed' && result.recheck.passed ? EXIT.ok : EXIT.failed;
}

export const command = defineCommand({
  command: 'demo',
  describe: 'Run the whole job on a bundled demo vehicle (invented data): identify, build, check, export C and CSV into one folder',
  builder,
  exitCodes: [
    [0, 'the demo schedule passed its dense check and the independent re-check'],
    [1, 'it failed one of them (the files are still written, the schedule marked failed)'],
    [2, 'bad input: unknown demo vehicle, an output folder that cannot be written'],
  ],
  examples: [
    ['speedband demo', 'The parcel van, into ./speedband-demo'],
    ['speedband demo --vehicle vineyard-sprayer --out sprayer-demo', 'The sprayer with its slow hydraulic steering'],
  ],
  run,
});
