/**
 * The report's time-domain section: the closed-loop responses it draws are the simulations behind the
 * figures schedule.json records (simulated again, every figure equal), the thinned curves keep their peaks,
 * the section is drawn only when the schedule has figures, and a 'marginal' verdict is said in words.
 */
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { recordingIo } from '../../src/cli/io.js';
import { runCli } from '../../src/cli/main.js';
import { thinnedSignal, TRACE_STRETCHES } from '../../src/report/closed-loop-traces.js';
import { reportSectionTitles } from '../../src/report/render/index.js';
import { gatherReportData } from '../../src/report/report-data.js';
import type { ReportData, TraceSignal } from '../../src/report/types.js';
import { escapeHtml } from '../../src/report/render/html.js';
import { renderReportHtml } from '../../src/report/write-report.js';
import { readSchedule } from '../../src/schedule/schedule-file.js';
import type { ScheduleFile } from '../../src/schedule/schedule-types.js';
import { demoModels, demoSchedule } from '../helpers/demo-builds.js';

const VAN = 'vehicles/parcel-van';
let yawRate: ReportData;
let path: ReportData;

beforeAll(async () => {
  // The van's default yaw-rate schedule and its default path plan (README: {"loop":{"kind":"path"}}), built from its
  // bundled logs (shared with the other tests that read them: test/helpers/demo-builds.ts).
  const { path: models, models: content } = await demoModels('parcel-van');
  for (const name of ['yaw-rate', 'path'] as const) {
    const { path: file, schedule } = await demoSchedule('parcel-van', name === 'path' ? { loop: { kind: 'path' } } : {});
    const data = gatherReportData({ schedule, scheduleFile: file, models: { file: models, content } });
    if (name === 'path') path = data;
    else yawRate = data;
  }
}, 90_000);

const peakOf = (signal: TraceSignal): number => Math.max(...signal.value.map(Math.abs));

describe('closed-loop responses in the report', () => {
  it('are the simulations behind schedule.json: simulated again at the drawn breakpoints, every time-domain figure equals the one the file records (yaw-rate and path loops)', () => {
    for (const data of [yawRate, path]) {
      const drawn = data.closedLoop!.speeds;
      const speeds = data.schedule.breakpoints.map((breakpoint) => breakpoint.speed_mps);
      // The lowest and highest breakpoint, and the one closest to a limit.
      expect(drawn[0].speed_mps).toBe(speeds[0]);
      expect(drawn.at(-1)!.speed_mps).toBe(speeds.at(-1));
      expect(drawn.some((at) => /closest to a time-domain limit/.test(at.reason))).toBe(true);
      for (const at of drawn) {
        const recorded = data.schedule.breakpoints.find((breakpoint) => breakpoint.speed_mps === at.speed_mps)!.timeDomain;
        expect(JSON.parse(JSON.stringify(at.figures)), `${data.schedule.loop.kind} at ${at.speed_mps} m/s`).toEqual(recorded);
      }
    }
  });

  it('keep the peaks the figures are read from: overshoot of the step, peak error of the lane change and the curve entry, the steering rate asked for and reached', () => {
    for (const at of yawRate.closedLoop!.speeds) {
      expect(100 * (Math.max(...at.referenceStep.value) - 1)).toBe(at.figures.referenceStep.overshoot_pct);
      // The step through the limits: the rate the road wheels reach is the figure, and never above the vehicle's limit.
      expect(peakOf(at.limitedStep!.rate)).toBeCloseTo(at.figures.limitedStep!.peakSteerRate_radps, 12);
      expect(peakOf(at.limitedStep!.rate)).toBeLessThanOrEqual(yawRate.schedule.check.timeDomain.steeringLimits.maxSteerRate_radps * (1 + 1e-12));
      expect(peakOf(at.steeringMisalignment)).toBe(1);
    }
    for (const at of path.closedLoop!.speeds) {
      const figures = at.figures;
      expect(peakOf(at.laneChange!.error)).toBe(figures.laneChange!.peakError_m);
      expect(peakOf(at.curveEntry!)).toBe(figures.curveEntry!.peakError_m);
      // The actuator's room is read from the lane change: angle and asked-for rate per metre of lane change.
      expect(peakOf(at.laneChange!.angle) / figures.laneChange!.size_m).toBeCloseTo(figures.actuator.peakAnglePerUnit, 12);
      expect(peakOf(at.laneChange!.rate) / figures.laneChange!.size_m).toBeCloseTo(figures.actuator.peakRatePerUnit, 12);
      expect(at.limitedStep).toBeNull();
    }
  });

  it('with a baseline, the old gains are simulated on the new vehicle at the new breakpoints: a schedule as its own baseline gives back exactly the figures it records', () => {
    for (const data of [yawRate, path]) {
      const file = `${data.schedule.loop.kind}.json`;
      const again = gatherReportData({ schedule: data.schedule, scheduleFile: file, baseline: { file, schedule: data.schedule } });
      expect(JSON.parse(JSON.stringify(again.baseline!.timeDomain))).toEqual(data.schedule.breakpoints.map((breakpoint) => breakpoint.timeDomain));
    }
  });

  it("with the plan's variations, the worst case over them is said in words and drawn beside the nominal figures: the values drawn are those schedule.variations records", async () => {
    const dir = mkdtempSync(join(tmpdir(), 'speedband-variations-report-'));
    const models = join(dir, 'models.json');
    writeFileSync(models, JSON.stringify(yawRate.models!.content));
    // The README's example of a variations section, checked on 24 speeds with a short worst-case search: what is drawn
    // is what the file records, whatever the grid.
    writeFileSync(
      join(dir, 'plan.json'),
      JSON.stringify({
        check: { gridSpeeds: 24 },
        variations: {
          mass_pct: [-5, 30],
          cgRearwardShift_m: [0, 0.2],
          rearCorneringStiffness_pct: 12,
          addedLatency_s: 0.01,
          search: { samples: 6, localSearchEvaluations: 6 },
        },
      }),
    );
    const file = join(dir, 'robust.json');
    const io = recordingIo();
    await runCli(['build', '--vehicle', VAN, '--models', models, '--plan', join(dir, 'plan.json'), '--out', file, '--allow-failing'], io);
    const schedule = readSchedule(file);
    const variations = schedule.variations!;
    const data = gatherReportData({ schedule, scheduleFile: file });
    expect(data.variations!.verdict).toMatch(/^The worst case over the plan's variations (keeps the limits|breaks a limit at \d+ of \d+ check speeds)/);
    const { html } = await renderReportHtml(data);
    expect(html).toContain(escapeHtml(data.variations!.weakest ?? 'no weakest parameter'));
    const drawn = [...html.matchAll(/data-field="worst\.overshoot_pct"[^>]*><data value="([^"]+)">/g)].map((match) => Number(match[1]));
    expect(drawn).toEqual(variations.breakpoints.map((breakpoint) => breakpoint.timeDomain!.worst.overshoot_pct!.value));
    // Never better than nominal (the set holds the nominal vehicle).
    schedule.breakpoints.forEach((breakpoint, k) => expect(drawn[k]).toBeGreaterThanOrEqual(breakpoint.timeDomain!.referenceStep.overshoot_pct - 1e-9));
  }, 120_000);

  it("thinning keeps each stretch's smallest and largest sample, in time order, and the last sample", () => {
    const ts = 0.001;
    const values = Float64Array.from({ length: 10_001 }, (_, k) => Math.sin(2 * Math.PI * 0.7 * k * ts) * Math.exp(-0.1 * k * ts));
    const thinned = thinnedSignal(values, ts, 10);
    expect(thinned.time_s.length).toBeLessThanOrEqual(2 * TRACE_STRETCHES + 1);
    expect(Math.max(...thinned.value)).toBe(Math.max(...values));
    expect(Math.min(...thinned.value)).toBe(Math.min(...values));
    expect(thinned.time_s.every((t, k) => k === 0 || t > thinned.time_s[k - 1])).toBe(true);
    expect(thinned.value.at(-1)).toBe(values.at(-1));
    // Cut at the end time asked for.
    expect(thinnedSignal(values, ts, 2.5).time_s.at(-1)).toBeCloseTo(2.5, 12);
  });

  it('the section is drawn only when the schedule has time-domain figures; the table lists the set-point weights and feed-forward of every breakpoint', async () => {
    expect(reportSectionTitles(path)).toContain('Time-domain figures and closed-loop responses');
    const without: ScheduleFile = { ...path.schedule, breakpoints: path.schedule.breakpoints.map((breakpoint) => ({ ...breakpoint, timeDomain: null })) };
    expect(reportSectionTitles({ ...path, schedule: without, closedLoop: null })).not.toContain('Time-domain figures and closed-loop responses');
    const { html } = await renderReportHtml(path);
    // The scenario check schedule.json records (pass or the limits broken, and the speed-change certificate), said in words.
    const yawHtml = (await renderReportHtml(yawRate)).html;
    expect(yawHtml).toContain('<h3 id="scenarios">Closed-loop scenarios</h3>');
    expect(yawHtml).toContain(escapeHtml(yawRate.schedule.check.speedChange!.statement));
    const table = html.slice(html.indexOf('<table id="time-domain-table"'), html.indexOf('</table>', html.indexOf('<table id="time-domain-table"')));
    for (const breakpoint of path.schedule.breakpoints) {
      expect(table).toContain(`<data value="${String(breakpoint.setpointWeightProportional)}">`);
      expect(table).toContain(`<data value="${String(breakpoint.feedForward)}">`);
      expect(table).toContain(`<data value="${String(breakpoint.timeDomain!.laneChange!.peakError_m)}">`);
    }
  });

  it("says where the closed loop is 'marginal' (a pole on the unit circle within its rounding bound) or unstable, as runs of check speeds", async () => {
    const points = yawRate.check!.points;
    const marked = points.map((point, k) =>
      k === 3 || k === 4
        ? { ...point, margins: { ...point.margins, verdict: 'marginal' as const } }
        : k === 9
          ? { ...point, margins: { ...point.margins, verdict: 'unstable' as const } }
          : point,
    );
    const { html } = await renderReportHtml({ ...yawRate, check: { ...yawRate.check!, points: marked } });
    const speed = (k: number) => points[k].speed_mps.toFixed(2);
    expect(html).toContain(`The closed loop of the new gains is marginal at ${speed(3)}–${speed(4)} m/s (a closed-loop pole on the unit circle`);
    expect(html).toContain(`; unstable at ${speed(9)} m/s.`);
    expect((await renderReportHtml(yawRate)).html).not.toContain('The closed loop of the new gains is');
  });
});
