import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { exportCsv } from '../../src/export/csv.js';
import { exportJson } from '../../src/export/json.js';
import { parseQFormat, quantiseTable } from '../../src/export/fixed-point.js';
import { recheckQuantised } from '../../src/export/recheck.js';
import { readSchedule } from '../../src/schedule/schedule-file.js';
import { scheduleLookupSettings, scheduleTable } from '../../src/schedule/schedule-lookup.js';
import { runPython } from '../helpers/python.js';
import { integratorLoopMargins } from '../schedule/integrator-loop.js';
import { sampleSchedule } from '../schedule/sample-schedule.js';

describe('exportCsv(schedule)', () => {
  it('is RFC 4180 CSV that python’s csv module reads back to the same numbers, with units in the header', () => {
    const schedule = sampleSchedule();
    const text = exportCsv(schedule);
    // Source: python csv module (reference reader of RFC 4180-style CSV).
    const rows = runPython<string[][]>(
      `import csv, io, json, sys
print(json.dumps(list(csv.reader(io.StringIO(json.load(sys.stdin), newline='')))))`,
      text,
    );
    expect(rows[0].slice(0, 4)).toEqual(['speed_mps', 'kp (rad per m)', 'ki (rad per m*s)', 'kd (rad per m/s)']);
    expect(rows.length).toBe(schedule.breakpoints.length + 1);
    schedule.breakpoints.forEach((row, k) => {
      expect(Number(rows[k + 1][0])).toBe(row.speed_mps);
      expect(Number(rows[k + 1][1])).toBe(row.kp);
      expect(Number(rows[k + 1][2])).toBe(row.ki);
      expect(Number(rows[k + 1][3])).toBe(row.kd);
      const column = (name: string): string => rows[k + 1][rows[0].indexOf(name)];
      expect(Number(column('setpointWeightProportional'))).toBe(row.setpointWeightProportional);
      expect(Number(column('feedForward (rad per 1/m)'))).toBe(row.feedForward);
      expect(Number(column('feedForwardLeadTime_s'))).toBe(row.feedForwardLeadTime_s);
      expect(column('lowerGainMargin_dB')).toBe(''); // no lower gain margin on this loop
      expect(column('overshoot_pct')).toBe(''); // no time-domain figures on this synthetic loop
      // The controller settings the gains assume stand on every row.
      expect(['sampleTime_s', 'computationLatency_s', 'derivativeFilter', 'discretisation'].map(column)).toEqual([
        String(schedule.controller.sampleTime_s),
        String(schedule.controller.computationLatency_s),
        String(schedule.controller.derivativeFilter),
        schedule.controller.discretisation,
      ]);
    });
    expect(rows[0].slice(-4)).toEqual(['sampleTime_s', 'computationLatency_s', 'derivativeFilter', 'discretisation']);
    expect(text.endsWith('\r\n')).toBe(true);
  });
});

describe('exportJson(schedule)', () => {
  it('export then import returns the same schedule, and exporting again gives the same bytes', () => {
    const schedule = sampleSchedule();
    const text = exportJson(schedule);
    const path = join(mkdtempSync(join(tmpdir(), 'speedband-json-')), 'exported.json');
    writeFileSync(path, text);
    const imported = readSchedule(path);
    expect(imported).toEqual(schedule);
    expect(exportJson(imported)).toBe(text);
  });
});

describe('recheckQuantised(schedule, quantised, analyse)', () => {
  it('with the exact table it reproduces the check recorded in the schedule', () => {
    const schedule = sampleSchedule();
    const result = recheckQuantised({ schedule, quantised: scheduleTable(schedule), analyse: integratorLoopMargins });
    expect(result.points.length).toBe(schedule.check.gridSize);
    expect(result.passed).toBe(schedule.check.passed);
    expect(result.worst.phaseMargin_deg).toEqual(schedule.check.worst.phaseMargin_deg);
  });

  it('a coarse fixed-point format moves the margins and the re-check sees it', () => {
    const schedule = sampleSchedule();
    const coarse = quantiseTable(scheduleTable(schedule), parseQFormat('8.8'), scheduleLookupSettings(schedule));
    const result = recheckQuantised({ schedule, quantised: coarse.table, analyse: integratorLoopMargins });
    // Q8.8 rounds kp to 1/256: kp at 16 m/s (0.0205) becomes 5/256 = 0.0195, so kθ and the phase margin there change.
    // Source: closed form PM = 90° − kθ·180/π for k·e^(−θs)/s (Åström & Murray 2008).
    const last = result.points[result.points.length - 1];
    const expectedPm = 90 - ((5 / 256) * 16 * 16 * 0.1 * 180) / Math.PI;
    expect(last.margins.phaseMargin_deg).toBeCloseTo(expectedPm, 9);
    expect(coarse.errors.kp.maxAbsolute).toBeLessThanOrEqual(2 ** -9);
  });
});
