/**
 * A plan's rule parameters at any speed. Each speed-varying parameter is written as one number, a
 * table over speed (linear between its speeds, end values held beyond them), or an expression in
 * speed_mps (src/core/speed-expression.ts: parsed once with mathjs, restricted scope). Expressions are
 * compiled when the lookup is made — so a plan's errors come before any tuning — and checked at every
 * speed they are evaluated at: every speed-varying parameter must be a positive number there.
 */
import { SpeedbandError } from '../core/errors.js';
import { quoted } from '../core/quote.js';
import { compileSpeedExpression, type ExpressionValue } from '../core/speed-expression.js';
import type { RuleParameters } from '../tuning/types.js';
import { planReferenceHint } from './plan-reference-path.js';
import type { PlanRuleParameters, SpeedVarying } from './plan.js';

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

/** A number or speed table at a speed (m/s): a table is linear between its speeds, its end values held beyond them. */
export function valueAtSpeed(value: number | { readonly speeds_mps: readonly number[]; readonly values: readonly number[] }, speed_mps: number): number {
  if (typeof value === 'number') return value;
  const { speeds_mps: speeds, values } = value;
  if (speed_mps <= speeds[0]) return values[0];
  const last = speeds.length - 1;
  if (speed_mps >= speeds[last]) return values[last];
  let k = 0;
  while (speeds[k + 1] < speed_mps) k += 1;
  const t = (speed_mps - speeds[k]) / (speeds[k + 1] - speeds[k]);
  return values[k] + t * (values[k + 1] - values[k]);
}

const shown = (value: number): string => String(Number(value.toPrecision(6)));

/**
 * Compile the plan's expressions and return the lookup. `file` names the plan in errors. Throws
 * `plan.invalid` at `/rule/parameters/NAME` for an expression outside the restricted scope or with a
 * syntax error (naming the character position); the lookup throws `plan.invalid` when an expression
 * gives anything but a positive finite number at a speed (naming the speed and the value).
 */
export async function makeRuleParameterLookup(parameters: PlanRuleParameters, file?: string): Promise<RuleParameterLookup> {
  const expressions = new Map<string, { readonly text: string; readonly evaluate: (speed_mps: number) => ExpressionValue }>();
  for (const name of SPEED_VARYING_PARAMETERS) {
    const text = parameters[name];
    if (typeof text !== 'string') continue;
    const compiled = await compileSpeedExpression(text);
    if (compiled.kind === 'refused') {
      const where = compiled.position === null ? '' : ` (at character ${compiled.position} of the expression)`;
      throw new SpeedbandError(
        'plan.invalid',
        `${name} ${quoted(text)}: ${compiled.reason}${where} — write a number, a table {"speeds_mps": […], "values": […]}, or an expression in speed_mps such as "max(15, 1.2 * speed_mps)"\n${planReferenceHint()}`,
        { location: { file, jsonPath: `/rule/parameters/${name}` }, details: { parameter: name, reason: compiled.reason, position: compiled.position } },
      );
    }
    expressions.set(name, { text, evaluate: compiled.evaluate });
  }
  return (speed_mps: number): RuleParameters => {
    const resolved: Record<string, number | string> = {};
    for (const [name, value] of Object.entries(parameters) as [string, SpeedVarying | string][]) {
      const expression = expressions.get(name);
      if (expression !== undefined) resolved[name] = checkedValue(name, expression.text, expression.evaluate(speed_mps), speed_mps, file);
      else resolved[name] = typeof value === 'string' ? value : valueAtSpeed(value, speed_mps);
    }
    return resolved as RuleParameters;
  };
}

function checkedValue(name: string, text: string, result: ExpressionValue, speed_mps: number, file: string | undefined): number {
  if (result.kind === 'number' && Number.isFinite(result.value) && result.value > 0) return result.value;
  const found = result.kind === 'number' ? shown(result.value) : result.found;
  throw new SpeedbandError(
    'plan.invalid',
    `${name} ${quoted(text)} gives ${found} at ${shown(speed_mps)} m/s — it must be a positive number at every speed the schedule is tuned at; change the expression (e.g. bound it with max(…, …))\n${planReferenceHint()}`,
    { location: { file, jsonPath: `/rule/parameters/${name}` }, details: { parameter: name, speed_mps, found } },
  );
}
