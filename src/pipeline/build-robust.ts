/**
 * The build's robust half: the plan's variations as a set of vehicles around the check model (the robust check's, and
 * a fastest-passing search's on the worst case), and the robust check of the final table over them with the worst
 * time-domain figures at its breakpoints.
 */
import type { ControllerSettings } from '../controller/types.js';
import type { ModelsFile } from '../identify/models-schema.js';
import type { LoopSpecification } from '../loops/types.js';
import { resolveVariationSet } from '../robust/variation-set.js';
import { makeGainLookup } from '../schedule/interpolate.js';
import type { Plan } from '../schedule/plan.js';
import type { OverSpeed } from '../core/by-speed.js';
import type { AcceptanceThresholds } from '../schedule/types.js';
import type { PlanVariations } from '../schedule/plan-variations.js';
import type { RefineResult } from '../schedule/refine.js';
import type { BreakpointExtras } from '../schedule/schedule-file.js';
import type { ProgressCallback } from '../schedule/types.js';
import type { CheckModel } from './check-model.js';
import type { RobustContext } from './robust-analysis.js';
import { robustScheduleCheck, type RobustScheduleCheck } from './robust-schedule-check.js';
import { breakpointControl, type TimeDomainSettings } from './robust-time-domain.js';
import type { PidGains } from '../controller/types.js';
import type { BreakpointEvaluation, BreakpointEvaluator } from './breakpoint-evaluation.js';
import { worstCaseMarginsAt } from './robust-analysis.js';
import { robustSetpointWeights } from './robust-setpoint-weights.js';

/** The plan's variation set around the check model, with what the analysis at a speed needs; undefined without variations. */
export function planRobustContext(input: {
  readonly plan: Plan;
  readonly checkModel: CheckModel;
  readonly loop: LoopSpecification;
  readonly controller: ControllerSettings;
  readonly models: ModelsFile;
  readonly planFile: string | undefined;
}): RobustContext | undefined {
  const variations = input.plan.variations;
  if (variations === undefined) return undefined;
  return {
    model: input.checkModel,
    loop: input.loop,
    controller: input.controller,
    set: resolveVariationSet(variations, input.checkModel.summary, variations.fromIdentification ? input.models : null, input.planFile),
    search: variations.search,
  };
}

/** A breakpoint's nominal evaluation and what it takes to redo it under robust acceptance (withRobustWeights). */
export interface RobustWeightsInput {
  /** The breakpoint's evaluation on the nominal model. */
  readonly evaluation: BreakpointEvaluation;
  /** The breakpoint's speed, m/s. */
  readonly speed_mps: number;
  /** The breakpoint's gains. */
  readonly gains: PidGains;
  /** Evaluates a breakpoint on the nominal model (with given set-point weights). */
  readonly evaluate: BreakpointEvaluator;
  /** The model, loop, controller and the set of variations. */
  readonly context: RobustContext;
  /** The time-domain limits and the vehicle's and firmware's settings. */
  readonly settings: TimeDomainSettings;
}

/**
 * Under robust acceptance: a breakpoint's evaluation with its set-point weights lowered until the worst overshoot over
 * the set keeps the limit (robust-setpoint-weights.ts), evaluated again on the nominal model with them; unchanged
 * when the weights chosen there already do.
 */
export function withRobustWeights(input: RobustWeightsInput): BreakpointEvaluation {
  const { evaluation, speed_mps, gains, evaluate, context, settings } = input;
  if (evaluation.performance === null) return evaluation;
  const feedForward = evaluation.performanceLoop.feedForward;
  const control = {
    speed_mps,
    gains,
    setpointWeights: evaluation.performance.setpointWeights,
    feedForward: feedForward.gain,
    feedForwardLeadTime_s: feedForward.leadTime_s,
  };
  const kept = robustSetpointWeights(worstCaseMarginsAt(speed_mps, gains, context), control, context, settings).control.setpointWeights;
  return kept.proportional === control.setpointWeights.proportional ? evaluation : evaluate(speed_mps, gains, kept);
}

export interface OverVariationsInput {
  readonly plan: Plan;
  readonly variations: PlanVariations;
  readonly context: RobustContext;
  readonly refinement: RefineResult;
  readonly breakpointExtras: readonly BreakpointExtras[];
  readonly timeDomain: TimeDomainSettings;
  /** The plan's frequency-domain limits (src/schedule/acceptance-limits.ts). */
  readonly thresholds: OverSpeed<AcceptanceThresholds>;
  readonly onProgress: ProgressCallback;
  readonly progress: (text: string) => void;
}

/** The final table's robust check over the plan's variations, on the nominal check's grid (every core), with the worst time-domain figures at its breakpoints. */
export async function checkTableOverVariations(input: OverVariationsInput): Promise<RobustScheduleCheck> {
  const { plan, variations, context, refinement } = input;
  input.progress(`worst case over the variations: ${context.set.dimensions.length} varied parameters, ${refinement.check.points.length} speeds\n`);
  return robustScheduleCheck({
    acceptance: variations.acceptance,
    model: context.model,
    loop: context.loop,
    controller: context.controller,
    set: context.set,
    search: context.search,
    thresholds: input.thresholds,
    grid: refinement.check.points.map((point) => point.speed_mps),
    gainsAt: makeGainLookup(refinement.table, { interpolation: plan.interpolation, lowSpeedFloor_mps: plan.speeds.lowSpeedFloor_mps }),
    breakpointSpeeds: refinement.table.speeds_mps,
    timeDomain: {
      ...input.timeDomain,
      breakpoints: refinement.table.speeds_mps.map((speed_mps, k) => breakpointControl(speed_mps, refinement.table.gains[k], input.breakpointExtras[k])),
    },
    onProgress: input.onProgress,
  });
}
