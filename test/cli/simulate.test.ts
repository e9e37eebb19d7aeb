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
writeFileSync(schedulePath, `${canonicalJson(vehicleSchedule('parcel-van', singleTrackParametersFromVehicle(loadVehicle('vehicles/parcel-van/vehicle.json'))))}\n`);

describe('speedband simulate', () => {
  it('writes the traces as CSV with units in the column names, one row per controller sample of every run, and prints the figures', async () => {
    const io = recordingIo();
    const out = join(folder, 'traces.csv');
    const code = await runCli(['simulate', schedulePath, '--vehicle', 'vehicles/parcel-van', '--scenario', 'small-step', 'side-force', '--speed-mps', '6', '12', '--out', out], io);
    expect(code, io.err()).toBe(0);
    const lines = readFileSync(out, 'utf8').trimEnd().split('\n');
    expect(lines[0]).toBe(
      'scenario,startSpeed_mps,time_s,speed_mps,distance_m,reference_rad,measurement_rad,error_rad,feedForwardInput_radps,command_rad,steerAngle_rad,steerRate_radps,yawRate_radps,lateralAcceleration_mps2,lateralOffset_m,headingError_rad',
    );
    // 2 scenarios × 2 speeds, 31 s at 0.01 s: 3101 samples each.
    expect(lines.length - 1).toBe(4 * 3101);
    expect(new Set(lines.slice(1).map((line) => line.split(',').slice(0, 2).join(',')))).toEqual(new Set(['small-step,6', 'small-step,12', 'side-force,6', 'side-force,12']));
    expect(io.out()).toMatch(/small-step\s+6\.00/);
    expect(io.out()).toMatch(/closed track/);
  });

  it('--json gives every figure per run', async () => {
    const io = recordingIo();
    expect(await runCli(['simulate', schedulePath, '--vehicle', 'vehicles/parcel-van', '--scenario', 'braking-in-curve', '--json'], io)).toBe(0);
    const result = JSON.parse(io.out()) as { runs: { scenario: string; speed_mps: number; integrator: { name: string; converged: boolean }; limitCycle: unknown; peakSteerRate_radps: number }[] };
    expect(result.runs).toHaveLength(1);
    expect(result.runs[0]).toMatchObject({ scenario: 'braking-in-curve', speed_mps: 25, integrator: { name: 'runge-kutta-4', converged: true }, limitCycle: null });
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
    expect(await runCli(['simulate', schedulePath, '--vehicle', 'vehicles/parcel-van', '--scenario', 'small-step', '--speed-mps', '8', '--out', out], io)).toBe(2);
    expect(readFileSync(out, 'utf8')).toBe('something else\n');
  });
});
