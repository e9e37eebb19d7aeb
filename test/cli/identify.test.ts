import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { recordingIo } from '../../src/cli/io.js';
import { runCli } from '../../src/cli/main.js';
import { readModels } from '../../src/identify/models-file.js';
import { loadVehicle } from '../../src/vehicle/load.js';
import { writeTestLogs } from '../../src/vehicle/test-logs.js';

const VEHICLE = 'vehicles/sidewalk-robot';
let folder = '';
let logs: string[] = [];

beforeAll(() => {
  folder = mkdtempSync(join(tmpdir(), 'speedband-cli-identify-'));
  const written = writeTestLogs(loadVehicle(VEHICLE), [0.8, 1.6], join(folder, 'logs'), { seed: 2 });
  logs = written.files.map((f) => f.path).filter((p) => p.endsWith('.csv'));
}, 60_000);

afterAll(() => rmSync(folder, { recursive: true, force: true }));

describe('speedband identify', () => {
  it('writes models.json and prints a table per speed with intervals, steps used and the model chosen', async () => {
    const io = recordingIo();
    const out = join(folder, 'models.json');
    const code = await runCli(['identify', '--vehicle', VEHICLE, '--logs', ...logs, '--out', out, '--joint-fit', 'false'], io);
    expect(io.err()).toBe('');
    expect(code).toBe(0);
    expect(existsSync(out)).toBe(true);
    const models = readModels(out);
    expect(models.speeds).toHaveLength(2);
    expect(io.out()).toMatch(/FOPDT per speed/);
    expect(io.out()).toMatch(/±/);
    expect(io.out()).toMatch(/Joint single-track fit refused: the joint single-track fit was switched off/);
    // Same inputs → same bytes: a second run leaves the file unchanged (no --force needed).
    const again = recordingIo();
    expect(await runCli(['identify', '--vehicle', VEHICLE, '--logs', ...logs, '--out', out, '--joint-fit', 'false', '--json'], again)).toBe(0);
    expect(JSON.parse(again.out()).outcome).toBe('unchanged');
  }, 60_000);

  it('takes a folder of logs as its .csv files', async () => {
    const io = recordingIo();
    const out = join(folder, 'from-folder.json');
    expect(await runCli(['identify', '--vehicle', VEHICLE, '--logs', join(folder, 'logs'), '--out', out, '--joint-fit', 'false', '--second-order', 'false'], io)).toBe(0);
    expect(readModels(out).inputs.map((i) => i.file)).toEqual([...logs].sort());
  }, 60_000);

  it('refuses logs at a single speed with exit 2 and says that two speeds are needed', async () => {
    const io = recordingIo();
    const code = await runCli(['identify', '--vehicle', VEHICLE, '--logs', logs[0], '--out', join(folder, 'one.json')], io);
    expect(code).toBe(2);
    expect(io.err()).toMatch(/at least two/);
  }, 60_000);

  it('names a missing log file with exit 2', async () => {
    const io = recordingIo();
    expect(await runCli(['identify', '--vehicle', VEHICLE, '--logs', join(folder, 'absent.csv'), '--out', join(folder, 'x.json')], io)).toBe(2);
    expect(io.err()).toMatch(/absent\.csv/);
  });

  it('--help describes options with units and defaults and gives examples', async () => {
    const io = recordingIo();
    expect(await runCli(['identify', '--help'], io)).toBe(0);
    expect(io.out()).toMatch(/speed-tolerance-mps/);
    expect(io.out()).toMatch(/Examples/);
  });
});
