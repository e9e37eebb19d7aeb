import { describe, expect, it } from 'vitest';
import { MAXIMUM_UNIT_LENGTH, readUnitExpression, type PhysicalQuantity } from '../../src/core/unit-expressions.js';

const RELATIVE = 1e-15; // a few units in the last place of a double

/** The factor of a unit that must convert, or the test fails with what came back. */
async function factor(expression: string, quantity: PhysicalQuantity): Promise<number> {
  const reading = await readUnitExpression(expression, quantity);
  if (reading.kind !== 'converted') throw new Error(`${expression}: ${JSON.stringify(reading)}`);
  return reading.toSi;
}

const close = (actual: number, expected: number): void => {
  expect(Math.abs(actual - expected)).toBeLessThanOrEqual(RELATIVE * Math.abs(expected));
};

describe('readUnitExpression(unit, quantity) converts with the SI definitions', () => {
  // Each row: unit, quantity, exact value in the quantity's SI unit, and where the definition comes from.
  const rows: readonly (readonly [string, PhysicalQuantity, number, string])[] = [
    ['km/h', 'speed', 1 / 3.6, 'SI Brochure 9th ed. (2019): prefix k = 10³ (Table 7), 1 h = 3600 s (Table 8)'],
    ['mi/h', 'speed', 1609.344 / 3600, 'international yard and pound agreement (1959): 1 yd = 0.9144 m, 1 mi = 1760 yd = 1609.344 m'],
    ['mi/s', 'speed', 1609.344, 'international yard and pound agreement (1959)'],
    ['ft/s', 'speed', 0.3048, 'international yard and pound agreement (1959): 1 ft = 0.3048 m'],
    ['m/s', 'speed', 1, 'SI coherent unit'],
    ['ms', 'time', 1e-3, 'SI Brochure 9th ed., Table 7: milli = 10⁻³'],
    ['min', 'time', 60, 'SI Brochure 9th ed., Table 8: 1 min = 60 s'],
    ['h', 'time', 3600, 'SI Brochure 9th ed., Table 8: 1 h = 3600 s'],
    ['deg', 'angle', Math.PI / 180, 'SI Brochure 9th ed., Table 8: 1° = (π/180) rad'],
    ['arcmin', 'angle', Math.PI / 10800, "SI Brochure 9th ed., Table 8: 1' = (1/60)° = (π/10 800) rad"],
    ['grad', 'angle', Math.PI / 200, 'SI Brochure 8th ed. (2006), Table 6 note (c): 1 gon (grad) = (π/200) rad'],
    ['mrad', 'angle', 1e-3, 'SI Brochure 9th ed., Table 7: milli = 10⁻³'],
    ['deg/s', 'angularRate', Math.PI / 180, 'SI Brochure 9th ed., Table 8'],
    ['deg/min', 'angularRate', Math.PI / 180 / 60, 'SI Brochure 9th ed., Table 8'],
    ['m/s^2', 'acceleration', 1, 'SI coherent unit'],
    ['g', 'acceleration', 9.80665, 'standard acceleration of gravity g_n, 3rd CGPM (1901); SI Brochure 8th ed. (2006)'],
    ['ft/s^2', 'acceleration', 0.3048, 'international yard and pound agreement (1959)'],
    ['km/h/s', 'acceleration', 1 / 3.6, 'SI Brochure 9th ed., Tables 7 and 8'],
  ];
  for (const [unit, quantity, expected, source] of rows) {
    it(`${unit} (${quantity}) = ${expected} in SI — ${source}`, async () => {
      close(await factor(unit, quantity), expected);
    });
  }

  it('accepts spaces and other spellings mathjs reads: "km / h", "m s^-1", "inch/s"', async () => {
    close(await factor('km / h', 'speed'), 1 / 3.6);
    close(await factor('m s^-1', 'speed'), 1);
    close(await factor('inch/s', 'speed'), 0.0254); // 1 in = 0.0254 m (international yard and pound agreement, 1959)
  });
});

describe('readUnitExpression refuses what is not a unit of the quantity, saying what it is', () => {
  it('a unit of another quantity → wrongQuantity naming that quantity in words', async () => {
    expect(await readUnitExpression('deg', 'speed')).toEqual({ kind: 'wrongQuantity', found: 'an angle' });
    expect(await readUnitExpression('km/h', 'angularRate')).toEqual({ kind: 'wrongQuantity', found: 'a speed' });
    expect(await readUnitExpression('kg', 'acceleration')).toEqual({ kind: 'wrongQuantity', found: 'a mass' });
    expect(await readUnitExpression('Hz', 'angularRate')).toMatchObject({ kind: 'wrongQuantity', found: expect.stringMatching(/^a frequency/) });
    expect(await readUnitExpression('W', 'speed')).toMatchObject({ kind: 'wrongQuantity', found: expect.stringMatching(/^of dimension .*kg/) });
  });

  it('"g" is standard gravity only for an acceleration; elsewhere mathjs reads the gram', async () => {
    expect(await readUnitExpression('g', 'speed')).toEqual({ kind: 'wrongQuantity', found: 'a mass' });
  });

  it('unknown names, numbers, empty and over-long texts → notAUnit with the reason', async () => {
    expect(await readUnitExpression('knots', 'speed')).toMatchObject({ kind: 'notAUnit', reason: expect.stringContaining('knots') });
    expect(await readUnitExpression('3.6 km/h', 'speed')).toMatchObject({ kind: 'notAUnit', reason: expect.stringContaining('number') });
    expect(await readUnitExpression('  ', 'speed')).toMatchObject({ kind: 'notAUnit' });
    expect(await readUnitExpression('m/'.repeat(MAXIMUM_UNIT_LENGTH), 'speed')).toMatchObject({
      kind: 'notAUnit',
      reason: expect.stringContaining('characters'),
    });
  });
});
