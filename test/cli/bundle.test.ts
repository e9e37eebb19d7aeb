import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { recordingIo } from '../../src/cli/io.js';
import { runCli } from '../../src/cli/main.js';
import { readSchedule } from '../../src/schedule/schedule-file.js';

// The `speedband` binary runs a bundle of the built CLI (scripts/bundle-cli.mjs, made by `npm ci` /
// `npm run build`). These run the binary as a user would and compare it with the sources.
const BIN = fileURLToPath(new URL('../../bin/speedband.js', import.meta.url));
const REBUILD = 'the bundle is older than the sources — run `npm run build`';

function runBinary(args: readonly string[]): { status: number | null; stdout: string; stderr: string } {
  const result = spawnSync(process.execPath, [BIN, ...args], { encoding: 'utf8', timeout: 120_000 });
  return { status: result.status, stdout: result.stdout, stderr: result.stderr };
}

describe('the speedband binary (bundled CLI)', () => {
  it('prints the same help as the CLI built from the sources', async () => {
    const io = recordingIo();
    await runCli(['build', '--help'], io);
    const binary = runBinary(['build', '--help']);
    expect(binary.status).toBe(0);
    expect(binary.stdout, REBUILD).toBe(io.out());
  });

  it('runs the demo end to end: it finds the bundled vehicles and writes a schedule that passes', () => {
    const out = join(mkdtempSync(join(tmpdir(), 'speedband-bundle-')), 'demo');
    const binary = runBinary(['demo', '--out', out]);
    expect(binary.status, binary.stderr).toBe(0);
    expect(existsSync(join(out, 'schedule.json'))).toBe(true);
    expect(readSchedule(join(out, 'schedule.json')).check.passed).toBe(true);
  });

  it('reports bad input with exit 2 and names the file', () => {
    const binary = runBinary(['inspect', 'no-such-log.csv', '--vehicle', 'vehicles/parcel-van']);
    expect(binary.status).toBe(2);
    expect(binary.stderr).toContain('no-such-log.csv');
  });
});
