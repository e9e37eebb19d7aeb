/**
 * Writes docs/errors.md, the error reference, from the registry of error codes (src/core/error-reference.ts).
 * Run after adding, removing or rewording a code in src/core/error-codes.ts: `npm run error-reference`
 * (test/core/error-codes.test.ts fails until then).
 */
import { writeFileSync } from 'node:fs';
import { ERROR_REFERENCE_PATH, errorReferenceMarkdown } from '../src/core/error-reference.js';

writeFileSync(ERROR_REFERENCE_PATH, errorReferenceMarkdown());
process.stdout.write(`wrote ${ERROR_REFERENCE_PATH}\n`);
