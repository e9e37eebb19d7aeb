/**
 * A plan's acceptance limits as every check reads them: each limit one number, a table over speed (linear
 * between its speeds, the end values held beyond them) or — written as an expression in speed_mps — a table
 * of the expression's values at the plan's check speeds (the dense check's grid before refinement:
 * breakpoints, midpoints and the evenly spaced speeds), linear between them. The tables are plain data: the
 * checks on worker threads read the same limits, and schedule.json records exactly the limits every check
 * used, so a later check of the file judges as the build did. Every value is checked against the limit's
 * range (as the plan schema gives it) at every speed it is taken at; errors name the plan field.
 */
import type { NumberOverSpeed, OverSpeed } from '../core/by-speed.js';
import type { ScenarioLimits } from '../performance/scenario-limits.js';
import type { TimeDomainLimits } from '../performance/types.js';
import type { LoopKind } from '../loops/types.js';
import { checkGrid } from './grid.js';
import { planBreakpoints, type AcceptanceAtSpeed, type PartialPlan, type Plan } from './plan.js';
import { compileSpeedVarying, POSITIVE, type ValueRange } from './speed-varying.js';
import type { AcceptanceThresholds } from './types.js';

const AT_LEAST_ONE: ValueRange = { words: 'a number of at least 1', holds: (value) => value >= 1 };
const NOT_NEGATIVE: ValueRange = { words: 'a number of at least 0', holds: (value) => value >= 0 };

/** The range of each limit (as the plan schema states it for a number). */
export const ACCEPTANCE_RANGES: Readonly<Record<keyof AcceptanceAtSpeed, ValueRange>> = {
  maximumLowerGainMargin_dB: { words: 'a number of at most 0 dB', holds: (value) => value <= 0 },
  minimumUpperGainMargin_dB: NOT_NEGATIVE,
  minimumPhaseMargin_deg: { words: 'a number from 0° to 180°', holds: (value) => value >= 0 && value <= 180 },
  maximumSensitivityPeak: AT_LEAST_ONE,
  maximumComplementarySensitivityPeak: AT_LEAST_ONE,
  delayMarginRoom_s: NOT_NEGATIVE,
  maximumOvershoot_pct: NOT_NEGATIVE,
  maximumRecoveryTime_s: POSITIVE,
  maximumLaneChangeError_m: POSITIVE,
  maximumCurveEntryError_m: POSITIVE,
  maximumSpeedChangeError_m: POSITIVE,
  maximumSpeedChangeError_rad: POSITIVE,
  maximumSpeedChangeError_radps: POSITIVE,
};

/** The limits every check reads: the dense check's, the time-domain figures' and the scenarios'. */
export interface AcceptanceLimits {
  readonly thresholds: OverSpeed<AcceptanceThresholds>;
  readonly timeDomain: OverSpeed<TimeDomainLimits>;
  readonly scenarios: OverSpeed<ScenarioLimits>;
}

/** The speeds an expression is evaluated at: the plan's dense-check grid before refinement, m/s. */
export function limitSampleSpeeds(plan: Plan): number[] {
  return Array.from(checkGrid(planBreakpoints(plan), plan.speeds, plan.check.gridSpeeds));
}

/**
 * The plan's acceptance limits, expressions made tables at limitSampleSpeeds(plan). `file` names the plan in
 * errors (plan.invalid at /acceptance/NAME: an expression outside the restricted scope, or a value outside the
 * limit's range at a speed). Loads mathjs only when the plan writes an expression.
 */
export async function acceptanceLimits(plan: Plan, file?: string): Promise<AcceptanceLimits> {
  const written = plan.acceptance;
  const needsSpeeds = Object.values(written).some((value) => typeof value === 'string');
  const speeds = needsSpeeds ? limitSampleSpeeds(plan) : [];
  const resolved: Record<string, NumberOverSpeed> = {};
  for (const name of Object.keys(ACCEPTANCE_RANGES) as (keyof AcceptanceAtSpeed)[]) {
    const value = written[name];
    const place = { name, jsonPath: `/acceptance/${name}`, ...(file === undefined ? {} : { file }) };
    const at = await compileSpeedVarying(value, ACCEPTANCE_RANGES[name], place);
    // Numbers and tables are kept as written (checked at their own speeds); expressions become tables.
    if (typeof value === 'number') resolved[name] = at(0);
    else if (typeof value === 'object') resolved[name] = { speeds_mps: value.speeds_mps, values: value.speeds_mps.map(at) };
    else resolved[name] = { speeds_mps: speeds, values: speeds.map(at) };
  }
  return limitsFromResolved(resolved as OverSpeed<AcceptanceAtSpeed>, plan);
}

/**
 * Compile a written plan's acceptance expressions without evaluating them: an expression outside the restricted
 * scope or with a syntax error is refused at once (plan.invalid at /acceptance/NAME), before any log is read; its
 * values are checked when the limits are read at the check speeds (acceptanceLimits).
 */
export async function compileAcceptanceExpressions(plan: PartialPlan, file?: string): Promise<void> {
  for (const [name, value] of Object.entries(plan.acceptance ?? {})) {
    if (typeof value !== 'string') continue;
    await compileSpeedVarying(value, ACCEPTANCE_RANGES[name as keyof AcceptanceAtSpeed], {
      name,
      jsonPath: `/acceptance/${name}`,
      ...(file === undefined ? {} : { file }),
    });
  }
}

/**
 * The limits of a plan whose acceptance section holds numbers and tables only (no expression) — for callers
 * that cannot wait for mathjs: a library caller with a plan of numbers, or a test. Throws on an expression.
 */
export function numericAcceptanceLimits(plan: Plan): AcceptanceLimits {
  for (const [name, value] of Object.entries(plan.acceptance)) {
    if (typeof value === 'string') throw new Error(`acceptance.${name} is an expression: read the limits with acceptanceLimits (async)`);
  }
  return limitsFromResolved(plan.acceptance as OverSpeed<AcceptanceAtSpeed>, plan);
}

/** A number or table with `offset` added to every value. */
function shifted(value: NumberOverSpeed, offset: number): NumberOverSpeed {
  return typeof value === 'number' ? offset + value : { speeds_mps: value.speeds_mps, values: value.values.map((v) => offset + v) };
}

const SPEED_CHANGE_LIMIT: Readonly<Record<LoopKind, keyof AcceptanceAtSpeed>> = {
  path: 'maximumSpeedChangeError_m',
  heading: 'maximumSpeedChangeError_rad',
  'yaw-rate': 'maximumSpeedChangeError_radps',
};

/**
 * Required delay margin, s: computationLatency_s + sampleTime_s/2 (zero-order hold, docs/domain.md §5) +
 * delayMarginRoom_s. The scenarios' speed-change limit is the one in the loop's unit.
 */
function limitsFromResolved(a: OverSpeed<AcceptanceAtSpeed>, plan: Plan): AcceptanceLimits {
  const { controller } = plan;
  const timeDomain: OverSpeed<TimeDomainLimits> = {
    maximumOvershoot_pct: a.maximumOvershoot_pct,
    maximumRecoveryTime_s: a.maximumRecoveryTime_s,
    maximumLaneChangeError_m: a.maximumLaneChangeError_m,
    maximumCurveEntryError_m: a.maximumCurveEntryError_m,
  };
  return {
    thresholds: {
      maximumLowerGainMargin_dB: a.maximumLowerGainMargin_dB,
      minimumUpperGainMargin_dB: a.minimumUpperGainMargin_dB,
      minimumPhaseMargin_deg: a.minimumPhaseMargin_deg,
      maximumSensitivityPeak: a.maximumSensitivityPeak,
      maximumComplementarySensitivityPeak: a.maximumComplementarySensitivityPeak,
      minimumDelayMargin_s: shifted(a.delayMarginRoom_s, controller.computationLatency_s + controller.sampleTime_s / 2),
    },
    timeDomain,
    scenarios: { ...timeDomain, maximumSpeedChangeError: a[SPEED_CHANGE_LIMIT[plan.loop.kind]] },
  };
}
