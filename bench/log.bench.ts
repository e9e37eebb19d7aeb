/**
 * Log stage benchmark: a one-hour 100 Hz log (360,000 rows, six channels) with
 * step manoeuvres at varying speeds, generated here in a temporary folder (not
 * committed). Figures:
 * - whole process `speedband inspect LOG --json` (built CLI: read + validate +
 *   segment + metrics), wall time and peak memory; target < 2 s and < 400 MB;
 * - in-process: reading (our parser) vs csv-parse on the same text, and segmentation.
 */
import { mkdtempSync, readFileSync, rmSync, writeFileSync, existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { parse } from 'csv-parse/sync';
import { makeRandom } from '../src/core/random.js';
import { parseSteerLog } from '../src/log/read.js';
import { findStepTests } from '../src/log/segment.js';
import { measureProcess, printFigure, timeMs } from './measure.js';

const RATE_Hz = 100;
const DURATION_s = 3600;

/** A first-order-plus-delay yaw response (τ 0.3 s, θ 0.1 s, gain growing with speed) to step manoeuvres: left/right × two amplitudes at each speed, speed changes between blocks. */
function oneHourLog(): { text: string; plannedSteps: number } {
  const random = makeRandom(2026);
  const n = RATE_Hz * DURATION_s;
  const dt = 1 / RATE_Hz;
  const lines: string[] = ['time_s,speed_mps,steer_cmd_rad,steer_angle_rad,yaw_rate_radps,lat_accel_mps2'];
  const amplitudes_rad = [0.02, -0.02, 0.01, -0.01];
  const blockSamples = Math.round((2 + amplitudes_rad.length * 8) * RATE_Hz); // 2 s speed change + per amplitude 0.15 s ramp, ≈4.5 s hold, ≈3.35 s at zero
  let speed = 5;
  let target = 5;
  let command = 0;
  let yawState = 0;
  const delaySamples = Math.round(0.1 * RATE_Hz);
  const history = new Float64Array(delaySamples + 1);
  let plannedSteps = 0;
  for (let i = 0; i < n; i += 1) {
    const t = i * dt;
    const inBlock = i % blockSamples;
    if (inBlock === 0) target = 3 + 17 * random.uniform();
    // Speed moves to the block's target in the first 2 s of each block; steering is at zero then.
    speed += inBlock < 2 * RATE_Hz ? (target - speed) * 0.02 : 0;
    const manoeuvre = inBlock - 2 * RATE_Hz;
    let level = 0;
    if (manoeuvre >= 0) {
      const k = Math.floor(manoeuvre / (8 * RATE_Hz));
      const within = manoeuvre - k * 8 * RATE_Hz;
      if (k < amplitudes_rad.length) {
        const ramp = 0.15 * RATE_Hz;
        if (within === 1) plannedSteps += 1;
        if (within === 1 + Math.round(4.65 * RATE_Hz)) plannedSteps += 1;
        if (within < 4.65 * RATE_Hz) level = amplitudes_rad[k] * Math.min(1, within / ramp);
        else level = amplitudes_rad[k] * Math.max(0, 1 - (within - 4.65 * RATE_Hz) / ramp);
      }
    }
    command = level;
    history.copyWithin(0, 1);
    history[delaySamples] = command;
    const gain = speed / (3 + 0.004 * speed * speed);
    const alpha = dt / (0.3 + dt);
    yawState += alpha * (gain * history[0] - yawState);
    const yaw = yawState + 0.001 * random.normal();
    lines.push(
      `${t.toFixed(2)},${(speed + 0.01 * random.normal()).toFixed(3)},${command.toFixed(5)},${(command + 0.0003 * random.normal()).toFixed(5)},${yaw.toFixed(5)},${(speed * yawState + 0.03 * random.normal()).toFixed(3)}`,
    );
  }
  return { text: `${lines.join('\n')}\n`, plannedSteps };
}

const folder = mkdtempSync(join(tmpdir(), 'speedband-log-bench-'));
try {
  const { text, plannedSteps } = oneHourLog();
  const path = join(folder, 'one-hour-100Hz.csv');
  writeFileSync(path, text);
  printFigure('one-hour 100 Hz log: rows', DURATION_s * RATE_Hz, 'rows');
  printFigure('one-hour 100 Hz log: size', text.length / 1e6, 'MB');

  if (existsSync('dist/cli/commands/inspect.js')) {
    const runs = Array.from({ length: 3 }, () => measureProcess(process.execPath, ['bin/speedband.js', 'inspect', path, '--json']));
    const walls = runs.map((run) => run.wall_ms).sort((a, b) => a - b);
    printFigure('speedband inspect (read+validate+segment), whole process, median of 3', walls[1], 'ms', '< 2000 ms');
    printFigure('speedband inspect, peak memory', Math.max(...runs.map((run) => run.peakMemory_MB ?? NaN)), 'MB', '< 400 MB');
  } else {
    process.stdout.write('dist/ has no inspect command: run `npm run build` first for the whole-process figures\n');
  }

  const fileText = readFileSync(path, 'utf8');
  let log = parseSteerLog(fileText, path);
  const ours_ms = Math.min(...(await Promise.all([0, 1, 2].map(() => timeMs(() => (log = parseSteerLog(fileText, path)))))));
  printFigure('read + validate (hand-written parser), in process, best of 3', ours_ms, 'ms');
  const csvParse_ms = await timeMs(() => parse(fileText, { columns: true, cast: true, skip_empty_lines: true }));
  printFigure('csv-parse alone (columns, cast to numbers), same text', csvParse_ms, 'ms');
  let found = 0;
  const segment_ms = await timeMs(() => {
    found = findStepTests(log).steps.length;
  });
  printFigure('segment + metrics, in process', segment_ms, 'ms');
  printFigure('steps found', found, `of ${plannedSteps} commanded`);
} finally {
  rmSync(folder, { recursive: true, force: true });
}
