/**
 * The scenario limits: what a run of a scenario (scenario-run.ts) must show for a schedule to pass. Sources:
 * a sustained oscillation fails every scenario (common practice: a steering loop must come to rest); the
 * small step keeps the overshoot limit and both steps settle within the run; a misalignment, a lateral force
 * and an initial offset are removed within the recovery limit; the path loop's lane change keeps the
 * lane-change limit (the plan's time-domain limits, PLAN_DEFAULTS); a speed change through the range keeps
 * the error within maximumSpeedChangeError (the plan's, in the loop's unit).
 */
import type { LoopKind } from '../loops/types.js';
import { RANGE_SCENARIOS, type ScenarioName } from './scenario-catalogue.js';
import type { ScenarioMetrics } from './scenario-metrics.js';
import type { TimeDomainLimits } from './types.js';
import { atSpeed, valueAtSpeed, type OverSpeed } from '../core/by-speed.js';
import type { ScenarioTraces } from './scenario-simulation.js';
import { firstJudgedSample } from './scenario-metrics.js';
import type { ScenarioRun } from './scenario-run.js';

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

/** A run to judge: the scenario, its speed (the initial speed of a speed change), its metrics and, for a speed change, its traces. */
export interface JudgedRun {
  readonly scenario: ScenarioName;
  readonly speed_mps: number;
  readonly metrics: ScenarioMetrics;
  /** A speed change's traces from the time it is judged from: a speed-change limit that varies with speed is judged sample by sample on them. */
  readonly traces?: Pick<ScenarioTraces, 'speed_mps' | 'error'>;
  /** The first sample judged (the scenario's judgeFrom_s over the sample time). */
  readonly judgedFrom?: number;
}

/** A scenario run (scenario-run.ts) at `speed_mps`, as judgeScenarioRun takes it. */
export function judgedRun(run: Pick<ScenarioRun, 'scenario' | 'traces' | 'metrics'>, speed_mps: number): JudgedRun {
  const judged = { scenario: run.scenario.name, speed_mps, metrics: run.metrics };
  if (!RANGE_SCENARIOS.includes(run.scenario.name)) return judged;
  // Only a speed change keeps traces (its speed and error): the record may cross to another thread.
  const traces = { speed_mps: run.traces.speed_mps, error: run.traces.error };
  return { ...judged, traces, judgedFrom: firstJudgedSample(run.scenario, run.traces) };
}

/**
 * The limits a run broke (empty: within every limit). Limits that vary with speed are read at the run's speed;
 * while the speed changes, the error at each sample is held to the speed-change limit at that sample's speed.
 */
export function judgeScenarioRun(run: JudgedRun, limitsOverSpeed: OverSpeed<ScenarioLimits>, loop: LoopKind): ScenarioFailure[] {
  const { scenario, speed_mps, metrics } = run;
  const limits = atSpeed(limitsOverSpeed, speed_mps);
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
    case 'braking-in-curve': {
      const limit = limitsOverSpeed.maximumSpeedChangeError;
      if (typeof limit === 'number') {
        if (metrics.peakError > limit) fail('peakError', `error ${shown(metrics.peakError)} ${unit} while the speed changes, needs ≤ ${shown(limit)} ${unit}`);
        break;
      }
      if (run.traces === undefined) throw new Error(`judgeScenarioRun: ${scenario} with a speed-change limit that varies with speed needs the run's traces`);
      const worst = worstAgainstLimit(run.traces, run.judgedFrom ?? 0, (speed) => valueAtSpeed(limit, speed));
      if (worst !== null && worst.ratio > 1) {
        fail(
          'peakError',
          `error ${shown(worst.error)} ${unit} at ${worst.speed_mps.toFixed(2)} m/s while the speed changes, needs ≤ ${shown(worst.limit)} ${unit} there`,
        );
      }
      break;
    }
  }
  return failures;
}

/** The sample where |error| is largest against the limit at its speed (from sample `from` on); null when there is none. */
function worstAgainstLimit(
  traces: Pick<ScenarioTraces, 'speed_mps' | 'error'>,
  from: number,
  limitAt: (speed_mps: number) => number,
): { ratio: number; error: number; limit: number; speed_mps: number } | null {
  let worst: { ratio: number; error: number; limit: number; speed_mps: number } | null = null;
  for (let k = from; k < traces.error.length; k++) {
    const limit = limitAt(traces.speed_mps[k]);
    const error = Math.abs(traces.error[k]);
    const ratio = error / limit;
    if (worst === null || ratio > worst.ratio) worst = { ratio, error, limit, speed_mps: traces.speed_mps[k] };
  }
  return worst;
}
