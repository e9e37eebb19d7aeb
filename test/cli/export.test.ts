import { execFileSync } from 'node:child_process';
import { chmodSync, closeSync, existsSync, mkdirSync, mkdtempSync, openSync, readFileSync, statSync, symlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { COMMANDS } from '../../src/cli/commands/index.js';
import { makeExportCommand } from '../../src/cli/commands/export.js';
import { fileDescriptorIo, recordingIo, type CommandIo } from '../../src/cli/io.js';
import { runCli } from '../../src/cli/main.js';
import { computeScheduleChecksum } from '../../src/schedule/checksum.js';
import { readSchedule, writeSchedule } from '../../src/schedule/schedule-file.js';
import { serialiseSchedule } from '../../src/schedule/schedule-json.js';
import type { ScheduleFile } from '../../src/schedule/schedule-types.js';
import { integratorLoopMargins } from '../schedule/integrator-loop.js';
import { sampleSchedule } from '../schedule/sample-schedule.js';
import { expectSameBytes } from '../helpers/same-bytes.js';

function scheduleFile(schedule: ScheduleFile = sampleSchedule()): { dir: string; path: string } {
  const dir = mkdtempSync(join(tmpdir(), 'speedband-export-cli-'));
  const path = join(dir, 'schedule.json');
  writeSchedule(path, schedule, { force: false });
  return { dir, path };
}

/** The CLI with `export` re-checking on the constructed integrator loop (the sample schedule's own synthetic model). */
const withLoop = COMMANDS.map((command) => (command.command.startsWith('export ') ? makeExportCommand({ analyseFor: () => integratorLoopMargins }) : command));
const exportCli = (args: readonly string[], io: CommandIo = recordingIo()): Promise<number> => runCli(['export', ...args], io, { commands: withLoop });

/** A schedule with its gains scaled and the checksum recomputed by speedband's own function: the file is consistent, its figures are not. */
function rescaled(factor: number): ScheduleFile {
  const schedule = JSON.parse(serialiseSchedule(sampleSchedule())) as { breakpoints: { kp: number; ki: number; kd: number }[] };
  for (const row of schedule.breakpoints) {
    row.kp *= factor;
    row.ki *= factor;
    row.kd *= factor;
  }
  const edited = schedule as unknown as ScheduleFile;
  return { ...edited, checksum: computeScheduleChecksum(edited) };
}

const compile = (dir: string, header: string, defines: readonly string[] = []): { ok: boolean; output: string } => {
  writeFileSync(
    join(dir, 'main.c'),
    `#include "${header}"\nint main(void)\n{\n  speedband_schedule_gains g;\n  return speedband_schedule_lookup(5.0, &g);\n}\n`,
  );
  try {
    execFileSync('gcc', ['-std=c99', '-Wall', '-Wextra', '-Werror', '-pedantic', ...defines, '-c', '-o', join(dir, 'main.o'), join(dir, 'main.c')], {
      cwd: dir,
      stdio: 'pipe',
    });
    return { ok: true, output: '' };
  } catch (error) {
    return { ok: false, output: String((error as { stderr?: Buffer }).stderr ?? '') };
  }
};

describe('speedband export', () => {
  it('--help teaches the formats, the Q format, the opt-in macro of a failing export, and gives examples', async () => {
    const io = recordingIo();
    expect(await runCli(['export', '--help'], io)).toBe(0);
    expect(io.out()).toMatch(/--q-format/);
    expect(io.out()).toMatch(/16\.16/);
    expect(io.out()).toMatch(/ALLOW_FAILING_SCHEDULE/);
    expect(io.out()).toMatch(/Examples:/);
  });

  it('re-checks the gains, writes a C header to --out and reports what it wrote', async () => {
    const { dir, path } = scheduleFile();
    const out = join(dir, 'steer_schedule.h');
    const io = recordingIo();
    expect(await exportCli([path, '--format', 'c', '--out', out], io)).toBe(0);
    expect(io.out()).toMatch(/Wrote .*steer_schedule\.h: C99 header, 6 breakpoints/);
    expect(io.out()).toMatch(/Dense check with the gains: passed at all \d+ speeds/);
    expect(io.out()).toMatch(/closed track/);
    expect(readFileSync(out, 'utf8')).toContain(readSchedule(path).checksum.value);
    // A second run with different content is refused without --force (exit 2: bad input).
    const again = recordingIo();
    expect(await exportCli([path, '--format', 'csv', '--out', out], again)).toBe(2);
    expect(again.err()).toMatch(/--force/);
  });

  it('json to standard output is the schedule file itself', async () => {
    const { path } = scheduleFile();
    const io = recordingIo();
    expect(await exportCli([path, '--format', 'json'], io)).toBe(0);
    expect(io.out()).toBe(readFileSync(path, 'utf8'));
  });

  it('--q-format prints the quantisation error per gain and --json gives it as data, with the re-check of the quantised gains', async () => {
    const { dir, path } = scheduleFile();
    const io = recordingIo();
    expect(await exportCli([path, '--format', 'c', '--q-format', '16.16', '--out', join(dir, 'q.h'), '--json'], io)).toBe(0);
    const summary = JSON.parse(io.out());
    for (const name of ['kp', 'ki', 'kd']) expect(summary.quantisation.formats[name]).toEqual({ fractionalBits: 16, wordBits: 32 });
    // Source: Q-format rounding, at most 2^−17 per value.
    expect(summary.quantisation.errors.kp.maxAbsolute).toBeLessThanOrEqual(2 ** -17);
    expect(summary.quantisation.recheckPassed).toBe(true);
  });

  it('a tampered schedule is refused with exit 2 and names the changed breakpoint', async () => {
    const { dir } = scheduleFile();
    const edited = JSON.parse(serialiseSchedule(sampleSchedule()));
    edited.breakpoints[3].kd = 0.5;
    const path = join(dir, 'edited.json');
    writeFileSync(path, JSON.stringify(edited));
    const io = recordingIo();
    expect(await exportCli([path, '--format', 'c'], io)).toBe(2);
    expect(io.err()).toMatch(/checksum does not match.*breakpoint 3/);
  });

  it('an edited status, margin, latency or vehicle name is refused (exit 2), naming the section', async () => {
    const base = JSON.parse(serialiseSchedule(sampleSchedule({ acceptance: { minimumPhaseMargin_deg: 75 } })));
    expect(base.status).toBe('failed');
    const edits: [string, (s: Record<string, any>) => void, RegExp][] = [
      ['status', (s) => ((s.status = 'passed'), (s.check.passed = true)), /\/status/],
      ['margin', (s) => (s.breakpoints[2].margins.phaseMargin_deg = 89), /breakpoint 2/],
      ['latency', (s) => (s.controller.computationLatency_s = 0), /\/controller\/computationLatency_s/],
      ['vehicle name', (s) => (s.vehicle.name = 'another van'), /\/vehicle\/name/],
      ['cautions', (s) => (s.cautions = ['No cautions.']), /\/cautions/],
    ];
    const dir = mkdtempSync(join(tmpdir(), 'speedband-export-cli-'));
    for (const [name, edit, named] of edits) {
      const copy = JSON.parse(JSON.stringify(base));
      edit(copy);
      const path = join(dir, `${name}.json`);
      writeFileSync(path, JSON.stringify(copy, null, 2));
      const io = recordingIo();
      expect(await exportCli([path, '--format', 'c'], io), name).toBe(2);
      expect(io.err(), name).toMatch(named);
      const check = recordingIo();
      expect(await runCli(['check', path, '--vehicle', 'vehicles/parcel-van'], check), name).toBe(2);
      expect(check.err(), name).toMatch(/checksum does not match/);
    }
  });

  it('gains ×3 with the checksum recomputed by speedband itself: the fresh dense check fails, nothing is written (exit 1)', async () => {
    const { dir, path } = scheduleFile(rescaled(3));
    expect(readSchedule(path).status).toBe('passed'); // the file claims it passed, and its checksum matches
    const out = join(dir, 'x3.h');
    const io = recordingIo();
    // Source: integrator loop closed form (Åström & Murray 2008): kθ = 3·π/6 = π/2 is the stability limit, PM = 0°.
    expect(await exportCli([path, '--format', 'c', '--out', out], io)).toBe(1);
    expect(io.err()).toMatch(/FAILED at \d+ of \d+ speeds/);
    expect(io.err()).toMatch(/does not hold what it states/);
    expect(existsSync(out)).toBe(false);
  });

  it('a failed schedule is not exported without --allow-failing (exit 1); with it, the header stops the build with #error unless the opt-in macro is defined', async () => {
    const { dir, path } = scheduleFile(sampleSchedule({ acceptance: { minimumPhaseMargin_deg: 75 } }));
    // Phase margin 75° demanded: the synthetic loop only reaches 60°, so the check fails.
    const io = recordingIo();
    expect(await exportCli([path, '--format', 'csv'], io)).toBe(1);
    expect(io.err()).toMatch(/dense check failed/);
    expect(await exportCli([path, '--format', 'csv', '--allow-failing'], recordingIo())).toBe(1);
    const header = join(dir, 'failing.h');
    expect(await exportCli([path, '--format', 'c', '--allow-failing', '--out', header], recordingIo())).toBe(1);
    const text = readFileSync(header, 'utf8');
    expect(text.startsWith('#ifndef SPEEDBAND_SCHEDULE_ALLOW_FAILING_SCHEDULE\n#error ')).toBe(true);
    const refused = compile(dir, 'failing.h');
    expect(refused.ok).toBe(false);
    expect(refused.output).toMatch(/FAILED its dense stability check/);
    expect(compile(dir, 'failing.h', ['-DSPEEDBAND_SCHEDULE_ALLOW_FAILING_SCHEDULE']).ok).toBe(true);
  });

  it('a schedule recording no model speedband can rebuild is not exported (exit 2): its gains cannot be re-checked', async () => {
    const { path } = scheduleFile();
    const io = recordingIo();
    expect(await runCli(['export', path, '--format', 'c'], io)).toBe(2);
    expect(io.err()).toMatch(/cannot be re-checked/);
  });

  it('a coarse Q format that breaks the margins is not written (exit 1)', async () => {
    const { dir, path } = scheduleFile();
    // Q4.12 keeps these gains within 2^−13 and passes; Q16.0 (whole numbers) rounds kp = 0.58 at 3 m/s up to 1,
    // so kθ grows by 1.72 there and the phase margin falls to about 90° − 30°·1.72 = 38° < 45° (closed form, integrator-loop.ts).
    const io = recordingIo();
    expect(await exportCli([path, '--format', 'c', '--q-format', '4.12', '--out', join(dir, 'fine.h')], io)).toBe(0);
    expect(io.out()).toMatch(/quantised gains: passed/);
    const coarse = recordingIo();
    expect(await exportCli([path, '--format', 'c', '--q-format', '16.0', '--out', join(dir, 'coarse.h')], coarse)).toBe(1);
    expect(coarse.err()).toMatch(/nothing written/);
    expect(existsSync(join(dir, 'coarse.h'))).toBe(false);
  });

  it('--q-format with csv is a usage error; a bad Q format names the expected form', async () => {
    const { path } = scheduleFile();
    expect(await exportCli([path, '--format', 'csv', '--q-format', '16.16'], recordingIo())).toBe(2);
    const bad = recordingIo();
    expect(await exportCli([path, '--format', 'c', '--q-format', '16.8'], bad)).toBe(2);
    expect(bad.err()).toMatch(/I \+ F = 16 or 32/);
  });
});

describe('speedband export: output paths', () => {
  it('--out equal to the schedule it reads is refused with exit 2, even with --force, under any name; the schedule is untouched', async () => {
    const { dir, path } = scheduleFile();
    const before = readFileSync(path);
    for (const out of [path, join(dir, '.', 'schedule.json'), join(dir, 'sub', '..', 'schedule.json')]) {
      mkdirSync(join(dir, 'sub'), { recursive: true });
      const io = recordingIo();
      expect(await exportCli([path, '--format', 'json', '--out', out, '--force'], io)).toBe(2);
      expect(io.err()).toMatch(/never replaces an input/);
    }
    expectSameBytes(readFileSync(path), before);
  });

  it('an --out that is a folder, under a file, a symbolic link, or in a folder that refuses new files is exit 2 with a message, not a stack trace', async () => {
    const { dir, path } = scheduleFile();
    const link = join(dir, 'link.h');
    symlinkSync(join(dir, 'target.h'), link);
    const cases: [string, RegExp][] = [
      [dir, /is a folder/],
      [join(path, 'x.h'), /is a file, not a folder/],
      [link, /symbolic link/],
      ['/sys/speedband-test.h', /not writable/],
    ];
    for (const [out, message] of cases) {
      const io = recordingIo();
      expect(await exportCli([path, '--format', 'c', '--out', out, '--force'], io), out).toBe(2);
      expect(io.err(), out).toMatch(message);
      expect(io.err(), out).not.toMatch(/internal error|\n\s+at /);
    }
    expect(existsSync(join(dir, 'target.h'))).toBe(false);
  });

  it('standard output on a full device (ENOSPC) ends with exit 2 and a message, not exit 0 with a truncated header', async () => {
    const { path } = scheduleFile();
    const full = openSync('/dev/full', 'w');
    const errors = join(mkdtempSync(join(tmpdir(), 'speedband-stderr-')), 'stderr.txt');
    const stderr = openSync(errors, 'w');
    try {
      expect(await exportCli([path, '--format', 'c'], fileDescriptorIo(full, stderr))).toBe(2);
    } finally {
      closeSync(full);
      closeSync(stderr);
    }
    expect(readFileSync(errors, 'utf8')).toMatch(/cannot write to standard output: no space left on the device \(ENOSPC\)/);
  });

  it('a replaced file keeps its permission bits', async () => {
    const { dir, path } = scheduleFile();
    const out = join(dir, 'gains.csv');
    writeFileSync(out, 'old content\n');
    chmodSync(out, 0o640);
    expect(await exportCli([path, '--format', 'csv', '--out', out, '--force'], recordingIo())).toBe(0);
    expect(statSync(out).mode & 0o777).toBe(0o640);
    expect(readFileSync(out, 'utf8')).toMatch(/^speed_mps,/);
  });
});
