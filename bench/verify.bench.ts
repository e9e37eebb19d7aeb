import { printFigure } from './measure.js';
import { analyseLoop, analyseOpenLoop, openLoopOf } from '../src/verify/index.js';

// Full analysis of one loop (all margins, Ms, both verdicts): a yaw-rate-like FOPDT under a
// filtered PID, a double integrator under SIMC PID (conditionally stable), and a loop with a
// discrete controller. Target (issue 4): under 0.2 ms per loop, ≥ 5,000 loops/s on one core.
const cases = {
  'FOPDT + PID (N = 10)': openLoopOf({ plant: { numerator: [1.8], denominator: [0.4, 1], delay_s: 0.08 }, pid: { kp: 0.9, ki: 2, kd: 0.03, derivativeFilter: 10 } }),
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

for (const [name, loop] of Object.entries(cases)) {
  for (let i = 0; i < 200; i++) analyseOpenLoop(loop); // warm up
  const runs = 2000;
  const start = process.hrtime.bigint();
  const cpuStart = process.cpuUsage();
  for (let i = 0; i < runs; i++) analyseOpenLoop(loop);
  const perLoop_ms = Number(process.hrtime.bigint() - start) / 1e6 / runs;
  const cpu = process.cpuUsage(cpuStart);
  printFigure(`analyseOpenLoop, ${name}, per loop`, perLoop_ms, 'ms', '< 0.2 ms');
  printFigure(`  same, CPU time per loop (less sensitive to a busy machine)`, (cpu.user + cpu.system) / 1000 / runs, 'ms');
  printFigure(`analyseOpenLoop, ${name}, loops per second`, 1000 / perLoop_ms, '/s', '≥ 5,000/s');
}
const start = process.hrtime.bigint();
for (let i = 0; i < 500; i++) analyseLoop({ plant: { numerator: [1.8], denominator: [0.4, 1], delay_s: 0.08 }, pid: { kp: 0.9 + i * 1e-4, ki: 2, kd: 0.03 } });
printFigure('analyseLoop (building the loop too), per loop', Number(process.hrtime.bigint() - start) / 1e6 / 500, 'ms');
