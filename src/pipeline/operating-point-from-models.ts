/**
 * The vehicle model at one speed from identification results (models.json) and the vehicle file,
 * for tuning a single operating point: the same model a schedule is built on (`checkModelFromModels`),
 * said in words — which model, which test speeds — with warnings when the speed lies outside the
 * tested range or the vehicle file is not the one the models were identified with.
 */
import type { ModelsFile } from '../identify/models-schema.js';
import type { OperatingPointModel } from '../tuning/operating-point.js';
import type { Vehicle } from '../vehicle/types.js';
import { checkModelFromModels, type CheckModelKind } from './check-model.js';
import { quoted } from '../core/quote.js';

export interface ModelAtSpeed {
  readonly model: OperatingPointModel;
  readonly kind: CheckModelKind;
  /** Which model, from which test speeds, in words. */
  readonly description: string;
  /** The test speeds of the models file, ascending, m/s. */
  readonly testSpeeds_mps: readonly number[];
  /** For the lumped model: the test speeds whose FOPDT models were used (one when at or beyond an end test speed), m/s. */
  readonly usedSpeeds_mps: readonly number[];
  readonly warnings: readonly string[];
}

/** Relative distance below which a requested speed counts as a test speed (1e-3: 10.003 m/s is the 10 m/s test). */
const SAME_SPEED_FRACTION = 1e-3;

/**
 * The model at `speed_mps` (m/s, > 0): the joint single-track fit (Cf, Cr, actuator lag and delay from
 * `models.singleTrack`; mass, yaw inertia and axle distances from `vehicle`) when present, else the
 * per-speed FOPDT models (command → yaw rate, actuator included) interpolated linearly in speed between
 * the neighbouring test speeds and held beyond the end ones — `checkModelFromModels(models, vehicle,
 * 'single-track').modelAt(speed_mps)`, the model `buildSchedule` tunes on (a speed within 0.1 % of a
 * test speed takes that speed's FOPDT exactly). `vehicleSha256` (of the vehicle file given) is compared
 * with the hash the models file records.
 */
export function operatingPointModelFromModels(models: ModelsFile, vehicle: Vehicle, speed_mps: number, vehicleSha256?: string): ModelAtSpeed {
  const checkModel = checkModelFromModels(models, vehicle, 'single-track');
  const testSpeeds_mps = models.speeds.map((record) => record.speed_mps).sort((p, q) => p - q);
  const lowest = testSpeeds_mps[0];
  const highest = testSpeeds_mps[testSpeeds_mps.length - 1];
  const warnings: string[] = [];
  if (vehicleSha256 !== undefined && vehicleSha256 !== models.vehicle.sha256) {
    warnings.push(
      `the vehicle file given (${quoted(vehicle.name)}) differs from the one the models were identified with (${quoted(models.vehicle.name)}, ${models.vehicle.file}): ` +
        "the fitted stiffnesses assume that file's mass, inertia and geometry — pass the same vehicle file or identify again",
    );
  }
  const outside = speed_mps < lowest * (1 - SAME_SPEED_FRACTION) || speed_mps > highest * (1 + SAME_SPEED_FRACTION);
  const range = `${lowest.toFixed(2)}–${highest.toFixed(2)} m/s`;

  if (checkModel.kind === 'single-track') {
    if (outside) {
      warnings.push(
        `${speed_mps} m/s is outside the tested range ${range}: the joint single-track fit is extrapolated there (its tyre stiffnesses were measured only inside the range) — log step tests at this speed before relying on these gains`,
      );
    }
    return { model: checkModel.modelAt(speed_mps), kind: checkModel.kind, description: checkModel.description, testSpeeds_mps, usedSpeeds_mps: [], warnings };
  }

  const near = testSpeeds_mps.find((test) => Math.abs(test - speed_mps) <= SAME_SPEED_FRACTION * test);
  let usedSpeeds_mps: number[];
  let words: string;
  if (near !== undefined) {
    usedSpeeds_mps = [near];
    words = `the FOPDT identified at the ${near.toFixed(2)} m/s test speed`;
  } else if (outside) {
    const end = speed_mps < lowest ? lowest : highest;
    usedSpeeds_mps = [end];
    words = `the FOPDT of the ${end.toFixed(2)} m/s test speed, held beyond the tested range`;
    warnings.push(
      `${speed_mps} m/s is outside the tested range ${range}: the FOPDT of the nearest test speed, ${end.toFixed(2)} m/s, is used as it is, but the yaw response changes with speed — log step tests at this speed before relying on these gains`,
    );
  } else {
    const above = testSpeeds_mps.findIndex((test) => test > speed_mps);
    usedSpeeds_mps = [testSpeeds_mps[above - 1], testSpeeds_mps[above]];
    words = `the FOPDT models of the ${usedSpeeds_mps[0].toFixed(2)} and ${usedSpeeds_mps[1].toFixed(2)} m/s test speeds, interpolated linearly in speed`;
  }
  return {
    // At a test speed (within 0.1 %), exactly that speed's FOPDT: the user named the test speed.
    model: checkModel.modelAt(near ?? speed_mps),
    kind: checkModel.kind,
    description: `${words} — the models file has no joint single-track fit (${models.singleTrackRefusal?.reason ?? 'no reason recorded'})`,
    testSpeeds_mps,
    usedSpeeds_mps,
    warnings,
  };
}
