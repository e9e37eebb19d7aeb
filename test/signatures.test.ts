/**
 * Signatures of src/: an exported function with more than four inputs takes one readonly options object, and a flag
 * is a named option or a string union, never a parameter typed `boolean` (DEVELOPERS.md, Rules of the code). A call
 * such as `writeSchedule(path, schedule, true)` or `settlingTime_s(output, 1, 0.02, 0.01)` does not say what its
 * arguments mean, and two numbers swapped still type-check.
 */
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join, relative, sep } from 'node:path';
import { describe, expect, it } from 'vitest';
import { exportedSignatures, isBareBoolean } from './helpers/signatures.js';

/** The most positional parameters an exported function takes (common practice: beyond four, name them). */
const MOST_POSITIONAL = 4;

/**
 * Exceptions, `file function` → why. Keep this short: each is an inner loop where an options object per call is
 * what the design avoids.
 */
const EXCEPTIONS: Readonly<Record<string, string>> = {
  // Four calls per Runge–Kutta step of the scenario simulator, writing into a reused array (no allocation per step).
  'src/performance/path-frame-vehicle.ts pathFrameDerivativeAt': 'seven positional parameters',
  // Called once per sample (or half sample) by the scenario simulator and the limited loop, writing the pieces into a
  // reused typed array without building a record.
  'src/performance/actuator-motion.ts actuatorPiecesInto': 'six positional parameters',
};

function sourceFiles(folder: string): string[] {
  return readdirSync(folder).flatMap((name) => {
    const path = join(folder, name);
    return statSync(path).isDirectory() ? sourceFiles(path) : path.endsWith('.ts') ? [path] : [];
  });
}

/** What is wrong with a signature ('' when nothing). */
function problemOf(parameters: readonly string[]): string {
  const flags = parameters.filter(isBareBoolean);
  const problems = [
    ...(parameters.length > MOST_POSITIONAL ? [`${parameters.length} positional parameters`] : []),
    ...flags.map((flag) => `a bare boolean parameter (${flag})`),
  ];
  return problems.join(', ');
}

describe('signatures of the exported functions of src/', () => {
  const signatures = sourceFiles('src').flatMap((file) =>
    exportedSignatures(readFileSync(file, 'utf8')).map((signature) => ({ ...signature, key: `${relative('.', file).split(sep).join('/')} ${signature.name}` })),
  );

  it('are all found (the reader sees the hundreds of exported functions, not a few)', () => {
    expect(signatures.length).toBeGreaterThan(500);
    expect(signatures.find((signature) => signature.name === 'buildSchedule')?.parameters.length).toBe(1);
  });

  it('take at most four positional parameters and no bare boolean: more inputs go in one readonly options object, a flag is a named option or a string union', () => {
    const offenders = signatures
      .filter((signature) => EXCEPTIONS[signature.key] === undefined)
      .map((signature) => ({ at: `${signature.key} (line ${signature.line})`, problem: problemOf(signature.parameters) }))
      .filter((found) => found.problem !== '')
      .map((found) => `${found.at}: ${found.problem}`);
    expect(offenders).toEqual([]);
  });

  it('list only exceptions that still exist and still need to be one', () => {
    const stale = Object.keys(EXCEPTIONS).filter((key) => {
      const found = signatures.filter((signature) => signature.key === key);
      return found.length === 0 || found.every((signature) => problemOf(signature.parameters) === '');
    });
    expect(stale).toEqual([]);
  });
});

describe('exportedSignatures (the reader the check above relies on)', () => {
  const text = [
    '/** A doc comment with export function fake(a, b, c, d, e) in it. */',
    'export function writeIt(path: string, content: string | Uint8Array, force: boolean): void {}',
    'export async function later<T extends { a: number }>(',
    '  value: Pick<Options, "a" | "b">,',
    '  /** a comment, with, commas */',
    '  callback: (x: number, y: number) => void = () => {},',
    '  rest = [1, 2],',
    "  text = 'a, b',",
    '): Promise<T> {}',
    'export const arrow = (a: number, b: Map<string, number>, { c, d }: Both, e?: boolean, f = false): number => a;',
    'export const notAFunction = (1 + 2) * 3;',
    'export const typed: Lookup = (speed_mps: number) => speed_mps;',
    'function internal(a: boolean, b: number, c: number, d: number, e: number): void {}',
    'export function options(input: { readonly force: boolean; readonly limit: number }): void {}',
  ].join('\n');
  const found = exportedSignatures(text);

  it('reads each exported declaration with its parameters, split at their own commas only', () => {
    expect(found.map((signature) => [signature.name, signature.parameters.length])).toEqual([
      ['writeIt', 3],
      ['later', 4],
      ['arrow', 5],
      ['typed', 1],
      ['options', 1],
    ]);
    expect(found[1].parameters[1]).toBe('callback: (x: number, y: number) => void = () => {}');
    expect(found[2].line).toBe(10);
  });

  it('tells a bare boolean parameter from a boolean field of an options object', () => {
    expect(found.map((signature) => signature.parameters.filter(isBareBoolean))).toEqual([['force: boolean'], [], ['e?: boolean', 'f = false'], [], []]);
    expect(problemOf(found[2].parameters)).toBe('5 positional parameters, a bare boolean parameter (e?: boolean), a bare boolean parameter (f = false)');
  });
});
