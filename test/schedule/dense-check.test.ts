import { describe, expect, it } from 'vitest';
import { denseCheck, judgeMargins, THRESHOLD_DEFAULTS } from '../../src/schedule/dense-check.js';
import { checkGrid } from '../../src/schedule/grid.js';
import { makeGainLookup } from '../../src/schedule/interpolate.js';
import { refineBreakpoints } from '../../src/schedule/refine.js';
import type { AcceptanceThresholds, GainTable } from '../../src/schedule/types.js';
import { idealGains, integratorLoopMargins, LOOP_DELAY_S } from './integrator-loop.js';

// Source: common practice (docs/domain.md §5): GM ≥ 6 dB, PM ≥ 45°, Ms ≤ 2; delay margin 50 ms chosen for this case.
const THRESHOLDS: AcceptanceThresholds = { ...THRESHOLD_DEFAULTS, minimumDelayMargin_s: 0.05 };
const RANGE = { minimum_mps: 2, maximum_mps: 18 };
const BREAKPOINTS = [2, 6, 18];
const table: GainTable = { speeds_mps: BREAKPOINTS, gains: BREAKPOINTS.map(idealGains) };

describe('denseCheck on a loop that passes at every breakpoint but fails between', () => {
  const grid = checkGrid(BREAKPOINTS, RANGE, 200);
  const result = denseCheck({ grid, gainsAt: makeGainLookup(table, { interpolation: 'linear' }), analyse: integratorLoopMargins, thresholds: THRESHOLDS });

  it('passes at every breakpoint', () => {
    for (const speed of BREAKPOINTS) {
      const point = result.points.find((p) => p.speed_mps === speed);
      expect(point?.failures).toEqual([]);
      // Source: closed form for k·e^(−θs)/s with kθ = π/6 (Åström & Murray 2008): PM = 60°, GM = 3 = 9.54 dB.
      expect(point?.margins.phaseMargin_deg).toBeCloseTo(60, 9);
      expect(point?.margins.upperGainMargin_dB).toBeCloseTo(20 * Math.log10(3), 9);
    }
  });

  it('fails between breakpoints and reports the worst phase margin where calculus puts it', () => {
    expect(result.passed).toBe(false);
    expect(result.failedCount).toBeGreaterThan(0);
    // Linear interpolation of c/v² between 2 and 6 m/s overshoots the ideal gain by the ratio
    // f(v) = (6.5 − v)·v²/18, largest at v = 13/3 m/s with f = 2.2604 (set f'(v) = 0);
    // so PM_worst = 90° − 30°·f = 22.19° and the upper GM there is 20·log10(3/f) = 2.46 dB.
    // Source: hand calculation from the closed form above.
    const fWorst = ((6.5 - 13 / 3) * (13 / 3) ** 2) / 18;
    expect(result.worst.phaseMargin_deg?.value).toBeCloseTo(90 - 30 * fWorst, 1);
    expect(result.worst.phaseMargin_deg?.speed_mps).toBeCloseTo(13 / 3, 1);
    expect(result.worst.upperGainMargin_dB?.value).toBeCloseTo(20 * Math.log10(3 / fWorst), 1);
    expect(result.worst.lowerGainMargin_dB).toBeNull();
    const failingMid = result.points.find((p) => p.speed_mps === 4);
    expect(failingMid?.failures.map((f) => f.criterion)).toEqual(expect.arrayContaining(['phaseMargin', 'upperGainMargin']));
  });

  it('refinement inserts breakpoints in the failing interval until the check passes, and says why', () => {
    const events: string[] = [];
    const checkEvents: number[] = [];
    const refined = refineBreakpoints({
      table,
      range: RANGE,
      density: 200,
      lookup: { interpolation: 'linear', lowSpeedFloor_mps: 2 },
      tuneAt: idealGains,
      analyse: integratorLoopMargins,
      thresholds: THRESHOLDS,
      maxInsertions: 10,
      onProgress: (event) => {
        if (event.stage === 'refine') events.push(event.note ?? '');
        else checkEvents.push(event.done / event.total);
      },
    });
    expect(refined.passed).toBe(true);
    expect(refined.stoppedBecause).toBe('passed');
    expect(refined.check.passed).toBe(true);
    expect(refined.insertions.length).toBeGreaterThan(0);
    expect(events.length).toBe(refined.insertions.length);
    expect(checkEvents.filter((fraction) => fraction === 1).length).toBe(Math.max(...refined.insertions.map((insertion) => insertion.round)) + 1); // one full check per round, plus the final one
    for (const insertion of refined.insertions) {
      expect(insertion.reason).toMatch(/failed; worst at .* breakpoint inserted there/);
      expect(insertion.below_mps).not.toBeNull();
      expect(insertion.speed_mps).toBeGreaterThan(insertion.below_mps ?? Infinity);
      expect(insertion.speed_mps).toBeLessThan(insertion.above_mps ?? -Infinity);
    }
    // The first round inserts one breakpoint in each failing interval, at its most severe speed.
    expect(refined.insertions[0].speed_mps).toBeCloseTo(13 / 3, 1);
    expect(refined.table.speeds_mps.length).toBe(3 + refined.insertions.length);
    expect(refined.insertedByRefinement.filter(Boolean).length).toBe(refined.insertions.length);
    refined.table.speeds_mps.forEach((speed, k) => {
      if (!refined.insertedByRefinement[k]) expect(BREAKPOINTS).toContain(speed);
    });
    // Independent re-check of the refined table on a finer grid.
    const recheck = denseCheck({
      grid: checkGrid(refined.table.speeds_mps, RANGE, 1000),
      gainsAt: makeGainLookup(refined.table, { interpolation: 'linear' }),
      analyse: integratorLoopMargins,
      thresholds: THRESHOLDS,
    });
    expect(recheck.passed).toBe(true);
  });

  it('refinement stops at its insertion limit and reports the table still failing', () => {
    const refined = refineBreakpoints({
      table,
      range: RANGE,
      density: 200,
      lookup: { interpolation: 'linear', lowSpeedFloor_mps: 2 },
      tuneAt: idealGains,
      analyse: integratorLoopMargins,
      thresholds: THRESHOLDS,
      maxInsertions: 1,
    });
    expect(refined.passed).toBe(false);
    expect(refined.stoppedBecause).toBe('insertionLimit');
    expect(refined.insertions.length).toBe(1);
  });

  it('a failure at a breakpoint is reported as not fixable by insertion', () => {
    const tooHigh = (speed: number) => ({ kp: idealGains(speed).kp * 2, ki: 0, kd: 0 });
    const refined = refineBreakpoints({
      table: { speeds_mps: BREAKPOINTS, gains: BREAKPOINTS.map(tooHigh) },
      range: RANGE,
      density: 50,
      lookup: { interpolation: 'monotone-cubic', lowSpeedFloor_mps: 2 },
      tuneAt: tooHigh,
      analyse: integratorLoopMargins,
      thresholds: THRESHOLDS,
      maxInsertions: 3,
    });
    expect(refined.passed).toBe(false);
    expect(refined.unfixable.length).toBeGreaterThan(0);
    expect(refined.unfixable[0].reason).toMatch(/fails at a breakpoint/);
  });
});

describe('refineBreakpoints when the rule itself fails between breakpoints', () => {
  it('does not insert a breakpoint whose own gains fail, and says the rule is at fault', () => {
    // The "rule" gives the ideal gains at 2, 6 and 18 m/s but three times them elsewhere: kθ = π/2 → unstable
    // (closed form, Åström & Murray 2008), so a breakpoint between would fail by itself.
    const rule = (speed: number) => (BREAKPOINTS.includes(speed) ? idealGains(speed) : { kp: 3 * idealGains(speed).kp, ki: 0, kd: 0 });
    const refined = refineBreakpoints({
      table,
      range: RANGE,
      density: 100,
      lookup: { interpolation: 'linear', lowSpeedFloor_mps: 2 },
      tuneAt: rule,
      analyse: integratorLoopMargins,
      thresholds: THRESHOLDS,
      maxInsertions: 5,
    });
    expect(refined.passed).toBe(false);
    expect(refined.stoppedBecause).toBe('notFixableByInsertion');
    expect(refined.insertions).toEqual([]);
    expect(refined.table.speeds_mps).toEqual(BREAKPOINTS);
    expect(refined.unfixable.length).toBeGreaterThan(0);
    expect(refined.unfixable[0].reason).toMatch(/the rule's own gains at .* fail too/);
  });
});

describe('judgeMargins(margins, thresholds)', () => {
  it('an unstable loop fails on stability; its margins do not apply and are not judged', () => {
    // Source: Åström & Murray 2008 — k·e^(−θs)/s is unstable for kθ > π/2.
    const k = 2 / LOOP_DELAY_S;
    const failures = judgeMargins(integratorLoopMargins(1, { kp: k, ki: 0, kd: 0 }), THRESHOLDS);
    expect(failures.map((f) => f.criterion)).toEqual(['stability']);
    expect(failures[0].message).toBe('closed loop unstable');
  });

  it('a lower gain margin closer to 0 dB than −6 dB fails; absent margins do not', () => {
    const base = integratorLoopMargins(1, { kp: 1, ki: 0, kd: 0 });
    expect(judgeMargins({ ...base, lowerGainMargin_dB: -4 }, THRESHOLDS).map((f) => f.criterion)).toEqual(['lowerGainMargin']);
    expect(judgeMargins({ ...base, lowerGainMargin_dB: -12 }, THRESHOLDS)).toEqual([]);
    expect(judgeMargins({ ...base, upperGainMargin_dB: null, delayMargin_s: null, phaseMargin_deg: null }, THRESHOLDS)).toEqual([]);
  });
});
