import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { recordingIo } from '../../src/cli/io.js';
import { runCli } from '../../src/cli/main.js';
import { serialiseSchedule } from '../../src/schedule/schedule-json.js';
import { writeSchedule } from '../../src/schedule/schedule-file.js';
import { fixtureGains, fixtureSchedule } from '../compare/fixture-schedules.js';

const folder = mkdtempSync(join(tmpdir(), 'speedband-compare-'));
const oldPath = join(folder, 'old.json');
const raisedPath = join(folder, 'raised.json');
writeSchedule(oldPath, fixtureSchedule(), { force: false });
// One gain raised 20 % at 7 m/s; the file is assembled and checksummed by the schedule module.
writeSchedule(raisedPath, fixtureSchedule({ gainsAt: (speed) => ({ ...fixtureGains(speed), kp: fixtureGains(speed).kp * (speed === 7 ? 1.2 : 1) }) }), {
  force: false,
});

async function compare(...args: string[]) {
  const io = recordingIo();
  const code = await runCli(['compare', ...args], io);
  return { code, out: io.out(), err: io.err() };
}

describe('speedband compare OLD NEW', () => {
  it('a schedule compared with itself: nothing flagged, exit 0', async () => {
    const result = await compare(oldPath, oldPath);
    expect(result.code).toBe(0);
    expect(result.out).toMatch(/Nothing flagged: 6 speeds compared \(2–16 m\/s\)\.\n$/);
    expect(result.out).toMatch(/speed m\/s {2}breakpoint of {2}kp old → new/);
    expect(result.out).toMatch(/A comparison is not a verification.*Safety: These gains are engineering input/);
  });

  it('one gain raised 20 %: flagged at that breakpoint only, exit 1, table row marked', async () => {
    const result = await compare(oldPath, raisedPath);
    expect(result.code).toBe(1);
    expect(result.out).toMatch(/- kp at 7 m\/s: .* \(\+20\.0 %, limit ±15 %\)/);
    expect(result.out).toMatch(/1 flag: gains at 1 of 6 speeds/);
    const flaggedRows = result.out.split('\n').filter((line) => /^\s+\d[\d.]*\s+both\s/.test(line) && /\s(kp|ki|kd)$/.test(line));
    expect(flaggedRows).toHaveLength(1);
    expect(flaggedRows[0]).toMatch(/^\s+7\s/);
  });

  it('--json gives the comparison for machines; --gain-change-pct 25 passes the same change with exit 0', async () => {
    const result = await compare(oldPath, raisedPath, '--json');
    expect(result.code).toBe(1);
    const parsed = JSON.parse(result.out) as { files: { old: string }; flags: { kind: string; speed_mps: number; quantity: string }[]; speeds: unknown[] };
    expect(parsed.files.old).toBe(oldPath);
    expect(parsed.flags.map((flag) => [flag.kind, flag.speed_mps, flag.quantity])).toEqual([['gainChange', 7, 'kp']]);
    expect(parsed.speeds).toHaveLength(6);
    expect((await compare(oldPath, raisedPath, '--gain-change-pct', '25')).code).toBe(0);
  });

  it('--markdown writes a review: a Markdown table and a flag list', async () => {
    const result = await compare(oldPath, raisedPath, '--markdown');
    expect(result.code).toBe(1);
    expect(result.out).toMatch(/^## Gain schedule change: /);
    expect(result.out).toMatch(/\n\| speed m\/s \| breakpoint of \| kp old → new \|/);
    expect(result.out).toMatch(/\n\|---\|---\|/);
    expect(result.out).toMatch(/### Flags\n\n- \[ \] kp at 7 m\/s/);
  });

  it('an invalid, tampered or missing file exits 2 naming the file', async () => {
    const invalid = join(folder, 'invalid.json');
    writeFileSync(invalid, '{"format": "something else"}');
    const bad = await compare(oldPath, invalid);
    expect(bad.code).toBe(2);
    expect(bad.err).toContain(invalid);
    const tampered = join(folder, 'tampered.json');
    writeFileSync(
      tampered,
      serialiseSchedule(fixtureSchedule()).replace(/"kp": ([0-9.]+)/, (_, kp: string) => `"kp": ${Number(kp) * 1.2}`),
    );
    const changed = await compare(tampered, oldPath);
    expect(changed.code).toBe(2);
    expect(changed.err).toMatch(new RegExp(`${tampered.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}.*checksum does not match`));
    const missing = await compare(oldPath, join(folder, 'nowhere.json'));
    expect(missing.code).toBe(2);
    expect(missing.err).toContain('nowhere.json');
  });

  it('a negative threshold or both --json and --markdown is bad usage, exit 2', async () => {
    expect((await compare(oldPath, oldPath, '--phase-margin-drop-deg', '-5')).code).toBe(2);
    expect((await compare(oldPath, oldPath, '--json', '--markdown')).code).toBe(2);
  });

  it('--help teaches the thresholds with units and defaults, and the exit codes for CI', async () => {
    const result = await compare('--help');
    expect(result.code).toBe(0);
    expect(result.out).toMatch(/--gain-change-pct[\s\S]*default 15/);
    expect(result.out).toMatch(/--gain-margin-drop-dB[\s\S]*dB \(default 3\)/);
    expect(result.out).toMatch(/--phase-margin-drop-deg[\s\S]*degrees \(default 10\)/);
    expect(result.out).toMatch(/Exit codes:\n {2}0 {2}nothing flagged\n {2}1 {2}something moved past a threshold/);
  });
});

describe('speedband compare on schedules written by speedband build (demo van before and after its change)', () => {
  // A small plan keeps the tests quick: 3 breakpoints, 20 check speeds (the build's defaults are larger).
  const plan = join(folder, 'plan.json');
  writeFileSync(plan, JSON.stringify({ breakpoints: { count: 3 }, check: { gridSpeeds: 20, maxInsertedBreakpoints: 0 } }));
  const builds = new Map<string, Promise<string>>();
  const built = (vehicle: string): Promise<string> => {
    const build = async () => {
      const out = join(folder, `${vehicle}.json`);
      const logs = ['08.00', '25.00'].map((speed) => join('vehicles', vehicle, 'logs', `synthetic-steps-${speed}mps.csv`));
      const io = recordingIo();
      const code = await runCli(['build', '--vehicle', join('vehicles', vehicle), '--logs', ...logs, '--plan', plan, '--out', out, '--allow-failing'], io);
      expect(code, io.err()).toBe(0);
      return out;
    };
    if (!builds.has(vehicle)) builds.set(vehicle, build());
    return builds.get(vehicle)!;
  };

  it('reports model drift from the joint single-track fits the build records, in the direction of the vehicle files', async () => {
    const before = await built('parcel-van');
    const after = await built('parcel-van-loaded');
    const result = await compare(before, after, '--json');
    const parsed = JSON.parse(result.out) as {
      flags: unknown[];
      gainsComparable: boolean;
      modelDrift: { available: boolean; parameters?: { name: string; change: number }[] };
    };
    expect(result.code).toBe(parsed.flags.length > 0 ? 1 : 0);
    expect(parsed.gainsComparable).toBe(true);
    expect(parsed.modelDrift.available).toBe(true);
    const change = (name: string) => parsed.modelDrift.parameters!.find((parameter) => parameter.name === name)!.change;
    // Source: the vehicle files (rear stiffness 180 → 160 kN/rad) and K = (m/L)(b/Cf − a/Cr) (Gillespie 1992): both fall.
    expect(change('rearCorneringStiffness_NPerRad')).toBeLessThan(0);
    expect(change('understeerGradient_radPerMps2')).toBeLessThan(0);
  }, 30_000);

  it('leads with the key fact — the old gains on the new vehicle model — and finds what build --baseline finds, speed for speed', async () => {
    const before = await built('parcel-van');
    const after = join(folder, 'parcel-van-loaded-baseline.json');
    const logs = ['08.00', '25.00'].map((speed) => join('vehicles', 'parcel-van-loaded', 'logs', `synthetic-steps-${speed}mps.csv`));
    const io = recordingIo();
    const code = await runCli(
      [
        'build',
        '--vehicle',
        join('vehicles', 'parcel-van-loaded'),
        '--logs',
        ...logs,
        '--plan',
        plan,
        '--baseline',
        before,
        '--out',
        after,
        '--allow-failing',
        '--json',
      ],
      io,
    );
    expect([0, 1]).toContain(code);
    const build = JSON.parse(io.out()) as {
      baseline: { passedOnNewModel: boolean; failedSpeeds: number; gridSize: number; failures: { speed_mps: number }[] };
    };
    const result = await compare(before, after, '--json');
    const parsed = JSON.parse(result.out) as {
      oldGainsOnNewVehicle: {
        available: boolean;
        passed: boolean;
        failedSpeeds: number;
        gridSize: number;
        failingIntervals: { from_mps: number; to_mps: number; speeds: number }[];
      };
      flags: { kind: string }[];
    };
    const record = parsed.oldGainsOnNewVehicle;
    expect(record.available).toBe(true);
    expect(record.passed).toBe(false); // this change breaks the old gains at the top speed (the full demo build: PM 37° at 25 m/s)
    // The same check as build --baseline: the old gains on the new model at the new schedule's check speeds.
    expect([record.passed, record.failedSpeeds, record.gridSize]).toEqual([
      build.baseline.passedOnNewModel,
      build.baseline.failedSpeeds,
      build.baseline.gridSize,
    ]);
    expect(record.failingIntervals.reduce((sum, interval) => sum + interval.speeds, 0)).toBe(build.baseline.failedSpeeds);
    const failing = build.baseline.failures.map((failure) => failure.speed_mps);
    for (const interval of record.failingIntervals) expect(failing).toContain(interval.from_mps);
    expect(parsed.flags.some((flag) => flag.kind === 'oldGainsFailOnNewVehicle')).toBe(!record.passed);
    const markdown = (await compare(before, after, '--markdown')).out.split('\n');
    // The first statement after the title is this verdict; where it fails, the speeds are named.
    expect(markdown[2]).toMatch(
      record.passed
        ? /^\*\*The old gains still hold on the new vehicle model/
        : /^\*\*The old gains do NOT hold on the new vehicle model: .* at \d+ of \d+ speeds checked .* — at [\d.]+(–[\d.]+)? m\/s \(/,
    );
    const text = (await compare(before, after)).out.split('\n');
    expect(text[1]).toMatch(/^The old gains (still hold|do NOT hold) on the new vehicle model/);
  }, 30_000);
});
