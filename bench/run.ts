/**
 * `npm run bench`: runs every bench/*.bench.ts in its own process (so start-up
 * cost and peak memory are each file's own) and prints what each reports.
 * Figures, not pass/fail: the targets live in the issues and the closing notes.
 */
import { execFileSync } from 'node:child_process';
import { readdirSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const here = dirname(fileURLToPath(import.meta.url));
const only = process.argv[2];
const files = readdirSync(here)
  .filter((name) => name.endsWith('.bench.ts') && (only === undefined || name.includes(only)))
  .sort();
for (const name of files) {
  process.stdout.write(`\n== ${name} ==\n`);
  execFileSync(process.execPath, ['--import', 'tsx', join(here, name)], { stdio: 'inherit' });
}
