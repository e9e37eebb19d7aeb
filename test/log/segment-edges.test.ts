import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { degreesToRadians } from '../../src/core/units.js';
import { parseSteerLog } from '../../src/log/read.js';
import { findStepTests } from '../../src/log/segment.js';
import { syntheticCsv, syntheticLog, type Stage } from './synthetic-log.js';

const deg = degreesToRadians;
const DEMO_LOG = 'vehicles/parcel-van/logs/synthetic-steps-10.00mps.csv';
/** The eight onsets of the demo log, s (the log's README; the plan in src/vehicle/step-plan.ts). */
const DEMO_ONSETS_S = [2.0, 6.64, 9.8, 14.46, 17.62, 22.26, 25.42, 30.06];

/** The demo log without the rows whose time satisfies `drop`. */
function demoWithout(drop: (time_s: number) => boolean): string {
  const [header, ...rows] = readFileSync(DEMO_LOG, 'utf8').trimEnd().split('\n');
  return `${[header, ...rows.filter((row) => !drop(Number(row.slice(0, row.indexOf(',')))))].join('\n')}\n`;
}

function onsetsOf(found: { steps: readonly { onset_s: number }[]; rejected: readonly { onset_s: number }[] }): number[] {
  return [...found.steps, ...found.rejected].map((event) => Math.round(event.onset_s * 100) / 100).sort((a, b) => a - b);
}

describe('findStepTests(log): a command move next to a segment edge is rejected with its reason, never lost', () => {
  it('a time gap 0.26 s before a step (rows t = 20.00–21.98 s removed from the demo log) → noPreStepWindow naming the gap', () => {
    const log = parseSteerLog(
      demoWithout((t) => t >= 19.999 && t <= 21.981),
      'gap.csv',
    );
    expect(log.segments).toHaveLength(2);
    const found = findStepTests(log);
    expect(found.steps).toHaveLength(7);
    expect(found.rejected.map((r) => [r.onset_s, r.reasonCode])).toEqual([[22.26, 'noPreStepWindow']]);
    expect(found.rejected[0].reason).toMatch(
      /step 1\.75° → 0\.00°: the log resumes after a 2\.02 s time gap \(line 1002\) only 0\.26 s before the step \(need ≥ 0\.5 s/,
    );
    expect(onsetsOf(found)).toEqual(DEMO_ONSETS_S);
  });

  it('a log ending 0.34 s after its last step (cut at t = 30.40 s) → holdTooShort saying the log ends', () => {
    const found = findStepTests(
      parseSteerLog(
        demoWithout((t) => t > 30.401),
        'cut.csv',
      ),
    );
    expect(found.steps).toHaveLength(7);
    expect(found.rejected.map((r) => [r.onset_s, r.reasonCode])).toEqual([[30.06, 'holdTooShort']]);
    expect(found.rejected[0].reason).toMatch(/step -1\.75° → 0\.00°: the log ends 0\.34 s after the step \(need ≥ 1\.5 s of hold/);
    expect(onsetsOf(found)).toEqual(DEMO_ONSETS_S);
  });

  it('a time gap 0.4 s after a step → holdTooShort naming the gap; the step after the gap is still found', () => {
    // Keep 0.4 s after the onset at 6.64 s, drop up to 9.00 s: the hold from 6.64 s is cut; the step at 9.80 s stays.
    const found = findStepTests(
      parseSteerLog(
        demoWithout((t) => t > 7.041 && t < 8.999),
        'gap-after.csv',
      ),
    );
    const cut = found.rejected.find((r) => Math.abs(r.onset_s - 6.64) < 0.005);
    expect(cut?.reasonCode).toBe('holdTooShort');
    expect(cut?.reason).toMatch(/a 1\.9\d s time gap \(line \d+\) cuts the log 0\.40 s after the step/);
    expect(found.steps.map((step) => step.onset_s)).toContain(9.8);
    expect(onsetsOf(found)).toEqual(DEMO_ONSETS_S);
  });

  it('a segment shorter than a plateau that still holds a step (0.25 s at 0°, then 1°) → noPreStepWindow', () => {
    const synthetic = syntheticLog({
      plant: { gain_perS: 2.5, timeConstant_s: 0.3, deadTime_s: 0.1 },
      stages: [
        { level_rad: 0, hold_s: 0.2 },
        { level_rad: deg(1), hold_s: 0.2, ramp_s: 0.05 },
      ],
      yawNoise_radps: 0.001,
      seed: 4,
    });
    const found = findStepTests(parseSteerLog(syntheticCsv(synthetic), 'tiny.csv'));
    expect(found.steps).toEqual([]);
    expect(found.rejected.map((r) => r.reasonCode)).toEqual(['noPreStepWindow']);
    expect(Math.abs(found.rejected[0].onset_s - 0.2)).toBeLessThanOrEqual(0.01 + 1e-9);
  });

  it('a constant command in a short segment, or a log that ends on its held level, adds no candidate', () => {
    const flat = syntheticLog({ plant: { gain_perS: 2.5, timeConstant_s: 0.3, deadTime_s: 0.1 }, stages: [{ level_rad: deg(1), hold_s: 0.2 }], seed: 2 });
    expect(findStepTests(parseSteerLog(syntheticCsv(flat), 'flat.csv'))).toEqual({ steps: [], rejected: [] });
    const demo = findStepTests(
      parseSteerLog(
        demoWithout(() => false),
        'whole.csv',
      ),
    );
    expect(demo.rejected).toEqual([]);
    expect(demo.steps.map((step) => step.onset_s)).toEqual(DEMO_ONSETS_S);
  });
});

describe('findStepTests on a log cut at random places (fast-check)', () => {
  // The usual pattern: 8 steps of ±1° and ±2°, returns to zero included, held 3–4.5 s.
  const stages: Stage[] = [{ level_rad: 0, hold_s: 3 }];
  for (const amplitude of [1, -1, 2, -2]) stages.push({ level_rad: deg(amplitude), hold_s: 4.5 }, { level_rad: 0, hold_s: 3 });
  const synthetic = syntheticLog({
    plant: { gain_perS: 2.5, timeConstant_s: 0.3, deadTime_s: 0.1 },
    stages,
    yawNoise_radps: 0.002,
    speedNoise_mps: 0.02,
    seed: 8,
  });
  const [header, ...rows] = syntheticCsv(synthetic).trimEnd().split('\n');
  const end_s = synthetic.time_s[synthetic.time_s.length - 1];

  it('every step whose onset and first 0.05 s of ramp lie in one segment is accepted or rejected; nothing else is reported', () => {
    const cut = fc
      .record({
        end_s: fc.double({ min: 1, max: end_s, noNaN: true }),
        gapStart_s: fc.double({ min: 0.5, max: end_s, noNaN: true }),
        gap_s: fc.double({ min: 0.1, max: 3, noNaN: true }),
      })
      .filter(({ end_s: last, gapStart_s }) => gapStart_s < last - 0.5);
    fc.assert(
      fc.property(cut, ({ end_s: last, gapStart_s, gap_s }) => {
        const gapEnd_s = gapStart_s + gap_s;
        const kept = rows.filter((row) => {
          const t = Number(row.slice(0, row.indexOf(',')));
          return t <= last && (t <= gapStart_s || t >= gapEnd_s);
        });
        const found = findStepTests(parseSteerLog(`${[header, ...kept].join('\n')}\n`, 'cut.csv'));
        const reported = [...found.steps, ...found.rejected].map((event) => event.onset_s);
        // The ramp moves 1° in 0.15 s: 0.05 s into it the command is 0.33° from its old level, beyond the 0.1° band.
        const visible = synthetic.onsets_s.filter((onset) => onset + 0.05 <= last && (onset + 0.05 < gapStart_s || onset > gapEnd_s));
        for (const onset of visible) expect(reported.filter((t) => Math.abs(t - onset) <= 0.02 + 1e-9)).toHaveLength(1);
        // A segment starting part-way up a ramp puts the onset at its first sample: within the 0.15 s ramp of a commanded onset.
        for (const t of reported) expect(synthetic.onsets_s.some((onset) => t >= onset - 0.02 && t <= onset + 0.16)).toBe(true);
      }),
      { numRuns: 80, seed: 1212 },
    );
  });
});
