import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { isSpeedbandError } from '../../src/core/errors.js';
import { parseDecimalRange } from '../../src/log/csv-text.js';
import { parseSteerLog } from '../../src/log/read.js';
import type { SteerLog } from '../../src/log/types.js';

/** Property: the reader returns a SteerLog or throws a SpeedbandError, never another exception. */
function readsOrExplains(text: string): SteerLog | null {
  try {
    return parseSteerLog(text, 'random.csv', { steeringRatio: 15 });
  } catch (error) {
    if (!isSpeedbandError(error)) throw error;
    expect(error.code).toMatch(/^log\.[a-zA-Z]+$/);
    expect(error.message.length).toBeGreaterThan(10);
    return null;
  }
}

const CHANNEL_NAMES = ['time_s', 'speed_mps', 'steer_cmd_rad', 'yaw_rate_radps', 'steer_angle_rad', 'lat_accel_mps2', 'extra'];

describe('parseSteerLog on random input (fast-check)', () => {
  it('random bytes decoded as UTF-8 give a SteerLog or a SpeedbandError', () => {
    fc.assert(
      fc.property(fc.uint8Array({ maxLength: 400 }), (bytes) => {
        readsOrExplains(Buffer.from(bytes).toString('utf8'));
      }),
      { numRuns: 400, seed: 20261201 },
    );
  });

  it('random text built from CSV-like characters gives a SteerLog or a SpeedbandError', () => {
    const alphabet = fc.constantFrom(...'0123456789.,;\t\r\n-+eE#"xNaInfty_ ');
    const header = fc.shuffledSubarray(CHANNEL_NAMES, { minLength: 0 }).map((names) => names.join(','));
    fc.assert(
      fc.property(header, fc.array(alphabet, { maxLength: 300 }), (head, characters) => {
        readsOrExplains(`${head}\n${characters.join('')}`);
      }),
      { numRuns: 400, seed: 7 },
    );
  });

  it('random numeric tables (any doubles, any column order and delimiter) give a SteerLog or a SpeedbandError, and a SteerLog keeps every row', () => {
    const required = ['time_s', 'speed_mps', 'steer_cmd_rad', 'yaw_rate_radps'];
    const columnSets = fc.tuple(fc.subarray(['steer_angle_rad', 'lat_accel_mps2', 'extra']), fc.boolean()).chain(([optional, dropOne]) => {
      const names = [...(dropOne ? required.slice(1) : required), ...optional];
      return fc.shuffledSubarray(names, { minLength: names.length, maxLength: names.length });
    });
    // Mostly plausible values so that many tables are valid; sometimes anything (NaN, ±Infinity, huge, negative).
    const value = fc.oneof(
      { arbitrary: fc.double({ min: 0, max: 1, noNaN: true }), weight: 30 },
      { arbitrary: fc.double(), weight: 1 },
      { arbitrary: fc.integer({ min: -5, max: 200 }), weight: 1 },
    );
    const table = fc.record({
      columns: columnSets,
      delimiter: fc.constantFrom(',', ';', '\t'),
      rows: fc.array(fc.array(value, { minLength: 7, maxLength: 7 }), { minLength: 0, maxLength: 12 }),
      sortTime: fc.boolean(),
    });
    let valid = 0;
    fc.assert(
      fc.property(table, ({ columns, delimiter, rows, sortTime }) => {
        const timeIndex = columns.indexOf('time_s');
        const body = rows.map((row, r) => columns.map((_, c) => (sortTime && c === timeIndex ? r * 0.01 : row[c])).join(delimiter));
        const log = readsOrExplains([columns.join(delimiter), ...body].join('\n'));
        if (log !== null) {
          valid += 1;
          const samples = log.segments.reduce((sum, segment) => sum + segment.time_s.length, 0);
          expect(samples).toBe(rows.length);
          for (const segment of log.segments) for (const value of segment.yawRate_radps) expect(Number.isFinite(value)).toBe(true);
        }
      }),
      { numRuns: 400, seed: 11 },
    );
    expect(valid).toBeGreaterThan(20); // the property must also exercise the accepting path
  });
});

describe('parseDecimalRange(text, from, to)', () => {
  it('equals Number() on every plain decimal, fixed-point or exponent, short or long (fast-check)', () => {
    const decimal = fc.oneof(
      fc.tuple(fc.double({ min: -1e6, max: 1e6, noNaN: true }), fc.integer({ min: 0, max: 17 })).map(([x, digits]) => x.toFixed(digits)),
      fc.double({ noNaN: true, noDefaultInfinity: true }).map(String),
      fc.stringMatching(/^[+-]?\d{1,20}(\.\d{0,20})?$/),
    );
    fc.assert(
      fc.property(decimal, (text) => {
        const padded = `;${text};`;
        expect(Object.is(parseDecimalRange(padded, 1, padded.length - 1), Number(text))).toBe(true);
      }),
      { numRuns: 3000, seed: 5 },
    );
  });

  it('returns NaN for text that is not a plain finite decimal', () => {
    for (const text of ['', ' ', '-', '.', '1.2.3', '0x10', '1e', 'NaN', 'Infinity', '1,5', '12a', '--1']) {
      expect(parseDecimalRange(text, 0, text.length), text).toBeNaN();
    }
  });
});
