import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { valueAtSpeed, type SpeedTable } from '../../src/core/by-speed.js';
import { recordingIo } from '../../src/cli/io.js';
import { runCli } from '../../src/cli/main.js';
import { buildSchedule, type BuildResult } from '../../src/pipeline/build-schedule.js';
import { readSchedule } from '../../src/schedule/schedule-file.js';
import { demoModels } from '../helpers/demo-builds.js';
import { PARCEL_VAN_FOLDER } from '../helpers/parcel-van.js';

/** A phase-margin limit that grows with speed: 20° at standstill, 2° more per m/s. */
const PHASE = '20 + 2 * speed_mps';
const phase = (speed_mps: number): number => 20 + 2 * speed_mps;

let dir: string;
let models: BuildResult['models'];
let varying: BuildResult;

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'speedband-acceptance-expressions-'));
  // The van identified from its bundled logs as build identifies (shared with the other tests that read it).
  models = (await demoModels('parcel-van')).models;
  varying = await buildSchedule({ vehicle: PARCEL_VAN_FOLDER, logPaths: [], models, plan: { acceptance: { minimumPhaseMargin_deg: PHASE } } });
}, 120_000);

describe('build with an acceptance limit written as an expression of speed', () => {
  it('judges every checked speed against the limit at that speed: it fails exactly where the phase margin is below 20° + 2°·v', () => {
    const points = varying.refinement.check.points;
    let failing = 0;
    for (const point of points) {
      const below = point.margins.phaseMargin_deg !== null && point.margins.phaseMargin_deg < phase(point.speed_mps);
      expect(
        point.failures.some((failure) => failure.criterion === 'phaseMargin'),
        `${point.speed_mps} m/s`,
      ).toBe(below);
      if (below) failing += 1;
    }
    // The van's phase margins (about 55–70°) cross the limit within its range: some speeds pass, some fail.
    expect(failing).toBeGreaterThan(0);
    expect(failing).toBeLessThan(points.length);
    expect(varying.schedule.status).toBe('failed');
  });

  it('records the limit as the table every check read, and the plan as written', () => {
    const recorded = varying.schedule.check.thresholds.minimumPhaseMargin_deg as SpeedTable;
    expect(typeof recorded).toBe('object');
    for (const breakpoint of varying.schedule.breakpoints) expect(valueAtSpeed(recorded, breakpoint.speed_mps)).toBeCloseTo(phase(breakpoint.speed_mps), 10);
    expect((varying.schedule.provenance.plan as { acceptance: Record<string, unknown> }).acceptance.minimumPhaseMargin_deg).toBe(PHASE);
  });

  it('an expression equal to a number everywhere builds the same schedule as the number', async () => {
    const asNumber = await buildSchedule({ vehicle: PARCEL_VAN_FOLDER, logPaths: [], models, plan: { acceptance: { minimumPhaseMargin_deg: 50 } } });
    const asExpression = await buildSchedule({
      vehicle: PARCEL_VAN_FOLDER,
      logPaths: [],
      models,
      plan: { acceptance: { minimumPhaseMargin_deg: '50 + 0 * speed_mps' } },
    });
    expect(asExpression.schedule.breakpoints).toEqual(asNumber.schedule.breakpoints);
    expect(asExpression.schedule.status).toBe(asNumber.schedule.status);
    expect(asExpression.refinement.check.failedCount).toBe(asNumber.refinement.check.failedCount);
  }, 60_000);

  it('speedband check of the written file judges as the build did (the same failing speeds), and the report draws the limit over speed', async () => {
    const schedulePath = join(dir, 'schedule.json');
    const planPath = join(dir, 'plan.json');
    const modelsPath = join(dir, 'models.json');
    writeFileSync(planPath, JSON.stringify({ acceptance: { minimumPhaseMargin_deg: PHASE } }));
    writeFileSync(modelsPath, JSON.stringify(models));
    const build = recordingIo();
    expect(
      await runCli(['build', '--vehicle', PARCEL_VAN_FOLDER, '--models', modelsPath, '--plan', planPath, '--out', schedulePath, '--allow-failing'], build),
    ).toBe(1);
    expect(build.out()).toMatch(/PM ≥ 24–70 \(varies with speed\)°/);
    const schedule = readSchedule(schedulePath);
    expect(schedule.check.failedSpeeds).toBe(varying.refinement.check.failedCount);
    const check = recordingIo();
    expect(await runCli(['check', schedulePath, '--vehicle', PARCEL_VAN_FOLDER, '--models', modelsPath, '--json'], check)).toBe(1);
    const result = JSON.parse(check.out()) as { failedSpeeds?: number; check?: { failedSpeeds: number } };
    expect(result.check?.failedSpeeds ?? result.failedSpeeds).toBe(schedule.check.failedSpeeds);
    const report = recordingIo();
    const html = join(dir, 'report.html');
    expect(await runCli(['report', schedulePath, '--models', modelsPath, '--out', html], report), report.err()).toBe(0);
    const page = readFileSync(html, 'utf8');
    expect(page).toContain('limit (varies with speed)');
    expect(page).toMatch(/phase margin ≥ 24–70 \(varies with speed\)°/);
  }, 120_000);
});
