/**
 * `npm run bench [-- NAME]`: runs every bench/*.bench.ts (or those whose name contains NAME) in its own
 * process (so start-up cost and peak memory are each file's own), prints what each reports and writes
 * the figures, with the machine they were measured on, to bench/results.md — the one place benchmark
 * figures are kept (never copied by hand into the guides). A run of some files replaces only their sections.
 * Figures, not pass/fail: the targets live in the issues and the closing notes.
 */
import { execFileSync } from 'node:child_process';
import { existsSync, readdirSync, readFileSync } from 'node:fs';
import { cpus, loadavg, totalmem } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { INTERRUPT_BUDGET_FLAG } from '../src/cli/v8-tiering.js';
import { writeFileAtomic } from '../src/core/files.js';

const here = dirname(fileURLToPath(import.meta.url));
const resultsPath = join(here, 'results.md');
const only = process.argv[2];
const files = readdirSync(here)
  .filter((name) => name.endsWith('.bench.ts') && (only === undefined || name.includes(only)))
  .sort();

/** The sections of an existing results file, by bench file name. */
function previousSections(): Map<string, string> {
  const sections = new Map<string, string>();
  if (!existsSync(resultsPath)) return sections;
  const parts = readFileSync(resultsPath, 'utf8').split(/^## /m).slice(1);
  for (const part of parts) sections.set(part.slice(0, part.indexOf('\n')).trim(), `## ${part.trimEnd()}\n`);
  return sections;
}

const machine = `${cpus().length} × ${cpus()[0]?.model ?? 'unknown CPU'}, ${(totalmem() / 2 ** 30).toFixed(1)} GiB, Node ${process.version}`;
const sections = previousSections();
for (const name of files) {
  process.stdout.write(`\n== ${name} ==\n`);
  const load = loadavg()[0].toFixed(1);
  let output: string;
  try {
    // With V8's tiering as the CLI sets it (src/cli/v8-tiering.ts): the figures are those a user's run sees.
    output = execFileSync(process.execPath, [INTERRUPT_BUDGET_FLAG, '--import', 'tsx', join(here, name)], {
      encoding: 'utf8',
      stdio: ['ignore', 'pipe', 'inherit'],
      maxBuffer: 64 * 2 ** 20,
    });
  } catch (error) {
    // One failing bench does not stop the others; its section says so and the run ends with exit 1.
    const stdout = (error as { stdout?: string }).stdout ?? '';
    output = `${stdout}FAILED: ${error instanceof Error ? error.message.split('\n')[0] : String(error)}\n`;
    process.exitCode = 1;
  }
  process.stdout.write(output);
  const measured = `${new Date().toISOString().slice(0, 16).replace('T', ' ')} UTC on ${machine}, load average ${load} at the start`;
  sections.set(name, `## ${name}\n\nMeasured ${measured}.\n\n\`\`\`\n${output.trimEnd()}\n\`\`\`\n`);
}
const header = [
  '# Benchmark figures',
  '',
  'Written by `npm run bench` (bench/run.ts) — do not edit by hand. Each section says when and on what machine it was',
  'measured; a shared machine varies ±20 % from run to run, so compare versions with interleaved runs.',
  '',
].join('\n');
const body = [...sections.keys()]
  .sort()
  .map((name) => sections.get(name))
  .join('\n');
writeFileAtomic(resultsPath, `${header}\n${body}`, { force: true });
process.stdout.write(`\nwrote ${resultsPath}\n`);
