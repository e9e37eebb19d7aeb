/**
 * Everything a build judges at one speed for one set of gains: the exact loop analysis of the dense check
 * (loop-analysis.ts) against the frequency-domain limits, and — when the loop is stable — the time-domain
 * figures of the exact sampled closed loop with the set-point weights chosen for the overshoot limit
 * (src/performance) against the time-domain limits. The fastest-passing search and the schedule's
 * breakpoint records both come from here, so what is searched for is what is recorded.
 */
import type { AntiWindup } from '../controller/firmware-step.js';
import type { ControllerSettings, PidGains } from '../controller/types.js';
import type { LoopSpecification } from '../loops/types.js';
import { breakpointPerformance, type BreakpointPerformance, type SetpointWeights } from '../performance/breakpoint-performance.js';
import { performanceLoopAt, type PerformanceLoop } from '../performance/loop-at-speed.js';
import type { TimeDomainLimits } from '../performance/types.js';
import { atSpeed, type OverSpeed } from '../core/by-speed.js';
import { breakpointScenarioFailures } from '../performance/breakpoint-scenarios.js';
import type { ScenarioFailure, ScenarioLimits } from '../performance/scenario-limits.js';
import type { ScenarioName } from '../performance/scenario-catalogue.js';
import { judgeMargins } from '../schedule/dense-check.js';
import type { AcceptanceThresholds, AnalyseLoop, CheckFailure } from '../schedule/types.js';
import type { LoopMargins } from '../verify/types.js';
import type { CheckModel } from './check-model.js';
import { makeLoopAnalysis } from './loop-analysis.js';

export interface BreakpointEvaluation {
  readonly margins: LoopMargins;
  readonly marginFailures: readonly CheckFailure[];
  /** Null when the loop is not stable. */
  readonly performance: BreakpointPerformance | null;
  readonly performanceLoop: PerformanceLoop;
  /** The scenarios' broken limits at this speed (empty when they pass or were not run). */
  readonly scenarioFailures: readonly ScenarioFailure[];
  /** Every limit broken, in words (margins first). */
  readonly failures: readonly string[];
  /** How far from passing: 0 passes; Infinity when not stable; else the number of limits broken (+1000 when figures were skipped). */
  readonly severity: number;
}

export interface BreakpointEvaluatorInput {
  readonly model: CheckModel;
  readonly loop: LoopSpecification;
  readonly controller: ControllerSettings;
  /** Limits as numbers or tables over speed (src/schedule/acceptance-limits.ts), read at the breakpoint's speed. */
  readonly thresholds: OverSpeed<AcceptanceThresholds>;
  readonly limits: OverSpeed<TimeDomainLimits>;
  readonly vehicleLimits: { readonly maxSteerAngle_rad: number; readonly maxSteerRate_radps: number };
  readonly antiWindup: AntiWindup;
  /** The dense check's analysis (made here when absent). */
  readonly analyse?: AnalyseLoop;
  /** A search's shortcut: no time-domain figures for gains that already break a frequency-domain limit (nor scenarios for gains that break any limit). */
  readonly skipFiguresWhenMarginsFail?: boolean;
  /** Run the per-speed scenarios (single-track model only) against these limits over this speed range. */
  readonly scenarios?: {
    readonly limits: OverSpeed<ScenarioLimits>;
    readonly range: { readonly minimum_mps: number; readonly maximum_mps: number };
    /** Which (default: every per-speed scenario). */
    readonly names?: readonly ScenarioName[];
  };
}

/** Severity offset of gains breaking a frequency-domain limit when their time-domain figures are skipped. */
const MARGIN_FAILURE_RANK = 1000;

export type BreakpointEvaluator = (speed_mps: number, gains: PidGains, setpointWeights?: SetpointWeights) => BreakpointEvaluation;

export function makeBreakpointEvaluator(input: BreakpointEvaluatorInput): BreakpointEvaluator {
  const analyse = input.analyse ?? makeLoopAnalysis(input.model, input.loop, input.controller);
  const loops = new Map<number, PerformanceLoop>();
  return (speed_mps, gains, setpointWeights) => {
    let performanceLoop = loops.get(speed_mps);
    if (performanceLoop === undefined) {
      performanceLoop = performanceLoopAt(input.model.modelAt(speed_mps), input.loop, speed_mps, input.controller);
      loops.set(speed_mps, performanceLoop);
    }
    const margins = analyse(speed_mps, gains);
    const marginFailures = judgeMargins(margins, atSpeed(input.thresholds, speed_mps));
    if (!margins.stable) {
      return {
        margins,
        marginFailures,
        performance: null,
        performanceLoop,
        scenarioFailures: [],
        failures: marginFailures.map((f) => f.message),
        severity: Number.POSITIVE_INFINITY,
      };
    }
    if (input.skipFiguresWhenMarginsFail === true && marginFailures.length > 0) {
      // Ranked behind every set of gains within the margins, whatever its time-domain figures.
      return {
        margins,
        marginFailures,
        performance: null,
        performanceLoop,
        scenarioFailures: [],
        failures: marginFailures.map((f) => f.message),
        severity: MARGIN_FAILURE_RANK + marginFailures.length,
      };
    }
    const performance = breakpointPerformance({
      loop: performanceLoop,
      gains,
      limits: atSpeed(input.limits, speed_mps),
      vehicleLimits: input.vehicleLimits,
      antiWindup: input.antiWindup,
      slowestTimeConstant_s: margins.analysis?.sampledDataSlowestTimeConstant_s ?? null,
      ...(setpointWeights === undefined ? {} : { setpointWeights }),
    });
    const before = [...marginFailures.map((f) => f.message), ...performance.failures];
    const model = input.model.modelAt(speed_mps);
    const scenarioFailures =
      input.scenarios !== undefined && model.kind === 'single-track' && (input.skipFiguresWhenMarginsFail !== true || before.length === 0)
        ? breakpointScenarioFailures({
            parameters: model.parameters,
            vehicleLimits: input.vehicleLimits,
            loop: input.loop,
            settings: {
              ...input.controller,
              antiWindup: input.antiWindup,
              commandLimit_rad: input.vehicleLimits.maxSteerAngle_rad,
              integratorClamp_rad: input.vehicleLimits.maxSteerAngle_rad,
            },
            gains: {
              ...gains,
              setpointWeightProportional: performance.setpointWeights.proportional,
              setpointWeightDerivative: performance.setpointWeights.derivative,
              feedForward: performanceLoop.feedForward.gain,
            },
            feedForwardLeadTime_s: performanceLoop.feedForward.leadTime_s,
            speed_mps,
            range: input.scenarios.range,
            limits: atSpeed(input.scenarios.limits, speed_mps),
            scenarios: input.scenarios.names,
          })
        : [];
    const failures = [...before, ...scenarioFailures.map((f) => f.message)];
    return { margins, marginFailures, performance, performanceLoop, scenarioFailures, failures, severity: failures.length };
  };
}
