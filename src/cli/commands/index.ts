import type { AnyCommand } from '../command.js';
import { command as makeTestLogs } from './make-test-logs.js';
import { command as inspect } from './inspect.js';
import { command as identify } from './identify.js';
import { command as exportSchedule } from './export.js';
import { command as tune } from './tune.js';
import { command as stability } from './stability.js';
import { command as compare } from './compare.js';
import { command as build } from './build.js';
import { command as check } from './check.js';
import { command as demo } from './demo.js';
import { command as reverify } from './reverify.js';
import { command as plan } from './plan.js';
import { command as report } from './report.js';
import { command as simulate } from './simulate.js';

/**
 * Every command of the CLI, in the order `--help` lists them (the pipeline's order).
 * Add a command: write `src/cli/commands/<name>.ts` exporting `command = defineCommand({ … })`
 * and add it here. Keep command modules cheap to import (no mathjs at top level):
 * `speedband --help` must stay under 300 ms.
 */
export const COMMANDS: readonly AnyCommand[] = [
  demo,
  inspect,
  identify,
  tune,
  stability,
  plan,
  build,
  check,
  simulate,
  reverify,
  exportSchedule,
  report,
  compare,
  makeTestLogs,
];
