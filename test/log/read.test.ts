import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { describeError, isSpeedbandError, type SpeedbandError } from '../../src/core/errors.js';
import { parseSteerLog, readSteerLog } from '../../src/log/read.js';
import { loadLogProfile, parseColumnOptions, parseLogProfile } from '../../src/log/profile.js';

const HEADER = 'time_s,speed_mps,steer_cmd_rad,yaw_rate_radps';
const ROWS = ['0.00,10.0,0.000,0.0000', '0.01,10.0,0.010,0.0010', '0.02,10.1,0.020,0.0030', '0.03,10.1,0.020,0.0040'];
const TOLERANCE = 1e-12; // floating-point round-off, rad or m/s

/** Parse and return the thrown SpeedbandError (fails the test if none is thrown). */
function errorOf(text: string, options = {}): SpeedbandError {
  try {
    parseSteerLog(text, 'test.csv', options);
  } catch (error) {
    if (isSpeedbandError(error)) return error;
    throw error;
  }
  throw new Error('expected a SpeedbandError');
}

describe('parseSteerLog(text, file) accepts the formats loggers write', () => {
  it('reads the default comma format into SI channels with the header as line 1', () => {
    const log = parseSteerLog(`${[HEADER, ...ROWS].join('\n')}\n`, 'a.csv');
    expect(log.rowCount).toBe(4);
    expect(log.segments).toHaveLength(1);
    expect(log.segments[0].firstLine).toBe(2);
    expect(Array.from(log.segments[0].steerCommand_rad)).toEqual([0, 0.01, 0.02, 0.02]);
    expect(log.samplePeriod_s).toBeCloseTo(0.01, 12);
    expect(log.splits).toEqual([]);
    expect(log.droppedRows).toEqual({});
    expect(log.segments[0].steerAngle_rad).toBeUndefined();
  });

  it('accepts a UTF-8 byte-order mark and CRLF line endings', () => {
    const log = parseSteerLog(`\ufeff${[HEADER, ...ROWS].join('\r\n')}\r\n`, 'a.csv');
    expect(log.rowCount).toBe(4);
    expect(Array.from(log.segments[0].yawRate_radps)).toEqual([0, 0.001, 0.003, 0.004]);
  });

  it.each([
    [';', 'semicolon'],
    ['\t', 'tab'],
  ] as const)('detects the %s delimiter (%s) from the header', (delimiter, _name) => {
    const text = [HEADER, ...ROWS].map((line) => line.replaceAll(',', delimiter)).join('\n');
    const log = parseSteerLog(text, 'a.csv');
    expect(log.delimiter).toBe(delimiter);
    expect(Array.from(log.segments[0].speed_mps)).toEqual([10, 10, 10.1, 10.1]);
  });

  it('accepts any column order and lists extra columns without using them', () => {
    const text = ['gps_fix,yaw_rate_radps,steer_cmd_rad,time_s,battery_V,speed_mps', '3,0.5,0.1,0,48.1,5', '3,0.6,0.1,0.02,48.0,5.5'].join('\n');
    const log = parseSteerLog(text, 'a.csv');
    expect(log.ignoredColumns).toEqual(['gps_fix', 'battery_V']);
    expect(log.warnings.join(' ')).toMatch(/gps_fix, battery_V/);
    expect(Array.from(log.segments[0].yawRate_radps)).toEqual([0.5, 0.6]);
    expect(Array.from(log.segments[0].speed_mps)).toEqual([5, 5.5]);
    expect(log.channels?.find((c) => c.channel === 'time_s')?.columnNumber).toBe(4);
  });

  it('reads the optional measured steer angle and lateral acceleration when present', () => {
    const text = ['time_s,speed_mps,steer_cmd_rad,yaw_rate_radps,steer_angle_rad,lat_accel_mps2', '0,5,0.1,0.2,0.09,1.0', '0.1,5,0.1,0.2,0.1,1.1'].join('\n');
    const segment = parseSteerLog(text, 'a.csv').segments[0];
    expect(Array.from(segment.steerAngle_rad ?? [])).toEqual([0.09, 0.1]);
    expect(Array.from(segment.lateralAcceleration_mps2 ?? [])).toEqual([1.0, 1.1]);
  });

  it('converts units: 36 km/h → 10 m/s, 90 deg → π/2 rad, 180 deg/s → π rad/s, 250 ms → 0.25 s, 22.369 mph → 10 m/s, steering wheel 160° at ratio 16 → 10° road wheel', async () => {
    const text = ['t,v_kph,v_mph,swa_deg,wheel_deg,r_dps', '0,36,22.369362920544,160,90,180', '250,36,22.369362920544,160,90,180'].join('\n');
    const columns = await parseColumnOptions([
      'time_s=t:ms',
      'speed_mps=v_kph:km/h',
      'steer_cmd_rad=swa_deg:steering-wheel-deg',
      'steer_angle_rad=wheel_deg:deg',
      'yaw_rate_radps=r_dps:deg/s',
    ]);
    const segment = parseSteerLog(text, 'a.csv', { columns, steeringRatio: 16 }).segments[0];
    expect(segment.time_s[1]).toBeCloseTo(0.25, 12); // 1 s = 1000 ms (SI definition)
    expect(segment.speed_mps[0]).toBeCloseTo(10, 12); // 36 km/h = 36000 m / 3600 s (SI definition)
    expect(Math.abs(segment.steerCommand_rad[0] - (10 * Math.PI) / 180)).toBeLessThan(TOLERANCE); // 160°/16 = 10° road wheel (steering ratio definition)
    expect(Math.abs((segment.steerAngle_rad ?? [])[0] - Math.PI / 2)).toBeLessThan(TOLERANCE); // 90° = π/2 rad
    expect(Math.abs(segment.yawRate_radps[0] - Math.PI)).toBeLessThan(TOLERANCE); // 180°/s = π rad/s
    const mph = parseSteerLog(text, 'a.csv', { columns: { ...columns, speed_mps: { from: 'v_mph', unit: 'mph' } }, steeringRatio: 16 }).segments[0];
    expect(mph.speed_mps[0]).toBeCloseTo(10, 9); // international mile 1609.344 m (1959 international yard and pound agreement): 10 m/s = 22.369362920544 mph
  });

  it('reads a log profile file (JSON) and applies it', async () => {
    const folder = mkdtempSync(join(tmpdir(), 'speedband-log-'));
    const profilePath = join(folder, 'logger.json');
    writeFileSync(
      profilePath,
      JSON.stringify({
        description: 'test logger',
        columns: { time_s: { from: 't', unit: 'ms' }, speed_mps: { from: 'v', unit: 'km/h' }, steer_cmd_rad: { from: 'SWA', unit: 'steering-wheel-deg' } },
      }),
    );
    const logPath = join(folder, 'log.csv');
    writeFileSync(logPath, 't;v;SWA;yaw_rate_radps\n0;72;320;0.1\n20;72;320;0.1\n');
    const profile = await loadLogProfile(profilePath);
    const segment = readSteerLog(logPath, { columns: profile.columns, steeringRatio: 16 }).segments[0];
    expect(segment.time_s[1]).toBeCloseTo(0.02, 12);
    expect(segment.speed_mps[0]).toBeCloseTo(20, 12); // 72 km/h = 20 m/s
    expect(segment.steerCommand_rad[0]).toBeCloseTo((20 * Math.PI) / 180, 12); // 320°/16 = 20°
  });

  it('splits at time gaps longer than 5 median periods and reports each split with its line and gap', () => {
    const rows = [];
    for (let i = 0; i < 10; i += 1) rows.push(`${(i * 0.01).toFixed(2)},5,0,0`);
    for (let i = 0; i < 10; i += 1) rows.push(`${(1 + i * 0.01).toFixed(2)},5,0,0`);
    const log = parseSteerLog([HEADER, ...rows].join('\n'), 'a.csv');
    expect(log.segments).toHaveLength(2);
    expect(log.splits).toHaveLength(1);
    expect(log.splits[0].line).toBe(12); // header line 1, ten rows on lines 2–11
    expect(log.splits[0].gap_s).toBeCloseTo(0.91, 12);
    expect(log.segments[1].firstLine).toBe(12);
    expect(log.segments[1].segmentIndex).toBe(1);
    expect(log.segments[1].time_s[0]).toBe(1);
  });

  it('warns about missed samples that are too short to split the log', () => {
    const rows = ['0.00,5,0,0', '0.01,5,0,0', '0.02,5,0,0', '0.04,5,0,0', '0.05,5,0,0', '0.06,5,0,0'];
    const log = parseSteerLog([HEADER, ...rows].join('\n'), 'a.csv');
    expect(log.segments).toHaveLength(1);
    expect(log.warnings.join(' ')).toMatch(/1 time step longer than 1\.5 median sample periods/);
  });

  it('counts skipped blank and comment lines by reason instead of dropping them silently', () => {
    const text = `${['# logger v2', HEADER, ROWS[0], '', '# marker: step 1', ROWS[1], ROWS[2]].join('\n')}\n`;
    const log = parseSteerLog(text, 'a.csv');
    expect(log.droppedRows).toEqual({ commentLine: 2, blankLine: 1 });
    expect(log.rowCount).toBe(5);
    expect(log.segments[0].time_s).toHaveLength(3);
  });
});

describe('parseSteerLog(text, file) rejects malformed input with a typed error naming line and column', () => {
  const cases: readonly { name: string; text: string; code: string; line: number; column?: RegExp; message?: RegExp; options?: object }[] = [
    { name: 'an empty file', text: '', code: 'log.empty', line: 0 },
    { name: 'a header-only file', text: `${HEADER}\n`, code: 'log.headerOnly', line: 1 },
    {
      name: 'a missing column, with "did you mean"',
      text: ['time_s,speed_mps,steer_cmd_rad,yawrate_radps', ROWS[0], ROWS[1]].join('\n'),
      code: 'log.missingColumn',
      line: 1,
      message: /did you mean "yawrate_radps"/,
    },
    {
      name: 'a non-numeric cell',
      text: [HEADER, ROWS[0], '0.01,10,abc,0'].join('\n'),
      code: 'log.nonNumeric',
      line: 3,
      column: /column 3 \(steer_cmd_rad\)/,
      message: /"abc"/,
    },
    { name: 'a hexadecimal cell', text: [HEADER, ROWS[0], '0.01,0x10,0,0'].join('\n'), code: 'log.nonNumeric', line: 3, column: /column 2 \(speed_mps\)/ },
    {
      name: 'a decimal comma',
      text: ['time_s;speed_mps;steer_cmd_rad;yaw_rate_radps', '0;10;0;0', '0,01;10;0;0'].join('\n'),
      code: 'log.nonNumeric',
      line: 3,
      column: /column 1 \(time_s\)/,
      message: /decimal point/,
    },
    { name: 'NaN', text: [HEADER, ROWS[0], '0.01,10,0,NaN'].join('\n'), code: 'log.nonFinite', line: 3, column: /column 4 \(yaw_rate_radps\)/ },
    { name: 'Infinity', text: [HEADER, ROWS[0], '0.01,Infinity,0,0'].join('\n'), code: 'log.nonFinite', line: 3, column: /column 2 \(speed_mps\)/ },
    { name: 'an overflowing number', text: [HEADER, ROWS[0], '0.01,10,0,1e999'].join('\n'), code: 'log.nonFinite', line: 3, column: /column 4/ },
    { name: 'an empty cell', text: [HEADER, ROWS[0], '0.01,,0,0'].join('\n'), code: 'log.emptyCell', line: 3, column: /column 2 \(speed_mps\)/ },
    { name: 'a short row', text: [HEADER, ROWS[0], '0.01,10,0'].join('\n'), code: 'log.missingCell', line: 3, column: /column 4 \(yaw_rate_radps\)/ },
    { name: 'a long row', text: [HEADER, ROWS[0], '0.01,10,0,0,7'].join('\n'), code: 'log.extraCell', line: 3, column: /column 5/ },
    {
      name: 'time going backwards',
      text: [HEADER, '12.38,10,0,0', '12.40,10,0,0', '12.39,10,0,0'].join('\n'),
      code: 'log.timeNotIncreasing',
      line: 4,
      column: /column 1 \(time_s\)/,
      message: /time_s must increase: 12\.40 then 12\.39 at line 4 — sort the log or split it/,
    },
    {
      name: 'a duplicate timestamp',
      text: [HEADER, ROWS[0], ROWS[1], '0.01,10,0,0'].join('\n'),
      code: 'log.duplicateTime',
      line: 4,
      column: /column 1 \(time_s\)/,
      message: /lines 3 and 4/,
    },
    {
      name: 'a steer command in degrees in a radian column (|steer| > π/2)',
      text: [HEADER, ROWS[0], '0.01,10,5.0,0'].join('\n'),
      code: 'log.implausibleValue',
      line: 3,
      column: /column 3 \(steer_cmd_rad\)/,
      message: /probably degrees/,
    },
    {
      name: 'a speed above 100 m/s',
      text: [HEADER, ROWS[0], '0.01,130,0,0'].join('\n'),
      code: 'log.implausibleValue',
      line: 3,
      column: /column 2 \(speed_mps\)/,
      message: /km\/h/,
    },
    { name: 'a negative speed', text: [HEADER, ROWS[0], '0.01,-3,0,0'].join('\n'), code: 'log.implausibleValue', line: 3, column: /column 2 \(speed_mps\)/ },
    {
      name: 'a yaw rate above 5 rad/s',
      text: [HEADER, ROWS[0], '0.01,10,0,30'].join('\n'),
      code: 'log.implausibleValue',
      line: 3,
      column: /column 4 \(yaw_rate_radps\)/,
      message: /deg\/s/,
    },
    {
      name: 'a measured steer angle beyond π/2',
      text: ['time_s,speed_mps,steer_cmd_rad,yaw_rate_radps,steer_angle_rad', '0,10,0,0,0', '0.01,10,0,0,-2'].join('\n'),
      code: 'log.implausibleValue',
      line: 3,
      column: /column 5 \(steer_angle_rad\)/,
    },
    {
      name: 'a duplicate header name',
      text: ['time_s,speed_mps,steer_cmd_rad,yaw_rate_radps,time_s', '0,1,0,0,0', '1,1,0,0,1'].join('\n'),
      code: 'log.duplicateColumn',
      line: 1,
      column: /column 5 \(time_s\)/,
    },
  ];

  it.each(cases)('$name → $code', ({ text, code, line, column, message, options }) => {
    const error = errorOf(text, options);
    expect(error.code).toBe(code);
    expect(error.location.file).toBe('test.csv');
    const words = describeError(error);
    if (line > 0) expect(words).toMatch(new RegExp(`line ${line}\\b`));
    if (column) expect(words).toMatch(column);
    if (message) expect(words).toMatch(message);
  });

  it('a steering-wheel unit without a steering ratio → log.steeringRatioRequired, telling the user to pass the vehicle or ratio', async () => {
    const error = errorOf([HEADER, ...ROWS].join('\n'), { columns: await parseColumnOptions(['steer_cmd_rad=:steering-wheel-deg']) });
    expect(error.code).toBe('log.steeringRatioRequired');
    expect(error.message).toMatch(/--vehicle/);
  });

  it('a unit of the wrong quantity → log.unitMismatch naming both quantities and units that fit', () => {
    const error = errorOf([HEADER, ...ROWS].join('\n'), { columns: { speed_mps: { unit: 'deg' } } });
    expect(error.code).toBe('log.unitMismatch');
    expect(error.message).toMatch(/"deg" is an angle; speed_mps \(vehicle speed\) needs a speed/);
    expect(error.message).toMatch(/km\/h, mi\/h/);
  });

  it('a unit outside the built-in table that was not resolved (mathjs not loaded) → log.unitNotResolved saying what to call', () => {
    const error = errorOf([HEADER, ...ROWS].join('\n'), { columns: { speed_mps: { unit: 'mi/h' } } });
    expect(error.code).toBe('log.unitNotResolved');
    expect(error.message).toMatch(/resolveColumnUnits/);
  });

  it('a mapped optional column that is absent → log.missingColumn', () => {
    const error = errorOf([HEADER, ...ROWS].join('\n'), { columns: { steer_angle_rad: { from: 'delta_meas' } } });
    expect(error.code).toBe('log.missingColumn');
  });

  it('a missing file → file.unreadable naming the file', () => {
    expect(() => readSteerLog('/nonexistent/log.csv')).toThrow(expect.objectContaining({ code: 'file.unreadable' }));
  });
});

describe('log profiles and --column options are validated', () => {
  it('parseLogProfile rejects an unknown channel (log.profileInvalid) and an unknown unit (log.unknownUnit), each at its JSON path', async () => {
    for (const [profile, code, jsonPath] of [
      [{ columns: { speed_mps: { unit: 'knots' } } }, 'log.unknownUnit', '/columns/speed_mps/unit'],
      [{ columns: { speed_mps: { unit: 'deg/s' } } }, 'log.unitMismatch', '/columns/speed_mps/unit'],
      [{ columns: { speed_kph: { from: 'v' } } }, 'log.profileInvalid', undefined],
    ] as const) {
      const error = await parseLogProfile(JSON.stringify(profile), 'p.json').then(
        () => expect.unreachable(),
        (caught: unknown) => caught as SpeedbandError,
      );
      expect(error.code).toBe(code);
      expect(error.location.file).toBe('p.json');
      if (jsonPath === undefined) expect(error.location.jsonPath).toBeDefined();
      else expect(error.location.jsonPath).toBe(jsonPath);
    }
  });

  it('parseColumnOptions reads CHANNEL=HEADER[:UNIT], converts the units and rejects unknown channels and units', async () => {
    expect(await parseColumnOptions(['speed_mps=v:km/h', 'time_s=stamp', 'yaw_rate_radps=:deg/s'])).toEqual({
      speed_mps: { from: 'v', unit: 'km/h', conversion: { unit: 'km/h', quantity: 'speed', toSi: 1 / 3.6, steeringWheel: false } }, // 1 km/h = 1000 m / 3600 s (SI Brochure 9th ed., Tables 7 and 8)
      time_s: { from: 'stamp' },
      yaw_rate_radps: { unit: 'deg/s', conversion: { unit: 'deg/s', quantity: 'angularRate', toSi: Math.PI / 180, steeringWheel: false } }, // 1° = π/180 rad (SI Brochure 9th ed., Table 8)
    });
    await expect(parseColumnOptions(['speed=v'])).rejects.toMatchObject({ code: 'log.badColumnOption' });
    await expect(parseColumnOptions(['speed_mps=v:'])).rejects.toMatchObject({ code: 'log.badColumnOption' });
    await expect(parseColumnOptions(['speed_mps=v:knots'])).rejects.toMatchObject({
      code: 'log.unknownUnit',
      message: expect.stringContaining('--column "speed_mps=v:knots"'),
    });
  });
});
