/**
 * breaksBoundAt, the test at one grid point (and the one below it) that the MIGO search asks before sweeping the grid,
 * against gridLoopCheck's sweep of the whole grid: asking it first must never change which gains the search finds. For random gains on loops of several kinds (lag, integrating, resonant; with delay), at every grid point:
 * - below the point where the sweep stopped on a broken bound, the point test finds no broken bound;
 * - at that point it finds one;
 * - when the sweep went through, it finds none anywhere;
 * and wherever it finds one the sweep calls the gains infeasible.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import type { ControllerSettings } from '../../src/controller/types.js';
import { breaksBoundAt, fullLoopResponse, gridLoopCheck, type SensitivityBounds } from '../../src/tuning/full-loop.js';

const controller: ControllerSettings = { derivativeFilter: 10, sampleTime_s: 0.02, discretisation: 'tustin', computationLatency_s: 0.01 };
/** Each plant, and the decades its gains are drawn from (so that some gains keep the bounds and some break them). */
const PLANTS = {
  'first-order lag with delay': { plant: { numerator: [2], denominator: [0.8, 1], delay_s: 0.12 }, decades: [-3, 1] },
  'integrating with a lag and delay': { plant: { numerator: [3], denominator: [0.2, 1, 0], delay_s: 0.08 }, decades: [-4, 0] },
  'resonant with delay': { plant: { numerator: [4], denominator: [0.04, 0.08, 1], delay_s: 0.05 }, decades: [-3, 1] },
};

describe('breaksBoundAt decides each grid point as gridLoopCheck does', () => {
  for (const [name, { plant, decades }] of Object.entries(PLANTS)) {
    it(`${name}: the same points break, at the same index, for random gains and bounds`, () => {
      const response = fullLoopResponse({ plant, controller }, 0.01);
      let broken = 0;
      let through = 0;
      fc.assert(
        fc.property(
          fc.double({ min: decades[0], max: decades[1], noNaN: true }),
          fc.double({ min: decades[0], max: decades[1], noNaN: true }),
          fc.double({ min: decades[0] - 1, max: decades[1] - 1, noNaN: true }),
          fc.double({ min: 1.2, max: 2.5, noNaN: true }),
          fc.constantFrom(0, 30, 50),
          (logKp, logKi, logKd, peak, phaseMargin_deg) => {
            const gains = { kp: 10 ** logKp, ki: 10 ** logKi, kd: 10 ** logKd };
            const bounds: SensitivityBounds = { sensitivity: peak, complementary: peak, phaseMargin_deg };
            const sweep = gridLoopCheck(response, gains, bounds);
            const decided: boolean[] = [];
            for (let i = 0; i < response.plantRe.length; i++) decided.push(breaksBoundAt(response, gains, bounds, i));
            const first = decided.indexOf(true);
            if (sweep.brokenAt >= 0) broken++;
            else through++;
            // The first point the point test breaks is where the sweep stopped (none when it went through) …
            expect(first).toBe(sweep.brokenAt);
            // … and a broken point anywhere means infeasible gains.
            if (first >= 0) expect(sweep.feasible).toBe(false);
          },
        ),
        { numRuns: 150 },
      );
      // Both outcomes were met: the property was tested on gains that break a bound and on gains that keep them.
      expect(broken).toBeGreaterThan(10);
      expect(through).toBeGreaterThan(10);
    });
  }
});
