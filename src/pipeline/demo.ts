/**
 * The demo: the main job end to end on a bundled demo vehicle (invented data) — identify, build,
 * check, export C and CSV — into one folder, saying where everything went.
 */
import { readdirSync } from 'node:fs';
import { join, relative } from 'node:path';
import { SpeedbandError } from '../core/errors.js';
import type { WriteOutcome } from '../core/files.js';
import { writeFileAtomic } from '../core/files.js';
import { checkOutputFolder, checkOutputPaths } from '../core/output-paths.js';
import { scheduleTable } from '../schedule/schedule-lookup.js';
import { exportC } from '../export/c-header.js';
import { exportCsv } from '../export/csv.js';
import { writeModels } from '../identify/models-file.js';
import type { DenseCheckResult } from '../schedule/types.js';
import { writeSchedule } from '../schedule/schedule-file.js';
import { buildSchedule, planLoopAndController, type BuildResult } from './build-schedule.js';
import { findFallbackGains } from './export-check.js';
import { makeLoopAnalysis } from './loop-analysis.js';
import { recheckSchedule, recordedCheckModel } from './recheck-schedule.js';
import { quoted } from '../core/quote.js';
import { BUNDLED_VEHICLES, bundledVehicles } from '../vehicle/bundled.js';

export { BUNDLED_VEHICLES, bundledVehicles } from '../vehicle/bundled.js';

/** Defaults of the demo: the parcel van, into ./speedband-demo. */
export const DEMO_DEFAULTS = { vehicle: 'parcel-van', outDir: 'speedband-demo' } as const;

/** Input of runDemo: the bundled vehicle, the output folder, whether to replace files, progress. */
export interface DemoInput {
  readonly vehicle: string;
  readonly outDir: string;
  readonly force: boolean;
  readonly progress?: (text: string) => void;
}

/** What runDemo did: the build, the independent re-check and the files written. */
export interface DemoResult {
  readonly build: BuildResult;
  readonly recheck: DenseCheckResult;
  readonly files: readonly { readonly path: string; readonly what: string; readonly outcome: WriteOutcome }[];
}

/** Run the demo; a failing schedule is still written (marked failed) so that it can be looked at. */
export async function runDemo(input: DemoInput): Promise<DemoResult> {
  const known = bundledVehicles();
  if (!known.includes(input.vehicle)) {
    throw new SpeedbandError('demo.unknownVehicle', `no bundled demo vehicle ${quoted(input.vehicle)} — choose one of: ${known.join(', ')}`);
  }
  // Paths relative to the working directory, so that the files written name no machine paths.
  const folder = relative(process.cwd(), join(BUNDLED_VEHICLES, input.vehicle)) || '.';
  const logsFolder = join(folder, 'logs');
  const logPaths = readdirSync(logsFolder)
    .filter((name) => name.endsWith('.csv'))
    .sort()
    .map((name) => join(logsFolder, name));
  const modelsPath = join(input.outDir, 'models.json');
  const schedulePath = join(input.outDir, 'schedule.json');
  const headerPath = join(input.outDir, 'schedule.h');
  const csvPath = join(input.outDir, 'schedule.csv');
  checkOutputFolder({ path: input.outDir, option: '--out' });
  checkOutputPaths(
    [modelsPath, schedulePath, headerPath, csvPath].map((path) => ({ path, option: '--out' })),
    [{ path: join(folder, 'vehicle.json'), role: 'vehicle file' }, ...logPaths.map((path) => ({ path, role: 'log' }))],
  );
  const build = await buildSchedule({ vehicle: folder, logPaths, ...(input.progress === undefined ? {} : { progress: input.progress }) });
  const files: { path: string; what: string; outcome: WriteOutcome }[] = [];
  files.push({
    path: modelsPath,
    what: 'identified models (per step, per speed, single-track)',
    outcome: writeModels(modelsPath, build.models, { force: input.force }),
  });
  files.push({
    path: schedulePath,
    what: `gain schedule (status ${build.schedule.status})`,
    outcome: writeSchedule(schedulePath, build.schedule, { force: input.force }),
  });
  const { loop, controller } = planLoopAndController(build.plan);
  const fallback = findFallbackGains(build.schedule, scheduleTable(build.schedule), makeLoopAnalysis(build.checkModel, loop, controller));
  files.push({
    path: headerPath,
    what: 'C99 header for firmware',
    outcome: writeFileAtomic(headerPath, exportC(build.schedule, { fallback }).text, { force: input.force }),
  });
  files.push({
    path: csvPath,
    what: 'breakpoints, gains and margins for a spreadsheet',
    outcome: writeFileAtomic(csvPath, exportCsv(build.schedule), { force: input.force }),
  });
  const model = recordedCheckModel(build.schedule);
  if (model === null) throw new SpeedbandError('internal', 'the demo schedule records no rebuildable model');
  const recheck = recheckSchedule({ schedule: build.schedule, model });
  return { build, recheck, files };
}
