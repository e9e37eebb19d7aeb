/**
 * Identification speed. Whole-process figures run the built CLI (`npm run build` first).
 * 1. The demo van's logs (vehicles/parcel-van/logs): `speedband identify`, whole process.
 * 2. A one-hour log with about 200 steps, generated here (synthetic: 25 blocks of 8 steps
 *    from the exact simulator at five speeds, with straight driving between blocks), whole process.
 * 3. In-process step fits per second (FOPDT + two second-order fits per step).
 */
import { mkdtempSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { IDENTIFY_DEFAULTS } from '../src/identify/defaults.js';
import { identifyStep } from '../src/identify/identify-step.js';
import { fitFopdt } from '../src/identify/fit-fopdt.js';
import { yawSignals } from '../src/identify/step-signals.js';
import { readSteerLog } from '../src/log/read.js';
import { findStepTests } from '../src/log/segment.js';
import { loadVehicle } from '../src/vehicle/load.js';
import { generateTestLog } from '../src/vehicle/test-logs.js';
import { spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { measureProcess, printFigure, timeMs } from './measure.js';

/** CPU time (user + system, ms) of a whole command, from GNU time; NaN where /usr/bin/time is absent. Wall time on a shared machine includes waiting. */
function processCpu_ms(command: string, args: readonly string[]): number {
  if (!existsSync('/usr/bin/time')) return Number.NaN;
  const result = spawnSync('/usr/bin/time', ['-f', 'cpu=%U+%S', command, ...args], { encoding: 'utf8', stdio: ['ignore', 'ignore', 'pipe'] });
  const match = /cpu=([\d.]+)\+([\d.]+)/.exec(result.stderr ?? '');
  return match ? 1000 * (Number(match[1]) + Number(match[2])) : Number.NaN;
}

const VEHICLE = 'vehicles/parcel-van';
const folder = mkdtempSync(join(tmpdir(), 'speedband-bench-identify-'));
try {
  const demoLogs = readdirSync(join(VEHICLE, 'logs'))
    .filter((name) => name.endsWith('.csv'))
    .sort()
    .map((name) => join(VEHICLE, 'logs', name));
  const steps = demoLogs.flatMap((file) => findStepTests(readSteerLog(file), { maxSteerAngle_rad: loadVehicle(VEHICLE).maxSteerAngle_rad }).steps);
  const samples = steps.reduce((sum, s) => sum + s.time_s.length, 0);
  process.stdout.write(`demo van: ${demoLogs.length} logs, ${steps.length} steps, ${Math.round(samples / steps.length)} samples per step on average\n`);

  const demoRuns = Array.from({ length: 3 }, () =>
    measureProcess(process.execPath, [
      'bin/speedband.js',
      'identify',
      '--vehicle',
      VEHICLE,
      '--logs',
      ...demoLogs,
      '--out',
      join(folder, 'demo.json'),
      '--force',
    ]),
  );
  const demoWalls = demoRuns.map((r) => r.wall_ms).sort((a, b) => a - b);
  printFigure('identify, demo van logs, whole process (median of 3)', demoWalls[1], 'ms', '< 1000 ms');
  printFigure('identify, demo van logs, peak memory', demoRuns[1].peakMemory_MB ?? NaN, 'MB');
  const demoArgs = ['bin/speedband.js', 'identify', '--vehicle', VEHICLE, '--logs', ...demoLogs, '--out', join(folder, 'demo.json'), '--force'];
  printFigure('identify, demo van logs, whole-process CPU time (user + system)', processCpu_ms(process.execPath, demoArgs), 'ms');
  const halfLogs = demoLogs.filter((_, i) => i % 2 === 0);
  const halfArgs = ['bin/speedband.js', 'identify', '--vehicle', VEHICLE, '--logs', ...halfLogs, '--out', join(folder, 'half.json'), '--force'];
  const half = measureProcess(process.execPath, halfArgs);
  printFigure(`identify, ${halfLogs.length} of the demo logs (about 40 steps), whole process`, half.wall_ms, 'ms', '< 1000 ms');
  printFigure(`identify, ${halfLogs.length} of the demo logs, whole-process CPU time`, processCpu_ms(process.execPath, halfArgs), 'ms');

  // One-hour log: blocks of 8 steps with straight driving in between, time continuous.
  const vehicle = loadVehicle(VEHICLE);
  const speeds = [4, 8, 12, 16, 20];
  const blocks = 25;
  const blockPeriod_s = 3600 / blocks;
  const lines: string[] = [];
  let header = '';
  for (let b = 0; b < blocks; b++) {
    const log = generateTestLog(vehicle, speeds[b % speeds.length], { seed: 100 + b });
    const rows = log.csv.trim().split('\n');
    header = rows[0];
    const start_s = b * blockPeriod_s;
    let last_s = 0;
    for (const row of rows.slice(1)) {
      const cells = row.split(',');
      last_s = Number(cells[0]);
      cells[0] = (start_s + last_s).toFixed(2);
      lines.push(cells.join(','));
    }
    // straight driving at zero steer until the next block
    const lastCells = rows[rows.length - 1].split(',');
    for (let t = last_s + 0.02; t < blockPeriod_s - 0.01; t += 0.02) {
      lines.push([(start_s + t).toFixed(2), lastCells[1], '0.00000', '0.00000', '0.00000', '0.000'].join(','));
    }
  }
  const hourLog = join(folder, 'one-hour.csv');
  writeFileSync(hourLog, `${header}\n${lines.join('\n')}\n`);
  const hourSteps = findStepTests(readSteerLog(hourLog), { maxSteerAngle_rad: vehicle.maxSteerAngle_rad }).steps.length;
  process.stdout.write(`one-hour log: ${lines.length} rows, ${hourSteps} steps\n`);
  const hour = measureProcess(process.execPath, [
    'bin/speedband.js',
    'identify',
    '--vehicle',
    VEHICLE,
    '--logs',
    hourLog,
    '--out',
    join(folder, 'hour.json'),
    '--force',
  ]);
  printFigure('identify, one-hour log, whole process', hour.wall_ms, 'ms', '< 10000 ms');
  printFigure('identify, one-hour log, peak memory', hour.peakMemory_MB ?? NaN, 'MB', '< 500 MB');
  printFigure(
    'identify, one-hour log, whole-process CPU time',
    processCpu_ms(process.execPath, ['bin/speedband.js', 'identify', '--vehicle', VEHICLE, '--logs', hourLog, '--out', join(folder, 'hour.json'), '--force']),
    'ms',
  );

  // In-process fit rates (after one warm-up pass).
  for (const step of steps.slice(0, 5)) identifyStep(step, IDENTIFY_DEFAULTS);
  const fopdtMs = await timeMs(() => {
    for (const step of steps) fitFopdt(yawSignals(step));
  });
  printFigure('FOPDT step fits per second (in process)', (1000 * steps.length) / fopdtMs, 'fits/s');
  const allMs = await timeMs(() => {
    for (const step of steps) identifyStep(step, IDENTIFY_DEFAULTS);
  });
  printFigure('steps identified per second (FOPDT + 2 second-order fits)', (1000 * steps.length) / allMs, 'steps/s');
  printFigure('model fits per second, all structures', (3000 * steps.length) / allMs, 'fits/s');
} finally {
  rmSync(folder, { recursive: true, force: true });
}
