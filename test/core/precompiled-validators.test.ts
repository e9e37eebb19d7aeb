import { readFileSync } from 'node:fs';
import { Ajv } from 'ajv';
import { describe, expect, it } from 'vitest';
import { PRECOMPILED_PATH, PRECOMPILED_SCHEMAS } from '../../scripts/precompile-validators.js';
import * as precompiled from '../../src/core/precompiled-validators.js';
import { AJV_OPTIONS } from '../../src/core/schema.js';
import { precompiledValidatorSource } from '../../src/core/validator-code.js';

// The program validates its files with Ajv standalone code generated from the schemas; the reference
// here is Ajv itself compiling the same schema at run time (the behaviour before precompilation).
type Validator = ((value: unknown) => boolean) & { errors?: unknown[] | null };
const generated = precompiled as unknown as Record<string, Validator>;

const vehicle = JSON.parse(readFileSync('vehicles/parcel-van/vehicle.json', 'utf8')) as Record<string, unknown>;
const { mass_kg: _mass, ...vehicleWithoutMass } = vehicle;

/** Valid and invalid documents per validator; each must get the same verdict and the same errors from both. */
const CASES: Record<string, unknown[]> = {
  validateVehicleFile: [vehicle, vehicleWithoutMass, { ...vehicle, mass_kg: 'heavy' }, { ...vehicle, massKg: 1 }, null, []],
  validatePlanFile: [{}, { loop: { kind: 'heading' } }, { loop: { kind: 'steering' } }, { rule: 7 }, 'plan'],
  validateLogProfile: [{ columns: { speed_mps: { from: 'v', unit: 'km/h' } } }, { columns: { speed: {} } }, {}],
  validateModelsFile: [{}, { format: 'speedband-models' }],
  validateScheduleFile: [{}, { format: 'speedband-schedule', formatVersion: 1 }],
};

describe('precompiled validators (src/core/precompiled-validators.ts)', () => {
  it('the generated module is up to date with the schemas — else run `npm run precompile-validators`', () => {
    expect(readFileSync(PRECOMPILED_PATH, 'utf8') === precompiledValidatorSource(PRECOMPILED_SCHEMAS)).toBe(true);
  });

  it.each(Object.keys(CASES))('%s gives the verdict and the errors of Ajv compiling the schema at run time', (name) => {
    const reference = new Ajv(AJV_OPTIONS).compile(PRECOMPILED_SCHEMAS[name]);
    let invalid = 0;
    for (const document of CASES[name]) {
      const expected = reference(document);
      expect(generated[name](document)).toBe(expected);
      expect(generated[name].errors ?? null).toEqual(reference.errors ?? null);
      if (!expected) invalid += 1;
    }
    expect(invalid).toBeGreaterThan(0);
  });

  it('a valid demo vehicle passes and one without mass_kg names the missing field', () => {
    expect(generated.validateVehicleFile(vehicle)).toBe(true);
    expect(generated.validateVehicleFile(vehicleWithoutMass)).toBe(false);
    expect(JSON.stringify(generated.validateVehicleFile.errors)).toContain('mass_kg');
  });
});
