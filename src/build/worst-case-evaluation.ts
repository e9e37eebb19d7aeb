/**
 * A fastest-passing search aimed at the worst case (plan `rule.searchOn: "worst-case"`): a candidate passes when
 * it meets every limit on the nominal model (breakpoint-evaluation.ts) and in the worst case over the plan's
 * variations — the margins as the robust check finds them at that speed (robust-analysis.ts) and the time-domain
 * figures over the set with the set-point weights and feed-forward chosen on the nominal model
 * (robust-time-domain.ts): what the robust check of the final table then finds at that breakpoint. The search over
 * the set runs only for candidates that pass on the nominal model (most of the ladder fails there, cheaply).
 */
import { judgeRobust } from '../robust/robust-check.js';
import type { AcceptanceThresholds } from '../schedule/types.js';
import type { BreakpointEvaluator } from './breakpoint-evaluation.js';
import { worstCaseMarginsAt, type RobustContext } from './robust-analysis.js';
import { worstTimeDomainAt, type TimeDomainSettings } from './robust-time-domain.js';

export interface WorstCaseEvaluatorInput {
  /** The nominal evaluation (with the search's room). */
  readonly nominal: BreakpointEvaluator;
  readonly context: RobustContext;
  /** The frequency-domain limits the worst case must meet (the search's, with its room). */
  readonly thresholds: AcceptanceThresholds;
  readonly timeDomain: TimeDomainSettings;
}

/**
 * The nominal evaluation, with the limits the worst case breaks added as "worst case: …". Severity: 0 passes
 * both; a candidate that passes on the nominal model but not in the worst case ranks between 0 and 1 (n/(n + 1)
 * for n limits broken), ahead of every candidate that fails on the nominal model.
 */
export function makeWorstCaseEvaluator(input: WorstCaseEvaluatorInput): BreakpointEvaluator {
  return (speed_mps, gains, setpointWeights) => {
    const nominal = input.nominal(speed_mps, gains, setpointWeights);
    if (nominal.severity > 0 || nominal.performance === null) return nominal;
    const point = worstCaseMarginsAt(speed_mps, gains, input.context);
    const marginFailures = judgeRobust(point, input.thresholds).map((failure) => failure.message);
    const control = {
      speed_mps,
      gains,
      setpointWeights: nominal.performance.setpointWeights,
      feedForward: nominal.performanceLoop.feedForward.gain,
      feedForwardLeadTime_s: nominal.performanceLoop.feedForward.leadTime_s,
    };
    // Gains whose worst margins already fail are not simulated: they cannot pass.
    const timeDomainFailures = marginFailures.length > 0 ? [] : (worstTimeDomainAt(point, control, input.context, input.timeDomain)?.failures ?? []);
    const failures = [...marginFailures, ...timeDomainFailures].map((message) => `worst case: ${message}`);
    return failures.length === 0 ? nominal : { ...nominal, failures, severity: failures.length / (failures.length + 1) };
  };
}
