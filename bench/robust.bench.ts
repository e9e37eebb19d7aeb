/**
 * The robust check (issue: worst-case margins over the variations; target: 200 speeds with 64 samples and the local
 * search under 2 s in-process on 2 cores): the parcel van's default schedule over the default variation set (mass,
 * yaw inertia, both cornering stiffnesses, actuator lag and delay with the identification's intervals: 6 varied
 * parameters), 200 evenly spaced speeds, 64 seeded samples and the compass search at each — on the main thread
 * alone and on every core. Figures: median and fastest of 3 runs, loop analyses, loops per second, and the CPU time
 * of all threads (the shared machine's other work does not count there); and the time-domain figures over the set at the
 * schedule's breakpoints (closed-loop simulations of the chosen vehicles, main thread). The checks run
 * from dist/ (run `npm run build` first), as the CLI does: its worker threads then load the built JavaScript
 * instead of compiling the TypeScript sources.
 */
import { availableParallelism } from 'node:os';
import { buildSchedule } from '../src/pipeline/build-schedule.js';
import { printFigure, timeMs } from './measure.js';

type Dist = {
  recordedCheckModel: typeof import('../src/pipeline/recheck-schedule.js').recordedCheckModel;
  scheduleLoopAndController: typeof import('../src/pipeline/recheck-schedule.js').scheduleLoopAndController;
  robustCheckOnAllCores: typeof import('../src/pipeline/parallel-robust-check.js').robustCheckOnAllCores;
  resolveVariationSet: typeof import('../src/robust/variation-set.js').resolveVariationSet;
  resolveVariations: typeof import('../src/schedule/plan-variations.js').resolveVariations;
  scheduleLookup: typeof import('../src/schedule/schedule-lookup.js').scheduleLookup;
  worstTimeDomainAt: typeof import('../src/pipeline/robust-time-domain.js').worstTimeDomainAt;
  breakpointControl: typeof import('../src/pipeline/robust-time-domain.js').breakpointControl;
  worstCaseMarginsAt: typeof import('../src/pipeline/robust-analysis.js').worstCaseMarginsAt;
};
const dist = async (path: string): Promise<Record<string, unknown>> =>
  import(new URL(`../dist/${path}`, import.meta.url).href) as Promise<Record<string, unknown>>;
const lib = {
  ...(await dist('build/recheck-schedule.js')),
  ...(await dist('build/parallel-robust-check.js')),
  ...(await dist('robust/variation-set.js')),
  ...(await dist('schedule/plan-variations.js')),
  ...(await dist('schedule/schedule-lookup.js')),
  ...(await dist('build/robust-time-domain.js')),
  ...(await dist('build/robust-analysis.js')),
} as unknown as Dist;

const SPEEDS = 200;
const RUNS = 3;
const { schedule, models } = await buildSchedule({ vehicle: 'vehicles/parcel-van', logPaths: ['vehicles/parcel-van/logs'] });
const model = lib.recordedCheckModel(schedule);
if (model === null) throw new Error('no model recorded');
const { loop, controller } = lib.scheduleLoopAndController(schedule);
const variations = lib.resolveVariations({ search: { samples: 64 } }, controller.sampleTime_s);
const set = lib.resolveVariationSet(variations, model.summary, models);
const grid = Array.from({ length: SPEEDS }, (_, i) => 2 + (23 * i) / (SPEEDS - 1));
const check = (workers: number) =>
  lib.robustCheckOnAllCores({
    model,
    loop,
    controller,
    thresholds: schedule.check.thresholds,
    set,
    search: variations.search,
    grid,
    gainsAt: lib.scheduleLookup(schedule),
    workers,
  });
await check(0); // warm-up of the main thread

const runs = { main: [] as number[], all: [] as number[], cpu: [] as number[] };
let loops = 0;
for (let run = 0; run < RUNS; run++) {
  runs.main.push(await timeMs(async () => (loops = (await check(0)).evaluations)));
  const cpu = process.cpuUsage();
  runs.all.push(await timeMs(async () => (loops = (await check(availableParallelism() - 1)).evaluations)));
  const used = process.cpuUsage(cpu);
  runs.cpu.push((used.user + used.system) / 1000);
}
const median = (values: number[]): number => [...values].sort((p, q) => p - q)[Math.floor(values.length / 2)];
const fastest = (values: number[]): number => Math.min(...values);
printFigure(
  `robust check, ${SPEEDS} speeds × ${set.dimensions.length} parameters, ${variations.search.samples} samples + local search`,
  loops,
  'loop analyses',
);
printFigure('  loop analyses per speed', loops / SPEEDS, 'loops');
printFigure(`  main thread only (median of ${RUNS})`, median(runs.main), 'ms');
printFigure('  main thread only, loops per second (median)', (loops / median(runs.main)) * 1000, 'loops/s');
printFigure(`  every core (${availableParallelism()}) (median of ${RUNS})`, median(runs.all), 'ms', '< 2,000 ms on 2 cores');
printFigure('  every core (fastest)', fastest(runs.all), 'ms');
printFigure('  every core, loops per second (median)', (loops / median(runs.all)) * 1000, 'loops/s');
// CPU time of every thread of the process: what the check costs whatever else the shared machine runs.
printFigure('  every core, CPU time of all threads (median)', median(runs.cpu), 'ms');
printFigure('  loops per CPU second (median)', (loops / median(runs.cpu)) * 1000, 'loops/s');

// Time-domain figures over the set at the breakpoints (the margins' search at each breakpoint not counted).
const context = { model, loop, controller, set, search: variations.search };
const settings = {
  limits: schedule.check.timeDomain.limits,
  vehicleLimits: schedule.check.timeDomain.steeringLimits,
  antiWindup: schedule.controller.antiWindup,
};
const points = schedule.breakpoints.map((row) => lib.worstCaseMarginsAt(row.speed_mps, row, context));
let vehicles = 0;
const timeDomain = await timeMs(async () => {
  vehicles = 0;
  schedule.breakpoints.forEach(
    (row, k) => (vehicles += lib.worstTimeDomainAt(points[k], lib.breakpointControl(row.speed_mps, row, row), context, settings)?.vehicles ?? 0),
  );
});
printFigure(`time-domain figures over the set at ${schedule.breakpoints.length} breakpoints`, timeDomain, 'ms');
printFigure('  vehicles simulated', vehicles, 'vehicles');
printFigure('  per vehicle', timeDomain / vehicles, 'ms');
