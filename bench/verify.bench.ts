import { printFigure } from './measure.js';
import { analyseLoop, analyseOpenLoop, openLoopOf } from '../src/verify/index.js';

// Full analysis of one loop (all margins, Ms, both verdicts): a yaw-rate-like FOPDT under a
// filtered PID, a double integrator under SIMC PID (conditionally stable), and a loop with a
// discrete controller. Target (issue 4): under 0.2 ms per loop, ≥ 5,000 loops/s on one core.
// The machine may be shared: each figure is the best of 7 batches of 1,000 loops (the usual
// way to read a micro-benchmark on a busy machine), with the median batch beside it.
const cases = {
  'FOPDT + PID (N = 10)': openLoopOf({
    plant: { numerator: [1.8], denominator: [0.4, 1], delay_s: 0.08 },
    pid: { kp: 0.9, ki: 2, kd: 0.03, derivativeFilter: 10 },
  }),
  'double integrator + SIMC PID (N = 10)': openLoopOf({
    plant: { numerator: [1], denominator: [1, 0, 0], delay_s: 1 },
    pid: { kp: 1 / 16, ki: 8, kd: 8, form: 'series', derivativeFilter: 10 },
  }),
  'FOPDT + discrete PID, Ts = 10 ms': openLoopOf({
    plant: { numerator: [1.8], denominator: [0.4, 1], delay_s: 0.08 },
    pid: { kp: 0.9, ki: 2, kd: 0.03, derivativeFilter: 10 },
    sampleTime_s: 0.01,
  }),
};

function batches(work: (i: number) => unknown): { best_ms: number; median_ms: number } {
  for (let i = 0; i < 1000; i++) work(i); // warm up
  const perLoop: number[] = [];
  for (let batch = 0; batch < 7; batch++) {
    const start = process.hrtime.bigint();
    for (let i = 0; i < 1000; i++) work(i);
    perLoop.push(Number(process.hrtime.bigint() - start) / 1e6 / 1000);
  }
  perLoop.sort((a, b) => a - b);
  return { best_ms: perLoop[0], median_ms: perLoop[3] };
}

for (const [name, loop] of Object.entries(cases)) {
  const { best_ms, median_ms } = batches(() => analyseOpenLoop(loop));
  printFigure(`analyseOpenLoop, ${name}, per loop (best batch)`, best_ms, 'ms', '< 0.2 ms');
  printFigure(`  median batch`, median_ms, 'ms');
  printFigure(`  loops per second (best batch)`, 1000 / best_ms, '/s', '≥ 5,000/s');
}
const built = batches((i) =>
  analyseLoop({ plant: { numerator: [1.8], denominator: [0.4, 1], delay_s: 0.08 }, pid: { kp: 0.9 + (i % 100) * 1e-3, ki: 2, kd: 0.03 } }),
);
printFigure('analyseLoop (building the loop too), per loop (best batch)', built.best_ms, 'ms');
