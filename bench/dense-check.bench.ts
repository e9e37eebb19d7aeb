/**
 * The dense check of a path-loop schedule at 20,000 speeds, in-process (issue: verdicts that never depend on
 * the grid; target ≥ 5,000 speeds/s): the parcel van with the README's path plan (2 m preview from the front
 * axle, damping-target placement), on the main thread alone and on every core (`recheckScheduleOnAllCores`, from
 * dist/ as the CLI runs it: its worker threads load the built modules; run `npm run build` first).
 * Figures: median and fastest of 3 runs each, speeds per second, and the verdicts found (none may be marginal).
 */
import { availableParallelism } from 'node:os';
import { join } from 'node:path';
import { buildSchedule } from '../src/pipeline/build-schedule.js';
import { recheckSchedule, recordedCheckModel } from '../src/pipeline/recheck-schedule.js';
import { printFigure, timeMs } from './measure.js';

const { recheckScheduleOnAllCores } = (await import(
  join(process.cwd(), 'dist/pipeline/recheck-schedule.js')
)) as typeof import('../src/pipeline/recheck-schedule.js');
const SPEEDS = 20_000;
const RUNS = 3;
const { schedule } = await buildSchedule({
  vehicle: 'vehicles/parcel-van',
  logPaths: ['vehicles/parcel-van/logs'],
  plan: {
    loop: { kind: 'path', preview_m: 2, referencePoint: 'front-axle' },
    rule: { name: 'damping-target', parameters: { dampingRatio: 1 } },
    interpolation: 'monotone-cubic',
    controller: { sampleTime_s: 0.01, discretisation: 'backward-euler', derivativeFilter: 10 },
  },
});
const model = recordedCheckModel(schedule);
if (model === null) throw new Error('no model recorded');
recheckSchedule({ schedule, model, gridSpeeds: 300 }); // warm-up

const sequential: number[] = [];
const parallel: number[] = [];
let points = 0;
let marginal = 0;
for (let run = 0; run < RUNS; run++) {
  sequential.push(await timeMs(() => (points = recheckSchedule({ schedule, model, gridSpeeds: SPEEDS }).points.length)));
  parallel.push(
    await timeMs(async () => {
      const result = await recheckScheduleOnAllCores({ schedule, model, gridSpeeds: SPEEDS });
      marginal = result.points.filter((point) => point.margins.verdict === 'marginal').length;
    }),
  );
}
sequential.sort((p, q) => p - q);
parallel.sort((p, q) => p - q);
const median = (values: number[]): number => values[Math.floor(values.length / 2)];
printFigure(`path loop, ${points} speeds, main thread only (median of ${RUNS})`, median(sequential), 'ms');
printFigure('  speeds per second (median)', (points / median(sequential)) * 1000, 'speeds/s');
printFigure(`path loop, ${points} speeds, every core (${availableParallelism()}) (median of ${RUNS})`, median(parallel), 'ms');
printFigure('  speeds per second (median)', (points / median(parallel)) * 1000, 'speeds/s', '≥ 5,000 speeds/s');
printFigure('  speeds per second (fastest)', (points / parallel[0]) * 1000, 'speeds/s');
printFigure('  speeds whose verdict is marginal', marginal, 'speeds', '0');
