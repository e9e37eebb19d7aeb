import { SpeedbandError, isSpeedbandError } from '../core/errors.js';
import { AMIGO } from './amigo.js';
import { DAMPING_TARGET } from './damping-target.js';
import { IMC_PID } from './imc-pid.js';
import { MIGO } from './migo.js';
import { describePlantClass, plantClassOf } from './plant-class.js';
import { SIMC } from './simc.js';
import type { DesignModel, RuleContext, RuleName, RuleParameterName, RuleParameters, RuleResult, TuningRule } from './types.js';
import { closestName } from '../core/closest-name.js';
import { ZIEGLER_NICHOLS_STEP } from './ziegler-nichols-step.js';
import { ZIEGLER_NICHOLS_ULTIMATE } from './ziegler-nichols-ultimate.js';

/** Every tuning rule, in the order help texts list them. A new rule is one file plus one line here. */
export const TUNING_RULES: readonly TuningRule[] = [ZIEGLER_NICHOLS_STEP, ZIEGLER_NICHOLS_ULTIMATE, IMC_PID, SIMC, DAMPING_TARGET, AMIGO, MIGO];

/** The names of every tuning rule, in the registry's order. */
export const RULE_NAMES: readonly RuleName[] = TUNING_RULES.map((rule) => rule.name);

/** The rule called `name`, or a `tuning.unknownRule` error listing the known names (with a closest match). */
export function findRule(name: string): TuningRule {
  const rule = TUNING_RULES.find((candidate) => candidate.name === name);
  if (rule !== undefined) return rule;
  const closest = RULE_NAMES.find((known) => known.startsWith(name.slice(0, 3).toLowerCase()));
  throw new SpeedbandError(
    'tuning.unknownRule',
    `unknown tuning rule "${name}"${closest === undefined ? '' : ` — did you mean ${closest}?`}; known rules: ${RULE_NAMES.join(', ')}`,
    { details: { rule: name, known: RULE_NAMES } },
  );
}

/** The rules that read the parameter `name` (none: it is no rule's parameter). */
export function rulesTaking(name: string): RuleName[] {
  return TUNING_RULES.filter((rule) => (rule.parameters as readonly string[]).includes(name)).map((rule) => rule.name);
}

/** Of the parameter names given, those the rule does not read, in the order given. */
export function parametersNotTaken(rule: TuningRule, given: readonly string[]): string[] {
  return given.filter((name) => !(rule.parameters as readonly string[]).includes(name));
}

/**
 * Words for a parameter the rule does not take: whose parameter it is, the closest one the rule takes,
 * and the list the rule takes. `shown` writes a parameter name as the user wrote it (a plan field, or a
 * command-line option).
 */
export function parameterNotTakenWords(rule: TuningRule, name: string, shown: (parameter: RuleParameterName) => string = (parameter) => parameter): string {
  // Rules whose parameters are written the same way (two parameters may share one command-line option).
  const owners = TUNING_RULES.filter((candidate) => candidate.parameters.some((parameter) => shown(parameter) === shown(name as RuleParameterName))).map(
    (candidate) => candidate.name,
  );
  const own = [...new Set(rule.parameters.map(shown))];
  const closest = closestName(shown(name as RuleParameterName), own);
  const whose = owners.length > 0 ? ` (a parameter of ${owners.join(', ')})` : '';
  const takes = own.length > 0 ? `${rule.name} takes ${own.join(', ')}` : `${rule.name} takes no parameter`;
  return `${rule.name} does not use ${shown(name as RuleParameterName)}${whose} — ${closest === null ? '' : `did you mean ${closest}? `}${takes}`;
}

/**
 * The rules that produce numbers for a model: its plant class is declared by the rule and the rule
 * does not refuse it (e.g. Ziegler–Nichols needs a finite ultimate gain). A rule that only lacks a
 * parameter with no default for this model (`tuning.parameterRequired`) counts as applicable.
 */
export function applicableRules(model: DesignModel, parameters: RuleParameters, context: RuleContext): RuleName[] {
  const names: RuleName[] = [];
  for (const rule of TUNING_RULES) {
    if (!rule.plantClasses.includes(plantClassOf(model))) continue;
    try {
      rule.tune(model, parameters, context);
      names.push(rule.name);
    } catch (error) {
      if (!isSpeedbandError(error)) throw error;
      // A missing parameter (e.g. λ on a delay-free plant) does not make the rule inapplicable.
      if (error.code === 'tuning.parameterRequired') names.push(rule.name);
    }
  }
  return names;
}

/**
 * Apply the rule `name` to a design model. A rule that does not apply throws
 * `tuning.ruleNotApplicable` saying why and naming the rules that do apply (details.applicableRules).
 */
export function applyRule(name: string, model: DesignModel, parameters: RuleParameters, context: RuleContext): RuleResult {
  const rule = findRule(name);
  // A parameter the rule does not read would be silently ignored: refused instead.
  const notTaken = parametersNotTaken(
    rule,
    Object.keys(parameters).filter((key) => parameters[key as RuleParameterName] !== undefined),
  );
  if (notTaken.length > 0) {
    throw new SpeedbandError('tuning.parameterNotTaken', `${parameterNotTakenWords(rule, notTaken[0])}; remove it`, {
      details: { rule: rule.name, parameters: notTaken, takes: rule.parameters },
    });
  }
  const plantClass = plantClassOf(model);
  const declared = rule.plantClasses.includes(plantClass);
  let refusal: SpeedbandError;
  try {
    // Outside its declared classes a rule is still asked, so that its refusal says the specific reason.
    const result = rule.tune(model, parameters, context);
    if (declared) return result;
    refusal = new SpeedbandError(
      'tuning.ruleNotApplicable',
      `rule ${rule.name} does not apply to a ${describePlantClass(plantClass)}: it is written for ${rule.plantClasses.join(', ')} plants`,
      { details: { rule: rule.name, plantClass, reason: 'plant class' } },
    );
  } catch (error) {
    if (!isSpeedbandError(error) || error.code !== 'tuning.ruleNotApplicable') throw error;
    refusal = error;
  }
  const alternatives = applicableRules(model, parameters, context).filter((candidate) => candidate !== rule.name);
  const advice = alternatives.length > 0 ? `rules that apply: ${alternatives.join(', ')}` : 'no rule applies to this model with these parameters';
  throw new SpeedbandError('tuning.ruleNotApplicable', `${refusal.message} — ${advice}`, {
    details: { ...refusal.details, applicableRules: alternatives },
    cause: refusal,
  });
}
