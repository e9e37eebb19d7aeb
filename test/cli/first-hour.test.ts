// The traps a new user met in the first hour with speedband, each as the command they ran.
import { existsSync, mkdtempSync, readdirSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { runCli } from '../../src/cli/main.js';
import { recordingIo } from '../../src/cli/io.js';
import { CONTROLLER_DEFAULTS } from '../../src/controller/defaults.js';
import { readSchedule } from '../../src/schedule/schedule-file.js';
import { convertLogs } from '../identify/converted-logs.js';

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

describe('plan parameters: a parameter the rule does not use is refused, in plans and on the command line', () => {
  const planFile = (name: string, plan: unknown): string => {
    const path = join(dir, name);
    writeFileSync(path, JSON.stringify(plan));
    return path;
  };

  it('IMC\'s closedLoopTimeConstant_s in a SIMC plan: exit 2 at its JSON path, naming the parameter SIMC takes and the plan reference', async () => {
    const plan = planFile('simc-lambda.json', { rule: { name: 'simc', parameters: { closedLoopTimeConstant_s: 0.2 } } });
    const result = await run(['build', '--vehicle', VAN, '--models', modelsPath, '--plan', plan, '--out', join(dir, 'never.json')]);
    expect(result.code).toBe(2);
    expect(result.err).toMatch(/at \/rule\/parameters\/closedLoopTimeConstant_s: simc does not use closedLoopTimeConstant_s \(a parameter of imc-pid\) — did you mean simcClosedLoopTimeConstant_s\? simc takes controllerType, simcClosedLoopTimeConstant_s/);
    expect(result.err).toMatch(/plan reference \(every field, its unit, default and source\): docs\/plan\.md/);
    expect(existsSync(join(dir, 'never.json'))).toBe(false);
  });

  it('a damping-target parameter in a plan of the default rule (SIMC) is refused the same way', async () => {
    const plan = planFile('simc-zeta.json', { rule: { parameters: { dampingRatio: 0.8 } } });
    const result = await run(['build', '--vehicle', VAN, '--models', modelsPath, '--plan', plan, '--out', join(dir, 'never.json')]);
    expect(result.code).toBe(2);
    expect(result.err).toMatch(/simc does not use dampingRatio \(a parameter of damping-target\)/);
    expect(result.err).toMatch(/simc is the default rule/);
  });

  it('a misspelt plan field gets the closest field name and the plan reference', async () => {
    const plan = planFile('typo.json', { acceptance: { minimumPhaseMargin_degs: 50 } });
    const result = await run(['build', '--vehicle', VAN, '--models', modelsPath, '--plan', plan, '--out', join(dir, 'never.json')]);
    expect(result.code).toBe(2);
    expect(result.err).toMatch(/\/acceptance: unknown field "minimumPhaseMargin_degs" — did you mean "minimumPhaseMargin_deg"\?/);
    expect(result.err).toMatch(/docs\/plan\.md/);
  });

  it('tune refuses an option the rule does not use, naming the options it takes', async () => {
    const result = await run(['tune', '--rule', 'simc', '--damping-ratio', '0.7', '--speed-mps', '8', '--gain', '2.4', '--time-constant-s', '0.12', '--dead-time-s', '0.07']);
    expect(result.code).toBe(2);
    expect(result.err).toMatch(/simc does not use --damping-ratio \(a parameter of damping-target\) — simc takes --controller-type, --closed-loop-time-constant-s/);
    const zieglerNichols = await run(['tune', '--rule', 'ziegler-nichols-step', '--closed-loop-time-constant-s', '0.2', '--speed-mps', '8', '--gain', '2.4', '--time-constant-s', '0.12', '--dead-time-s', '0.07']);
    expect(zieglerNichols.code).toBe(2);
    expect(zieglerNichols.err).toMatch(/ziegler-nichols-step does not use --closed-loop-time-constant-s \(a parameter of imc-pid, simc\) — ziegler-nichols-step takes --controller-type/);
  });

  it('speedband plan --default prints the whole default plan; given back to build it builds the same schedule as no plan', async () => {
    const printed = await run(['plan', '--default']);
    expect(printed.code).toBe(0);
    const plan = JSON.parse(printed.out) as { loop: { kind: string }; acceptance: object; controller: object; check: object };
    expect(plan.loop.kind).toBe('yaw-rate');
    expect(Object.keys(plan.acceptance)).toHaveLength(5);
    const path = planFile('default-plan.json', plan);
    const out = join(dir, 'with-default-plan.json');
    expect((await run(['build', '--vehicle', VAN, '--models', modelsPath, '--plan', path, '--out', out])).code).toBe(0);
    const [withPlan, without] = [readSchedule(out), readSchedule(schedulePath)];
    expect(withPlan.breakpoints).toEqual(without.breakpoints);
    expect(withPlan.controller).toEqual(without.controller);
    expect(withPlan.check.thresholds).toEqual(without.check.thresholds);
    const path2 = JSON.parse((await run(['plan', '--default', '--loop', 'path'])).out) as { loop: { kind: string }; description: string };
    expect(path2.loop.kind).toBe('path');
    expect(path2.description).toMatch(/damping-target/);
  });
});

describe('inputs checked against physics: a channel off by a unit factor is refused with its likely unit and the --column fix', () => {
  // Source: SI and the international yard (1959): 1 km/h = 1/3.6 m/s, 1 mph = 0.44704 m/s (a factor 2.237); 1 rad = 57.2958°.
  it('speed logged in km/h under speed_mps: build exits 2 naming km/h and the --column fix; with the fix it builds the 2–25 m/s schedule', async () => {
    const logs = convertLogs(join(VAN, 'logs'), join(dir, 'kph'), { scale: { speed_mps: 3.6 } });
    const out = join(dir, 'kph-schedule.json');
    const refused = await run(['build', '--vehicle', VAN, '--logs', ...logs, '--out', out]);
    expect(refused.code).toBe(2);
    expect(refused.err).toMatch(/speed_mps \(column "speed_mps" read as m\/s\) reads 3\.60× too high/);
    expect(refused.err).toMatch(/it looks like km\/h: --column speed_mps=speed_mps:km\/h/);
    expect(existsSync(out)).toBe(false);
    const fixed = await run(['build', '--vehicle', VAN, '--logs', ...logs, '--column', 'speed_mps=speed_mps:km/h', '--out', out]);
    expect(fixed.code).toBe(0);
    const schedule = readSchedule(out);
    expect(schedule.check.range.minimum_mps).toBeCloseTo(2, 1);
    expect(schedule.check.range.maximum_mps).toBeCloseTo(25, 1);
  });

  it('speed in mph, without lateral acceleration or measured steer angle logged: identify exits 2 naming mph from the kinematic yaw gain alone', async () => {
    const logs = convertLogs(join(VAN, 'logs'), join(dir, 'mph'), { scale: { speed_mps: 1 / 0.44704 }, drop: ['lat_accel_mps2', 'steer_angle_rad'] });
    const refused = await run(['identify', '--vehicle', VAN, '--logs', ...logs, '--json']);
    expect(refused.code).toBe(2);
    expect(refused.err).toMatch(/speed_mps \(column "speed_mps" read as m\/s\) reads 2\.24× too high/);
    expect(refused.err).toMatch(/kinematic v\/L/);
    expect(refused.err).toMatch(/--column speed_mps=speed_mps:mph/);
    expect(refused.err).toMatch(/logging lat_accel_mps2 and steer_angle_rad tells the channels apart/);
  });

  it('a steering-wheel angle in degrees mapped as a road-wheel angle in degrees: exit 2 naming the steering ratio\'s unit, steering-wheel-deg', async () => {
    // The van's steering ratio is 18; its logs from 15 m/s up keep the steering-wheel angle below the road-wheel limit.
    const logs = convertLogs(join(VAN, 'logs'), join(dir, 'steering-wheel'), { scale: { steer_cmd_rad: 18 * (180 / Math.PI) }, only: /(15|18|21|25)\.00mps/ });
    const refused = await run(['build', '--vehicle', VAN, '--logs', ...logs, '--column', 'steer_cmd_rad=steer_cmd_rad:deg', '--out', join(dir, 'never.json')]);
    expect(refused.code).toBe(2);
    expect(refused.err).toMatch(/steer_cmd_rad \(column "steer_cmd_rad" read as deg\) reads 18\.0× too high/);
    expect(refused.err).toMatch(/--column steer_cmd_rad=steer_cmd_rad:steering-wheel-deg/);
    // In a radian column the same angles are refused on reading, as a steering-wheel angle or degrees.
    const unmapped = await run(['build', '--vehicle', VAN, '--logs', ...logs, '--out', join(dir, 'never.json')]);
    expect(unmapped.code).toBe(2);
    expect(unmapped.err).toMatch(/steering-wheel-deg/);
  });
});
