/**
 * What mathjs costs on the paths that load it (issue: every dependency earns its place). Whole-process
 * figures of the built CLI (run `npm run build` first), each pair run alternately so that a noisy spell
 * hits both, median of RUNS:
 * - `build --models` with a plan whose SIMC τc is a number, and the same plan with τc as an expression
 *   of speed (compiled with mathjs, loaded from dist/cli/mathjs.bundle.js);
 * - `inspect` of one log with its speed column declared in km/h (built-in unit) and in mi/h (mathjs).
 * `speedband --help` and a build without expressions never load mathjs (test/cli/bundle.test.ts);
 * their times are in cli-startup.bench.ts and build.bench.ts.
 */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { measureProcess, printFigure } from './measure.js';

const VAN = 'vehicles/parcel-van';
const LOG = join(VAN, 'logs', 'synthetic-steps-10.00mps.csv');
const RUNS = 9;
const work = mkdtempSync(join(tmpdir(), 'speedband-bench-mathjs-'));
const models = join(work, 'models.json');
measureProcess(process.execPath, ['bin/speedband.js', 'identify', '--vehicle', VAN, '--logs', join(VAN, 'logs'), '--out', models]);
const plan = (tau: number | string): string => {
  const path = join(work, `plan-${typeof tau}.json`);
  writeFileSync(path, JSON.stringify({ loop: { kind: 'yaw-rate' }, rule: { name: 'simc', parameters: { simcClosedLoopTimeConstant_s: tau } } }));
  return path;
};
const pairs: readonly (readonly [string, readonly string[], string, readonly string[]])[] = [
  [
    'build --models, plan τc = 0.2 s',
    ['build', '--vehicle', VAN, '--models', models, '--plan', plan(0.2), '--out', join(work, 'number.json'), '--force'],
    'build --models, plan τc = "max(0.2, 0.02 * speed_mps)"',
    ['build', '--vehicle', VAN, '--models', models, '--plan', plan('max(0.2, 0.02 * speed_mps)'), '--out', join(work, 'expression.json'), '--force'],
  ],
  [
    'inspect one log, speed in km/h (built-in)',
    ['inspect', LOG, '--column', 'speed_mps=speed_mps:km/h'],
    'inspect one log, speed in mi/h (mathjs)',
    ['inspect', LOG, '--column', 'speed_mps=speed_mps:mi/h'],
  ],
];
const median = (values: number[]): number => [...values].sort((p, q) => p - q)[Math.floor(values.length / 2)];
for (const [withoutLabel, withoutArgs, withLabel, withArgs] of pairs) {
  const without: number[] = [];
  const withMathjs: number[] = [];
  for (let k = 0; k < RUNS; k += 1) {
    without.push(measureProcess(process.execPath, ['bin/speedband.js', ...withoutArgs]).wall_ms);
    withMathjs.push(measureProcess(process.execPath, ['bin/speedband.js', ...withArgs]).wall_ms);
  }
  printFigure(`${withoutLabel}, median of ${RUNS}`, median(without), 'ms');
  printFigure(`${withLabel}, median of ${RUNS}`, median(withMathjs), 'ms');
  printFigure('  difference (mathjs loaded and used)', median(withMathjs) - median(without), 'ms');
}
rmSync(work, { recursive: true, force: true });
