/**
 * The scenario limits: what a run of a scenario (scenario-run.ts) must show for a schedule to pass. Sources:
 * a sustained oscillation fails every scenario (common practice: a steering loop must come to rest); the
 * small step keeps the overshoot limit and both steps settle within the run; a misalignment, a lateral force
 * and an initial offset are removed within the recovery limit; the path loop's lane change keeps the
 * lane-change limit (the plan's time-domain limits, PLAN_DEFAULTS); a speed change through the range keeps
 * the error within maximumSpeedChangeError (the plan's, in the loop's unit).
 */
import type { LoopKind } from '../loops/types.js';
import type { ScenarioName } from './scenario-catalogue.js';
import type { ScenarioMetrics } from './scenario-metrics.js';
import type { TimeDomainLimits } from './types.js';

/** The limits scenarios are judged against: the plan's time-domain limits and the speed-change error limit of the loop. */
export interface ScenarioLimits extends TimeDomainLimits {
  /** Largest error while the speed changes through the range, in the loop's unit (m, rad or rad/s). */
  readonly maximumSpeedChangeError: number;
}

/** One limit a run broke. */
export interface ScenarioFailure {
  readonly speed_mps: number;
  readonly scenario: ScenarioName;
  /** The metric (a ScenarioMetrics key). */
  readonly metric: keyof ScenarioMetrics;
  readonly message: string;
}

export const LOOP_UNITS: Readonly<Record<LoopKind, string>> = { heading: 'rad', 'yaw-rate': 'rad/s', path: 'm' };

const shown = (value: number): string => String(Number(value.toPrecision(3)));

/** A scenario run to judge: what ran, at which speed, its metrics, and the limits. */
export interface ScenarioJudgement {
  /** The scenario that ran. */
  readonly scenario: ScenarioName;
  /** The speed the run started at, m/s (named in every failure). */
  readonly speed_mps: number;
  /** The run's metrics (scenario-metrics.ts). */
  readonly metrics: ScenarioMetrics;
  /** The plan's acceptance limits of the scenarios. */
  readonly limits: ScenarioLimits;
  /** The loop the firmware closes: the unit of the error, and which limits apply. */
  readonly loop: LoopKind;
}

/** The limits a run of `scenario` at `speed_mps` broke (empty: within every limit). */
export function judgeScenarioRun(run: ScenarioJudgement): ScenarioFailure[] {
  const { scenario, speed_mps, metrics, limits, loop } = run;
  const failures: ScenarioFailure[] = [];
  const unit = LOOP_UNITS[loop];
  const fail = (metric: keyof ScenarioMetrics, what: string): void => {
    failures.push({ speed_mps, scenario, metric, message: `${scenario} at ${speed_mps.toFixed(2)} m/s: ${what}` });
  };
  if (metrics.limitCycle !== null) {
    fail('limitCycle', `sustained oscillation ±${shown(metrics.limitCycle.amplitude)} ${unit}, period ${shown(metrics.limitCycle.period_s)} s (a limit cycle)`);
  }
  const settles = (limit_s: number | null, what: string): void => {
    if (metrics.settlingTime_s === null) fail('settlingTime_s', `${what} not within the simulated time`);
    else if (limit_s !== null && metrics.settlingTime_s > limit_s)
      fail('settlingTime_s', `${what} in ${shown(metrics.settlingTime_s)} s, needs ≤ ${shown(limit_s)} s`);
  };
  switch (scenario) {
    case 'small-step':
      if (metrics.overshoot_pct !== null && metrics.overshoot_pct > limits.maximumOvershoot_pct) {
        fail('overshoot_pct', `overshoot ${shown(metrics.overshoot_pct)} %, needs ≤ ${shown(limits.maximumOvershoot_pct)} %`);
      }
      settles(null, 'settles to 2 %');
      break;
    case 'large-step':
      if (loop === 'heading' && metrics.overshoot_pct !== null && metrics.overshoot_pct > limits.maximumOvershoot_pct) {
        fail('overshoot_pct', `overshoot ${shown(metrics.overshoot_pct)} % through the steering limits, needs ≤ ${shown(limits.maximumOvershoot_pct)} %`);
      }
      settles(null, 'settles to 2 %');
      break;
    case 'initial-offset':
    case 'misalignment':
    case 'side-force':
      settles(limits.maximumRecoveryTime_s, 'removed to 5 %');
      break;
    case 'lane-change':
      if (loop === 'path' && metrics.peakError > limits.maximumLaneChangeError_m) {
        fail('peakError', `error ${shown(metrics.peakError)} m, needs ≤ ${shown(limits.maximumLaneChangeError_m)} m`);
      }
      break;
    case 'curve-entry':
      break;
    case 'speed-ramp-in-curve':
    case 'braking-in-curve':
      if (metrics.peakError > limits.maximumSpeedChangeError) {
        fail('peakError', `error ${shown(metrics.peakError)} ${unit} while the speed changes, needs ≤ ${shown(limits.maximumSpeedChangeError)} ${unit}`);
      }
      break;
  }
  return failures;
}
