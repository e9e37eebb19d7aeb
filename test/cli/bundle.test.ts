import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { recordingIo } from '../../src/cli/io.js';
import { runCli } from '../../src/cli/main.js';

// The `speedband` binary runs a bundle of the built CLI (scripts/bundle-cli.mjs, made by `npm ci` /
// `npm run build`). These run the binary as a user would and compare it with the sources; the binary's demo
// end to end, from another folder, is in anywhere.test.ts.
const BIN = fileURLToPath(new URL('../../bin/speedband.js', import.meta.url));
const REBUILD = 'the bundle is older than the sources — run `npm run build`';

const DIST_CLI = fileURLToPath(new URL('../../dist/cli/', import.meta.url));
const VAN_LOG = fileURLToPath(new URL('../../vehicles/parcel-van/logs/synthetic-steps-10.00mps.csv', import.meta.url));

function runBinary(args: readonly string[], cwd?: string, nodeOptions: readonly string[] = []): { status: number | null; stdout: string; stderr: string } {
  const result = spawnSync(process.execPath, [...nodeOptions, BIN, ...args], { encoding: 'utf8', timeout: 120_000, ...(cwd === undefined ? {} : { cwd }) });
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

  it('reports bad input with exit 2 and names the file', () => {
    const binary = runBinary(['inspect', 'no-such-log.csv', '--vehicle', 'vehicles/parcel-van']);
    expect(binary.status).toBe(2);
    expect(binary.stderr).toContain('no-such-log.csv');
  });

  it('keeps mathjs out of the CLI bundle: a separate chunk, imported only dynamically, so --help never reads it', () => {
    const cli = readFileSync(join(DIST_CLI, 'speedband.bundle.js'), 'utf8');
    const chunk = readFileSync(join(DIST_CLI, 'mathjs.bundle.js'), 'utf8');
    expect(cli, REBUILD).toContain('import("./mathjs.bundle.js")');
    expect(cli).not.toMatch(/from\s*"\.\/mathjs\.bundle\.js"/);
    // mathjs's own code (its sparse matrix class, its unit parser) is in the chunk only.
    for (const marker of ['SparseMatrix', 'Unit.parse']) {
      expect(chunk).toContain(marker);
      expect(cli).not.toContain(marker);
    }
  });

  it('run from another folder, converts a log recorded in mi/h through the mathjs chunk exactly as one in m/s', () => {
    const folder = mkdtempSync(join(tmpdir(), 'speedband-bundle-units-'));
    const [header, ...rows] = readFileSync(VAN_LOG, 'utf8').trim().split('\n');
    const columns = header.split(',');
    const speed = columns.indexOf('speed_mps');
    const converted = rows.map((row) =>
      row
        .split(',')
        .map((cell, k) => (k === speed ? String(Number(cell) / 0.44704) : cell))
        .join(','),
    );
    writeFileSync(join(folder, 'van-mph.csv'), [columns.map((name, k) => (k === speed ? 'v_mph' : name)).join(','), ...converted].join('\n'));
    writeFileSync(join(folder, 'van.csv'), readFileSync(VAN_LOG));
    const vehicle = fileURLToPath(new URL('../../vehicles/parcel-van', import.meta.url));
    const mph = runBinary(['inspect', 'van-mph.csv', '--vehicle', vehicle, '--column', 'speed_mps=v_mph:mi/h', '--json'], folder);
    const si = runBinary(['inspect', 'van.csv', '--vehicle', vehicle, '--json'], folder);
    expect(mph.status, mph.stderr).toBe(0);
    expect(si.status, si.stderr).toBe(0);
    type Channel = { channel: string; recordedUnit: string; min: number; max: number };
    const speedOf = (text: string): Channel | undefined => (JSON.parse(text) as { channels: Channel[] }[])[0].channels.find((c) => c.channel === 'speed_mps');
    const fromMph = speedOf(mph.stdout);
    expect(fromMph?.recordedUnit).toBe('mi/h');
    // 1 mi/h = 0.44704 m/s exactly (international mile 1609.344 m): the round trip returns the m/s log's values.
    expect(fromMph?.min).toBeCloseTo(speedOf(si.stdout)?.min ?? NaN, 9);
    expect(fromMph?.max).toBeCloseTo(speedOf(si.stdout)?.max ?? NaN, 9);
  });

  it('loads the mathjs chunk only when needed: not for --help nor a log in built-in units, once for a mi/h column', () => {
    // A module-loading hook (node:module register) that records every module URL naming mathjs in a file. The hooks
    // run on their own thread: a write to stderr from there can be lost when the process exits; appendFileSync cannot.
    const folder = mkdtempSync(join(tmpdir(), 'speedband-bundle-lazy-'));
    const record = join(folder, 'loaded.txt');
    writeFileSync(
      join(folder, 'hooks.mjs'),
      `import { appendFileSync } from 'node:fs';\nexport async function load(url, context, next) { if (url.includes('mathjs')) appendFileSync(${JSON.stringify(record)}, \`LOADED \${url}\\n\`); return next(url, context); }\n`,
    );
    writeFileSync(
      join(folder, 'register.mjs'),
      `import { register } from 'node:module';\nregister(${JSON.stringify(new URL(`file://${join(folder, 'hooks.mjs')}`).href)});\n`,
    );
    const hook = ['--import', join(folder, 'register.mjs')];
    /** What the last run loaded (the record is emptied for the next). */
    const loaded = (): string[] => {
      const lines = existsSync(record)
        ? readFileSync(record, 'utf8')
            .split('\n')
            .filter((line) => line.startsWith('LOADED '))
        : [];
      writeFileSync(record, '');
      return lines;
    };
    const help = runBinary(['--help'], folder, hook);
    expect(help.status).toBe(0);
    expect(loaded()).toEqual([]);
    const plain = runBinary(['inspect', VAN_LOG, '--column', 'speed_mps=speed_mps:km/h'], folder, hook);
    expect(plain.status, plain.stderr).toBe(0);
    expect(loaded()).toEqual([]);
    const mph = runBinary(['inspect', VAN_LOG, '--column', 'speed_mps=speed_mps:mi/h'], folder, hook);
    expect(mph.status, mph.stderr).toBe(0);
    expect(loaded()).toEqual([expect.stringMatching(/\/dist\/cli\/mathjs\.bundle\.js$/)]);
  });
});
