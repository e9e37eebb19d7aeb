import { SpeedbandError } from '../core/errors.js';
import { describePlantClass, plantClassOf } from './plant-class.js';
import type { DesignModel, RuleName } from './types.js';

/**
 * The typed error a rule throws when it cannot justify numbers for a model:
 * code `tuning.ruleNotApplicable`, details { rule, plantClass, reason }. The registry
 * (`applyRule`) adds the names of the rules that do apply.
 */
export function ruleNotApplicable(rule: RuleName, model: DesignModel, reason: string): SpeedbandError {
  const plantClass = plantClassOf(model);
  return new SpeedbandError('tuning.ruleNotApplicable', `rule ${rule} does not apply to this ${describePlantClass(plantClass)}: ${reason}`, {
    details: { rule, plantClass, reason },
  });
}
