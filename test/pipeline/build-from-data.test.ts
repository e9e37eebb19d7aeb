/**
 * buildScheduleFromData: the main job on loaded data, no file read — the vehicle, the models and the plan
 * are records made here. The gains at every breakpoint must be those of tuning the single-track model built
 * from the vehicle's own parameters (another route through the library than the models file), and the
 * schedule must record the names and hashes it was given.
 */
import { describe, expect, it } from 'vitest';
import { buildScheduleFromData, type LoadedBuildInput } from '../../src/pipeline/build-schedule.js';
import type { ModelsFile, SingleTrackRecord } from '../../src/identify/models-schema.js';
import { tuneOperatingPoint } from '../../src/tuning/operating-point.js';
import { singleTrackParametersFromVehicle } from '../../src/vehicle/single-track.js';
import type { Vehicle } from '../../src/vehicle/types.js';

// An invented airport baggage tug (demo values only).
const TUG: Vehicle = {
  name: 'baggage-tug',
  mass_kg: 2600,
  yawInertia_kgm2: 3900,
  cgToFrontAxle_m: 1.1,
  cgToRearAxle_m: 1.3,
  steeringRatio: 16,
  maxSteerAngle_rad: 0.55,
  maxSteerRate_radps: 0.6,
  actuatorLag_s: 0.06,
  actuatorDelay_s: 0.04,
  controllerSampleTime_s: 0.01,
  frontCorneringStiffness_NPerRad: 70000,
  rearCorneringStiffness_NPerRad: 95000,
};
const VEHICLE_SHA = 'a'.repeat(64);

/** Models as identification would record them, with the fit equal to the vehicle's parameters (only what the build reads). */
function modelsOf(vehicle: Vehicle, speeds_mps: readonly number[]): ModelsFile {
  const a = vehicle.cgToFrontAxle_m;
  const b = vehicle.cgToRearAxle_m;
  const cf = vehicle.frontCorneringStiffness_NPerRad!;
  const cr = vehicle.rearCorneringStiffness_NPerRad!;
  // Source: Gillespie 1992, understeer gradient K = m·(b·Cr − a·Cf)/(L·Cf·Cr) for whole-axle stiffnesses, rad/(m/s²).
  const understeer = (vehicle.mass_kg * (b * cr - a * cf)) / ((a + b) * cf * cr);
  const fit = {
    frontCorneringStiffness_NPerRad: cf,
    rearCorneringStiffness_NPerRad: cr,
    actuatorLag_s: vehicle.actuatorLag_s!,
    actuatorDelay_s: vehicle.actuatorDelay_s!,
    understeerGradient_radPerMps2: understeer,
    stepCount: 16,
    r2: 0.99,
  } as unknown as SingleTrackRecord;
  return {
    vehicle: { name: vehicle.name, file: 'baggage-tug/vehicle.json', sha256: VEHICLE_SHA },
    inputs: speeds_mps.map((speed, k) => ({ file: `baggage-tug/logs/step-${speed}.csv`, sha256: String(k).repeat(64) })),
    speeds: speeds_mps.map((speed_mps) => ({ speed_mps })),
    singleTrack: fit,
    singleTrackRefusal: null,
  } as unknown as ModelsFile;
}

const input = (plan: LoadedBuildInput['plan']): LoadedBuildInput => ({
  vehicle: TUG,
  vehicleFile: 'baggage-tug/vehicle.json',
  vehicleSha256: VEHICLE_SHA,
  models: modelsOf(TUG, [2, 5, 9, 14]),
  plan,
});

describe('buildScheduleFromData (no file read)', () => {
  it("yaw-rate loop, SIMC: every breakpoint holds the gains of tuning the vehicle's own single-track model there; names and hashes recorded as given", async () => {
    const result = await buildScheduleFromData(input({ rule: { name: 'simc' } }));
    const { schedule } = result;
    expect(schedule.breakpoints.length).toBeGreaterThanOrEqual(6);
    // Provenance records file names without their folders.
    expect(schedule.provenance.inputs[0]).toEqual({ file: 'vehicle.json', sha256: VEHICLE_SHA, role: 'vehicle' });
    expect(schedule.provenance.inputs.filter((entry) => entry.role === 'log')).toHaveLength(4);
    const parameters = singleTrackParametersFromVehicle(TUG);
    for (const row of schedule.breakpoints) {
      const tuned = tuneOperatingPoint({
        loop: { kind: 'yaw-rate' },
        speed_mps: row.speed_mps,
        model: { kind: 'single-track', parameters },
        rule: 'simc',
        ruleParameters: {},
        controller: { derivativeFilter: 10, sampleTime_s: 0.01, discretisation: 'backward-euler', computationLatency_s: 0.01 },
      });
      expect({ kp: row.kp, ki: row.ki, kd: row.kd }).toEqual(tuned.gains);
    }
    expect(schedule.check.range).toEqual({ minimum_mps: 2, maximum_mps: 14 });
  });

  it('the same data give the same checksum; another vehicle hash in the models is refused unless allowed', async () => {
    const first = await buildScheduleFromData(input({}));
    const again = await buildScheduleFromData(input({}));
    expect(again.schedule.checksum).toEqual(first.schedule.checksum);
    const other = { ...input({}), vehicleSha256: 'b'.repeat(64) };
    await expect(buildScheduleFromData(other)).rejects.toMatchObject({ code: 'build.otherVehicle' });
    const allowed = await buildScheduleFromData({ ...other, allowOtherVehicle: true });
    expect(allowed.schedule.breakpoints.map((row) => row.kp)).toEqual(first.schedule.breakpoints.map((row) => row.kp));
  });
});
