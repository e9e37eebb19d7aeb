/**
 * docs/errors.md, the error reference, as text made from the registry (src/core/error-codes.ts):
 * a short introduction, then one table per stage — code, meaning, exit code.
 * `npm run error-reference` writes it; test/core/error-codes.test.ts fails while the file is stale.
 */
import { fileURLToPath } from 'node:url';
import { ERROR_CODES, exitCodeForError, type ErrorCode } from './error-codes.js';

/** …/docs/errors.md beside src/ or dist/. */
export const ERROR_REFERENCE_PATH = fileURLToPath(new URL('../../docs/errors.md', import.meta.url));

/** The stage of a code (the part before the dot; `internal` is its own), with its heading, in pipeline order. */
export const ERROR_STAGES: ReadonlyArray<readonly [string, string]> = [
  ['file', 'Reading files'],
  ['json', 'JSON text'],
  ['vehicle', 'Vehicle file and single-track model'],
  ['simulate', 'Simulation'],
  ['testLogs', 'Synthetic step-test logs (make-test-logs)'],
  ['log', 'Test logs'],
  ['identify', 'Identification'],
  ['models', 'Models file'],
  ['lti', 'Linear models: transfer functions, delays, responses'],
  ['loops', 'Loops'],
  ['controller', 'Controller'],
  ['tuning', 'Tuning rules'],
  ['plan', 'Plan file'],
  ['build', 'Building a schedule'],
  ['schedule', 'Schedule table and file'],
  ['check', 'Checking a schedule'],
  ['verify', 'Stability analysis'],
  ['compare', 'Comparing schedules'],
  ['report', 'The HTML report'],
  ['export', 'Export'],
  ['output', 'Writing outputs'],
  ['demo', 'Demo'],
  ['cli', 'Command line'],
  ['internal', 'A bug in speedband'],
];

/** 'log.missingColumn' → 'log'; 'internal' → 'internal'. */
export function stageOfErrorCode(code: ErrorCode): string {
  return code.split('.')[0];
}

const cell = (text: string): string => text.replace(/\|/g, '\\|');

export function errorReferenceMarkdown(): string {
  const codes = Object.keys(ERROR_CODES) as ErrorCode[];
  const unstaged = codes.filter((code) => !ERROR_STAGES.some(([stage]) => stage === stageOfErrorCode(code)));
  if (unstaged.length > 0) throw new Error(`error codes with no stage in ERROR_STAGES: ${unstaged.join(', ')}`);
  const lines = [
    '# Error reference',
    '',
    '<!-- Generated from src/core/error-codes.ts by `npm run error-reference` (src/core/error-reference.ts); do not edit. -->',
    '',
    'When speedband refuses an input it writes one message on standard error: where (file, line, column or JSON path), what it',
    'found, what it expected and what to do. With `--json` the same error is also written to standard output as',
    '`{"error": {"code", "message", "location"}}`. Scripts should branch on the code, not on the words of the message.',
    '',
    'Exit codes: 0 done or passed, 1 a check failed (not an error: the command ran and reports the failure), 2 bad input or usage',
    '(nothing was computed), 3 a bug in speedband. The library throws the same codes as `SpeedbandError.code`',
    '(`ERROR_CODES` and the type `ErrorCode` are exported).',
  ];
  for (const [stage, title] of ERROR_STAGES) {
    const inStage = codes.filter((code) => stageOfErrorCode(code) === stage).sort();
    if (inStage.length === 0) continue;
    lines.push('', `## ${title}`, '', '| Code | Meaning | Exit |', '| --- | --- | --- |');
    for (const code of inStage) lines.push(`| \`${code}\` | ${cell(ERROR_CODES[code])} | ${exitCodeForError(code)} |`);
  }
  return `${lines.join('\n')}\n`;
}
