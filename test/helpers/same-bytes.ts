import { expect } from 'vitest';

/**
 * Asserts that two files' contents are byte-identical. `Buffer.equals` compares them at once, where vitest's
 * `toEqual` walks a Buffer index by index (about 3.5 s for a 1 MB report). When they differ, their texts are
 * compared first, for a readable difference.
 */
export function expectSameBytes(actual: Buffer, expected: Buffer, what = 'the two files'): void {
  if (actual.equals(expected)) return;
  expect(actual.toString('utf8'), what).toBe(expected.toString('utf8'));
  expect.fail(`${what} differ in their bytes (${actual.length} and ${expected.length} bytes) though they read as the same text`);
}
