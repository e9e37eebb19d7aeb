import { mkdtempSync, readdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { identifyFromLogs } from '../../src/identify/identify-from-logs.js';
import type { SpeedModel } from '../../src/identify/aggregate.js';
import { fitSingleTrack, type SingleTrackFit } from '../../src/identify/joint-single-track.js';
import { simulateYawThroughActuator } from '../../src/identify/simulate-single-track-yaw.js';
import { readSteerLog } from '../../src/log/read.js';
import { findStepTests } from '../../src/log/segment.js';
import { modelsToJson, parseModels } from '../../src/identify/models-file.js';
import type { ModelsFile } from '../../src/identify/models-schema.js';
import { loadVehicle } from '../../src/vehicle/load.js';
import { simulateSingleTrack } from '../../src/vehicle/simulate.js';
import { singleTrackParametersFromVehicle } from '../../src/vehicle/single-track.js';
import { writeTestLogs } from '../../src/vehicle/test-logs.js';

const VEHICLE = 'vehicles/parcel-van';
const SPEEDS_MPS = [4, 12, 20];
// Tolerances from the identification brief, with units.
const GAIN_RELATIVE = 0.02;
const TIME_CONSTANT_RELATIVE = 0.1;
const DEAD_TIME_S = 0.01;
const STIFFNESS_RELATIVE = 0.05;
const ACTUATOR_DELAY_S = 0.01;

let folder = '';
let noisy: ModelsFile;
let clean: ModelsFile;

beforeAll(() => {
  folder = mkdtempSync(join(tmpdir(), 'speedband-identify-'));
  const vehicle = loadVehicle(VEHICLE);
  const noisyLogs = writeTestLogs({ vehicle, speeds_mps: SPEEDS_MPS, outDir: join(folder, 'noisy'), generation: { seed: 5 }, force: false });
  const cleanLogs = writeTestLogs({ vehicle, speeds_mps: SPEEDS_MPS, outDir: join(folder, 'clean'), generation: { seed: 5, noiseScale: 0 }, force: false });
  const csv = (files: readonly { path: string }[]) => files.map((f) => f.path).filter((p) => p.endsWith('.csv'));
  noisy = identifyFromLogs({ vehicle: VEHICLE, logPaths: csv(noisyLogs.files) });
  clean = identifyFromLogs({ vehicle: VEHICLE, logPaths: csv(cleanLogs.files), options: { jointFit: false, fitSecondOrder: false } });
}, 120_000);

afterAll(() => rmSync(folder, { recursive: true, force: true }));

describe('identifyFromLogs on logs from the exact simulator (parcel van, seeded noise)', () => {
  it('per-speed FOPDT: gain within 2 %, time constant within 10 %, dead time within 10 ms of the best FOPDT of the noise-free response', () => {
    expect(noisy.speeds.length).toBe(SPEEDS_MPS.length);
    noisy.speeds.forEach((speed, i) => {
      const reference = clean.speeds[i].fopdt; // Source: FOPDT fitted to the noise-free simulator output
      expect(Math.abs(speed.fopdt.gain / reference.gain - 1)).toBeLessThan(GAIN_RELATIVE);
      expect(Math.abs(speed.fopdt.timeConstant_s / reference.timeConstant_s - 1)).toBeLessThan(TIME_CONSTANT_RELATIVE);
      expect(Math.abs(speed.fopdt.deadTime_s - reference.deadTime_s)).toBeLessThan(DEAD_TIME_S);
    });
  });

  it('joint single-track fit: Cf and Cr within 5 % and actuator delay within 10 ms of the simulated vehicle', () => {
    const st = noisy.singleTrack;
    expect(st).not.toBeNull();
    // Source: the vehicle file's nominal values used by the simulator (vehicles/parcel-van/vehicle.json)
    expect(Math.abs(st!.frontCorneringStiffness_NPerRad / 120000 - 1)).toBeLessThan(STIFFNESS_RELATIVE);
    expect(Math.abs(st!.rearCorneringStiffness_NPerRad / 180000 - 1)).toBeLessThan(STIFFNESS_RELATIVE);
    expect(Math.abs(st!.actuatorDelay_s - 0.05)).toBeLessThan(ACTUATOR_DELAY_S);
    expect(st!.ci95.frontCorneringStiffness_NPerRad[0]).toBeLessThan(st!.frontCorneringStiffness_NPerRad);
    // Understeer gradient K = (m/L)(b/Cf − a/Cr) with the nominal values: 3400/3.6·(1.85/120000 − 1.75/180000) (Gillespie 1992)
    const nominalK = (3400 / 3.6) * (1.85 / 120000 - 1.75 / 180000);
    expect(Math.abs(st!.understeerGradient_radPerMps2 / nominalK - 1)).toBeLessThan(0.1);
    expect(st!.characteristicSpeed_mps).not.toBeNull();
    expect(noisy.warnings.filter((w) => w.includes('single-track'))).toEqual([]);
  });

  it('actuator lag and delay from the logged steer angle match the vehicle file (lag within 10 %, delay within 10 ms)', () => {
    expect(noisy.actuator).not.toBeNull();
    expect(Math.abs(noisy.actuator!.lag_s / 0.08 - 1)).toBeLessThan(0.1); // Source: vehicles/parcel-van actuatorLag_s
    expect(Math.abs(noisy.actuator!.delay_s - 0.05)).toBeLessThan(ACTUATOR_DELAY_S); // actuatorDelay_s
  });

  it('writes a models file that validates, carries the hashes of its inputs, and reads back equal', () => {
    const text = modelsToJson(noisy);
    const back = parseModels(text, 'models.json');
    expect(back).toEqual(JSON.parse(text));
    expect(noisy.inputs).toHaveLength(SPEEDS_MPS.length);
    for (const input of noisy.inputs) expect(input.sha256).toMatch(/^[0-9a-f]{64}$/);
    expect(noisy.vehicle.name).toBe('parcel-van');
    const test = noisy.tests[0];
    expect(test.fopdt.ci95.gain[0]).toBeLessThan(test.fopdt.gain);
    expect(test.fopdt.ci95.gain[1]).toBeGreaterThan(test.fopdt.gain);
  });

  it('rejects a models file with a missing field, naming the field', () => {
    const value = JSON.parse(modelsToJson(noisy));
    delete value.speeds[0].fopdt.gain;
    expect(() => parseModels(JSON.stringify(value), 'broken.json')).toThrow(/gain/);
  });
});

describe('fitSingleTrack without nominal stiffnesses in the vehicle file', () => {
  it('starts from the understeer gradient of the per-speed gains and still recovers Cf and Cr within 5 %', () => {
    const { frontCorneringStiffness_NPerRad: _f, rearCorneringStiffness_NPerRad: _r, ...withoutStiffness } = loadVehicle(VEHICLE);
    const csv = readdirSync(join(folder, 'noisy'))
      .filter((name) => name.endsWith('.csv'))
      .sort()
      .map((name) => join(folder, 'noisy', name));
    const steps = csv.flatMap((file) => findStepTests(readSteerLog(file)).steps);
    const speeds = noisy.speeds.map((s) => ({
      speed_mps: s.speed_mps,
      model: { kind: 'fopdt' as const, gain: s.fopdt.gain, timeConstant_s: s.fopdt.timeConstant_s, deadTime_s: s.fopdt.deadTime_s },
    }));
    const fit = fitSingleTrack({ vehicle: withoutStiffness, steps, speeds: speeds as unknown as SpeedModel[], actuator: null, mismatchWarning_pct: 10 });
    expect('reasonCode' in fit).toBe(false);
    const st = fit as SingleTrackFit;
    // Source: vehicles/parcel-van nominal values used by the simulator
    expect(Math.abs(st.parameters.frontCorneringStiffness_NPerRad / 120000 - 1)).toBeLessThan(STIFFNESS_RELATIVE);
    expect(Math.abs(st.parameters.rearCorneringStiffness_NPerRad / 180000 - 1)).toBeLessThan(STIFFNESS_RELATIVE);
  }, 60_000);
});

describe('fitSingleTrack with a wrong vehicle file', () => {
  it('warns, per speed, where the joint model fails to explain the steps (mass a quarter, yaw inertia four times the true values)', () => {
    const vehicle = loadVehicle(VEHICLE);
    const wrong = { ...vehicle, mass_kg: vehicle.mass_kg / 4, yawInertia_kgm2: 4 * vehicle.yawInertia_kgm2 };
    const csv = readdirSync(join(folder, 'noisy'))
      .filter((name) => name.endsWith('.csv'))
      .sort()
      .map((name) => join(folder, 'noisy', name));
    const steps = csv.flatMap((file) => findStepTests(readSteerLog(file)).steps);
    const speeds = noisy.speeds.map((s) => {
      const tests = noisy.tests.filter((t) => s.steps.some((k) => k.file === t.file && k.stepIndex === t.stepIndex));
      return {
        speed_mps: s.speed_mps,
        steps: s.steps,
        fopdtRmse_radps: Math.sqrt(tests.reduce((sum, t) => sum + t.fopdt.rmse ** 2, 0) / tests.length),
        model: { kind: 'fopdt' as const, gain: s.fopdt.gain, timeConstant_s: s.fopdt.timeConstant_s, deadTime_s: s.fopdt.deadTime_s },
      };
    });
    const fit = fitSingleTrack({ vehicle: wrong, steps, speeds: speeds as unknown as SpeedModel[], actuator: null, mismatchWarning_pct: 10 }) as SingleTrackFit;
    expect(fit.warnings.some((w) => /RMS yaw-rate residual/.test(w))).toBe(true);
    expect(fit.comparison.some((c) => c.singleTrackRmse_radps > 2 * c.fopdtRmse_radps)).toBe(true);
  }, 60_000);
});

describe('simulateYawThroughActuator({ params, speed_mps, time_s, input })', () => {
  it('equals the exact single-track simulator of src/vehicle (actuator delay and lag, no limits) to 1e−9 rad/s', () => {
    // Source: simulateSingleTrack, matrix-exponential simulator written independently in src/vehicle/simulate.ts
    const params = singleTrackParametersFromVehicle(loadVehicle(VEHICLE));
    const time_s = Float64Array.from({ length: 300 }, (_, k) => k * 0.02);
    const command = time_s.map((t) => (t >= 1 ? 0.02 : t >= 0.9 ? 0.01 : 0));
    for (const speed_mps of [3, 15, 25]) {
      const reference = simulateSingleTrack({ params, speed_mps, time_s, steerCommand_rad: command });
      const ours = simulateYawThroughActuator({ params, speed_mps, time_s, input: command });
      let worst = 0;
      for (let k = 0; k < time_s.length; k++) worst = Math.max(worst, Math.abs(ours[k] - reference.yawRate_radps[k]));
      expect(worst).toBeLessThan(1e-9);
    }
  });
});
