import { existsSync, mkdtempSync, readFileSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
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
  const written = writeTestLogs({ vehicle: loadVehicle(VEHICLE), speeds_mps: [0.8, 1.6], outDir: join(folder, 'logs'), generation: { seed: 2 }, force: false });
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
    expect(
      await runCli(['identify', '--vehicle', VEHICLE, '--logs', join(folder, 'logs'), '--out', out, '--joint-fit', 'false', '--second-order', 'false'], io),
    ).toBe(0);
    const inputs = readModels(out).inputs;
    expect(inputs.map((i) => i.file).sort()).toEqual([...logs].sort());
    // Canonical order: by content hash, whatever the order the folder lists them in.
    expect(inputs.map((i) => i.sha256)).toEqual(inputs.map((i) => i.sha256).sort());
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

  it('reads logs recorded in other units through --column (km/h and deg/s here): the same models as from SI logs', async () => {
    const converted = logs.map((path, k) => {
      const [header, ...rows] = readFileSync(path, 'utf8').trim().split('\n');
      const names = header.split(',');
      const speed = names.indexOf('speed_mps');
      const yaw = names.indexOf('yaw_rate_radps');
      const scaled = rows.map((row) =>
        row
          .split(',')
          .map((cell, c) => (c === speed ? String(Number(cell) * 3.6) : c === yaw ? String((Number(cell) * 180) / Math.PI) : cell))
          .join(','),
      );
      const target = join(folder, `converted-${k}.csv`);
      writeFileSync(target, [names.map((name, c) => (c === speed ? 'v_kph' : c === yaw ? 'r_dps' : name)).join(','), ...scaled].join('\n'));
      return target;
    });
    const options = ['--vehicle', VEHICLE, '--joint-fit', 'false', '--second-order', 'false', '--json'];
    const si = recordingIo();
    expect(await runCli(['identify', ...options, '--logs', ...logs], si)).toBe(0);
    const other = recordingIo();
    expect(
      await runCli(['identify', ...options, '--logs', ...converted, '--column', 'speed_mps=v_kph:km/h', '--column', 'yaw_rate_radps=r_dps:deg/s'], other),
      other.err(),
    ).toBe(0);
    const speeds = (text: string) => (JSON.parse(text) as { speeds: { speed_mps: number; fopdt: { gain: number } }[] }).speeds;
    // 1 km/h = 1/3.6 m/s, 1° = π/180 rad (SI Brochure 9th ed., Tables 7 and 8): the round trip gives the same fits.
    expect(speeds(other.out())).toHaveLength(2);
    speeds(other.out()).forEach((speed, k) => {
      expect(speed.speed_mps).toBeCloseTo(speeds(si.out())[k].speed_mps, 9);
      expect(speed.fopdt.gain).toBeCloseTo(speeds(si.out())[k].fopdt.gain, 6);
    });
  }, 60_000);

  it('--out that is the --log-profile or a log is refused (exit 2) before the column options are read, even with --force', async () => {
    const profile = join(folder, 'profile.json');
    const profileText = '{"columns": {"speed_mps": {"unit": "m/s"}}}';
    writeFileSync(profile, profileText);
    const onProfile = recordingIo();
    expect(await runCli(['identify', '--vehicle', VEHICLE, '--logs', ...logs, '--log-profile', profile, '--out', profile, '--force'], onProfile)).toBe(2);
    expect(onProfile.err()).toMatch(/--out .*profile\.json is the log profile .* this command reads/);
    expect(readFileSync(profile, 'utf8')).toBe(profileText);
    // A unit of the wrong quantity would be refused too, but the output path is checked first, before any work.
    const logText = readFileSync(logs[0], 'utf8');
    const onLog = recordingIo();
    expect(await runCli(['identify', '--vehicle', VEHICLE, '--logs', ...logs, '--column', 'speed_mps=speed_mps:deg', '--out', logs[0], '--force'], onLog)).toBe(
      2,
    );
    expect(onLog.err()).toMatch(/is the log .* this command reads/);
    expect(onLog.err()).not.toMatch(/needs a speed/);
    expect(readFileSync(logs[0], 'utf8')).toBe(logText);
  });

  it('--help describes options with units and defaults and gives examples', async () => {
    const io = recordingIo();
    expect(await runCli(['identify', '--help'], io)).toBe(0);
    expect(io.out()).toMatch(/--column/);
    expect(io.out()).toMatch(/speed-tolerance-mps/);
    expect(io.out()).toMatch(/Examples/);
  });
});

describe('speedband identify: --json without --out, the two-point note, step order in models.json', () => {
  it('--json alone prints the summary and writes nothing; neither --json nor --out is a usage error naming both', async () => {
    const before = readdirSync(folder).sort();
    const io = recordingIo();
    expect(await runCli(['identify', '--vehicle', VEHICLE, '--logs', ...logs, '--joint-fit', 'false', '--second-order', 'false', '--json'], io)).toBe(0);
    const summary = JSON.parse(io.out()) as {
      file: string | null;
      outcome: string | null;
      speeds: unknown[];
      twoPointCheck: { steps: number; disagreeing: number };
    };
    expect(summary.file).toBeNull();
    expect(summary.outcome).toBeNull();
    expect(summary.speeds).toHaveLength(2);
    expect(summary.twoPointCheck.steps).toBe(16);
    expect(readdirSync(folder).sort()).toEqual(before);

    const neither = recordingIo();
    expect(await runCli(['identify', '--vehicle', VEHICLE, '--logs', ...logs], neither)).toBe(2);
    expect(neither.err()).toMatch(/give --out models\.json to write the models file, and\/or --json to print a summary/);
  }, 60_000);

  it('records per step whether the two-point estimate agrees with the fit and counts the disagreements in a note', async () => {
    const out = join(folder, 'two-point.json');
    const io = recordingIo();
    expect(await runCli(['identify', '--vehicle', VEHICLE, '--logs', ...logs, '--out', out, '--joint-fit', 'false', '--second-order', 'false'], io)).toBe(0);
    const models = readModels(out);
    const flags = models.tests.map((test) => test.fopdt.twoPoint?.agreesWithFit);
    expect(flags.every((flag) => typeof flag === 'boolean')).toBe(true);
    const disagreeing = flags.filter((flag) => flag === false).length;
    // The robot's response (τ + θ ≈ 0.06 s) is shorter than its 0.15 s command ramps: Smith's reading, which takes the step as
    // instantaneous at mid-ramp, stretches τ (test/identify/two-point-agreement.test.ts), so the note must appear.
    expect(disagreeing).toBeGreaterThan(0);
    expect(io.out()).toMatch(
      new RegExp(
        `Note: Smith's two-point estimate \\(28\\.3 %/63\\.2 % crossings\\) disagrees with the FOPDT fit on ${disagreeing} of ${models.tests.length} steps`,
      ),
    );
    expect(io.out()).toMatch(/a ramp that is not short against the response/);
  }, 60_000);

  it("lists each speed's steps by file, then step index (two files at one speed)", async () => {
    const vehicle = loadVehicle(VEHICLE);
    const first = writeTestLogs({ vehicle, speeds_mps: [0.8, 1.6], outDir: join(folder, 'repeat-a'), generation: { seed: 7 }, force: false });
    const second = writeTestLogs({ vehicle, speeds_mps: [0.8], outDir: join(folder, 'repeat-b'), generation: { seed: 8 }, force: false });
    const csv = [...first.files, ...second.files].map((f) => f.path).filter((p) => p.endsWith('.csv'));
    const out = join(folder, 'order.json');
    expect(
      await runCli(['identify', '--vehicle', VEHICLE, '--logs', ...csv, '--out', out, '--joint-fit', 'false', '--second-order', 'false'], recordingIo()),
    ).toBe(0);
    const speeds = readModels(out).speeds;
    expect(speeds[0].steps.length).toBeGreaterThan(8);
    for (const speed of speeds) {
      const keys = speed.steps.map((step) => [step.file, step.stepIndex] as const);
      const sorted = [...keys].sort((p, q) => (p[0] < q[0] ? -1 : p[0] > q[0] ? 1 : p[1] - q[1]));
      expect(keys).toEqual(sorted);
    }
  }, 60_000);
});
