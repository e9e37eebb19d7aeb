import { execFileSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { exportC } from '../../src/export/c-header.js';
import { parseQFormat } from '../../src/export/fixed-point.js';
import { makeGainLookup } from '../../src/schedule/interpolate.js';
import { scheduleLookup } from '../../src/schedule/schedule-lookup.js';
import type { ScheduleFile } from '../../src/schedule/schedule-types.js';
import { sampleSchedule } from '../schedule/sample-schedule.js';

/** Agreement between the C lookup (double) and the TypeScript lookup, relative. */
const C_AGREEMENT = 1e-6;

/** 1,000 speeds from 0 to beyond the table (floor, clamp), plus every breakpoint exactly. */
function speedsFor(schedule: ScheduleFile): number[] {
  const last = schedule.breakpoints[schedule.breakpoints.length - 1].speed_mps;
  const speeds = Array.from({ length: 1000 - schedule.breakpoints.length }, (_, i) => (i * (last + 3)) / 990);
  return [...speeds, ...schedule.breakpoints.map((row) => row.speed_mps)];
}

/** Compile the header into a tiny program with the machine's gcc (C99, all warnings as errors) and evaluate the lookup. */
function runC(header: string, speeds: readonly number[]): { kp: number; ki: number; kd: number }[] {
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
    speedband_schedule_gains g = speedband_schedule_lookup(v);
    printf("%.17g %.17g %.17g\\n", g.kp, g.ki, g.kd);
  }
  return 0;
}
`,
  );
  execFileSync('gcc', ['-std=c99', '-Wall', '-Wextra', '-Werror', '-pedantic', '-o', join(dir, 'lookup'), join(dir, 'main.c')], { cwd: dir });
  const output = execFileSync(join(dir, 'lookup'), { input: speeds.map((v) => v.toPrecision(17)).join('\n'), encoding: 'utf8' });
  return output
    .trim()
    .split('\n')
    .map((line) => {
      const [kp, ki, kd] = line.split(' ').map(Number);
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
          if (!close(fromC[i][name], expected[name], C_AGREEMENT)) throw new Error(`${name} at ${speed} m/s: C ${fromC[i][name]}, TypeScript ${expected[name]}`);
        }
      });
      // Exact table values at breakpoints in C as well (DOMAIN.md §7).
      schedule.breakpoints.forEach((row, k) => expect(fromC[1000 - schedule.breakpoints.length + k]).toEqual({ kp: row.kp, ki: row.ki, kd: row.kd }));
    });
  }

  it('fixed point Q16.16: integers in int32_t, C agrees with the exact lookup within the reported quantisation error', () => {
    const schedule = sampleSchedule();
    const exported = exportC(schedule, { fixedPoint: parseQFormat('16.16') });
    const quantisation = exported.quantisation!;
    // Source: definition of Q format — rounding to 2^−16 leaves at most 2^−17 per stored value.
    for (const name of ['kp', 'ki', 'kd'] as const) expect(quantisation.errors[name].maxAbsolute).toBeLessThanOrEqual(2 ** -17);
    expect(exported.text).toMatch(/static const int32_t speedband_schedule_kp\[/);
    const speeds = speedsFor(schedule);
    const fromC = runC(exported.text, speeds);
    const exact = scheduleLookup(schedule);
    const quantised = makeGainLookup(quantisation.table, { interpolation: 'monotone-cubic', lowSpeedFloor_mps: 2 }, quantisation.slopes);
    speeds.forEach((speed, i) => {
      for (const name of ['kp', 'ki', 'kd'] as const) {
        // Source: Q-format rounding bound 2^−17, carried through the convex Hermite weights (fixed-point.ts); 1e-15 for double rounding.
        expect(Math.abs(fromC[i][name] - exact(speed)[name])).toBeLessThanOrEqual(quantisation.resolutionBound + 1e-15);
        expect(close(fromC[i][name], quantised(speed)[name], C_AGREEMENT) || fromC[i][name] === quantised(speed)[name]).toBe(true);
      }
    });
  });

  it('carries units, loop, controller equation, checksum and the safety cautions, in ASCII', () => {
    const schedule = sampleSchedule();
    const { text } = exportC(schedule);
    expect(/^[\x00-\x7f]*$/.test(text)).toBe(true);
    expect(text).toContain(schedule.checksum.value);
    expect(text).toMatch(/#ifndef SPEEDBAND_SCHEDULE_H/);
    expect(text).toMatch(/kp rad per m; ki rad per m\*s; kd rad per m\/s/);
    expect(text).toMatch(/Loop: path \(preview 4 m from the front-axle\)/);
    expect(text).toMatch(/I\[k\] = clamp\(I\[k-1\] \+ ki\[k\]\*Ts\*e\[k\]/);
    expect(text).toMatch(/closed track/);
    expect(text).toMatch(/IEEE 754 double/);
    expect(text).not.toMatch(/malloc|free\(/);
  });

  it('a gain too large for the word is a typed overflow error', () => {
    expect(() => exportC(sampleSchedule(), { fixedPoint: parseQFormat('1.15') })).toThrow(expect.objectContaining({ code: 'export.fixedPointOverflow' }));
    expect(() => parseQFormat('16.8')).toThrow(expect.objectContaining({ code: 'export.qFormatInvalid' }));
  });
});
