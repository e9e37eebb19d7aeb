import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { compareSchedules } from '../../src/compare/compare-schedules.js';
import { loadVehicle } from '../../src/vehicle/load.js';
import { singleTrackParametersFromVehicle } from '../../src/vehicle/single-track.js';
import type { Vehicle } from '../../src/vehicle/types.js';
import { VEHICLE_SCHEDULE_SPEEDS, vehicleSchedule } from './vehicle-schedules.js';

const van = loadVehicle(join('vehicles', 'parcel-van'));
const loaded = loadVehicle(join('vehicles', 'parcel-van-loaded'));

/** Steady-state yaw gain r/δ = vx/(L + K·vx²), K = (m/L)(b/Cf − a/Cr), 1/s. Source: Gillespie 1992 §6; Rajamani 2012 §3. */
function yawGain_perS(vehicle: Vehicle, speed_mps: number): number {
  const a = vehicle.cgToFrontAxle_m;
  const b = vehicle.cgToRearAxle_m;
  const L = a + b;
  const K = (vehicle.mass_kg / L) * (b / vehicle.frontCorneringStiffness_NPerRad! - a / vehicle.rearCorneringStiffness_NPerRad!);
  return speed_mps / (L + K * speed_mps * speed_mps);
}

describe('compare: the parcel van schedule against the loaded van schedule (heading loop, SIMC, single-track models)', () => {
  const before = vehicleSchedule('parcel-van', singleTrackParametersFromVehicle(van));
  const after = vehicleSchedule('parcel-van-loaded', singleTrackParametersFromVehicle(loaded));
  const comparison = compareSchedules(before, after);

  it('kp changes at each breakpoint as the SIMC integrating rule predicts from the yaw-gain change (within 1.5 points)', () => {
    // Source: Skogestad 2003, SIMC integrating process: Kc = 1/(k'(τc + θ)) with τc = θ; for the heading loop
    // k' is the steady-state yaw gain r/δ (Gillespie 1992) and θ (actuator, sampling) is the same in both vans,
    // so kp_new/kp_old ≈ (r/δ)_old/(r/δ)_new. The fast yaw dynamics folded into θ move it a little: tolerance 1.5 points.
    for (const row of comparison.speeds) {
      const predicted_pct = 100 * (yawGain_perS(van, row.speed_mps) / yawGain_perS(loaded, row.speed_mps) - 1);
      expect(Math.abs(row.kp.change_pct! - predicted_pct), `${row.speed_mps} m/s`).toBeLessThan(1.5);
    }
    expect(comparison.speeds.map((row) => row.speed_mps)).toEqual([...VEHICLE_SCHEDULE_SPEEDS]);
  });

  it('flags kp exactly where the predicted change passes ±15 %: the high speeds, where the load and tyres raise the yaw gain most', () => {
    const predictedFlagged = VEHICLE_SCHEDULE_SPEEDS.filter((speed) => Math.abs(100 * (yawGain_perS(van, speed) / yawGain_perS(loaded, speed) - 1)) >= 15);
    expect(predictedFlagged).toEqual([18, 25]);
    const flaggedKp = comparison.flags.filter((flag) => flag.kind === 'gainChange' && flag.quantity === 'kp').map((flag) => flag.speed_mps);
    expect(flaggedKp).toEqual(predictedFlagged);
  });

  it('reports the model drift in the direction of the vehicle files: rear stiffness −11.1 %, understeer gradient down', () => {
    expect(comparison.modelDrift.available).toBe(true);
    if (!comparison.modelDrift.available) return;
    const byName = Object.fromEntries(comparison.modelDrift.parameters.map((parameter) => [parameter.name, parameter]));
    // Source: the vehicle files, 180 → 160 kN/rad.
    expect(byName.rearCorneringStiffness_NPerRad.change_pct).toBeCloseTo(-100 / 9, 9);
    expect(byName.frontCorneringStiffness_NPerRad.change).toBe(0);
    expect(byName.understeerGradient_radPerMps2.change).toBeLessThan(0);
  });

  it('derives the characteristic speed √(L/K) of each model and reports mass, inertia and axle distances', () => {
    if (!comparison.modelDrift.available) throw new Error('model drift expected');
    const byName = Object.fromEntries(comparison.modelDrift.parameters.map((parameter) => [parameter.name, parameter]));
    // Source: Gillespie 1992 §6, characteristic speed √(L/K), K = (m/L)(b/Cf − a/Cr), from the vehicle files.
    const characteristic = (vehicle: Vehicle) => {
      const L = vehicle.cgToFrontAxle_m + vehicle.cgToRearAxle_m;
      const K =
        (vehicle.mass_kg / L) *
        (vehicle.cgToRearAxle_m / vehicle.frontCorneringStiffness_NPerRad! - vehicle.cgToFrontAxle_m / vehicle.rearCorneringStiffness_NPerRad!);
      return Math.sqrt(L / K);
    };
    expect(byName.characteristicSpeed_mps.old).toBeCloseTo(characteristic(van), 9);
    expect(byName.characteristicSpeed_mps.new).toBeCloseTo(characteristic(loaded), 9);
    expect(byName.characteristicSpeed_mps.change).toBeGreaterThan(0);
    expect(byName.mass_kg.change).toBe(900);
    expect(byName.cgToFrontAxle_m.change).toBeCloseTo(0.18, 12);
  });
});
