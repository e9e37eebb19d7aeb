import { mkdtempSync, readdirSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { recordingIo } from '../../src/cli/io.js';
import { runCli } from '../../src/cli/main.js';
import { DEMO_FLEET, regenerateDemoVehicle } from '../../src/vehicle/demo-fleet.js';
import { loadVehicle } from '../../src/vehicle/load.js';
import { singleTrackParametersFromVehicle, understeerGradient_radPerMps2 } from '../../src/vehicle/single-track.js';

const VEHICLES = 'vehicles';

describe('the demo fleet in vehicles/', () => {
  it('regenerates the committed parcel-van logs byte-identically', () => {
    const demo = DEMO_FLEET.find((entry) => entry.folder === 'parcel-van')!;
    const out = mkdtempSync(join(tmpdir(), 'speedband-fleet-'));
    regenerateDemoVehicle(demo, { vehiclesRoot: VEHICLES, outRoot: out, force: false });
    const committed = join(VEHICLES, demo.folder, 'logs');
    const names = readdirSync(committed).sort();
    expect(readdirSync(join(out, demo.folder, 'logs')).sort()).toEqual(names);
    for (const name of names) expect(readFileSync(join(out, demo.folder, 'logs', name)).equals(readFileSync(join(committed, name))), name).toBe(true);
  });

  it('the make-test-logs command in the sprayer logs README reproduces its CSV files', async () => {
    const committed = join(VEHICLES, 'vineyard-sprayer', 'logs');
    const command = /`speedband (make-test-logs [^`]+)`/.exec(readFileSync(join(committed, 'README.md'), 'utf8'))![1];
    const out = mkdtempSync(join(tmpdir(), 'speedband-fleet-'));
    const args = command.split(' ').map((word) => (word === 'vehicles/vineyard-sprayer/logs' ? out : word));
    expect(await runCli(args, recordingIo())).toBe(0);
    const csvs = readdirSync(committed).filter((name) => name.endsWith('.csv'));
    expect(csvs.length).toBeGreaterThanOrEqual(8);
    for (const name of csvs) expect(readFileSync(join(out, name)).equals(readFileSync(join(committed, name))), name).toBe(true);
  });

  it('every demo vehicle loads, understeers, has 8–12 speeds of labelled synthetic logs and a README saying it is invented', () => {
    for (const demo of DEMO_FLEET) {
      const folder = join(VEHICLES, demo.folder);
      const vehicle = loadVehicle(folder);
      expect(understeerGradient_radPerMps2(singleTrackParametersFromVehicle(vehicle))).toBeGreaterThan(0);
      expect(vehicle.description).toMatch(/synthetic/i);
      const logs = readdirSync(join(folder, 'logs')).filter((name) => name.endsWith('.csv'));
      expect(logs.length).toBeGreaterThanOrEqual(8);
      expect(logs.length).toBeLessThanOrEqual(12);
      expect(logs.every((name) => name.startsWith('synthetic-'))).toBe(true);
      expect(readFileSync(join(folder, 'README.md'), 'utf8')).toMatch(/Synthetic, for demos and tests only/);
    }
  });
});
