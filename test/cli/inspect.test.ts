import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { recordingIo } from '../../src/cli/io.js';
import { runCli } from '../../src/cli/main.js';
import { degreesToRadians } from '../../src/core/units.js';
import type { LogInspection } from '../../src/log/inspect.js';
import { syntheticCsv, syntheticLog } from '../log/synthetic-log.js';

const folder = mkdtempSync(join(tmpdir(), 'speedband-inspect-'));
const PLANT = { gain_perS: 2.5, timeConstant_s: 0.3, deadTime_s: 0.1 };
const deg = degreesToRadians;

function writeLog(name: string, text: string): string {
  const path = join(folder, name);
  writeFileSync(path, text);
  return path;
}

const fourSteps = syntheticLog({
  plant: PLANT,
  yawNoise_radps: 0.002,
  seed: 2,
  stages: [
    { level_rad: 0, hold_s: 3 },
    { level_rad: deg(2), hold_s: 4 },
    { level_rad: 0, hold_s: 3 },
    { level_rad: deg(-2), hold_s: 4 },
    { level_rad: 0, hold_s: 3 },
  ],
});
const goodLog = writeLog('good.csv', syntheticCsv(fourSteps));

describe('speedband inspect', () => {
  it('prints channels, sampling, and every step with amplitude in rad and degrees, exit 0', async () => {
    const io = recordingIo();
    expect(await runCli(['inspect', goodLog], io)).toBe(0);
    const out = io.out();
    expect(out).toContain(goodLog);
    expect(out).toMatch(/100\.0 Hz/);
    expect(out).toMatch(/steps: 4 found, 0 rejected/);
    expect(out).toMatch(/\+0\.0349\s+\+2\.00\s+left/); // 2° = 0.0349 rad
    expect(out).toMatch(/-0\.0349\s+-2\.00\s+right/);
    expect(out).toMatch(/yaw_rate_radps\s+4 "yaw_rate_radps"\s+rad\/s/);
  });

  it('--json gives one object per log with the steps, in SI units', async () => {
    const io = recordingIo();
    expect(await runCli(['inspect', goodLog, '--json'], io)).toBe(0);
    const [report] = JSON.parse(io.out()) as LogInspection[];
    expect(report.steps).toHaveLength(4);
    expect(report.steps.map((step) => step.direction)).toEqual(['left', 'right', 'right', 'left']);
    expect(report.steps[0].amplitude_rad).toBeCloseTo(deg(2), 6);
    expect(report.steps[0].metrics.steadyYawGain_perS).toBeCloseTo(PLANT.gain_perS, 1);
    expect(report.sampleRate_Hz).toBeCloseTo(100, 6);
  });

  it('applies --column maps with units and the --steering-ratio', async () => {
    const text = syntheticCsv(fourSteps)
      .split('\n')
      .map((line, i) => {
        if (i === 0) return 't_ms;v_kph;SWA_deg;r_dps';
        if (line === '') return line;
        const [t, v, delta, r] = line.split(',').map(Number);
        return [t * 1000, v * 3.6, (delta * 180 * 16) / Math.PI, (r * 180) / Math.PI].map((x) => x.toFixed(6)).join(';');
      })
      .join('\n');
    const path = writeLog('mapped.csv', text);
    const io = recordingIo();
    const args = ['inspect', path, '--json', '--steering-ratio', '16', '--column', 'time_s=t_ms:ms', '--column', 'speed_mps=v_kph:km/h'];
    const code = await runCli([...args, '--column', 'steer_cmd_rad=SWA_deg:steering-wheel-deg', '--column', 'yaw_rate_radps=r_dps:deg/s'], io);
    expect(io.err()).toBe('');
    expect(code).toBe(0);
    const [report] = JSON.parse(io.out()) as LogInspection[];
    expect(report.steps).toHaveLength(4);
    expect(report.steps[0].amplitude_rad).toBeCloseTo(deg(2), 5);
    expect(report.steps[0].speed_mps).toBeCloseTo(10, 3);
  });

  it('exits 2 with file, line and column on unreadable input, and still reports the other logs', async () => {
    const bad = writeLog('bad.csv', 'time_s,speed_mps,steer_cmd_rad,yaw_rate_radps\n0,10,0,0\n0.01,10,oops,0\n');
    const io = recordingIo();
    expect(await runCli(['inspect', bad, goodLog], io)).toBe(2);
    expect(io.err()).toContain(`${bad}, line 3, column 3 (steer_cmd_rad)`);
    expect(io.out()).toMatch(/steps: 4 found/);
  });

  it('several logs end with a summary sorted by speed', async () => {
    const slow = syntheticLog({
      plant: PLANT,
      seed: 4,
      yawNoise_radps: 0.002,
      stages: [
        { level_rad: 0, hold_s: 3, speed_mps: 4 },
        { level_rad: deg(3), hold_s: 4, speed_mps: 4 },
      ],
    });
    const slowLog = writeLog('slow.csv', syntheticCsv(slow));
    const io = recordingIo();
    expect(await runCli(['inspect', goodLog, slowLog], io)).toBe(0);
    const summary = io.out().slice(io.out().indexOf('summary of 2 logs'));
    expect(summary).toMatch(/4\.00\s+1\s+0\s+2\.[45]\d\d\s+\S+\s+\S*slow\.csv\n\s+10\.00\s+4\s+0\s+2\.[45]\d\d\s+\S+\s+\S*good\.csv/);
  });

  it('exits 2 naming the option when a numeric option is out of range', async () => {
    const io = recordingIo();
    expect(await runCli(['inspect', goodLog, '--min-hold-s', '-2'], io)).toBe(2);
    expect(io.err()).toMatch(/minHold_s is -2/);
    const gap = recordingIo();
    expect(await runCli(['inspect', goodLog, '--gap-factor', '0.5'], gap)).toBe(2);
    expect(gap.err()).toMatch(/gap factor is 0\.5/);
  });

  it('exits 2 for a missing file', async () => {
    const io = recordingIo();
    expect(await runCli(['inspect', join(folder, 'absent.csv')], io)).toBe(2);
    expect(io.err()).toMatch(/no such file/);
  });

  it('exits 1 and says why when a log has no usable step', async () => {
    const flat = syntheticLog({ plant: PLANT, stages: [{ level_rad: 0, hold_s: 5 }] });
    const io = recordingIo();
    expect(await runCli(['inspect', writeLog('flat.csv', syntheticCsv(flat))], io)).toBe(1);
    expect(io.out()).toMatch(/no step-steer event found/);
  });

  it('--help teaches the options with units and defaults, and gives examples', async () => {
    const io = recordingIo();
    expect(await runCli(['inspect', '--help'], io)).toBe(0);
    const help = io.out();
    expect(help).toMatch(/--column/);
    expect(help).toMatch(/CHANNEL=HEADER\[:UNIT\]/);
    expect(help).toMatch(/--min-hold-s[\s\S]*\[default: 1\.5\]/);
    expect(help).toMatch(/Examples:/);
  });
});
