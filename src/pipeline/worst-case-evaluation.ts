/**
 * A fastest-passing search aimed at the worst case (plan `rule.searchOn: "worst-case"`): a candidate passes when
 * it meets every limit on the nominal model (breakpoint-evaluation.ts) and in the worst case over the plan's
 * variations — the margins as the robust check finds them at that speed (robust-analysis.ts) and the time-domain
 * figures over the set with the feed-forward chosen on the nominal model and the set-point weights lowered for the
 * worst case (robust-setpoint-weights.ts): what the build then records and the robust check of the final table
 * finds at that breakpoint. The search over
 * the set runs only for candidates that pass on the nominal model (most of the ladder fails there, cheaply).
 */
import type { OverSpeed } from '../core/by-speed.js';
import { judgeRobust } from '../robust/robust-check.js';
import type { AcceptanceThresholds } from '../schedule/types.js';
import type { BreakpointEvaluator } from './breakpoint-evaluation.js';
import { worstCaseMarginsAt, type RobustContext } from './robust-analysis.js';
import type { TimeDomainSettings } from './robust-time-domain.js';
import { robustSetpointWeights } from './robust-setpoint-weights.js';
import { thresholdsWithRoom } from './fastest-passing.js';

/**
 * The worst case at a breakpoint must keep this far inside the frequency-domain limits (our choice, wider than the nominal
 * search's SEARCH_ROOM): between two breakpoints the gains are interpolated and the worst combination changes with speed,
 * so the worst case there can fall below both ends (parcel van, heading loop, ±10 % mass and ±20 % rear stiffness: by up
 * to 2.2° of phase margin with 1° of room).
 */
export const WORST_CASE_SEARCH_ROOM = { phaseMargin_deg: 3, gainMargin_dB: 1, peakFactor: 0.97, delayMarginFactor: 1.1 } as const;

/** The plan's limits moved inside by WORST_CASE_SEARCH_ROOM. */
export function worstCaseThresholds(thresholds: OverSpeed<AcceptanceThresholds>): OverSpeed<AcceptanceThresholds> {
  return thresholdsWithRoom(thresholds, WORST_CASE_SEARCH_ROOM);
}

export interface WorstCaseEvaluatorInput {
  /** The nominal evaluation (with the search's room). */
  readonly nominal: BreakpointEvaluator;
  readonly context: RobustContext;
  /** The plan's frequency-domain limits: the worst case must meet them with WORST_CASE_SEARCH_ROOM. */
  readonly thresholds: OverSpeed<AcceptanceThresholds>;
  readonly timeDomain: TimeDomainSettings;
}

/**
 * The nominal evaluation, with the limits the worst case breaks added as "worst case: …". Severity: 0 passes
 * both; a candidate that passes on the nominal model but not in the worst case ranks between 0 and 1 (n/(n + 1)
 * for n limits broken), ahead of every candidate that fails on the nominal model.
 */
export function makeWorstCaseEvaluator(input: WorstCaseEvaluatorInput): BreakpointEvaluator {
  const thresholds = worstCaseThresholds(input.thresholds);
  return (speed_mps, gains, setpointWeights) => {
    const nominal = input.nominal(speed_mps, gains, setpointWeights);
    if (nominal.severity > 0 || nominal.performance === null) return nominal;
    const point = worstCaseMarginsAt(speed_mps, gains, input.context);
    const marginFailures = judgeRobust(point, thresholds).map((failure) => failure.message);
    const control = {
      speed_mps,
      gains,
      setpointWeights: nominal.performance.setpointWeights,
      feedForward: nominal.performanceLoop.feedForward.gain,
      feedForwardLeadTime_s: nominal.performanceLoop.feedForward.leadTime_s,
    };
    // Gains whose worst margins already fail are not simulated: they cannot pass.
    const timeDomainFailures =
      marginFailures.length > 0 ? [] : (robustSetpointWeights(point, control, input.context, input.timeDomain).timeDomain?.failures ?? []);
    const failures = [...marginFailures, ...timeDomainFailures].map((message) => `worst case: ${message}`);
    return failures.length === 0 ? nominal : { ...nominal, failures, severity: failures.length / (failures.length + 1) };
  };
}
