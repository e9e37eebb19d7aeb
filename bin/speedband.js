#!/usr/bin/env node
// The speedband command. All logic lives in the library (dist/, built from src/ by `npm ci` or `npm run build`).
import { runCli } from '../dist/cli/main.js';

process.exitCode = await runCli(process.argv.slice(2));
