/** What a scenario run shows a test driver, from its traces (scenario-simulation.ts). */
import { SCENARIO_DEFAULTS } from './defaults.js';
import { peakMagnitude, settlingTime_s } from './figures.js';
import { detectLimitCycle, type LimitCycle } from './limit-cycle.js';
import type { PreparedScenario } from './scenario-catalogue.js';
import type { ScenarioTraces } from './scenario-simulation.js';

/** The figures of one simulated run (loop units and SI units in the names). */
export interface ScenarioMetrics {
  /** Largest |error| from the start of the manoeuvre, loop unit. */
  readonly peakError: number;
  /** Error at the end of the run, loop unit. */
  readonly finalError: number;
  /** Reference steps: overshoot, % of the step (0 when none); null for other scenarios. */
  readonly overshoot_pct: number | null;
  /**
   * Time from the start of the manoeuvre until the error stays within 2 % of a step, or within 5 % of its peak
   * for a disturbance or manoeuvre (for a misalignment: the time to remove it), s; null when it does not
   * within the run.
   */
  readonly settlingTime_s: number | null;
  /** The distance travelled in that time, m. */
  readonly settlingDistance_m: number | null;
  readonly peakSteerAngle_rad: number;
  readonly peakSteerRate_radps: number;
  readonly timeAtAngleLimit_s: number;
  readonly timeAtRateLimit_s: number;
  readonly peakLateralAcceleration_mps2: number;
  /** A sustained oscillation of the error in the last part of the run (limit-cycle.ts), or null. */
  readonly limitCycle: LimitCycle | null;
}

/** Smallest limit-cycle amplitude that counts, as a fraction of the run's peak error (our choice). */
const LIMIT_CYCLE_FLOOR = 1e-3;

/** The first sample a run is judged from (the scenario's judgeFrom_s, in samples). */
export function firstJudgedSample(scenario: Pick<PreparedScenario, 'judgeFrom_s'>, traces: Pick<ScenarioTraces, 'time_s'>): number {
  const ts = traces.time_s.length > 1 ? traces.time_s[1] - traces.time_s[0] : 1;
  return Math.min(traces.time_s.length - 1, Math.round(scenario.judgeFrom_s / ts));
}

/** The figures of one simulated run: peak and final error, overshoot, settling time and distance, steering at its limits, lateral acceleration, limit cycle. */
export function scenarioMetrics(scenario: PreparedScenario, traces: ScenarioTraces): ScenarioMetrics {
  const ts = traces.time_s.length > 1 ? traces.time_s[1] - traces.time_s[0] : 1;
  const start = firstJudgedSample(scenario, traces);
  const error = traces.error;
  const peakError = peakMagnitude(error, start);
  let overshoot: number | null = null;
  let band: number;
  if (scenario.kind === 'step') {
    let most = Number.NEGATIVE_INFINITY;
    for (let k = start; k < error.length; k++) most = Math.max(most, 1 - error[k] / scenario.size);
    overshoot = Math.max(0, 100 * (most - 1));
    band = SCENARIO_DEFAULTS.settlingBand * Math.abs(scenario.size);
  } else {
    band = SCENARIO_DEFAULTS.recoveryBand * peakError;
  }
  const settling = peakError === 0 ? 0 : settlingTime_s({ signal: error, target: 0, band, sampleTime_s: ts, start });
  return {
    peakError,
    finalError: error[error.length - 1],
    overshoot_pct: overshoot,
    settlingTime_s: settling,
    settlingDistance_m: settling === null ? null : traces.distance_m[Math.min(error.length - 1, start + Math.round(settling / ts))] - traces.distance_m[start],
    peakSteerAngle_rad: peakMagnitude(traces.steerAngle_rad),
    peakSteerRate_radps: traces.peakSteerRate_radps,
    timeAtAngleLimit_s: traces.timeAtAngleLimit_s,
    timeAtRateLimit_s: traces.timeAtRateLimit_s,
    peakLateralAcceleration_mps2: peakMagnitude(traces.lateralAcceleration_mps2),
    limitCycle: detectLimitCycle(error, ts, LIMIT_CYCLE_FLOOR * Math.max(peakError, Math.abs(scenario.kind === 'step' ? scenario.size : 0))),
  };
}
