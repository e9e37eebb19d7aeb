import { describe, expect, it } from 'vitest';
import { compareSchedules } from '../../src/compare/compare-schedules.js';
import { COMPARE_DEFAULTS } from '../../src/compare/defaults.js';
import { scheduleLookup } from '../../src/schedule/schedule-lookup.js';
import type { ScheduleFile } from '../../src/schedule/schedule-types.js';
import { SINGLE_TRACK_SUMMARY, fixtureGains, fixtureSchedule } from './fixture-schedules.js';

const RAISED_SPEED = 7;
const raisedKp = (speed: number) => ({ ...fixtureGains(speed), kp: fixtureGains(speed).kp * (speed === RAISED_SPEED ? 1.2 : 1) });

/** A copy with edited margins or provenance: neither is covered by the checksum (src/schedule/checksum.ts), so the file stays valid. */
const clone = <T>(value: T): T => JSON.parse(JSON.stringify(value)) as T;

describe('compareSchedules(old, new) on one schedule', () => {
  it('compared with itself flags nothing: every change is 0 and the breakpoints are the compared speeds', () => {
    const schedule = fixtureSchedule();
    const comparison = compareSchedules(schedule, schedule);
    expect(comparison.flags).toEqual([]);
    expect(comparison.gainsComparable).toBe(true);
    expect(comparison.sameBreakpoints).toBe(true);
    expect(comparison.speeds.map((row) => row.speed_mps)).toEqual([2, 3, 4.5, 7, 10, 16]);
    for (const row of comparison.speeds) {
      for (const gain of [row.kp, row.ki, row.kd]) {
        expect(gain.change).toBe(0);
        expect(gain.change_pct).toBe(0);
      }
      expect(row.phaseMargin_deg.change).toBe(0);
      expect(row.oldSource).toBe('breakpoint');
    }
    expect(comparison.thresholds).toEqual(COMPARE_DEFAULTS);
  });
});

describe('compareSchedules with one gain raised 20 % (re-assembled and re-checksummed by the schedule module)', () => {
  const old = fixtureSchedule();
  const next = fixtureSchedule({ gainsAt: raisedKp });

  it('flags kp at that breakpoint and nothing else', () => {
    expect(next.checksum.value).not.toBe(old.checksum.value);
    const comparison = compareSchedules(old, next);
    expect(comparison.flags.map((flag) => ({ kind: flag.kind, speed: flag.speed_mps, quantity: flag.quantity }))).toEqual([
      { kind: 'gainChange', speed: RAISED_SPEED, quantity: 'kp' },
    ]);
    const row = comparison.speeds.find((entry) => entry.speed_mps === RAISED_SPEED)!;
    // Source: definition of the relative change, 100·(1.2·kp − kp)/kp = 20 %.
    expect(row.kp.change_pct).toBeCloseTo(20, 10);
    expect(row.kp.flagged).toBe(true);
    expect(row.ki.flagged).toBe(false);
    expect(comparison.flags[0].message).toMatch(/kp at 7 m\/s: .* \(\+20\.0 %, limit ±15 %\)/);
  });

  it('reports the margins each schedule proved: the phase margin loses 6°, the upper gain margin 20·log10(1.2) dB, neither past its threshold', () => {
    const row = compareSchedules(old, next).speeds.find((entry) => entry.speed_mps === RAISED_SPEED)!;
    // Source: closed form for k·e^(−θs)/s (Åström & Murray 2008): PM = 90° − kθ·180°/π with kθ = π/6 → 60°, ×1.2 → 54°.
    expect(row.phaseMargin_deg.old).toBeCloseTo(60, 9);
    expect(row.phaseMargin_deg.new).toBeCloseTo(54, 9);
    expect(row.phaseMargin_deg.flagged).toBe(false);
    // Source: same closed form, upper GM = π/(2kθ): raising k by 1.2 costs 20·log10(1.2) = 1.584 dB.
    expect(row.upperGainMargin_dB.change).toBeCloseTo(-20 * Math.log10(1.2), 9);
    expect(row.upperGainMargin_dB.flagged).toBe(false);
    expect(row.lowerGainMargin_dB).toEqual({ old: null, new: null, change: null, flagged: false });
  });

  it('a 25 % gain threshold lets the same change pass; a 5° phase-margin threshold flags the 6° loss', () => {
    expect(compareSchedules(old, next, { gainChange_pct: 25 }).flags).toEqual([]);
    const kinds = compareSchedules(old, next, { gainChange_pct: 25, phaseMarginDrop_deg: 5 }).flags.map((flag) => `${flag.kind}@${flag.speed_mps}`);
    expect(kinds).toContain('phaseMarginDrop@7');
    expect(kinds.every((kind) => kind.startsWith('phaseMarginDrop'))).toBe(true);
  });

  it('refuses a negative or non-finite threshold with a typed error naming it', () => {
    expect(() => compareSchedules(old, next, { gainChange_pct: -1 })).toThrow(
      expect.objectContaining({ code: 'compare.invalidThreshold', message: expect.stringMatching(/gainChange_pct is -1/) }),
    );
    expect(() => compareSchedules(old, next, { phaseMarginDrop_deg: Number.NaN })).toThrow(expect.objectContaining({ code: 'compare.invalidThreshold' }));
  });
});

describe('compareSchedules when the breakpoints differ', () => {
  const old = fixtureSchedule();
  const next = fixtureSchedule({ speeds: [2.5, 4, 6, 8, 12, 20] });
  const comparison = compareSchedules(old, next);

  it('compares at the union of both breakpoint speeds within the common range and lists the rest as not compared', () => {
    expect(comparison.sameBreakpoints).toBe(false);
    expect(comparison.commonRange).toEqual({ minimum_mps: 2.5, maximum_mps: 16 });
    expect(comparison.speeds.map((row) => row.speed_mps)).toEqual([2.5, 3, 4, 4.5, 6, 7, 8, 10, 12, 16]);
    expect(comparison.notCompared).toEqual({ old_mps: [2], new_mps: [20] });
    expect(comparison.speeds.map((row) => `${row.oldSource[0]}${row.newSource[0]}`)).toEqual(['ib', 'bi', 'ib', 'bi', 'ib', 'bi', 'ib', 'bi', 'ib', 'bi']);
  });

  it("gives each schedule's own lookup value at every compared speed (gains) and linear interpolation of its breakpoint margins", () => {
    const oldLookup = scheduleLookup(old);
    const newLookup = scheduleLookup(next);
    for (const row of comparison.speeds) {
      for (const name of ['kp', 'ki', 'kd'] as const) {
        expect(row[name].old).toBe(oldLookup(row.speed_mps)[name]);
        expect(row[name].new).toBe(newLookup(row.speed_mps)[name]);
      }
    }
    const interpolated = (schedule: ScheduleFile, speed: number): number => {
      const rows = schedule.breakpoints;
      const k = rows.findIndex((row) => row.speed_mps > speed);
      const [a, b] = [rows[k - 1], rows[k]];
      const t = (speed - a.speed_mps) / (b.speed_mps - a.speed_mps);
      return a.margins.upperGainMargin_dB! + t * (b.margins.upperGainMargin_dB! - a.margins.upperGainMargin_dB!);
    };
    const at3 = comparison.speeds.find((row) => row.speed_mps === 3)!;
    expect(at3.upperGainMargin_dB.old).toBe(old.breakpoints[1].margins.upperGainMargin_dB);
    expect(at3.upperGainMargin_dB.new).toBeCloseTo(interpolated(next, 3), 12);
    const at12 = comparison.speeds.find((row) => row.speed_mps === 12)!;
    expect(at12.upperGainMargin_dB.old).toBeCloseTo(interpolated(old, 12), 12);
  });

  it('breakpoint ranges that do not overlap give no compared speed and a flag saying so', () => {
    const high = fixtureSchedule({ speeds: [20, 25, 30] });
    const result = compareSchedules(old, high);
    expect(result.commonRange).toBeNull();
    expect(result.speeds).toEqual([]);
    expect(result.flags.map((flag) => flag.kind)).toContain('noCommonSpeeds');
  });
});

describe('compareSchedules when settings differ', () => {
  it('a different sample time or loop kind makes the gains not comparable one by one: said, flagged, gain changes null', () => {
    const old = fixtureSchedule();
    for (const plan of [{ controller: { sampleTime_s: 0.02 } }, { loop: { kind: 'heading' as const } }]) {
      const next = fixtureSchedule({ plan });
      const comparison = compareSchedules(old, next);
      expect(comparison.gainsComparable).toBe(false);
      expect(comparison.flags.some((flag) => flag.kind === 'settingChanged' && /not comparable/.test(flag.message))).toBe(true);
      expect(comparison.speeds.every((row) => row.kp.change === null && row.kp.change_pct === null && !row.kp.flagged)).toBe(true);
    }
  });

  it('a different discretisation is named with both values', () => {
    const comparison = compareSchedules(fixtureSchedule(), fixtureSchedule({ plan: { controller: { discretisation: 'tustin' } } }));
    expect(comparison.settingChanges).toEqual([{ setting: 'controller.discretisation', old: 'backward-euler', new: 'tustin', breaksGainComparison: true }]);
  });

  it('a different interpolation method is flagged but leaves the gains comparable', () => {
    const comparison = compareSchedules(fixtureSchedule(), fixtureSchedule({ plan: { interpolation: 'linear' } }));
    expect(comparison.gainsComparable).toBe(true);
    expect(comparison.flags.map((flag) => flag.quantity)).toEqual(['interpolation.method']);
  });
});

describe('compareSchedules margin flags (margins edited in a copy; they are not checksummed)', () => {
  const base = fixtureSchedule();
  const withMargin = (name: 'lowerGainMargin_dB' | 'upperGainMargin_dB' | 'phaseMargin_deg', oldValue: number | null, newValue: number | null) => {
    const old = clone(base);
    const next = clone(base);
    (old.breakpoints[3].margins as unknown as Record<string, unknown>)[name] = oldValue;
    (next.breakpoints[3].margins as unknown as Record<string, unknown>)[name] = newValue;
    return compareSchedules(old, next)
      .flags.filter((flag) => flag.speed_mps !== null)
      .map((flag) => flag.kind);
  };

  it('upper gain margin: flagged when it decreases by 3 dB or more, not by 2.9 dB, not when it grows', () => {
    // Thresholds: the product rule (upper GM decreasing by 3 dB or more is flagged).
    expect(withMargin('upperGainMargin_dB', 12, 9)).toEqual(['upperGainMarginDrop']);
    expect(withMargin('upperGainMargin_dB', 12, 9.1)).toEqual([]);
    expect(withMargin('upperGainMargin_dB', 9, 12)).toEqual([]);
  });

  it('lower gain margin (negative dB): flagged when it moves 3 dB closer to 0 dB, not when it moves away', () => {
    expect(withMargin('lowerGainMargin_dB', -12, -9)).toEqual(['lowerGainMarginCloser']);
    expect(withMargin('lowerGainMargin_dB', -12, -9.5)).toEqual([]);
    expect(withMargin('lowerGainMargin_dB', -12, -15)).toEqual([]);
  });

  it('phase margin: flagged at a 10° loss, not at 9°', () => {
    expect(withMargin('phaseMargin_deg', 60, 50)).toEqual(['phaseMarginDrop']);
    expect(withMargin('phaseMargin_deg', 60, 51)).toEqual([]);
  });

  it('a crossing that appears (null = unbounded before) is flagged; one that disappears is not', () => {
    expect(withMargin('lowerGainMargin_dB', null, -20)).toEqual(['lowerGainMarginCloser']);
    expect(withMargin('lowerGainMargin_dB', -20, null)).toEqual([]);
  });

  it('a speed proven stable before and not now is flagged', () => {
    const next = clone(base);
    (next.breakpoints[2].margins as { stable: boolean }).stable = false;
    expect(compareSchedules(base, next).flags.map((flag) => `${flag.kind}@${flag.speed_mps}`)).toEqual(['stabilityLost@4.5']);
  });
});

describe('compareSchedules gains that were 0', () => {
  it('a gain that was 0 has no % change; any absolute change flags it, staying 0 does not', () => {
    const old = fixtureSchedule({ gainsAt: (speed) => ({ ...fixtureGains(speed), ki: 0 }) });
    const next = fixtureSchedule({ gainsAt: (speed) => ({ ...fixtureGains(speed), ki: speed === 10 ? 1e-6 : 0 }) });
    const comparison = compareSchedules(old, next);
    const at10 = comparison.speeds.find((row) => row.speed_mps === 10)!;
    expect(at10.ki.change_pct).toBeNull();
    expect(at10.ki.change).toBe(1e-6);
    expect(comparison.flags.map((flag) => `${flag.quantity}@${flag.speed_mps}`)).toEqual(['ki@10']);
    expect(comparison.speeds.find((row) => row.speed_mps === 7)!.ki).toEqual({ old: 0, new: 0, change: 0, change_pct: null, flagged: false });
    expect(compareSchedules(old, next, { gainChangeFromZero: 1e-5 }).flags).toEqual([]);
  });
});

describe('compareSchedules model drift', () => {
  it('with single-track summaries in both: each parameter old → new with change and %', () => {
    const old = fixtureSchedule({ modelSummary: SINGLE_TRACK_SUMMARY });
    const next = fixtureSchedule({
      modelSummary: { ...SINGLE_TRACK_SUMMARY, rearCorneringStiffness_NPerRad: 160000, understeerGradient_radPerMps2: 0.002215 },
    });
    const drift = compareSchedules(old, next).modelDrift;
    expect(drift.available).toBe(true);
    if (!drift.available) return;
    expect(drift.parameters.map((parameter) => parameter.name)).toEqual([
      'frontCorneringStiffness_NPerRad',
      'rearCorneringStiffness_NPerRad',
      'actuatorLag_s',
      'actuatorDelay_s',
      'understeerGradient_radPerMps2',
    ]);
    const rear = drift.parameters[1];
    expect(rear.change).toBe(-20000);
    expect(rear.change_pct).toBeCloseTo(-11.111111, 5);
    expect(drift.parameters[0].change).toBe(0);
  });

  it('with a lumped model on either side: not available, with the reason, never zero drift', () => {
    const drift = compareSchedules(fixtureSchedule({ modelSummary: SINGLE_TRACK_SUMMARY }), fixtureSchedule()).modelDrift;
    expect(drift).toEqual({ available: false, reason: expect.stringMatching(/new schedule's model is "synthetic integrator with delay"/) });
    const partial = compareSchedules(
      fixtureSchedule({ modelSummary: { kind: 'single-track', actuatorLag_s: 0.08 } }),
      fixtureSchedule({ modelSummary: SINGLE_TRACK_SUMMARY }),
    ).modelDrift;
    expect(partial.available).toBe(false);
    if (!partial.available) expect(partial.reason).toMatch(/old schedule's single-track model lacks frontCorneringStiffness_NPerRad/);
  });

  it('an understeering model that now oversteers is flagged (K > 0 → K < 0, Gillespie 1992 §6)', () => {
    const old = fixtureSchedule({ modelSummary: SINGLE_TRACK_SUMMARY });
    const next = fixtureSchedule({ modelSummary: { ...SINGLE_TRACK_SUMMARY, understeerGradient_radPerMps2: -0.001 } });
    expect(compareSchedules(old, next).flags.map((flag) => flag.kind)).toEqual(['understeerBecameOversteer']);
  });
});

describe('compareSchedules worst margins and check status', () => {
  it('compares the worst margins of both dense checks; a failing new check is flagged', () => {
    const old = fixtureSchedule();
    // kθ = π/6·1.8 at 7 m/s: PM = 90° − 54° = 36° < 45° (closed form, Åström & Murray 2008): the new check fails.
    const next = fixtureSchedule({ gainsAt: (speed) => ({ ...fixtureGains(speed), kp: fixtureGains(speed).kp * (speed === 7 ? 1.8 : 1) }) });
    expect(next.status).toBe('failed');
    const comparison = compareSchedules(old, next);
    expect(comparison.worst.phaseMargin_deg.new!.value).toBeLessThanOrEqual(36 + 1e-9);
    expect(comparison.worst.phaseMargin_deg.flagged).toBe(true);
    const kinds = comparison.flags.map((flag) => flag.kind);
    expect(kinds).toContain('checkNowFails');
    expect(kinds).toContain('phaseMarginDrop');
    expect(kinds).toContain('upperGainMarginDrop');
  });
});

describe('compareSchedules with breakpoints at measured test speeds', () => {
  it('breakpoints and floors a few mm/s apart are the same speed and setting; each schedule is read at its own breakpoint', () => {
    const old = fixtureSchedule({ speeds: [2.000247, 3, 4.5, 7, 10, 16] });
    const next = fixtureSchedule({ speeds: [2.00019, 3, 4.5, 7.004, 10, 16.002] });
    const comparison = compareSchedules(old, next);
    expect(comparison.sameBreakpoints).toBe(true);
    expect(comparison.flags).toEqual([]);
    expect(comparison.speeds.map((row) => [row.speed_mps, row.newSpeed_mps])).toEqual([
      [2.000247, 2.00019],
      [3, 3],
      [4.5, 4.5],
      [7, 7.004],
      [10, 10],
      [16, 16.002],
    ]);
    const at7 = comparison.speeds[3];
    expect(at7.kp.new).toBe(next.breakpoints[3].kp);
    expect(at7.phaseMargin_deg.new).toBe(next.breakpoints[3].margins.phaseMargin_deg);
    // With no tolerance they are different speeds, resampled through each lookup, and the floors differ.
    const exact = compareSchedules(old, next, { speedTolerance_mps: 0 });
    expect(exact.sameBreakpoints).toBe(false);
    expect(exact.settingChanges.map((change) => change.setting)).toEqual(['interpolation.lowSpeedFloor_mps']);
  });
});
