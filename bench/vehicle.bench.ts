import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { loadVehicle } from '../src/vehicle/load.js';
import { simulateSingleTrack } from '../src/vehicle/simulate.js';
import { singleTrackParametersFromVehicle } from '../src/vehicle/single-track.js';
import { regenerateDemoFleet } from '../src/vehicle/demo-fleet.js';
import { generateTestLog } from '../src/vehicle/test-logs.js';
import { measureProcess, printFigure, timeMs } from './measure.js';

const van = loadVehicle('vehicles/parcel-van');
const params = singleTrackParametersFromVehicle(van);

// One 60 s step-test simulation at 100 Hz (6,000 samples), delay 0.05 s (5 samples) — the case a joint fit repeats.
const count = 6000;
const time_s = Float64Array.from({ length: count }, (_, k) => k * 0.01);
const command = Float64Array.from(time_s, (t) => (Math.floor(t / 5) % 2 === 0 ? 0 : 0.02));
const runs = 200;
const linear_ms = await timeMs(() => {
  for (let run = 0; run < runs; run += 1) simulateSingleTrack({ params, speed_mps: 12, time_s, steerCommand_rad: command });
});
printFigure('simulateSingleTrack, 6,000 samples, no limit binding', (runs * count) / (linear_ms / 1000) / 1e6, 'M samples/s');
printFigure('simulateSingleTrack, one 60 s run at 100 Hz', linear_ms / runs, 'ms');

// Fractional delay (0.055 s = 5.5 samples) and a rate limit that binds at every step: the slow path.
const bigSteps = Float64Array.from(time_s, (t) => (Math.floor(t / 2) % 2 === 0 ? -0.3 : 0.3));
const limited_ms = await timeMs(() => {
  for (let run = 0; run < runs; run += 1)
    simulateSingleTrack({
      params: { ...params, actuatorDelay_s: 0.055 },
      speed_mps: 12,
      time_s,
      steerCommand_rad: bigSteps,
      maxSteerRate_radps: 0.5,
      maxSteerAngle_rad: 0.6,
    });
});
printFigure('simulateSingleTrack, fractional delay, rate limit binding', (runs * count) / (limited_ms / 1000) / 1e6, 'M samples/s');

const log_ms = await timeMs(() => generateTestLog(van, 10, { seed: 1 }));
printFigure('generateTestLog, one 34 s file at 50 Hz (first call)', log_ms, 'ms');

const fleet_ms = await timeMs(() => regenerateDemoFleet({ vehiclesRoot: 'vehicles', outRoot: mkdtempSync(join(tmpdir(), 'speedband-bench-')), force: false }));
printFigure('regenerate the demo fleet (28 logs + READMEs)', fleet_ms, 'ms');

// Whole process, built CLI (npm run build first). Median of 5.
const out = mkdtempSync(join(tmpdir(), 'speedband-bench-cli-'));
const walls = Array.from({ length: 5 }, () =>
  measureProcess(process.execPath, ['bin/speedband.js', 'make-test-logs', '--vehicle', 'vehicles/parcel-van', '--speeds', '2:2:20', '--out', out, '--force']),
).sort((a, b) => a.wall_ms - b.wall_ms);
printFigure('speedband make-test-logs, 10 speeds, whole process (median of 5)', walls[2].wall_ms, 'ms');
printFigure('speedband make-test-logs, peak memory', walls[2].peakMemory_MB ?? NaN, 'MB');
