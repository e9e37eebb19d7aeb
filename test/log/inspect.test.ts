import { describe, expect, it } from 'vitest';
import { degreesToRadians } from '../../src/core/units.js';
import { inspectLog } from '../../src/log/inspect.js';
import { formatInspection } from '../../src/log/inspection-text.js';
import { parseSteerLog } from '../../src/log/read.js';
import { syntheticCsv, syntheticLog } from './synthetic-log.js';

const PLANT = { gain_perS: 2.5, timeConstant_s: 0.3, deadTime_s: 0.1 };
const deg = degreesToRadians;

function inspectSteps(amplitude_deg: number, speed_mps: number) {
  const stages = [
    { level_rad: 0, hold_s: 3, speed_mps },
    { level_rad: deg(amplitude_deg), hold_s: 4, speed_mps },
    { level_rad: 0, hold_s: 3, speed_mps },
  ];
  return inspectLog(parseSteerLog(syntheticCsv(syntheticLog({ plant: PLANT, stages, yawNoise_radps: 0.001 })), 'x.csv'));
}

describe('inspectLog(log)', () => {
  it('summarises duration, sample rate and channel ranges in SI', () => {
    const inspection = inspectSteps(2, 10);
    expect(inspection.duration_s).toBeCloseTo(10.3, 9); // 3 + (0.15 + 4) + (0.15 + 3) s
    expect(inspection.sampleRate_Hz).toBeCloseTo(100, 6);
    const steer = inspection.channels.find((channel) => channel.channel === 'steer_cmd_rad');
    expect(steer?.max).toBeCloseTo(deg(2), 6);
    expect(steer?.min).toBe(0);
    expect(inspection.steps).toHaveLength(2);
    expect(inspection.steps[0].hold_s).toBeCloseTo(4.15, 1);
  });

  it('warns when a step leaves the linear tyre range (vx·r above 4 m/s², common practice) and not otherwise', () => {
    // 20 m/s × 2.5 1/s × 6° (0.105 rad) ≈ 5.2 m/s².
    const hard = inspectSteps(6, 20);
    expect(hard.warnings.filter((warning) => /linear tyre range/.test(warning))).toHaveLength(1);
    expect(hard.warnings.join(' ')).toMatch(/step 0 at 3\.00 s: steady lateral acceleration ≈ 5\.2 m\/s²/);
    // 10 m/s × 2.5 1/s × 2° ≈ 0.87 m/s².
    expect(inspectSteps(2, 10).warnings).toEqual([]);
  });

  it('formatInspection shows each step with its amplitude in rad and degrees and the metrics', () => {
    const text = formatInspection(inspectSteps(2, 10));
    expect(text).toMatch(/steps: 2 found, 0 rejected/);
    expect(text).toMatch(/0\s+3\.00\s+10\.00\s+\+0\.0349\s+\+2\.00\s+left\s+2\.50\d/);
    expect(text).toMatch(/1\s+7\.15\s+10\.00\s+-0\.0349\s+-2\.00\s+right/);
  });
});
