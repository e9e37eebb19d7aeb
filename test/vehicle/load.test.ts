import { mkdtempSync, mkdirSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { SpeedbandError, describeError } from '../../src/core/errors.js';
import { loadVehicle, validateVehicle } from '../../src/vehicle/load.js';

const GOOD = {
  name: 'test van',
  mass_kg: 3000,
  yawInertia_kgm2: 5000,
  cgToFrontAxle_m: 1.5,
  cgToRearAxle_m: 1.9,
  steeringRatio: 17,
  maxSteerAngle_rad: 0.6,
  maxSteerRate_radps: 0.8,
  actuatorLag_s: 0.08,
  actuatorDelay_s: 0.04,
  controllerSampleTime_s: 0.01,
  frontCorneringStiffness_NPerRad: 100_000,
  rearCorneringStiffness_NPerRad: 140_000,
};

function folderWith(content: string): string {
  const dir = mkdtempSync(join(tmpdir(), 'speedband-vehicle-'));
  writeFileSync(join(dir, 'vehicle.json'), content);
  return dir;
}

/** The SpeedbandError a call throws (fails the test when it does not throw one). */
function errorOf(work: () => unknown): SpeedbandError {
  try {
    work();
  } catch (error) {
    expect(error).toBeInstanceOf(SpeedbandError);
    return error as SpeedbandError;
  }
  throw new Error('expected a SpeedbandError, nothing was thrown');
}

describe('loadVehicle(path)', () => {
  it('reads vehicle.json from a folder and from the file path', () => {
    const dir = folderWith(JSON.stringify(GOOD));
    expect(loadVehicle(dir)).toEqual(GOOD);
    expect(loadVehicle(join(dir, 'vehicle.json'))).toEqual(GOOD);
  });

  it('names the file and JSON path of a missing field', () => {
    const { mass_kg: _mass, ...withoutMass } = GOOD;
    const dir = folderWith(JSON.stringify(withoutMass));
    const error = errorOf(() => loadVehicle(dir));
    expect(error.code).toBe('vehicle.missingField');
    expect(error.location.file).toBe(join(dir, 'vehicle.json'));
    expect(error.location.jsonPath).toBe('/mass_kg');
    expect(describeError(error)).toMatch(/vehicle\.json, at \/mass_kg: missing required field "mass_kg"/);
  });

  it('points at a field given under another unit', () => {
    const { mass_kg: _mass, ...withoutMass } = GOOD;
    const error = errorOf(() => validateVehicle({ ...withoutMass, mass_lb: 6600 }, 'v.json'));
    expect(error.message).toMatch(/found "mass_lb" instead — rename it to "mass_kg"/);
  });

  it('names the JSON path and expected type of a wrong type', () => {
    const error = errorOf(() => validateVehicle({ ...GOOD, yawInertia_kgm2: '5000' }, 'v.json'));
    expect(error.code).toBe('vehicle.invalid');
    expect(error.location).toEqual({ file: 'v.json', jsonPath: '/yawInertia_kgm2' });
    expect(error.message).toMatch(/\/yawInertia_kgm2: must be number/);
  });

  it('rejects a negative mass, quoting the value and the expected range', () => {
    const error = errorOf(() => validateVehicle({ ...GOOD, mass_kg: -3000 }, 'v.json'));
    expect(error.code).toBe('vehicle.outOfRange');
    expect(error.location).toEqual({ file: 'v.json', jsonPath: '/mass_kg' });
    expect(error.message).toBe(
      'mass_kg is -3000, expected a mass above 0 kg and below 1,000,000 kg — enter the test mass in kilograms (a sidewalk robot is tens of kg, a loaded haul truck hundreds of tonnes)',
    );
  });

  it('rejects a CG outside the wheelbase (a or b not above 0)', () => {
    expect(errorOf(() => validateVehicle({ ...GOOD, cgToRearAxle_m: 0 }, 'v.json')).location.jsonPath).toBe('/cgToRearAxle_m');
    expect(errorOf(() => validateVehicle({ ...GOOD, cgToFrontAxle_m: -0.2 }, 'v.json')).location.jsonPath).toBe('/cgToFrontAxle_m');
  });

  it('rejects a maximum steer angle of π/2 or more as probably degrees', () => {
    // Source: common practice — road-wheel angles stay well below 90°; 35 in a radian field is degrees.
    const error = errorOf(() => validateVehicle({ ...GOOD, maxSteerAngle_rad: 35 }, 'v.json'));
    expect(error.message).toMatch(/maxSteerAngle_rad is 35, expected a road-wheel angle above 0 and below π\/2 rad/);
    expect(error.message).toMatch(/degrees/);
  });

  it('reads the service acceleration and deceleration, and refuses a negative or zero one (a deceleration is given as a positive number)', () => {
    const gentle = validateVehicle({ ...GOOD, serviceDeceleration_mps2: 1, serviceAcceleration_mps2: 0.5 }, 'v.json');
    expect([gentle.serviceAcceleration_mps2, gentle.serviceDeceleration_mps2]).toEqual([0.5, 1]);
    const error = errorOf(() => validateVehicle({ ...GOOD, serviceDeceleration_mps2: -2 }, 'v.json'));
    expect(error.code).toBe('vehicle.outOfRange');
    expect(error.location).toEqual({ file: 'v.json', jsonPath: '/serviceDeceleration_mps2' });
    expect(error.message).toMatch(/serviceDeceleration_mps2 is -2, expected a deceleration above 0 m\/s² and below 10 m\/s² .*positive/);
    expect(errorOf(() => validateVehicle({ ...GOOD, serviceAcceleration_mps2: 0 }, 'v.json')).location.jsonPath).toBe('/serviceAcceleration_mps2');
  });

  it('accepts a zero actuator lag and delay', () => {
    expect(validateVehicle({ ...GOOD, actuatorLag_s: 0, actuatorDelay_s: 0 }, 'v.json').actuatorLag_s).toBe(0);
  });

  it('rejects only one of the two cornering stiffnesses', () => {
    const { rearCorneringStiffness_NPerRad: _rear, ...frontOnly } = GOOD;
    const error = errorOf(() => validateVehicle(frontOnly, 'v.json'));
    expect(error.code).toBe('vehicle.incompleteStiffness');
    expect(error.location.jsonPath).toBe('/rearCorneringStiffness_NPerRad');
  });

  it('rejects an unknown field, naming it and its JSON path', () => {
    const error = errorOf(() => validateVehicle({ ...GOOD, wheelbase_m: 3.4 }, 'v.json'));
    expect(error.code).toBe('vehicle.unknownField');
    expect(error.location.jsonPath).toBe('/wheelbase_m');
    expect(error.message).toMatch(/unknown field "wheelbase_m"/);
  });

  it('suggests the field a misspelt one probably meant', () => {
    const { actuatorDelay_s: _delay, ...withoutDelay } = GOOD;
    const error = errorOf(() => validateVehicle({ ...withoutDelay, actuatorDleay_s: 0.04 }, 'v.json'));
    expect(error.message).toMatch(/unknown field "actuatorDleay_s" — did you mean "actuatorDelay_s"\?/);
  });

  it('names the line of a JSON syntax error', () => {
    const dir = folderWith('{\n  "name": "x",\n  "mass_kg": 3000,,\n}');
    const error = errorOf(() => loadVehicle(dir));
    expect(error.code).toBe('json.syntax');
    expect(error.location.line).toBe(3);
  });

  it('says when a folder has no vehicle.json, and when a file does not exist', () => {
    const dir = mkdtempSync(join(tmpdir(), 'speedband-empty-'));
    mkdirSync(join(dir, 'logs'));
    expect(errorOf(() => loadVehicle(dir)).code).toBe('vehicle.notFound');
    expect(errorOf(() => loadVehicle(join(dir, 'nope.json'))).code).toBe('file.unreadable');
  });
});
