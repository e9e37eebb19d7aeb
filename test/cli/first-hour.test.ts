// The traps a new user met in the first hour with speedband, each as the command they ran.
import { mkdtempSync, readdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { runCli } from '../../src/cli/main.js';
import { recordingIo } from '../../src/cli/io.js';
import { CONTROLLER_DEFAULTS } from '../../src/controller/defaults.js';
import { readSchedule } from '../../src/schedule/schedule-file.js';

async function run(argv: string[]): Promise<{ code: number; out: string; err: string }> {
  const io = recordingIo();
  const code = await runCli(argv, io);
  return { code, out: io.out(), err: io.err() };
}

const VAN = 'vehicles/parcel-van';
const vanLogs = (): string[] =>
  readdirSync(join(VAN, 'logs'))
    .filter((name) => name.endsWith('.csv'))
    .sort()
    .map((name) => join(VAN, 'logs', name));

let dir: string;
let modelsPath: string;
let schedulePath: string;
let buildOutput: string;

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'speedband-first-hour-'));
  modelsPath = join(dir, 'models.json');
  schedulePath = join(dir, 'schedule.json');
  const built = await run(['build', '--vehicle', VAN, '--logs', ...vanLogs(), '--out', schedulePath, '--models-out', modelsPath]);
  if (built.code !== 0) throw new Error(`build failed: ${built.err}${built.out}`);
  buildOutput = built.out;
});

describe('one set of controller defaults: tune, stability and build', () => {
  it('tune at a breakpoint speed gives the gains build wrote there, with the default settings of both', async () => {
    const schedule = readSchedule(schedulePath);
    for (const breakpoint of schedule.breakpoints) {
      const tuned = await run(['tune', '--rule', 'simc', '--speed-mps', String(breakpoint.speed_mps), '--models', modelsPath, '--vehicle', VAN, '--json']);
      expect(tuned.code).toBe(0);
      const json = JSON.parse(tuned.out) as { gains: { kp: number; ki: number; kd: number }; controller: unknown; sampledMargins: { phaseMargin_deg: number } };
      expect(json.gains).toEqual({ kp: breakpoint.kp, ki: breakpoint.ki, kd: breakpoint.kd });
      // The margins of the discrete PID tune reports are the ones build proved at the breakpoint.
      expect(json.sampledMargins.phaseMargin_deg).toBeCloseTo(breakpoint.margins.phaseMargin_deg as number, 6);
      expect(json.controller).toEqual({
        derivativeFilter: schedule.controller.derivativeFilter,
        sampleTime_s: schedule.controller.sampleTime_s,
        discretisation: schedule.controller.discretisation,
        computationLatency_s: schedule.controller.computationLatency_s,
      });
    }
    // One sample of latency by default (the van's controllerSampleTime_s is 0.01 s).
    expect(schedule.controller.computationLatency_s).toBe(0.01);
  });

  it('the build summary and the tune output name the controller settings the gains assume, latency included', async () => {
    expect(buildOutput).toMatch(/controller the gains assume: backward-euler PID at 0\.01 s \(100 Hz\), computation latency 0\.01 s \(one sample\), derivative filter N = 10/);
    const tuned = await run(['tune', '--rule', 'simc', '--speed-mps', '9', '--models', modelsPath, '--vehicle', VAN]);
    expect(tuned.out).toMatch(/^Controller: backward-euler PID at 0\.01 s \(100 Hz\), computation latency 0\.01 s \(one sample\), derivative filter N = 10$/m);
  });

  it('stability analyses the same discrete controller by default (0.01 s, one sample of latency); --continuous analyses the continuous PID', async () => {
    const loop = ['stability', '--gain', '2.4', '--time-constant-s', '0.12', '--dead-time-s', '0.07', '--kp', '0.29', '--ki', '2.4'];
    const byDefault = await run([...loop, '--json']);
    const explicit = await run([...loop, '--sample-time-s', '0.01', '--latency-s', '0.01', '--discretisation', 'backward-euler', '--derivative-filter', '10', '--json']);
    const continuous = await run([...loop, '--continuous', '--json']);
    expect(JSON.parse(byDefault.out)).toEqual(JSON.parse(explicit.out));
    expect((JSON.parse(byDefault.out) as { controller: unknown }).controller).toEqual(CONTROLLER_DEFAULTS);
    // Source: common practice — the hold (Ts/2) and one sample of latency add 15 ms of delay, ≈ ωc·0.015 rad less phase margin.
    const sampled = JSON.parse(byDefault.out) as { phaseMargin_deg: number };
    const free = JSON.parse(continuous.out) as { phaseMargin_deg: number; phaseMarginFrequency_radps: number };
    const expectedLoss_deg = free.phaseMarginFrequency_radps * 0.015 * (180 / Math.PI);
    expect(free.phaseMargin_deg - sampled.phaseMargin_deg).toBeGreaterThan(0.7 * expectedLoss_deg);
    expect(free.phaseMargin_deg - sampled.phaseMargin_deg).toBeLessThan(1.3 * expectedLoss_deg);
    expect((await run([...loop])).out).toMatch(/^controller: backward-euler PID at 0\.01 s \(100 Hz\), computation latency 0\.01 s \(one sample\)/);
  });
});
