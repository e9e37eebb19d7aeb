import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { commandPrefix } from '../../src/cli/invocation.js';
import { readSchedule } from '../../src/schedule/schedule-file.js';
import { resolveVehiclePath } from '../../src/vehicle/load.js';

// speedband used outside its repository: the binary run by its path from another folder, as a user who
// has not installed it would, and the demo's "Next:" commands run exactly as printed.
const BIN = fileURLToPath(new URL('../../bin/speedband.js', import.meta.url));

function shell(command: string, cwd: string): { status: number | null; stdout: string; stderr: string } {
  const result = spawnSync('/bin/sh', ['-c', command], { cwd, encoding: 'utf8', timeout: 120_000 });
  return { status: result.status, stdout: result.stdout, stderr: result.stderr };
}

describe('speedband from any folder', () => {
  it('demo runs end to end from another folder: it finds the bundled vehicles, writes a schedule that passes, and prints "Next:" commands that run where they are printed (exit 0, or 1 where a check or comparison flags)', () => {
    const folder = mkdtempSync(join(tmpdir(), 'speedband-anywhere-'));
    const demo = shell(`${process.execPath} ${BIN} demo --out demo-out`, folder);
    expect(demo.status, demo.stderr).toBe(0);
    expect(existsSync(join(folder, 'demo-out', 'schedule.json'))).toBe(true);
    expect(readSchedule(join(folder, 'demo-out', 'schedule.json')).check.passed).toBe(true);
    const next = demo.stdout
      .split('\n')
      .slice(demo.stdout.split('\n').indexOf('Next:') + 1)
      .filter((line) => line.startsWith('  node '));
    // Outside the package `npx speedband` finds nothing: the binary is named by its path.
    expect(next.length).toBe(4);
    for (const line of next) expect(line).toMatch(new RegExp(`^  node ${BIN.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')} `));
    expect(next[0]).toMatch(/ check demo-out\/schedule\.json --vehicle parcel-van$/);
    expect(next[1]).toMatch(/--q-format Q16\.16/);
    const expected = [0, 0, 1, 1]; // the loaded van fails the old gains (the baseline), and the comparison flags it
    next.forEach((line, k) => {
      const result = shell(line.replace('node ', `${process.execPath} `), folder);
      expect(result.status, `${line}\n${result.stderr}`).toBe(expected[k]);
    });
  });

  it('a bundled demo vehicle is found by its name from any folder; a file or folder of that name wins', () => {
    const folder = mkdtempSync(join(tmpdir(), 'speedband-by-name-'));
    const result = shell(`${process.execPath} ${BIN} tune --rule simc --speed-mps 10 --vehicle vineyard-sprayer --json`, folder);
    expect(result.status, result.stderr).toBe(0);
    expect(resolveVehiclePath('parcel-van')).toMatch(/vehicles\/parcel-van\/vehicle\.json$/);
    expect(resolveVehiclePath('vehicles/parcel-van')).toBe(join('vehicles/parcel-van', 'vehicle.json'));
    const unknown = shell(`${process.execPath} ${BIN} tune --rule simc --speed-mps 10 --vehicle no-such-van`, folder);
    expect(unknown.status).toBe(2);
    expect(unknown.stderr).toMatch(
      /no file or folder "no-such-van" here, and no bundled demo vehicle of that name \(parcel-van, parcel-van-loaded, sidewalk-robot, vineyard-sprayer\)/,
    );
  });

  it('inside the package folder the commands are written `npx speedband`', () => {
    expect(commandPrefix()).toBe('npx speedband');
  });
});
