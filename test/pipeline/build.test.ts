import { copyFileSync, mkdirSync, mkdtempSync, readFileSync, writeFileSync, existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { runCli } from '../../src/cli/main.js';
import { recordingIo } from '../../src/cli/io.js';
import type { ModelsFile } from '../../src/identify/models-schema.js';
import { computeScheduleChecksum } from '../../src/schedule/checksum.js';
import { readSchedule } from '../../src/schedule/schedule-file.js';
import type { ScheduleFile } from '../../src/schedule/schedule-types.js';
import { sampledSingleTrackMarginsInPython, type SingleTrackLoopCase } from '../helpers/sampled-loop-reference.js';
import { parcelVanLogs } from '../helpers/parcel-van.js';
import { demoModels } from '../helpers/demo-builds.js';
import { expectSameBytes } from '../helpers/same-bytes.js';

const VAN = 'vehicles/parcel-van';
const vanLogs = parcelVanLogs;

let dir: string;
let modelsPath: string;
let schedulePath: string;

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'speedband-build-'));
  // The van identified from its bundled logs as build identifies it (shared: test/helpers/demo-builds.ts).
  modelsPath = (await demoModels('parcel-van')).path;
  schedulePath = join(dir, 'schedule.json');
  const io = recordingIo();
  const code = await runCli(['build', '--vehicle', VAN, '--models', modelsPath, '--out', schedulePath], io);
  if (code !== 0) throw new Error(`build failed: ${io.err()}${io.out()}`);
});

describe('speedband build', () => {
  it('writes a schedule that passes, lists every breakpoint with its margins, and shows the cautions', () => {
    const schedule = readSchedule(schedulePath);
    expect(schedule.status).toBe('passed');
    expect(schedule.check.gridSize).toBeGreaterThanOrEqual(200);
    expect(schedule.breakpoints.length).toBeGreaterThanOrEqual(2);
    for (const breakpoint of schedule.breakpoints) expect(breakpoint.margins.verdict).toBe('stable');
    expect(schedule.provenance.model.kind).toBe('single-track');
    expect(schedule.cautions.join(' ')).toMatch(/closed track/);
  });

  it('is deterministic: the same inputs and plan give a byte-identical schedule', async () => {
    const again = join(dir, 'again.json');
    expect(await runCli(['build', '--vehicle', VAN, '--models', modelsPath, '--out', again], recordingIo())).toBe(0);
    expectSameBytes(readFileSync(again), readFileSync(schedulePath));
    // No machine paths inside: only base names of the inputs.
    expect(readFileSync(again, 'utf8')).not.toContain(dir);
  });

  it('never overwrites a different file without --force', async () => {
    const path = join(dir, 'occupied.json');
    writeFileSync(path, '{}');
    const io = recordingIo();
    expect(await runCli(['build', '--vehicle', VAN, '--models', modelsPath, '--out', path], io)).toBe(2);
    expect(io.err()).toMatch(/--force/);
    expect(readFileSync(path, 'utf8')).toBe('{}');
    expect(await runCli(['build', '--vehicle', VAN, '--models', modelsPath, '--out', path, '--force'], recordingIo())).toBe(0);
  });

  it('refuses to write a schedule that fails its limits (exit 1), and --allow-failing writes it marked failed', async () => {
    const plan = join(dir, 'strict-plan.json');
    // A phase-margin demand no SIMC yaw-rate loop of this van meets (it reaches about 51–63°).
    writeFileSync(plan, JSON.stringify({ acceptance: { minimumPhaseMargin_deg: 80 } }));
    const out = join(dir, 'strict.json');
    const io = recordingIo();
    expect(await runCli(['build', '--vehicle', VAN, '--models', modelsPath, '--plan', plan, '--out', out], io)).toBe(1);
    expect(existsSync(out)).toBe(false);
    expect(io.out()).toMatch(/Nothing written/);
    expect(await runCli(['build', '--vehicle', VAN, '--models', modelsPath, '--plan', plan, '--out', out, '--allow-failing'], recordingIo())).toBe(1);
    expect(readSchedule(out).status).toBe('failed');
    // export refuses a failed schedule for firmware.
    expect(await runCli(['export', out, '--format', 'c'], recordingIo())).toBe(1);
  });

  it('names the missing input when neither logs nor models are given', async () => {
    const io = recordingIo();
    expect(await runCli(['build', '--vehicle', VAN, '--out', join(dir, 'x.json')], io)).toBe(2);
    expect(io.err()).toMatch(/--logs/);
  });
});

describe('speedband check', () => {
  it('passes the schedule it built, on the recorded model and on the models file', async () => {
    expect(await runCli(['check', schedulePath, '--vehicle', VAN], recordingIo())).toBe(0);
    const io = recordingIo();
    expect(await runCli(['check', schedulePath, '--vehicle', VAN, '--models', modelsPath, '--json'], io)).toBe(0);
    const result = JSON.parse(io.out()) as { passed: boolean; gridSize: number };
    expect(result.passed).toBe(true);
    expect(result.gridSize).toBeGreaterThanOrEqual(200);
  });

  it('refuses a schedule with one altered gain, naming the breakpoint, and one with an altered checksum', async () => {
    const edited = JSON.parse(readFileSync(schedulePath, 'utf8')) as { breakpoints: { kp: number }[]; checksum: { value: string } };
    edited.breakpoints[2].kp *= 1.2;
    const gainPath = join(dir, 'edited-gain.json');
    writeFileSync(gainPath, JSON.stringify(edited, null, 2));
    const io = recordingIo();
    expect(await runCli(['check', gainPath, '--vehicle', VAN], io)).toBe(2);
    expect(io.err()).toMatch(/checksum/);
    expect(io.err()).toMatch(/breakpoint 2/);

    const original = JSON.parse(readFileSync(schedulePath, 'utf8')) as { checksum: { value: string } };
    original.checksum.value = '0'.repeat(64);
    const sumPath = join(dir, 'edited-checksum.json');
    writeFileSync(sumPath, JSON.stringify(original, null, 2));
    expect(await runCli(['check', sumPath, '--vehicle', VAN], recordingIo())).toBe(2);
  });

  it('fails (exit 1) when the vehicle has changed under the schedule: four times the actuator delay', async () => {
    const changed = JSON.parse(readFileSync(modelsPath, 'utf8')) as ModelsFile & { singleTrack: { actuatorDelay_s: number } };
    changed.singleTrack.actuatorDelay_s *= 4;
    const changedPath = join(dir, 'slow-actuator-models.json');
    writeFileSync(changedPath, JSON.stringify(changed, null, 2));
    const io = recordingIo();
    expect(await runCli(['check', schedulePath, '--vehicle', VAN, '--models', changedPath], io)).toBe(1);
    expect(io.out()).toMatch(/FAILED/);

    // The refit flow: a new schedule for the changed vehicle, and the old gains judged on it.
    const refit = recordingIo();
    const code = await runCli(
      ['build', '--vehicle', VAN, '--models', changedPath, '--baseline', schedulePath, '--out', join(dir, 'refit.json'), '--json'],
      refit,
    );
    const report = JSON.parse(refit.out()) as { status: string; baseline: { passedOnNewModel: boolean; failedSpeeds: number } };
    expect(report.baseline.passedOnNewModel).toBe(false);
    expect(report.baseline.failedSpeeds).toBeGreaterThan(0);
    expect(code).toBe(1);
  });
});

describe('the refit flow on the changed demo vehicle', () => {
  it('answers whether the old gains are still safe: they fail at high speed on the loaded van with softer rear tyres, and hold at low speed', async () => {
    const loaded = 'vehicles/parcel-van-loaded';
    // The loaded van identified from its bundled logs (shared: test/helpers/demo-builds.ts; the README and demo tests build from the logs).
    const loadedModels = (await demoModels('parcel-van-loaded')).path;
    const io = recordingIo();
    const code = await runCli(
      ['build', '--vehicle', loaded, '--models', loadedModels, '--baseline', schedulePath, '--out', join(dir, 'loaded.json'), '--json'],
      io,
    );
    const report = JSON.parse(io.out()) as {
      status: string;
      baseline: { passedOnNewModel: boolean; failures: { speed_mps: number }[] };
    };
    // The new schedule passes its own check; the old one does not, so the command exits 1.
    expect(report.status).toBe('passed');
    expect(report.baseline.passedOnNewModel).toBe(false);
    expect(code).toBe(1);
    // Less understeer (K = (m/L)(b/Cf − a/Cr) falls: rear CG shift and softer rear tyres, Gillespie 1992) raises the
    // yaw gain vx/(L + K·vx²) most at high speed, so the old gains fail there first (common practice: check high speed).
    const failing = report.baseline.failures.map((point) => point.speed_mps);
    expect(Math.min(...failing)).toBeGreaterThan(10);
    expect(Math.max(...failing)).toBeCloseTo(25, 0);
    // Side by side at the new breakpoints: the old gains at the top speed fail, the new ones pass there.
    const rows = (report.baseline as unknown as { atNewBreakpoints: { speed_mps: number; oldFailures: string[]; newMargins: { phaseMargin_deg: number } }[] })
      .atNewBreakpoints;
    const top = rows[rows.length - 1];
    expect(top.oldFailures.length).toBeGreaterThan(0);
    expect(top.newMargins.phaseMargin_deg).toBeGreaterThanOrEqual(45);
    expect(rows[0].oldFailures).toEqual([]);
  });
});

describe('breakpoint margins against scipy', () => {
  it('agree with an independent python computation of the same sampled loop (single-track plant, backward-Euler PID, hold and latency)', () => {
    const schedule: ScheduleFile = readSchedule(schedulePath);
    const model = schedule.provenance.model as Record<string, number>;
    // Source: an independent python computation of the same sampled loop from the single-track formulas and
    // scipy.signal.cont2discrete (test/helpers/sampled-loop-reference.ts names the textbooks).
    const reference = sampledSingleTrackMarginsInPython({
      ...(model as unknown as SingleTrackLoopCase),
      T: schedule.controller.sampleTime_s,
      N: schedule.controller.derivativeFilter,
      latency: schedule.controller.computationLatency_s,
      breakpoints: schedule.breakpoints,
    });
    schedule.breakpoints.forEach((breakpoint, k) => {
      const expected = reference[k];
      // Tolerance: 0.1 % relative on margins, 0.1 % on Ms (issue 6 asks for agreement with scipy.signal).
      expect(breakpoint.margins.phaseMargin_deg).not.toBeNull();
      expect(Math.abs(breakpoint.margins.phaseMargin_deg! - expected.pm!)).toBeLessThan(1e-3 * Math.abs(expected.pm!));
      expect(Math.abs(breakpoint.margins.upperGainMargin_dB! - expected.gm!)).toBeLessThan(1e-3 * Math.abs(expected.gm!));
      expect(Math.abs(breakpoint.margins.sensitivityPeak! - expected.ms)).toBeLessThan(1e-3 * expected.ms);
    });
  });
});

describe('speedband export of a built schedule', () => {
  it('--q-format re-checks the fixed-point gains on the model the schedule records', async () => {
    const io = recordingIo();
    expect(await runCli(['export', schedulePath, '--format', 'c', '--q-format', '16.16', '--out', join(dir, 'q16.h'), '--json'], io)).toBe(0);
    const summary = JSON.parse(io.out()) as { quantisation: { recheckPassed: boolean | null; resolutionBound: number } };
    expect(summary.quantisation.recheckPassed).toBe(true);
    // Source: Q16.16 rounding error bound 2^−17 (half of the last fractional bit).
    expect(summary.quantisation.resolutionBound).toBe(2 ** -17);
    // Too few fractional bits: Q15.1 rounds every kp of the van (0.18–0.93 rad per rad/s) to 0 or 1 (error bound 2^-2);
    // the re-check fails and nothing is written.
    const coarse = recordingIo();
    const coarsePath = join(dir, 'q15-1.h');
    expect(await runCli(['export', schedulePath, '--format', 'c', '--q-format', '15.1', '--out', coarsePath], coarse)).toBe(1);
    expect(coarse.err()).toMatch(/Dense check with the quantised gains: FAILED/);
    expect(existsSync(coarsePath)).toBe(false);
  });
});

describe('speedband demo', () => {
  it('builds, checks and exports the parcel van into one folder, and a second run changes nothing', async () => {
    const out = join(dir, 'demo');
    const io = recordingIo();
    expect(await runCli(['demo', '--out', out], io)).toBe(0);
    for (const name of ['models.json', 'schedule.json', 'schedule.h', 'schedule.csv']) expect(existsSync(join(out, name))).toBe(true);
    expect(io.out()).toMatch(/Re-checked independently from the written schedule: PASSED/);
    const again = recordingIo();
    expect(await runCli(['demo', '--out', out], again)).toBe(0);
    expect(again.out()).toMatch(/schedule\.json .*\(unchanged\)/);
  });
});

describe("a schedule edited and re-checksummed with speedband's own function", () => {
  it('gains ×3: check says FAILED (exit 1) and export writes nothing (exit 1), though the file says passed and its checksum matches', async () => {
    const schedule = JSON.parse(readFileSync(schedulePath, 'utf8')) as ScheduleFile & { breakpoints: { kp: number; ki: number; kd: number }[] };
    for (const row of schedule.breakpoints) {
      row.kp *= 3;
      row.ki *= 3;
      row.kd *= 3;
    }
    const path = join(dir, 'gains-x3.json');
    writeFileSync(path, JSON.stringify({ ...schedule, checksum: computeScheduleChecksum(schedule) }, null, 2));
    expect(readSchedule(path).status).toBe('passed');
    const check = recordingIo();
    expect(await runCli(['check', path, '--vehicle', VAN], check)).toBe(1);
    expect(check.out()).toMatch(/FAILED at \d+ speeds/);
    const out = join(dir, 'gains-x3.h');
    const exported = recordingIo();
    expect(await runCli(['export', path, '--format', 'c', '--out', out], exported)).toBe(1);
    expect(exported.err()).toMatch(/does not hold what it states/);
    expect(existsSync(out)).toBe(false);
  });
});

describe('speedband reverify (a deliberate hand edit)', () => {
  it('re-checks an edited schedule densely and, as it passes, writes it with a fresh checksum, the margins of the check and a record of the edit', async () => {
    const edited = JSON.parse(readFileSync(schedulePath, 'utf8')) as ScheduleFile & { breakpoints: { kp: number; margins: { phaseMargin_deg: number } }[] };
    edited.breakpoints[2].kp *= 0.95;
    edited.breakpoints[2].margins.phaseMargin_deg = 89; // a claim the re-verification must not keep
    const editedPath = join(dir, 'hand-tuned.json');
    writeFileSync(editedPath, JSON.stringify(edited, null, 2));
    expect(await runCli(['check', editedPath, '--vehicle', VAN], recordingIo())).toBe(2);
    const out = join(dir, 'hand-tuned-reverified.json');
    const io = recordingIo();
    expect(await runCli(['reverify', editedPath, '--vehicle', VAN, '--out', out], io)).toBe(0);
    expect(io.out()).toMatch(/changed by hand since it was written: breakpoint 2/);
    const reverified = readSchedule(out);
    expect(reverified.status).toBe('passed');
    expect(reverified.breakpoints[2].kp).toBe(edited.breakpoints[2].kp);
    expect(reverified.breakpoints[2].margins.phaseMargin_deg).not.toBe(89);
    expect(reverified.provenance.handEdits).toEqual([
      expect.objectContaining({ statement: expect.stringMatching(/edited by hand.*re-verified/i), changedSections: ['/breakpoints/2'] }),
    ]);
    expect(await runCli(['check', out, '--vehicle', VAN], recordingIo())).toBe(0);
    expect(await runCli(['export', out, '--format', 'c', '--out', join(dir, 'hand-tuned.h')], recordingIo())).toBe(0);
    const again = recordingIo();
    expect(await runCli(['reverify', out, '--vehicle', VAN, '--out', out], again)).toBe(2);
    expect(again.err()).toMatch(/never replaces an input/);
  });

  it('refuses to give a failing edit a fresh checksum: gains ×3 fail the check, nothing is written (exit 1)', async () => {
    const edited = JSON.parse(readFileSync(schedulePath, 'utf8')) as ScheduleFile & { breakpoints: { kp: number }[] };
    for (const row of edited.breakpoints) row.kp *= 3;
    const editedPath = join(dir, 'hand-x3.json');
    writeFileSync(editedPath, JSON.stringify(edited, null, 2));
    const out = join(dir, 'hand-x3-reverified.json');
    const io = recordingIo();
    expect(await runCli(['reverify', editedPath, '--vehicle', VAN, '--out', out], io)).toBe(1);
    expect(io.out()).toMatch(/Nothing written/);
    expect(existsSync(out)).toBe(false);
  });
});

describe('inputs are never outputs, and output paths are checked before any work', () => {
  it('--out equal to a log, the vehicle file, the models file or --models-out is refused with exit 2, even with --force; nothing is replaced', async () => {
    const copy = join(dir, 'inputs');
    mkdirSync(copy, { recursive: true });
    const log = join(copy, 'a-log.csv');
    copyFileSync(vanLogs()[0], log);
    const vehicle = join(copy, 'vehicle.json');
    copyFileSync(join(VAN, 'vehicle.json'), vehicle);
    const before = [readFileSync(log), readFileSync(vehicle), readFileSync(modelsPath)];
    const cases: [string[], RegExp][] = [
      [['--logs', log, ...vanLogs().slice(1), '--out', log], /the log/],
      [['--logs', ...vanLogs(), '--out', join(copy, '..', 'inputs', 'vehicle.json')], /the vehicle file/],
      [['--models', modelsPath, '--out', modelsPath], /the models file/],
      [['--models', modelsPath, '--out', join(dir, 'same.json'), '--models-out', join(dir, 'same.json')], /name the same file/],
    ];
    for (const [args, message] of cases) {
      const io = recordingIo();
      const started = Date.now();
      expect(await runCli(['build', '--vehicle', vehicle, ...args, '--force'], io)).toBe(2);
      expect(io.err()).toMatch(message);
      expect(Date.now() - started).toBeLessThan(2000); // refused before identification and the dense check
    }
    [readFileSync(log), readFileSync(vehicle), readFileSync(modelsPath)].forEach((after, k) =>
      expectSameBytes(after, before[k], [log, vehicle, modelsPath][k]),
    );
  });
});

describe('the same logs in any order, and a log given twice', () => {
  const logs = () => vanLogs().slice(0, 4);
  it('gives a byte-identical schedule for the logs in any order', async () => {
    const forward = join(dir, 'order-forward.json');
    const backward = join(dir, 'order-backward.json');
    expect(await runCli(['build', '--vehicle', VAN, '--logs', ...logs(), '--out', forward], recordingIo())).toBe(0);
    const shuffled = [logs()[2], logs()[0], logs()[3], logs()[1]];
    expect(await runCli(['build', '--vehicle', VAN, '--logs', ...shuffled, '--out', backward], recordingIo())).toBe(0);
    expectSameBytes(readFileSync(backward), readFileSync(forward));
  });

  it('refuses a log given twice (same content, another name) with exit 2, naming both paths', async () => {
    const twin = join(dir, 'twin.csv');
    copyFileSync(logs()[1], twin);
    const io = recordingIo();
    expect(await runCli(['build', '--vehicle', VAN, '--logs', ...logs(), twin, '--out', join(dir, 'twice.json')], io)).toBe(2);
    expect(io.err()).toMatch(/same content/);
    expect(io.err()).toContain(twin);
    expect(io.err()).toContain(logs()[1]);
  });
});
