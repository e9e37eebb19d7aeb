/**
 * Writes docs/api.md, the library API reference, from src/index.ts (scripts/api-text.ts).
 * Run after changing what src/index.ts exports or a doc comment of an exported name: `npm run api-reference`
 * (test/api-reference.test.ts fails until then).
 */
import { writeFileSync } from 'node:fs';
import { API_REFERENCE_PATH, apiReferenceMarkdown } from './api-text.js';

writeFileSync(API_REFERENCE_PATH, apiReferenceMarkdown());
process.stdout.write(`wrote ${API_REFERENCE_PATH}\n`);
