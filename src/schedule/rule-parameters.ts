/**
 * A plan's rule parameters at any speed. Each speed-varying parameter is written as one number, a
 * table over speed (linear between its speeds, end values held beyond them), or an expression in
 * speed_mps (src/core/speed-expression.ts: parsed once with mathjs, restricted scope). Expressions are
 * compiled when the lookup is made — so a plan's errors come before any tuning — and checked at every
 * speed they are evaluated at: every speed-varying parameter must be a positive number there.
 */
import type { RuleParameters } from '../tuning/types.js';
import type { PlanRuleParameters, SpeedVarying } from './plan.js';
import { compileSpeedVarying, POSITIVE } from './speed-varying.js';

export { valueAtSpeed } from '../core/by-speed.js';

/** The rule parameters that may vary with speed (the plan schema's speedVarying fields); all must be positive. */
export const SPEED_VARYING_PARAMETERS = [
  'closedLoopTimeConstant_s',
  'simcClosedLoopTimeConstant_s',
  'dampingRatio',
  'naturalFrequency_radps',
  'settlingDistance_m',
  'integralPoleRatio',
  'sensitivityPeakTarget',
  'phaseMarginTarget_deg',
] as const;
export type SpeedVaryingParameter = (typeof SPEED_VARYING_PARAMETERS)[number];

/** The rule's parameters at a speed (m/s), for src/tuning (RuleParameters): only those the plan gives. */
export type RuleParameterLookup = (speed_mps: number) => RuleParameters;

/**
 * Compile the plan's expressions and return the lookup. `file` names the plan in errors. Throws
 * `plan.invalid` at `/rule/parameters/NAME` for an expression outside the restricted scope or with a
 * syntax error (naming the character position); the lookup throws `plan.invalid` when a value is anything
 * but a positive finite number at a speed (naming the speed and the value). speed-varying.ts does both.
 */
export async function makeRuleParameterLookup(parameters: PlanRuleParameters, file?: string): Promise<RuleParameterLookup> {
  const varying = new Map<string, (speed_mps: number) => number>();
  for (const name of SPEED_VARYING_PARAMETERS) {
    const value = parameters[name];
    if (value === undefined) continue;
    varying.set(name, await compileSpeedVarying(value, POSITIVE, { name, jsonPath: `/rule/parameters/${name}`, ...(file === undefined ? {} : { file }) }));
  }
  return (speed_mps: number): RuleParameters => {
    const resolved: Record<string, number | string> = {};
    for (const [name, value] of Object.entries(parameters) as [string, SpeedVarying][]) {
      const at = varying.get(name);
      resolved[name] = at === undefined ? (value as string) : at(speed_mps);
    }
    return resolved as RuleParameters;
  };
}
