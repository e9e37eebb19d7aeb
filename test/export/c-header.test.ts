import { execFileSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { findFallbackGains } from '../../src/pipeline/export-check.js';
import type { PidGains } from '../../src/controller/types.js';
import { commentSafe } from '../../src/export/c-comment.js';
import { computeScheduleChecksum } from '../../src/schedule/checksum.js';
import { exportC } from '../../src/export/c-header.js';
import { parseFixedPointRequest, parseQFormat } from '../../src/export/fixed-point.js';
import { integerLookup, speedToInteger } from '../../src/export/integer-lookup.js';
import { gainSlopes } from '../../src/schedule/interpolate.js';
import { scheduleExtrasLookup, scheduleLookup, scheduleTable } from '../../src/schedule/schedule-lookup.js';
import type { ScheduleFile } from '../../src/schedule/schedule-types.js';
import { integratorLoopMargins } from '../schedule/integrator-loop.js';
import { sampleSchedule } from '../schedule/sample-schedule.js';

/** Agreement between the C lookup (double) and the TypeScript lookup, relative. */
const C_AGREEMENT = 1e-6;

/** 1,000 speeds from 0 to beyond the table (floor, clamp), plus every breakpoint exactly. */
function speedsFor(schedule: ScheduleFile): number[] {
  const last = schedule.breakpoints[schedule.breakpoints.length - 1].speed_mps;
  const speeds = Array.from({ length: 1000 - schedule.breakpoints.length }, (_, i) => (i * (last + 3)) / 990);
  return [...speeds, ...schedule.breakpoints.map((row) => row.speed_mps)];
}

const GCC_FLAGS = ['-std=c99', '-Wall', '-Wextra', '-Werror', '-pedantic'] as const;

/** Compile the header into a tiny program with the machine's gcc (C99, all warnings as errors) and evaluate the lookup: status and gains. */
function runCStatus(header: string, speeds: readonly string[]): { status: number; kp: number; ki: number; kd: number }[] {
  const dir = mkdtempSync(join(tmpdir(), 'speedband-c-'));
  writeFileSync(join(dir, 'schedule.h'), header);
  writeFileSync(
    join(dir, 'main.c'),
    `#include <stdio.h>
#include "schedule.h"
#include "schedule.h"
int main(void)
{
  double v;
  while (scanf("%lf", &v) == 1) {
    speedband_schedule_gains g;
    int status;
    g.kp = -1.0;
    g.ki = -1.0;
    g.kd = -1.0;
    status = speedband_schedule_lookup(v, &g);
    printf("%d %.17g %.17g %.17g\\n", status, g.kp, g.ki, g.kd);
  }
  return 0;
}
`,
  );
  execFileSync('gcc', [...GCC_FLAGS, '-o', join(dir, 'lookup'), join(dir, 'main.c')], { cwd: dir });
  const output = execFileSync(join(dir, 'lookup'), { input: speeds.join('\n'), encoding: 'utf8' });
  return output
    .trim()
    .split('\n')
    .map((line) => {
      const [status, kp, ki, kd] = line.split(' ').map(Number);
      return { status, kp, ki, kd };
    });
}

/** The set-point weights and feed-forward the C lookup gives, in struct order, at finite speeds. */
function runCExtras(header: string, speeds: readonly number[]): number[][] {
  const dir = mkdtempSync(join(tmpdir(), 'speedband-c-'));
  writeFileSync(join(dir, 'schedule.h'), header);
  writeFileSync(
    join(dir, 'main.c'),
    `#include <stdio.h>
#include "schedule.h"
int main(void)
{
  double v;
  while (scanf("%lf", &v) == 1) {
    speedband_schedule_gains g;
    (void)speedband_schedule_lookup(v, &g);
    printf("%.17g %.17g %.17g %.17g\\n", g.setpoint_weight_p, g.setpoint_weight_d, g.feed_forward, g.feed_forward_lead_time_s);
  }
  return 0;
}
`,
  );
  execFileSync('gcc', [...GCC_FLAGS, '-o', join(dir, 'lookup'), join(dir, 'main.c')], { cwd: dir });
  return execFileSync(join(dir, 'lookup'), { input: speeds.map((v) => v.toPrecision(17)).join('\n'), encoding: 'utf8' })
    .trim()
    .split('\n')
    .map((line) => line.split(' ').map(Number));
}

/** Compile a fixed-point header with -mgeneral-regs-only (any floating point is then a compile error) and run its integer lookup. */
function runIntegerC(header: string, speeds: readonly bigint[]): { kp: bigint; ki: bigint; kd: bigint }[] {
  const dir = mkdtempSync(join(tmpdir(), 'speedband-c-integer-'));
  writeFileSync(join(dir, 'schedule.h'), header);
  writeFileSync(
    join(dir, 'main.c'),
    `#include <stdio.h>
#include "schedule.h"
int main(void)
{
  long v;
  while (scanf("%ld", &v) == 1) {
    speedband_schedule_gains g;
    if (speedband_schedule_lookup((int32_t)v, &g) != SPEEDBAND_SCHEDULE_LOOKUP_OK) return 1;
    printf("%ld %ld %ld\\n", (long)g.kp, (long)g.ki, (long)g.kd);
  }
  return 0;
}
`,
  );
  execFileSync('gcc', [...GCC_FLAGS, '-mgeneral-regs-only', '-o', join(dir, 'lookup'), join(dir, 'main.c')], { cwd: dir });
  const output = execFileSync(join(dir, 'lookup'), { input: speeds.map(String).join('\n'), encoding: 'utf8' });
  return output
    .trim()
    .split('\n')
    .map((line) => {
      const [kp, ki, kd] = line.split(' ').map((cell) => BigInt(cell));
      return { kp, ki, kd };
    });
}

/** The gains the C lookup gives at finite speeds (every status must be LOOKUP_OK = 0). */
function runC(header: string, speeds: readonly number[]): { kp: number; ki: number; kd: number }[] {
  return runCStatus(
    header,
    speeds.map((v) => v.toPrecision(17)),
  ).map(({ status, kp, ki, kd }) => {
    if (status !== 0) throw new Error(`status ${status} at a finite speed`);
    return { kp, ki, kd };
  });
}

const close = (a: number, b: number, relative: number): boolean => Math.abs(a - b) <= relative * Math.max(Math.abs(a), Math.abs(b), 1e-300);

describe('exportC(schedule)', () => {
  for (const interpolation of ['monotone-cubic', 'linear'] as const) {
    it(`${interpolation}: compiles with gcc -std=c99 -Wall -Wextra -Werror -pedantic and agrees with the TypeScript lookup at 1,000 speeds`, () => {
      const schedule = sampleSchedule({ interpolation });
      const { text } = exportC(schedule);
      const speeds = speedsFor(schedule);
      const fromC = runC(text, speeds);
      const lookup = scheduleLookup(schedule);
      expect(fromC.length).toBe(1000);
      speeds.forEach((speed, i) => {
        const expected = lookup(speed);
        for (const name of ['kp', 'ki', 'kd'] as const) {
          if (!close(fromC[i][name], expected[name], C_AGREEMENT))
            throw new Error(`${name} at ${speed} m/s: C ${fromC[i][name]}, TypeScript ${expected[name]}`);
        }
      });
      // Exact table values at breakpoints in C as well (docs/domain.md §7).
      schedule.breakpoints.forEach((row, k) => expect(fromC[1000 - schedule.breakpoints.length + k]).toEqual({ kp: row.kp, ki: row.ki, kd: row.kd }));
    });
  }

  it('returns the set-point weights, feed-forward gain and lead time interpolated exactly as scheduleExtrasLookup does (monotone cubic and linear)', () => {
    for (const interpolation of ['monotone-cubic', 'linear'] as const) {
      const schedule = sampleSchedule({ interpolation });
      const speeds = speedsFor(schedule);
      const fromC = runCExtras(exportC(schedule).text, speeds);
      const lookup = scheduleExtrasLookup(schedule);
      speeds.forEach((speed, i) => {
        const expected = lookup(speed);
        const ordered = [expected.setpointWeightProportional, expected.setpointWeightDerivative, expected.feedForward, expected.feedForwardLeadTime_s];
        ordered.forEach((value, j) => {
          if (!close(fromC[i][j], value, C_AGREEMENT) && Math.abs(fromC[i][j] - value) > 1e-15)
            throw new Error(`field ${j} at ${speed} m/s: C ${fromC[i][j]}, TypeScript ${value}`);
        });
      });
      // Exact table values at the breakpoints.
      schedule.breakpoints.forEach((row, k) =>
        expect(fromC[1000 - schedule.breakpoints.length + k]).toEqual([
          row.setpointWeightProportional,
          row.setpointWeightDerivative,
          row.feedForward,
          row.feedForwardLeadTime_s,
        ]),
      );
    }
  });

  for (const [request, interpolation] of [
    ['Q16.16', 'monotone-cubic'],
    ['auto', 'monotone-cubic'],
    ['8.8', 'linear'],
  ] as const) {
    it(`fixed point ${request}, ${interpolation}: integers only (compiles with -mgeneral-regs-only), bit for bit the TypeScript integer lookup, within the derived error bound of the exact lookup`, () => {
      const schedule = sampleSchedule({ interpolation });
      const exported = exportC(schedule, { fixedPoint: parseFixedPointRequest(request) });
      const quantisation = exported.quantisation!;
      // Source: definition of Q format — rounding to 2^−F leaves at most 2^−(F+1) per stored value.
      for (const name of ['kp', 'ki', 'kd'] as const) expect(quantisation.errors[name].maxAbsolute).toBeLessThanOrEqual(quantisation.resolutionBounds[name]);
      expect(exported.text).not.toMatch(/\bdouble\b|\bfloat\b/);
      const speeds = speedsFor(schedule);
      const integerSpeeds = speeds.map((speed) => speedToInteger(speed));
      const fromC = runIntegerC(exported.text, integerSpeeds);
      const exact = scheduleLookup(schedule);
      const slopes = gainSlopes(scheduleTable(schedule), interpolation);
      speeds.forEach((_speed, i) => {
        const expected = integerLookup(quantisation.integer, integerSpeeds[i]);
        expect(fromC[i]).toEqual({ kp: expected.kp, ki: expected.ki, kd: expected.kd });
      });
      // The bound, value units: stored values 2^−(F+1) each, carried through the convex weights (h00 + h01 = 1) and the
      // Hermite slope weights (|h10|, |h11| ≤ 4/27, slope terms stored to 2^−(F+1)), the final rounding 2^−(F+1); the
      // weights truncated to 2^−24 (t, t², t³: at most 7·2^−24 on each weight) times |Δy| + |h·m0| + |h·m1|; the speed
      // rounded to 2^−17 m/s on the grid and the argument: |dy/dv|·2^−16, |dy/dv| ≤ 3·max(|m|, |Δy/h|) for a monotone cubic
      // (Fritsch & Carlson 1980), |Δy/h| for linear.
      const table = scheduleTable(schedule);
      for (const name of ['kp', 'ki', 'kd'] as const) {
        const epsilon = quantisation.resolutionBounds[name];
        let largest = 0;
        let steepest = 0;
        for (let k = 0; k + 1 < table.speeds_mps.length; k += 1) {
          const h = table.speeds_mps[k + 1] - table.speeds_mps[k];
          const dy = Math.abs(table.gains[k + 1][name] - table.gains[k][name]);
          largest = Math.max(largest, dy + h * (Math.abs(slopes[name][k]) + Math.abs(slopes[name][k + 1])));
          steepest = Math.max(steepest, 3 * Math.max(Math.abs(slopes[name][k]), Math.abs(slopes[name][k + 1]), dy / h));
        }
        const bound = epsilon * (2 + 8 / 27) + 7 * 2 ** -24 * largest + steepest * 2 ** -16;
        speeds.forEach((speed, i) => {
          const value = Number(fromC[i][name]) / 2 ** quantisation.formats[name].fractionalBits;
          expect(Math.abs(value - exact(speed)[name])).toBeLessThanOrEqual(bound);
        });
        expect(quantisation.errors[name].maxAbsoluteInterpolated).toBeLessThanOrEqual(bound);
      }
      // Exact stored values at the breakpoints.
      schedule.breakpoints.forEach((_, k) =>
        expect(fromC[1000 - schedule.breakpoints.length + k]).toEqual({
          kp: quantisation.integer.gains.kp[k],
          ki: quantisation.integer.gains.ki[k],
          kd: quantisation.integer.gains.kd[k],
        }),
      );
    });
  }

  it("--q-format spellings: Q16.16, q16.16 and 16.16 are one format; auto picks each gain's format from its range", () => {
    expect(parseFixedPointRequest('Q16.16')).toEqual({ fractionalBits: 16, wordBits: 32 });
    expect(parseFixedPointRequest('q16.16')).toEqual(parseQFormat('16.16'));
    expect(parseFixedPointRequest('Q4.12')).toEqual({ fractionalBits: 12, wordBits: 16 });
    expect(parseFixedPointRequest('AUTO')).toBe('auto');
    const schedule = sampleSchedule();
    const { formats } = exportC(schedule, { fixedPoint: 'auto' }).quantisation!;
    const table = scheduleTable(schedule);
    const slopes = gainSlopes(table, 'monotone-cubic');
    for (const name of ['kp', 'ki', 'kd'] as const) {
      // Source: two's complement — an int32 holds −2^31 … 2^31 − 1: the most fractional bits F with max|value|·2^F < 2^31,
      // over the gains and the slope terms h·m the integer lookup stores in the same format.
      const terms = table.speeds_mps
        .slice(1)
        .flatMap((speed, k) => [(speed - table.speeds_mps[k]) * slopes[name][k], (speed - table.speeds_mps[k]) * slopes[name][k + 1]]);
      const largest = Math.max(...table.gains.map((row) => Math.abs(row[name])), ...terms.map(Math.abs));
      expect(formats[name].wordBits).toBe(32);
      if (largest > 0) expect(largest * 2 ** formats[name].fractionalBits).toBeLessThan(2 ** 31);
      // One more fractional bit would not fit (31 is the most an int32 has beside its sign).
      if (largest > 0 && formats[name].fractionalBits < 31) expect(largest * 2 ** (formats[name].fractionalBits + 1)).toBeGreaterThanOrEqual(2 ** 31 - 1);
    }
  });

  it('carries units, loop, controller equation, checksum and the safety cautions, in ASCII', () => {
    const schedule = sampleSchedule();
    const { text } = exportC(schedule);
    expect(/^[\x00-\x7f]*$/.test(text)).toBe(true);
    expect(text).toContain(schedule.checksum.value);
    expect(text).toMatch(/#ifndef SPEEDBAND_SCHEDULE_H/);
    expect(text).toMatch(/kp rad per m; ki rad per m\*s; kd rad per m\/s/);
    expect(text).toMatch(/Loop: path \(preview 4 m from the front axle\)/);
    expect(text).toMatch(/I\[k\] = clamp\(I\[k-1\] \+ dI\[k\], -integratorClamp_rad - F\[k\]/);
    expect(text).toMatch(/Feed-forward: F = kff\*w, w = the path curvature/);
    expect(text).toMatch(/v\[k\] = F\[k\] \+ kp\[k\]\*\(b\[k\]\*r\[k\] - y\[k\]\) \+ I\[k\] \+ D\[k\]/);
    expect(text).toMatch(/closed track/);
    expect(text).toMatch(/IEEE 754 double/);
    expect(text).not.toMatch(/malloc|free\(/);
  });

  it('a gain too large for the word is a typed overflow error', () => {
    expect(() => exportC(sampleSchedule(), { fixedPoint: parseQFormat('1.15') })).toThrow(expect.objectContaining({ code: 'export.fixedPointOverflow' }));
    expect(() => parseQFormat('16.8')).toThrow(expect.objectContaining({ code: 'export.qFormatInvalid' }));
  });
});

/** Text built to end a comment and inject code, each way C99 allows (ISO/IEC 9899:1999 §5.1.1.2 translation phases, §5.2.1.1 trigraphs). */
const HOSTILE: readonly string[] = [
  '*\\\n/ int injected_splice(void) { return 42; } /*', // backslash-newline splice: "*" then "/" after phase 2
  '*??/\n/ int injected_trigraph(void) { return 42; } /*', // ??/ is a backslash under -std=c99 (phase 1), then a splice
  '*/ int injected_plain(void) { return 42; } /*',
  'x */\n#define speedband_schedule_lookup(v, g) 42\n/*',
  'ends in a backslash \\',
  "trigraphs ??= ??( ??) ??< ??> ??! ??- ??' ??/",
  '/* nested opening',
  '\u2028*/ int injected_separator(void) { return 42; } /*',
  'control \u0000 \u001b[31m red \r\n carriage',
  'm·/s and ·/·/ from the ASCII table',
  'x'.repeat(5000),
];

/** A schedule whose every free-text field carries hostile text (the checksum recomputed, as an edited file would have). */
function hostileSchedule(): ScheduleFile {
  const base = JSON.parse(JSON.stringify(sampleSchedule())) as Record<string, any>;
  const pick = (k: number): string => HOSTILE[k % HOSTILE.length];
  base.vehicle.name = pick(0);
  base.cautions = [...HOSTILE];
  base.units = { ...base.units, kp: pick(1), ki: pick(2), kd: pick(3) };
  base.loop.error = pick(4);
  base.controller.equation = pick(5);
  base.controller.update = HOSTILE.slice(6);
  base.controller.integration = pick(7);
  base.interpolation.description = pick(8);
  base.provenance.toolVersion = pick(0);
  const schedule = base as ScheduleFile;
  return { ...schedule, checksum: { ...computeScheduleChecksum(schedule), canonicalForm: pick(1) } };
}

/** Every name the header may define (README, "C header"), for the default prefix. */
const DOCUMENTED_SYMBOLS = new Set([
  'speedband_schedule_speed_mps',
  'speedband_schedule_speed_q16',
  ...['kp', 'ki', 'kd', 'setpoint_weight_p', 'setpoint_weight_d', 'feed_forward', 'feed_forward_lead_time_s'].flatMap((name) => [
    `speedband_schedule_${name}_slope_term0`,
    `speedband_schedule_${name}_slope_term1`,
  ]),
  'speedband_schedule_kp',
  'speedband_schedule_ki',
  'speedband_schedule_kd',
  'speedband_schedule_kp_slope',
  'speedband_schedule_ki_slope',
  'speedband_schedule_kd_slope',
  ...['setpoint_weight_p', 'setpoint_weight_d', 'feed_forward', 'feed_forward_lead_time_s'].flatMap((name) => [
    `speedband_schedule_${name}`,
    `speedband_schedule_${name}_slope`,
  ]),
  'speedband_schedule_segment',
  'speedband_schedule_lookup',
  'speedband_schedule_controller_init',
  'speedband_schedule_square_root',
  'speedband_schedule_step',
  // The integer step function's helpers (fixed-point headers):
  'speedband_schedule_multiply',
  'speedband_schedule_divide',
  'speedband_schedule_integer_square_root',
  'speedband_schedule_magnitude',
  'speedband_schedule_clamp',
]);
const DOCUMENTED_MACROS = new Set(
  [
    'H',
    'BREAKPOINTS',
    'SAMPLE_TIME_S',
    'DERIVATIVE_FILTER',
    'INTEGRATOR_CLAMP_RAD',
    'COMMAND_LIMIT_RAD',
    'LOW_SPEED_FLOOR_MPS',
    'CHECKSUM',
    'LOOKUP_OK',
    'LOOKUP_FALLBACK',
    'LOOKUP_NO_GAINS',
    'FALLBACK_BREAKPOINT',
    // Fixed-point headers:
    'SPEED_FRACTIONAL_BITS',
    'KP_FRACTIONAL_BITS',
    'KI_FRACTIONAL_BITS',
    'KD_FRACTIONAL_BITS',
    'SETPOINT_WEIGHT_P_FRACTIONAL_BITS',
    'SETPOINT_WEIGHT_D_FRACTIONAL_BITS',
    'FEED_FORWARD_FRACTIONAL_BITS',
    'FEED_FORWARD_LEAD_TIME_S_FRACTIONAL_BITS',
    'LOW_SPEED_FLOOR_Q16',
  ].map((name) => `SPEEDBAND_SCHEDULE_${name}`),
);

describe('exportC with hostile text in every free-text field', () => {
  it('keeps all of it inside comments: the header compiles cleanly and defines no symbol or macro beyond the documented ones', () => {
    const dir = mkdtempSync(join(tmpdir(), 'speedband-c-hostile-'));
    for (const fixedPoint of [undefined, parseQFormat('16.16')]) {
      const { text } = exportC(hostileSchedule(), { ...(fixedPoint === undefined ? {} : { fixedPoint }) });
      expect(/^[\x09\x0a\x20-\x7e]*$/.test(text)).toBe(true);
      expect(text).not.toMatch(/\?\?|\\/);
      writeFileSync(join(dir, 'schedule.h'), text);
      writeFileSync(
        join(dir, 'main.c'),
        `#include "schedule.h"\nint main(void)\n{\n  speedband_schedule_gains g;\n  return speedband_schedule_lookup(${fixedPoint === undefined ? '5.0' : '327680'}, &g);\n}\n`,
      );
      writeFileSync(join(dir, 'empty.c'), '#include <stdint.h>\nint main(void)\n{\n  return 0;\n}\n');
      // Compiles with every warning an error; -fkeep-inline-functions emits every function the header defines.
      execFileSync('gcc', [...GCC_FLAGS, '-fkeep-inline-functions', '-c', '-o', join(dir, 'main.o'), join(dir, 'main.c')], { cwd: dir });
      const symbols = execFileSync('nm', ['--defined-only', join(dir, 'main.o')], { encoding: 'utf8' })
        .trim()
        .split('\n')
        .map((line) => line.trim().split(/\s+/))
        .map(([, type, name]) => ({ type, name }));
      for (const { type, name } of symbols) {
        if (name === 'main') continue;
        expect(DOCUMENTED_SYMBOLS.has(name), `${type} ${name}`).toBe(true);
        expect(type, name).toMatch(/^[a-z]$/); // local (static) only: nothing visible to other translation units
      }
      const macros = (file: string): Set<string> =>
        new Set(
          execFileSync('gcc', ['-std=c99', '-E', '-dM', join(dir, file)], { encoding: 'utf8' })
            .split('\n')
            .map((line) => line.split(/[\s(]/)[1]),
        );
      const before = macros('empty.c');
      const added = [...macros('main.c')].filter((name) => !before.has(name));
      for (const name of added) expect(DOCUMENTED_MACROS.has(name), name).toBe(true);
      // The preprocessed code declares nothing at file scope beyond the documented names (and what <stdint.h> brings).
      const code = execFileSync('gcc', ['-std=c99', '-E', '-P', join(dir, 'schedule.h')], { encoding: 'utf8' });
      expect(code).not.toMatch(/injected|\b42\b/);
    }
  });

  it('commentSafe leaves no comment end, nested opening, trigraph, backslash or non-printable character (property)', () => {
    fc.assert(
      fc.property(fc.string({ unit: fc.constantFrom('*', '/', '?', '\\', '\n', '\r', 'a', ' ', '·', '\u2028', '\u0000', '=', '(') }), (text) => {
        const safe = commentSafe(text);
        expect(safe).not.toMatch(/\*\/|\/\*|\?\?|\\/);
        expect(/^[\x20-\x7e]*$/.test(safe)).toBe(true);
      }),
      { numRuns: 500, seed: 12 },
    );
  });
});

describe('the C lookup at a NaN or infinite speed', () => {
  it('returns LOOKUP_FALLBACK with the fallback gains, proven over the whole range, and LOOKUP_OK at finite speeds', () => {
    const schedule = sampleSchedule();
    const table = scheduleTable(schedule);
    const fallback = findFallbackGains(schedule, table, integratorLoopMargins);
    // Source: integrator loop closed form (Åström & Murray 2008): the 16 m/s gains held constant give
    // kθ = (π/6)(v/16)² ≤ π/6 at every v ≤ 16 m/s, so PM ≥ 60° and upper GM ≥ 9.5 dB over the whole range.
    expect(fallback?.breakpoint).toBe(5);
    expect(fallback?.speed_mps).toBe(16);
    const { text } = exportC(schedule, { fallback });
    expect(text).toMatch(/#define SPEEDBAND_SCHEDULE_FALLBACK_BREAKPOINT 5/);
    const results = runCStatus(text, ['nan', 'inf', '-inf', '5']);
    const top = schedule.breakpoints[5];
    for (const result of results.slice(0, 3)) expect(result).toEqual({ status: 1, kp: top.kp, ki: top.ki, kd: top.kd });
    expect(results[3].status).toBe(0);
  });

  it('without proven fallback gains returns LOOKUP_NO_GAINS and leaves the gains unwritten; a null pointer is LOOKUP_NO_GAINS too', () => {
    const schedule = sampleSchedule();
    // A loop on which constant gains fail everywhere except at their own breakpoint: no fallback.
    const strict = (speed_mps: number, gains: PidGains) => {
      const own = scheduleLookup(schedule)(speed_mps);
      return gains.kp === own.kp
        ? integratorLoopMargins(speed_mps, gains)
        : { ...integratorLoopMargins(speed_mps, gains), stable: false, verdict: 'unstable' as const };
    };
    expect(findFallbackGains(schedule, scheduleTable(schedule), strict)).toBeNull();
    const { text } = exportC(schedule);
    expect(text).toMatch(/#define SPEEDBAND_SCHEDULE_FALLBACK_BREAKPOINT -1/);
    for (const result of runCStatus(text, ['nan', 'inf', '-inf'])) expect(result).toEqual({ status: 2, kp: -1, ki: -1, kd: -1 });
    const dir = mkdtempSync(join(tmpdir(), 'speedband-c-null-'));
    writeFileSync(join(dir, 'schedule.h'), text);
    writeFileSync(
      join(dir, 'main.c'),
      '#include <stdio.h>\n#include "schedule.h"\nint main(void)\n{\n  printf("%d", speedband_schedule_lookup(5.0, 0));\n  return 0;\n}\n',
    );
    execFileSync('gcc', [...GCC_FLAGS, '-o', join(dir, 'null'), join(dir, 'main.c')], { cwd: dir });
    expect(execFileSync(join(dir, 'null'), { encoding: 'utf8' })).toBe('2');
  });
});
