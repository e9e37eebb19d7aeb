import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { makeGainLookup } from '../../src/schedule/interpolate.js';
import { hermiteValue, monotoneCubicSlopes } from '../../src/schedule/monotone-cubic.js';
import { scheduleExtrasLookup, scheduleFirmware, scheduleLookup } from '../../src/schedule/schedule-lookup.js';
import type { GainTable, InterpolationMethod } from '../../src/schedule/types.js';
import { runPython } from '../helpers/python.js';
import { sampleSchedule } from './sample-schedule.js';

/** Floating-point rounding allowance, relative. */
const ROUNDING = 1e-13;
const METHODS: readonly InterpolationMethod[] = ['linear', 'monotone-cubic'];

/** Random tables: 1–8 strictly increasing speeds in (0, 40] m/s, gains of either sign. */
const tableArbitrary = fc.uniqueArray(fc.double({ min: 0.1, max: 40, noNaN: true }), { minLength: 1, maxLength: 8 }).chain((speeds) => {
  const sorted = [...speeds].sort((a, b) => a - b);
  const gain = fc.double({ min: -50, max: 50, noNaN: true });
  return fc
    .array(fc.record({ kp: gain, ki: gain, kd: gain }), { minLength: sorted.length, maxLength: sorted.length })
    .map((gains): GainTable => ({ speeds_mps: sorted, gains }));
});

describe('makeGainLookup(table)', () => {
  for (const interpolation of METHODS) {
    it(`${interpolation}: returns the table values exactly at every breakpoint`, () => {
      // Source: common practice — firmware tables are exact at their breakpoints (docs/domain.md §7).
      fc.assert(
        fc.property(tableArbitrary, (table) => {
          const lookup = makeGainLookup(table, { interpolation });
          table.speeds_mps.forEach((speed, k) => expect(lookup(speed)).toEqual(table.gains[k]));
        }),
      );
    });

    it(`${interpolation}: stays between the neighbouring table values`, () => {
      // Source: Fritsch & Carlson 1980 (monotone intervals cannot overshoot); linear interpolation is a convex combination.
      fc.assert(
        fc.property(tableArbitrary, fc.double({ min: 0, max: 1, noNaN: true }), (table, fraction) => {
          const lookup = makeGainLookup(table, { interpolation });
          const speeds = table.speeds_mps;
          for (let k = 0; k + 1 < speeds.length; k += 1) {
            // Kept inside the interval: with breakpoints one rounding apart, speeds[k] + 1·(width) can round onto the next one.
            const speed = Math.min(speeds[k] + fraction * (speeds[k + 1] - speeds[k]), speeds[k + 1]);
            const gains = lookup(speed);
            for (const name of ['kp', 'ki', 'kd'] as const) {
              const a = table.gains[k][name];
              const b = table.gains[k + 1][name];
              expect(gains[name]).toBeGreaterThanOrEqual(Math.min(a, b));
              expect(gains[name]).toBeLessThanOrEqual(Math.max(a, b));
            }
          }
        }),
      );
    });

    it(`${interpolation}: clamps to the end values outside the table`, () => {
      // Source: docs/domain.md §7 — out of range the schedule holds its end values (clamp), no extrapolation.
      const table: GainTable = {
        speeds_mps: [2, 5, 10],
        gains: [
          { kp: 3, ki: 1, kd: 0.5 },
          { kp: 2, ki: 0.5, kd: 0.2 },
          { kp: 1, ki: 0.2, kd: 0.1 },
        ],
      };
      const lookup = makeGainLookup(table, { interpolation });
      expect(lookup(0)).toEqual(table.gains[0]);
      expect(lookup(1.999)).toEqual(table.gains[0]);
      expect(lookup(10.001)).toEqual(table.gains[2]);
      expect(lookup(1e6)).toEqual(table.gains[2]);
    });
  }

  it('monotone-cubic: monotone data gives a monotone lookup (Fritsch & Carlson 1980)', () => {
    // Source: Fritsch & Carlson 1980, SIAM J. Numer. Anal. 17(2) — the α² + β² ≤ 9 condition guarantees monotone intervals.
    const increasingTable = fc.uniqueArray(fc.double({ min: 0.1, max: 40, noNaN: true }), { minLength: 2, maxLength: 8 }).chain((speeds) =>
      fc.array(fc.double({ min: 0, max: 10, noNaN: true }), { minLength: speeds.length, maxLength: speeds.length }).map((steps) => {
        const sorted = [...speeds].sort((a, b) => a - b);
        let value = 0;
        const values = steps.map((step) => (value += step));
        return { speeds: sorted, values };
      }),
    );
    fc.assert(
      fc.property(increasingTable, fc.boolean(), ({ speeds, values }, decreasing) => {
        const sign = decreasing ? -1 : 1;
        const lookup = makeGainLookup(
          { speeds_mps: speeds, gains: values.map((v) => ({ kp: sign * v, ki: sign * v * v, kd: 0 })) },
          { interpolation: 'monotone-cubic' },
        );
        const first = speeds[0];
        const last = speeds[speeds.length - 1];
        let previous = lookup(first - 1);
        for (let i = 0; i <= 100; i += 1) {
          const gains = lookup(first + ((last - first) * i) / 100);
          // Monotone up to floating-point rounding: a few ulps of the value's size.
          expect(sign * (gains.kp - previous.kp)).toBeGreaterThanOrEqual(-ROUNDING * Math.max(1, Math.abs(gains.kp)));
          expect(sign * (gains.ki - previous.ki)).toBeGreaterThanOrEqual(-ROUNDING * Math.max(1, Math.abs(gains.ki)));
          previous = gains;
        }
      }),
    );
  });

  it('linear data is reproduced exactly by both methods', () => {
    // Source: textbook property of Hermite interpolation — with secant slopes equal to the line's slope, the cubic is the line.
    const table: GainTable = { speeds_mps: [1, 3, 4, 9], gains: [1, 3, 4, 9].map((v) => ({ kp: 2 * v + 1, ki: -0.5 * v, kd: 0.25 })) };
    for (const interpolation of METHODS) {
      const lookup = makeGainLookup(table, { interpolation });
      for (const speed of [1.5, 2.2, 3.7, 6.1, 8.99]) {
        expect(lookup(speed).kp).toBeCloseTo(2 * speed + 1, 12);
        expect(lookup(speed).ki).toBeCloseTo(-0.5 * speed, 12);
        expect(lookup(speed).kd).toBeCloseTo(0.25, 12);
      }
    }
  });

  it('below the low-speed floor the gains at the floor are used', () => {
    // Source: docs/domain.md §7 — gains grow like 1/vx², so below a floor speed the floor's gains are held.
    const table: GainTable = {
      speeds_mps: [1, 4, 8],
      gains: [
        { kp: 16, ki: 4, kd: 1 },
        { kp: 1, ki: 0.25, kd: 0.0625 },
        { kp: 0.25, ki: 0.0625, kd: 0.015625 },
      ],
    };
    for (const interpolation of METHODS) {
      const lookup = makeGainLookup(table, { interpolation, lowSpeedFloor_mps: 2 });
      expect(lookup(0.5)).toEqual(lookup(2));
      expect(lookup(1)).toEqual(lookup(2));
      expect(lookup(1.99)).toEqual(lookup(2));
      expect(lookup(2).kp).toBeLessThan(16);
      expect(lookup(4)).toEqual(table.gains[1]);
    }
  });

  it('rejects unsorted speeds and non-finite speeds with typed errors', () => {
    expect(() =>
      makeGainLookup({
        speeds_mps: [2, 2],
        gains: [
          { kp: 1, ki: 1, kd: 1 },
          { kp: 1, ki: 1, kd: 1 },
        ],
      }),
    ).toThrow(expect.objectContaining({ code: 'schedule.tableInvalid' }));
    const lookup = makeGainLookup({ speeds_mps: [2], gains: [{ kp: 1, ki: 1, kd: 1 }] });
    expect(() => lookup(Number.NaN)).toThrow(expect.objectContaining({ code: 'schedule.speedNotFinite' }));
  });

  it('the Hermite evaluation agrees with scipy CubicHermiteSpline given the same slopes', () => {
    // Source: scipy.interpolate.CubicHermiteSpline (reference library), evaluated with our Fritsch–Carlson slopes.
    const x = [1, 2, 4, 7, 12, 20];
    const y = [10, 6, 3.5, 3.4, 1.2, 1.1];
    const slopes = Array.from(monotoneCubicSlopes(x, y));
    const queries = Array.from({ length: 97 }, (_, i) => 1 + (19 * i) / 96);
    const ours = queries.map((q) => {
      let k = 0;
      while (k < x.length - 2 && q >= x[k + 1]) k += 1;
      const h = x[k + 1] - x[k];
      return hermiteValue({ t: (q - x[k]) / h, h, y0: y[k], y1: y[k + 1], m0: slopes[k], m1: slopes[k + 1] });
    });
    const reference = runPython<number[]>(
      `import json, sys
from scipy.interpolate import CubicHermiteSpline
d = json.load(sys.stdin)
print(json.dumps(CubicHermiteSpline(d['x'], d['y'], d['m'])(d['q']).tolist()))`,
      { x, y, m: slopes, q: queries },
    );
    ours.forEach((value, i) => expect(value).toBeCloseTo(reference[i], 12));
  });

  it('Fritsch–Carlson slopes are zero at a local extremum and respect the α² + β² ≤ 9 circle', () => {
    // Source: Fritsch & Carlson 1980, steps 1–5 (zero slope where secants change sign; circle of radius 3).
    const x = [0, 1, 2, 3, 4];
    const y = [0, 1, 0, 0.01, 10];
    const m = monotoneCubicSlopes(x, y);
    expect(m[1]).toBe(0);
    expect(m[2]).toBe(0);
    for (let k = 0; k < 4; k += 1) {
      const secant = (y[k + 1] - y[k]) / (x[k + 1] - x[k]);
      if (secant === 0) continue;
      expect((m[k] / secant) ** 2 + (m[k + 1] / secant) ** 2).toBeLessThanOrEqual(9 + 1e-12);
    }
  });
});

describe("scheduleFirmware(schedule).at: the firmware's one lookup of every scheduled number", () => {
  for (const interpolation of METHODS) {
    it(`${interpolation}: gives what the gain lookup and the extras lookup give separately, to the bit, at and between breakpoints, below the floor and beyond the table`, () => {
      // Property: one search for the interval and each column interpolated on its own is the same arithmetic as the separate lookups.
      const schedule = sampleSchedule({ interpolation });
      const firmware = scheduleFirmware(schedule);
      const gains = scheduleLookup(schedule);
      const extras = scheduleExtrasLookup(schedule);
      const speeds = schedule.breakpoints.map((row) => row.speed_mps);
      const queries = [0, ...speeds, ...speeds.slice(1).map((v, k) => (v + speeds[k]) / 2), speeds[0] * 0.999, speeds[speeds.length - 1] * 1.5];
      fc.assert(
        fc.property(fc.constantFrom(...queries), fc.double({ min: 0, max: 60, noNaN: true }), (listed, random) => {
          for (const speed of [listed, random]) {
            const at = firmware.at(speed);
            const { kp, ki, kd } = gains(speed);
            const more = extras(speed);
            expect(at).toEqual({
              gains: {
                kp,
                ki,
                kd,
                setpointWeightProportional: more.setpointWeightProportional,
                setpointWeightDerivative: more.setpointWeightDerivative,
                feedForward: more.feedForward,
              },
              feedForwardLeadTime_s: more.feedForwardLeadTime_s,
            });
          }
        }),
      );
      expect(() => firmware.at(Number.NaN)).toThrow(/finite speed/);
    });
  }
});
