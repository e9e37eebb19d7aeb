import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { canonicalJson } from '../../src/schedule/canonical-json.js';
import { checksumContent, computeScheduleChecksum, verifyScheduleChecksum } from '../../src/schedule/checksum.js';
import { parseSchedule, readSchedule, writeSchedule } from '../../src/schedule/schedule-file.js';
import { serialiseSchedule } from '../../src/schedule/schedule-json.js';
import { SAFETY_CAUTIONS } from '../../src/core/safety.js';
import type { ScheduleFile } from '../../src/schedule/schedule-types.js';
import { runPython } from '../helpers/python.js';
import { sampleSchedule } from './sample-schedule.js';

const folder = () => mkdtempSync(join(tmpdir(), 'speedband-schedule-'));
const clone = <T>(value: T): T => JSON.parse(JSON.stringify(value)) as T;

describe('canonicalJson(value)', () => {
  it('writes numbers as ECMAScript shortest round-trip strings, as RFC 8785 requires', () => {
    // Source: RFC 8785 §3.2.2.3 / ECMA-262 Number::toString (from memory: exponent form below 1e-6 and from 1e21).
    expect(canonicalJson([0.1, 1e21, 1e-7, 0.000001, -0, 5e-324, 1.5e300, 100])).toBe('[0.1,1e+21,1e-7,0.000001,0,5e-324,1.5e+300,100]');
    // Source: RFC 8785 §3.2.3 — keys sorted by UTF-16 code units, no whitespace.
    expect(canonicalJson({ b: 1, a: [true, null, 'x'], A: { d: 'é', c: 2 } })).toBe('{"A":{"c":2,"d":"é"},"a":[true,null,"x"],"b":1}');
  });

  it('refuses non-finite numbers with a typed error', () => {
    expect(() => canonicalJson({ kp: Number.NaN })).toThrow(expect.objectContaining({ code: 'schedule.notSerialisable' }));
  });
});

describe('schedule checksum', () => {
  it('matches SHA-256 of the canonical form computed independently in python (ECMA-262 number rules)', () => {
    const schedule = sampleSchedule();
    // Independent implementation: python hashlib + json with sorted keys and ECMA-262 Number::toString digits.
    const reference = runPython<{ value: string; text: string }>(
      `import json, sys, hashlib
from decimal import Decimal
def number(x):
    if isinstance(x, bool): return 'true' if x else 'false'
    if x == 0: return '0'
    sign = '-' if x < 0 else ''
    digits_tuple = Decimal(repr(abs(float(x)))).normalize().as_tuple()
    digits = ''.join(map(str, digits_tuple.digits))
    k = len(digits); n = digits_tuple.exponent + k
    if k <= n <= 21: s = digits + '0' * (n - k)
    elif 0 < n <= 21: s = digits[:n] + '.' + digits[n:]
    elif -6 < n <= 0: s = '0.' + '0' * (-n) + digits
    else:
        e = n - 1
        s = (digits[0] + ('.' + digits[1:] if k > 1 else '')) + 'e' + ('+' if e >= 0 else '-') + str(abs(e))
    return sign + s
def canon(v):
    if v is None: return 'null'
    if isinstance(v, bool): return 'true' if v else 'false'
    if isinstance(v, (int, float)): return number(v)
    if isinstance(v, str): return json.dumps(v, ensure_ascii=False)
    if isinstance(v, list): return '[' + ','.join(canon(x) for x in v) + ']'
    return '{' + ','.join(json.dumps(k, ensure_ascii=False) + ':' + canon(v[k]) for k in sorted(v)) + '}'
s = json.load(sys.stdin)
content = {k: v for k, v in s.items() if k != 'checksum'}
text = canon(content)
print(json.dumps({'value': hashlib.sha256(text.encode('utf-8')).hexdigest(), 'text': text}))`,
      schedule,
    );
    expect(checksumContent(schedule)).toBe(reference.text);
    expect(schedule.checksum.value).toBe(reference.value);
    expect(checksumContent(schedule)).toContain('e-7'); // the synthetic kd includes 1e-7: exercises the exponent form
  });

  it('one altered gain fails verification and names the breakpoint', () => {
    const schedule = clone(sampleSchedule());
    (schedule.breakpoints[2] as { ki: number }).ki *= 1.0001;
    const verdict = verifyScheduleChecksum(schedule);
    expect(verdict.valid).toBe(false);
    expect(verdict.changes).toEqual(['breakpoint 2 (speed 4.5 m/s)']);
  });

  it('any change to any one speed or gain is detected and located (property)', () => {
    // Source: SHA-256 collision resistance (FIPS 180-4) — distinct canonical texts give distinct digests in practice.
    const schedule = sampleSchedule();
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: schedule.breakpoints.length - 1 }),
        fc.constantFrom('speed_mps', 'kp', 'ki', 'kd'),
        fc.double({ noNaN: true, noDefaultInfinity: true }),
        (k, field, value) => {
          fc.pre(!Object.is(value, (schedule.breakpoints[k] as unknown as Record<string, number>)[field]) && !Object.is(value, -0));
          const edited = clone(schedule);
          (edited.breakpoints[k] as unknown as Record<string, number>)[field] = value;
          const verdict = verifyScheduleChecksum(edited);
          expect(verdict.valid).toBe(false);
          expect(verdict.changes).toEqual([`breakpoint ${k} (speed ${edited.breakpoints[k].speed_mps} m/s)`]);
        },
      ),
      { numRuns: 200 },
    );
  });

  it('an altered checksum value fails verification', () => {
    const schedule = clone(sampleSchedule());
    (schedule.checksum as { value: string }).value = '0'.repeat(64);
    expect(verifyScheduleChecksum(schedule).changes[0]).toMatch(/checksum value/);
  });

  it('a changed discretisation fails verification as a controller change', () => {
    const schedule = clone(sampleSchedule());
    (schedule.controller as { discretisation: string }).discretisation = 'tustin';
    expect(verifyScheduleChecksum(schedule).changes).toEqual(['/controller/discretisation']);
  });

  // Every field but the checksum carries meaning a reviewer relies on: each edit below is refused and named.
  const edits: readonly [string, (s: Record<string, any>) => void, string][] = [
    ['status flipped', (s) => (s.status = s.status === 'passed' ? 'failed' : 'passed'), '/status'],
    ['a breakpoint margin', (s) => (s.breakpoints[1].margins.phaseMargin_deg += 10), 'breakpoint 1 (speed 3 m/s)'],
    ['the check range', (s) => (s.check.range.maximum_mps = 30), '/check/range'],
    ['a threshold', (s) => (s.check.thresholds.minimumPhaseMargin_deg = 20), '/check/thresholds'],
    ['the worst margins', (s) => (s.check.worst.phaseMargin_deg.value = 80), '/check/worst'],
    ['check.passed', (s) => (s.check.passed = !s.check.passed), '/check/passed'],
    ['the computation latency', (s) => (s.controller.computationLatency_s = 0.05), '/controller/computationLatency_s'],
    ['the controller equation text', (s) => (s.controller.equation = 'u = 0'), '/controller/equation'],
    ['a unit', (s) => (s.units.kp = 'deg per m'), '/units/kp'],
    ['the vehicle name', (s) => (s.vehicle.name = 'another van'), '/vehicle/name'],
    ['a caution', (s) => (s.cautions[0] = 'Approved for public roads.'), '/cautions/0'],
    ['the interpolation description', (s) => (s.interpolation.description = 'linear'), '/interpolation/description'],
    ['the plan in the provenance', (s) => (s.provenance.plan.interpolation = 'linear'), '/provenance/plan'],
    ['a field a later version might add', (s) => (s.feedForward = { gain: 1 }), '/feedForward/gain (added)'],
    ['a field removed', (s) => delete s.cautions, '/cautions/0 (removed)'],
  ];
  it.each(edits)('covers the whole file: %s is detected and named', (_what, edit, named) => {
    const schedule = clone(sampleSchedule()) as unknown as Record<string, any>;
    edit(schedule);
    const verdict = verifyScheduleChecksum(schedule as unknown as ScheduleFile);
    expect(verdict.valid).toBe(false);
    expect(verdict.changes).toContain(named);
  });

  it('a file of format version 1 (whose checksum covered the table only) is refused by name', () => {
    const old = JSON.parse(serialiseSchedule(sampleSchedule()));
    old.formatVersion = 1;
    expect(() => parseSchedule(old, 'old.json')).toThrow(
      expect.objectContaining({ code: 'schedule.unsupportedVersion', message: expect.stringMatching(/rebuild/) }),
    );
  });
});

describe('writeSchedule / readSchedule', () => {
  it('write then read returns the same schedule; the bytes are deterministic and hold no machine paths', () => {
    const dir = folder();
    const path = join(dir, 'schedule.json');
    const schedule = sampleSchedule();
    expect(writeSchedule(path, schedule, { force: false })).toBe('written');
    expect(readSchedule(path)).toEqual(schedule);
    const text = readFileSync(path, 'utf8');
    expect(text).toBe(serialiseSchedule(sampleSchedule()));
    expect(text).not.toMatch(/\/somewhere|\/data\/logs|tmp/);
    expect(text.indexOf('"format"')).toBeLessThan(text.indexOf('"breakpoints"'));
    expect(schedule.cautions).toEqual(SAFETY_CAUTIONS);
    expect(writeSchedule(path, schedule, { force: false })).toBe('unchanged');
  });

  it('does not replace a different file without force', () => {
    const dir = folder();
    const path = join(dir, 'schedule.json');
    writeFileSync(path, '{}');
    expect(() => writeSchedule(path, sampleSchedule(), { force: false })).toThrow(expect.objectContaining({ code: 'output.exists' }));
    expect(writeSchedule(path, sampleSchedule(), { force: true })).toBe('written');
  });

  it('a file with an altered gain is refused with a typed error naming what changed', () => {
    const dir = folder();
    const path = join(dir, 'schedule.json');
    const text = serialiseSchedule(sampleSchedule());
    const edited = JSON.parse(text);
    edited.breakpoints[0].kp = 1.5;
    writeFileSync(path, JSON.stringify(edited, null, 2));
    expect(() => readSchedule(path)).toThrow(
      expect.objectContaining({ code: 'schedule.checksumMismatch', message: expect.stringMatching(/breakpoint 0 \(speed 2 m\/s/) }),
    );
  });

  it('the schema rejects missing and mistyped fields with the JSON path', () => {
    const base = JSON.parse(serialiseSchedule(sampleSchedule()));
    const missing = clone(base);
    delete missing.controller.sampleTime_s;
    expect(() => parseSchedule(missing, 'schedule.json')).toThrow(
      expect.objectContaining({
        code: 'schedule.invalid',
        location: expect.objectContaining({ jsonPath: '/controller' }),
        message: expect.stringMatching(/sampleTime_s/),
      }),
    );
    const mistyped = clone(base);
    mistyped.breakpoints[1].kp = '0.5';
    expect(() => parseSchedule(mistyped, 'schedule.json')).toThrow(
      expect.objectContaining({ code: 'schedule.invalid', location: expect.objectContaining({ jsonPath: '/breakpoints/1/kp' }) }),
    );
    const wrongFormat = clone(base);
    wrongFormat.format = 'something-else';
    expect(() => parseSchedule(wrongFormat, 'schedule.json')).toThrow(expect.objectContaining({ location: expect.objectContaining({ jsonPath: '/format' }) }));
  });

  it('unsorted breakpoints are refused even with a matching checksum', () => {
    const schedule = clone(sampleSchedule());
    const rows = schedule.breakpoints as unknown as { speed_mps: number }[];
    [rows[1], rows[2]] = [rows[2], rows[1]];
    const resigned = { ...schedule, checksum: computeScheduleChecksum(schedule) };
    expect(() => parseSchedule(resigned, 'schedule.json')).toThrow(expect.objectContaining({ code: 'schedule.invalid' }));
  });

  it('records the loop, units and controller law firmware needs', () => {
    const schedule = sampleSchedule();
    expect(schedule.loop).toMatchObject({ kind: 'path', referencePoint: 'front-axle', preview_m: 4 });
    // Source: docs/domain.md §3 — the path loop's error is a lateral offset in m, command a road-wheel angle in rad.
    expect(schedule.units).toMatchObject({ kp: 'rad per m', ki: 'rad per m·s', kd: 'rad per m/s' });
    expect(schedule.controller.integration).toMatch(/ki·e·Ts/);
    expect(schedule.controller.update.join('\n')).toMatch(/Tf·D\[k−1\]/);
    expect(schedule.controller.integratorClamp_rad).toBe(0.6);
    expect(schedule.interpolation).toMatchObject({ method: 'monotone-cubic', outOfRange: 'clamp', lowSpeedFloor_mps: 2 });
    expect(schedule.check.gridSize).toBeGreaterThanOrEqual(200);
    expect(schedule.status).toBe(schedule.check.passed ? 'passed' : 'failed');
  });
});
