/**
 * The scenarios' benchmark (issue: closed-loop scenarios). Figures:
 * - the scenario check of one schedule in-process — every scenario at each breakpoint and at low, middle and top
 *   speed, the speed changes through the range — cold (first call, as in a one-shot `build`) and warm; target < 1 s;
 * - the scenario stage as `build` runs it (src/pipeline/scenario-stage.ts: the range part and the certificate on a
 *   helper thread started half a second before, as a build starts it before tuning), from dist/ and so cold;
 * - the speed-change certificate (bisection over the rate), warm;
 * - whole-process `speedband build` on the parcel van with the scenarios (the default) and without them
 *   (`check.scenarios: false`), median of 5 each, alternating; target < 1.5 s with them.
 * The 2-core machine is shared and noisy: medians, with the fastest run beside them.
 * Run `npm run build` first: the CLI runs from dist/.
 */
import { mkdtempSync, readdirSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { buildSchedule } from '../src/pipeline/build-schedule.js';
import { recordedCheckModel } from '../src/pipeline/recheck-schedule.js';
import { judgeScheduleScenarios, scenarioParameters, scheduleScenarioController, scheduleSpeedChanges } from '../src/pipeline/simulate-schedule.js';
import { speedChangeCertificate } from '../src/pipeline/speed-change-certificate.js';
import type { Plan } from '../src/schedule/plan.js';
import { numericAcceptanceLimits } from '../src/schedule/acceptance-limits.js';
import { loadVehicle } from '../src/vehicle/load.js';
import { measureProcess, printFigure, timeMs } from './measure.js';

const VAN = 'vehicles/parcel-van';
const logs = readdirSync(join(VAN, 'logs'))
  .filter((name) => name.endsWith('.csv'))
  .sort()
  .map((name) => join(VAN, 'logs', name));
const work = mkdtempSync(join(tmpdir(), 'speedband-bench-scenarios-'));
const withoutScenarios = join(work, 'plan-without-scenarios.json');
writeFileSync(withoutScenarios, JSON.stringify({ check: { scenarios: false } }));

// In-process: the scenario check and the certificate of the default (yaw-rate) schedule.
const { schedule } = await buildSchedule({ vehicle: VAN, logPaths: logs, plan: { check: { scenarios: false } } });
const vehicle = loadVehicle(join(VAN, 'vehicle.json'));
const { parameters, description } = scenarioParameters(recordedCheckModel(schedule), vehicle);
const limits = numericAcceptanceLimits(schedule.provenance.plan as unknown as Plan).scenarios;
const steeringLimits = { maxSteerAngle_rad: vehicle.maxSteerAngle_rad, maxSteerRate_radps: vehicle.maxSteerRate_radps };
const sizes = scheduleSpeedChanges(schedule);
// The stage as build runs it, first: from dist/ (the helper thread runs the built files), its modules apart from the
// sources' below, so this is a first call too.
const built = (await import(join(process.cwd(), 'dist/pipeline/scenario-stage.js'))) as typeof import('../src/pipeline/scenario-stage.js');
const helper = built.startScenarioHelper();
await new Promise((resolve) => setTimeout(resolve, 500));
const stage = await timeMs(async () => void (await built.scenarioStage({ schedule, parameters, steeringLimits, limits, model: description, sizes }, helper)));
helper?.close();
const checkOnce = (): number => judgeScheduleScenarios({ schedule, parameters, steeringLimits, limits, model: description, sizes }).speeds_mps.length;
let speeds = 0;
const cold = await timeMs(() => {
  speeds = checkOnce();
});
const warm: number[] = [];
for (let k = 0; k < 5; k++) warm.push(await timeMs(() => void checkOnce()));
warm.sort((p, q) => p - q);
printFigure(`scenario stage as build runs it (check + certificate, helper thread${helper === null ? ': none, one core' : ''}), cold`, stage, 'ms', '< 1000 ms');
printFigure(`scenario check, ${speeds} speeds + 2 speed changes, in-process, first call (cold)`, cold, 'ms', '< 1000 ms');
printFigure('scenario check, in-process, warm, median of 5', warm[2], 'ms', '< 1000 ms');
const certificate = await timeMs(
  () =>
    void speedChangeCertificate({
      vehicle: { parameters, ...steeringLimits },
      controller: scheduleScenarioController(schedule),
      context: { loop: schedule.loop.kind, parameters, maxSteerAngle_rad: vehicle.maxSteerAngle_rad, range: schedule.check.range },
      limits,
    }),
);
printFigure('speed-change certificate, in-process, warm', certificate, 'ms');

// Whole process, alternating with and without the scenarios.
const RUNS = 5;
const wall = (run: ReturnType<typeof measureProcess>): number => run.wall_ms;
const withRuns: ReturnType<typeof measureProcess>[] = [];
const withoutRuns: ReturnType<typeof measureProcess>[] = [];
for (let k = 0; k < RUNS; k++) {
  withRuns.push(measureProcess(process.execPath, ['bin/speedband.js', 'build', '--vehicle', VAN, '--logs', ...logs, '--out', join(work, `with-${k}.json`)]));
  withoutRuns.push(
    measureProcess(process.execPath, [
      'bin/speedband.js',
      'build',
      '--vehicle',
      VAN,
      '--logs',
      ...logs,
      '--plan',
      withoutScenarios,
      '--out',
      join(work, `without-${k}.json`),
    ]),
  );
}
const sorted = (runs: ReturnType<typeof measureProcess>[]): number[] => runs.map(wall).sort((p, q) => p - q);
printFigure(`build with the scenarios, parcel van, whole process, median of ${RUNS}`, sorted(withRuns)[2], 'ms', '< 1500 ms');
printFigure('build with the scenarios, fastest', sorted(withRuns)[0], 'ms');
printFigure(`build without them (check.scenarios false), median of ${RUNS}`, sorted(withoutRuns)[2], 'ms');
printFigure('build without them, fastest', sorted(withoutRuns)[0], 'ms');
