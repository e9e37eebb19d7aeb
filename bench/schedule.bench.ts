/**
 * Schedule bookkeeping speed: the dense check over 2,000 grid speeds with a cheap analyse stub
 * (so the figure is the schedule's own cost; swap in the real loop analysis to time a build),
 * gain lookups per second, and a refinement run on the constructed integrator loop.
 */
import { timeMs, printFigure } from './measure.js';
import { denseCheck } from '../src/schedule/dense-check.js';
import { checkGrid } from '../src/schedule/grid.js';
import { makeGainLookup } from '../src/schedule/interpolate.js';
import { refineBreakpoints } from '../src/schedule/refine.js';
import { THRESHOLD_DEFAULTS } from '../src/schedule/dense-check.js';
import type { AnalyseLoop, GainTable } from '../src/schedule/types.js';
import type { PidGains } from '../src/controller/types.js';

const ideal = (v: number): PidGains => ({ kp: 5.236 / (v * v), ki: 1.5 / (v * v), kd: 0.2 / (v * v) });
const speeds = [1, 1.8, 3.2, 5.8, 10.4, 18.7, 25];
const table: GainTable = { speeds_mps: speeds, gains: speeds.map(ideal) };
const range = { minimum_mps: 0.5, maximum_mps: 25 };

// Cheap stub: closed-form margins of k·e^(−0.1 s)/s with k = kp·v² (no frequency sweep).
const stub: AnalyseLoop = (v, gains) => {
  const k = gains.kp * v * v;
  const pm = Math.PI / 2 - 0.1 * k;
  return {
    stable: pm > 0,
    verdict: pm > 0 ? 'stable' : 'unstable',
    phaseMargin_deg: (pm * 180) / Math.PI,
    phaseMarginFrequency_radps: k,
    phaseMarginDirection: 'lag',
    lowerGainMargin_dB: null,
    lowerGainMarginFrequency_radps: null,
    upperGainMargin_dB: 20 * Math.log10(Math.PI / (0.2 * k)),
    upperGainMarginFrequency_radps: 5 * Math.PI,
    delayMargin_s: pm / k,
    delayMarginFrequency_radps: k,
    sensitivityPeak: 1.5,
    sensitivityPeakFrequency_radps: k,
    complementarySensitivityPeak: 1.2,
    complementarySensitivityPeakFrequency_radps: k,
  };
};

const thresholds = { ...THRESHOLD_DEFAULTS, minimumDelayMargin_s: 0.03 };
const grid = checkGrid(speeds, range, 2000);
const lookup = makeGainLookup(table, { interpolation: 'monotone-cubic', lowSpeedFloor_mps: 1 });
denseCheck({ grid, gainsAt: lookup, analyse: stub, thresholds }); // warm-up
const runs: number[] = [];
for (let i = 0; i < 9; i += 1) runs.push(await timeMs(() => denseCheck({ grid, gainsAt: lookup, analyse: stub, thresholds })));
runs.sort((a, b) => a - b);
printFigure(`dense check bookkeeping, ${grid.length} speeds, stub analysis (median of 9)`, runs[4], 'ms');

const lookups = 1_000_000;
let sink = 0;
const lookupTime = await timeMs(() => {
  for (let i = 0; i < lookups; i += 1) sink += lookup(0.5 + (24.5 * i) / lookups).kp;
});
printFigure('monotone cubic gain lookups per second', (lookups / lookupTime) * 1000, '/s');

let insertions = 0;
const refineTime = await timeMs(() => {
  insertions = refineBreakpoints({
    table: { speeds_mps: [1, 5, 25], gains: [1, 5, 25].map(ideal) },
    range,
    density: 2000,
    lookup: { interpolation: 'linear', lowSpeedFloor_mps: 1 },
    tuneAt: ideal,
    analyse: stub,
    thresholds,
    maxInsertions: 20,
  }).insertions.length;
});
printFigure(`refinement from 3 breakpoints (${insertions} inserted), 2,000-speed grid, stub`, refineTime, 'ms');
if (Number.isNaN(sink)) process.stdout.write('(unreachable)\n');
