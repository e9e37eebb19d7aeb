#!/usr/bin/env node
// The speedband command. All logic lives in the library (dist/, built from src/ by `npm ci` or `npm run build`);
// the CLI runs from one bundled file, dist/cli/speedband.bundle.js (scripts/bundle-cli.mjs), which starts faster
// than the ~150 modules it is made of. V8's optimising compiler is told to wait for the truly hot functions
// (src/cli/v8-tiering.ts) before that bundle is loaded, so that its functions and its worker threads start with it.
import { setFlagsFromString } from 'node:v8';
import { INTERRUPT_BUDGET_FLAG } from '../dist/cli/v8-tiering.js';

setFlagsFromString(INTERRUPT_BUDGET_FLAG);
const { runCli } = await import('../dist/cli/speedband.bundle.js');
process.exitCode = await runCli(process.argv.slice(2));
