import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { PLAN_DEFAULTS } from '../../src/schedule/plan.js';
import { PLAN_REFERENCE_PATH, planReferenceMarkdown } from '../../src/schedule/plan-reference.js';
import { TUNING_RULES } from '../../src/tuning/registry.js';
import { PLAN_SCHEMA } from '../../src/schedule/plan-schema.js';

describe('docs/plan.md, the plan reference', () => {
  it('is what the generator makes from the plan schema today (run `npm run plan-reference` after changing the schema, its defaults or a rule)', () => {
    expect(readFileSync(PLAN_REFERENCE_PATH, 'utf8')).toBe(planReferenceMarkdown());
  });

  it('lists every field of the schema, every rule with the parameters it takes, and the constant defaults', () => {
    const text = planReferenceMarkdown();
    const parameters = Object.keys(PLAN_SCHEMA.properties.rule.properties.parameters.properties);
    for (const name of parameters) expect(text).toContain(`| \`rule.parameters.${name}\` |`);
    for (const name of Object.keys(PLAN_SCHEMA.properties.acceptance.properties)) expect(text).toContain(`| \`acceptance.${name}\` |`);
    for (const rule of TUNING_RULES) expect(text).toContain(`| \`${rule.name}\` | ${rule.title} |`);
    expect(text).toMatch(
      new RegExp(`\\| \`acceptance\\.minimumPhaseMargin_deg\` \\|[^\\n]*\\| ° \\| \`${PLAN_DEFAULTS.acceptance.minimumPhaseMargin_deg}\` \\|`),
    );
    expect(text).toMatch(/\| `controller\.computationLatency_s` \|[^\n]*\| s \| one sample: controller\.sampleTime_s \|/);
  });

  it('every rule parameter of the schema is taken by some rule, and every parameter a rule takes is in the schema', () => {
    const schemaParameters = Object.keys(PLAN_SCHEMA.properties.rule.properties.parameters.properties).sort();
    const taken = [...new Set(TUNING_RULES.flatMap((rule) => rule.parameters))].sort();
    expect(taken).toEqual(schemaParameters);
  });
});
