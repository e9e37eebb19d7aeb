import { mkdtempSync, readdirSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { recordingIo } from '../../src/cli/io.js';
import { runCli } from '../../src/cli/main.js';

const VEHICLE = 'vehicles/sidewalk-robot';

describe('speedband make-test-logs', () => {
  it('writes one synthetic log per speed and says the data are synthetic', async () => {
    const out = mkdtempSync(join(tmpdir(), 'speedband-cli-logs-'));
    const io = recordingIo();
    expect(await runCli(['make-test-logs', '--vehicle', VEHICLE, '--speeds', '1:0.5:2', '--out', out], io)).toBe(0);
    expect(readdirSync(out).sort()).toEqual(['README.md', 'synthetic-steps-01.00mps.csv', 'synthetic-steps-01.50mps.csv', 'synthetic-steps-02.00mps.csv']);
    expect(io.out()).toMatch(/Synthetic data for demos and tests only/);
    expect(io.out()).toMatch(/each with 8 steps/);
  });

  it('--json reports amplitudes in rad and step onsets in s', async () => {
    const out = mkdtempSync(join(tmpdir(), 'speedband-cli-logs-'));
    const io = recordingIo();
    expect(await runCli(['make-test-logs', '--vehicle', VEHICLE, '--speeds', '2', '--amplitudes-deg', '4,2', '--out', out, '--json'], io)).toBe(0);
    const summary = JSON.parse(io.out()) as { synthetic: boolean; logs: { largeAmplitude_rad: number; smallAmplitude_rad: number; stepOnsets_s: number[] }[] };
    expect(summary.synthetic).toBe(true);
    // Source: 4° = 4π/180 rad (definition of the degree).
    expect(summary.logs[0].largeAmplitude_rad).toBeCloseTo((4 * Math.PI) / 180, 12);
    expect(summary.logs[0].smallAmplitude_rad).toBeCloseTo((2 * Math.PI) / 180, 12);
    expect(summary.logs[0].stepOnsets_s).toHaveLength(8);
  });

  it('the same seed twice gives byte-identical files; another seed needs --force', async () => {
    const out = mkdtempSync(join(tmpdir(), 'speedband-cli-logs-'));
    const args = ['make-test-logs', '--vehicle', VEHICLE, '--speeds', '1.5', '--seed', '11', '--out', out];
    expect(await runCli(args, recordingIo())).toBe(0);
    const first = readFileSync(join(out, 'synthetic-steps-01.50mps.csv'));
    const io = recordingIo();
    expect(await runCli(args, io)).toBe(0);
    expect(io.out()).toMatch(/unchanged/);
    expect(readFileSync(join(out, 'synthetic-steps-01.50mps.csv')).equals(first)).toBe(true);
    const refused = recordingIo();
    expect(await runCli([...args.slice(0, -4), '--seed', '12', '--out', out], refused)).toBe(2);
    expect(refused.err()).toMatch(/--force/);
    expect(await runCli([...args.slice(0, -4), '--seed', '12', '--out', out, '--force'], recordingIo())).toBe(0);
    expect(readFileSync(join(out, 'synthetic-steps-01.50mps.csv')).equals(first)).toBe(false);
  });

  it('bad input exits 2 with a message naming the problem', async () => {
    const out = mkdtempSync(join(tmpdir(), 'speedband-cli-logs-'));
    const badList = recordingIo();
    expect(await runCli(['make-test-logs', '--vehicle', VEHICLE, '--speeds', '1,fast', '--out', out], badList)).toBe(2);
    expect(badList.err()).toMatch(/--speeds "1,fast": "fast" is not a number/);
    const noVehicle = recordingIo();
    expect(await runCli(['make-test-logs', '--vehicle', join(out, 'nope.json'), '--speeds', '1', '--out', out], noVehicle)).toBe(2);
    expect(noVehicle.err()).toMatch(/nope\.json.*cannot read the file/);
    const missing = recordingIo();
    expect(await runCli(['make-test-logs', '--vehicle', VEHICLE, '--out', out], missing)).toBe(2);
    expect(missing.err()).toMatch(/speeds/);
  });

  it('warns when given amplitudes leave the linear tyre range', async () => {
    const out = mkdtempSync(join(tmpdir(), 'speedband-cli-logs-'));
    const io = recordingIo();
    // Source: common practice (docs/domain.md §6) — lateral acceleration well under ~4 m/s² in step tests.
    expect(await runCli(['make-test-logs', '--vehicle', VEHICLE, '--speeds', '3', '--amplitudes-deg', '20,10', '--out', out], io)).toBe(0);
    expect(io.err()).toMatch(/warning: at 3 m\/s the large step gives about .* m\/s² steady lateral acceleration/);
  });

  it('--help teaches the options with units and defaults, and shows examples', async () => {
    const io = recordingIo();
    expect(await runCli(['make-test-logs', '--help'], io)).toBe(0);
    const help = io.out().replace(/\s+/g, ' ');
    expect(help).toMatch(/--speeds Test speeds in m\/s/);
    expect(help).toMatch(/--sample-rate-hz Sample rate of the logs, Hz .*default: 50/);
    expect(help).toMatch(/--amplitudes-deg Road-wheel step amplitudes in degrees/);
    expect(help).toMatch(/Examples:/);
  });
});

describe('speedband make-test-logs --command-resolution-deg', () => {
  it('quantises the command to multiples of the resolution and records it in the README', async () => {
    const out = mkdtempSync(join(tmpdir(), 'speedband-cli-logs-'));
    expect(await runCli(['make-test-logs', '--vehicle', VEHICLE, '--speeds', '2', '--command-resolution-deg', '0.5', '--out', out], recordingIo())).toBe(0);
    const [header, ...rows] = readFileSync(join(out, 'synthetic-steps-02.00mps.csv'), 'utf8').trimEnd().split('\n');
    const column = header.split(',').indexOf('steer_cmd_rad');
    const step = (0.5 * Math.PI) / 180; // Source: 0.5° = 0.5·π/180 rad (definition of the degree).
    for (const row of rows) {
      const value = Number(row.split(',')[column]);
      expect(Math.abs(value / step - Math.round(value / step))).toBeLessThan(1e-3); // 5-decimal rounding of the written value
    }
    expect(readFileSync(join(out, 'README.md'), 'utf8')).toMatch(/--command-resolution-deg 0\.5 /);
  });
});
