import { SpeedbandError } from '../../core/errors.js';
import type { Argv } from 'yargs';
import { defineCommand } from '../command.js';
import { EXIT } from '../io.js';

function builder(yargs: Argv) {
  return yargs
    .option('default', { type: 'boolean', default: false, describe: 'Print the default plan (required: the only thing this command does today)' })
    .option('loop', { type: 'string', choices: ['yaw-rate', 'heading', 'path'] as const, describe: 'The loop the plan is for (default yaw-rate)' });
}

/** `speedband plan --default`: the default plan as a plan file, to start from or to read. */
export const command = defineCommand({
  command: 'plan',
  describe:
    'Print the default plan in full as a plan file (JSON): the loop, rule, breakpoints, interpolation, controller, limits and check a build uses without --plan',
  builder,
  epilogue:
    'The plan printed, given to `speedband build --plan`, builds what no plan builds. Fields whose default the data decide (speed range, sample time, latency) are left out ' +
    'and named in its "description". Every field with its unit, default and source: docs/plan.md in the speedband package.',
  exitCodes: [
    [0, 'the plan was printed'],
    [2, 'bad usage'],
  ],
  examples: [
    ['speedband plan --default > plan.json', 'Start a plan from the defaults, then edit it'],
    ['speedband plan --default --loop path', 'The defaults for a path loop'],
  ],
  run: async (args, io) => {
    if (!args.default) {
      throw new SpeedbandError('cli.missingOption', 'nothing to do: `speedband plan --default [--loop KIND]` prints the default plan');
    }
    const { defaultPlanFile } = await import('../../schedule/default-plan.js');
    const plan = defaultPlanFile(args.loop);
    io.stdout(`${JSON.stringify(plan, null, 2)}\n`);
    return EXIT.ok;
  },
});
