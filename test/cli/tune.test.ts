import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { recordingIo } from '../../src/cli/io.js';
import { runCli } from '../../src/cli/main.js';
import { CONTROLLER_DEFAULTS } from '../../src/controller/defaults.js';
import { modelsToJson, readModels } from '../../src/identify/models-file.js';
import type { ModelsFile } from '../../src/identify/models-schema.js';
import { tuneOperatingPoint } from '../../src/tuning/operating-point.js';

const fopdt = ['--gain', '2.4', '--time-constant-s', '0.12', '--dead-time-s', '0.07'];

async function run(argv: string[]): Promise<{ code: number; out: string; err: string }> {
  const io = recordingIo();
  const code = await runCli(argv, io);
  return { code, out: io.out(), err: io.err() };
}

describe('speedband tune', () => {
  it('SIMC on a yaw-rate FOPDT prints Kc = τ/(K(τc+θ)) and the closed-form phase margin of e^(−θs)/(2θs); exit 0', async () => {
    const { code, out } = await run(['tune', '--rule', 'simc', '--loop', 'yaw-rate', '--speed-mps', '8', ...fopdt]);
    expect(code).toBe(0);
    // Source: Skogestad 2003 SIMC PI; θ = 0.07 s + Ts/2 + latency = 0.085 s (default Ts 0.01 s, one sample of latency, as build):
    // Kc = 0.12/(2.4·0.17) = 0.29412, τI = min(0.12, 4·0.17) = 0.12 s, ki = Kc/τI = 2.4510.
    expect(out).toMatch(/Controller: backward-euler PID at 0\.01 s \(100 Hz\), computation latency 0\.01 s \(one sample\), derivative filter N = 10/);
    expect(out).toMatch(/kp = 0\.29412 rad per rad\/s/);
    expect(out).toMatch(/ki = 2\.4510 rad per rad\b/);
    // Closed form: PM = 90° − 0.5 rad = 61.352°, upper GM = 20·log10(π) = 9.943 dB.
    expect(out).toMatch(/phase margin\s+61\.352 °/);
    expect(out).toMatch(/upper gain margin\s+9\.9430 dB/);
    expect(out).toMatch(/Skogestad, S\. \(2003\)/);
  });

  it('--json gives the gains, the derivation and the margins as data', async () => {
    const { code, out } = await run(['tune', '--rule', 'imc-pid', '--speed-mps', '8', ...fopdt, '--closed-loop-time-constant-s', '0.1', '--json']);
    expect(code).toBe(0);
    const parsed = JSON.parse(out) as { gains: { kp: number; ki: number; kd: number }; derivation: { rule: string }; margins: { stable: boolean } };
    // Source: Rivera, Morari & Skogestad 1986 with θ = 0.07 + Ts/2 + one sample of latency = 0.085 s, τ = 0.12 s, λ = 0.1 s, K = 2.4:
    // Kc = (2τ+θ)/(K(2λ+θ)).
    const kc = (2 * 0.12 + 0.085) / (2.4 * (2 * 0.1 + 0.085));
    expect(parsed.gains.kp).toBeCloseTo(kc, 12);
    expect(parsed.gains.ki).toBeCloseTo(kc / (0.12 + 0.085 / 2), 12);
    expect(parsed.gains.kd).toBeCloseTo((kc * 0.12 * 0.085) / (2 * 0.12 + 0.085), 12);
    expect(parsed.derivation.rule).toBe('imc-pid');
    expect(parsed.margins.stable).toBe(true);
  });

  it('Ziegler–Nichols for a path loop exits 2 saying why and naming the rules that apply', async () => {
    const { code, err } = await run(['tune', '--rule', 'ziegler-nichols-step', '--loop', 'path', '--preview-m', '0', '--speed-mps', '8', ...fopdt]);
    expect(code).toBe(2);
    expect(err).toMatch(/no finite maximum slope/);
    expect(err).toMatch(/rules that apply: simc, damping-target/);
  });

  it('a tuned loop that is unstable on the full plant exits 1 and says so', async () => {
    const { code, out } = await run([
      'tune',
      '--rule',
      'simc',
      '--loop',
      'path',
      '--preview-m',
      '0',
      '--speed-mps',
      '8',
      ...fopdt,
      '--closed-loop-time-constant-s',
      '0.01',
    ]);
    expect(code).toBe(1);
    expect(out).toMatch(/NOT stable/);
  });

  it('the single-track model from a demo vehicle file, path loop with a front-axle preview', async () => {
    const { code, out } = await run([
      'tune',
      '--rule',
      'damping-target',
      '--loop',
      'path',
      '--preview-m',
      '2',
      '--reference-point',
      'front-axle',
      '--speed-mps',
      '10',
      '--settling-distance-m',
      '100',
      '--vehicle',
      'vehicles/parcel-van',
    ]);
    expect(code).toBe(0);
    // Front-axle preview: d = 2 m + a (parcel van a = 1.75 m).
    expect(out).toMatch(/3\.7500 m from the CG/);
    // ωn = 4·v/(ζ·D) = 4·10/100 (docs/domain.md §4).
    expect(out).toMatch(/naturalFrequency_radps = 0\.40000/);
  });

  it('a settling target too fast for the preview lead exits 2 with how far to lower ωn', async () => {
    const { code, err } = await run([
      'tune',
      '--rule',
      'damping-target',
      '--loop',
      'path',
      '--preview-m',
      '2',
      '--reference-point',
      'front-axle',
      '--speed-mps',
      '10',
      '--settling-distance-m',
      '40',
      '--vehicle',
      'vehicles/parcel-van',
    ]);
    expect(code).toBe(2);
    expect(err).toMatch(/lower ωn to at most [0-9.]+ rad\/s/);
  });

  it('bad input exits 2: no model, an incomplete FOPDT, an unknown rule', async () => {
    expect((await run(['tune', '--rule', 'simc', '--speed-mps', '8'])).err).toMatch(/no model given/);
    const incomplete = await run(['tune', '--rule', 'simc', '--speed-mps', '8', '--gain', '2']);
    expect(incomplete.code).toBe(2);
    expect(incomplete.err).toMatch(/needs all of --gain, --time-constant-s and --dead-time-s/);
    expect((await run(['tune', '--rule', 'ziegler', '--speed-mps', '8', ...fopdt])).code).toBe(2);
  });

  it('--help describes the options with units and defaults and shows examples', async () => {
    const { code, out } = await run(['tune', '--help']);
    expect(code).toBe(0);
    expect(out).toMatch(/--speed-mps/);
    expect(out).toMatch(/settling distance D, m/);
    expect(out).toMatch(/Examples:/);
  });
});

describe('speedband tune --models (the model identified by speedband identify)', () => {
  const logs = 'vehicles/parcel-van/logs';
  const directory = mkdtempSync(join(tmpdir(), 'speedband-tune-models-'));
  const jointFile = join(directory, 'models.json');
  const lumpedFile = join(directory, 'models-lumped.json');
  let joint: ModelsFile;
  let lumped: ModelsFile;

  beforeAll(async () => {
    const identified = await run([
      'identify',
      '--vehicle',
      'vehicles/parcel-van',
      '--logs',
      `${logs}/synthetic-steps-06.00mps.csv`,
      `${logs}/synthetic-steps-10.00mps.csv`,
      `${logs}/synthetic-steps-15.00mps.csv`,
      '--out',
      jointFile,
    ]);
    expect(identified.code).toBe(0);
    joint = readModels(jointFile);
    // The same file as if the joint fit had been refused: only the per-speed FOPDT models remain.
    lumped = { ...joint, singleTrack: null, singleTrackRefusal: { reasonCode: 'notRequested', reason: 'the joint single-track fit was switched off' } };
    writeFileSync(lumpedFile, modelsToJson(lumped, lumpedFile));
  });
  afterAll(() => rmSync(directory, { recursive: true, force: true }));

  type TuneJson = {
    model: { kind: string; description: string };
    gains: { kp: number; ki: number; kd: number };
    design: { yawRateGain_perS: number; yawRateTimeConstant_s: number; yawRateDeadTime_s: number };
    warnings: string[];
  };
  const tuneJson = async (argv: string[]): Promise<{ code: number; json: TuneJson }> => {
    const { code, out } = await run(['tune', ...argv, '--json']);
    return { code, json: JSON.parse(out) as TuneJson };
  };

  it('with the joint single-track fit: tunes on the fitted Cf, Cr with the vehicle file geometry (steady yaw gain vx/(L + K·vx²))', async () => {
    const { code, json } = await tuneJson([
      '--rule',
      'simc',
      '--loop',
      'heading',
      '--speed-mps',
      '10',
      '--models',
      jointFile,
      '--vehicle',
      'vehicles/parcel-van',
    ]);
    expect(code).toBe(0);
    expect(json.model.kind).toBe('single-track');
    expect(json.model.description).toMatch(/joint single-track fit over \d+ steps/);
    expect(json.warnings.filter((w) => /outside the tested range|differs from the one/.test(w))).toEqual([]);
    // Source: Gillespie 1992 / Rajamani 2012 (docs/domain.md §3): r/δ = vx/(L + K·vx²), K = (m/L)(b/Cf − a/Cr);
    // parcel van m = 3400 kg, a = 1.75 m, b = 1.85 m, L = 3.6 m, with the fitted Cf, Cr (the actuator's steady gain is 1).
    const fit = joint.singleTrack!;
    const understeer = (3400 / 3.6) * (1.85 / fit.frontCorneringStiffness_NPerRad - 1.75 / fit.rearCorneringStiffness_NPerRad);
    expect(json.design.yawRateGain_perS).toBeCloseTo(10 / (3.6 + understeer * 100), 6);
    // The vehicle file's nominal stiffnesses (120000, 180000 N/rad) would give 2.41671 1/s: the fitted model is used, not those.
    expect(Math.abs(json.design.yawRateGain_perS - 10 / (3.6 + (3400 / 3.6) * (1.85 / 120000 - 1.75 / 180000) * 100))).toBeGreaterThan(1e-5);
    // The same gains as tuning the single-track model built from the fit and the vehicle file's mass, inertia and geometry.
    const direct = tuneOperatingPoint({
      loop: { kind: 'heading', preview_m: 0, referencePoint: 'cg' },
      speed_mps: 10,
      model: {
        kind: 'single-track',
        parameters: {
          mass_kg: 3400,
          yawInertia_kgm2: 11000,
          cgToFrontAxle_m: 1.75,
          cgToRearAxle_m: 1.85,
          frontCorneringStiffness_NPerRad: fit.frontCorneringStiffness_NPerRad,
          rearCorneringStiffness_NPerRad: fit.rearCorneringStiffness_NPerRad,
          actuatorLag_s: fit.actuatorLag_s,
          actuatorDelay_s: fit.actuatorDelay_s,
        },
      },
      rule: 'simc',
      ruleParameters: {},
      controller: { ...CONTROLLER_DEFAULTS, sampleTime_s: 0.01 },
    });
    expect(json.gains).toEqual(direct.gains);
  });

  it('without it, at a test speed: the per-speed FOPDT as identified, SIMC Kc = τ/(K(τc + θ)), τI = min(τ, 4(τc + θ)), and the words name the speed', async () => {
    const { code, json } = await tuneJson(['--rule', 'simc', '--speed-mps', '10', '--models', lumpedFile, '--vehicle', 'vehicles/parcel-van']);
    expect(code).toBe(0);
    expect(json.model.kind).toBe('lumped');
    expect(json.model.description).toMatch(
      /the FOPDT identified at the 10\.00 m\/s test speed — the models file has no joint single-track fit \(the joint single-track fit was switched off\)/,
    );
    const at10 = lumped.speeds.find((speed) => Math.abs(speed.speed_mps - 10) < 0.1)!.fopdt;
    expect(json.design.yawRateGain_perS).toBe(at10.gain);
    expect(json.design.yawRateTimeConstant_s).toBe(at10.timeConstant_s);
    // Source: Skogestad 2003, SIMC for FOPDT with τc = θ; θ = identified dead time + Ts/2 + one sample of latency (the van's Ts = 0.01 s).
    const theta = at10.deadTime_s + 0.005 + 0.01;
    const kc = at10.timeConstant_s / (at10.gain * 2 * theta);
    expect(json.gains.kp).toBeCloseTo(kc, 10);
    expect(json.gains.ki).toBeCloseTo(kc / Math.min(at10.timeConstant_s, 8 * theta), 10);
  });

  it('between test speeds the FOPDT parameters are linear in speed; beyond the tested range the end model is held with a warning', async () => {
    const between = await tuneJson(['--rule', 'simc', '--speed-mps', '12', '--models', lumpedFile, '--vehicle', 'vehicles/parcel-van']);
    const [low, high] = [lumped.speeds.find((s) => Math.abs(s.speed_mps - 10) < 0.1)!, lumped.speeds.find((s) => Math.abs(s.speed_mps - 15) < 0.1)!];
    const t = (12 - low.speed_mps) / (high.speed_mps - low.speed_mps);
    // Linear interpolation, by hand.
    expect(between.json.design.yawRateGain_perS).toBeCloseTo(low.fopdt.gain + t * (high.fopdt.gain - low.fopdt.gain), 12);
    expect(between.json.design.yawRateDeadTime_s).toBeCloseTo(low.fopdt.deadTime_s + t * (high.fopdt.deadTime_s - low.fopdt.deadTime_s), 12);
    expect(between.json.model.description).toMatch(/FOPDT models of the 10\.00 and 15\.00 m\/s test speeds, interpolated linearly/);
    expect(between.json.warnings.filter((w) => /outside the tested range/.test(w))).toEqual([]);

    const beyond = await run(['tune', '--rule', 'simc', '--speed-mps', '20', '--models', lumpedFile, '--vehicle', 'vehicles/parcel-van']);
    expect(beyond.code).toBe(0);
    expect(beyond.out).toMatch(/^Model: the FOPDT of the 15\.00 m\/s test speed, held beyond the tested range/);
    expect(beyond.out).toMatch(/Warning: 20 m\/s is outside the tested range 6\.00–15\.00 m\/s: the FOPDT of the nearest test speed, 15\.00 m\/s, is used/);
    expect(beyond.out).toMatch(/K = 3\.\d+ 1\/s/);
    const jointBeyond = await tuneJson(['--rule', 'simc', '--speed-mps', '3', '--models', jointFile, '--vehicle', 'vehicles/parcel-van']);
    expect(
      jointBeyond.json.warnings.some((w) => /3 m\/s is outside the tested range 6\.00–15\.00 m\/s: the joint single-track fit is extrapolated/.test(w)),
    ).toBe(true);
  });

  it('a vehicle file other than the identified one gives a warning naming both', async () => {
    const { json } = await tuneJson(['--rule', 'simc', '--speed-mps', '10', '--models', jointFile, '--vehicle', 'vehicles/parcel-van-loaded']);
    expect(
      json.warnings.some((w) => /the vehicle file given \("parcel-van-loaded"\) differs from the one the models were identified with \("parcel-van"/.test(w)),
    ).toBe(true);
  });

  it('bad input exits 2: --models without --vehicle names the vehicle to pass; --models with a hand-given FOPDT; an unreadable models file', async () => {
    const noVehicle = await run(['tune', '--rule', 'simc', '--speed-mps', '10', '--models', jointFile]);
    expect(noVehicle.code).toBe(2);
    expect(noVehicle.err).toMatch(/--models needs --vehicle: .* \("parcel-van", vehicles\/parcel-van\/vehicle\.json\)/);
    const both = await run(['tune', '--rule', 'simc', '--speed-mps', '10', '--models', jointFile, '--vehicle', 'vehicles/parcel-van', ...fopdt]);
    expect(both.code).toBe(2);
    expect(both.err).toMatch(/--models and --gain\/--time-constant-s\/--dead-time-s both give the vehicle model — use one/);
    expect(
      (await run(['tune', '--rule', 'simc', '--speed-mps', '10', '--models', join(directory, 'missing.json'), '--vehicle', 'vehicles/parcel-van'])).code,
    ).toBe(2);
  });

  it('--help offers --models and says nominal stiffnesses in a vehicle file are for the simulator', async () => {
    const { out } = await run(['tune', '--help']);
    expect(out).toMatch(/--models/);
    // yargs wraps long descriptions: any run of white space between the words.
    expect(out).toMatch(/values\s+for\s+the\s+simulator,\s+not\s+measured;\s+to\s+tune\s+a\s+real\s+vehicle\s+use\s+--models/);
  });
});
