/**
 * The demo parcel van's nominal single-track numbers (vehicles/parcel-van/vehicle.json: invented demo values),
 * for the tests that need one realistic vehicle without reading its file, and the controller of its firmware.
 */
import { readdirSync } from 'node:fs';
import { join } from 'node:path';
import type { SingleTrackParameters } from '../../src/vehicle/types.js';

/** The demo van's folder (vehicle.json and logs/), from the repository root. */
export const PARCEL_VAN_FOLDER = 'vehicles/parcel-van';

export const PARCEL_VAN: SingleTrackParameters = {
  mass_kg: 3400,
  yawInertia_kgm2: 11000,
  cgToFrontAxle_m: 1.75,
  cgToRearAxle_m: 1.85,
  frontCorneringStiffness_NPerRad: 120000,
  rearCorneringStiffness_NPerRad: 180000,
  actuatorLag_s: 0.08,
  actuatorDelay_s: 0.05,
};

/** The van's firmware controller: the default settings at 100 Hz (one sample of latency). */
export const PARCEL_VAN_CONTROLLER = { derivativeFilter: 10, sampleTime_s: 0.01, discretisation: 'backward-euler' as const, computationLatency_s: 0.01 };

/** The step-test logs of a vehicle folder (its logs/ folder), in name order. */
export const bundledLogs = (vehicleFolder: string): string[] =>
  readdirSync(join(vehicleFolder, 'logs'))
    .filter((name) => name.endsWith('.csv'))
    .sort()
    .map((name) => join(vehicleFolder, 'logs', name));

/** The demo van's step-test logs, in name order. */
export const parcelVanLogs = (): string[] => bundledLogs(PARCEL_VAN_FOLDER);
