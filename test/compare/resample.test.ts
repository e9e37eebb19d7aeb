import { describe, expect, it } from 'vitest';
import { marginsAtSpeed, matchSpeeds } from '../../src/compare/resample.js';
import { gainChange, marginChange } from '../../src/compare/changes.js';
import { COMPARE_DEFAULTS } from '../../src/compare/defaults.js';
import type { BreakpointMargins } from '../../src/schedule/schedule-types.js';

const margins = (upper: number | null, lower: number | null, stable = true): BreakpointMargins => ({
  stable,
  verdict: stable ? 'stable' : 'unstable',
  lowerGainMargin_dB: lower,
  upperGainMargin_dB: upper,
  phaseMargin_deg: 50,
  delayMargin_s: 0.1,
  sensitivityPeak: 1.5,
  complementarySensitivityPeak: 1.2,
});
const rows = (list: readonly [number, BreakpointMargins][]) => ({
  breakpoints: list.map(([speed_mps, m]) => ({
    speed_mps,
    kp: 1,
    ki: 0,
    kd: 0,
    setpointWeightProportional: 1,
    setpointWeightDerivative: 0,
    feedForward: 0,
    feedForwardLeadTime_s: 0,
    insertedByRefinement: false,
    margins: m,
    timeDomain: null,
  })),
});

describe('matchSpeeds(old, new, tolerance)', () => {
  it('compares the sorted union inside the overlap of the breakpoint ranges and lists the rest', () => {
    const match = matchSpeeds([2, 5, 10], [4, 5, 12], 0);
    expect(match.points.map((point) => point.speed_mps)).toEqual([4, 5, 10]);
    expect(match.commonRange).toEqual({ minimum_mps: 4, maximum_mps: 10 });
    expect(match.notCompared).toEqual({ old_mps: [2], new_mps: [12] });
    expect(matchSpeeds([2, 4], [5, 9], 0.05)).toEqual({ commonRange: null, points: [], notCompared: { old_mps: [2, 4], new_mps: [5, 9] } });
  });

  it('breakpoints within the tolerance are one compared speed, each schedule read at its own breakpoint', () => {
    // Breakpoints at measured test speeds (build places them there): 15.087 and 15.088 m/s are the same test speed.
    const match = matchSpeeds([2.000247, 9.104, 15.087, 25.002], [2.00019, 9.1041, 15.088, 20, 25.004], 0.05);
    expect(match.points).toEqual([
      { speed_mps: 2.000247, oldSpeed_mps: 2.000247, newSpeed_mps: 2.00019 },
      { speed_mps: 9.104, oldSpeed_mps: 9.104, newSpeed_mps: 9.1041 },
      { speed_mps: 15.087, oldSpeed_mps: 15.087, newSpeed_mps: 15.088 },
      { speed_mps: 20, oldSpeed_mps: 20, newSpeed_mps: 20 },
      { speed_mps: 25.002, oldSpeed_mps: 25.002, newSpeed_mps: 25.004 },
    ]);
    expect(match.notCompared).toEqual({ old_mps: [], new_mps: [] });
  });
});

describe('marginsAtSpeed(schedule, speed)', () => {
  const schedule = rows([
    [2, margins(10, -20)],
    [6, margins(6, null)],
    [10, margins(null, null, false)],
  ]);

  it('returns the breakpoint margins exactly at a breakpoint', () => {
    const at = marginsAtSpeed(schedule, 6);
    expect(at.atBreakpoint).toBe(true);
    expect(at.value('upperGainMargin_dB')).toBe(6);
  });

  it('interpolates linearly between two finite neighbours: 10 dB at 2 m/s, 6 dB at 6 m/s → 9 dB at 3 m/s', () => {
    // Source: linear interpolation, 10 + (3 − 2)/(6 − 2)·(6 − 10) = 9.
    expect(marginsAtSpeed(schedule, 3).value('upperGainMargin_dB')).toBe(9);
  });

  it('takes the finite neighbour when the other has no crossing (the cautious reading), null between two nulls', () => {
    expect(marginsAtSpeed(schedule, 3).value('lowerGainMargin_dB')).toBe(-20);
    expect(marginsAtSpeed(schedule, 8).value('upperGainMargin_dB')).toBe(6);
    expect(marginsAtSpeed(schedule, 8).value('lowerGainMargin_dB')).toBeNull();
  });

  it('is stable between breakpoints only when both neighbours are', () => {
    expect(marginsAtSpeed(schedule, 4).stable).toBe(true);
    expect(marginsAtSpeed(schedule, 8).stable).toBe(false);
  });
});

describe('gainChange / marginChange', () => {
  it('a negative gain growing in magnitude by 20 % reads +20 % (ratio new/old − 1) and is flagged', () => {
    const change = gainChange({ old: -1, new: -1.2, comparable: true, thresholds: COMPARE_DEFAULTS });
    expect(change.change_pct).toBeCloseTo(20, 12);
    expect(change.flagged).toBe(true);
  });

  it('exactly 15 % is flagged (the limit is reached), 14.9 % is not', () => {
    expect(gainChange({ old: 1, new: 1.15, comparable: true, thresholds: COMPARE_DEFAULTS }).flagged).toBe(true);
    expect(gainChange({ old: 1, new: 1.149, comparable: true, thresholds: COMPARE_DEFAULTS }).flagged).toBe(false);
    expect(gainChange({ old: 1, new: 0.85, comparable: true, thresholds: COMPARE_DEFAULTS }).flagged).toBe(true);
  });

  it('informative margins (delay margin, sensitivity peak) are never flagged', () => {
    expect(marginChange(0.2, 0.01, 'none', 0).flagged).toBe(false);
    expect(marginChange(0.2, 0.01, 'none', 0).change).toBeCloseTo(-0.19, 12);
  });
});

describe('thresholds of 0', () => {
  it('flag any change and never an unchanged value', () => {
    const zero = { ...COMPARE_DEFAULTS, gainChange_pct: 0 };
    expect(gainChange({ old: 1, new: 1, comparable: true, thresholds: zero }).flagged).toBe(false);
    expect(gainChange({ old: 1, new: 1.0001, comparable: true, thresholds: zero }).flagged).toBe(true);
    expect(marginChange(60, 60, 'decrease', 0).flagged).toBe(false);
    expect(marginChange(60, 59.9, 'decrease', 0).flagged).toBe(true);
  });
});
