/**
 * Schedule comparison: library call time on small and large tables, and `speedband compare` as a
 * whole process (built CLI; run `npm run build` first). Synthetic schedules from test/compare.
 */
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { compareSchedules } from '../src/compare/compare-schedules.js';
import { writeSchedule } from '../src/schedule/schedule-file.js';
import { fixtureGains, fixtureSchedule } from '../test/compare/fixture-schedules.js';
import { measureProcess, printFigure, timeMs } from './measure.js';

const small = fixtureSchedule();
const smallRaised = fixtureSchedule({ gainsAt: (speed) => ({ ...fixtureGains(speed), kp: fixtureGains(speed).kp * 1.1 }) });
const speedsA = Array.from({ length: 40 }, (_, k) => 2 + k * 0.5);
const speedsB = Array.from({ length: 40 }, (_, k) => 2.25 + k * 0.5);
const range = { speeds: { minimum_mps: 2, maximum_mps: 21.75, lowSpeedFloor_mps: 2 } };
const largeA = fixtureSchedule({ speeds: speedsA, plan: range });
const largeB = fixtureSchedule({ speeds: speedsB, plan: range });

const repeat = 2000;
const smallTime = await timeMs(() => {
  for (let i = 0; i < repeat; i += 1) compareSchedules(small, smallRaised);
});
printFigure('compareSchedules, 6 vs 6 same breakpoints, per call', (1000 * smallTime) / repeat, 'µs');
const largeTime = await timeMs(() => {
  for (let i = 0; i < 200; i += 1) compareSchedules(largeA, largeB);
});
printFigure(
  `compareSchedules, 40 vs 40 interleaved breakpoints (${compareSchedules(largeA, largeB).speeds.length} speeds), per call`,
  (1000 * largeTime) / 200,
  'µs',
);

const folder = mkdtempSync(join(tmpdir(), 'speedband-bench-compare-'));
writeSchedule(join(folder, 'old.json'), largeA, { force: false });
writeSchedule(join(folder, 'new.json'), largeB, { force: false });
const runs = Array.from({ length: 5 }, () => {
  try {
    return measureProcess(process.execPath, ['bin/speedband.js', 'compare', join(folder, 'old.json'), join(folder, 'new.json'), '--gain-change-pct', '1000']);
  } catch (error) {
    return { wall_ms: Number.NaN, peakMemory_MB: null, error };
  }
});
const walls = runs.map((run) => run.wall_ms).sort((a, b) => a - b);
printFigure('speedband compare, 40 vs 40 breakpoints, whole process (median of 5)', walls[2], 'ms');
printFigure('speedband compare, peak memory', runs[2].peakMemory_MB ?? Number.NaN, 'MB');
