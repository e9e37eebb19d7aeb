/**
 * One scenario run with its metrics. At constant speed the simulation is exact (one run); when the speed
 * changes, the Runge–Kutta step is halved from `START_STEPS` steps per sample until halving it changes no metric
 * by more than 0.1 % (times: by more than 0.1 % or one sample, whichever is larger — a time read off the samples
 * moves in whole samples), up to `MOST_STEPS`.
 */
import { scenarioMetrics, type ScenarioMetrics } from './scenario-metrics.js';
import type { PreparedScenario } from './scenario-catalogue.js';
import { simulateScenario, type ScenarioController, type ScenarioTraces, type ScenarioVehicle } from './scenario-simulation.js';

export const STEP_HALVING = { startStepsPerSample: 1, mostStepsPerSample: 64, relativeTolerance: 1e-3 } as const;

export interface ScenarioRun {
  readonly scenario: PreparedScenario;
  readonly traces: ScenarioTraces;
  readonly metrics: ScenarioMetrics;
  /** False when halving the step still moved a metric by more than the tolerance at the finest step. */
  readonly converged: boolean;
}

/** Metrics that differ by more than the tolerance (names), comparing a run with one at half the step. */
export function metricsThatMoved(coarse: ScenarioMetrics, fine: ScenarioMetrics, sampleTime_s: number): string[] {
  const moved: string[] = [];
  const tolerance = STEP_HALVING.relativeTolerance;
  for (const key of Object.keys(coarse) as (keyof ScenarioMetrics)[]) {
    if (key === 'limitCycle') {
      const a = coarse.limitCycle;
      const b = fine.limitCycle;
      if ((a === null) !== (b === null)) moved.push(key);
      else if (
        a !== null &&
        b !== null &&
        (Math.abs(a.amplitude - b.amplitude) > tolerance * b.amplitude || Math.abs(a.period_s - b.period_s) > Math.max(tolerance * b.period_s, sampleTime_s))
      )
        moved.push(key);
      continue;
    }
    const a = coarse[key];
    const b = fine[key];
    if (a === null || b === null) {
      if (a !== b) moved.push(key);
      continue;
    }
    const speed =
      fine.settlingTime_s !== null && fine.settlingTime_s > 0 && fine.settlingDistance_m !== null ? fine.settlingDistance_m / fine.settlingTime_s : 0;
    const absolute = key.endsWith('_s') ? sampleTime_s : key === 'settlingDistance_m' ? sampleTime_s * speed : 0;
    if (Math.abs(a - b) > Math.max(tolerance * Math.max(Math.abs(a), Math.abs(b)), absolute, 1e-12)) moved.push(key);
  }
  return moved;
}

/** What runScenario runs. */
export interface ScenarioRunInput {
  /** The single-track vehicle with its actuator and steering limits. */
  readonly vehicle: ScenarioVehicle;
  /** The firmware's controller: loop, settings, the schedule's lookup. */
  readonly controller: ScenarioController;
  /** The scenario with its setup (scenario-catalogue.ts). */
  readonly scenario: PreparedScenario;
  /** For judging only — the traces hold their last values once the run is at rest (scenario-simulation.ts REST); default false. */
  readonly stopAtRest?: boolean;
}

/** The run of `input.scenario` with its metrics, the Runge–Kutta step halved as the file comment says. */
export function runScenario(input: ScenarioRunInput): ScenarioRun {
  const { vehicle, controller, scenario, stopAtRest = false } = input;
  const ts = controller.settings.sampleTime_s;
  const first = simulateScenario({ vehicle, controller, setup: scenario.setup, stepsPerSample: STEP_HALVING.startStepsPerSample, stopAtRest });
  let metrics = scenarioMetrics(scenario, first);
  if (first.integrator.name === 'exact') return { scenario, traces: first, metrics, converged: true };
  let traces = first;
  for (let steps = 2 * STEP_HALVING.startStepsPerSample; steps <= STEP_HALVING.mostStepsPerSample; steps *= 2) {
    const finer = simulateScenario({ vehicle, controller, setup: scenario.setup, stepsPerSample: steps, stopAtRest });
    const finerMetrics = scenarioMetrics(scenario, finer);
    const moved = metricsThatMoved(metrics, finerMetrics, ts);
    traces = finer;
    metrics = finerMetrics;
    if (moved.length === 0) return { scenario, traces, metrics, converged: true };
  }
  return { scenario, traces, metrics, converged: false };
}
