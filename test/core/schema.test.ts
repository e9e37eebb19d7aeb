import { Ajv } from 'ajv';
import { describe, expect, it } from 'vitest';
import { AJV_OPTIONS, makeValidator } from '../../src/core/schema.js';
import { MODELS_SCHEMA } from '../../src/identify/models-schema.js';
import { LOG_PROFILE_SCHEMA } from '../../src/log/profile.js';
import { PLAN_SCHEMA } from '../../src/schedule/plan-schema.js';
import { SCHEDULE_SCHEMA } from '../../src/schedule/schedule-schema.js';
import { VEHICLE_SCHEMA } from '../../src/vehicle/schema.js';

// The program compiles its schemas without checking them against the meta-schema (start-up time):
// this is where they are checked. Source: JSON Schema draft-07 meta-schema, as bundled with Ajv 8.
const SCHEMAS: Record<string, object> = {
  models: MODELS_SCHEMA,
  logProfile: LOG_PROFILE_SCHEMA,
  plan: PLAN_SCHEMA,
  schedule: SCHEDULE_SCHEMA,
  vehicle: VEHICLE_SCHEMA,
};

describe('schemas of the files speedband reads and writes', () => {
  it.each(Object.keys(SCHEMAS))('the %s schema is a valid JSON Schema (meta-schema check) and compiles in strict mode', (name) => {
    const checking = new Ajv({ ...AJV_OPTIONS, validateSchema: true });
    const valid = checking.validateSchema(SCHEMAS[name]);
    expect(checking.errors ?? []).toEqual([]);
    expect(valid).toBe(true);
    expect(() => checking.compile(SCHEMAS[name])).not.toThrow();
  });

  it('a schema breaking the meta-schema is caught by the meta-schema check', () => {
    const checking = new Ajv({ ...AJV_OPTIONS, validateSchema: true });
    expect(checking.validateSchema({ type: 'object', required: 'name' })).toBe(false);
  });

  it('makeValidator still rejects a bad value with the code, file and JSON path', () => {
    const validate = makeValidator<{ a: number }>({
      schema: { type: 'object', required: ['a'], properties: { a: { type: 'number' } }, additionalProperties: false },
      code: 'plan.invalid',
      what: 'test file',
    });
    expect(validate({ a: 1 }, 'x.json')).toEqual({ a: 1 });
    expect(() => validate({ a: 'one' }, 'x.json')).toThrow(
      expect.objectContaining({ code: 'plan.invalid', location: expect.objectContaining({ file: 'x.json', jsonPath: '/a' }) }),
    );
  });
});
