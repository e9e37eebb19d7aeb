import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { recordingIo } from '../../src/cli/io.js';
import { runCli } from '../../src/cli/main.js';
import { LIBRARY_MESSAGE_MAX, QUOTED_TEXT_MAX, libraryMessage, quoted, safeMessageText } from '../../src/core/quote.js';

/** C0/C1 control characters, DEL, bidirectional overrides and line separators (none may reach a terminal raw). */
const RAW_CONTROL = /[\u0000-\u0009\u000b-\u001f\u007f-\u009f\u2028\u2029\u202a-\u202e\u2066-\u2069]/;

describe('quoted(text)', () => {
  it('escapes control characters and cuts long text, saying how long it was', () => {
    expect(quoted('abc')).toBe('"abc"');
    expect(quoted('a\u001b[31mb\nc\u202e')).toBe('"a\\e[31mb\\nc\\u202e"');
    const long = quoted('x'.repeat(1_000_000));
    expect(long.length).toBeLessThan(QUOTED_TEXT_MAX + 60);
    expect(long).toMatch(/\(1000000 characters in all\)$/);
  });

  it('libraryMessage re-quotes the input a library echoes (mathjs parse errors) and bounds the whole', () => {
    expect(libraryMessage('Unit "knots" not found.')).toBe('Unit "knots" not found.');
    const echoed = libraryMessage(`Syntax error in part "\u001b[2J${' '.repeat(450)}+ x" (char 20)`);
    expect(echoed).toMatch(/^Syntax error in part "\\e\[2J {76}…" \(457 characters in all\)/);
    expect(RAW_CONTROL.test(echoed)).toBe(false);
    expect(libraryMessage(`no quotes \u0007${'z'.repeat(5000)}`).length).toBeLessThan(LIBRARY_MESSAGE_MAX + 40);
  });

  it('safeMessageText keeps line breaks, escapes other control characters and cuts each line', () => {
    expect(safeMessageText('one\ntwo\u0007')).toBe('one\ntwo\\u0007');
    expect(safeMessageText('y'.repeat(10_000)).length).toBeLessThan(2100);
  });
});

describe('messages quoting input text', () => {
  it('a 2 MB log cell with terminal escapes is cut and escaped in the error (exit 2), not echoed whole', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'speedband-quote-'));
    const log = join(dir, 'log.csv');
    const cell = `\u001b]0;owned\u0007${'9'.repeat(2_000_000)}\r`;
    writeFileSync(log, `time_s,speed_mps,steer_cmd_rad,yaw_rate_radps\n0,5,0,0\n0.02,5,${cell},0\n`);
    const io = recordingIo();
    expect(await runCli(['inspect', log], io)).toBe(2);
    expect(io.err().length).toBeLessThan(1000);
    expect(io.err()).toMatch(/characters in all/);
    expect(RAW_CONTROL.test(io.err())).toBe(false);
  });

  it('a vehicle file with a huge unknown field name full of control characters gets a short, escaped message', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'speedband-quote-'));
    const vehicle = join(dir, 'vehicle.json');
    const key = `\u001b[2J${'k'.repeat(500_000)}`;
    writeFileSync(
      vehicle,
      JSON.stringify({
        name: 'v',
        mass_kg: 1000,
        yawInertia_kgm2: 1000,
        cgToFrontAxle_m: 1,
        cgToRearAxle_m: 1,
        steeringRatio: 15,
        maxSteerAngle_rad: 0.5,
        maxSteerRate_radps: 1,
        [key]: 1,
      }),
    );
    const io = recordingIo();
    expect(await runCli(['make-test-logs', '--vehicle', vehicle, '--speeds', '5', '--out', join(dir, 'logs')], io)).toBe(2);
    expect(io.err().length).toBeLessThan(1500);
    expect(RAW_CONTROL.test(io.err())).toBe(false);
  });
});
