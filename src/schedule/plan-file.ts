/**
 * Plan files: read, schema-validated (the precompiled validator; errors name the file and JSON path), the rule's
 * parameters checked against what the rule takes, then resolved (plan.ts resolvePlan). Apart from plan.ts, so that
 * what only resolves plans or reads their defaults (the check and scenario worker threads among them) does not load
 * the file validators.
 */
import { SpeedbandError } from '../core/errors.js';
import { readTextFile } from '../core/files.js';
import { validatePlanFile } from '../core/precompiled-validators.js';
import { makeValidator, parseJsonText } from '../core/schema.js';
import { findRule, parameterNotTakenWords, parametersNotTaken } from '../tuning/registry.js';
import { DEFAULT_RULES, PLAN_DEFAULTS, resolvePlan, type PartialPlan, type Plan, type ResolveContext } from './plan.js';
import { planReferenceHint } from './plan-reference-path.js';
import { PLAN_SCHEMA } from './plan-schema.js';

const validateSchema = makeValidator<PartialPlan>({
  schema: PLAN_SCHEMA,
  code: 'plan.invalid',
  what: 'plan file',
  precompiled: validatePlanFile,
  reference: planReferenceHint,
});

/** Schema, then the rule's parameters: one the rule does not take is refused (it would be ignored), naming those it takes. */
function validatePlan(value: unknown, file: string): PartialPlan {
  const plan = validateSchema(value, file);
  const defaultRule = DEFAULT_RULES[plan.loop?.kind ?? PLAN_DEFAULTS.loop.kind].name;
  const rule = findRule(plan.rule?.name ?? defaultRule);
  const notTaken = parametersNotTaken(rule, Object.keys(plan.rule?.parameters ?? {}));
  if (notTaken.length > 0) {
    throw new SpeedbandError(
      'plan.parameterNotTaken',
      `${parameterNotTakenWords(rule, notTaken[0])}${plan.rule?.name === undefined ? ` (${defaultRule} is the default rule of this loop: name another with "rule": {"name": …})` : ''} — remove it or change the rule\n${planReferenceHint()}`,
      { location: { file, jsonPath: `/rule/parameters/${notTaken[0]}` }, details: { rule: rule.name, parameters: notTaken, takes: rule.parameters } },
    );
  }
  return plan;
}

/** Read and schema-validate a plan file, not yet resolved (errors name the file and JSON path). */
export function readPlanFile(path: string): PartialPlan {
  return validatePlan(parseJsonText(readTextFile(path), path), path);
}

/** Read, schema-validate and resolve a plan file; errors name the file and JSON path. */
export function readPlan(path: string, context: Omit<ResolveContext, 'file'> = {}): Plan {
  return resolvePlan(readPlanFile(path), { ...context, file: path });
}

/** Validate a parsed plan object (e.g. from a test or another file) against the schema, then resolve it. */
export function planFromJson(value: unknown, context: ResolveContext = {}): Plan {
  return resolvePlan(validatePlan(value, context.file ?? '(plan)'), context);
}
