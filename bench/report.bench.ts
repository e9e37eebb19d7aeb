/**
 * The HTML report's benchmark (issue: a report an engineer would rather look at than read). Figures:
 * - whole-process `speedband report` of the parcel van's schedule (built CLI), from the schedule alone and with
 *   its models and logs (the fits over the steps), and of its path loop; target < 1.5 s;
 * - the size of the HTML file, with everything drawn and after the vehicle change with a baseline; target < 3 MB;
 * - `speedband --help` start-up with the report command in the CLI (bench/cli-startup.bench.ts has the target:
 *   unchanged — the renderer and d3 are a chunk loaded by the report path only).
 * Median of several runs with the fastest beside it (the machine is shared and noisy). Run `npm run build` first.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { measureProcess, printFigure } from './measure.js';

const RUNS = 7;
const work = mkdtempSync(join(tmpdir(), 'speedband-bench-report-'));
const cli = (...args: string[]) => measureProcess(process.execPath, ['bin/speedband.js', ...args]);
const schedule = join(work, 'schedule.json');
const models = join(work, 'models.json');
const loaded = join(work, 'loaded.json');
cli('build', '--vehicle', 'parcel-van', '--logs', 'vehicles/parcel-van/logs', '--out', schedule, '--models-out', models);
const sorted = (runs: { wall_ms: number }[]) => runs.map((run) => run.wall_ms).sort((p, q) => p - q);

const plain: { wall_ms: number }[] = [];
const full: { wall_ms: number; peakMemory_MB: number | null }[] = [];
for (let k = 0; k < RUNS; k++) {
  plain.push(cli('report', schedule, '--out', join(work, `plain-${k}.html`)));
  full.push(cli('report', schedule, '--models', models, '--logs', 'vehicles/parcel-van/logs', '--out', join(work, `full-${k}.html`)));
}
printFigure(`report, parcel van, schedule alone (median of ${RUNS})`, sorted(plain)[RUNS >> 1], 'ms', '< 1500 ms');
printFigure('  fastest run', sorted(plain)[0], 'ms');
printFigure(`report, parcel van, with models and logs (median of ${RUNS})`, sorted(full)[RUNS >> 1], 'ms', '< 1500 ms');
printFigure('  fastest run', sorted(full)[0], 'ms');
printFigure('  peak memory', full[0].peakMemory_MB ?? Number.NaN, 'MB');
printFigure('report HTML, with models and logs', statSync(join(work, 'full-0.html')).size / 1024 / 1024, 'MB', '< 3 MB');

// The path loop (the default path plan): its time-domain section draws the lane change and curve entry.
const pathSchedule = join(work, 'path.json');
writeFileSync(join(work, 'path-plan.json'), JSON.stringify({ loop: { kind: 'path' } }));
cli('build', '--vehicle', 'parcel-van', '--models', models, '--plan', join(work, 'path-plan.json'), '--out', pathSchedule);
const paths: { wall_ms: number }[] = [];
for (let k = 0; k < RUNS; k++)
  paths.push(cli('report', pathSchedule, '--models', models, '--logs', 'vehicles/parcel-van/logs', '--out', join(work, `path-${k}.html`)));
printFigure(`report, parcel van path loop, with models and logs (median of ${RUNS})`, sorted(paths)[RUNS >> 1], 'ms', '< 1500 ms');
printFigure('report HTML, path loop with models and logs', statSync(join(work, 'path-0.html')).size / 1024 / 1024, 'MB', '< 3 MB');

// After the change: the loaded van's build with the van's schedule as the baseline and everything drawn.
const change = join(work, 'change.html');
try {
  cli('build', '--vehicle', 'parcel-van-loaded', '--logs', 'vehicles/parcel-van-loaded/logs', '--baseline', schedule, '--out', loaded, '--report', change);
} catch {
  // exit 1: the old gains fail on the loaded van (the schedule and its report are written)
}
printFigure('report HTML, loaded van against the van (build --report)', statSync(change).size / 1024 / 1024, 'MB', '< 3 MB');

// compare now leads with the old gains densely checked on the new schedule's model (the 209 speeds of its check).
const compares: { wall_ms: number }[] = [];
for (let k = 0; k < RUNS; k++) {
  const started = process.hrtime.bigint();
  spawnSync(process.execPath, ['bin/speedband.js', 'compare', schedule, loaded, '--markdown'], { stdio: 'ignore' }); // exit 1: flagged
  compares.push({ wall_ms: Number(process.hrtime.bigint() - started) / 1e6 });
}
printFigure(`compare van → loaded van with the old gains' check (median of ${RUNS})`, sorted(compares)[RUNS >> 1], 'ms');
