import { readFileSync, readdirSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { ERROR_CODES, exitCodeForError, isErrorCode, type ErrorCode } from '../../src/core/error-codes.js';
import { ERROR_REFERENCE_PATH, ERROR_STAGES, errorReferenceMarkdown, stageOfErrorCode } from '../../src/core/error-reference.js';
import { SpeedbandError } from '../../src/core/errors.js';
import type { CommandModule } from '../../src/cli/command.js';
import { recordingIo } from '../../src/cli/io.js';
import { runCli } from '../../src/cli/main.js';

const SRC = fileURLToPath(new URL('../../src/', import.meta.url));
/** The registry and the reference generator name every code; they do not count as places that throw one. */
const REGISTRY_FILES = new Set(['core/error-codes.ts', 'core/error-reference.ts']);

/** Every TypeScript source under src/ but the registry, path relative to src/ → text. */
function sourceTexts(): Map<string, string> {
  const texts = new Map<string, string>();
  for (const entry of readdirSync(SRC, { recursive: true, encoding: 'utf8' })) {
    const path = entry.split('\\').join('/');
    if (!path.endsWith('.ts') || REGISTRY_FILES.has(path)) continue;
    texts.set(path, readFileSync(join(SRC, path), 'utf8'));
  }
  return texts;
}

const codes = Object.keys(ERROR_CODES) as ErrorCode[];

describe('the registry of error codes', () => {
  const sources = sourceTexts();

  it('has a code in every place src/ makes an error: each quoted code given to new SpeedbandError or makeValidator is a registry code', () => {
    // The type system checks the same; this catches a code passed through an `as` cast.
    const given = new Map<string, string>();
    for (const [path, text] of sources) {
      for (const match of text.matchAll(/new SpeedbandError\(\s*'([^']+)'/g)) given.set(match[1], path);
      for (const match of text.matchAll(/makeValidator(?:<[^>]*>)?\(\{[^}]*?\bcode:\s*'([^']+)'/g)) given.set(match[1], path);
    }
    expect(given.size).toBeGreaterThan(100);
    const unknown = [...given].filter(([code]) => !isErrorCode(code)).map(([code, path]) => `${code} (${path})`);
    expect(unknown).toEqual([]);
  });

  it('lists no code that src/ never reports: each is quoted in src/ outside a comparison (=== / !==)', () => {
    const reported = new Set<string>();
    for (const text of sources.values()) {
      for (const match of text.matchAll(/(.{0,5})'([A-Za-z]+(?:\.[A-Za-z]+)?)'/g)) if (!/[=!]==\s*$/.test(match[1])) reported.add(match[2]);
    }
    expect(codes.filter((code) => !reported.has(code))).toEqual([]);
  });

  it('keeps one line of meaning per code, a sentence that ends with a full stop', () => {
    for (const code of codes) {
      expect(ERROR_CODES[code], code).toMatch(/^[^\n]+\.$/);
      expect(ERROR_CODES[code].length, code).toBeLessThanOrEqual(170);
    }
  });

  it('is written grouped by stage in pipeline order (the stages of the reference), sorted inside a stage', () => {
    const stageOrder = ERROR_STAGES.map(([stage]) => stage);
    const written = codes.map((code) => stageOrder.indexOf(stageOfErrorCode(code)));
    expect(written.every((index) => index >= 0)).toBe(true);
    expect(written).toEqual([...written].sort((a, b) => a - b));
    for (const stage of stageOrder) {
      const inStage = codes.filter((code) => stageOfErrorCode(code) === stage);
      expect(inStage).toEqual([...inStage].sort());
    }
  });

  it('maps internal (a bug) to exit 3 and every other code to exit 2 (bad input), as the product rules say', () => {
    expect(exitCodeForError('internal')).toBe(3);
    expect(codes.filter((code) => exitCodeForError(code) === 3)).toEqual(['internal']);
    expect(exitCodeForError('log.missingColumn')).toBe(2);
  });
});

describe('the CLI reports a SpeedbandError with its code and the exit code of the registry', () => {
  const throwing = (code: ErrorCode): CommandModule => ({
    command: 'throw',
    describe: 'throws one error',
    builder: (yargs) => yargs.option('json', { type: 'boolean', default: false }),
    exitCodes: [[2, 'bad input']],
    run: async () => {
      throw new SpeedbandError(code, 'the words of the error', { location: { file: 'x.csv', line: 3 } });
    },
  });

  it('a bad-input code: exit 2, the code in the --json report', async () => {
    const io = recordingIo();
    expect(await runCli(['throw', '--json'], io, { commands: [throwing('log.emptyCell')] })).toBe(2);
    expect(JSON.parse(io.out())).toEqual({ error: { code: 'log.emptyCell', message: 'the words of the error', location: { file: 'x.csv', line: 3 } } });
    expect(io.err()).toBe('speedband: x.csv, line 3: the words of the error\n');
  });

  it('code internal (a bug relayed as a SpeedbandError, e.g. from a check worker): exit 3, not 2', async () => {
    const io = recordingIo();
    expect(await runCli(['throw', '--json'], io, { commands: [throwing('internal')] })).toBe(3);
    expect(JSON.parse(io.out()).error.code).toBe('internal');
  });
});

describe('docs/errors.md, the error reference', () => {
  it('is what the generator makes from the registry today (run `npm run error-reference` after changing src/core/error-codes.ts)', () => {
    expect(readFileSync(ERROR_REFERENCE_PATH, 'utf8')).toBe(errorReferenceMarkdown());
  });

  it('has a row for every code with its meaning and exit code, under its stage heading', () => {
    const text = errorReferenceMarkdown();
    for (const code of codes) expect(text).toContain(`| \`${code}\` | ${ERROR_CODES[code].replace(/\|/g, '\\|')} | ${exitCodeForError(code)} |`);
    expect(text.indexOf('## Test logs')).toBeLessThan(text.indexOf('| `log.missingColumn` |'));
    expect(text.indexOf('| `log.missingColumn` |')).toBeLessThan(text.indexOf('## Identification'));
  });
});
