/**
 * The robust analysis at one speed: the dense check's loop analysis (loop-analysis.ts) of every vehicle the
 * search visits in the variation set, and the worst figures over them (src/robust/worst-case.ts). The
 * entry point for anything that needs the worst case of some gains at a speed — the robust check, the
 * baseline and compare after a change, and a tuning setting that targets the worst case.
 */
import type { OverSpeed } from '../core/by-speed.js';
import type { ControllerSettings, PidGains } from '../controller/types.js';
import type { LoopSpecification } from '../loops/types.js';
import type { AnalyseOverSet, RobustMargins, RobustSearchSettings, VariationSet } from '../robust/types.js';
import { weakestParameter, type WeakestParameter } from '../robust/weakest-parameter.js';
import type { AcceptanceThresholds } from '../schedule/types.js';
import type { LoopMargins } from '../verify/types.js';
import { operatingPointWith } from '../robust/variation-set.js';
import { worstCaseOverSet } from '../robust/worst-case.js';
import type { CheckModel } from './check-model.js';
import { analyseOperatingPoint } from './loop-analysis.js';

/** Everything the robust analysis needs besides the speed and the gains. */
export interface RobustContext {
  readonly model: CheckModel;
  readonly loop: LoopSpecification;
  readonly controller: ControllerSettings;
  readonly set: VariationSet;
  readonly search: RobustSearchSettings;
}

/**
 * Worst lower and upper gain margin, phase margin, delay margin, Ms and Mt of `gains` at `speed_mps` over
 * the set, each with the combination that gives it, beside the nominal figures; or the combination whose
 * loop is not stable. Deterministic; each call is independent of any other.
 */
export function worstCaseMarginsAt(speed_mps: number, gains: PidGains, context: RobustContext): RobustMargins {
  const found = worstCaseOverSet({ set: context.set, search: context.search, analyse: analysisWithChanges(speed_mps, gains, context) });
  return { speed_mps, gains, ...found };
}

/** worstCaseMarginsAt as a (speed_mps, gains) → RobustMargins function, as the checks take it. */
export function makeRobustAnalysis(context: RobustContext): AnalyseOverSet {
  return (speed_mps, gains) => worstCaseMarginsAt(speed_mps, gains, context);
}

/** The loop at `speed_mps` under `gains` with the set's changes `values` (one per dimension, in order): the analysis the search runs. */
export function analysisWithChanges(
  speed_mps: number,
  gains: PidGains,
  context: RobustContext,
): (values: readonly number[], scope?: 'full' | 'figures') => LoopMargins {
  const base = context.model.modelAt(speed_mps);
  return (values, scope = 'full') =>
    analyseOperatingPoint({
      operatingPoint: operatingPointWith(base, context.set, values),
      loop: context.loop,
      controller: context.controller,
      speed_mps,
      gains,
      scope,
    });
}

/** The weakest parameter at a robust point (src/robust/weakest-parameter.ts), its trials analysed in full. */
export function weakestParameterAt(point: RobustMargins, thresholds: OverSpeed<AcceptanceThresholds>, context: RobustContext): WeakestParameter | null {
  return weakestParameter(point, thresholds, context.set, analysisWithChanges(point.speed_mps, point.gains, context));
}
