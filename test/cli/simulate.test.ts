import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { recordingIo } from '../../src/cli/io.js';
import { runCli } from '../../src/cli/main.js';
import { canonicalJson } from '../../src/schedule/canonical-json.js';
import { singleTrackParametersFromVehicle } from '../../src/vehicle/single-track.js';
import { loadVehicle } from '../../src/vehicle/load.js';
import { vehicleSchedule } from '../compare/vehicle-schedules.js';

const folder = mkdtempSync(join(tmpdir(), 'speedband-simulate-'));
const schedulePath = join(folder, 'schedule.json');
writeFileSync(
  schedulePath,
  `${canonicalJson(vehicleSchedule('parcel-van', singleTrackParametersFromVehicle(loadVehicle('vehicles/parcel-van/vehicle.json'))))}\n`,
);

describe('speedband simulate', () => {
  it('writes the traces as CSV with units in the column names, one row per controller sample of every run, and prints the figures', async () => {
    const io = recordingIo();
    const out = join(folder, 'traces.csv');
    const code = await runCli(
      ['simulate', schedulePath, '--vehicle', 'vehicles/parcel-van', '--scenario', 'small-step', 'side-force', '--speed-mps', '6', '12', '--out', out],
      io,
    );
    expect(code, io.err()).toBe(0);
    const lines = readFileSync(out, 'utf8').trimEnd().split('\n');
    expect(lines[0]).toBe(
      'scenario,startSpeed_mps,time_s,speed_mps,distance_m,reference_rad,measurement_rad,error_rad,feedForwardInput_radps,command_rad,steerAngle_rad,steerRate_radps,yawRate_radps,lateralAcceleration_mps2,lateralOffset_m,headingError_rad',
    );
    // 2 scenarios × 2 speeds, 31 s at 0.01 s: 3101 samples each.
    expect(lines.length - 1).toBe(4 * 3101);
    expect(new Set(lines.slice(1).map((line) => line.split(',').slice(0, 2).join(',')))).toEqual(
      new Set(['small-step,6', 'small-step,12', 'side-force,6', 'side-force,12']),
    );
    expect(io.out()).toMatch(/small-step\s+6\.00/);
    expect(io.out()).toMatch(/closed track/);
  });

  it('--json gives every figure per run', async () => {
    const io = recordingIo();
    expect(await runCli(['simulate', schedulePath, '--vehicle', 'vehicles/parcel-van', '--scenario', 'braking-in-curve', '--json'], io)).toBe(0);
    const result = JSON.parse(io.out()) as {
      runs: { scenario: string; speed_mps: number; integrator: { name: string; converged: boolean }; limitCycle: unknown; peakSteerRate_radps: number }[];
    };
    expect(result.runs).toHaveLength(1);
    expect(result.runs[0]).toMatchObject({
      scenario: 'braking-in-curve',
      speed_mps: 25,
      integrator: { name: 'runge-kutta-4', converged: true },
      limitCycle: null,
    });
  });

  it('takes the lane change and the speed change the user gives (the path the vehicle follows has that width; the ramp lasts range/acceleration)', async () => {
    const io = recordingIo();
    const out = join(folder, 'own.csv');
    const args = ['simulate', schedulePath, '--vehicle', 'vehicles/parcel-van', '--scenario', 'lane-change', 'speed-ramp-in-curve', '--speed-mps', '10'];
    expect(await runCli([...args, '--lane-change-width-m', '3', '--lane-change-length-m', '40', '--acceleration-mps2', '3', '--out', out], io), io.err()).toBe(
      0,
    );
    const rows = readFileSync(out, 'utf8')
      .trimEnd()
      .split('\n')
      .slice(1)
      .map((line) => line.split(','));
    const lane = rows.filter((row) => row[0] === 'lane-change');
    // 1 s lead-in + 40 m at 10 m/s + 30 s: 3501 samples; the reference stays 0 and the vehicle ends 3 m over (offset from the path ≈ 0).
    expect(lane).toHaveLength(3501);
    // The feed-forward reads the yaw-rate reference v·κ: the quintic's largest curvature is (10/√3)·w/L² (d²/ds² of
    // w·(10q³ − 15q⁴ + 6q⁵) at q = (3 − √3)/6; common practice), here 10 m/s × 5.7735 × 3 m / (40 m)².
    const largest = Math.max(...lane.map((row) => Math.abs(Number(row[8]))));
    expect(largest).toBeCloseTo((10 * (10 / Math.sqrt(3)) * 3) / 1600, 4);
    const ramp = rows.filter((row) => row[0] === 'speed-ramp-in-curve');
    // Range 4–25 m/s at 3 m/s²: 7 s of change between 11 s of lead-in and hold and 10 s of hold.
    expect(Number(ramp[ramp.length - 1][2])).toBeCloseTo(11 + 7 + 10, 9);
    expect(await runCli([...args, '--acceleration-mps2', '-1'], recordingIo())).toBe(2);
  });

  it('refuses an unknown scenario with exit 2, naming the closest and every one', async () => {
    const io = recordingIo();
    expect(await runCli(['simulate', schedulePath, '--vehicle', 'vehicles/parcel-van', '--scenario', 'lane-chnage'], io)).toBe(2);
    expect(io.err()).toMatch(/did you mean lane-change/);
    expect(io.err()).toMatch(/braking-in-curve/);
  });

  it('never replaces a different traces file without --force (exit 2)', async () => {
    const out = join(folder, 'other.csv');
    writeFileSync(out, 'something else\n');
    const io = recordingIo();
    expect(await runCli(['simulate', schedulePath, '--vehicle', 'vehicles/parcel-van', '--scenario', 'small-step', '--speed-mps', '8', '--out', out], io)).toBe(
      2,
    );
    expect(readFileSync(out, 'utf8')).toBe('something else\n');
  });
});
