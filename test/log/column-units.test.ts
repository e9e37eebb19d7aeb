import { describe, expect, it } from 'vitest';
import { loadMathjs } from '../../src/core/mathjs.js';
import { readUnitExpression } from '../../src/core/unit-expressions.js';
import { mergeColumnMaps } from '../../src/log/column-map.js';
import { BUILT_IN_UNITS, STEERING_WHEEL_PREFIX, resolveColumnUnit } from '../../src/log/column-units.js';
import { parseColumnOptions } from '../../src/log/profile.js';
import { parseSteerLog } from '../../src/log/read.js';

const RELATIVE = 1e-15; // a few units in the last place of a double

/** How mathjs spells each built-in unit that is not a mathjs unit name itself. */
const MATHJS_SPELLING: Readonly<Record<string, string>> = { mph: 'mi/h', 'm/s2': 'm/s^2' };

describe('the built-in unit table (fast path, no mathjs) agrees with mathjs', () => {
  for (const [unit, definition] of Object.entries(BUILT_IN_UNITS)) {
    it(`${unit}: ${definition.toSi} per SI unit of ${definition.quantity}`, async () => {
      if (unit === 'g') {
        // Not a mathjs unit ("g" is the gram there): mathjs's physical constant for standard gravity.
        const gravity = (await loadMathjs()).evaluate('gravity').toNumber('m/s^2');
        expect(definition.toSi).toBe(gravity); // 9.80665 m/s² exactly (3rd CGPM 1901)
        return;
      }
      const spelled = MATHJS_SPELLING[unit] ?? (unit.startsWith(STEERING_WHEEL_PREFIX) ? unit.slice(STEERING_WHEEL_PREFIX.length) : unit);
      const reading = await readUnitExpression(spelled, definition.quantity);
      expect(reading.kind).toBe('converted');
      const toSi = reading.kind === 'converted' ? reading.toSi : NaN;
      expect(Math.abs(definition.toSi - toSi)).toBeLessThanOrEqual(RELATIVE * toSi);
      expect(definition.steeringWheel).toBe(unit.startsWith(STEERING_WHEEL_PREFIX));
    });
  }
});

describe('resolveColumnUnit(channel, unit) takes any unit of the channel quantity and refuses the others naming both', () => {
  it('a steering-wheel angle in any angle unit: steering-wheel-grad = π/200 rad, divided by the ratio later', async () => {
    const conversion = await resolveColumnUnit('steer_cmd_rad', 'steering-wheel-grad');
    expect(conversion).toMatchObject({ quantity: 'angle', steeringWheel: true });
    expect(conversion.toSi).toBeCloseTo(Math.PI / 200, 15); // 1 gon = π/200 rad (SI Brochure 8th ed., Table 6 note c)
  });

  it('"deg" for speed_mps → log.unitMismatch: "deg" is an angle; speed_mps needs a speed', async () => {
    await expect(resolveColumnUnit('speed_mps', 'deg')).rejects.toMatchObject({
      code: 'log.unitMismatch',
      message: expect.stringMatching(/^"deg" is an angle; speed_mps \(vehicle speed\) needs a speed — give a unit such as/),
    });
  });

  it('"g" for speed_mps says it is an acceleration and that mathjs reads it as the gram; mathjs units of another quantity are named too', async () => {
    await expect(resolveColumnUnit('speed_mps', 'g')).rejects.toMatchObject({ code: 'log.unitMismatch', message: expect.stringContaining('gram') });
    await expect(resolveColumnUnit('yaw_rate_radps', 'km/h')).rejects.toMatchObject({
      message: expect.stringMatching(/"km\/h" is a speed; yaw_rate_radps .* needs an angular rate/),
    });
    await expect(resolveColumnUnit('time_s', 'steering-wheel-deg')).rejects.toMatchObject({
      message: expect.stringContaining('is a steering-wheel angle; time_s'),
    });
  });

  it('a name mathjs does not know → log.unknownUnit with the origin given (profile file and JSON path)', async () => {
    const error = await resolveColumnUnit('speed_mps', 'furlong/fortnight!', { location: { file: 'p.json', jsonPath: '/columns/speed_mps/unit' } }).catch(
      (caught: unknown) => caught,
    );
    expect(error).toMatchObject({ code: 'log.unknownUnit', location: { file: 'p.json', jsonPath: '/columns/speed_mps/unit' } });
  });
});

describe('logs recorded in units outside the built-in table read into SI', () => {
  it('mi/h, min, ft/s^2 and steering-wheel-grad columns become m/s, s, m/s² and road-wheel rad', async () => {
    const text = ['t_min,v,swa,yaw_rate_radps,ay', '0,22.369362920544,100,0.1,3.2808398950131', '0.001,22.369362920544,100,0.1,3.2808398950131'].join('\n');
    const columns = await parseColumnOptions(['time_s=t_min:min', 'speed_mps=v:mi/h', 'steer_cmd_rad=swa:steering-wheel-grad', 'lat_accel_mps2=ay:ft/s^2']);
    const segment = parseSteerLog(text, 'a.csv', { columns, steeringRatio: 20 }).segments[0];
    expect(segment.time_s[1]).toBeCloseTo(0.06, 12); // 1 min = 60 s (SI Brochure 9th ed., Table 8)
    expect(segment.speed_mps[0]).toBeCloseTo(10, 9); // 10 m/s = 22.369362920544 mi/h (1 mi = 1609.344 m, 1959 agreement)
    expect(segment.steerCommand_rad[0]).toBeCloseTo((100 * Math.PI) / 200 / 20, 12); // 100 gon at the wheel / ratio 20
    expect(segment.lateralAcceleration_mps2?.[0]).toBeCloseTo(1, 9); // 3.2808398950131 ft/s² = 1 m/s² (1 ft = 0.3048 m)
  });
});

describe('mergeColumnMaps keeps each unit with its own conversion', () => {
  it('a later unit replaces the earlier unit and its conversion; a later header name alone keeps both', async () => {
    const profile = await parseColumnOptions(['speed_mps=v:mi/h']);
    expect(mergeColumnMaps(profile, { speed_mps: { unit: 'km/h' } })).toEqual({ speed_mps: { from: 'v', unit: 'km/h' } });
    expect(mergeColumnMaps(profile, { speed_mps: { from: 'speed' } })).toEqual({ speed_mps: { ...profile.speed_mps, from: 'speed' } });
  });
});
