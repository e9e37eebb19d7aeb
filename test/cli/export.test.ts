import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { makeExportCommand } from '../../src/cli/commands/export.js';
import { recordingIo } from '../../src/cli/io.js';
import { runCli } from '../../src/cli/main.js';
import { makeQuantisedRecheck } from '../../src/export/recheck.js';
import { readSchedule, writeSchedule } from '../../src/schedule/schedule-file.js';
import { serialiseSchedule } from '../../src/schedule/schedule-json.js';
import { integratorLoopMargins } from '../schedule/integrator-loop.js';
import { sampleSchedule } from '../schedule/sample-schedule.js';

function scheduleFile(): { dir: string; path: string } {
  const dir = mkdtempSync(join(tmpdir(), 'speedband-export-cli-'));
  const path = join(dir, 'schedule.json');
  writeSchedule(path, sampleSchedule(), false);
  return { dir, path };
}

describe('speedband export', () => {
  it('--help teaches the formats, the Q format and gives examples', async () => {
    const io = recordingIo();
    expect(await runCli(['export', '--help'], io)).toBe(0);
    expect(io.out()).toMatch(/--q-format/);
    expect(io.out()).toMatch(/16\.16/);
    expect(io.out()).toMatch(/Examples:/);
  });

  it('writes a C header to --out and reports what it wrote', async () => {
    const { dir, path } = scheduleFile();
    const out = join(dir, 'steer_schedule.h');
    const io = recordingIo();
    expect(await runCli(['export', path, '--format', 'c', '--out', out], io)).toBe(0);
    expect(io.out()).toMatch(/Wrote .*steer_schedule\.h: C99 header, 6 breakpoints/);
    expect(io.out()).toMatch(/closed track/);
    expect(readFileSync(out, 'utf8')).toContain(readSchedule(path).checksum.value);
    // A second run with different content is refused without --force (exit 2: bad input).
    const again = recordingIo();
    expect(await runCli(['export', path, '--format', 'csv', '--out', out], again)).toBe(2);
    expect(again.err()).toMatch(/--force/);
  });

  it('json to standard output is the schedule file itself', async () => {
    const { path } = scheduleFile();
    const io = recordingIo();
    expect(await runCli(['export', path, '--format', 'json'], io)).toBe(0);
    expect(io.out()).toBe(readFileSync(path, 'utf8'));
  });

  it('--q-format prints the quantisation error per gain and --json gives it as data', async () => {
    const { dir, path } = scheduleFile();
    const io = recordingIo();
    expect(await runCli(['export', path, '--format', 'c', '--q-format', '16.16', '--out', join(dir, 'q.h'), '--json'], io)).toBe(0);
    const summary = JSON.parse(io.out());
    expect(summary.quantisation.format).toEqual({ fractionalBits: 16, wordBits: 32 });
    // Source: Q-format rounding, at most 2^−17 per value.
    expect(summary.quantisation.errors.kp.maxAbsolute).toBeLessThanOrEqual(2 ** -17);
    expect(summary.quantisation.recheckPassed).toBeNull();
  });

  it('a tampered schedule is refused with exit 2 and names the changed breakpoint', async () => {
    const { dir } = scheduleFile();
    const edited = JSON.parse(serialiseSchedule(sampleSchedule()));
    edited.breakpoints[3].kd = 0.5;
    const path = join(dir, 'edited.json');
    writeFileSync(path, JSON.stringify(edited));
    const io = recordingIo();
    expect(await runCli(['export', path, '--format', 'c'], io)).toBe(2);
    expect(io.err()).toMatch(/checksum does not match.*breakpoint 3/);
  });

  it('--q-format with csv is a usage error; a bad Q format names the expected form', async () => {
    const { path } = scheduleFile();
    const io = recordingIo();
    expect(await runCli(['export', path, '--format', 'csv', '--q-format', '16.16'], io)).toBe(2);
    const bad = recordingIo();
    expect(await runCli(['export', path, '--format', 'c', '--q-format', '16.8'], bad)).toBe(2);
    expect(bad.err()).toMatch(/I \+ F = 16 or 32/);
  });

  it('a failed schedule is not exported without --allow-failing (exit 1)', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'speedband-export-cli-'));
    const path = join(dir, 'failing.json');
    // Phase margin 75° demanded: the synthetic loop only reaches 60°, so the check fails.
    writeSchedule(path, sampleSchedule({ acceptance: { minimumPhaseMargin_deg: 75 } }), false);
    const io = recordingIo();
    expect(await runCli(['export', path, '--format', 'csv'], io)).toBe(1);
    expect(io.err()).toMatch(/dense check failed/);
    expect(await runCli(['export', path, '--format', 'csv', '--allow-failing'], recordingIo())).toBe(0);
  });

  it('with a re-check hook, a coarse Q format that breaks the margins is not written (exit 1)', async () => {
    const { dir, path } = scheduleFile();
    const command = makeExportCommand({ recheck: makeQuantisedRecheck(() => integratorLoopMargins) });
    const io = recordingIo();
    const out = join(dir, 'coarse.h');
    // Q4.12 keeps these gains within 2^−13 and passes; Q16.0 (whole numbers) rounds kp = 0.58 at 3 m/s up to 1,
    // so kθ grows by 1.72 there and the phase margin falls to about 90° − 30°·1.72 = 38° < 45° (closed form, integrator-loop.ts).
    const fine = await command.run({ schedule: path, format: 'c', 'q-format': '4.12', out, prefix: 'speedband_schedule', force: false, json: false }, io);
    expect(fine).toBe(0);
    expect(io.out()).toMatch(/quantised gains: passed/);
    const coarseIo = recordingIo();
    const coarse = await command.run(
      { schedule: path, format: 'c', 'q-format': '16.0', out: join(dir, 'coarse2.h'), prefix: 'speedband_schedule', force: false, json: false },
      coarseIo,
    );
    expect(coarse).toBe(1);
    expect(coarseIo.err()).toMatch(/nothing written/);
  });
});
