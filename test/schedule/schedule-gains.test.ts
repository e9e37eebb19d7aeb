import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { resolvePlan } from '../../src/schedule/plan.js';
import { assembleSchedule, readSchedule, writeSchedule } from '../../src/schedule/schedule-file.js';
import { scheduleGains } from '../../src/schedule/schedule-gains.js';
import { idealGains, integratorLoopMargins } from './integrator-loop.js';
import { fixtureExtras } from './sample-schedule.js';

describe('scheduleGains(plan, tuneAt, analyse) then assembleSchedule', () => {
  it('a plan with too few breakpoints is refined until the dense check passes; the file records the insertions', () => {
    // Two linear-interpolated breakpoints 2 and 18 m/s: between them c/v² is overestimated by up to ~5×,
    // far past the PM 45° / GM 6 dB limits (common practice) on the constructed loop k·e^(−0.1 s)/s.
    const plan = resolvePlan({
      speeds: { minimum_mps: 2, maximum_mps: 18, lowSpeedFloor_mps: 2 },
      breakpoints: { count: 2, spacing: 'geometric' },
      interpolation: 'linear',
      controller: { sampleTime_s: 0.01, computationLatency_s: 0.01 },
      check: { maxInsertedBreakpoints: 20 },
    });
    const result = scheduleGains({ plan, tuneAt: idealGains, analyse: integratorLoopMargins });
    expect(result.passed).toBe(true);
    expect(result.insertions.length).toBeGreaterThan(0);
    const schedule = assembleSchedule({
      vehicle: { name: 'sidewalk robot (synthetic)', file: 'vehicle.json', sha256: 'a'.repeat(64) },
      plan,
      table: result.table,
      insertedByRefinement: result.insertedByRefinement,
      check: result.check,
      insertions: result.insertions,
      integratorClamp_rad: 0.5,
      maxSteerRate_radps: 0.5,
      breakpointExtras: fixtureExtras(result.table.speeds_mps),
      inputs: [],
      modelSummary: {},
      modelDescription: 'synthetic test loop',
    });
    expect(schedule.status).toBe('passed');
    expect(schedule.breakpoints.filter((row) => row.insertedByRefinement).length).toBe(result.insertions.length);
    expect(schedule.check.insertions[0].reason).toMatch(/breakpoint inserted there/);
    // Source: closed form (Åström & Murray 2008): at every breakpoint kθ = π/6, so PM = 60°.
    for (const row of schedule.breakpoints) expect(row.margins.phaseMargin_deg).toBeCloseTo(60, 9);
    const path = join(mkdtempSync(join(tmpdir(), 'speedband-gains-')), 'schedule.json');
    writeSchedule(path, schedule, { force: false });
    expect(readSchedule(path)).toEqual(schedule);
  });
});
