import { measureProcess, printFigure } from './measure.js';

// `speedband --help` whole-process time (built CLI; run `npm run build` first). Median of 7.
const runs = Array.from({ length: 7 }, () => measureProcess(process.execPath, ['bin/speedband.js', '--help']));
const walls = runs.map((r) => r.wall_ms).sort((a, b) => a - b);
printFigure('speedband --help, whole process (median of 7)', walls[3], 'ms', '< 300 ms');
printFigure('speedband --help, peak memory', runs[3].peakMemory_MB ?? NaN, 'MB');
