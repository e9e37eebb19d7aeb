#!/usr/bin/env node
// The speedband command. All logic lives in the library (dist/, built from src/ by `npm ci` or `npm run build`);
// the CLI runs from one bundled file, dist/cli/speedband.bundle.js (scripts/bundle-cli.mjs), which starts faster
// than the ~150 modules it is made of.
import { runCli } from '../dist/cli/speedband.bundle.js';

process.exitCode = await runCli(process.argv.slice(2));
