import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { buildSchedule } from '../../src/pipeline/build-schedule.js';
import { recordingIo } from '../../src/cli/io.js';
import { runCli } from '../../src/cli/main.js';
import { jsonPointer, parseJsonText } from '../../src/core/json-text.js';
import { parseModels } from '../../src/identify/models-file.js';
import { parseLogProfile } from '../../src/log/profile.js';
import { readPlan } from '../../src/schedule/plan-file.js';
import { parseSchedule } from '../../src/schedule/schedule-file.js';
import { serialiseSchedule } from '../../src/schedule/schedule-json.js';
import { loadVehicle } from '../../src/vehicle/load.js';
import { sampleSchedule } from '../schedule/sample-schedule.js';

const folder = () => mkdtempSync(join(tmpdir(), 'speedband-json-'));

describe('parseJsonText(text, file)', () => {
  it('parses what JSON.parse parses, a byte-order mark included', () => {
    // Source: RFC 8259 — objects, arrays, strings with escapes, numbers with exponents.
    expect(parseJsonText('\ufeff{"a":[1,2.5e-3,"x\\u0041"],"b":{"c":null}}', 'x.json')).toEqual({ a: [1, 2.5e-3, 'xA'], b: { c: null } });
    expect(parseJsonText('[{"a":1},{"a":2}]', 'x.json')).toEqual([{ a: 1 }, { a: 2 }]); // the same key in two objects is fine
  });

  it('refuses a key repeated in one object with the file, line, column and JSON path (RFC 8259 §4 leaves its meaning open)', () => {
    const text = '{\n  "mass_kg": 3400,\n  "axles": [{}, {"load": {"x": 1,\n    "x": 2}}],\n  "mass_kg": 1\n}';
    expect(() => parseJsonText(text, 'van.json')).toThrow(
      expect.objectContaining({
        code: 'json.duplicateKey',
        location: { file: 'van.json', line: 4, column: 5, jsonPath: '/axles/1/load/x' },
        message: expect.stringMatching(/"x" appears twice in the same object \(lines 3 and 4\)/),
      }),
    );
    expect(() => parseJsonText('{"a~b/c": 1, "a~b/c": 2}', 'x.json')).toThrow(
      expect.objectContaining({ location: expect.objectContaining({ jsonPath: '/a~0b~1c' }) }),
    );
    // An escaped spelling of the same key is the same key.
    expect(() => parseJsonText('{"mass_kg": 1, "mass\\u005fkg": 2}', 'x.json')).toThrow(expect.objectContaining({ code: 'json.duplicateKey' }));
  });

  it('keeps syntax errors as json.syntax', () => {
    expect(() => parseJsonText('{"a": 1,}', 'x.json')).toThrow(expect.objectContaining({ code: 'json.syntax' }));
    expect(() => parseJsonText('{"a": 1} // comment', 'x.json')).toThrow(expect.objectContaining({ code: 'json.syntax' }));
  });

  it('jsonPointer escapes ~ and / as RFC 6901 says', () => {
    // Source: RFC 6901 §3 — "~" is written "~0" and "/" is written "~1".
    expect(jsonPointer(['a/b', 'm~n', 0])).toBe('/a~1b/m~0n/0');
  });
});

describe('every JSON input refuses a repeated key', () => {
  const duplicate = (json: string, key: string): string => json.replace(`"${key}": `, `"${key}": 1, "${key}": `);

  it('the vehicle file: a second "mass_kg" is exit 2 from build, naming the file and the path (JSON.parse would have kept the 1 kg)', async () => {
    const dir = folder();
    const vehicle = join(dir, 'vehicle.json');
    writeFileSync(vehicle, readFileSync('vehicles/parcel-van/vehicle.json', 'utf8').replace('"mass_kg": ', '"mass_kg": 3400, "mass_kg": '));
    expect(() => loadVehicle(vehicle)).toThrow(
      expect.objectContaining({ code: 'json.duplicateKey', location: expect.objectContaining({ jsonPath: '/mass_kg' }) }),
    );
    const io = recordingIo();
    expect(await runCli(['build', '--vehicle', vehicle, '--logs', 'vehicles/parcel-van/logs', '--out', join(dir, 'schedule.json')], io)).toBe(2);
    expect(io.err()).toMatch(new RegExp(`${vehicle.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}.*at /mass_kg: the key "mass_kg" appears twice`));
  });

  it('the plan, models, schedule and log-profile files', async () => {
    const dir = folder();
    const plan = join(dir, 'plan.json');
    writeFileSync(plan, '{"interpolation": "linear", "controller": {"sampleTime_s": 0.01, "sampleTime_s": 0.1}}');
    expect(() => readPlan(plan)).toThrow(
      expect.objectContaining({ code: 'json.duplicateKey', location: expect.objectContaining({ file: plan, jsonPath: '/controller/sampleTime_s' }) }),
    );
    expect(() => parseModels('{"format": "speedband-models", "format": "speedband-models"}', 'models.json')).toThrow(
      expect.objectContaining({ code: 'json.duplicateKey', location: expect.objectContaining({ jsonPath: '/format' }) }),
    );
    const schedule = duplicate(serialiseSchedule(sampleSchedule()), 'kp');
    expect(() => parseSchedule(parseJsonText(schedule, 'schedule.json'), 'schedule.json')).toThrow(
      expect.objectContaining({ code: 'json.duplicateKey', location: expect.objectContaining({ jsonPath: '/units/kp' }) }),
    );
    // parseLogProfile is asynchronous (a unit outside the built-in table loads mathjs): the refusal is a rejection.
    await expect(parseLogProfile('{"columns": {"time_s": {"from": "t", "from": "T"}}}', 'profile.json')).rejects.toMatchObject({
      code: 'json.duplicateKey',
      location: expect.objectContaining({ jsonPath: '/columns/time_s/from' }),
    });
  });

  it('the JSON read on the paths that take units and expressions (a profile unit for mathjs, a plan expression of speed)', async () => {
    const dir = folder();
    await expect(parseLogProfile('{"columns": {"speed_mps": {"from": "v", "unit": "mi/h", "unit": "km/h"}}}', 'profile.json')).rejects.toMatchObject({
      code: 'json.duplicateKey',
      location: expect.objectContaining({ file: 'profile.json', jsonPath: '/columns/speed_mps/unit' }),
    });
    const plan = join(dir, 'plan.json');
    writeFileSync(plan, '{"rule": {"name": "damping-target", "parameters": {"settlingDistance_m": "max(90, 14 * speed_mps)", "settlingDistance_m": 20}}}');
    // The plan is read before any log: a log that does not exist is never reached.
    await expect(buildSchedule({ vehicle: 'vehicles/parcel-van', logPaths: [join(dir, 'no-such-log.csv')], planFile: plan })).rejects.toMatchObject({
      code: 'json.duplicateKey',
      location: expect.objectContaining({ file: plan, jsonPath: '/rule/parameters/settlingDistance_m' }),
    });
  });
});
