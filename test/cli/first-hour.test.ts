// The traps a new user met in the first hour with speedband, each as the command they ran.
import { existsSync, mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { runCli } from '../../src/cli/main.js';
import { recordingIo } from '../../src/cli/io.js';
import { CONTROLLER_DEFAULTS } from '../../src/controller/defaults.js';
import { readSchedule } from '../../src/schedule/schedule-file.js';
import { convertLogs } from '../identify/converted-logs.js';
import { demoModels } from '../helpers/demo-builds.js';

async function run(argv: string[]): Promise<{ code: number; out: string; err: string }> {
  const io = recordingIo();
  const code = await runCli(argv, io);
  return { code, out: io.out(), err: io.err() };
}

const VAN = 'vehicles/parcel-van';

let dir: string;
let modelsPath: string;
let schedulePath: string;
let buildOutput: string;

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'speedband-first-hour-'));
  // The van identified from its bundled logs as build identifies it (shared: test/helpers/demo-builds.ts).
  modelsPath = (await demoModels('parcel-van')).path;
  schedulePath = join(dir, 'schedule.json');
  const built = await run(['build', '--vehicle', VAN, '--models', modelsPath, '--out', schedulePath]);
  if (built.code !== 0) throw new Error(`build failed: ${built.err}${built.out}`);
  buildOutput = built.out;
});

describe('the same log options on every command that reads logs', () => {
  it('build, check, identify, inspect, report, reverify and simulate take --column and --log-profile, described alike (one definition)', async () => {
    const { COMMANDS } = await import('../../src/cli/commands/index.js');
    const readers: string[] = [];
    for (const command of COMMANDS) {
      const name = command.command.split(' ')[0];
      const help = (await run([name, '--help'])).out.replace(/\s+/g, ' ');
      if (!/--logs\b|<logs\.\.>/.test(help)) continue;
      readers.push(name);
      expect(help, name).toMatch(/--column Map one channel, CHANNEL=HEADER\[:UNIT\] \(overrides the profile; repeatable\)/);
      expect(help, name).toMatch(/--log-profile JSON file naming the log columns and their units/);
    }
    expect(readers.sort()).toEqual(['build', 'check', 'identify', 'inspect', 'report', 'reverify', 'simulate']);
    // identify reads a column in another unit, as its missing-column error recommends.
    const logs = convertLogs(join(VAN, 'logs'), join(dir, 'identify-kph'), { scale: { speed_mps: 3.6 }, only: /(02|10|25)\.00mps/ });
    const identified = await run(['identify', '--vehicle', VAN, '--logs', ...logs, '--column', 'speed_mps=speed_mps:km/h', '--json', '--no-second-order']);
    expect(identified.code, identified.err).toBe(0);
    expect((JSON.parse(identified.out) as { speeds: { speed_mps: number }[] }).speeds.map((speed) => Math.round(speed.speed_mps))).toEqual([2, 10, 25]);
  });
});

/** A plan file in the test folder. */
const writePlan = (name: string, plan: unknown): string => {
  const path = join(dir, name);
  writeFileSync(path, JSON.stringify(plan));
  return path;
};

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

  it('a path loop too: tune with no preview given takes the preview and reference point build takes (0.5 m + 0.3 s × speed from the front axle)', async () => {
    const out = join(dir, 'path-migo.json');
    const built = await run([
      'build',
      '--vehicle',
      VAN,
      '--models',
      modelsPath,
      '--plan',
      writePlan('path-migo-plan.json', { loop: { kind: 'path' }, rule: { name: 'migo' } }),
      '--out',
      out,
      '--allow-failing',
    ]);
    expect(built.code, built.err).toBeLessThanOrEqual(1);
    const schedule = readSchedule(out);
    expect(schedule.loop).toMatchObject({ preview_m: 0.5, previewTime_s: 0.3, referencePoint: 'front-axle' });
    for (const breakpoint of schedule.breakpoints.filter((row) => !row.insertedByRefinement).slice(0, 3)) {
      const tuned = await run([
        'tune',
        '--rule',
        'migo',
        '--loop',
        'path',
        '--speed-mps',
        String(breakpoint.speed_mps),
        '--models',
        modelsPath,
        '--vehicle',
        VAN,
        '--json',
      ]);
      expect(tuned.code, tuned.err).toBeLessThanOrEqual(1);
      expect((JSON.parse(tuned.out) as { gains: unknown }).gains).toEqual({ kp: breakpoint.kp, ki: breakpoint.ki, kd: breakpoint.kd });
    }
  });

  it('the build summary and the tune output name the controller settings the gains assume, latency included', async () => {
    expect(buildOutput).toMatch(
      /controller the gains assume: backward-euler PID at 0\.01 s \(100 Hz\), computation latency 0\.01 s \(one sample\), derivative filter N = 10/,
    );
    const tuned = await run(['tune', '--rule', 'simc', '--speed-mps', '9', '--models', modelsPath, '--vehicle', VAN]);
    expect(tuned.out).toMatch(/^Controller: backward-euler PID at 0\.01 s \(100 Hz\), computation latency 0\.01 s \(one sample\), derivative filter N = 10$/m);
    const compared = await run(['compare', schedulePath, schedulePath]);
    expect(compared.out).toMatch(/controller the gains assume \(both\): backward-euler PID at 0\.01 s \(100 Hz\), computation latency 0\.01 s \(one sample\)/);
  });

  it('stability analyses the same discrete controller by default (0.01 s, one sample of latency); --continuous analyses the continuous PID', async () => {
    const loop = ['stability', '--gain', '2.4', '--time-constant-s', '0.12', '--dead-time-s', '0.07', '--kp', '0.29', '--ki', '2.4'];
    const byDefault = await run([...loop, '--json']);
    const explicit = await run([
      ...loop,
      '--sample-time-s',
      '0.01',
      '--latency-s',
      '0.01',
      '--discretisation',
      'backward-euler',
      '--derivative-filter',
      '10',
      '--json',
    ]);
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
  it("IMC's closedLoopTimeConstant_s in a SIMC plan: exit 2 at its JSON path, naming the parameter SIMC takes and the plan reference", async () => {
    const plan = writePlan('simc-lambda.json', { rule: { name: 'simc', parameters: { closedLoopTimeConstant_s: 0.2 } } });
    const result = await run(['build', '--vehicle', VAN, '--models', modelsPath, '--plan', plan, '--out', join(dir, 'never.json')]);
    expect(result.code).toBe(2);
    expect(result.err).toMatch(
      /at \/rule\/parameters\/closedLoopTimeConstant_s: simc does not use closedLoopTimeConstant_s \(a parameter of imc-pid\) — did you mean simcClosedLoopTimeConstant_s\? simc takes controllerType, simcClosedLoopTimeConstant_s/,
    );
    expect(result.err).toMatch(/plan reference \(every field, its unit, default and source\): docs\/plan\.md/);
    expect(existsSync(join(dir, 'never.json'))).toBe(false);
  });

  it('a damping-target parameter in a plan of the default rule (SIMC) is refused the same way', async () => {
    const plan = writePlan('simc-zeta.json', { rule: { parameters: { dampingRatio: 0.8 } } });
    const result = await run(['build', '--vehicle', VAN, '--models', modelsPath, '--plan', plan, '--out', join(dir, 'never.json')]);
    expect(result.code).toBe(2);
    expect(result.err).toMatch(/simc does not use dampingRatio \(a parameter of damping-target\)/);
    expect(result.err).toMatch(/simc is the default rule/);
  });

  it('a misspelt plan field gets the closest field name and the plan reference', async () => {
    const plan = writePlan('typo.json', { acceptance: { minimumPhaseMargin_degs: 50 } });
    const result = await run(['build', '--vehicle', VAN, '--models', modelsPath, '--plan', plan, '--out', join(dir, 'never.json')]);
    expect(result.code).toBe(2);
    expect(result.err).toMatch(/\/acceptance: unknown field "minimumPhaseMargin_degs" — did you mean "minimumPhaseMargin_deg"\?/);
    expect(result.err).toMatch(/docs\/plan\.md/);
  });

  it('tune refuses an option the rule does not use, naming the options it takes', async () => {
    const result = await run([
      'tune',
      '--rule',
      'simc',
      '--damping-ratio',
      '0.7',
      '--speed-mps',
      '8',
      '--gain',
      '2.4',
      '--time-constant-s',
      '0.12',
      '--dead-time-s',
      '0.07',
    ]);
    expect(result.code).toBe(2);
    expect(result.err).toMatch(
      /simc does not use --damping-ratio \(a parameter of damping-target\) — simc takes --controller-type, --closed-loop-time-constant-s/,
    );
    const zieglerNichols = await run([
      'tune',
      '--rule',
      'ziegler-nichols-step',
      '--closed-loop-time-constant-s',
      '0.2',
      '--speed-mps',
      '8',
      '--gain',
      '2.4',
      '--time-constant-s',
      '0.12',
      '--dead-time-s',
      '0.07',
    ]);
    expect(zieglerNichols.code).toBe(2);
    expect(zieglerNichols.err).toMatch(
      /ziegler-nichols-step does not use --closed-loop-time-constant-s \(a parameter of imc-pid, simc\) — ziegler-nichols-step takes --controller-type/,
    );
  });

  it('speedband plan --default prints the whole default plan; given back to build it builds the same schedule as no plan', async () => {
    const printed = await run(['plan', '--default']);
    expect(printed.code).toBe(0);
    const plan = JSON.parse(printed.out) as { loop: { kind: string }; acceptance: object; controller: object; check: object };
    expect(plan.loop.kind).toBe('yaw-rate');
    // Thirteen limits: the gain and phase margins, Ms, Mt, the delay-margin room, the time-domain limits (reference step, disturbances, lane change,
    // curve entry) and the speed-change error of each loop kind.
    expect(Object.keys(plan.acceptance)).toHaveLength(13);
    const path = writePlan('default-plan.json', plan);
    const out = join(dir, 'with-default-plan.json');
    expect((await run(['build', '--vehicle', VAN, '--models', modelsPath, '--plan', path, '--out', out])).code).toBe(0);
    const [withPlan, without] = [readSchedule(out), readSchedule(schedulePath)];
    expect(withPlan.breakpoints).toEqual(without.breakpoints);
    expect(withPlan.controller).toEqual(without.controller);
    expect(withPlan.check.thresholds).toEqual(without.check.thresholds);
    const path2 = JSON.parse((await run(['plan', '--default', '--loop', 'path'])).out) as {
      loop: { kind: string; previewTime_s: number };
      rule: { name: string; tuneFor: string };
      description: string;
    };
    expect(path2.loop).toMatchObject({ kind: 'path', preview_m: 0.5, previewTime_s: 0.3, referencePoint: 'front-axle' });
    expect(path2.rule).toMatchObject({ name: 'migo', tuneFor: 'fastest-passing' });
    expect(path2.description).toMatch(/MIGO/);
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

  it("a steering-wheel angle in degrees mapped as a road-wheel angle in degrees: exit 2 naming the steering ratio's unit, steering-wheel-deg", async () => {
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

describe('machine and human output', () => {
  it('under --json an error is JSON on standard output {"error": {code, message, location}} with exit 2 (bad input and usage alike)', async () => {
    const missing = await run(['build', '--vehicle', VAN, '--models', join(dir, 'no-such-models.json'), '--out', join(dir, 'never.json'), '--json']);
    expect(missing.code).toBe(2);
    const error = (JSON.parse(missing.out) as { error: { code: string; message: string; location: { file?: string } } }).error;
    expect(error.code).toBe('file.unreadable');
    expect(error.location.file).toBe(join(dir, 'no-such-models.json'));
    expect(error.message).toMatch(/no such file/);
    const logs = convertLogs(join(VAN, 'logs'), join(dir, 'kph-json'), { scale: { speed_mps: 3.6 } });
    const scaled = await run(['identify', '--vehicle', VAN, '--logs', ...logs, '--json']);
    expect(scaled.code).toBe(2);
    expect((JSON.parse(scaled.out) as { error: { code: string } }).error.code).toBe('identify.channelScale');
    const usage = await run(['check', schedulePath, '--vehicle', VAN, '--unheard-of-option', '--json']);
    expect(usage.code).toBe(2);
    expect((JSON.parse(usage.out) as { error: { code: string; message: string } }).error).toMatchObject({
      code: 'cli.usage',
      message: expect.stringMatching(/Unknown argument.*unheard-of-option/),
    });
    // Without --json the error stays words on standard error only.
    const words = await run(['build', '--vehicle', VAN, '--models', join(dir, 'no-such-models.json'), '--out', join(dir, 'never.json')]);
    expect(words.out).toBe('');
    expect(words.err).toMatch(/^speedband: .*no-such-models\.json/);
  });

  it("every command's --help lists its exit codes, 0, 2 and 3 at least", async () => {
    const { COMMANDS } = await import('../../src/cli/commands/index.js');
    for (const command of COMMANDS) {
      const name = command.command.split(' ')[0];
      const help = await run([name, '--help']);
      expect(help.code, name).toBe(0);
      const section = help.out.slice(help.out.indexOf('Exit codes:'), help.out.indexOf('Safety:'));
      expect(section, name).toMatch(/^Exit codes:\n {2}0 {2}\S/);
      expect(section, name).toMatch(/^ {2}2 {2}\S/m);
      expect(section, name).toMatch(/^ {2}3 {2}a bug in speedband/m);
    }
    const build = await run(['build', '--help']);
    expect(build.out.replace(/\s+/g, ' ')).toMatch(
      / 1 the schedule failed its dense check .* or with --baseline the OLD gains fail on the new vehicle model .* the output says which/,
    );
  });

  it('build --baseline: exit 1 says it is the old gains that fail, and that the new schedule passed and was written', async () => {
    // The loaded van identified from its bundled logs as build identifies it (shared: test/helpers/demo-builds.ts).
    const loadedModels = (await demoModels('parcel-van-loaded')).path;
    const out = join(dir, 'loaded.json');
    const text = await run(['build', '--vehicle', 'vehicles/parcel-van-loaded', '--models', loadedModels, '--baseline', schedulePath, '--out', out]);
    expect(text.code).toBe(1);
    expect(readSchedule(out).status).toBe('passed');
    expect(text.out).toMatch(
      /Exit 1: the OLD gains of the baseline \S+ fail on the new vehicle model at \d+ of \d+ speeds \(the new schedule passed and was written\)\./,
    );
    const json = await run(['build', '--vehicle', 'vehicles/parcel-van-loaded', '--models', loadedModels, '--baseline', schedulePath, '--out', out, '--json']);
    const parsed = JSON.parse(json.out) as {
      exitCode: number;
      exitReasons: string[];
      status: string;
      baseline: { failures: { speed_mps: number; messages: string[] }[] };
    };
    expect(parsed.exitCode).toBe(1);
    expect(parsed.status).toBe('passed');
    expect(parsed.exitReasons).toHaveLength(1);
    expect(parsed.baseline.failures[0]).toEqual({
      speed_mps: expect.any(Number),
      messages: [expect.any(String), ...parsed.baseline.failures[0].messages.slice(1)],
    });
  });

  it('the build table shows pass or FAIL against the limits beside the closed-loop verdict; failing speeds have one JSON shape in build and check', async () => {
    const plan = join(dir, 'heading.json');
    // SIMC named: its parameters as given (τc = θ), no search — short of the phase-margin limit at speed.
    writeFileSync(plan, JSON.stringify({ loop: { kind: 'heading' }, rule: { name: 'simc' } }));
    const out = join(dir, 'heading-schedule.json');
    const built = await run(['build', '--vehicle', VAN, '--models', modelsPath, '--plan', plan, '--out', out, '--allow-failing']);
    expect(built.code).toBe(1);
    // A stable loop below the phase-margin limit: "stable" in the closed-loop column, "FAIL: PM" under the limits.
    expect(built.out).toMatch(/closed loop\s+limits/);
    expect(built.out).toMatch(/\s25\.00\s.*\sstable\s+FAIL: PM, Ms/);
    expect(built.out).toMatch(/\s2\.00\s.*\sstable\s+pass/);
    const buildJson = JSON.parse(
      (await run(['build', '--vehicle', VAN, '--models', modelsPath, '--plan', plan, '--out', out, '--allow-failing', '--json'])).out,
    ) as {
      check: { failures: { speed_mps: number; messages: string[] }[] };
    };
    const checkJson = JSON.parse((await run(['check', out, '--vehicle', VAN, '--json'])).out) as { failures: { speed_mps: number; messages: string[] }[] };
    expect(Object.keys(checkJson.failures[0]).sort()).toEqual(['messages', 'speed_mps']);
    expect(Object.keys(buildJson.check.failures[0]).sort()).toEqual(['messages', 'speed_mps']);
    expect(checkJson.failures[0]).toEqual(buildJson.check.failures[0]);
  });

  it('labels in plain words: the model of the check and what limited a step amplitude', async () => {
    const plan = join(dir, 'lumped.json');
    writeFileSync(plan, JSON.stringify({ check: { model: 'interpolated-lumped' } }));
    const built = await run(['build', '--vehicle', VAN, '--models', modelsPath, '--plan', plan, '--out', join(dir, 'lumped-schedule.json')]);
    expect(built.out).toMatch(/dense check on the per-speed models interpolated in speed,/);
    expect(built.out).not.toMatch(/interpolated-lumped/);
    const logs = await run(['make-test-logs', '--vehicle', VAN, '--speeds', '2,10', '--out', join(dir, 'made')]);
    expect(logs.out).toMatch(/steer rate limit/);
    expect(logs.out).toMatch(/lateral acceleration target/);
    expect(logs.out).not.toMatch(/rateLimit|lateralAcceleration\b/);
  });
});

describe('models of another vehicle, and gains beyond the tested speeds', () => {
  it('build --models refuses models identified with another vehicle file unless --allow-other-vehicle', async () => {
    const refused = await run(['build', '--vehicle', 'vehicles/parcel-van-loaded', '--models', modelsPath, '--out', join(dir, 'other.json')]);
    expect(refused.code).toBe(2);
    expect(refused.err).toMatch(
      /the models were identified with another vehicle file \("parcel-van", "vehicle\.json", SHA-256 [0-9a-f]{12}…\) than the one given \("parcel-van-loaded"/,
    );
    expect(refused.err).toMatch(/--allow-other-vehicle/);
    expect(existsSync(join(dir, 'other.json'))).toBe(false);
    const allowed = await run([
      'build',
      '--vehicle',
      'vehicles/parcel-van-loaded',
      '--models',
      modelsPath,
      '--out',
      join(dir, 'other.json'),
      '--allow-other-vehicle',
    ]);
    expect([0, 1]).toContain(allowed.code);
  });

  it('tune below the tested speeds says how far and how large the gains are against the lowest tested speed', async () => {
    const low = await run(['tune', '--rule', 'simc', '--speed-mps', '0.5', '--models', modelsPath, '--vehicle', VAN, '--json']);
    const at2 = await run([
      'tune',
      '--rule',
      'simc',
      '--speed-mps',
      String(readSchedule(schedulePath).breakpoints[0].speed_mps),
      '--models',
      modelsPath,
      '--vehicle',
      VAN,
      '--json',
    ]);
    const [gains, reference] = [
      JSON.parse(low.out) as { gains: { kp: number; ki: number }; warnings: string[] },
      JSON.parse(at2.out) as { gains: { kp: number; ki: number } },
    ];
    const warning = gains.warnings.find((text) => /below the lowest tested speed/.test(text));
    expect(warning).toMatch(
      /^0\.5 m\/s is 1\.5 m\/s \(75 %\) below the lowest tested speed, 2 m\/s: the model is extrapolated there, and the gains are kp [\d.]+×, ki [\d.]+× those at 2 m\/s/,
    );
    const kpRatio = Number(/kp ([\d.]+)×/.exec(warning ?? '')?.[1]);
    expect(kpRatio).toBeCloseTo(gains.gains.kp / reference.gains.kp, 2);
    expect(kpRatio).toBeGreaterThan(2);
    const text = await run(['tune', '--rule', 'simc', '--speed-mps', '0.5', '--models', modelsPath, '--vehicle', VAN]);
    expect(text.out).toMatch(/^Warning: 0\.5 m\/s is 1\.5 m\/s \(75 %\) below the lowest tested speed/m);
  });
});
