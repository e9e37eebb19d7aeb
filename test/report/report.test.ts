/**
 * The report's data and files without a browser: build --report and report agree byte for byte, the drawn
 * fits are the fits models.json records, the model prediction follows the textbook steady yaw gain, the
 * frequency response passes through its own crossings, and bad inputs are refused before anything is written.
 * (The page itself is checked in headless Chromium: browser.test.ts.)
 */
import { existsSync, mkdtempSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { recordingIo } from '../../src/cli/io.js';
import { runCli } from '../../src/cli/main.js';
import { readModels } from '../../src/identify/models-file.js';
import type { ModelsFile } from '../../src/identify/models-schema.js';
import { gatherReportData } from '../../src/report/report-data.js';
import { renderReportHtml } from '../../src/report/write-report.js';
import { readSchedule } from '../../src/schedule/schedule-file.js';
import type { ScheduleFile } from '../../src/schedule/schedule-types.js';
import { openLoopOf } from '../../src/verify/analyse-loop.js';
import { loopFrequencyResponse } from '../../src/verify/frequency-points.js';
import { sampledLoopDescription, checkLoopPlant } from '../../src/pipeline/loop-analysis.js';
import { recordedCheckModel, scheduleLoopAndController } from '../../src/pipeline/recheck-schedule.js';
import { expectSameBytes } from '../helpers/same-bytes.js';

const VAN = 'vehicles/parcel-van';
const LOGS = join(VAN, 'logs');
let dir: string;
let schedulePath: string;
let modelsPath: string;
let reportPath: string;
let schedule: ScheduleFile;
let models: ModelsFile;

async function cli(...args: string[]) {
  const io = recordingIo();
  const code = await runCli(args, io);
  return { code, out: io.out(), err: io.err() };
}

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'speedband-report-'));
  schedulePath = join(dir, 'schedule.json');
  modelsPath = join(dir, 'models.json');
  reportPath = join(dir, 'report.html');
  const build = await cli('build', '--vehicle', VAN, '--logs', LOGS, '--out', schedulePath, '--models-out', modelsPath, '--report', reportPath);
  if (build.code !== 0) throw new Error(`build failed: ${build.err}${build.out}`);
  schedule = readSchedule(schedulePath);
  models = readModels(modelsPath);
}, 60_000);

describe('speedband build --report and speedband report', () => {
  it("build --report writes the report beside the schedule; report from the same files gives the same bytes (the re-run check reproduces the build's)", async () => {
    expect(existsSync(reportPath)).toBe(true);
    const again = join(dir, 'again.html');
    const result = await cli('report', schedulePath, '--models', modelsPath, '--logs', LOGS, '--out', again);
    expect(result.code, result.err).toBe(0);
    expect(result.out).toMatch(
      /^Wrote .*again\.html \(\d+ KB; Breakpoints and worst figures, Gains against speed, Margins against speed, Time-domain figures and closed-loop responses, Frequency response and Nyquist plots, Identified models against speed, Fits over the measured steps, Provenance\)\n$/,
    );
    expectSameBytes(readFileSync(again), readFileSync(reportPath));
    // No machine paths: base names only.
    expect(readFileSync(again, 'utf8')).not.toContain(dir);
    // Written again unchanged; a different report is not replaced without --force.
    expect((await cli('report', schedulePath, '--models', modelsPath, '--logs', LOGS, '--out', again)).out).toMatch(/^Unchanged /);
    const other = await cli('report', schedulePath, '--out', again);
    expect(other.code).toBe(2);
    expect(other.err).toMatch(/--force/);
  }, 30_000);

  it('holds no script, no event handler and nothing fetched: one self-contained file whose policy forbids any load', () => {
    const html = readFileSync(reportPath, 'utf8');
    expect(html).not.toMatch(/<script|<iframe|<img|<link|<object|@import|url\((?!#)/i);
    expect(html).not.toMatch(/\son[a-z]+=/i);
    expect(html).not.toMatch(/(src|href)="(?!#)/);
    expect(html).toContain(`<meta http-equiv="Content-Security-Policy" content="default-src 'none'; style-src 'unsafe-inline'">`);
    // The cautions come before the first section.
    expect(html.indexOf('First runs belong on a closed track')).toBeLessThan(html.indexOf('<main>'));
  });

  it('draws each step with the fit models.json records: the residual RMSE over the fitted window equals the recorded one', () => {
    const data = gatherReportData({ schedule, scheduleFile: schedulePath, models: { file: modelsPath, content: models }, logs: { paths: [LOGS] } });
    const traces = data.stepTraces!.flatMap((speed) => speed.steps);
    expect(traces).toHaveLength(models.tests.length);
    for (const trace of traces) {
      const test = models.tests.find((candidate) => candidate.file === trace.file && candidate.stepIndex === trace.stepIndex)!;
      expect(Math.abs(trace.rmse_radps / test.fopdt.rmse - 1)).toBeLessThan(1e-9);
      // Drawn on the per-command scale: the fit settles at the step's gain K.
      expect(trace.fitPerCommand_perS[trace.fitPerCommand_perS.length - 1]).toBeCloseTo(test.fopdt.gain, 3);
    }
    expect(data.checkReproduced).toBe(true);
  });

  it('with some of the logs, draws their steps and counts the others as not given', () => {
    const some = readdirSync(LOGS)
      .filter((name) => name.endsWith('.csv'))
      .sort()
      .slice(0, 3)
      .map((name) => join(LOGS, name));
    const data = gatherReportData({ schedule, scheduleFile: schedulePath, models: { file: modelsPath, content: models }, logs: { paths: some } });
    const drawn = data.stepTraces!.reduce((sum, speed) => sum + speed.steps.length, 0);
    const missing = data.stepTraces!.reduce((sum, speed) => sum + speed.missing, 0);
    expect(drawn).toBe(24); // 8 steps per log (the demo logs' step plan)
    expect(drawn + missing).toBe(models.tests.length);
  });

  it('predicts the steady yaw gain of the single-track model: K(v) = v/(L + Ku·v²) at every speed drawn', () => {
    const data = gatherReportData({ schedule, scheduleFile: schedulePath, models: { file: modelsPath, content: models } });
    const model = schedule.provenance.model as { cgToFrontAxle_m: number; cgToRearAxle_m: number; understeerGradient_radPerMps2: number };
    const wheelbase = model.cgToFrontAxle_m + model.cgToRearAxle_m;
    const prediction = data.prediction!;
    expect(prediction.speeds_mps.length).toBeGreaterThan(10);
    prediction.speeds_mps.forEach((speed, k) => {
      // Source: Gillespie 1992, Fundamentals of Vehicle Dynamics, §6 — steady-state yaw velocity gain r/δ = V/(L + K·V²).
      const expected = speed / (wheelbase + model.understeerGradient_radPerMps2 * speed * speed);
      expect(Math.abs((prediction.gain[k] as number) / expected - 1)).toBeLessThan(1e-6);
    });
  });

  it('frequency response: the curve passes through the crossings that set the margins, and the margins are those the schedule proves at the breakpoint', () => {
    const data = gatherReportData({ schedule, scheduleFile: schedulePath });
    const lowest = data.frequencyResponses[0];
    expect(lowest.reason).toMatch(/lowest breakpoint/);
    const proven = schedule.breakpoints[0].margins;
    expect(lowest.response.margins.phaseMargin_deg).toBe(proven.phaseMargin_deg);
    expect(lowest.response.margins.upperGainMargin_dB).toBe(proven.upperGainMargin_dB);
    // |L| = 1 at the gain crossover, and 180° + ∠L there is the phase margin (the definition, Åström & Murray 2008 §9.3).
    const { loop, controller } = scheduleLoopAndController(schedule);
    const description = sampledLoopDescription(
      checkLoopPlant(recordedCheckModel(schedule)!, loop, controller, lowest.speed_mps),
      lowest.response.gains,
      controller,
    );
    const [atCrossover] = loopFrequencyResponse(openLoopOf(description), [lowest.response.margins.phaseMarginFrequency_radps!]);
    expect(atCrossover.magnitude).toBeCloseTo(1, 6);
    expect(180 + atCrossover.phase_deg).toBeCloseTo(proven.phaseMargin_deg!, 4);
    // Up to the Nyquist frequency of the firmware's sample time.
    expect(lowest.response.frequency_radps.at(-1)).toBeCloseTo(Math.PI / schedule.controller.sampleTime_s, 9);
  });

  it('refuses models of another build, a log not in models.json, logs without models, a speed outside the range, an output that is an input — exit 2, nothing written', async () => {
    const out = join(dir, 'refused.html');
    const otherModels = join(dir, 'other-models.json');
    writeFileSync(otherModels, JSON.stringify({ ...models, inputs: models.inputs.slice(1) }, null, 2));
    const mismatch = await cli('report', schedulePath, '--models', otherModels, '--out', out);
    expect(mismatch.code).toBe(2);
    expect(mismatch.err).toMatch(/other-models\.json.*is not the identification this schedule was built from: its 9 logs are not the schedule's 10/);
    const strangerLog = join(dir, 'stranger.csv');
    writeFileSync(strangerLog, `${readFileSync(join(LOGS, 'synthetic-steps-02.00mps.csv'), 'utf8')}\n`);
    const stranger = await cli('report', schedulePath, '--models', modelsPath, '--logs', strangerLog, '--out', out);
    expect(stranger.code).toBe(2);
    expect(stranger.err).toMatch(/stranger\.csv.*not one of the logs .*models\.json was identified from/);
    const noModels = await cli('report', schedulePath, '--logs', LOGS, '--out', out);
    expect(noModels.code).toBe(2);
    expect(noModels.err).toMatch(/give --models with --logs/);
    const far = await cli('report', schedulePath, '--response-speed-mps', '40', '--out', out);
    expect(far.code).toBe(2);
    expect(far.err).toMatch(/--response-speed-mps 40 is outside the schedule's checked range 2\.000–25\.002 m\/s/);
    const overInput = await cli('report', schedulePath, '--models', modelsPath, '--out', modelsPath);
    expect(overInput.code).toBe(2);
    expect(existsSync(out)).toBe(false);
  }, 30_000);

  it('--response-speed-mps chooses the speeds of the Bode and Nyquist plots; the report says why each was drawn', async () => {
    const data = gatherReportData({ schedule, scheduleFile: schedulePath, responseSpeeds_mps: [12, 6] });
    expect(data.frequencyResponses.map((entry) => [entry.speed_mps, entry.reason])).toEqual([
      [6, 'asked for'],
      [12, 'asked for'],
    ]);
    const { html } = await renderReportHtml(data);
    expect(html).toContain('Open loop at 6.00 m/s (asked for)');
  });

  it('build --report writes no report when the schedule is not written (it fails its check without --allow-failing)', async () => {
    const plan = join(dir, 'strict-plan.json');
    // A phase-margin demand no SIMC yaw-rate loop of this van meets (it reaches about 51–63°).
    writeFileSync(plan, JSON.stringify({ acceptance: { minimumPhaseMargin_deg: 80 }, check: { maxInsertedBreakpoints: 0 } }));
    const report = join(dir, 'strict.html');
    const result = await cli('build', '--vehicle', VAN, '--models', modelsPath, '--plan', plan, '--out', join(dir, 'strict.json'), '--report', report);
    expect(result.code).toBe(1);
    expect(existsSync(report)).toBe(false);
    expect(result.out).toMatch(/No report written: it goes with the schedule, which was not written/);
  }, 30_000);
});
