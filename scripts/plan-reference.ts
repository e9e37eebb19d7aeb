/**
 * Writes docs/plan.md, the plan reference, from the plan schema (src/schedule/plan-reference.ts).
 * Run after changing the plan schema, its defaults or a rule: `npm run plan-reference`
 * (test/schedule/plan-reference.test.ts fails until then).
 */
import { writeFileSync } from 'node:fs';
import { PLAN_REFERENCE_PATH, planReferenceMarkdown } from '../src/schedule/plan-reference.js';

writeFileSync(PLAN_REFERENCE_PATH, planReferenceMarkdown());
process.stdout.write(`wrote ${PLAN_REFERENCE_PATH}\n`);
